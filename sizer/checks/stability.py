"""The member's stability for one section: the elastic buckling load factors of every combination
(sizer.stability) beside the demands they are compared with, for the buckling, lateral-torsional and
interaction checks.

For each combination: the peak axial compression (N) and the peak major-axis moment |Mz| (N*m, the
section's own axes) at the check stations, and the lowest load factors of the eigen-solves on the
member as it is: `axial` under the combination's axial force alone, `lateral` under its major-axis
bending with the loads' heights. A load factor scales the whole combination (self-weight included).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Iterable

import numpy as np

from sizer.checks.results import ZERO_ACTION
from sizer.design import Design
from sizer.errors import InputError
from sizer.stability import Buckling, MemberStability, StabilitySection, minor_axis_is_weaker, stability_section
from sizer.stability.section import has_weaker_axis

if TYPE_CHECKING:
    from sizer.checks.arrangement_stability import LateralSearch
    from sizer.stability.problem import SectionStability

N, MZ = 0, 5
FIELD_WORDS = {0: "movement along the section's depth", 1: "sideways movement", 2: "twisting about the member axis"}
FIELD_FIXES = {0: "hold uy (or uz for a member turned to its minor axis) at a support",
               1: 'hold the sideways movement at a support, or add a [[restraints]] entry with hold = ["lateral"]',
               2: 'hold rx at a support (pin, roller and fixed all hold it), or add a [[restraints]] entry with hold = ["twist"]'}


@dataclass(frozen=True)
class CombinationStability:
    """One combination's demands and buckling load factors (see the module docstring)."""

    combination: str
    compression: float  # N, >= 0
    compression_at: float  # m
    moment: float  # N*m, >= 0: largest |Mz| in the section's axes
    moment_at: float  # m
    moment_sign: float  # sign of Mz there (+1 sagging: top fibre in compression)
    axial: Buckling | None  # None: no compression
    lateral: Buckling | None  # None: no major-axis bending, or the member cannot buckle sideways
    lateral_bound: bool = False  # True: `lateral` is a proven lower bound of the load factor, not solved (pattern arrangements)


@dataclass
class StabilityReport:
    """Every combination's stability for one section, and why lateral-torsional buckling does not
    apply where it does not ("" where it does)."""

    model: MemberStability
    section: StabilitySection
    lateral_reason: str
    combinations: list[CombinationStability] = field(default_factory=list)
    solver: SectionStability | None = None  # the section's solves, for solving bounded entries exactly
    elements: int = 0  # the most elements a converged load factor needed
    converged: bool = True  # False: some load factor was not converged within 5 halvings, taken less its last change (see SectionStability)
    lowered: bool = False  # True: some load factor was taken less the error left, extrapolated (see SectionStability)
    warping_elements: float = 0.0  # m: the elements next to the warping holds, where the mesh was graded towards them (else 0)

    def bounded(self, names: Iterable[str | None]) -> list[int]:
        """Indices of the named combinations whose lateral load factor is a bound, not solved."""
        wanted = set(names)
        return [c for c, entry in enumerate(self.combinations) if entry.combination in wanted and entry.lateral_bound]

    def solve_exactly(self, combinations: Iterable[int], design: Design, mass: float) -> None:
        """Replace the bounded lateral load factors of these combinations with their exact ones."""
        solver = self.solver
        assert solver is not None  # a bound is found only with the section's solves
        for c in combinations:
            entry = self.combinations[c]
            found = _checked(solver.combination("lateral", c, mass), self.model, design, entry.combination)
            self.combinations[c] = replace(entry, lateral=found, lateral_bound=False)


def lateral_not_applicable(design: Design, section: StabilitySection, moments: np.ndarray) -> str:
    """Why the member cannot buckle sideways under these moments ("" when it can)."""
    if not np.any(np.abs(moments) > ZERO_ACTION):
        if design.member.orientation == "minor":
            return "no bending about the section's major axis: it is bent about its weaker axis only"
        return "no bending about the section's major axis"
    if not minor_axis_is_weaker(section):
        if not has_weaker_axis(section):
            return "the section has no weaker axis (I11 = I22, principal second moments): it does not buckle sideways"
        return "the section is bent about its weaker principal axis: it does not buckle sideways"
    return ""


