"""Every check of docs/design.md section 7 for one member and one section, and the assumptions behind them.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from sizer.analysis.section_axes import to_section_axes
from sizer.checks.bracing import brace_demands, brace_notes
from sizer.checks.buckling import BucklingAxis, buckling_check, column_buckling, given_length_axes
from sizer.checks.deflection import deflection_check, deflection_limits
from sizer.checks.field import FieldPeaks
from sizer.checks.lateral import LateralBuckling, lateral_buckling, lateral_check
from sizer.checks.local import ASSUMPTIONS as LOCAL_ASSUMPTIONS
from sizer.checks.local import local_check
from sizer.checks.reduction import PLATEAU_WORDS, TRANSITION_WORDS
from sizer.checks.results import CheckReport, CheckResult
from sizer.checks.second_order import second_order_actions, second_order_check, second_order_notes, with_amplification
from sizer.checks.stability import StabilityReport, lateral_not_applicable, stability_mass, stability_report
from sizer.checks.stations import check_stations, member_actions
from sizer.checks.web import web_check, web_notes
from sizer.checks.torsion import check_across, torsion_actions, torsion_note, torsion_summary
from sizer.checks.strength import (axial_check, bending_check, compression_allowables, equivalent_check, interaction_check, needs_allowable,
                                   shear_check)
from sizer.design import Design
from sizer.model import Member, PointLoad
from sizer.phrase import joined, phrase, q
from sizer.stability import MemberStability
from sizer.stability.boundary import warping_held

if TYPE_CHECKING:
    from sizer.checks.arrangement_stability import LateralSearch
    from sizer.checks.second_order import SecondOrderActions
    from sizer.checks.torsion import TorsionActions
    from sizer.sections.fields import UnitStressField
    from sizer.stability.problem import SectionStability


PATTERN_SECOND_ORDER_NOTE = (
    "Second order with pattern loading: the arrangements are found from first-order quantities (per-span superposition holds "
    "only there) and lateral-torsional buckling; the second-order actions are solved for each arrangement evaluated in full "
    "(those that govern some first-order quantity, deflection or lateral-torsional buckling, and all or no span loaded). An "
    "arrangement that governs none of these in first order is not solved in second order: where the axial force is patterned "
    "or the amplification is large, check such arrangements as combinations of their own.")


@dataclass
class StressState:
    """What the stress-field checks of one design read: the check stations (m), the torsion solve,
    the first-order actions (C, S, 6) in member axes, the second-order actions (None with second
    order off), the actions (C, S, 6) and warping actions in section axes the stress field is made
    from, and its peaks."""

    xs: np.ndarray
    torsion: TorsionActions
    first: np.ndarray
    second: SecondOrderActions | None
    actions: np.ndarray
    warping: np.ndarray
    stress: FieldPeaks


def stress_state(design: Design, unit_field: UnitStressField, n_even: int = 200, validate_across: bool = True) -> StressState:
    """The design's actions and stress field at its check stations, first and (where on) second order:
    the full check's own (see check_design); no stability solve is made for them."""
    xs, sides = check_stations(design, n_even)
    if validate_across:
        check_across(design, np.asarray(unit_field.points))
    torsion = torsion_actions(design, xs, sides)
    first = member_actions(design, xs, sides)
    first[..., 3] = torsion.torque  # with the torques of loads across the section, split between supports by the warping solve
    second = second_order_actions(design, xs, sides, first)
    actions = to_section_axes(first if second is None else second.actions, design.member.orientation)
    warping = torsion.warping() if second is None else torsion.warping() + second.warping
    stress = FieldPeaks(actions, unit_field, design.props.area, warping)
    return StressState(xs, torsion, first, second, actions, warping, stress)


