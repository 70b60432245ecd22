"""The cautions every output carries and the assumption notes that follow from the member file or its
solution, as sentences (sizer.phrase) whose numbers each output shows in its own units."""

from __future__ import annotations

from typing import TYPE_CHECKING

from sizer.model import Member
from sizer.phrase import joined, phrase, q

if TYPE_CHECKING:
    from sizer.analysis import MemberSolution

CAUTIONS: tuple[str, ...] = (
    "These results rest on the allowable stresses entered by the user and on linear elastic, "
    "small-deflection (Euler-Bernoulli) beam theory.",
    "Stability (column, lateral-torsional and local buckling) is checked from elastic critical values "
    "that sizer computes, divided by the safety factor stated in the assumptions; not by a design "
    "code's buckling curves.",
    "Checked under concentrated loads: web bearing (local yielding), web crippling and, for a load over a "
    "support, web compression buckling of I, channel and tube webs (AISC 360-16 J10.2, J10.3, J10.5), and web "
    "shear buckling between supports or stiffeners. Not checked by sizer: connections, the stiffeners themselves, "
    "concentrated loads on other shapes or across a web, fatigue, fire and dynamic effects.",
    "A qualified engineer must check these results against the governing local code before "
    "anything is built.",
)


def member_notes(member: Member) -> list[str]:
    """Assumptions that follow from the member file alone."""
    from sizer.analysis.patterns import pattern_notes
    from sizer.analysis.support_stability import free_movement_notes
    from sizer.checks.deflection import deflection_notes

    notes: list[str] = []
    if not member.combinations_given:
        notes.append("No [combinations] given: one combination 'all' with every load case x 1.0.")
    used = {case for factors in member.given_combinations.values() for case in factors}
    for case in dict.fromkeys(load.case for load in member.given_loads):
        if case not in used:
            notes.append(f"Load case '{case}' is in no combination, so it is not in any result.")
    notes += pattern_notes(member) + area_load_notes(member)
    if member.checks.deflection:  # [[checks.deflection]] entries; the single keys are stated with the checks
        notes += deflection_notes(member)
    if member.hinges:
        notes.append("Internal hinges release both bending moments (My and Mz); axial force, shears and torque pass through.")
    notes += free_movement_notes(member)
    notes.append("Transverse loads act at the centroid unless `across` says otherwise; the checks add each one's torque about the "
                 "shear centre (non-uniform torsion on the section); force diagrams and reactions show only torques given as loads.")
    return notes


def area_load_notes(member: Member) -> list[str]:
    """Each area load as the line load it makes: pressure x tributary width (SI numbers)."""
    from sizer.model import LineLoad

    found = [(load, load.area) for load in member.given_loads if isinstance(load, LineLoad) and load.area is not None]
    if not found:
        return []
    parts = []
    for load, area in found:
        for name, p0, p1, q0, q1 in zip(("p" + c for c in "xyz"), area.p_start, area.p_end, load.q_start, load.q_end):
            if p0 or p1:
                pressure = q("pressure", p0 if p0 == p1 else (p0, p1), "kPa", ".6g")
                line = q("line_load", q0 if q0 == q1 else (q0, q1), "kN/m", ".6g")
                parts.append(phrase(f"{name} ", pressure, " x ", q("width", area.width, "m", ".6g"), " = ", line,
                                    f" (case '{load.case}', ", q("from_to", (load.start, load.end), "m", ".6g"), ")"))
    return [phrase("Area loads as line loads, pressure x tributary width: ", joined("; ", parts), ".")]


def small_deflection_cautions(solution: MemberSolution) -> list[str]:
    """A caution when a span deflects more than SMALL_DEFLECTION_FRACTION of its length
    (`solution`: analysis.MemberSolution; none without displacements)."""
    from sizer.checks.deflection import SMALL_DEFLECTION_FRACTION, large_deflection

    found = large_deflection(solution)
    if found is None:
        return []
    span, value, at, combination = found
    what = "overhang" if span.overhang else "span"
    return [phrase(f"CAUTION: the {what} from ", q("start", span.start, "m"), " to ", q("end", span.end, "m"), " deflects ",
                   q("deflection", value, "m", ".3g"), " at x = ", q("at", at, "m", ".4g"),
                   f" in combination '{combination}', {value / span.length:.2g} of its length (beyond 1/{1 / SMALL_DEFLECTION_FRACTION:g}): "
                   "small-deflection theory no longer holds there, so these results are not reliable.")]
