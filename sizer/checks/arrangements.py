"""The pattern arrangements that govern the stress checks of one section, over every arrangement
without listing them (analysis.superposition), so that the checks, which evaluate the member's
combinations one by one, evaluate them too:

- normal stress at each mesh node (from N, My, Mz; and the bending part from My, Mz) is linear in
  the loads: its worst arrangement at each node and station is the fixed part plus the switches of
  one sign; the arrangement of the largest over nodes and stations is taken;
- the shear stress vector (tau_xy, tau_xz) and von Mises sqrt(sigma^2 + 3 tau^2) at a node are
  convex measures of linear parts: at each (station, node) an upper bound over every arrangement
  from the linear envelopes (each part at its own worst) orders the points; the exact largest over
  every arrangement (convex_maximum: the corners of the set of values) is found point by point
  until no remaining bound can beat the best exact one, as the field peaks do over rows.

Where warping adds normal and shear stress (a bimoment), the node stresses are not split by span
here; the arrangements that govern the actions (analysis.superposition.candidate_arrangements)
stand for them and the output says so.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from sizer.analysis.section_axes import to_section_axes
from sizer.analysis.superposition import convex_maximum, linear_extremes, streamed_extremes, switched_combinations
from sizer.checks.results import CHUNK_VALUES
from sizer.design import Design

SLACK = 1e-9  # relative: a bound within this of the best exact value cannot beat it


def stress_arrangements(design: Design, xs: np.ndarray, sides: np.ndarray, unit_field: Any,
                        actions: np.ndarray) -> dict[str, set[frozenset[int]]]:
    """Given combination -> the arrangements that give the largest bending and normal stress (each
    sign), shear stress and von Mises stress over every mesh node and station (module docstring);
    `actions` (C, n, 6) those of the member's combinations at the stations, section axes: an
    arrangement that cannot beat their largest shear or von Mises stress is not looked for."""
    from sizer.checks.field import FieldPeaks

    held = FieldPeaks(actions, unit_field, design.props.area)
    beaten = (held.largest(held.shear_upper, lambda rows, exact: exact[:, 1])[0],
              held.largest(held.equivalent_upper, lambda rows, exact: exact[:, 2])[0])
    each = to_section_axes(design.solution.case_actions(xs, sides), design.member.orientation)  # (columns, n, 6)
    sigma = np.asarray(unit_field.sigma)[0:3]  # (3, p): N, My, Mz
    tau = np.asarray(unit_field.tau)[0:3]  # (3, p, 2): Vy, Vz, T
    found: dict[str, set[frozenset[int]]] = {}
    for combination in switched_combinations(design.solution):
        fixed = np.tensordot(combination.fixed, each, axes=1)  # (n, 6)
        parts = np.tensordot(combination.switches, each, axes=1)  # (K, n, 6)
        picked: set[frozenset[int]] = set()
        for columns, rows in (((4, 5), sigma[1:3]), ((0, 4, 5), sigma)):
            picked |= _linear_worst(fixed[:, columns], parts[..., columns], rows)
        if np.any(fixed[:, 0]) or np.any(parts[..., 0]):  # the interaction: each station's worst bending
            picked |= _station_worst(fixed[:, 4:6], parts[..., 4:6], sigma[1:3])
        shear = _Stresses(fixed, parts, tau, sigma, with_normal=False)
        equivalent = _Stresses(fixed, parts, tau, sigma, with_normal=True)
        for stresses, best in ((shear, beaten[0]), (equivalent, beaten[1])):
            on = _convex_worst(stresses, best)
            if on is not None:
                picked.add(frozenset(np.flatnonzero(on).tolist()))
        found[combination.origin] = picked
    return found


def _linear_worst(fixed: np.ndarray, parts: np.ndarray, rows: np.ndarray) -> set[frozenset[int]]:
    """The arrangements of the largest and of the smallest value of a linear quantity over every point
    and arrangement: the actions `fixed` (n, c) and `parts` (K, n, c) times the unit values `rows`
    (c, p) (each switch's (n, p) values made one at a time)."""
    if not parts.size:
        return set()
    high, low = streamed_extremes(fixed @ rows, lambda k: parts[k] @ rows, len(parts))
    points = [np.unravel_index(int(np.argmax(sense * values)), values.shape) for values, sense in ((high, 1.0), (low, -1.0))]
    at = np.array([[(parts[k] @ rows)[n, p] for n, p in points] for k in range(len(parts))])  # (K, 2)
    return {frozenset(np.flatnonzero(sense * at[:, i] > 0.0).tolist()) for i, sense in enumerate((1.0, -1.0))}


def _station_worst(fixed: np.ndarray, parts: np.ndarray, rows: np.ndarray) -> set[frozenset[int]]:
    """For each station, the arrangement of the largest |value| over the nodes of a linear quantity
    (the actions `fixed` (n, c) and `parts` (K, n, c) times the unit values `rows` (c, p)): with the
    axial force and Fb the same in every arrangement, the one of the largest interaction fa/Fa +
    fb/Fb at that station."""
    high, low = streamed_extremes(fixed @ rows, lambda k: parts[k] @ rows, len(parts))
    size = np.maximum(high, -low)
    node = size.argmax(axis=1)
    stations = np.arange(size.shape[0])
    sense = np.where(high[stations, node] >= -low[stations, node], 1.0, -1.0)
    signs = np.stack([sense * (parts[k] @ rows)[stations, node] > 0.0 for k in range(len(parts))])  # (K, n)
    return {frozenset(np.flatnonzero(column).tolist()) for column in np.unique(signs.T, axis=0)}


class _Stresses:
    """The shear vector (tau_xy, tau_xz), or with_normal (sigma, sqrt(3) tau_xy, sqrt(3) tau_xz), at
    every (station, node): fixed part and each switch's part, made block by block of stations."""

    def __init__(self, fixed: np.ndarray, parts: np.ndarray, tau: np.ndarray, sigma: np.ndarray, with_normal: bool) -> None:
        self.fixed, self.parts, self.tau, self.sigma, self.with_normal = fixed, parts, tau, sigma, with_normal
        self.nodes = sigma.shape[1]

    def values(self, actions: np.ndarray) -> np.ndarray:
        """(..., p, d) the stress vector of actions (..., 6)."""
        shear = np.stack([actions[..., 1:4] @ self.tau[..., 0], actions[..., 1:4] @ self.tau[..., 1]], axis=-1)
        if not self.with_normal:
            return shear
        normal = (actions[..., (0, 4, 5)] @ self.sigma)[..., None]
        return np.concatenate([normal, math.sqrt(3.0) * shear], axis=-1)

    def station_bounds(self) -> np.ndarray:
        """(n,) an upper bound over every arrangement and node at each station: each action at the
        larger size of its own largest and smallest, times its largest unit stress of each component."""
        high, low = linear_extremes(self.fixed, self.parts)
        size = np.maximum(high, -low)  # (n, 6)
        unit = np.abs(self.values(np.eye(6)[:, None, :])[:, 0])  # (6, p, d): each action's unit stresses
        return np.sqrt(((size @ unit.max(axis=1)) ** 2).sum(axis=-1))

    def bounds(self, stations: np.ndarray) -> np.ndarray:
        """(len(stations), p) an upper bound over every arrangement of the measure's value at each
        node of these stations: each component at the larger size of its own largest and smallest."""
        high, low = streamed_extremes(self.values(self.fixed[stations]), lambda k: self.values(self.parts[k, stations]), len(self.parts))
        return np.sqrt((np.maximum(high, -low) ** 2).sum(axis=-1))

    def exact(self, station: int, node: int) -> tuple[float, np.ndarray]:
        """(largest value over every arrangement, its switches on) at one point."""
        fixed = self.values(self.fixed[station])[node]
        parts = self.values(self.parts[:, station])[:, node]
        return convex_maximum(fixed, parts, _length)


def _length(vectors: np.ndarray) -> np.ndarray:
    return np.sqrt((vectors * vectors).sum(axis=-1))


def _convex_worst(stresses: _Stresses, held: float) -> np.ndarray | None:
    """The switches on of the arrangement with the largest value of the measure over every point and
    arrangement, where it is above `held` (the largest of the combinations held already; None where
    none is): stations in order of a coarse bound (each action's largest unit
    stress), a block at a time; in a block, exact values point by point in order of their bounds,
    until no bound left can beat the best."""
    coarse = stresses.station_bounds()
    stations = np.argsort(-coarse, kind="stable")
    rows = max(1, CHUNK_VALUES // max(stresses.nodes * (len(stresses.parts) + 1) * 3, 1))
    best, best_on = held * (1 + SLACK), None
    for start in range(0, len(stations), rows):
        block = stations[start:start + rows]
        if coarse[block[0]] <= 0.0 or coarse[block[0]] * (1 + SLACK) < best:
            break
        bounds = stresses.bounds(block)
        for flat in np.argsort(-bounds, axis=None, kind="stable").tolist():
            row, node = divmod(flat, bounds.shape[1])
            if bounds[row, node] <= 0.0 or bounds[row, node] * (1 + SLACK) < best:
                break
            value, on = stresses.exact(int(block[row]), node)
            if value > best:
                best, best_on = value, on
    return best_on


NEAR_BEST = 0.01  # relative: deflection arrangements this close to the best at the grid points are checked in full too


def deflection_arrangements(design: Design) -> dict[str, set[frozenset[int]]]:
    """Given combination -> the arrangements that give the largest deflection of each span a limit
    applies to (sizer.checks.deflection: relative to the supports or not, uy and uz together, over
    the span length / limit): the deflection vector at each point is linear in the loads and its
    length convex, so its largest over every arrangement is at a corner (convex_maximum), found
    point by point in order of an upper bound from the linear envelopes, on the check's grid
    (PEAK_GRID points on each piece between concentrated items); those within NEAR_BEST of the best
    are taken too, since the check finds each arrangement's peak between grid points."""
    from sizer.analysis import segment_ends
    from sizer.analysis.patterns import arrangements_of
    from sizer.checks.deflection import PEAK_GRID, limit_entries, limited_spans, span_body

    solution = design.solution
    if not solution.has_displacements:
        return {}
    switched = {combination.origin: combination for combination in switched_combinations(solution)}
    ends = segment_ends(design.member)
    found: dict[str, set[frozenset[int]]] = {}
    for entry in limit_entries(design.member.checks):
        origins = {design.member.origin(name) for name in arrangements_of(design.member, entry.combinations)} & set(switched)
        for span, limit in limited_spans(design.member, entry):
            inside = ends[(ends > span.start) & (ends < span.end)]
            edges = np.concatenate([[span.start], inside, [span.end]])
            xs = (edges[:-1, None] + np.linspace(0.0, 1.0, PEAK_GRID)[None, :] * np.diff(edges)[:, None]).ravel()
            reference = [span.base] if span.overhang else [span.start, span.end]
            each = span_body(solution.case_displacements(np.concatenate([xs, reference]))[..., 1:3], xs, span, entry.relative_to_supports)
            for origin in origins:
                combination = switched[origin]
                fixed = np.tensordot(combination.fixed, each, axes=1)  # (n, 2)
                parts = np.tensordot(combination.switches, each, axes=1)  # (K, n, 2)
                found.setdefault(origin, set()).update(_largest_lengths(fixed, parts))
    return found


def _largest_lengths(fixed: np.ndarray, parts: np.ndarray) -> set[frozenset[int]]:
    """The arrangements whose vector length at some point (fixed (n, d), parts (K, n, d)) is within
    NEAR_BEST of the largest over every point and arrangement."""
    high, low = linear_extremes(fixed, parts)
    bounds = np.sqrt((np.maximum(high, -low) ** 2).sum(axis=-1))
    best, kept = -math.inf, []
    for point in np.argsort(-bounds, kind="stable").tolist():
        if bounds[point] <= 0.0 or bounds[point] < best * (1 - NEAR_BEST):
            break
        value, on = convex_maximum(fixed[point], parts[:, point], _length)
        best = max(best, value)
        kept.append((value, frozenset(np.flatnonzero(on).tolist())))
    return {on for value, on in kept if value >= best * (1 - NEAR_BEST)}


def with_arrangements(design: Design, added: dict[str, set[frozenset[int]]]) -> Design:
    """The design with these arrangements among its solution's combinations (itself when none is new)."""
    from dataclasses import replace

    solution = design.solution.with_arrangements(added)
    if solution is design.solution:
        return design
    return replace(design, member=solution.member, solution=solution)
