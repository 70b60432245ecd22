"""The checks of SPEC section 7 for one member and one section: stresses from the internal actions
on the full cross-section stress field, against the user's allowables.

Stress field: the section's unit fields (sections.UnitStressField) give, at every mesh node, the
normal stress per unit N, My, Mz and the shear stress vector per unit Vy, Vz, T (section axes).
Stress is linear in the actions, so the stress at a node for any station is the weighted sum.
Orientation "minor" turns the section a quarter turn on the member: section axes (y_s, z_s) =
(member z, -member y), so Vy_s = Vz, Vz_s = -Vy, My_s = Mz, Mz_s = -My.

Units: stresses in Pa, forces in N, lengths in m. Utilization = demand / allowable (1.0 = at limit).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Iterable

import numpy as np

from sizer.analysis import distinct, load_sign_change_positions, stations, zero_shear_positions
from sizer.design import Design
from sizer.errors import InputError
from sizer.model import Member

CHECK_NAMES = ("axial", "bending", "interaction", "shear", "equivalent", "deflection", "buckling")
CHUNK_VALUES = 4_000_000  # station x node values evaluated at once (memory bound, ~32 MB per array)
ZERO_ACTION = 1e-9  # N or N*m: below this an action is treated as absent (round-off)


@dataclass(frozen=True)
class CheckResult:
    """One check. utilization None: not made (reason says why). demand/allowable in Pa for stresses,
    m for deflection, N for buckling (see `quantity`)."""

    check: str
    utilization: float | None
    demand: float | None = None
    allowable: float | None = None
    at: float | None = None
    combination: str | None = None
    quantity: str = "stress"  # "stress", "deflection", "force", "ratio"
    detail: str = ""  # what the numbers are, e.g. "compression", "about the minor axis", "span 2"

    @property
    def made(self) -> bool:
        return self.utilization is not None

    @property
    def passes(self) -> bool:
        return self.utilization is None or self.utilization <= 1.0


@dataclass
class CheckReport:
    """Every check of one section, the governing one and the verdict."""

    section: str
    checks: list[CheckResult]
    notes: list[str] = field(default_factory=list)
    stations_checked: int = 0
    nodes: int = 0

    @property
    def made(self) -> list[CheckResult]:
        return [c for c in self.checks if c.made]

    @property
    def governing(self) -> CheckResult | None:
        made = self.made
        return max(made, key=lambda c: c.utilization) if made else None

    @property
    def utilization(self) -> float:
        governing = self.governing
        return governing.utilization if governing else 0.0

    @property
    def passes(self) -> bool:
        return all(c.passes for c in self.checks)


# ----------------------------------------------------------------------------------------------
# stations and actions

def check_stations(design: Design, n_even: int = 200) -> tuple[np.ndarray, np.ndarray]:
    """Stations x (m) and sides: supports, loads, hinges (both sides), even spacing, the zero-shear
    points of every combination (local extremes of the bending moments) and the points where a line
    load changes sign (local extremes of the shear forces, axial force and torque)."""
    xs, sides = stations(design.member, n_even)
    names = design.solution.combination_names
    extra = distinct(np.concatenate([zero_shear_positions(design.solution, names), load_sign_change_positions(design.solution, names)]))
    xs = np.concatenate([xs, extra])
    sides = np.concatenate([sides, np.full(extra.shape, "right")])
    order = np.argsort(xs, kind="stable")
    return xs[order], sides[order]


def member_actions(design: Design, xs: np.ndarray, sides: np.ndarray) -> np.ndarray:
    """(n_combinations, n_stations, 6) actions N, Vy, Vz, T, My, Mz at each station, each on its side."""
    return design.solution.all_actions(xs, sides)


def to_section_axes(actions: np.ndarray, orientation: str) -> np.ndarray:
    """Actions in the section's own axes (identity for "major"; quarter turn for "minor")."""
    if orientation != "minor":
        return actions
    turned = actions.copy()
    turned[..., 1], turned[..., 2] = actions[..., 2], -actions[..., 1]
    turned[..., 4], turned[..., 5] = actions[..., 5], -actions[..., 4]
    return turned


# ----------------------------------------------------------------------------------------------
# stresses on the full field

