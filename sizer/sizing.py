"""The lightest passing section of a catalogue, and why each lighter one fails.

Speed by design:
1. Superposition: each load case is solved once with unit rigidities, plus one unit self-weight
   solution. A section's actions are A_loads + m * A_unit_weight (m: its mass per length); its
   displacements are the unit-rigidity ones divided by its own EA, EIz, EIy, GJ per component.
   Exact without springs; with springs the forces depend on stiffness and each section is solved.
2. Screen: all sections x combinations x stations at once with numpy, using conservative bounds
   from the per-unit-action peak stresses (|sigma| <= sum |action_i| * peak_i). Axial, buckling and
   deflection are exact in the screen.
3. Confirm: the final choice, the runners-up shown, and every section the screen cannot decide
   rest on the full stress-field check (checks.check_design), the same as `sizer check` gives.
A section whose screen bound passes cannot fail the full check at the screen's stations; a section
whose exact screen part (axial, buckling, deflection) fails cannot pass. Everything else is confirmed.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Sequence

import numpy as np

from sizer.analysis import MemberSolution, solve_member
from sizer.checks import CheckReport, buckling_axes, check_design, check_stations, critical_stress, member_actions, spans, to_section_axes
from sizer.design import Design, oriented_stiffness
from sizer.errors import InputError
from sizer.model import Material, Member, Stiffness
from sizer.units import GRAVITY

EXACT_IN_SCREEN = ("axial", "buckling", "deflection")


@dataclass
class Candidate:
    """One catalogue section in the sizing run."""

    name: str
    spec: Any
    props: Any
    mass_per_length: float
    screen_utilization: float = 0.0  # conservative upper bound over every check
    screen_governing: str = ""
    exact_utilization: float = 0.0  # exact checks of the screen (axial, buckling, deflection)
    exact_governing: str = ""
    report: CheckReport | None = None  # full check, where made
    design: Design | None = None

    @property
    def decided_by(self) -> str:
        return "full stress field" if self.report is not None else "screen"

    @property
    def passes(self) -> bool:
        if self.report is not None:
            return self.report.passes
        return False

    @property
    def utilization(self) -> float:
        return self.report.utilization if self.report is not None else self.exact_utilization

    @property
    def governing(self) -> str:
        if self.report is not None and self.report.governing is not None:
            return self.report.governing.check
        return self.exact_governing


@dataclass
class SizingResult:
    member: Member
    material: Material
    candidates: list[Candidate]  # every candidate after filters, by mass per length
    chosen: Candidate | None
    strongest: Candidate | None = None  # when nothing passes: the best the catalogue has
    notes: list[str] = field(default_factory=list)
    full_checks: int = 0


# ----------------------------------------------------------------------------------------------
# candidates

def candidate_sections(catalogue: Any, member: Member, material: Material, families: Sequence[str],
                       max_depth: float | None, max_width: float | None) -> list[Candidate]:
    """Catalogue sections after the filters, with properties (cached), sorted by mass per length."""
    from sizer.sections import section_properties_many

    specs = [spec for spec in catalogue.sections.values() if not families or spec.family in families]
    if not specs:
        raise InputError("", "--family", "no catalogue section is in the families " + ", ".join(families),
                         "use a family from `sizer sections list`, or drop --family")
    properties = section_properties_many(specs, material.density)
    candidates = []
    for spec, props in zip(specs, properties):
        depth, width = (props.depth, props.width) if member.orientation == "major" else (props.width, props.depth)
        if max_depth is not None and depth > max_depth * (1 + 1e-9):
            continue
        if max_width is not None and width > max_width * (1 + 1e-9):
            continue
        candidates.append(Candidate(spec.name, spec, props, props.area * material.density))
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


# ----------------------------------------------------------------------------------------------
# screen

@dataclass(frozen=True)
class ScreenArrays:
    """Per-section arrays for the screen (one entry per candidate)."""

    area: np.ndarray
    mass: np.ndarray
    sigma_peak: np.ndarray  # (s, 3) |sigma| per unit N, My, Mz (section axes)
    tau_peak: np.ndarray  # (s, 3) |tau| per unit Vy, Vz, T
    stiffness: np.ndarray  # (s, 4) EA, GJ, EIz, EIy
    buckling_stress: np.ndarray  # (s,) smallest critical stress of the two principal axes


def screen_arrays(candidates: list[Candidate], member: Member, material: Material) -> ScreenArrays:
    from sizer.sections import peak_unit_stresses

    peaks = [peak_unit_stresses(c.spec) for c in candidates]
    stiffness = [oriented_stiffness(c.props, material, member.orientation) for c in candidates]
    buckling = []
    for c in candidates:
        lengths = (member.checks.buckling_length_major or member.length, member.checks.buckling_length_minor or member.length)
        radii = (np.sqrt(c.props.I11 / c.props.area), np.sqrt(c.props.I22 / c.props.area))
        buckling.append(min(critical_stress(l / r, material.elastic_modulus, material.yield_strength)[0] for l, r in zip(lengths, radii)))
    return ScreenArrays(
        area=np.array([c.props.area for c in candidates]),
        mass=np.array([c.mass_per_length for c in candidates]),
        sigma_peak=np.array([p[0] for p in peaks]),
        tau_peak=np.array([p[1] for p in peaks]),
        stiffness=np.array([[s.EA, s.GJ, s.EIz, s.EIy] for s in stiffness]),
        buckling_stress=np.array(buckling),
    )


def screen(candidates: list[Candidate], member: Member, material: Material, base: Design, n_even: int = 200) -> None:
    """Fill screen_utilization/governing (upper bounds) and exact_utilization/governing of each candidate."""
    arrays = screen_arrays(candidates, member, material)
    xs, sides = check_stations(base, n_even)
    loads_actions, weight_actions = _split_actions(base, xs, sides)
    allow = material.allowable
    names, upper, exact = [], [], []
    for s in range(len(candidates)):
        actions = to_section_axes(loads_actions + arrays.mass[s] * weight_actions, member.orientation)
        checks = _screen_one(actions, arrays, s, allow, member, material)
        names = list(checks)
        upper.append([checks[n][0] for n in names])
        exact.append([checks[n][1] for n in names])
    deflection = screen_deflection(candidates, member, base, arrays)
    for s, candidate in enumerate(candidates):
        values = dict(zip(names, upper[s]))
        exacts = {n: e for n, e in zip(names, exact[s]) if e is not None}
        if deflection is not None:
            values["deflection"] = exacts["deflection"] = float(deflection[s])
        candidate.screen_governing, candidate.screen_utilization = max(values.items(), key=lambda item: item[1])
        if exacts:
            candidate.exact_governing, candidate.exact_utilization = max(exacts.items(), key=lambda item: item[1])


def _split_actions(base: Design, xs: np.ndarray, sides: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Actions (n_comb, n_st, 6) from the loads alone, and per kg/m of self-weight."""
    solution = base.solution
    total_zero = np.empty((len(solution.combination_names), len(xs), 6))
    total_one = np.empty_like(total_zero)
    for side in ("left", "right"):
        mask = sides == side
        if mask.any():
            total_zero[:, mask] = solution.all_actions(xs[mask], side, mass_per_length=None)
            total_one[:, mask] = solution.all_actions(xs[mask], side, mass_per_length=1.0)
    return total_zero, total_one - total_zero