def field_checks(design: Design, unit_field: UnitStressField, state: StressState) -> dict[str, CheckResult]:
    """The checks that need no stability solve, by name: axial, bending, shear, equivalent,
    deflection, local and web, each the full check's own (check_design lists these same results)."""
    stress, xs, names = state.stress, state.xs, design.solution.combination_names
    return {
        "axial": axial_check(stress, xs, names, design),
        "bending": bending_check(stress, xs, names, design),
        "shear": shear_check(stress, xs, names, design),
        "equivalent": equivalent_check(stress, xs, names, design),
        "deflection": deflection_check(design, state.second),
        "local": local_check(design, with_warping_compression(state.actions, state.warping, unit_field, design.props.area), xs, names),
        "web": web_check(design),
    }


def stress_checks(design: Design, unit_field: UnitStressField, n_even: int = 200,
                  validate_across: bool = True) -> tuple[StressState, dict[str, CheckResult]] | None:
    """The full check's own stress-field checks (field_checks) and the state they came from, without
    its stability solves: each value equals check_design's for that check, so their largest is a
    proven lower bound of its utilization. None where check_design would first add the pattern
    arrangements that govern (a superposable solution: see _governing_arrangements)."""
    if has_arrangements_to_add(design):
        return None
    state = stress_state(design, unit_field, n_even, validate_across)
    return state, field_checks(design, unit_field, state)


def check_design(design: Design, unit_field: UnitStressField, n_even: int = 200, stability: MemberStability | None = None,
                 validate_across: bool = True, scaled: tuple[StabilityReport, float] | None = None,
                 made: tuple[StressState, dict[str, CheckResult]] | None = None) -> CheckReport:
    """Every check of docs/design.md section 7 for the design's section, on the full stress field. `stability`:
    the member's MemberStability to reuse (sizing checks many sections of one member). With
    `validate_across` a load placed across the section beyond it is bad input (sizing checks every
    candidate with the load where given, as on a bracket). `scaled`: the stability report of this
    section on the member as given and the factor on its loads (see stability_report). `made`: what
    stress_checks returned for this design, unit field and `n_even` (not made again)."""
    given_design = design
    design, stability, searches, solver = _governing_arrangements(design, unit_field, n_even, stability)
    names = design.solution.combination_names
    if made is None or design is not given_design:
        made_state = stress_state(design, unit_field, n_even, validate_across)
        made = made_state, field_checks(design, unit_field, made_state)
    state, fields = made
    xs, first, second, stress = state.xs, state.first, state.second, state.stress
    report = stability_report(design, to_section_axes(first, design.member.orientation), xs, stability, searches, solver, scaled)
    given = given_length_axes(design.member, design.props, design.known_material)
    columns = column_buckling(design, report, given)
    fb = _bending_allowable(design, report)
    interaction, lateral = _lateral_checks(design, report, stress, xs, columns, fb)
    while stale := report.bounded([interaction.combination, lateral.combination]):  # a bounded arrangement governs: solve it
        report.solve_exactly(stale, design, stability_mass(design))
        interaction, lateral = _lateral_checks(design, report, stress, xs, columns, fb)
    checks = [
        fields["axial"],
        fields["bending"],
        interaction,
        fields["shear"],
        fields["equivalent"],
        fields["deflection"],
        buckling_check(columns, design),
        lateral,
        fields["local"],
        fields["web"],
    ]
    if second is not None:
        checks = with_amplification(checks, second, design)
    checks.append(second_order_check(second))
    nodes = np.asarray(unit_field.sigma).shape[1]
    notes = check_notes(design, report, given, len(xs), len(names), nodes, {c.check for c in checks if c.made})
    notes += second_order_notes(design, second)
    if second is not None and design.member.patterning is not None and design.member.patterning.switches:
        notes.append(PATTERN_SECOND_ORDER_NOTE)
    notes.insert(1, torsion_note(design))
    braces = brace_demands(design, state.actions, xs)
    notes += brace_notes(braces)
    return CheckReport(design.spec.name, checks, notes, len(xs), nodes, stability=report, restraints=braces,
                       torsion=torsion_summary(design, state.torsion, xs), second_order=second, design=design)


