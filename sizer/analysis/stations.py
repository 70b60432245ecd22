"""Where to look along the member (m): check stations (ends, both sides of every concentrated item,
an even spacing), the points where a shear force crosses zero (local extremes of the bending
moments, found exactly from the quadratic shear) and where a summed line load changes sign (local
extremes of N, V and T), and the extremes of each action with their positions.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from sizer.analysis.layout import distinct, merge_positions, position_tolerance
from sizer.analysis.member_solution import MemberSolution
from sizer.model import ACTIONS, Member, PointLoad

EXTREME_ACTIONS: tuple[str, ...] = ACTIONS + ("V", "M")


def _concentrated_positions(member: Member) -> np.ndarray:
    """Sorted distinct positions of supports, hinges, point loads and line-load ends (m)."""
    xs = [s.at for s in member.supports] + [h.at for h in member.hinges]
    for load in member.loads:
        xs += [load.at] if isinstance(load, PointLoad) else [load.start, load.end]
    if not xs:
        return np.zeros(0)
    return merge_positions(np.clip(np.array(xs, dtype=float), 0.0, member.length), position_tolerance(member))


def stations(member: Member, n_even: int = 200) -> tuple[np.ndarray, np.ndarray]:
    """Stations for checking: x (m) sorted, and side (array of 'left'/'right'). Includes 0 (right)
    and L (left), both sides of every support, hinge, point load and line-load end, and n_even
    evenly spaced points (right side). Left comes before right at one position."""
    length, tol = member.length, position_tolerance(member)
    special = _concentrated_positions(member)
    inner = special[(special > tol) & (special < length - tol)]
    even = np.linspace(0.0, length, max(n_even, 2))
    even = even[np.all(np.abs(even[:, None] - special[None, :]) > tol, axis=1)] if special.size else even
    even = even[(even > tol) & (even < length - tol)]
    xs = np.concatenate([[0.0], inner, inner, even, [length]])
    right = np.concatenate([[True], np.zeros(inner.size, bool), np.ones(inner.size, bool), np.ones(even.size, bool), [False]])
    order = np.lexsort((right, xs))
    return xs[order], np.where(right[order], "right", "left")


def _quadratic_roots(v0: np.ndarray, vm: np.ndarray, v1: np.ndarray) -> list[np.ndarray]:
    """Roots t in (0, 1) of the quadratic through (0, v0), (1/2, vm), (1, v1), per segment; returns
    [segment index array, t array]."""
    scale = np.maximum.reduce([np.abs(v0), np.abs(vm), np.abs(v1)])
    safe = np.where(scale > 0, scale, 1.0)
    c, vm_, v1_ = v0 / safe, vm / safe, v1 / safe
    a = 2 * c - 4 * vm_ + 2 * v1_
    b = -3 * c + 4 * vm_ - v1_
    segments, roots = [], []
    quadratic = np.abs(a) > 1e-12
    linear = ~quadratic & (np.abs(b) > 1e-12)
    idx = np.flatnonzero(linear & (scale > 0))
    segments.append(idx)
    roots.append(-c[idx] / b[idx])
    disc = b * b - 4 * a * c
    idx = np.flatnonzero(quadratic & (scale > 0) & (disc >= 0))
    sq = np.sqrt(disc[idx])
    q = -0.5 * (b[idx] + np.where(b[idx] >= 0, sq, -sq))
    for t in (q / a[idx], np.divide(c[idx], q, out=np.full(idx.size, -1.0), where=q != 0)):
        segments.append(idx)
        roots.append(t)
    seg, t = np.concatenate(segments), np.concatenate(roots)
    inside = (t > 1e-12) & (t < 1 - 1e-12)
    return [seg[inside], t[inside]]


def segment_ends(member: Member) -> np.ndarray:
    """Sorted ends (m) of the segments between concentrated items (supports, hinges, point loads,
    line-load ends) and the member's ends: within each segment every action and displacement is one
    polynomial in x (for linearly varying line loads)."""
    ends = distinct(np.concatenate([[0.0, member.length], _concentrated_positions(member)]))
    return merge_positions(ends, position_tolerance(member))


def _segments(member: Member) -> tuple[np.ndarray, np.ndarray]:
    """Starts and ends (m) of the segments of segment_ends."""
    ends = segment_ends(member)
    return ends[:-1], ends[1:]


def zero_shear_positions(solution: MemberSolution, combinations: Sequence[str], actions: Sequence[str] = ("Vy", "Vz")) -> np.ndarray:
    """Sorted distinct x (m) where the shear `actions` ("Vy", "Vz") of any of the combinations cross
    zero inside a segment between concentrated items (supports, point loads, line-load ends): the
    shear is quadratic there and its roots are found exactly, for every combination in one pass.
    The bending moments have their local extremes at these points."""
    for action in actions:
        if action not in ("Vy", "Vz"):
            raise ValueError(f"action must be 'Vy' or 'Vz', got {action!r}")
    if not combinations or not actions:
        return np.empty(0)
    lo, hi = _segments(solution.member)
    x = np.concatenate([lo, (lo + hi) / 2, hi])
    side = np.array(["right"] * (2 * lo.size) + ["left"] * hi.size)
    weights = solution.combination_weights(combinations)
    values = solution.weighted_actions(weights, x, side)[:, :, [ACTIONS.index(action) for action in actions]]  # (C, 3m, a)
    values = values.reshape(len(combinations), 3, lo.size, len(actions)).transpose(1, 0, 3, 2).reshape(3, -1)
    segment, t = _quadratic_roots(values[0], values[1], values[2])
    segment = segment % lo.size
    return distinct(lo[segment] + t * (hi[segment] - lo[segment]))


def zero_shear_points(solution: MemberSolution, combination: str, action: str = "Vy") -> np.ndarray:
    """x (m) where the shear `action` ("Vy" or "Vz") of one combination crosses zero (see
    zero_shear_positions)."""
    return zero_shear_positions(solution, [combination], [action])


def load_sign_change_positions(solution: MemberSolution, combinations: Sequence[str]) -> np.ndarray:
    """Sorted distinct x (m) where the summed line load wx, wy, wz or mx of any of the combinations
    changes sign inside a stretch between line-load ends: there N, Vy, Vz or T has a local extreme
    (dN/dx = -wx, and so on)."""
    pieces = []
    for index, case in enumerate(solution.column_solutions()):
        if case is not None:
            start, end, q_start, q_end = case.line_items()
            pieces.append((start, end, q_start, q_end, np.full(start.size, index)))
    if not combinations or not pieces:
        return np.empty(0)
    start, end, q_start, q_end, column = (np.concatenate(parts) for parts in zip(*pieces))
    if not start.size:
        return np.empty(0)
    weights = solution.combination_weights(combinations)[:, column]  # (C, J)
    ends = merge_positions(distinct(np.concatenate([[0.0, solution.member.length], start, end])), position_tolerance(solution.member))
    lo, hi = ends[:-1], ends[1:]
    slope = (q_end - q_start) / np.where(end > start, end - start, 1.0)[:, None]
    covers = (start[None, :] <= lo[:, None] + 1e-12) & (end[None, :] >= hi[:, None] - 1e-12)  # (stretches, J)

    def intensity(x: np.ndarray) -> np.ndarray:  # (C, stretches, 4) summed over the loads covering each stretch
        values = (q_start[None] + slope[None] * (x[:, None] - start[None, :])[..., None]) * covers[..., None]
        return np.einsum("cj,sjk->csk", weights, values)

    at_lo, at_hi = intensity(lo), intensity(hi)
    crossing = (at_lo * at_hi) < 0
    _, stretch, _ = np.nonzero(crossing)
    t = at_lo[crossing] / (at_lo[crossing] - at_hi[crossing])
    return distinct(lo[stretch] + t * (hi[stretch] - lo[stretch]))


def load_sign_change_points(solution: MemberSolution, combination: str) -> np.ndarray:
    """x (m) where one combination's summed line load changes sign (see load_sign_change_positions)."""
    return load_sign_change_positions(solution, [combination])


