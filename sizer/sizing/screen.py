"""The screen: every candidate x combination x station at once, one block of sections at a time.

Each action of a block is one matrix product [c_s, c_s m_s] @ [A_loads; A_per_mass] over the
section-independent stations (all of which the full check uses too). Axial force, deflection and
the demands of the stability checks (each combination's peak compression and peak major-axis
moment) are exact there, in double precision: true lower bounds of the full check. Local buckling
is the check's own formula at these stations, for one candidate when the search needs it. Bending,
shear, interaction and equivalent stress are estimated from the per-unit-action peaks (|sigma| <=
sum |action_i| * peak_i) in single precision: the estimates only choose which checks to prove and
at which station; the proof is the full stress field at that station (prove_lower_bounds).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable, Iterable, Iterator, Sequence

import numpy as np

from sizer.analysis import MemberSolution, stations
from sizer.analysis.section_axes import to_section_axes
from sizer.analysis.patterns import Span, arrangements_of
from sizer.checks import StationStresses, full_field_stresses, span_points
from sizer.checks.deflection import limit_entries, limited_spans, measured
from sizer.checks.buckling import given_euler_loads
from sizer.checks.reduction import johnson
from sizer.checks.torsion import may_twist
from sizer.design import oriented_stiffness
from sizer.model import DeflectionLimit, Material, Member
from sizer.sizing.candidates import Candidate, CandidateTable

SCREEN_BLOCK = 65_536  # station values per block of sections (single precision: fits the CPU caches)
DEFLECTION_ROWS = 256  # combinations per block of the deflection screen
STRESS_CHECKS = ("bending", "interaction", "shear", "equivalent")
SINGLE = np.float32
N, MZ = 0, 5


@dataclass(frozen=True)
class ScreenRows:
    """The screen's actions as the stress estimates take them: per action (N, Vy, Vz, T, My, Mz) the
    (2, C x K) pair [loads; per kg/m] in double and in single precision, which actions are present
    anywhere, the stress checks estimated and the sections per block."""

    pairs64: list[np.ndarray]
    pairs: list[np.ndarray]
    present: list[bool]
    wanted: list[str]
    step: int


@dataclass
class Screen:
    """What the screen found for every candidate (rows as in CandidateTable). A lazy screen makes the
    stress estimates of a block of sections when the search first asks for one of them
    (estimate_rows): the same blocks, hence the same values, as made all at once."""

    exact: dict[str, np.ndarray]  # check -> (S,) the check's own value at the screen's stations: axial, deflection
    estimate: dict[str, np.ndarray]  # stress check -> (S,) largest utilization from the peaks (single precision)
    worst: dict[str, np.ndarray]  # stress check -> (S,) flat (combination x station) row of that estimate
    compression: np.ndarray  # (C, S) peak axial compression of each combination at the stations, N (>= 0)
    moment: np.ndarray  # (C, S) peak |Mz| (section axes) of each combination at the stations, N*m
    loads: np.ndarray  # (C x K, 6) actions of the loads alone at the stations, section axes
    per_mass: np.ndarray  # (C x K, 6) actions per kg/m of self weight, section axes
    table: CandidateTable
    fa_allowed: np.ndarray  # (S,) upper bound of Fa for the interaction: compression allowable, reduced on given lengths
    rows: ScreenRows | None = None  # the actions of `loads` and `per_mass` as the estimates take them (a lazy screen)
    material: Material | None = None  # the member's (a lazy screen)
    pending: np.ndarray | None = None  # (S,) True where the stress estimates are still to be made (a lazy screen)

    def estimate_rows(self, index: int) -> None:
        """Make the stress estimates of the block of sections holding row `index` where they are still
        to be made (a row made again after a reveal, see rescreen, keeps its own)."""
        if self.pending is None or not self.pending[index]:
            return
        assert self.rows is not None and self.material is not None
        start = index // self.rows.step * self.rows.step
        block = slice(start, min(start + self.rows.step, len(self.pending)))
        waiting = np.flatnonzero(self.pending[block])
        estimate = {name: np.zeros(len(self.pending)) for name in self.estimate}
        worst = {name: np.zeros(len(self.pending), int) for name in self.worst}
        estimate_blocks(self.table, self.rows, self.material, self.fa_allowed, estimate, worst, [start])
        for name in self.estimate:
            self.estimate[name][start + waiting], self.worst[name][start + waiting] = estimate[name][start + waiting], worst[name][start + waiting]
        self.pending[block] = False


def load_and_weight_factors(base: MemberSolution) -> np.ndarray:
    """(2C, n_cases + 1) combination factors: the loads alone (rows 0..C-1), then the self-weight
    per kg/m (rows C..2C-1), for MemberSolution.weighted_actions / weighted_displacements."""
    loads = base.weights(None)
    return np.vstack([loads, base.weights(1.0) - loads])


def screen(table: CandidateTable, member: Member, material: Material, base: MemberSolution, n_even: int = 200,
           lazy: bool = False) -> Screen:
    """Exact axial, deflection and stability demands, and the stress estimates, of every candidate
    at the section-independent stations (all of which the full check also uses); with `lazy`, the
    stress estimates of a block of sections only when first asked for (Screen.estimate_rows)."""
    xs, sides = stations(member, n_even)
    loads, per_mass = (to_section_axes(part, member.orientation).reshape(-1, 6)
                       for part in np.split(base.weighted_actions(load_and_weight_factors(base), xs, sides), 2))
    fa_allowed = given_length_compression(table, member, material)
    combinations = len(base.combination_names)
    lowered = lowered_by_second_order(member, loads, per_mass, combinations)
    exact, compression, moment = exact_screen(table, screen_rows(loads, per_mass, material), material, combinations)
    if lowered.any():  # their first-order stresses bound nothing: only their axial force is kept for the estimates and proofs
        loads, per_mass = (_axial_only(part, lowered) for part in (loads, per_mass))
    rows = screen_rows(loads, per_mass, material)
    count = len(table.mass)
    estimate, worst = {name: np.zeros(count) for name in rows.wanted}, {name: np.zeros(count, int) for name in rows.wanted}
    if not lazy:
        estimate_blocks(table, rows, material, fa_allowed, estimate, worst, range(0, count, rows.step))
    deflection = deflection_screen(table, member, material, base, ~lowered)
    if deflection is not None:
        exact["deflection"] = np.where(twisted_by_second_order(member, table), 0.0, deflection)
    return Screen(exact, estimate, worst, compression, moment, loads, per_mass, table, fa_allowed, rows, material,
                  np.full(count, True) if lazy else None)


def lowered_by_second_order(member: Member, loads: np.ndarray, per_mass: np.ndarray, combinations: int) -> np.ndarray:
    """(C,) the combinations whose second-order actions may be smaller than their first-order ones, so
    that the first-order stresses and deflections are no lower bounds of the check's: with second
    order on, those with axial tension anywhere (from the loads or the self-weight). Under
    compression (or no axial force) the geometric stiffness only softens the member, and the
    screen's first-order values stay lower bounds (tests/test_sizing.py holds the check to that)."""
    if not member.checks.second_order:
        return np.zeros(combinations, bool)
    tension = np.maximum(loads[:, N], per_mass[:, N]).reshape(combinations, -1).max(axis=1)
    return tension > 0.0