def has_arrangements_to_add(design: Design) -> bool:
    """Whether check_design first adds the pattern arrangements that govern (_governing_arrangements):
    where the design's solution superposes its arrangements (analysis.superposition.superposable)."""
    from sizer.analysis.superposition import superposable

    return superposable(design.solution) and design.material is not None


def _governing_arrangements(design: Design, unit_field: UnitStressField, n_even: int,
                            stability: MemberStability | None) -> tuple[Design, MemberStability | None, dict[str, LateralSearch], SectionStability | None]:
    """The design with the pattern arrangements that govern its stress and lateral-torsional checks
    among its combinations (sizer.checks.arrangements, sizer.checks.stability.lateral_searches), the
    stability model for it, the lateral searches and the section's solves they used; the design as
    it is where its arrangements are not superposable (analysis.superposition.superposable)."""
    from sizer.checks.arrangements import deflection_arrangements, stress_arrangements, with_arrangements
    from sizer.checks.stability import lateral_searches
    from sizer.stability import stability_section

    if not has_arrangements_to_add(design):
        return design, stability, {}, None
    xs, sides = check_stations(design, n_even)
    warping = torsion_actions(design, xs, sides).warping()
    first = to_section_axes(member_actions(design, xs, sides), design.member.orientation)
    added = stress_arrangements(design, xs, sides, unit_field, first) if not np.any(warping) else {}
    for origin, found in deflection_arrangements(design).items():
        added.setdefault(origin, set()).update(found)
    model = stability or MemberStability(design.member, design.solution)
    section = stability_section(design.props, design.known_material.elastic_modulus, design.known_material.shear_modulus)
    searches: dict[str, LateralSearch] = {}
    solver: SectionStability | None = None
    if not lateral_not_applicable(design, section, first[..., 5]):
        solver = model.for_section(section)
        searches = lateral_searches(design, xs, sides, solver)
        for origin, search in searches.items():
            if search.best is not None:
                added.setdefault(origin, set()).add(search.best)
    extended = with_arrangements(design, added)
    if solver is not None:
        solver.model = solver.model.for_solution(extended.solution)  # its solves so far kept: the same load cases
    return extended, model.for_solution(extended.solution), searches, solver


def with_warping_compression(actions: np.ndarray, warping: np.ndarray, unit_field: UnitStressField, area: float) -> np.ndarray:
    """Actions for the local wall check with the peak warping normal stress |B| max|omega| / Iw added
    as uniform compression to every wall (as an axial force of that stress x area): conservative."""
    extra = np.abs(warping[..., 0]) * unit_field.warping_peaks[0]
    if not np.any(extra):
        return actions
    moved = actions.copy()
    moved[..., 0] -= extra * area
    return moved


def _lateral_checks(design: Design, report: StabilityReport, stress: FieldPeaks, xs: np.ndarray, columns: list,
                    fb: float | None) -> tuple[CheckResult, CheckResult]:
    """The interaction and lateral-torsional checks, which use each combination's Fb reduced for
    lateral-torsional buckling."""
    names = design.solution.combination_names
    laterals: list[LateralBuckling | None] = lateral_buckling(design, report, fb) if fb is not None else [None] * len(names)
    fb_allowed = np.array([fb if entry is None else entry.allowable for entry in laterals]) if fb is not None else np.full(len(names), np.inf)
    return (interaction_check(stress, xs, names, design, compression_allowables(design, columns), fb_allowed),
            lateral_check(laterals, report, design))


def _bending_allowable(design: Design, report: StabilityReport) -> float | None:
    """Fb where some combination bends the member about its major axis (then it is needed), else
    the given one or None."""
    if any(entry.lateral is not None for entry in report.combinations):
        return needs_allowable(design.member, design.known_material, "bending", "lateral-torsional")
    return design.known_material.allowable.bending