@dataclass(frozen=True)
class Extreme:
    """Largest and smallest value of one action over the member (N or N*m) and where (m)."""

    action: str
    max_value: float
    max_at: float
    min_value: float
    min_at: float


def extremes(solution: MemberSolution, combination: str, n_even: int = 400) -> dict[str, Extreme]:
    """Largest and smallest of N, Vy, Vz, T, My, Mz, V, M (beam convention V = -Vy, M = Mz) over the
    stations including zero-shear points and the points where a line load changes sign, both sides
    of every concentrated item."""
    x, side = stations(solution.member, n_even)
    extra = np.concatenate([zero_shear_positions(solution, [combination]), load_sign_change_positions(solution, [combination])])
    x = np.concatenate([x, extra])
    side = np.concatenate([side, np.full(extra.size, "right")])
    values = solution.actions(combination, x, side)
    table = np.column_stack([values, -values[:, 1], values[:, 5]])
    found: dict[str, Extreme] = {}
    for column, name in enumerate(EXTREME_ACTIONS):
        high, low = int(np.argmax(table[:, column])), int(np.argmin(table[:, column]))
        found[name] = Extreme(name, float(table[high, column]), float(x[high]), float(table[low, column]), float(x[low]))
    return found


def extreme_positions(solution: MemberSolution, combinations: Sequence[str]) -> np.ndarray:
    """Sorted distinct x (m) where some action of the combinations can have its largest or smallest
    value away from the segment ends: for a combination on its own, its zero-shear points and the
    points where its line load changes sign; for the pattern arrangements of one given combination
    together, the points of pattern_extreme_positions (as many for n spans as for a few, however
    many arrangements there are)."""
    groups: dict[str, list[str]] = {}
    for name in combinations:
        groups.setdefault(solution.member.origin(name), []).append(name)
    alone = [names[0] for names in groups.values() if len(names) == 1]
    found = [zero_shear_positions(solution, alone), load_sign_change_positions(solution, alone)]
    found += [pattern_extreme_positions(solution, names) for names in groups.values() if len(names) > 1]
    return distinct(np.concatenate(found))