def _screen_one(actions: np.ndarray, arrays: ScreenArrays, s: int, allow: Any, member: Member, material: Material) -> dict[str, tuple[float, float | None]]:
    """Upper-bound and exact utilizations of one section: check -> (upper, exact or None)."""
    area = arrays.area[s]
    sp, tp = arrays.sigma_peak[s], arrays.tau_peak[s]
    fa = actions[..., 0] / area
    fb = np.abs(actions[..., 4]) * sp[1] + np.abs(actions[..., 5]) * sp[2]
    fv = np.abs(actions[..., 1]) * tp[0] + np.abs(actions[..., 2]) * tp[1] + np.abs(actions[..., 3]) * tp[2]
    out: dict[str, tuple[float, float | None]] = {}
    tension, compression = np.maximum(fa, 0).max(), np.maximum(-fa, 0).max()
    axial = max(tension / allow.tension if tension > 0 and allow.tension else 0.0,
                compression / allow.compression if compression > 0 and allow.compression else 0.0)
    out["axial"] = (axial, axial)
    if allow.bending:
        out["bending"] = (fb.max() / allow.bending, None)
    if allow.shear:
        out["shear"] = (fv.max() / allow.shear, None)
    if allow.equivalent:
        out["equivalent"] = (np.sqrt((np.abs(fa) + fb) ** 2 + 3 * fv**2).max() / allow.equivalent, None)
    factor = member.checks.buckling_safety_factor
    buckling_allow = arrays.buckling_stress[s] / factor
    buckling = compression / buckling_allow if compression > 0 else 0.0
    out["buckling"] = (buckling, buckling)
    if allow.bending and (tension > 0 or compression > 0):
        fa_allow_c = min(allow.compression or np.inf, buckling_allow)
        ratio = np.where(fa >= 0, fa / (allow.tension or np.inf), -fa / fa_allow_c) + fb / allow.bending
        out["interaction"] = (ratio.max(), None)
    return {name: (float(u), None if e is None else float(e)) for name, (u, e) in out.items()}


