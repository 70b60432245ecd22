"""The lightest passing section of a catalogue, and why each lighter one fails.

Speed by design:
1. Superposition: each load case is solved once with unit rigidities, plus one unit self-weight
   solution. A section's actions are A_loads + m * A_unit_weight (m: its mass per length); its
   displacements are the unit-rigidity ones divided by its own rigidities, problem by problem.
   Exact without springs; with springs the forces depend on stiffness and each section is solved.
2. Screen, every section x combination x station at once, one block of sections at a time. Each
   action of a block is one matrix product [c_s, c_s m_s] @ [A_loads; A_unit_weight]. Axial force,
   buckling and deflection are the check's own values (double precision) at the screen's stations,
   which the check uses too: true lower bounds, and exact unless a distributed axial load makes N
   peak between them (the check adds such points). Bending, shear, interaction and equivalent
   stress are estimated from the per-unit-action peaks (|sigma| <= sum |action_i| * peak_i) in single
   precision: these estimates only choose which checks to prove and at which station.
3. Lower bound: where an estimate says "fails", the full stress field (double precision) at the
   screen's worst station, a station the full check also uses, gives a true lower bound of the full
   check; above 1.0 the section certainly fails.
4. Confirm: the choice, the runners-up shown, and every section the bounds cannot decide rest on
   the full stress-field check (checks.check_design), the same as `sizer check`; without springs a
   section's solution is the unit-rigidity one rescaled (analysis.MemberSolution.for_section).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import Any, Callable, Iterator, Sequence

import numpy as np

from sizer.analysis import MemberSolution, solve_member, stations
from sizer.checks import (CheckReport, StationStresses, check_design, full_field_stresses, relative_to_supports, span_points, spans,
                          to_section_axes, weakest_buckling_stresses)
from sizer.design import Design, oriented_stiffness
from sizer.errors import InputError
from sizer.model import Material, Member, Stiffness

SCREEN_BLOCK = 65_536  # station values per block of sections (single precision: fits the CPU caches)
STRESS_CHECKS = ("bending", "interaction", "shear", "equivalent")
SINGLE = np.float32


@dataclass(frozen=True)
class CandidateTable:
    """One value per candidate (rows in candidate order), SI: m^2, m^4, kg/m, Pa per unit action."""

    area: np.ndarray
    J: np.ndarray
    Iz: np.ndarray
    Iy: np.ndarray
    I11: np.ndarray
    I22: np.ndarray
    mass: np.ndarray
    sigma_peak: np.ndarray  # (S, 3) |sigma| per unit N, My, Mz (section axes)
    tau_peak: np.ndarray  # (S, 3) |tau| per unit Vy, Vz, T
    buckling_stress: np.ndarray  # smaller flexural buckling stress of the two principal axes
    compression_allowable: np.ndarray  # Fa for the interaction: the compression allowable, reduced to sigma_cr / safety factor where lower


@dataclass
class Screen:
    """What the screen found for every candidate (rows as in CandidateTable)."""

    exact: dict[str, np.ndarray]  # check -> (S,) the check's own value at the screen's stations: axial, buckling, deflection
    estimate: dict[str, np.ndarray]  # stress check -> (S,) largest utilization from the peaks (single precision)
    worst: dict[str, np.ndarray]  # stress check -> (S,) flat (combination x station) row of that estimate
    loads: np.ndarray  # (C x N, 6) actions of the loads alone at the stations, section axes
    per_mass: np.ndarray  # (C x N, 6) actions per kg/m of self weight, section axes
    table: CandidateTable


@dataclass
class Candidate:
    """One catalogue section in the sizing run."""

    name: str
    spec: Any
    mass_per_length: float
    density: float
    index: int  # row in the CandidateTable and the Screen
    screen: Screen | None = None
    proven: dict[str, float] = field(default_factory=dict)  # stress check -> lower bound from the full field at one station
    report: CheckReport | None = None  # full check, where made

    @cached_property
    def props(self) -> Any:
        from sizer.sections import section_properties

        return section_properties(self.spec, self.density)

    @property
    def bounds(self) -> dict[str, float]:
        """check -> proven lower bound of its utilization (the screen's axial, buckling and deflection values, and
        the full field at single stations)."""
        exact = {name: float(values[self.index]) for name, values in self.screen.exact.items()} if self.screen else {}
        return {**exact, **self.proven}

    @property
    def decided_by(self) -> str:
        return "full stress field" if self.report is not None else "screen"

    @property
    def passes(self) -> bool:
        return self.report.passes if self.report is not None else False

    @property
    def lower_bound(self) -> tuple[str, float]:
        """(check, utilization) of the largest proven lower bound."""
        return max(self.bounds.items(), key=lambda item: item[1], default=("", 0.0))

    @property
    def certainly_fails(self) -> bool:
        return self.report is None and self.lower_bound[1] > 1.0

    @property
    def utilization(self) -> float:
        return self.report.utilization if self.report is not None else self.lower_bound[1]

    @property
    def governing(self) -> str:
        if self.report is not None:
            return self.report.governing.check if self.report.governing is not None else ""
        return self.lower_bound[0]


@dataclass
class SizingResult:
    member: Member
    material: Material
    candidates: list[Candidate]  # every candidate after filters, by mass per length
    chosen: Candidate | None
    strongest: Candidate | None = None  # when nothing passes: the least utilized on the full check
    notes: list[str] = field(default_factory=list)

    @property
    def full_checks(self) -> int:
        return sum(1 for c in self.candidates if c.report is not None)


# ----------------------------------------------------------------------------------------------
# candidates

def candidate_sections(catalogue: Any, member: Member, material: Material, families: Sequence[str],
                       max_depth: float | None, max_width: float | None,
                       progress: Callable[[int, int, str], None] | None = None) -> tuple[list[Candidate], CandidateTable]:
    """Catalogue sections after the filters, sorted by mass per length, and their table (from the
    cached properties; any not cached are computed first, reporting to `progress`). Depth and width
    are as installed (a minor orientation swaps them)."""
    from sizer.sections.properties import SCALAR_NAMES, SIGMA_PEAK_NAMES, TAU_PEAK_NAMES, section_table

    specs = catalogue.select(families)
    if not specs:
        files = ", ".join(str(path) for path in catalogue.files) or "the catalogue"
        raise InputError(files, "sections", "the catalogue holds no sections", "add [[sections]] entries, or pass --catalogue with a stock list")
    table = section_table(specs, progress=progress)
    column = {name: table[:, k] for k, name in enumerate(SCALAR_NAMES)}
    depth, width = (column["depth"], column["width"]) if member.orientation == "major" else (column["width"], column["depth"])
    keep = np.ones(len(specs), bool)
    if max_depth is not None:
        keep &= depth <= max_depth * (1 + 1e-9)
    if max_width is not None:
        keep &= width <= max_width * (1 + 1e-9)
    if not keep.any():
        raise InputError("", "--max-depth", "no catalogue section fits the depth and width limits", "relax --max-depth / --max-width")
    mass = column["area"] * material.density
    order = sorted(np.flatnonzero(keep).tolist(), key=lambda i: (mass[i], specs[i].name))
    rows = {name: values[order] for name, values in column.items()}
    candidates = [Candidate(specs[i].name, specs[i], float(mass[i]), material.density, k) for k, i in enumerate(order)]
    buckling = weakest_buckling_stresses(member, rows["area"], rows["I11"], rows["I22"], material)
    return candidates, CandidateTable(
        rows["area"], rows["J"], rows["Iz"], rows["Iy"], rows["I11"], rows["I22"], mass[order],
        np.column_stack([rows[name] for name in SIGMA_PEAK_NAMES]), np.column_stack([rows[name] for name in TAU_PEAK_NAMES]),
        buckling, np.minimum(material.allowable.compression or np.inf, buckling / member.checks.buckling_safety_factor))


def design_for(member: Member, material: Material, candidate: Candidate, base: MemberSolution | None = None) -> Design:
    """A solved Design for one candidate (its own stiffness and self-weight): the unit-rigidity
    solution `base` rescaled when given (no springs), else solved."""
    stiffness = oriented_stiffness(candidate.props, material, member.orientation)
    mass = candidate.mass_per_length if member.self_weight_case else None
    solution = base.for_section(stiffness, mass) if base is not None else solve_member(member, stiffness, mass)
    return Design(member, solution, material, candidate.spec, candidate.props, stiffness, candidate.mass_per_length)


def full_check(member: Member, material: Material, candidate: Candidate, base: MemberSolution | None) -> CheckReport:
    """The full stress-field check of one candidate (the same as `sizer check`)."""
    from sizer.sections import unit_stress_field

    if candidate.report is None:
        candidate.report = check_design(design_for(member, material, candidate, base), unit_stress_field(candidate.spec))
    return candidate.report


# ----------------------------------------------------------------------------------------------
# screen

def load_and_weight_factors(base: MemberSolution) -> np.ndarray:
    """(2C, n_cases + 1) combination factors: the loads alone (rows 0..C-1), then the self-weight
    per kg/m (rows C..2C-1), for MemberSolution.weighted_actions / weighted_displacements."""
    loads = base.weights(None)
    return np.vstack([loads, base.weights(1.0) - loads])


def screen(table: CandidateTable, member: Member, material: Material, base: MemberSolution, n_even: int = 200) -> Screen:
    """Exact axial, buckling and deflection utilizations and the stress estimates of every candidate,
    at the section-independent stations (all of which the full check also uses)."""
    xs, sides = stations(member, n_even)
    loads, per_mass = (to_section_axes(part, member.orientation).reshape(-1, 6)
                       for part in np.split(base.weighted_actions(load_and_weight_factors(base), xs, sides), 2))
    exact, estimate, worst = stress_screen(table, loads, per_mass, material, member)
    deflection = deflection_screen(table, member, material, base)
    if deflection is not None:
        exact["deflection"] = deflection
    return Screen(exact, estimate, worst, loads, per_mass, table)


def _scaled(coefficient: np.ndarray, mass: np.ndarray, pair: np.ndarray) -> np.ndarray:
    """(S, K) coefficient_s * (loads_k + mass_s * per_mass_k) as one matrix product; pair is (2, K)."""
    return np.column_stack([coefficient, coefficient * mass]).astype(pair.dtype) @ pair


def stress_screen(table: CandidateTable, loads: np.ndarray, per_mass: np.ndarray, material: Material,
                  member: Member) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray], dict[str, np.ndarray]]:
    """(axial and buckling utilizations at the stations, stress-check estimates, their worst rows) of every
    candidate; loads and per_mass (K, 6) in section axes. Blocks of sections keep each array in cache."""
    allow = material.allowable
    count, rows = len(table.mass), loads.shape[0]
    pairs64 = [np.stack([loads[:, j], per_mass[:, j]]) for j in range(6)]
    present = [bool(np.any(pair)) for pair in pairs64]
    pairs = [pair.astype(SINGLE) for pair in pairs64]
    wanted = [name for name in STRESS_CHECKS if _allowable(allow, name)]
    if not present[0] or not (present[4] or present[5]):
        wanted = [name for name in wanted if name != "interaction"]  # the check needs axial force and bending together
    n_max, n_min = np.empty(count), np.empty(count)
    estimate = {name: np.zeros(count) for name in wanted}
    worst = {name: np.zeros(count, int) for name in wanted}
    step = max(1, SCREEN_BLOCK // max(rows, 1))
    for start in range(0, count, step):
        block = slice(start, min(start + step, count))
        mass = table.mass[block]
        if present[0]:
            axial = _scaled(np.ones(len(mass)), mass, pairs64[0])  # N, exact
            n_max[block], n_min[block] = axial.max(axis=1), axial.min(axis=1)
        else:
            n_max[block] = n_min[block] = 0.0
        fa = _scaled(1.0 / table.area[block], mass, pairs[0])
        fb = _peak_sum(table.sigma_peak[block], [1, 2], [4, 5], mass, pairs, present)
        fv = _peak_sum(table.tau_peak[block], [0, 1, 2], [1, 2, 3], mass, pairs, present)
        for name, (values, scale) in _stress_estimates(fa, fb, fv, allow, table.compression_allowable[block], wanted):
            at = values.argmax(axis=1)
            estimate[name][block], worst[name][block] = scale(values[np.arange(len(at)), at]), at
    tension, compression = np.maximum(n_max, 0.0) / table.area, np.maximum(-n_min, 0.0) / table.area
    exact = {"axial": np.maximum(tension / (allow.tension or np.inf), compression / (allow.compression or np.inf)),
             "buckling": compression / (table.buckling_stress / member.checks.buckling_safety_factor)}
    return exact, estimate, worst


def _allowable(allow: Any, check: str) -> float | None:
    return allow.bending if check in ("bending", "interaction") else getattr(allow, check)


def _peak_sum(peaks: np.ndarray, peak_columns: list[int], action_columns: list[int], mass: np.ndarray, pairs: list[np.ndarray],
              present: list[bool]) -> np.ndarray:
    """(S, K) sum over the given actions of |action| * the section's peak stress per unit action."""
    total = np.zeros((len(mass), pairs[0].shape[1]), SINGLE)
    for peak, action in zip(peak_columns, action_columns):
        if present[action]:
            total += np.abs(_scaled(peaks[:, peak], mass, pairs[action]))
    return total