def switch_weights(solution: MemberSolution, combinations: Sequence[str]) -> tuple[np.ndarray, np.ndarray]:
    """(base, switches) of the pattern arrangements of one combination: the weights (as
    MemberSolution.weights) with every patterned part off, and (J, columns) each part's own
    weights, so that an arrangement is base + the sum of the switches it loads (superposition)."""
    table = solution.combination_weights(combinations)
    varying = np.flatnonzero(np.ptp(table, axis=0) > 0)
    off = np.flatnonzero(np.all(table[:, varying] == 0.0, axis=1))
    base = table[off[0]] if off.size else np.where(np.isin(np.arange(table.shape[1]), varying), 0.0, table[0])
    switches = np.zeros((varying.size, table.shape[1]))
    for k, column in enumerate(varying):
        values = table[:, column]
        switches[k, column] = values[np.flatnonzero(values)[0]]
    return base, switches


SAMPLE_T = np.array([0.0, 1.0 / 3.0, 2.0 / 3.0, 1.0])
CUBIC = np.linalg.inv(np.vander(SAMPLE_T, 4, increasing=True))  # values at SAMPLE_T -> coefficients of 1, t, t^2, t^3
CUBIC_TOLERANCE = 1e-9  # relative: a cubic through four points that misses a fifth by more is not one


def pattern_extreme_positions(solution: MemberSolution, combinations: Sequence[str]) -> np.ndarray:
    """x (m) where an action's envelope over every arrangement of loaded spans (base + each switch
    of one sign, see switch_weights) has an extreme inside a segment between concentrated items.
    Within a segment each switch's contribution to an action is a cubic in x; between the points
    where any contribution changes sign (kept too) the worst arrangement for each action and sense
    is one arrangement, and the envelope's extremes there are that arrangement's stationary points.
    Cost: (switches + 1) load sets at five points a segment, not one per arrangement. Where the
    actions are not cubics (the fifth point, mid-segment, disagrees: another analysis than the
    first-order one), each arrangement's own zero-shear and load sign-change points instead."""
    base, switches = switch_weights(solution, combinations)
    lo, hi = _segments(solution.member)
    t = np.append(SAMPLE_T, 0.5)
    x = (lo[:, None] + t[None, :] * (hi - lo)[:, None]).ravel()
    side = np.tile(np.array(["right", "right", "right", "left", "right"]), lo.size)
    values = solution.weighted_actions(np.vstack([base, switches]), x, side).reshape(1 + len(switches), lo.size, 5, 6)
    coef = np.einsum("kt,rsta->rsak", CUBIC, values[:, :, :4])  # (rows, segments, actions, 4)
    middle = coef[..., 0] + 0.5 * coef[..., 1] + 0.25 * coef[..., 2] + 0.125 * coef[..., 3]
    if np.abs(middle - values[:, :, 4]).max(initial=0.0) > CUBIC_TOLERANCE * (np.abs(values).max(initial=0.0) + 1e-300):
        return distinct(np.concatenate([zero_shear_positions(solution, combinations), load_sign_change_positions(solution, combinations)]))
    found = [lo[segment] + t * (hi[segment] - lo[segment]) for segment in range(lo.size) for action in range(6)
             for t in _envelope_stationary_points(coef[0, segment, action], coef[1:, segment, action])]
    return distinct(np.array(found, dtype=float))


def _envelope_stationary_points(base: np.ndarray, parts: np.ndarray) -> list[float]:
    """t in (0, 1) where base + the sum of the positive (or of the negative) cubics `parts` (J, 4)
    has a stationary point, and where any part changes sign; coefficients ascending in t."""
    breaks = sorted({float(t) for row in parts for t in _unit_roots(row)})
    edges = [0.0] + breaks + [1.0]
    found = list(breaks)
    for a, b in zip(edges[:-1], edges[1:]):
        if b - a <= 1e-12:
            continue
        mid = 0.5 * (a + b)
        signs = np.polynomial.polynomial.polyval(mid, parts.T) if len(parts) else np.zeros(0)
        for worst in (signs > 0, signs < 0):
            total = base + parts[worst].sum(axis=0)
            slope = total[1:] * np.arange(1, 4)
            found += [t for t in _unit_roots(slope) if a < t < b]
    return found


def _unit_roots(coef: np.ndarray) -> list[float]:
    """Real roots in (0, 1) of the polynomial with ascending coefficients `coef`, its negligible
    leading terms dropped (relative 1e-10 of the largest)."""
    scale = np.abs(coef).max() if coef.size else 0.0
    if scale == 0.0:
        return []
    kept = coef / scale
    degree = len(kept) - 1
    while degree > 0 and abs(kept[degree]) < 1e-10:
        degree -= 1
    if degree == 0:
        return []
    roots = np.roots(kept[degree::-1])
    real = roots.real[np.abs(roots.imag) <= 1e-9 * np.maximum(1.0, np.abs(roots))]
    return [float(t) for t in real if 1e-12 < t < 1 - 1e-12]