def twisted_by_second_order(member: Member, table: CandidateTable) -> np.ndarray:
    """(S,) the sections the member's loads may twist (see checks.torsion.may_twist) when second
    order is on: their second-order twist couples with the moments and may lower a stress or a
    deflection somewhere, so the screen's first-order values bound nothing for them."""
    if not member.checks.second_order:
        return np.zeros(len(table.specs), bool)
    twists = {shape: may_twist(member, shape) for shape in {spec.shape for spec in table.specs}}  # once per shape
    return np.array([twists[spec.shape] for spec in table.specs], bool)


def _axial_only(actions: np.ndarray, lowered: np.ndarray) -> np.ndarray:
    """(C x K, 6) actions with every action but N set to zero in the `lowered` combinations."""
    out = actions.reshape(len(lowered), -1, 6).copy()
    out[lowered, :, 1:] = 0.0
    return out.reshape(-1, 6)


def local_lower_bound(found: Screen, index: int, member: Member, material: Material) -> float | None:
    """The local check's own value for one candidate at the screen's worst rows of its stress checks
    (where the compression in its walls peaks; the wall stresses are linear in the actions), at the
    wall and row where its upper bound is largest: a lower bound of the check's, which looks at every
    wall, station and moment peak between them. None when it cannot be made here (no allowable for the
    walls: the check says why; a section that second order may twist, see twisted_by_second_order)."""
    return local_lower_bounds(found, [index], member, material)[0]