def check_notes(design: Design, report: StabilityReport, given: list[BucklingAxis], n_stations: int, n_combinations: int,
                nodes: int, made: set[str]) -> list[str]:
    """The assumptions behind the checks, stated so that none is hidden; the interaction and local
    buckling lines only where those checks were `made`."""
    settings = design.member.checks
    factor_text = "default" if not settings.buckling_safety_factor_given else "given"
    notes = [
        f"Verdict from the full cross-section stress field: {n_stations} stations x {n_combinations} "
        f"combination{'' if n_combinations == 1 else 's'}, "
        f"each on all {nodes} mesh nodes (unit stress fields of the section's finite-element elasticity solution, combined linearly).",
        stability_note(design, report, given) + f" Safety factor {settings.buckling_safety_factor:g} ({factor_text}).",
    ]
    if "interaction" in made:
        notes.append("Interaction: fa/Fa + fb/Fb with fb the peak bending stress from My and Mz together; Fa in compression is "
                     "the compression allowable reduced to the combination's buckling stress / safety factor where lower; Fb is "
                     "the bending allowable reduced for lateral-torsional buckling.")
    notes += restraint_notes(design)
    if "local" in made:
        notes.append(LOCAL_ASSUMPTIONS)
    notes.append(plateau_note())
    notes += web_notes(design)
    if design.known_material.yield_strength is None:
        notes.append("No yield strength given: elastic buckling only (no Johnson parabola); unsafe for stocky members.")
    span_limit, overhang_limit = deflection_limits(settings)
    if overhang_limit is not None:
        chosen = ", ".join(settings.deflection_combinations or design.solution.combination_names)
        spans_text = f"span/{span_limit:g}" if span_limit is not None else "spans not checked (no deflection_limit)"
        notes.append(f"Deflection limits: {spans_text}, overhang/{overhang_limit:g}, "
                     f"relative to the supports, combinations: {chosen}.")
    return notes


def plateau_note() -> str:
    """Where each buckling reduction starts (its plateau) and how it joins the Johnson curve."""
    return ("No reduction below the published slenderness limits (plateaus): lateral-torsional "
            f"{PLATEAU_WORDS['lateral-torsional']}; web shear buckling {PLATEAU_WORDS['shear']}; local buckling "
            f"{PLATEAU_WORDS['local']}; {TRANSITION_WORDS}.")


def stability_note(design: Design, report: StabilityReport, given: list[BucklingAxis]) -> str:
    """How the buckling loads were found."""
    model = report.model
    solves = []
    if any(entry.axial is not None for entry in report.combinations):
        solves.append("under its axial force (flexural, torsional, flexural-torsional)")
    if any(entry.lateral is not None for entry in report.combinations):
        solves.append("under its major-axis bending with the loads' heights (lateral-torsional)")
    if not solves:
        return ("Buckling: no eigen-solve was needed: no combination compresses the member, and "
                + (report.lateral_reason or "none bends it about its major axis") + ".")
    weight = ", self-weight included" if design.member.self_weight_case else ""
    text = (f"Buckling: eigen-solves on the member as it is ({len(model.mesh.nodes) - 1} thin-walled beam elements: "
            f"sideways and in-plane bending, twist and warping), for each combination {' and '.join(solves)}; "
            f"the load factor scales the whole combination{weight}. "
            f"Each load factor refined by halving every element until it changed by less than 1e-4 (up to {report.elements} elements)")
    if report.lowered:
        text += ("; where it changed by more, its value less the error left, at most a third of that change (each halving taken "
                 "to cut the error at least 4 times, fewer where the last two changes show fewer): within 1e-4 below the converged value")
    if not report.converged:
        text += "; where 5 halvings did not reach that, the last value less its last change (on the safe side)"
    if report.warping_elements:
        text += phrase("; warping held where the supports hold it, the mesh graded to ", q("element_length", report.warping_elements, "mm", ".0f"),
                       " elements next to them (the section's warping length sqrt(E Iw / G J) is shorter than the default elements)")
    text += "."
    bounded = sum(entry.lateral_bound for entry in report.combinations)
    if bounded:
        text += (f" Pattern arrangements: lateral-torsional buckling by branch and bound over the loaded spans, on the mesh the "
                 f"converged solves needed; {bounded} of {len(report.combinations)} arrangements were not solved on their own: a "
                 "proven lower bound of their load factor (one eigen-solve for each set of arrangements that agree on the spans "
                 "fixed so far) shows that none of them can govern.")
    section = report.section
    if abs(float(section.Iyz)) > 1e-6 * math.sqrt(float(section.Iz) * float(section.Iy)):
        text += (" The section's principal axes are not its y and z axes (an angle, say): the weaker-axis test compares the "
                 "principal second moments I11, I22; the solves take the bending coupling E Iyz, the shear centre and the Wagner "
                 "(monosymmetry) term in the section's axes, which is the principal-axis formulation written in those axes.")
    if given:
        text += phrase(" Euler loads on the given buckling lengths (", joined(", ", (phrase(f"{a.axis} ", q(f"L_{a.axis}", a.length, "m")) for a in given)),
                       ") are kept beside them; the lower governs.")
    return text