@dataclass(frozen=True)
class StationStresses:
    """Peak stresses (Pa) at every combination and station, each from the full field over all nodes."""

    axial: np.ndarray  # N / A, signed
    bending: np.ndarray  # max |sigma from My and Mz|
    shear: np.ndarray  # max |tau vector from Vy, Vz, T|
    equivalent: np.ndarray  # max sqrt(sigma^2 + 3 tau^2), sigma from N, My, Mz


def full_field_stresses(actions: np.ndarray, unit_field: Any, area: float) -> StationStresses:
    """Peak stresses over the mesh nodes at each (combination, station); actions in section axes.
    Each block of stations is one matrix product per stress component: (n, 3) @ (3, nodes)."""
    flat = actions.reshape(-1, 6)
    sigma = np.asarray(unit_field.sigma)  # (3, p): N, My, Mz
    tau = np.asarray(unit_field.tau)  # (3, p, 2): Vy, Vz, T
    tau_y, tau_z = np.ascontiguousarray(tau[..., 0]), np.ascontiguousarray(tau[..., 1])
    rows = max(1, CHUNK_VALUES // max(sigma.shape[1], 1))
    bending, shear, equivalent = (np.empty(len(flat)) for _ in range(3))
    for start in range(0, len(flat), rows):
        part = flat[start:start + rows]
        bend = part[:, 4:6] @ sigma[1:3]
        normal = bend + part[:, 0:1] * sigma[0]
        shear_sq = (part[:, 1:4] @ tau_y) ** 2 + (part[:, 1:4] @ tau_z) ** 2
        block = slice(start, start + len(part))
        bending[block] = np.abs(bend).max(axis=1)
        shear[block] = np.sqrt(shear_sq.max(axis=1))
        equivalent[block] = np.sqrt((normal * normal + 3.0 * shear_sq).max(axis=1))
    shape = actions.shape[:2]
    return StationStresses(actions[..., 0] / area, bending.reshape(shape), shear.reshape(shape), equivalent.reshape(shape))


class FieldPeaks:
    """Exact largest stresses over all mesh nodes and all (combination, station) rows, found without
    evaluating every row: rows are taken in order of a conservative upper bound (|sigma| <= sum of
    |action_i| x the unit field's peak_i, likewise for shear) and evaluation stops as soon as no
    remaining bound can beat the best exact value. The result equals evaluating every row."""

    FIRST_BATCH = 8  # rows evaluated first; each later batch is twice the one before

    def __init__(self, actions: np.ndarray, unit_field: Any, area: float) -> None:
        self.shape = actions.shape[:2]
        self.flat = actions.reshape(-1, 6)
        self.unit_field = unit_field
        self.area = area
        self.axial = actions[..., 0] / area  # (C, N) exact, signed
        sigma_peak, tau_peak = unit_field.sigma_peak, unit_field.tau_peak
        size = np.abs(self.flat)
        self.bending_upper = size[:, 4] * sigma_peak[1] + size[:, 5] * sigma_peak[2]
        self.shear_upper = size[:, 1:4] @ tau_peak
        self.equivalent_upper = np.sqrt((size[:, 0] * sigma_peak[0] + self.bending_upper) ** 2 + 3.0 * self.shear_upper**2)
        self._exact: dict[int, tuple[float, float, float]] = {}

    def exact(self, rows: np.ndarray) -> np.ndarray:
        """(len(rows), 3) exact bending, shear and equivalent stress (Pa) of the given flat rows."""
        missing = [row for row in rows.tolist() if row not in self._exact]
        if missing:
            stress = full_field_stresses(self.flat[missing][None], self.unit_field, self.area)
            for k, row in enumerate(missing):
                self._exact[row] = (stress.bending[0, k], stress.shear[0, k], stress.equivalent[0, k])
        return np.array([self._exact[row] for row in rows.tolist()]).reshape(-1, 3)

    def largest(self, upper: np.ndarray, value: Any) -> tuple[float, tuple[int, int]]:
        """(largest exact value, (combination, station)); `value(rows, exact)` gives the exact values
        of rows from their exact stresses, and `upper` bounds them row by row."""
        order = np.lexsort((np.arange(len(upper)), -upper))
        best, best_row = -np.inf, 0
        start, batch = 0, self.FIRST_BATCH
        while start < len(order):
            rows = order[start:start + batch]
            if upper[rows[0]] * (1 + 1e-9) + 1e-12 < best:
                break
            values = value(rows, self.exact(rows))
            for row, candidate in zip(rows.tolist(), values.tolist()):
                if candidate > best or (candidate == best and row < best_row):
                    best, best_row = candidate, row
            start, batch = start + batch, 2 * batch
        return float(best), tuple(int(i) for i in np.unravel_index(best_row, self.shape))


# ----------------------------------------------------------------------------------------------
# buckling

@dataclass(frozen=True)
class BucklingAxis:
    """Flexural buckling about one principal axis. Lengths m, stresses Pa, loads N."""

    axis: str  # "major" or "minor"
    length: float
    radius: float
    slenderness: float
    critical_stress: float
    formula: str  # "Euler" or "Johnson"


def _transition_slenderness(modulus: float, yield_strength: float | None) -> float:
    """Cc = pi sqrt(2 E / Fy), where the Johnson parabola meets Euler's curve (0 without a yield
    strength: Euler's curve throughout)."""
    return math.pi * math.sqrt(2.0 * modulus / yield_strength) if yield_strength else 0.0


def critical_stresses(slenderness: np.ndarray, modulus: float, yield_strength: float | None) -> np.ndarray:
    """Flexural buckling stress (Pa) for each slenderness: Euler pi^2 E / lambda^2, or the Johnson
    parabola Fy (1 - lambda^2 / (2 Cc^2)) below the transition slenderness Cc (see
    _transition_slenderness); lambda <= 0 (no length): Fy, or infinite without a yield strength."""
    slenderness = np.asarray(slenderness, dtype=float)
    transition = _transition_slenderness(modulus, yield_strength)
    with np.errstate(divide="ignore"):
        stress = math.pi**2 * modulus / slenderness**2
    if yield_strength:
        johnson = yield_strength * (1.0 - slenderness**2 / (2.0 * transition**2))
        stress = np.where(slenderness >= transition, stress, johnson)
    return np.where(slenderness <= 0, yield_strength or math.inf, stress)


def critical_stress(slenderness: float, modulus: float, yield_strength: float | None) -> tuple[float, str]:
    """Flexural buckling stress (Pa, see critical_stresses) and the formula that gives it."""
    stress = float(critical_stresses(np.array([slenderness]), modulus, yield_strength)[0])
    if slenderness <= 0:
        return stress, "short"
    return stress, "Euler" if slenderness >= _transition_slenderness(modulus, yield_strength) else "Johnson"


def buckling_lengths(member: Member) -> tuple[float, float]:
    """Buckling lengths (m) about the major (I11) and minor (I22) principal axes; default: the member length."""
    settings = member.checks
    return tuple(length if length is not None else member.length
                 for length in (settings.buckling_length_major, settings.buckling_length_minor))  # type: ignore[return-value]


def weakest_buckling_stresses(member: Member, area: np.ndarray, i11: np.ndarray, i22: np.ndarray, material: Any) -> np.ndarray:
    """Smaller flexural buckling stress (Pa) of the two principal axes, for arrays of sections."""
    major, minor = buckling_lengths(member)
    return np.minimum(critical_stresses(major / np.sqrt(i11 / area), material.elastic_modulus, material.yield_strength),
                      critical_stresses(minor / np.sqrt(i22 / area), material.elastic_modulus, material.yield_strength))


def buckling_axes(member: Member, props: Any, material: Any) -> list[BucklingAxis]:
    """Buckling about the section's principal axes: major (I11) with buckling_length_major, minor (I22)
    with buckling_length_minor; defaults: the member length."""
    axes = []
    for axis, inertia, length in zip(("major", "minor"), (props.I11, props.I22), buckling_lengths(member)):
        radius = math.sqrt(inertia / props.area)
        slenderness = length / radius
        stress, formula = critical_stress(slenderness, material.elastic_modulus, material.yield_strength)
        axes.append(BucklingAxis(axis, length, radius, slenderness, stress, formula))
    return axes


# ----------------------------------------------------------------------------------------------
# the checks

def _place(found: tuple[float, tuple[int, int]], xs: np.ndarray, names: tuple[str, ...]) -> tuple[float, float, str]:
    """(value, x, combination) from FieldPeaks.largest's answer."""
    value, (c, n) = found
    return value, float(xs[n]), names[c]


def _locate(values: np.ndarray, xs: np.ndarray, names: tuple[str, ...]) -> tuple[float, float, str]:
    """(largest value, x, combination) of a (n_combinations, n_stations) array."""
    c, s = np.unravel_index(int(np.argmax(values)), values.shape)
    return float(values[c, s]), float(xs[s]), names[c]


def _needs_allowable(member: Member, material: Any, which: str, check: str) -> float:
    value = getattr(material.allowable, which)
    if value is None:
        raise InputError(material.source or member.source, f"materials.{material.name}.allowable.{which}",
                         f"the {check} check needs the '{which}' allowable stress, which is not given",
                         f'add {which} = "... MPa" from your governing code under [materials.{material.name}.allowable]')
    return value


def axial_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """N / A against the tension or compression allowable, whichever governs."""
    member, material = design.member, design.material
    results = []
    for sense, which in ((1.0, "tension"), (-1.0, "compression")):
        demand = np.maximum(sense * stress.axial, 0.0)
        if demand.max() * design.props.area <= ZERO_ACTION:
            continue
        allowable = _needs_allowable(member, material, which, "axial")
        value, at, combination = _locate(demand, xs, names)
        results.append(CheckResult("axial", value / allowable, value, allowable, at, combination, detail=which))
    if not results:
        return CheckResult("axial", None, detail="no axial force")
    return max(results, key=lambda r: r.utilization)


def bending_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """Peak bending stress from My and Mz together (full field) against the bending allowable."""
    if stress.bending_upper.max() <= 0.0:
        return CheckResult("bending", None, detail="no bending moment")
    allowable = _needs_allowable(design.member, design.material, "bending", "bending")
    value, at, combination = _place(stress.largest(stress.bending_upper, lambda rows, exact: exact[:, 0]), xs, names)
    return CheckResult("bending", value / allowable, value, allowable, at, combination, detail="My and Mz together")


def compression_allowable(design: Design, axes: list[BucklingAxis]) -> float:
    """Fa for the interaction: the compression allowable, reduced to sigma_cr / safety factor where lower."""
    allowable = _needs_allowable(design.member, design.material, "compression", "interaction")
    buckling = min(axis.critical_stress for axis in axes) / design.member.checks.buckling_safety_factor
    return min(allowable, buckling)


def interaction_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design,
                      axes: list[BucklingAxis]) -> CheckResult:
    """fa/Fa + fb/Fb at every station (linear interaction); Fa in compression reduced for buckling."""
    has_axial = np.abs(stress.axial).max() * design.props.area > ZERO_ACTION
    if not has_axial or stress.bending_upper.max() <= 0.0:
        return CheckResult("interaction", None, detail="needs axial force and bending together")
    bending_allowable = _needs_allowable(design.member, design.material, "bending", "interaction")
    tension = design.material.allowable.tension
    compression = compression_allowable(design, axes) if (stress.axial < 0).any() else math.inf
    if tension is None and (stress.axial > 0).any():
        tension = _needs_allowable(design.member, design.material, "tension", "interaction")
    fa_ratio = np.where(stress.axial >= 0, stress.axial / (tension or math.inf), -stress.axial / compression).reshape(-1)
    found = stress.largest(fa_ratio + stress.bending_upper / bending_allowable,
                           lambda rows, exact: fa_ratio[rows] + exact[:, 0] / bending_allowable)
    value, at, combination = _place(found, xs, names)
    c, s = found[1]
    fb = float(stress.exact(np.array([c * stress.shape[1] + s]))[0, 0])
    detail = f"fa = {stress.axial[c, s] / 1e6:.3g} MPa, fb = {fb / 1e6:.3g} MPa, Fa = {(compression if stress.axial[c, s] < 0 else tension) / 1e6:.4g} MPa"
    return CheckResult("interaction", value, value, 1.0, at, combination, quantity="ratio", detail=detail)