def local_rows(found: Screen, index: int) -> list[int]:
    """The screen's rows (combination x station) where local_lower_bound looks for one candidate: the
    worst rows of its stress checks' estimates (every row when there is none)."""
    found.estimate_rows(index)
    return sorted({int(worst[index]) for worst in found.worst.values()}) or list(range(len(found.loads)))


def local_lower_bounds(found: Screen, indices: Sequence[int], member: Member, material: Material) -> list[float | None]:
    """local_lower_bound of each candidate of `indices`, made together: each section's rows padded to the
    most rows of any with copies of its first row (a copy changes no section's largest bound, nor the
    first place of it: the same value as alone), in one call of the elementwise local formulas."""
    from sizer.checks.local import BLOCK_VALUES, local_utilizations, poisson_ratio, table_of_walls, wall_allowable
    from sizer.checks.local_walls import section_walls
    from sizer.errors import InputError

    try:
        nu, allowable = poisson_ratio(material, member.source), wall_allowable(material, member.source)
    except InputError:
        return [None] * len(indices)
    table = found.table
    kept = [index for index in indices if not (member.checks.second_order and may_twist(member, table.specs[index].shape))]
    if not kept:  # their second-order twist may lower the wall stresses: see twisted_by_second_order
        return [None] * len(indices)
    rows = [local_rows(found, index) for index in kept]
    most = max(len(each) for each in rows)
    walls = table_of_walls([section_walls(table.specs[index], (float(table.centroid_y[index]), float(table.centroid_z[index])))
                            for index in kept])
    if len(kept) > 1 and most * walls.mask.shape[1] > BLOCK_VALUES:  # rows in blocks: each alone, as local_lower_bound blocks them
        alone = {index: local_lower_bound(found, index, member, material) for index in kept}
    else:
        padded = np.array([each + each[:1] * (most - len(each)) for each in rows])
        actions = found.loads[padded] + table.mass[kept][:, None, None] * found.per_mass[padded]
        values = local_utilizations(walls, actions, table.area[kept], table.Iz[kept], table.Iy[kept], table.Iyz[kept],
                                    material.elastic_modulus, nu, material.yield_strength, allowable,
                                    member.checks.buckling_safety_factor, largest=False)[0]
        alone = dict(zip(kept, values.tolist()))
    return [alone.get(index) for index in indices]


def given_length_compression(table: CandidateTable, member: Member, material: Material) -> np.ndarray:
    """(S,) Fa for the interaction, an upper bound of the check's: the compression allowable, reduced
    to the Johnson/Euler buckling stress on each buckling length the user gives / safety factor
    (the check's buckling load is at most these)."""
    allowable = material.allowable.compression or np.inf
    load = given_euler_loads(member, table.I11, table.I22, material.elastic_modulus)
    return np.minimum(allowable, johnson(load / table.area, material.yield_strength) / member.checks.buckling_safety_factor)


def _scaled(coefficient: np.ndarray, mass: np.ndarray, pair: np.ndarray, out: np.ndarray | None = None) -> np.ndarray:
    """(S, K) coefficient_s * (loads_k + mass_s * per_mass_k) as one matrix product; pair is (2, K);
    into `out` (S, K) when given."""
    return np.matmul(np.column_stack([coefficient, coefficient * mass]).astype(pair.dtype), pair, out=out)


