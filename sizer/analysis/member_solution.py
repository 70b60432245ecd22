"""Every load case of a member solved once, plus a unit self-weight case (1 N/m along gravity);
any combination is a weighted sum of them (superposition). Without springs a section's solution
is the unit-rigidity one rescaled (displacements scale as 1 / rigidity).
"""

from __future__ import annotations

from types import EllipsisType
from typing import Iterable, Mapping, Sequence

import numpy as np
from numpy.typing import ArrayLike

from sizer.analysis.case import CaseSolution
from sizer.analysis.cuts import as_stations, right_side, section_actions
from sizer.analysis.displacements import combine_fields, field_displacements
from sizer.analysis.layout import position_tolerance
from sizer.analysis.loads import self_weight_load
from sizer.analysis.patterns import expand_patterns, with_arrangements
from sizer.analysis.solve import solve_columns
from sizer.errors import InputError
from sizer.model import Load, Member, Stiffness
from sizer.units import GRAVITY


def _case_names(member: Member) -> tuple[str, ...]:
    """Load cases of the member, then any case named only in a combination."""
    names = list(member.cases)
    for factors in member.combinations.values():
        names += [name for name in factors if name not in names]
    return tuple(names)


class MemberSolution:
    """Every load case solved once, plus the unit self-weight case; combinations by superposition."""

    def __init__(self, member: Member, cases: dict[str, CaseSolution], self_weight: CaseSolution | None,
                 mass_per_length: float | None, stiffness: Stiffness | None, self_weight_error: InputError | None = None) -> None:
        self.member = member
        self.stiffness = stiffness
        self.cases = cases
        self.self_weight = self_weight
        self.mass_per_length = mass_per_length
        self.combination_names: tuple[str, ...] = tuple(member.combinations)
        self._self_weight_error = self_weight_error
        self._factor_table: tuple[np.ndarray, np.ndarray] | None = None  # made on first use (see _factors)
        self._rows: dict[str, int] = {name: row for row, name in enumerate(self.combination_names)}

    @property
    def has_displacements(self) -> bool:
        """True when solved with the member's stiffness (a section)."""
        return self.stiffness is not None

    def for_section(self, stiffness: Stiffness, mass_per_length: float | None) -> "MemberSolution":
        """The solution for a section of rigidities `stiffness` and mass per length (kg/m, None: no
        self weight), without solving again. Exact when no support has a spring: the reactions and
        internal actions do not depend on uniform rigidities, and the displacements scale as
        1 / rigidity. Needs a solution made with rigidities (e.g. Stiffness.unit()); ValueError with
        springs, whose forces depend on the stiffness."""
        if self.member.has_springs:
            raise ValueError("a member with springs must be solved for each stiffness")
        if self.stiffness is None:
            raise ValueError("rescaling needs a solution made with rigidities, e.g. Stiffness.unit()")
        if mass_per_length is not None and self._self_weight_error is not None:
            raise self._self_weight_error
        cases = {name: case.on_rigidities(stiffness) for name, case in self.cases.items()}
        self_weight = self.self_weight.on_rigidities(stiffness) if self.self_weight is not None else None
        moved = MemberSolution(self.member, cases, self_weight, mass_per_length, stiffness, self._self_weight_error)
        moved._factor_table = self._factors()  # the same combinations and cases
        return moved

    def with_arrangements(self, added: Mapping[str, Iterable[frozenset[int]]]) -> "MemberSolution":
        """This solution with the pattern arrangements `added` (given combination -> sets of switches
        on, analysis.patterns.with_arrangements) among its combinations; itself when none is new."""
        member = with_arrangements(self.member, added)
        if member is self.member:
            return self
        return MemberSolution(member, self.cases, self.self_weight, self.mass_per_length, self.stiffness, self._self_weight_error)

    def with_mass(self, mass_per_length: float | None) -> "MemberSolution":
        """This solution with another self-weight mass per length (kg/m, None: no self weight), the
        same case solutions and rigidities (for_section on the same stiffness, without copying them)."""
        if mass_per_length is not None and self._self_weight_error is not None:
            raise self._self_weight_error
        moved = MemberSolution(self.member, self.cases, self.self_weight, mass_per_length, self.stiffness, self._self_weight_error)
        moved._factor_table = self._factors()
        return moved

    def with_combinations(self, member: Member, mass_per_length: float | None) -> "MemberSolution":
        """This solution for `member`, which differs from this one's member in its combinations alone
        (the same loads, supports and rigidities; no pattern expanded): the case solutions reused, the
        combinations `member`'s, self-weight of `mass_per_length` kg/m (None: none)."""
        if mass_per_length is not None and self._self_weight_error is not None:
            raise self._self_weight_error
        return MemberSolution(member, self.cases, self.self_weight, mass_per_length, self.stiffness, self._self_weight_error)

    def _factors(self) -> tuple[np.ndarray, np.ndarray]:
        """(n_combinations, n_cases) each combination's factor on each case, and (n_combinations,) its
        factor on the self-weight case (0 without one); made once (many pattern arrangements)."""
        if self._factor_table is None:
            names, sw_case = list(self.cases), self.member.self_weight_case
            cases = np.array([[self.member.combinations[c].get(name, 0.0) for name in names] for c in self.combination_names],
                             dtype=float).reshape(len(self.combination_names), len(names))
            weight = np.array([self.member.combinations[name].get(sw_case, 0.0) if sw_case is not None else 0.0 for name in self.combination_names])
            self._factor_table = (cases, weight)
        return self._factor_table

    def weights(self, mass_per_length: float | None | EllipsisType = ...) -> np.ndarray:
        """(n_combinations, n_cases + 1) factors on [each case in self.cases order..., unit self
        weight]; the last column is factor(self_weight_case) * mass_per_length * GRAVITY (N/m per
        unit case), 0 when mass is None. Default mass: self.mass_per_length."""
        mass = self.mass_per_length if mass_per_length is ... else mass_per_length
        cases, weight = self._factors()
        table = np.column_stack([cases, weight * mass * GRAVITY if mass is not None else np.zeros_like(weight)])
        if self._self_weight_error is not None and np.any(table[:, -1]):
            raise self._self_weight_error
        return table

    def _row(self, combination: str) -> np.ndarray:
        return self.combination_weights([combination])[0]

    def combination_weights(self, combinations: Sequence[str]) -> np.ndarray:
        """(len(combinations), n_cases + 1) rows of weights() for the named combinations, for
        weighted_actions and weighted_displacements; KeyError for an unknown name."""
        for combination in combinations:
            if combination not in self._rows:
                raise KeyError(f"no combination {combination!r}; there are {', '.join(self.combination_names)}")
        return self.weights()[[self._rows[name] for name in combinations]]

    def _stations(self, x: ArrayLike, side: str | ArrayLike) -> tuple[np.ndarray, np.ndarray]:
        tol = position_tolerance(self.member)
        xs = as_stations(x, self.member.length, tol)
        return xs, right_side(side, xs.size)

    def column_solutions(self) -> list[CaseSolution | None]:
        """The case solutions in weights' column order: cases, then the unit self weight."""
        return list(self.cases.values()) + [self.self_weight]

    def weighted_actions(self, weights: np.ndarray, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(C, n, 6) actions of the load sets weights (C, n_cases + 1) @ [cases..., unit self weight],
        in one pass over the stations."""
        xs, right = self._stations(x, side)
        sources = [None if solution is None else solution.sources() for solution in self.column_solutions()]
        weights = np.atleast_2d(weights)
        if weights.shape[0] > len(sources):  # many load sets (pattern arrangements): each case once, then their weighted sums
            each = section_actions(sources, np.eye(len(sources)), xs, right, position_tolerance(self.member))
            return np.tensordot(weights, each, axes=1) + 0.0
        return section_actions(sources, weights, xs, right, position_tolerance(self.member))

    def weighted_displacements(self, weights: np.ndarray, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(C, n, 6) displacements of the load sets weights (C, n_cases + 1) @ [cases..., unit self
        weight]; ValueError without stiffness."""
        if not self.has_displacements:
            raise ValueError("displacements need the member's stiffness (a section)")
        weights = np.atleast_2d(weights)
        xs, right = self._stations(x, side)
        kept = [(j, solution.field()) for j, solution in enumerate(self.column_solutions()) if solution is not None]
        if not kept:
            return np.zeros((weights.shape[0], xs.size, 6))
        columns = weights[:, [j for j, _ in kept]]
        if weights.shape[0] > len(kept):  # many load sets (pattern arrangements): each case once, then their weighted sums
            each = field_displacements(combine_fields([f for _, f in kept], np.eye(len(kept))), xs, right)
            return np.tensordot(columns, each, axes=1) + 0.0
        return field_displacements(combine_fields([f for _, f in kept], columns), xs, right)

    def case_actions(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n_cases + 1, n, 6) actions of each case, the last the unit self weight (zeros if none)."""
        return self.weighted_actions(np.eye(len(self.cases) + 1), x, side)

    def case_displacements(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n_cases + 1, n, 6) displacements of each case, the last the unit self weight."""
        return self.weighted_displacements(np.eye(len(self.cases) + 1), x, side)

    def actions(self, combination: str, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) N, Vy, Vz, T, My, Mz of one combination."""
        return self.weighted_actions(self._row(combination)[None, :], x, side)[0]

    def all_actions(self, x: ArrayLike, side: str | ArrayLike = "right", mass_per_length: float | None | EllipsisType = ...) -> np.ndarray:
        """(n_combinations, n, 6) = weights @ case_actions."""
        return self.weighted_actions(self.weights(mass_per_length), x, side)

    def reactions(self, combination: str) -> np.ndarray:
        """(n_supports, 6) Fx, Fy, Fz, Mx, My, Mz of each support on the member."""
        return self.combination_reactions([combination])[0]

    def combination_reactions(self, combinations: Sequence[str]) -> np.ndarray:
        """(len(combinations), n_supports, 6) reactions of the named combinations, in one product."""
        stack = [case.reactions for case in self.cases.values()]
        stack.append(self.self_weight.reactions if self.self_weight is not None else np.zeros((len(self.member.supports), 6)))
        return np.tensordot(self.combination_weights(combinations), np.stack(stack), axes=1) + 0.0

    def section_reactions(self, masses: np.ndarray | None) -> np.ndarray:
        """(S, n_combinations, n_supports, 6) the reactions of every combination with each self-weight
        mass per length of `masses` (S,) (kg/m; None: no self weight, S = 1): for each mass the same
        product as combination_reactions on with_mass(mass), without a solution object per mass (the
        reactions of a member without springs do not depend on its uniform rigidities)."""
        if masses is not None and self._self_weight_error is not None:
            raise self._self_weight_error
        stack = [case.reactions for case in self.cases.values()]
        stack.append(self.self_weight.reactions if self.self_weight is not None else np.zeros((len(self.member.supports), 6)))
        each = np.stack(stack).reshape(len(stack), -1)
        cases, weight = self._factors()
        table = np.zeros((len(cases), len(stack)))  # weights(mass), one mass at a time
        table[:, :-1] = cases
        found = np.empty((1 if masses is None else len(masses), len(cases), each.shape[1]))
        for k, mass in enumerate([] if masses is None else np.asarray(masses, dtype=float).tolist()):
            table[:, -1] = weight * mass * GRAVITY
            found[k] = np.dot(table, each)  # np.tensordot's product in combination_reactions, the same operands
        if masses is None:
            found[0] = np.dot(table, each)
        return found.reshape(len(found), len(cases), -1, 6) + 0.0

    def displacements(self, combination: str, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) ux, uy, uz, rx, ry, rz of one combination; ValueError without stiffness."""
        return self.weighted_displacements(self._row(combination)[None, :], x, side)[0]

    def all_displacements(self, x: ArrayLike, side: str | ArrayLike = "right", mass_per_length: float | None | EllipsisType = ...) -> np.ndarray:
        """(n_combinations, n, 6) displacements of every combination."""
        return self.weighted_displacements(self.weights(mass_per_length), x, side)


def solve_member(member: Member, stiffness: Stiffness | None, mass_per_length: float | None) -> MemberSolution:
    """Solve every case in member.cases (loads grouped by case; cases named only in combinations
    too, as zero) and the unit self-weight case. A mechanism under the self weight alone is raised
    only when the self weight is counted (mass_per_length given, or later in weights()). Patterned
    loads are expanded first (analysis.patterns): the solution's member is the expanded one, with the
    arrangements that govern some action, reaction or displacement among its combinations."""
    member = expand_patterns(member)
    names = _case_names(member)
    load_sets: list[list[Load]] = [[load for load in member.loads if load.case == name] for name in names]
    sw_case = member.self_weight_case
    columns = list(names)
    if sw_case is not None:
        load_sets.append([self_weight_load(member)])
        columns.append(sw_case)
    solved = solve_columns(member, load_sets, columns, stiffness)
    for error in solved.errors[: len(names)]:
        if error is not None:
            raise error
    cases = {name: solution for name, solution in zip(names, solved.solutions) if solution is not None}
    self_weight, self_weight_error = None, None
    if sw_case is not None:
        self_weight, self_weight_error = solved.solutions[-1], solved.errors[-1]
        if self_weight_error is not None:
            self_weight_error.problem += " (self weight)"
            if mass_per_length is not None:
                raise self_weight_error
    solution = MemberSolution(member, cases, self_weight, mass_per_length, stiffness, self_weight_error)
    patterning = member.patterning
    whole = patterning is not None and set(member.combinations) == set(patterning.origins)  # not some arrangements alone (a reserve factor's)
    return with_governing_arrangements(solution) if whole else solution


def with_governing_arrangements(solution: MemberSolution) -> MemberSolution:
    """The solution with, among its combinations, the arrangements that make some action, reaction or
    displacement largest or smallest at the stations where their envelopes peak (the stations of
    analysis.stations, which include the envelope's stationary points): analysis.superposition."""
    from sizer.analysis.stations import extreme_positions, stations
    from sizer.analysis.superposition import candidate_arrangements

    xs, sides = stations(solution.member)
    extra = extreme_positions(solution, solution.combination_names)
    xs, sides = np.concatenate([xs, extra]), np.concatenate([sides, np.full(extra.size, "right")])
    return solution.with_arrangements(candidate_arrangements(solution, xs, sides))