def shear_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """Peak shear stress from Vy, Vz and T together (full field) against the shear allowable."""
    if stress.shear_upper.max() <= 0.0:
        return CheckResult("shear", None, detail="no shear force or torque")
    allowable = _needs_allowable(design.member, design.material, "shear", "shear")
    value, at, combination = _place(stress.largest(stress.shear_upper, lambda rows, exact: exact[:, 1]), xs, names)
    return CheckResult("shear", value / allowable, value, allowable, at, combination, detail="Vy, Vz and T together")


def equivalent_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """Peak von Mises stress against the `equivalent` allowable, where given (optional check)."""
    allowable = design.material.allowable.equivalent
    if allowable is None:
        return CheckResult("equivalent", None, detail="no 'equivalent' allowable given for the material")
    value, at, combination = _place(stress.largest(stress.equivalent_upper, lambda rows, exact: exact[:, 2]), xs, names)
    return CheckResult("equivalent", value / allowable, value, allowable, at, combination, detail="von Mises")


def buckling_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design,
                   axes: list[BucklingAxis]) -> CheckResult:
    """Largest axial compression against the flexural buckling load / safety factor, each principal axis."""
    compression = np.maximum(-stress.axial * design.props.area, 0.0)
    if compression.max() <= ZERO_ACTION:
        return CheckResult("buckling", None, detail="no axial compression")
    value, at, combination = _locate(compression, xs, names)
    factor = design.member.checks.buckling_safety_factor
    weakest = min(axes, key=lambda axis: axis.critical_stress)
    allowable = weakest.critical_stress * design.props.area / factor
    detail = (f"{weakest.formula} about the {weakest.axis} axis, KL/r = {weakest.slenderness:.0f}, "
              f"P_cr = {weakest.critical_stress * design.props.area / 1e3:.4g} kN, safety factor {factor:g}")
    return CheckResult("buckling", value / allowable, value, allowable, at, combination, quantity="force", detail=detail)