def screen_rows(loads: np.ndarray, per_mass: np.ndarray, material: Material) -> ScreenRows:
    """ScreenRows of the actions `loads` and `per_mass` (C x K, 6), section axes."""
    pairs64 = [np.stack([loads[:, j], per_mass[:, j]]) for j in range(6)]
    present = [bool(np.any(pair)) for pair in pairs64]
    wanted = [name for name in STRESS_CHECKS if _allowable(material.allowable, name)]
    if not present[0] or not (present[4] or present[5]):
        wanted = [name for name in wanted if name != "interaction"]  # the check needs axial force and bending together
    return ScreenRows(pairs64, [pair.astype(SINGLE) for pair in pairs64], present, wanted, max(1, SCREEN_BLOCK // max(loads.shape[0], 1)))


def exact_screen(table: CandidateTable, rows: ScreenRows, material: Material,
                 combinations: int) -> tuple[dict[str, np.ndarray], np.ndarray, np.ndarray]:
    """(axial utilization at the stations, and per combination (C, S) the peak compression and the
    peak |Mz|) of every candidate, in double precision, combination by combination. Blocks of
    sections keep each array in cache."""
    allow = material.allowable
    count = len(table.mass)
    n_max, n_min = np.empty(count), np.empty(count)
    compression, moment = np.zeros((combinations, count)), np.zeros((combinations, count))
    buffer = np.empty((min(rows.step, count), rows.pairs64[0].shape[1]))  # one block's values, reused (no fresh pages per block)
    for start in range(0, count, rows.step):
        block = slice(start, min(start + rows.step, count))
        mass = table.mass[block]
        if rows.present[0]:
            axial = _scaled(np.ones(len(mass)), mass, rows.pairs64[0], buffer[:len(mass)])  # N, exact
            n_max[block], n_min[block] = axial.max(axis=1), axial.min(axis=1)
            compression[:, block] = np.maximum(-axial.reshape(len(mass), combinations, -1).min(axis=2), 0.0).T
        else:
            n_max[block] = n_min[block] = 0.0
        if rows.present[MZ]:
            mz = np.abs(_scaled(np.ones(len(mass)), mass, rows.pairs64[MZ], buffer[:len(mass)]), out=buffer[:len(mass)])
            moment[:, block] = mz.reshape(len(mass), combinations, -1).max(axis=2).T
    tension, compression_stress = np.maximum(n_max, 0.0) / table.area, np.maximum(-n_min, 0.0) / table.area
    exact = {"axial": np.maximum(tension / (allow.tension or np.inf), compression_stress / (allow.compression or np.inf))}
    return exact, compression, moment


def estimate_blocks(table: CandidateTable, rows: ScreenRows, material: Material, fa_allowed: np.ndarray, estimate: dict[str, np.ndarray],
                    worst: dict[str, np.ndarray], starts: Iterable[int]) -> None:
    """The stress-check estimates and their worst rows, into `estimate` and `worst` (S,), of the blocks
    of rows.step sections from each of `starts`, in single precision."""
    from sizer.sections.properties import SIGMA_PEAK_NAMES, TAU_PEAK_NAMES

    count = len(table.mass)
    buffers = [np.empty((min(rows.step, count), rows.pairs[0].shape[1]), SINGLE) for _ in range(5)]  # reused by every block
    for start in starts:
        block = slice(start, min(start + rows.step, count))
        mass = table.mass[block]
        fa_, fb_, fv_, one, two = (buffer[:len(mass)] for buffer in buffers)
        sigma_peak = np.column_stack([table.column[name][block] for name in SIGMA_PEAK_NAMES])
        tau_peak = np.column_stack([table.column[name][block] for name in TAU_PEAK_NAMES])
        fa = _scaled(1.0 / table.area[block], mass, rows.pairs[0], fa_)
        fb = _peak_sum(sigma_peak, [1, 2], [4, 5], mass, rows.pairs, rows.present, fb_, one)
        fv = _peak_sum(tau_peak, [0, 1, 2], [1, 2, 3], mass, rows.pairs, rows.present, fv_, one)
        for name, (values, scale) in _stress_estimates(fa, fb, fv, material.allowable, fa_allowed[block], rows.wanted, one, two):
            at = values.argmax(axis=1)
            estimate[name][block], worst[name][block] = scale(values[np.arange(len(at)), at]), at


def _allowable(allow: Any, check: str) -> float | None:
    return allow.bending if check in ("bending", "interaction") else getattr(allow, check)


def _peak_sum(peaks_: np.ndarray, peak_columns: list[int], action_columns: list[int], mass: np.ndarray, pairs: list[np.ndarray],
              present: list[bool], total: np.ndarray, scratch: np.ndarray) -> np.ndarray:
    """(S, K) sum over the given actions of |action| * the section's peak stress per unit action, into
    `total` (scratch: another (S, K) array to work in)."""
    total.fill(0.0)
    for peak, action in zip(peak_columns, action_columns):
        if present[action]:
            total += np.abs(_scaled(peaks_[:, peak], mass, pairs[action], scratch), out=scratch)
    return total


def _stress_estimates(fa: np.ndarray, fb: np.ndarray, fv: np.ndarray, allow: Any, fa_allow: np.ndarray, wanted: list[str],
                      one: np.ndarray, two: np.ndarray) -> Iterator[tuple[str, tuple[np.ndarray, Callable[[np.ndarray], np.ndarray]]]]:
    """For each wanted stress check: (S, K) values whose largest marks the worst row, and the map from
    that value to the utilization estimate (same formulas as the checks). Consumes fa, fb and fv, and
    works in `one` and `two` ((S, K) each), each value taken before the next is asked for."""
    if "bending" in wanted:
        yield "bending", (fb, lambda value: value / allow.bending)
    if "shear" in wanted:
        yield "shear", (fv, lambda value: value / allow.shear)
    if "interaction" in wanted:
        interaction = np.maximum(np.multiply(fa, SINGLE(1.0 / (allow.tension or np.inf)), out=one),
                                 np.multiply(fa, (-1.0 / fa_allow).astype(SINGLE)[:, None], out=two), out=one)
        interaction += np.multiply(fb, SINGLE(1.0 / allow.bending), out=two)
        yield "interaction", (interaction, lambda value: value)
    if "equivalent" in wanted:  # (|fa| + fb)^2 + 3 fv^2, in place
        normal = np.abs(fa, out=fa)
        normal += fb
        normal *= normal
        fv *= fv
        fv *= SINGLE(3.0)
        normal += fv
        yield "equivalent", (normal, lambda value: np.sqrt(value) / allow.equivalent)


def deflection_screen(table: CandidateTable, member: Member, material: Material, base: MemberSolution,
                      bounded: np.ndarray | None = None, n: int = 201) -> np.ndarray | None:
    """Deflection utilization of every candidate from the unit-rigidity solution (no springs), for
    every deflection limit given (each with its combinations and their pattern arrangements), at the
    same points and from the same reference (chord between supports, the overhang's support, or the
    original position) as the check. The worst point of each section is found with the squared
    deflection over its allowable expanded as one matrix product, then its deflection is computed
    directly: the value at a point the check uses (a true lower bound of the check, and its exact
    value save for round-off in choosing the point)."""
    stiffness = oriented_stiffness(table, material, member.orientation)
    worst = None
    for entry in limit_entries(member.checks):
        combos = [base.combination_names.index(name) for name in arrangements_of(base.member, entry.combinations)]
        combos = [c for c in combos if bounded is None or bounded[c]]
        for start in range(0, len(combos), DEFLECTION_ROWS):  # a block of combinations (pattern arrangements) at a time: bounded memory
            rows = _limited_deflections(entry, base, n, combos[start:start + DEFLECTION_ROWS])
            if rows:
                found = _worst_deflections(rows, stiffness, table.mass)
                worst = found if worst is None else np.maximum(worst, found)
    return worst


def _worst_deflections(rows: list[tuple[np.ndarray, np.ndarray]], stiffness: Any, mass: np.ndarray) -> np.ndarray:
    """(S,) each candidate's largest deflection over its allowable at the points of `rows` (pairs of
    (points, 2) deflections of the loads alone and per kg/m, over allowable, at unit rigidities)."""
    a, b = (np.concatenate([row[k] for row in rows]) for k in (0, 1))
    u, v, m = 1.0 / stiffness.EIz**2, 1.0 / stiffness.EIy**2, mass
    terms = np.stack([a[:, 0] ** 2, a[:, 0] * b[:, 0], b[:, 0] ** 2, a[:, 1] ** 2, a[:, 1] * b[:, 1], b[:, 1] ** 2])
    weights = np.column_stack([u, 2 * u * m, u * m * m, v, 2 * v * m, v * m * m])
    step = max(1, SCREEN_BLOCK // 2 // len(a))  # double precision: half the values of a stress block
    at = np.concatenate([(weights[start:start + step] @ terms).argmax(axis=1) for start in range(0, len(m), step)])
    return np.hypot((a[at, 0] + m * b[at, 0]) / stiffness.EIz, (a[at, 1] + m * b[at, 1]) / stiffness.EIy)


def _limited_deflections(entry: DeflectionLimit, base: MemberSolution, n: int, combos: list[int]) -> list[tuple[np.ndarray, np.ndarray]]:
    """For one deflection limit and the combinations `combos` (indices): per limited span, the
    (points, 2) deflections (uy, uz) of the loads alone and per kg/m of self-weight at unit
    rigidities, each over the span's allowable length."""
    pairs = limited_spans(base.member, entry)
    if not pairs or not combos:
        return []
    factors = load_and_weight_factors(base)
    rows = combos + [len(base.combination_names) + c for c in combos]  # these combinations' loads, then their self-weight per kg/m
    each = base.case_displacements(np.concatenate([span_points(span, n) for span, _ in pairs]))[..., 1:3]  # (cases + 1, points, 2): uy, uz
    moved = np.tensordot(factors[rows], each, axes=1)  # superposition: one evaluation per case, however many arrangements
    zero, unit = (np.split(part, len(pairs), axis=1) for part in np.split(moved, 2))  # uy, uz per span
    def scaled(part: np.ndarray, span: Span, limit: float) -> np.ndarray:
        return measured(part, span, entry.relative_to_supports).reshape(-1, 2) * (limit / span.length)

    return [(scaled(loads, span, limit), scaled(per_mass, span, limit)) for (span, limit), loads, per_mass in zip(pairs, zero, unit)]


def prove_lower_bounds(candidate: Candidate, found: Screen, material: Material, member: Member, above: float = 1.0) -> None:
    """The stress field at the screen's worst station of each stress check estimated to fail (above
    `above`: 0 for every stress check with an estimate, as for a runner-up shown from its bounds): true
    lower bounds of the full check (it uses these stations too; the interaction with upper bounds
    of its allowables: Fa on the given buckling lengths only, Fb unreduced). The full field once the
    candidate's warping tier is known; before, the normal stresses at the outline's corners, which
    give bending and the interaction as the full field does (sizer.sections.geometric); the shear
    and equivalent estimates wait for the warping tier (NaN until then, see `rescreen`). None for a
    section the member's loads may twist (their torsion is the full check's alone)."""
    from sizer.sections import unit_stress_field
    from sizer.sections.geometric import normal_stress_field

    found.estimate_rows(candidate.index)
    wanted = [name for name, values in found.estimate.items() if values[candidate.index] > above and name not in candidate.bounds]
    if not wanted or may_twist(member, candidate.spec.shape):
        return  # torsion of this section (warping, torques across it) is not in the screen's stations: no proof from them
    rows = sorted({int(found.worst[name][candidate.index]) for name in wanted})
    actions = (found.loads[rows] + candidate.mass_per_length * found.per_mass[rows])[None]
    field = unit_stress_field(candidate.spec) if found.table.known[candidate.index] else normal_stress_field(candidate.spec)
    stress = full_field_stresses(actions, field, float(found.table.area[candidate.index]))
    compression = float(found.fa_allowed[candidate.index])
    for name in wanted:
        k = rows.index(int(found.worst[name][candidate.index]))
        candidate.raise_bound(name, stress_utilization(name, stress, k, material.allowable, compression))


def rescreen(found: Screen, rows: list[int], material: Material) -> None:
    """The stress estimates of `rows` made again, now that their warping tier (the peak shear
    stresses per unit action) is known."""
    from sizer.sections.properties import SIGMA_PEAK_NAMES, TAU_PEAK_NAMES

    index = np.array(rows, dtype=int)
    part = CandidateTable({name: found.table.column[name][index] for name in ("area", *SIGMA_PEAK_NAMES, *TAU_PEAK_NAMES)},
                          found.table.mass[index])  # the columns the estimates read
    actions = found.rows or screen_rows(found.loads, found.per_mass, material)
    estimate, worst = {name: np.zeros(len(rows)) for name in actions.wanted}, {name: np.zeros(len(rows), int) for name in actions.wanted}
    estimate_blocks(part, actions, material, found.fa_allowed[rows], estimate, worst, range(0, len(rows), actions.step))
    for name, values in estimate.items():
        found.estimate[name][rows], found.worst[name][rows] = values, worst[name]
    if found.pending is not None:
        found.pending[rows] = False


def stress_utilization(name: str, stress: StationStresses, k: int, allow: Any, compression_allowable: float) -> float:
    """Utilization of one stress check at station k of `stress` (same formulas as the checks)."""
    if name == "bending":
        return float(stress.bending[0, k] / allow.bending)
    if name == "shear":
        return float(stress.shear[0, k] / allow.shear)
    if name == "equivalent":
        return float(stress.equivalent[0, k] / allow.equivalent)
    fa = float(stress.axial[0, k])  # interaction: this station's fa and fb together
    fa_allow = (allow.tension or np.inf) if fa >= 0 else compression_allowable
    return float(abs(fa) / fa_allow + stress.bending[0, k] / allow.bending)