def stability_report(design: Design, actions: np.ndarray, xs: np.ndarray, model: MemberStability | None = None,
                     searches: dict[str, LateralSearch] | None = None, solver: SectionStability | None = None,
                     scaled: tuple[StabilityReport, float] | None = None) -> StabilityReport:
    """The stability of the design's section under every combination; `actions` (C, S, 6) in the
    section's axes at the check stations `xs` (m). `model`: a MemberStability of this member to
    reuse (its section-independent parts), else one is built; `searches`: given combination ->
    LateralSearch over its pattern arrangements (lateral_searches), whose load factors the
    arrangements take; `solver`: the section's solves (model.for_section) where made already.
    `scaled`: (the report of this section on the member as given, factor) where each combination
    of the design is the one of that name there with every load (self-weight included) times
    factor (the reserve factor's checks): its load factors are those divided by factor (the same
    load shape: K d = lam B d with B times factor), solved again only where that report lacks them."""
    if scaled is not None:
        found = _scaled_report(design, actions, xs, *scaled)
        if found is not None:
            return found
    model = model or MemberStability(design.member, design.solution)
    section = stability_section(design.props, design.known_material.elastic_modulus, design.known_material.shear_modulus)
    reason = lateral_not_applicable(design, section, actions[..., MZ])
    report = StabilityReport(model, section, reason)
    mass = stability_mass(design)
    solver = solver if solver is not None and solver.model.solution is design.solution else model.for_section(section)
    report.solver = solver
    patterned = {} if reason else searched_laterals(design, searches or {})
    for c, name in enumerate(design.solution.combination_names):
        compression = np.maximum(-actions[c, :, N], 0.0)
        moments = np.abs(actions[c, :, MZ])
        at_n, at_m = int(np.argmax(compression)), int(np.argmax(moments))
        axial = lateral = None
        if compression[at_n] > ZERO_ACTION:
            axial = _checked(solver.combination("axial", c, mass), model, design, name)
        bound = False
        if not reason and moments[at_m] > ZERO_ACTION:
            lateral, exact = patterned.get(c, (None, True))
            bound = not exact
            if exact:
                lateral = _checked(lateral or solver.combination("lateral", c, mass), model, design, name)
        report.combinations.append(CombinationStability(
            name, float(compression[at_n]), float(xs[at_n]), float(moments[at_m]), float(xs[at_m]),
            float(np.sign(actions[c, at_m, MZ]) or 1.0), axial, lateral, bound))
    report.elements, report.converged, report.lowered = solver.elements, solver.converged, solver.lowered
    if solver.model is not model:
        report.warping_elements = solver.warping_elements()
    return report


def _scaled_report(design: Design, actions: np.ndarray, xs: np.ndarray, known: StabilityReport, factor: float) -> StabilityReport | None:
    """stability_report from `known` with its load factors divided by `factor` (see stability_report);
    None where a combination of the design is not in `known` with its buckling solved, or where the
    demands call for a solve that `known` did not make (a demand at the threshold of ZERO_ACTION)."""
    entries = {entry.combination: entry for entry in known.combinations}
    report = StabilityReport(known.model, known.section, known.lateral_reason, solver=known.solver, elements=known.elements,
                             converged=known.converged, lowered=known.lowered, warping_elements=known.warping_elements)
    if not factor > 0.0 or lateral_not_applicable(design, known.section, actions[..., MZ]) != known.lateral_reason:
        return None
    for c, name in enumerate(design.solution.combination_names):
        entry = entries.get(name)
        if entry is None or entry.lateral_bound:
            return None
        compression = np.maximum(-actions[c, :, N], 0.0)
        moments = np.abs(actions[c, :, MZ])
        at_n, at_m = int(np.argmax(compression)), int(np.argmax(moments))
        needs_axial = compression[at_n] > ZERO_ACTION
        needs_lateral = not known.lateral_reason and moments[at_m] > ZERO_ACTION
        if needs_axial != (entry.axial is not None) or needs_lateral != (entry.lateral is not None):
            return None
        report.combinations.append(CombinationStability(
            name, float(compression[at_n]), float(xs[at_n]), float(moments[at_m]), float(xs[at_m]),
            float(np.sign(actions[c, at_m, MZ]) or 1.0), _divided(entry.axial, factor), _divided(entry.lateral, factor)))
    return report


def _divided(buckling: Buckling | None, factor: float) -> Buckling | None:
    """The buckling of the load set times `factor`: the load factor divided by it, the shape the same."""
    if buckling is None:
        return None
    return Buckling(buckling.load_factor / factor, buckling.mode, buckling.free_movement)