# ----------------------------------------------------------------------------------------------
# deflection

@dataclass(frozen=True)
class Span:
    """A span between two transverse supports, or an overhang beyond the outer one (m)."""

    start: float
    end: float
    overhang: bool
    base: float | None = None  # for an overhang: the support it hangs from

    @property
    def length(self) -> float:
        return self.end - self.start


def spans(member: Member) -> list[Span]:
    """Spans between supports that hold (or spring) uy or uz, and overhangs beyond the outer ones."""
    held = sorted({s.at for s in member.supports if {"uy", "uz"} & (set(s.restrain) | set(s.springs))})
    if not held:
        return []
    found = [Span(a, b, False) for a, b in zip(held, held[1:]) if b > a]
    if held[0] > 0:
        found.insert(0, Span(0.0, held[0], True, held[0]))
    if held[-1] < member.length:
        found.append(Span(held[-1], member.length, True, held[-1]))
    return found


def relative_to_supports(moved: np.ndarray, span: Span) -> np.ndarray:
    """(c, n, 2) transverse displacements at n points evenly spaced over the span, relative to its
    supports: the chord between the span's ends, or, for an overhang, its base support. `moved` is
    (c, n + 1, 2): the n points, then the displacement at the base (overhang) or start (span)."""
    body = moved[:, :-1]
    if span.overhang:
        return body - moved[:, -1:]
    t = np.linspace(0.0, 1.0, body.shape[1])[None, :, None]
    return body - ((1 - t) * body[:, :1] + t * body[:, -1:])


