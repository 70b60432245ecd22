"""The lightest passing section of a catalogue, and why each lighter one fails.

Speed by design:
1. Superposition: each load case is solved once with unit rigidities, plus one unit self-weight
   solution. A section's actions are A_loads + m * A_unit_weight (m: its mass per length); its
   displacements are the unit-rigidity ones divided by its own EIz, EIy per component. Exact
   without springs; with springs the forces depend on stiffness and each section is solved.
2. Screen: every section x combination x station at once with numpy. Upper bounds of each stress
   from the per-unit-action peaks (|sigma| <= sum |action_i| * peak_i); axial, buckling and
   deflection are exact.
3. Lower bound: where the upper bound says "fails", the full stress field at the screen's worst
   stations (stations the full check also uses) gives a true lower bound of the full check; above
   1.0 the section certainly fails.
4. Confirm: the choice, the runners-up shown, and every section the bounds cannot decide rest on
   the full stress-field check (checks.check_design), the same as `sizer check`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Sequence

import numpy as np

from sizer.analysis import solve_member, stations
from sizer.checks import (CheckReport, StationStresses, buckling_axes, check_design, full_field_stresses, relative_to_supports, spans,
                          to_section_axes)
from sizer.design import Design, oriented_stiffness
from sizer.errors import InputError
from sizer.model import Material, Member, Stiffness

SCREEN_CHUNK = 30_000  # section x combination x station values screened at once (fits the CPU caches)
STRESS_CHECKS = ("bending", "interaction", "shear", "equivalent")


@dataclass
class Candidate:
    """One catalogue section in the sizing run."""

    name: str
    spec: Any
    props: Any
    mass_per_length: float
    upper: dict[str, float] = field(default_factory=dict)  # check -> upper bound of its utilization
    lower: dict[str, float] = field(default_factory=dict)  # check -> proven lower bound (exact for axial, buckling, deflection)
    worst: dict[str, tuple[int, int]] = field(default_factory=dict)  # check -> (combination, station) of the upper bound
    buckling_stress: float = np.inf  # Pa, smallest flexural buckling stress of the principal axes
    report: CheckReport | None = None  # full check, where made

    @property
    def decided_by(self) -> str:
        return "full stress field" if self.report is not None else "screen"

    @property
    def passes(self) -> bool:
        return self.report.passes if self.report is not None else False

    @property
    def screen_utilization(self) -> float:
        return max(self.upper.values(), default=0.0)

    @property
    def lower_bound(self) -> tuple[str, float]:
        """(check, utilization) of the largest proven lower bound."""
        return max(self.lower.items(), key=lambda item: item[1], default=("", 0.0))

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
                       max_depth: float | None, max_width: float | None) -> list[Candidate]:
    """Catalogue sections after the filters, with properties (cached), sorted by mass per length.
    Depth and width are as installed (a minor orientation swaps them)."""
    from sizer.sections import section_properties_many

    specs = catalogue.select(families)
    properties = section_properties_many(specs, material.density)
    candidates = []
    for spec, props in zip(specs, properties):
        depth, width = (props.depth, props.width) if member.orientation == "major" else (props.width, props.depth)
        if max_depth is not None and depth > max_depth * (1 + 1e-9):
            continue
        if max_width is not None and width > max_width * (1 + 1e-9):
            continue
        weakest = min(axis.critical_stress for axis in buckling_axes(member, props, material))
        candidates.append(Candidate(spec.name, spec, props, props.area * material.density, buckling_stress=weakest))
    if not candidates:
        raise InputError("", "--max-depth", "no catalogue section fits the depth and width limits", "relax --max-depth / --max-width")
    candidates.sort(key=lambda c: (c.mass_per_length, c.name))
    return candidates


def has_springs(member: Member) -> bool:
    return any(support.springs for support in member.supports)


def design_for(member: Member, material: Material, candidate: Candidate) -> Design:
    """A solved Design for one candidate (its own stiffness and self-weight)."""
    stiffness = oriented_stiffness(candidate.props, material, member.orientation)
    mass = candidate.mass_per_length if member.self_weight_case else None
    solution = solve_member(member, stiffness, mass)
    return Design(member, solution, material, candidate.spec, candidate.props, stiffness, candidate.mass_per_length)


def full_check(member: Member, material: Material, candidate: Candidate) -> CheckReport:
    """The full stress-field check of one candidate (the same as `sizer check`)."""
    from sizer.sections import unit_stress_field

    if candidate.report is None:
        candidate.report = check_design(design_for(member, material, candidate), unit_stress_field(candidate.spec))
    return candidate.report


# ----------------------------------------------------------------------------------------------
# screen

@dataclass(frozen=True)
class ScreenData:
    """What the screen needs, for all candidates and the shared stations."""

    xs: np.ndarray
    sides: np.ndarray
    loads: np.ndarray  # (C, N, 6) actions from the loads alone, member axes
    per_mass: np.ndarray  # (C, N, 6) actions per kg/m of self-weight
    area: np.ndarray  # (S,)
    mass: np.ndarray  # (S,)
    sigma_peak: np.ndarray  # (S, 3) |sigma| per unit N, My, Mz (section axes)
    tau_peak: np.ndarray  # (S, 3) |tau| per unit Vy, Vz, T
    buckling_stress: np.ndarray  # (S,) smallest critical stress of the two principal axes


def load_and_weight_factors(base: Design) -> np.ndarray:
    """(2C, n_cases + 1) combination factors: the loads alone (rows 0..C-1), then the self-weight
    per kg/m (rows C..2C-1), for MemberSolution.weighted_actions / weighted_displacements."""
    loads = base.solution.weights(None)
    return np.vstack([loads, base.solution.weights(1.0) - loads])


def screen_data(candidates: list[Candidate], member: Member, base: Design, n_even: int) -> ScreenData:
    """Actions at the section-independent stations (all of which the full check also uses)."""
    from sizer.sections import peak_unit_stresses

    xs, sides = stations(member, n_even)
    loads, per_mass = np.split(base.solution.weighted_actions(load_and_weight_factors(base), xs, sides), 2)
    peaks = [peak_unit_stresses(c.spec) for c in candidates]
    return ScreenData(xs, sides, loads, per_mass,
                      np.array([c.props.area for c in candidates]), np.array([c.mass_per_length for c in candidates]),
                      np.array([p[0] for p in peaks]), np.array([p[1] for p in peaks]),
                      np.array([c.buckling_stress for c in candidates]))


def screen(candidates: list[Candidate], member: Member, material: Material, base: Design, n_even: int = 200) -> ScreenData:
    """Upper bounds (and exact axial, buckling, deflection) for every candidate, in chunks of sections."""
    data = screen_data(candidates, member, base, n_even)
    per_section = data.loads.size // 6
    chunk = max(1, SCREEN_CHUNK // max(per_section, 1))
    for start in range(0, len(candidates), chunk):
        block = slice(start, min(start + chunk, len(candidates)))
        actions = to_section_axes(data.loads[None] + data.mass[block, None, None, None] * data.per_mass[None], member.orientation)
        for name, (values, positions) in screen_block(actions, data, block, material, member).items():
            for offset, candidate in enumerate(candidates[block]):
                candidate.upper[name] = float(values[offset])
                candidate.worst[name] = positions[offset]
                if name in ("axial", "buckling"):
                    candidate.lower[name] = float(values[offset])
    deflection = screen_deflection(candidates, member, base, data)
    if deflection is not None:
        for candidate, value in zip(candidates, deflection):
            candidate.upper["deflection"] = candidate.lower["deflection"] = float(value)
    return data


def _largest(values: np.ndarray) -> tuple[np.ndarray, list[tuple[int, int]]]:
    """Per section (first axis) the largest value of a (S, C, N) array, and its (combination, station)."""
    flat = values.reshape(len(values), -1)
    index = flat.argmax(axis=1)
    combos, points = np.unravel_index(index, values.shape[1:])
    return flat[np.arange(len(flat)), index], list(zip(combos.tolist(), points.tolist()))


def screen_block(actions: np.ndarray, data: ScreenData, block: slice, material: Material, member: Member) -> dict[str, tuple[np.ndarray, list]]:
    """check -> (utilization bound per section, worst (combination, station)) for a block of sections.
    Axial and buckling are exact; bending, shear, equivalent and interaction are upper bounds."""
    allow = material.allowable
    area = data.area[block, None, None]
    sp, tp = data.sigma_peak[block, None, None, :], data.tau_peak[block, None, None, :]
    fa = actions[..., 0] / area
    fb = np.abs(actions[..., 4]) * sp[..., 1] + np.abs(actions[..., 5]) * sp[..., 2]
    fv = np.abs(actions[..., 1]) * tp[..., 0] + np.abs(actions[..., 2]) * tp[..., 1] + np.abs(actions[..., 3]) * tp[..., 2]
    tension, compression = np.maximum(fa, 0.0), np.maximum(-fa, 0.0)
    buckling_allow = data.buckling_stress[block, None, None] / member.checks.buckling_safety_factor
    out = {"axial": _largest(np.maximum(tension / (allow.tension or np.inf), compression / (allow.compression or np.inf))),
           "buckling": _largest(compression * area / (buckling_allow * area))}
    if allow.bending:
        out["bending"] = _largest(fb / allow.bending)
        has_axial = np.abs(fa).max(axis=(1, 2)) > 0
        interaction = tension / (allow.tension or np.inf) + compression / np.minimum(allow.compression or np.inf, buckling_allow) + fb / allow.bending
        values, positions = _largest(interaction)
        out["interaction"] = (np.where(has_axial, values, 0.0), positions)
    if allow.shear:
        out["shear"] = _largest(fv / allow.shear)
    if allow.equivalent:
        out["equivalent"] = _largest(np.sqrt((np.abs(fa) + fb) ** 2 + 3.0 * fv**2) / allow.equivalent)
    return out


def screen_deflection(candidates: list[Candidate], member: Member, base: Design, data: ScreenData, n: int = 201) -> np.ndarray | None:
    """Exact deflection utilization of every candidate from the unit-rigidity solution (no springs);
    the same points and reference (chord between supports, or the overhang's support) as the check."""
    settings = member.checks
    if settings.deflection_limit is None:
        return None
    combos = list(settings.deflection_combinations or base.solution.combination_names)
    index = [base.solution.combination_names.index(name) for name in combos]
    overhang_limit = settings.deflection_limit_overhang or settings.deflection_limit / 2
    stiffness = np.array([[s.EIz, s.EIy] for s in (oriented_stiffness(c.props, base.material, member.orientation) for c in candidates)])
    worst = np.zeros(len(candidates))
    for span in spans(member):
        points = np.append(np.linspace(span.start, span.end, n), span.base if span.overhang else span.start)
        zero, unit = np.split(base.solution.weighted_displacements(load_and_weight_factors(base), points)[..., 1:3], 2)
        relative_zero, relative_unit = relative_to_supports(zero[index], span), relative_to_supports(unit[index], span)
        moved = (relative_zero[None] + data.mass[:, None, None, None] * relative_unit[None]) / stiffness[:, None, None, :]
        size = np.hypot(moved[..., 0], moved[..., 1]).max(axis=(1, 2))
        limit = overhang_limit if span.overhang else settings.deflection_limit
        worst = np.maximum(worst, size / (span.length / limit))
    return worst


def prove_lower_bounds(candidate: Candidate, data: ScreenData, member: Member, material: Material) -> None:
    """The full stress field at the screen's worst stations of each stress check: true lower bounds of
    the full check (it uses these stations too)."""
    from sizer.sections import unit_stress_field

    allow = material.allowable
    wanted = [name for name in STRESS_CHECKS if candidate.upper.get(name, 0.0) > 1.0]
    if not wanted:
        return
    points = sorted({candidate.worst[name] for name in wanted})
    actions = np.stack([data.loads[c, n] + candidate.mass_per_length * data.per_mass[c, n] for c, n in points])[None]
    stress = full_field_stresses(to_section_axes(actions, member.orientation), unit_stress_field(candidate.spec), candidate.props.area)
    for name in wanted:
        k = points.index(candidate.worst[name])
        candidate.lower[name] = _stress_utilization(name, stress, k, allow, candidate, member)


def _stress_utilization(name: str, stress: StationStresses, k: int, allow: Any, candidate: Candidate, member: Member) -> float:
    """Utilization of one stress check at station k of `stress` (same formulas as checks.py)."""
    if name == "bending":
        return float(stress.bending[0, k] / allow.bending)
    if name == "shear":
        return float(stress.shear[0, k] / allow.shear)
    if name == "equivalent":
        return float(stress.equivalent[0, k] / allow.equivalent)
    fa = float(stress.axial[0, k])  # interaction: this station's fa and fb together
    buckling = candidate.buckling_stress / member.checks.buckling_safety_factor
    fa_allow = (allow.tension or np.inf) if fa >= 0 else min(allow.compression or np.inf, buckling)
    return float(abs(fa) / fa_allow + stress.bending[0, k] / allow.bending)


# ----------------------------------------------------------------------------------------------
# search

def size_member(member: Member, catalogue: Any, material: Material, families: Sequence[str] = (),
                max_depth: float | None = None, max_width: float | None = None, top: int = 3) -> SizingResult:
    """The lightest candidate that passes every check on the full stress field, with runners-up."""
    candidates = candidate_sections(catalogue, member, material, families, max_depth, max_width)
    notes = [f"{len(candidates)} candidate sections after filters, each with its own self-weight, in material "
             f"{material.name} (the member's)."]
    if has_springs(member):
        for candidate in candidates:
            full_check(member, material, candidate)
        notes.append("Spring supports: forces depend on stiffness, so every candidate was solved and checked in full.")
        data = None
    else:
        base = Design(member, solve_member(member, Stiffness.unit(), None), material)
        data = screen(candidates, member, material, base)
        notes.append("Screened all candidates at once (one solve per load case and one unit self-weight solve, "
                     "superposed); a lighter section is ruled out only by a proven lower bound of its full check; "
                     "every verdict of a section shown in full rests on the full stress-field check.")
    chosen = first_passing(candidates, member, material, data)
    confirm_runners_up(member, material, candidates, chosen, top)
    strongest = None if chosen is not None else least_utilized(candidates, member, material)
    return SizingResult(member, material, candidates, chosen, strongest, notes)


def first_passing(candidates: list[Candidate], member: Member, material: Material, data: ScreenData | None) -> Candidate | None:
    """Walk up by mass: skip sections a lower bound rules out, fully check the rest until one passes."""
    for candidate in candidates:
        if data is not None and candidate.report is None:
            if candidate.certainly_fails:
                continue
            prove_lower_bounds(candidate, data, member, material)
            if candidate.certainly_fails:
                continue
        if full_check(member, material, candidate).passes:
            return candidate
    return None


def least_utilized(candidates: list[Candidate], member: Member, material: Material) -> Candidate:
    """When nothing passes: the candidate with the smallest full-check utilization. Sections are
    fully checked in order of their lower bound until no lower bound can beat the best found."""
    best: Candidate | None = None
    for candidate in sorted(candidates, key=lambda c: c.utilization):
        if best is not None and candidate.utilization >= best.utilization:
            break
        full_check(member, material, candidate)
        if best is None or candidate.utilization < best.utilization:
            best = candidate
    return best


def confirm_runners_up(member: Member, material: Material, candidates: list[Candidate], chosen: Candidate | None, top: int) -> None:
    """Full checks for the `top` lighter sections just below the choice and the `top` heavier ones that pass."""
    if chosen is None:
        return
    position = candidates.index(chosen)
    for candidate in candidates[max(0, position - top):position]:
        full_check(member, material, candidate)
    heavier = 0
    for candidate in candidates[position + 1:]:
        if heavier >= top:
            break
        if candidate.certainly_fails:
            continue
        if full_check(member, material, candidate).passes:
            heavier += 1