def screen_deflection(candidates: list[Candidate], member: Member, base: Design, arrays: ScreenArrays, n: int = 201) -> np.ndarray | None:
    """Exact deflection utilization of every candidate from the unit-rigidity solution (no springs)."""
    settings = member.checks
    if settings.deflection_limit is None:
        return None
    combos = list(settings.deflection_combinations or base.solution.combination_names)
    index = [base.solution.combination_names.index(name) for name in combos]
    overhang_limit = settings.deflection_limit_overhang or settings.deflection_limit / 2
    worst = np.zeros(len(candidates))
    for span in spans(member):
        xs = np.linspace(span.start, span.end, n)
        points = np.append(xs, span.base if span.overhang else span.start)
        zero = base.solution.all_displacements(points, mass_per_length=None)[index][..., 1:3]
        unit = base.solution.all_displacements(points, mass_per_length=1.0)[index][..., 1:3] - zero
        relative_zero, relative_unit = _relative(zero, span), _relative(unit, span)
        ei = arrays.stiffness[:, [2, 3]]  # EIz for uy, EIy for uz
        moved = (relative_zero[None] + arrays.mass[:, None, None, None] * relative_unit[None]) / ei[:, None, None, :]
        size = np.hypot(moved[..., 0], moved[..., 1]).max(axis=(1, 2))
        limit = overhang_limit if span.overhang else settings.deflection_limit
        worst = np.maximum(worst, size / (span.length / limit))
    return worst


def _relative(moved: np.ndarray, span: Any) -> np.ndarray:
    """(c, n, 2) displacements relative to the span's supports (last point: the overhang's base)."""
    body = moved[:, :-1]
    if span.overhang:
        return body - moved[:, -1:, :]
    t = np.linspace(0.0, 1.0, body.shape[1])[None, :, None]
    return body - ((1 - t) * body[:, :1] + t * body[:, -1:])


# ----------------------------------------------------------------------------------------------
# search

def full_check(member: Member, material: Material, candidate: Candidate) -> CheckReport:
    """The full stress-field check of one candidate (the same as `sizer check`)."""
    from sizer.sections import unit_stress_field

    if candidate.report is None:
        candidate.design = design_for(member, material, candidate)
        candidate.report = check_design(candidate.design, unit_stress_field(candidate.spec))
    return candidate.report


def size_member(member: Member, catalogue: Any, material: Material, families: Sequence[str] = (),
                max_depth: float | None = None, max_width: float | None = None, top: int = 3) -> SizingResult:
    """The lightest candidate that passes every check on the full stress field, with runners-up."""
    candidates = candidate_sections(catalogue, member, material, families, max_depth, max_width)
    notes = [f"{len(candidates)} candidate sections after filters, each with its own self-weight, in material {material.name} (the member's)."]
    if has_springs(member):
        for candidate in candidates:
            full_check(member, material, candidate)
        notes.append("Spring supports: forces depend on stiffness, so every candidate was solved and checked in full.")
    else:
        base = Design(member, solve_member(member, Stiffness.unit(), None), material)
        screen(candidates, member, material, base)
        notes.append("Screened with conservative per-unit peak stresses (superposition of one solve per load case and one unit "
                     "self-weight solve); every verdict shown rests on the full stress-field check.")
    chosen = None
    for index, candidate in enumerate(candidates):
        if candidate.report is None and candidate.exact_utilization > 1.0:
            continue  # an exact check (axial, buckling or deflection) already fails
        if full_check(member, material, candidate).passes:
            chosen = candidate
            break
    confirm_runners_up(member, material, candidates, chosen, top)
    strongest = None
    if chosen is None:
        strongest = min(candidates, key=lambda c: c.report.utilization if c.report else c.screen_utilization)
        full_check(member, material, strongest)
    full = sum(1 for c in candidates if c.report is not None)
    return SizingResult(member, material, candidates, chosen, strongest, notes, full)


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
        if candidate.exact_utilization > 1.0:
            continue
        if full_check(member, material, candidate).passes:
            heavier += 1