def restraint_notes(design: Design) -> list[str]:
    """The restraints, load heights and support conditions the stability solves used."""
    member = design.member
    notes: list[str] = []
    supports = joined(", ", (phrase(f"{s.label} at ", q("at", s.at, "m"), f" (warping {'held' if warping_held(s) else 'free'})") for s in member.supports))
    forks = any(s.label in ("pin", "roller") for s in member.supports)
    notes.append(phrase("Supports for stability: ", supports, "; pins and rollers are forks (sideways movement and twist held)." if forks else "."))
    if member.restraints:
        parts = []
        for r in member.restraints:
            holds = " and ".join(name for name, on in (("lateral", r.lateral), ("twist", r.twist)) if on)
            where = phrase(q("at", r.start, "m")) if not r.continuous else phrase(q("from", r.start, "m"), " to ", q("to", r.end, "m"), " (continuous)")
            height = phrase(" at height ", _height_text(r.height)) if r.lateral else ""
            parts.append(phrase(f"{holds} at ", where, height))
        notes.append(phrase("Restraints: ", joined("; ", parts), "."))
    else:
        notes.append("Restraints: none given: the member is held against buckling at its supports only.")
    notes += free_end_couple_notes(member)
    heights = sorted({_height_text(load.height) for load in member.loads if hasattr(load, "height") and load.height is not None})
    text = "Load heights: transverse loads act on the face they push on (top for a downward load) unless given"
    weight = "; self-weight at the centroid" if member.self_weight_case else ""
    notes.append(phrase(text, phrase(" (", joined(", ", heights), " given)") if heights else "", weight, "."))
    return notes


def free_end_couple_notes(member: Member) -> list[str]:
    """How a bending couple at a free end (a cantilever's tip) acts in the lateral-torsional solve."""
    ends = [x for x in (0.0, member.length) if not any(abs(s.at - x) <= 1e-9 * member.length for s in member.supports)]
    found = sorted({x for load in member.loads if isinstance(load, PointLoad) and any(load.moment[1:])
                    for x in ends if abs(load.at - x) <= 1e-9 * member.length})
    if not found:
        return []
    where = joined(" and ", (phrase(q("at", x, "m")) for x in found))
    return [phrase("Couple at the free end (", where, "): taken as in the published case of a cantilever under an end couple "
            "(Timoshenko & Gere, ch. 6), turning with the end section (quasi-tangential): the cantilever buckles as half "
            "of a simply supported beam of twice its length under uniform moment; a couple applied through a fixed-axis "
            "lever is not covered.")]


def _height_text(height: str | float) -> str:
    return height if isinstance(height, str) else phrase(q("height", height, "mm", "+g"))