def stability_mass(design: Design) -> float:
    """The self-weight (kg/m) the stability solves count: the section's, where the member has a self-weight case."""
    return (design.mass_per_length or 0.0) if design.member.self_weight_case else 0.0


def lateral_searches(design: Design, xs: np.ndarray, sides: np.ndarray, solver: SectionStability) -> dict[str, LateralSearch]:
    """Given combination -> LateralSearch (sizer.checks.arrangement_stability): lateral-torsional
    buckling over every pattern arrangement of each combination with switches, by branch and bound;
    empty without them or a bending allowable, or where the member cannot buckle sideways."""
    from sizer.analysis.section_axes import to_section_axes
    from sizer.analysis.superposition import switched_combinations
    from sizer.checks.arrangement_stability import lateral_over_arrangements
    from sizer.checks.lateral import lateral_allowables

    fb = design.known_material.allowable.bending
    mass = stability_mass(design)
    switched = switched_combinations(design.solution, mass)
    if fb is None or not switched:
        return {}
    each = to_section_axes(design.solution.case_actions(xs, sides), design.member.orientation)[..., MZ]  # (columns, n)

    def utilization(peak: float, sign: float, factor: float) -> float:
        """The lateral-torsional utilization (sizer.checks.lateral) at this peak moment and load factor."""
        if not math.isfinite(factor):
            return 0.0
        allowed = lateral_allowables(design, fb, np.array([peak]), np.array([sign]), factor)[2]
        return float(peak * design.props.sigma_peak[2] / allowed[0])

    found: dict[str, LateralSearch] = {}
    for combination in switched:
        heaviest = combination.fixed + np.maximum(combination.switches, 0.0).sum(axis=0)
        moments = (combination.fixed @ each, combination.switches @ each)
        search = lateral_over_arrangements(solver, combination.fixed, combination.switches, moments, utilization,
                                           refinement_allowance(solver, heaviest[None, :]))
        if search is not None:
            found[combination.origin] = search
    return found


def searched_laterals(design: Design, searches: dict[str, LateralSearch]) -> dict[int, tuple[Buckling, bool]]:
    """combination -> (lateral Buckling, exact?) of the pattern arrangements the searches cover."""
    patterning = design.member.patterning
    found: dict[int, tuple[Buckling, bool]] = {}
    if patterning is None or not searches:
        return found
    for c, name in enumerate(design.solution.combination_names):
        search = searches.get(design.member.origin(name))
        if search is not None and name in patterning.loaded:
            found[c] = search.load_factor(patterning.loaded[name])
    return found


def refinement_allowance(solver: SectionStability, weights: np.ndarray) -> float:
    """The factor (at most 1) that the branch and bound's lower bounds, made on the base mesh, are
    multiplied by so that they stay below converged load factors: the base mesh's load factors lie
    above the converged ones (the finer meshes hold its shapes), by a relative change that depends on
    the mode's shape more than on which spans are loaded; twice the change found for the heaviest
    of these arrangements is allowed, and 1e-4 more for the convergence tolerance."""
    heaviest = weights[int(np.argmax(np.abs(weights).sum(axis=1)))]
    coarse = solver.reduced.modes(solver.load_matrix_full("lateral", heaviest), 1)[0].load_factor
    fine = solver.load_set("lateral", heaviest).load_factor
    if not (math.isfinite(coarse) and math.isfinite(fine)) or coarse <= 0.0:
        return 1.0 - 1e-4
    return max(0.0, 1.0 - 2.0 * max(0.0, 1.0 - fine / coarse) - 1e-4)


def _checked(buckling: Buckling, model: MemberStability, design: Design, combination: str) -> Buckling:
    """The buckling result, or bad input when the member is free to move in a way the loading drives
    (docs/design.md section 3: every movement a load engages must be held)."""
    if not buckling.free_movement:
        return buckling
    fields, mode = model.mesh.field_of(), buckling.mode
    assert mode is not None  # a free movement is found in the mode
    sizes = [float(np.abs(mode[fields == k]).max(initial=0.0)) for k in range(3)]
    moving = int(np.argmax(sizes))
    raise InputError(design.member.source, "supports", f"mechanism: nothing holds the member against {FIELD_WORDS[moving]}, "
                     f"and the loads of combination '{combination}' would drive it", FIELD_FIXES[moving])
