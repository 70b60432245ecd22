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
from dataclasses import dataclass, field
from typing import Callable

import numpy as np

from sizer.analysis.superposition import linear_extremes
from sizer.checks.results import ZERO_ACTION
from sizer.stability import Buckling
from sizer.stability.problem import SectionStability
from sizer.stability.solve import largest_eigenpairs

BOUND_SLACK = 1e-9  # relative: a bound lowered by this much covers the round-off between the two ways of solving
LEAF_SWITCHES = 0  # a set with this many free switches or fewer is solved one arrangement at a time (4 solves)


@dataclass
class LateralSearch:
    """What the branch and bound found for one given combination: the exact load factor of each
    arrangement it solved (switches on -> Buckling), the proven lower bound of every set it bounded
    (the switches fixed on or off -> load factor), and the arrangement of the largest utilization."""

    exact: dict[frozenset[int], Buckling] = field(default_factory=dict)
    bounds: list[tuple[dict[int, bool], float]] = field(default_factory=list)
    best: frozenset[int] | None = None

    def load_factor(self, on: frozenset[int]) -> tuple[Buckling, bool]:
        """(Buckling, exact?) of one arrangement: solved, or the highest bound of the sets it is in."""
        if on in self.exact:
            return self.exact[on], True
        factor = max((value for fixed, value in self.bounds if all((k in on) == state for k, state in fixed.items())), default=0.0)
        return Buckling(factor, None), math.isinf(factor)


def lateral_over_arrangements(solver: SectionStability, fixed: np.ndarray, switches: np.ndarray, moments: tuple[np.ndarray, np.ndarray],
                              utilization: Callable[[float, float, float], float], allowance: float = 1.0) -> LateralSearch | None:
    """Branch and bound over the arrangements of one combination: `fixed` (columns,) the weights in
    every arrangement (self-weight included), `switches` (K, columns) each switch's; `moments` the
    major-axis moment Mz (section axes) at the stations, fixed part (n,) and each switch's (K, n);
    `utilization(peak |Mz|, its sign, load factor)` the lateral-torsional utilization, which rises
    with the moment. The bounds are made on the solver's base mesh and multiplied by `allowance`
    (sizer.checks.stability.refinement_allowance) to hold for converged load factors; the
    arrangements solved are solved converged. None when the bound does not apply (K with free
    movements, or a sparse base mesh)."""
    if not hasattr(solver.reduced, "standard_forms"):  # a sparse level: each arrangement is solved on its own
        return None
    forms = solver.reduced.standard_forms([solver.load_matrix("lateral", w) for w in [fixed, *switches]])
    if forms is None:
        return None
    return _Search(solver, fixed, switches, moments, utilization, forms, allowance).run()


class _Search:
    """The best-first branch and bound of lateral_over_arrangements: split on the free switch that adds
    most to the bound along its buckled shape (the loaded span that drives the mode), which closes the
    bound in few splits where the mode is local to a span or two."""

    def __init__(self, solver: SectionStability, fixed: np.ndarray, switches: np.ndarray, moments: tuple[np.ndarray, np.ndarray],
                 utilization: Callable[[float, float, float], float], forms: list[np.ndarray], allowance: float) -> None:
        self.solver, self.fixed, self.switches, self.utilization, self.allowance = solver, fixed, switches, utilization, allowance
        self.moment, self.moment_parts = moments
        self.base, self.parts = forms[0], forms[1:]
        self.positive = [_positive_part(c) for c in self.parts]
        self.found = LateralSearch()

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
        values, vectors = largest_eigenpairs(total, 1)  # the largest alone: eigenvalues without vectors, then inverse iteration
        top = float(values[0])
        return (self.allowance / top * (1 - BOUND_SLACK), vectors[:, 0]) if top > 0 else (math.inf, None)

    def peaks(self, fixed: dict[int, bool]) -> list[tuple[float, float]]:
        """(peak, sign) bounds of the largest sagging and hogging |Mz| over the arrangements agreeing with `fixed`."""
        on = [k for k, state in fixed.items() if state]
        free = [k for k in range(len(self.switches)) if k not in fixed]
        base = self.moment + self.moment_parts[on].sum(axis=0)
        if not free:  # one arrangement: the sign where |Mz| is largest, as the check takes it
            at = int(np.argmax(np.abs(base))) if base.size else 0
            return [(abs(float(base[at])), -1.0 if base.size and base[at] < 0 else 1.0)] if base.size else []
        high, low = linear_extremes(base, self.moment_parts[free]) if free else (base, base)
        return [(float(high.max(initial=0.0)), 1.0), (float(-low.min(initial=0.0)), -1.0)]

    def node(self, fixed: dict[int, bool]) -> tuple[float, dict[int, bool], float, np.ndarray | None]:
        """(upper bound of the utilization, fixed switches, load-factor bound, its shape) of one set."""
        factor, shape = self.bound(fixed)
        self.found.bounds.append((fixed, factor))
        upper = max((self.utilization(peak, sign, factor) for peak, sign in self.peaks(fixed) if peak > ZERO_ACTION), default=0.0) \
            if math.isfinite(factor) else 0.0
        return upper, fixed, factor, shape

    def run(self) -> LateralSearch:
        best, counter = -math.inf, 0
        upper, *rest = self.node({})
        heap: list = [(-upper, counter, *rest)]
        while heap and -heap[0][0] >= best:
            _, _, fixed, factor, shape = heapq.heappop(heap)
            if math.isinf(factor):  # none of them can buckle sideways
                continue
            free = [k for k in range(len(self.switches)) if k not in fixed]
            if len(free) <= LEAF_SWITCHES:  # a few arrangements: solving each costs no more than splitting further
                for bits in range(2 ** len(free)):
                    on = frozenset([k for k, state in fixed.items() if state] + [k for i, k in enumerate(free) if bits >> i & 1])
                    value = self.solve(on)
                    if value > best:
                        best, self.found.best = value, on
                continue
            j = max(free, key=lambda k: float(shape @ self.positive[k] @ shape))
            for state in (True, False):
                counter += 1
                upper, *rest = self.node({**fixed, j: state})
                heapq.heappush(heap, (-upper, counter, *rest))
        return self.found

    def solve(self, on: frozenset[int]) -> float:
        """Solve one arrangement converged; its lateral-torsional utilization (-inf without moment)."""
        weights = self.fixed + self.switches[sorted(on)].sum(axis=0)
        moments = self.moment + self.moment_parts[sorted(on)].sum(axis=0)
        found = self.solver.load_set("lateral", weights)
        self.found.exact[on] = found
        at = int(np.argmax(np.abs(moments)))
        peak = abs(float(moments[at]))
        if peak <= ZERO_ACTION or not math.isfinite(found.load_factor):
            return -math.inf
        return self.utilization(peak, -1.0 if moments[at] < 0 else 1.0, found.load_factor)


def _positive_part(c: np.ndarray) -> np.ndarray:
    """The symmetric matrix with the eigenvectors of `c` and its eigenvalues below zero set to zero."""
    if c.size == 0:
        return c
    values, vectors = np.linalg.eigh(c)
    return (vectors * np.maximum(values, 0.0)) @ vectors.T
