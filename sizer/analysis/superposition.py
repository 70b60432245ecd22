"""Pattern arrangements by per-span superposition: every arrangement of a given combination is its
fixed part (unpatterned loads, self weight) plus the sum of the switches that are on, a switch
being one patterned case's part on one span, factored as in the combination (analysis.patterns).
Every choice of switches on and off is an arrangement, the empty one included, so:

- for any quantity linear in the loads, the largest value over all arrangements is the fixed part
  plus the sum of the positive contributions, and the smallest the fixed part plus the negative
  ones (cost linear in spans, not one row per arrangement); the arrangement that reaches it is the
  set of switches of that sign, which names it;
- for a convex measure of a few such quantities (a length sqrt(a^2 + b^2), von Mises), the
  largest value over all arrangements is at a corner of the set the arrangements map to (a
  zonotope: the fixed point plus the sums of any of the switches' vectors); its corners are the
  arrangements that switch on the contributions positive along some direction, found exactly from
  the switches' vectors (convex_maximum).

Valid only where every combination is a weighted sum of the case solutions (MemberSolution, first
order) and the member holds its arrangements as analysis.patterns made them (superposable).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

import numpy as np

from sizer.analysis.member_solution import MemberSolution

ZERO_SHARE = 1e-9  # relative to the largest contribution to a kind of quantity anywhere: one this small is taken as none (round-off)


@dataclass(frozen=True)
class SwitchedCombination:
    """One given combination as a fixed part and switches, in the columns of MemberSolution.weights
    (each case, then the unit self weight)."""

    origin: str  # the given combination's name
    fixed: np.ndarray  # (n_columns,) weights of the part in every arrangement
    switches: np.ndarray  # (K, n_columns) weights of each switch (one patterned case on one span)

    def weights(self, on: np.ndarray) -> np.ndarray:
        """(n_columns,) the weights of the arrangement with the switches `on` (K,) bool."""
        return self.fixed + self.switches[np.asarray(on, bool)].sum(axis=0)


def switched_combinations(solution: MemberSolution, mass_per_length: float | None = ...) -> list[SwitchedCombination]:  # type: ignore[assignment]
    """The solution's given combinations that have switches, each as a fixed part and switches (the
    fixed part is the weights of its arrangement with no switch on, which the member always holds).
    `mass_per_length` as MemberSolution.weights."""
    member = solution.member
    patterning = member.patterning
    if patterning is None:
        return []
    weights = solution.weights(mass_per_length)
    columns = {name: j for j, name in enumerate(solution.cases)}
    rows = {name: row for row, name in enumerate(solution.combination_names)}
    empty = {member.origin(name): name for name, loaded in patterning.loaded.items() if not loaded and name in rows}
    found = []
    for origin, switches in patterning.switches.items():
        if origin not in empty:
            continue
        table = np.zeros((len(switches), weights.shape[1]))
        for k, (case, factor) in enumerate(switches):
            if case in columns:
                table[k, columns[case]] = factor
        found.append(SwitchedCombination(origin, weights[rows[empty[origin]]], table))
    return found


def superposable(solution: MemberSolution) -> bool:
    """True where the solution's combinations are pattern arrangements as analysis.patterns made them
    (not a few of them alone, as for one combination's reserve factor) and each is a weighted sum
    of its case solutions (a MemberSolution: first order). A solution of another kind (second
    order: the axial force, and so the stiffness, change with the arrangement) is not."""
    member = solution.member
    patterning = member.patterning
    if patterning is None or type(solution) is not MemberSolution:
        return False
    return set(member.combinations) == set(patterning.origins)


def linear_extremes(fixed: np.ndarray, parts: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(largest, smallest) over every arrangement of a quantity linear in the loads: `fixed` (...)
    its value from the fixed part, `parts` (K, ...) each switch's contribution; every subset of
    switches is an arrangement (the empty one included)."""
    return fixed + np.maximum(parts, 0.0).sum(axis=0), fixed + np.minimum(parts, 0.0).sum(axis=0)


def streamed_extremes(fixed: np.ndarray, part: Callable[[int], np.ndarray], count: int) -> tuple[np.ndarray, np.ndarray]:
    """linear_extremes with the `count` switches' contributions made one at a time by `part(k)` (each
    shaped as `fixed`): the memory of one contribution, not of all of them."""
    high, low = np.zeros_like(fixed), np.zeros_like(fixed)
    for k in range(count):
        value = part(k)
        high += np.maximum(value, 0.0)
        low += np.minimum(value, 0.0)
    return fixed + high, fixed + low


def sign_patterns(parts: np.ndarray) -> np.ndarray:
    """(P, K) bool: the distinct arrangements that make some quantity of `parts` (K, ..., c) largest
    (the switches whose contribution is positive) or smallest (negative); contributions below
    ZERO_SHARE of the largest of their kind (last axis) anywhere count as none."""
    if parts.size == 0:
        return np.zeros((0, parts.shape[0]), bool)
    scale = np.abs(parts).reshape(-1, parts.shape[-1]).max(axis=0) * ZERO_SHARE
    flat = parts.reshape(parts.shape[0], -1)
    limit = np.broadcast_to(scale, parts.shape[1:]).ravel()
    patterns = np.concatenate([(flat > limit).T, (flat < -limit).T])
    return np.unique(patterns, axis=0)


def vertex_patterns(vectors: np.ndarray) -> np.ndarray:
    """(P, K) bool: arrangements that include every corner of the zonotope {sum of any of the
    `vectors` (K, d)}: for each direction u, the switches with vectors along u (v . u > 0) give the
    corner farthest along u. The directions that matter are found from the vectors' span (rank up
    to 3): on a line, both senses; in a plane, one direction inside each arc between the normals of
    the vectors; in space, around each direction normal to two of the vectors (v_i x v_j), every
    choice of the vectors in that plane that is a corner of their own (planar) zonotope."""
    count = vectors.shape[0]
    if count == 0:
        return np.zeros((1, 0), bool)
    scale = float(np.abs(vectors).max())
    if scale == 0.0:
        return np.zeros((1, count), bool)
    u, s, vt = np.linalg.svd(vectors / scale, full_matrices=False)
    rank = int(np.sum(s > 1e-9 * s[0]))
    coordinates = (vectors / scale) @ vt[:rank].T  # (K, rank)
    if rank == 1:
        x = coordinates[:, 0]
        return np.array([x > 1e-12, x < -1e-12])
    if rank == 2:
        return _planar_patterns(coordinates)
    if rank > 3:
        raise ValueError("corners of a zonotope are found for up to three dimensions")
    return _spatial_patterns(coordinates)


def _planar_patterns(vectors: np.ndarray) -> np.ndarray:
    """vertex_patterns of vectors (K, 2)."""
    length = np.hypot(vectors[:, 0], vectors[:, 1])
    live = length > 1e-12 * max(float(length.max()), 1e-300)
    angles = np.arctan2(vectors[live, 1], vectors[live, 0])
    normals = np.sort(np.mod(np.concatenate([angles + np.pi / 2, angles - np.pi / 2]), 2 * np.pi))
    normals = normals[np.concatenate([[True], np.diff(normals) > 1e-12])]
    following = np.append(normals[1:], normals[0] + 2 * np.pi)
    middles = 0.5 * (normals + following)
    directions = np.column_stack([np.cos(middles), np.sin(middles)])
    return np.unique((directions @ vectors.T) > 0.0, axis=0) & live[None, :]


def _spatial_patterns(vectors: np.ndarray) -> np.ndarray:
    """vertex_patterns of vectors (K, 3) spanning space."""
    count = vectors.shape[0]
    length = np.linalg.norm(vectors, axis=1)
    tolerance = 1e-9 * float(length.max())
    found = []
    for i in range(count):
        for j in range(i + 1, count):
            normal = np.cross(vectors[i], vectors[j])
            size = float(np.linalg.norm(normal))
            if size <= tolerance * float(length.max()):
                continue
            normal /= size
            along = vectors @ normal
            tied = np.abs(along) <= tolerance
            plane = vectors[tied] - np.outer(along[tied], normal)
            basis = np.linalg.svd(plane, full_matrices=False)[2][:2] if plane.shape[0] > 1 else np.eye(3)[:2]
            inner = _planar_patterns(plane @ basis.T) if plane.shape[0] else np.zeros((1, 0), bool)
            for sense in (1.0, -1.0):
                rows = np.repeat((sense * along > tolerance)[None, :], len(inner), axis=0)
                rows[:, tied] = inner
                found.append(rows)
    if not found:
        return _planar_patterns(vectors[:, :2])
    return np.unique(np.concatenate(found), axis=0)


def convex_maximum(fixed: np.ndarray, parts: np.ndarray, measure: Callable[[np.ndarray], np.ndarray]) -> tuple[float, np.ndarray]:
    """(largest value, arrangement (K,) bool) over every arrangement of `measure` (a convex function
    of the last axis, vectorised) of fixed (d,) + the sum of the switched parts (K, d) that are on."""
    patterns = vertex_patterns(parts)
    values = measure(fixed[None, :] + patterns.astype(float) @ parts)
    best = int(np.argmax(values))
    return float(values[best]), patterns[best]


def candidate_arrangements(solution: MemberSolution, xs: np.ndarray, sides: np.ndarray) -> dict[str, set[frozenset[int]]]:
    """For each given combination with switches, the arrangements that make some action (N, Vy, Vz,
    T, My, Mz) largest or smallest at some station `xs` (m, `sides` as MemberSolution.actions),
    some reaction largest or smallest, and (with the member's stiffness) some displacement largest or
    smallest there: with these among the combinations, the envelopes of those quantities over them
    equal those over every arrangement."""
    switched = switched_combinations(solution, None)
    if not switched:
        return {}
    each = solution.case_actions(xs, sides)  # (columns, n, 6)
    reactions = np.stack([case.reactions for case in solution.cases.values()]
                         + [np.zeros_like(next(iter(solution.cases.values())).reactions)])
    moved = solution.case_displacements(xs, sides) if solution.has_displacements else None
    found: dict[str, set[frozenset[int]]] = {}
    for combination in switched:
        blocks = [sign_patterns(np.tensordot(combination.switches, values, axes=1))
                  for values in (each, reactions, moved) if values is not None]
        patterns = np.concatenate(blocks)
        found[combination.origin] = {frozenset(np.flatnonzero(row).tolist()) for row in patterns}
    return found