def _stress_estimates(fa: np.ndarray, fb: np.ndarray, fv: np.ndarray, allow: Any, fa_allow: np.ndarray,
                      wanted: list[str]) -> Iterator[tuple[str, tuple[np.ndarray, Callable[[np.ndarray], np.ndarray]]]]:
    """For each wanted stress check: (S, K) values whose largest marks the worst row, and the map from
    that value to the utilization estimate (same formulas as checks.py). Consumes fa, fb and fv."""
    if "bending" in wanted:
        yield "bending", (fb, lambda value: value / allow.bending)
    if "shear" in wanted:
        yield "shear", (fv, lambda value: value / allow.shear)
    if "interaction" in wanted:
        interaction = np.maximum(fa * SINGLE(1.0 / (allow.tension or np.inf)), fa * (-1.0 / fa_allow).astype(SINGLE)[:, None])
        interaction += fb * SINGLE(1.0 / allow.bending)
        yield "interaction", (interaction, lambda value: value)
    if "equivalent" in wanted:  # (|fa| + fb)^2 + 3 fv^2, in place
        normal = np.abs(fa, out=fa)
        normal += fb
        normal *= normal
        fv *= fv
        fv *= SINGLE(3.0)
        normal += fv
        yield "equivalent", (normal, lambda value: np.sqrt(value) / allow.equivalent)


