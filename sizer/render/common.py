"""What every output shares: the cautions, the console, JSON conversion and the assumption notes."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

from sizer.model import Member
from sizer.printable import safe_console

if TYPE_CHECKING:
    from sizer.analysis import MemberSolution
    from rich.console import Console
    from rich.panel import Panel

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
PIPED_WIDTH = 80  # columns of output written to a file or pipe, unless COLUMNS says otherwise


def console(stderr: bool = False) -> Console:
    """A rich Console: the terminal's width as rich finds it (colour when the terminal supports it);
    PIPED_WIDTH columns when writing to a file or pipe, unless the COLUMNS variable gives a width."""
    import os
    import sys

    stream = sys.stderr if stderr else sys.stdout
    piped = not (hasattr(stream, "isatty") and stream.isatty())
    width = PIPED_WIDTH if piped and not os.environ.get("COLUMNS", "").isdigit() else None
    return safe_console(stderr=stderr, highlight=False, soft_wrap=False, width=width)


def cautions_panel() -> Panel:
    """The cautions in a visible panel (each a paragraph that wraps at the panel's width)."""
    from rich.console import Group
    from rich.panel import Panel

    from sizer.render.text import bullets

    return Panel(Group(*bullets(list(CAUTIONS), "!")), title="[bold]Cautions[/]", title_align="left", border_style="yellow", expand=True)


def notes_panel(notes: list[str], title: str = "Assumptions made", system: str = "si") -> Panel:
    """The assumptions the tool made, one per paragraph, so that none is hidden; SI numbers in the
    notes are shown in the display units of `system` (render.si_text)."""
    from rich.console import Group
    from rich.panel import Panel

    from sizer.render.si_text import in_display_units
    from sizer.render.text import bullets

    return Panel(Group(*bullets([in_display_units(note, system) for note in notes])), title=f"[bold]{title}[/]",
                 title_align="left", border_style="cyan", expand=True)


def patterned(member: Member) -> bool:
    """Whether the member's combinations are pattern arrangements (some of them, the ones that govern)."""
    return member.patterning is not None and bool(member.patterning.switches)


def combinations_words(member: Member, count: int) -> str:
    """"7 combinations", or for pattern arrangements "every pattern arrangement (7 evaluated in full)"."""
    if patterned(member):
        return f"every pattern arrangement ({count} evaluated in full)"
    return f"{count} combination{'' if count == 1 else 's'}"


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
                pressure = f"{p0 / 1e3:.6g} kPa" if p0 == p1 else f"{p0 / 1e3:.6g}–{p1 / 1e3:.6g} kPa"
                line = f"{q0 / 1e3:.6g} kN/m" if q0 == q1 else f"{q0 / 1e3:.6g}–{q1 / 1e3:.6g} kN/m"
                parts.append(f"{name} {pressure} x {area.width:.6g} m = {line} (case '{load.case}', {load.start:.6g}–{load.end:.6g} m)")
    return ["Area loads as line loads, pressure x tributary width: " + "; ".join(parts) + "."]


def small_deflection_cautions(solution: MemberSolution) -> list[str]:
    """A caution when a span deflects more than SMALL_DEFLECTION_FRACTION of its length
    (`solution`: analysis.MemberSolution; none without displacements)."""
    from sizer.checks.deflection import SMALL_DEFLECTION_FRACTION, large_deflection

    found = large_deflection(solution)
    if found is None:
        return []
    span, value, at, combination = found
    what = "overhang" if span.overhang else "span"
    return [f"CAUTION: the {what} from {span.start:g} m to {span.end:g} m deflects {value:.3g} m at x = {at:.4g} m in "
            f"combination '{combination}', {value / span.length:.2g} of its length (beyond 1/{1 / SMALL_DEFLECTION_FRACTION:g}): "
            "small-deflection theory no longer holds there, so these results are not reliable."]


def without_round_off(values: Any, scale: float | None = None, relative: float = 1e-9) -> Any:
    """`values` (an array) with entries smaller than `relative` x `scale` (default: its largest entry)
    set to exactly 0: the round-off of sums that are zero in exact arithmetic."""
    import numpy as np

    values = np.asarray(values, dtype=float)
    scale = np.abs(values).max(initial=0.0) if scale is None else scale
    return np.where(np.abs(values) <= relative * scale, 0.0, values)


def reactions_without_round_off(reactions: Any, length: float) -> Any:
    """(n, 6) reactions Fx, Fy, Fz (N), Mx, My, Mz (N*m) with round-off set to exactly 0, forces and
    moments each on their own scale: a force below 1e-9 of the largest force (or 1e-12 of the largest
    moment / length), a moment below 1e-9 of the largest moment (or 1e-12 of the largest force x
    length). Statics sums of terms of size F L carry round-off of about 1e-15 F L, far below these."""
    import numpy as np

    values = np.asarray(reactions, dtype=float).reshape(-1, 6)
    force, moment = np.abs(values[:, :3]).max(initial=0.0), np.abs(values[:, 3:]).max(initial=0.0)
    forces = without_round_off(values[:, :3], max(1e-9 * force, 1e-12 * moment / length), relative=1.0)
    moments = without_round_off(values[:, 3:], max(1e-9 * moment, 1e-12 * force * length), relative=1.0)
    return np.concatenate([forces, moments], axis=1)


def to_jsonable(value: Any) -> Any:
    """Convert numpy scalars/arrays and tuples to plain JSON types; NaN/inf become null, -0.0 becomes 0.0."""
    import numpy as np

    if isinstance(value, dict):
        return {str(key): to_jsonable(item) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [to_jsonable(item) for item in value]
    if isinstance(value, np.ndarray):
        return to_jsonable(value.tolist())
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float):
        return value + 0.0 if math.isfinite(value) else None  # + 0.0: never "-0.0"
    return value


def dumps(document: dict) -> str:
    """The JSON text of an output document (cautions always included by the caller)."""
    import json

    return json.dumps(to_jsonable(document), indent=2, ensure_ascii=False)
