"""Lateral-torsional buckling over the pattern arrangements of one combination, without an
eigen-solve per arrangement: branch and bound on the spans' switches.

An arrangement's geometric matrix is the sum of the always-present loads' and each loaded part's
(B = B0 + sum s_j B_j, s_j 0 or 1: linear in the loads, each part's factor of one sign). In the
standard form of the eigen-solve (C = L^-1 B L^-T, K = L L^T) the load factor is 1 / the largest
eigenvalue of C. Each s_j C_j is at most the positive part of C_j (its eigen-decomposition with the
negative eigenvalues dropped) in the order of symmetric matrices, and the largest eigenvalue rises
with that order, so for the arrangements that agree on the switches already fixed
    load factor >= 1 / largest eigenvalue of (C0 + the fixed loaded C_j + the positive parts of the free ones):
one solve bounds them all. The lateral-torsional utilization rises with the moment and falls with
the load factor, so each set of arrangements has a proven upper bound of their utilization; the set
with the highest bound is split on a free switch (best first) until a set of one arrangement is
solved exactly (a set of a few, each of them), and the search stops when no open set can beat the
best exact utilization. Every
arrangement not solved keeps its set's lower bound of the load factor (conservative for every check
that uses it; marked so in the outputs).
"""

from __future__ import annotations

import heapq
import math
from typing import Callable

import numpy as np

from sizer.stability import Buckling
from sizer.stability.problem import SectionStability

BOUND_SLACK = 1e-9  # relative: a bound lowered by this much covers the round-off between the two ways of solving
LEAF_ROWS = 4  # a set of this many arrangements or fewer is solved one by one (where bounds are loose the search costs at most ~1.5 solves an arrangement)


def lateral_over_arrangements(solver: SectionStability, loads: np.ndarray, demand: np.ndarray,
                              utilization: Callable[[np.ndarray, float], np.ndarray],
                              allowance: float = 1.0) -> dict[int, tuple[Buckling, bool]] | None:
    """For the arrangements of one combination, weights `loads` (A, columns) with self-weight: row ->
    (Buckling, exact?) for the rows with `demand` True; `utilization(rows, load_factor)` gives those
    rows' lateral-torsional utilizations at that load factor. The bounds are made on the solver's
    base mesh and multiplied by `allowance` (sizer.checks.stability.refinement_allowance) to hold for
    converged load factors; the arrangements solved are solved converged. None when the bound does
    not apply (K with free movements, or a sparse base mesh)."""
    varying = np.flatnonzero(np.ptp(loads, axis=0) > 0)
    bits = loads[:, varying] != 0.0  # (A, J) which parts each arrangement loads
    off = np.flatnonzero(~bits.any(axis=1))
    if not off.size:
        return None
    base = loads[off[0]]
    switches = []
    for k, column in enumerate(varying):
        weights = np.zeros(loads.shape[1])
        weights[column] = loads[np.flatnonzero(bits[:, k])[0], column]
        switches.append(weights)
    if not hasattr(solver.reduced, "standard_forms"):  # a sparse level: each arrangement is solved on its own
        return None
    forms = solver.reduced.standard_forms([solver.load_matrix("lateral", w) for w in [base] + switches])
    if forms is None:
        return None
    search = _Search(solver, loads, bits, demand, utilization, forms, allowance)
    return search.run()


class _Search:
    """The best-first branch and bound of lateral_over_arrangements: split on the free switch that adds
    most to the bound along its buckled shape (the loaded span that drives the mode), which closes the
    bound in few splits where the mode is local to a span or two."""

    def __init__(self, solver: SectionStability, loads: np.ndarray, bits: np.ndarray, demand: np.ndarray,
                 utilization: Callable[[np.ndarray, float], np.ndarray], forms: list[np.ndarray], allowance: float) -> None:
        self.solver, self.loads, self.bits, self.demand, self.utilization = solver, loads, bits, demand, utilization
        self.allowance = allowance
        self.base, self.parts = forms[0], forms[1:]
        self.positive = [_positive_part(c) for c in self.parts]
        self.exact: dict[int, tuple[Buckling, bool]] = {}

    def bound(self, fixed: dict[int, bool]) -> tuple[float, np.ndarray | None]:
        """A lower bound (or math.inf) of the load factor of every arrangement agreeing with `fixed`,
        and the shape (in standard form) that gives it."""
        if self.base.size == 0:
            return math.inf, None
        total = self.base.copy()
        for j, (part, positive) in enumerate(zip(self.parts, self.positive)):
            if j in fixed:
                if fixed[j]:
                    total += part
            else:
                total += positive
        values, vectors = np.linalg.eigh(total)
        top = float(values[-1])
        return (self.allowance / top * (1 - BOUND_SLACK), vectors[:, -1]) if top > 0 else (math.inf, None)

    def node(self, fixed: dict[int, bool]) -> tuple[float, dict[int, bool], np.ndarray, float, np.ndarray | None]:
        """(upper bound of the utilization, fixed switches, rows, load-factor bound, its shape) of one set."""
        rows = np.flatnonzero(self.demand & np.all([self.bits[:, j] == on for j, on in fixed.items()] or [np.ones(len(self.bits), bool)], axis=0))
        factor, shape = self.bound(fixed) if rows.size else (math.inf, None)
        upper = float(self.utilization(rows, factor).max(initial=-math.inf)) if math.isfinite(factor) else 0.0
        return upper, fixed, rows, factor, shape

    def branch(self, fixed: dict[int, bool], rows: np.ndarray, shape: np.ndarray) -> int:
        """The free switch to split on: of those the set's arrangements differ in, the one whose
        positive part adds most to the bound along its shape (it tightens the bound most)."""
        free = [k for k in range(self.bits.shape[1]) if k not in fixed and self.bits[rows, k].any() and not self.bits[rows, k].all()]
        return max(free, key=lambda k: float(shape @ self.positive[k] @ shape))

    def run(self) -> dict[int, tuple[Buckling, bool]]:
        best, counter = -math.inf, 0
        heap: list = []
        heapq.heappush(heap, (-self.node({})[0], counter, *self.node({})[1:]))
        while heap and -heap[0][0] >= best:
            _, _, fixed, rows, factor, shape = heapq.heappop(heap)
            if not rows.size:
                continue
            if math.isinf(factor):  # none of them can buckle sideways: exact
                for row in rows.tolist():
                    self.exact[row] = (Buckling(math.inf, None), True)
                continue
            if rows.size <= LEAF_ROWS:  # a few arrangements: solving each costs no more than splitting further
                for row in rows.tolist():
                    found = self.solve(row)
                    self.exact[row] = (found, True)
                    if math.isfinite(found.load_factor):
                        best = max(best, float(self.utilization(np.array([row]), found.load_factor)[0]))
                continue
            j = self.branch(fixed, rows, shape)
            for on in (True, False):
                counter += 1
                upper, *rest = self.node({**fixed, j: on})
                heapq.heappush(heap, (-upper, counter, *rest))
        for _, _, _, rows, factor, _ in heap:
            for row in rows.tolist():
                self.exact[row] = (Buckling(factor, None), math.isinf(factor))
        return self.exact

    def solve(self, row: int) -> Buckling:
        """The lowest load factor of one arrangement's load set, converged from this level's mesh."""
        return self.solver.lateral(self.loads[row])


def _positive_part(c: np.ndarray) -> np.ndarray:
    """The symmetric matrix with the eigenvectors of `c` and its eigenvalues below zero set to zero."""
    if c.size == 0:
        return c
    values, vectors = np.linalg.eigh(c)
    return (vectors * np.maximum(values, 0.0)) @ vectors.T