def deflection_screen(table: CandidateTable, member: Member, material: Material, base: MemberSolution, n: int = 201) -> np.ndarray | None:
    """Deflection utilization of every candidate from the unit-rigidity solution (no springs), at the
    same points and relative to the same reference (chord between supports, or the overhang's
    support) as the check. The worst point of each section is found with the squared deflection
    expanded as one matrix product, then its deflection is computed directly: the value at a point
    the check uses (a true lower bound of the check, and its exact value save for round-off in
    choosing the point)."""
    settings = member.checks
    span_list = spans(member)
    if settings.deflection_limit is None or not span_list:
        return None
    combos = [base.combination_names.index(name) for name in (settings.deflection_combinations or base.combination_names)]
    overhang_limit = settings.deflection_limit_overhang or settings.deflection_limit / 2
    moved = base.weighted_displacements(load_and_weight_factors(base), np.concatenate([span_points(span, n) for span in span_list]))
    zero, unit = (np.split(part[combos][..., 1:3], len(span_list), axis=1) for part in np.split(moved, 2))  # uy, uz per span
    per_allowable = [(overhang_limit if span.overhang else settings.deflection_limit) / span.length for span in span_list]
    a, b = (np.concatenate([relative_to_supports(part, span).reshape(-1, 2) * scale for part, span, scale in zip(parts, span_list, per_allowable)])
            for parts in (zero, unit))  # (points, 2): loads alone and per kg/m, over allowable, at unit rigidities
    stiffness = oriented_stiffness(table, material, member.orientation)
    u, v, m = 1.0 / stiffness.EIz**2, 1.0 / stiffness.EIy**2, table.mass
    terms = np.stack([a[:, 0] ** 2, a[:, 0] * b[:, 0], b[:, 0] ** 2, a[:, 1] ** 2, a[:, 1] * b[:, 1], b[:, 1] ** 2])
    weights = np.column_stack([u, 2 * u * m, u * m * m, v, 2 * v * m, v * m * m])
    step = max(1, SCREEN_BLOCK // 2 // len(a))  # double precision: half the values of a stress block
    at = np.concatenate([(weights[start:start + step] @ terms).argmax(axis=1) for start in range(0, len(m), step)])
    return np.hypot((a[at, 0] + m * b[at, 0]) / stiffness.EIz, (a[at, 1] + m * b[at, 1]) / stiffness.EIy)


def prove_lower_bounds(candidate: Candidate, material: Material) -> None:
    """The full stress field at the screen's worst station of each stress check estimated to fail:
    true lower bounds of the full check (it uses these stations too)."""
    from sizer.sections import unit_stress_field

    screen_result = candidate.screen
    wanted = [name for name, values in screen_result.estimate.items() if values[candidate.index] > 1.0 and name not in candidate.proven]
    if not wanted:
        return
    rows = sorted({int(screen_result.worst[name][candidate.index]) for name in wanted})
    actions = (screen_result.loads[rows] + candidate.mass_per_length * screen_result.per_mass[rows])[None]
    stress = full_field_stresses(actions, unit_stress_field(candidate.spec), float(screen_result.table.area[candidate.index]))
    compression = float(screen_result.table.compression_allowable[candidate.index])
    for name in wanted:
        k = rows.index(int(screen_result.worst[name][candidate.index]))
        candidate.proven[name] = _stress_utilization(name, stress, k, material.allowable, compression)


def _stress_utilization(name: str, stress: StationStresses, k: int, allow: Any, compression_allowable: float) -> float:
    """Utilization of one stress check at station k of `stress` (same formulas as checks.py)."""
    if name == "bending":
        return float(stress.bending[0, k] / allow.bending)
    if name == "shear":
        return float(stress.shear[0, k] / allow.shear)
    if name == "equivalent":
        return float(stress.equivalent[0, k] / allow.equivalent)
    fa = float(stress.axial[0, k])  # interaction: this station's fa and fb together
    fa_allow = (allow.tension or np.inf) if fa >= 0 else compression_allowable
    return float(abs(fa) / fa_allow + stress.bending[0, k] / allow.bending)


# ----------------------------------------------------------------------------------------------
# search

def size_member(member: Member, catalogue: Any, material: Material, families: Sequence[str] = (),
                max_depth: float | None = None, max_width: float | None = None, top: int = 3,
                progress: Callable[[int, int, str], None] | None = None) -> SizingResult:
    """The lightest candidate that passes every check on the full stress field, with runners-up
    (`progress` hears of any section properties computed first)."""
    candidates, table = candidate_sections(catalogue, member, material, families, max_depth, max_width, progress)
    notes = [f"{len(candidates)} candidate sections after filters, each with its own self-weight, in material "
             f"{material.name} (the member's)."]
    base = None
    if member.has_springs:
        for candidate in candidates:
            full_check(member, material, candidate, None)
        notes.append("Spring supports: forces depend on stiffness, so every candidate was solved and checked in full.")
    else:
        base = solve_member(member, Stiffness.unit(), None)
        found = screen(table, member, material, base)
        for candidate in candidates:
            candidate.screen = found
        notes.append("Screened all candidates at once (one solve per load case and one unit self-weight solve, "
                     "superposed); a lighter section is ruled out only by a proven lower bound of its full check; "
                     "every verdict of a section shown in full rests on the full stress-field check.")
    chosen = first_passing(candidates, member, material, base)
    confirm_runners_up(member, material, candidates, chosen, top, base)
    strongest = None if chosen is not None else least_utilized(candidates, member, material, base)
    return SizingResult(member, material, candidates, chosen, strongest, notes)


def first_passing(candidates: list[Candidate], member: Member, material: Material, base: MemberSolution | None) -> Candidate | None:
    """Walk up by mass: skip sections a lower bound rules out, fully check the rest until one passes."""
    return next((candidate for candidate in candidates if passes_in_full(candidate, member, material, base)), None)


def passes_in_full(candidate: Candidate, member: Member, material: Material, base: MemberSolution | None) -> bool:
    """False at once when a proven lower bound rules the candidate out (the double-precision parts of the screen,
    then the full field at the screen's worst stations); else the verdict of the full check."""
    if candidate.screen is not None and candidate.report is None:
        if candidate.certainly_fails:
            return False
        prove_lower_bounds(candidate, material)
        if candidate.certainly_fails:
            return False
    return full_check(member, material, candidate, base).passes


def least_utilized(candidates: list[Candidate], member: Member, material: Material, base: MemberSolution | None) -> Candidate:
    """When nothing passes: the candidate with the smallest full-check utilization. Sections are
    fully checked in order of their lower bound until no lower bound can beat the best found."""
    best: Candidate | None = None
    for candidate in sorted(candidates, key=lambda c: c.utilization):
        if best is not None and candidate.utilization >= best.utilization:
            break
        full_check(member, material, candidate, base)
        if best is None or candidate.utilization < best.utilization:
            best = candidate
    return best


def confirm_runners_up(member: Member, material: Material, candidates: list[Candidate], chosen: Candidate | None, top: int,
                       base: MemberSolution | None) -> None:
    """Full checks for the `top` lighter sections just below the choice and the `top` heavier ones that
    pass (heavier ones a lower bound rules out are skipped)."""
    if chosen is None:
        return
    position = candidates.index(chosen)
    for candidate in candidates[max(0, position - top):position]:
        full_check(member, material, candidate, base)
    heavier = 0
    for candidate in candidates[position + 1:]:
        if heavier >= top:
            break
        heavier += passes_in_full(candidate, member, material, base)
