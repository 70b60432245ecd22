"""Pattern arrangements by per-span superposition: every arrangement of a given combination is its
fixed part (unpatterned loads, self weight) plus the sum of the switches that are on, a switch
being one patterned case's part on one span, factored as in the combination. The arrangements of a
combination are every choice of switches on and off (analysis.patterns: each case on any set of
spans, none included), so for any quantity linear in the loads the largest value over all
arrangements is the fixed part plus the sum of the positive contributions, and the smallest the
fixed part plus the negative ones: cost linear in spans, not one row per arrangement. The
arrangement that reaches it is the set of switches of that sign, which names it.

Valid only where every combination is a weighted sum of the case solutions (MemberSolution, first
order). Where the actions are not (second-order actions, whose axial force changes with the
arrangement), use the per-arrangement path (every arrangement a combination of its own): it is
correct, only slower.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.analysis.member_solution import MemberSolution
from sizer.analysis.patterns import PART_MARK


@dataclass(frozen=True)
class SwitchedCombination:
    """One given combination as a fixed part and switches, in the columns of MemberSolution.weights
    (each case, then the unit self weight)."""

    origin: str  # the given combination's name
    fixed: np.ndarray  # (n_columns,) weights of the part in every arrangement
    switches: np.ndarray  # (K, n_columns) weights of each switch (one patterned case on one span)
    switch_cases: tuple[str, ...]  # the per-span case of each switch ("<case> @ span k")
    names: dict[frozenset[int], str]  # the switches on (indices into switch_cases) -> arrangement name

    def arrangement(self, on: np.ndarray) -> str:
        """The name of the arrangement whose switches on are those where `on` (K,) is true."""
        return self.names[frozenset(np.flatnonzero(on).tolist())]


def switched_combinations(solution: MemberSolution) -> list[SwitchedCombination]:
    """The solution's combinations grouped by the given combination they come from, each as a fixed
    part and switches (a combination without patterned cases: no switches, one arrangement). Needs
    the combinations to be weighted sums of the case solutions (module docstring)."""
    weights = solution.weights()
    columns = list(solution.cases)
    switched = np.array([PART_MARK in name for name in columns] + [False])
    member = solution.member
    groups: dict[str, list[int]] = {}
    for row, name in enumerate(solution.combination_names):
        groups.setdefault(member.origin(name), []).append(row)
    found = []
    for origin, rows in groups.items():
        table = weights[rows]
        used = np.flatnonzero(switched & np.any(table != 0.0, axis=0))
        fixed = np.where(switched, 0.0, table[0])
        switches = np.zeros((len(used), weights.shape[1]))
        switches[np.arange(len(used)), used] = table[np.argmax(table[:, used] != 0.0, axis=0), used]  # the factor where on
        names = {frozenset(np.flatnonzero(table[k, used] != 0.0).tolist()): solution.combination_names[row] for k, row in enumerate(rows)}
        found.append(SwitchedCombination(origin, fixed, switches, tuple(columns[j] for j in used), names))
    return found


def linear_extremes(fixed: np.ndarray, parts: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(largest, smallest) over every arrangement of a quantity linear in the loads: `fixed` (...)
    its value from the fixed part, `parts` (K, ...) each switch's contribution; every subset of
    switches is an arrangement (the empty one included)."""
    return fixed + np.maximum(parts, 0.0).sum(axis=0), fixed + np.minimum(parts, 0.0).sum(axis=0)


def worst_switches(parts: np.ndarray, index: tuple[int, ...], largest: bool) -> np.ndarray:
    """(K,) the switches on in the arrangement that makes the quantity at `index` (into parts[0])
    largest (or smallest): those whose contribution there is of that sign."""
    there = parts[(slice(None),) + tuple(index)]
    return there > 0.0 if largest else there < 0.0


def superposable(solution: MemberSolution) -> bool:
    """True where the solution's combinations are pattern arrangements and each is a weighted sum of
    its case solutions (a MemberSolution: first order). A solution of another kind (second order:
    the axial force, and so the stiffness, change with the arrangement) is not: the per-arrangement
    path is used there."""
    return solution.member.patterning is not None and type(solution) is MemberSolution


def every_arrangement(switched: list[SwitchedCombination]) -> bool:
    """True when the solution holds every arrangement of each of its given combinations (a solution
    of some arrangements only, as for one combination's reserve factor, is not to be superposed:
    its worst arrangement could be one it does not hold)."""
    return all(len(combination.names) == 2 ** len(combination.switches) for combination in switched)