def span_points(span: Span, n: int = 201) -> np.ndarray:
    """n points evenly over the span, then its reference point: the overhang's base support, or the
    span's start (see relative_to_supports)."""
    return np.append(np.linspace(span.start, span.end, n), span.base if span.overhang else span.start)


def span_deflections(design: Design, span_list: list[Span], combinations: Iterable[str], n: int = 201) -> list[tuple[float, float, str]]:
    """For each span: the largest transverse deflection (m) relative to its supports (chord between
    them; for an overhang, relative to its support's displacement), with x and combination. One
    displacement evaluation for all spans."""
    names = list(combinations)
    points = [span_points(span, n) for span in span_list]
    moved = design.solution.weighted_displacements(design.solution.combination_weights(names), np.concatenate(points))[..., 1:3]  # (c, spans x (n + 1), 2): uy, uz
    found = []
    for span, xs, part in zip(span_list, points, np.split(moved, len(span_list), axis=1)):
        relative = relative_to_supports(part, span)
        size = np.hypot(relative[..., 0], relative[..., 1])
        c, k = np.unravel_index(int(np.argmax(size)), size.shape)
        found.append((float(size[c, k]), float(xs[k]), names[c]))
    return found


def deflection_check(design: Design) -> CheckResult:
    """Peak deflection of each span against span / limit (overhangs: overhang / overhang limit)."""
    settings = design.member.checks
    if settings.deflection_limit is None:
        return CheckResult("deflection", None, quantity="deflection", detail="no deflection_limit in [checks]")
    combinations = settings.deflection_combinations or design.solution.combination_names
    overhang_limit = settings.deflection_limit_overhang or settings.deflection_limit / 2
    span_list = spans(design.member)
    if not span_list:
        return CheckResult("deflection", None, quantity="deflection", detail="no support holds a transverse movement")
    results = []
    for span, (value, at, name) in zip(span_list, span_deflections(design, span_list, combinations)):
        limit = overhang_limit if span.overhang else settings.deflection_limit
        allowable = span.length / limit
        label = f"{'overhang' if span.overhang else 'span'} {span.start:g}–{span.end:g} m, limit L/{limit:g}"
        results.append(CheckResult("deflection", value / allowable, value, allowable, at, name, quantity="deflection", detail=label))
    return max(results, key=lambda r: r.utilization)


# ----------------------------------------------------------------------------------------------
# whole check

def check_design(design: Design, unit_field: Any, n_even: int = 200) -> CheckReport:
    """Every check of SPEC section 7 for the design's section, on the full stress field."""
    xs, sides = check_stations(design, n_even)
    names = design.solution.combination_names
    actions = to_section_axes(member_actions(design, xs, sides), design.member.orientation)
    stress = FieldPeaks(actions, unit_field, design.props.area)
    axes = buckling_axes(design.member, design.props, design.material)
    checks = [
        axial_check(stress, xs, names, design),
        bending_check(stress, xs, names, design),
        interaction_check(stress, xs, names, design, axes),
        shear_check(stress, xs, names, design),
        equivalent_check(stress, xs, names, design),
        deflection_check(design),
        buckling_check(stress, xs, names, design, axes),
    ]
    nodes = np.asarray(unit_field.sigma).shape[1]
    notes = check_notes(design, axes, len(xs), len(names), nodes)
    return CheckReport(design.spec.name, checks, notes, len(xs), nodes)


def check_notes(design: Design, axes: list[BucklingAxis], n_stations: int, n_combinations: int, nodes: int) -> list[str]:
    """The assumptions behind the checks, stated so that none is hidden."""
    settings = design.member.checks
    factor_text = "default" if not settings.buckling_safety_factor_given else "given"
    notes = [
        f"Verdict from the full cross-section stress field: {n_stations} stations x {n_combinations} combinations, "
        f"each on all {nodes} mesh nodes (sectionproperties unit stress fields, combined linearly).",
        "Buckling lengths: " + ", ".join(f"{a.axis} {a.length:g} m (KL/r {a.slenderness:.0f}, {a.formula})" for a in axes)
        + f"; safety factor {settings.buckling_safety_factor:g} ({factor_text}).",
        "Interaction: fa/Fa + fb/Fb with fb the peak bending stress from My and Mz together; Fa in compression is "
        "the compression allowable reduced to σcr / safety factor where lower.",
    ]
    if design.material.yield_strength is None:
        notes.append("No yield strength given: Euler buckling only (no Johnson parabola); unsafe for stocky members.")
    if settings.deflection_limit is not None:
        overhang = settings.deflection_limit_overhang or settings.deflection_limit / 2
        chosen = ", ".join(settings.deflection_combinations or design.solution.combination_names)
        notes.append(f"Deflection limits: span/{settings.deflection_limit:g}, overhang/{overhang:g}, "
                     f"relative to the supports, combinations: {chosen}.")
    return notes
