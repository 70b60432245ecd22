"""Solving load cases: one factorization per 1-D problem for several load sets at once, with free
rigid-body motions held by Lagrange multipliers (zero component along them), mechanisms reported,
and each case's reactions and displacement field assembled.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from sizer.analysis.case import CaseSolution
from sizer.analysis.displacements import Field
from sizer.analysis.element_loads import Terms, case_terms, fixed_end_forces, load_vector
from sizer.analysis.layout import Layout, build_layout
from sizer.analysis.loads import lines_of, points_of
from sizer.analysis.mechanisms import engaged_modes, mechanism_error
from sizer.analysis.problems import Problem, build_problems
from sizer.analysis.reactions import column_reactions
from sizer.analysis.support_stability import check_support_stability
from sizer.analysis.validation import check_geometry, check_loads, check_springs_need_stiffness
from sizer.errors import InputError
from sizer.model import Load, Member, Stiffness


def _solve_free(problem: Problem, loads: np.ndarray) -> np.ndarray:
    """Displacements (size, c) for load columns (size, c), zero component along free rigid-body
    motions (which the loads must not drive). Diagonally scaled for conditioning."""
    free = ~problem.held
    matrix = problem.stiffness[np.ix_(free, free)] + np.diag(problem.springs[free])
    scale = np.sqrt(np.diag(matrix))
    scaled = matrix / np.outer(scale, scale)
    rhs = loads[free] / scale[:, None]
    modes = problem.modes[free] / scale[:, None]
    r = modes.shape[1]
    if r:
        modes = modes / np.linalg.norm(modes, axis=0)
        scaled = np.block([[scaled, modes], [modes.T, np.zeros((r, r))]])
        rhs = np.vstack([rhs, np.zeros((r, rhs.shape[1]))])
    solution = np.linalg.solve(scaled, rhs)[: int(free.sum())]
    displacement = np.zeros(loads.shape)
    displacement[free] = solution / scale[:, None]
    return displacement


@dataclass
class _Solved:
    """Solutions of several load columns, or the mechanism error of each column that has one."""

    solutions: list[CaseSolution | None]
    errors: list[InputError | None]


def solve_columns(member: Member, load_sets: Sequence[Sequence[Load]], names: Sequence[str], stiffness: Stiffness | None) -> _Solved:
    """Solve several load sets on one member with one factorization per problem."""
    check_geometry(member)
    check_loads(member, [load for loads in load_sets for load in loads])
    check_springs_need_stiffness(member, stiffness)
    layout = build_layout(member)
    check_support_stability(member, layout, stiffness)
    problems = build_problems(member, layout, stiffness or Stiffness.unit())
    points = [points_of(loads) for loads in load_sets]
    lines = [lines_of(loads) for loads in load_sets]
    terms = [case_terms(layout, loads) for loads in load_sets]
    fixed = [fixed_end_forces(layout, element_terms) for _, element_terms in terms]
    columns = {name: np.column_stack([load_vector(problem, nodal, f) for (nodal, _), f in zip(terms, fixed)])
               if load_sets else np.zeros((problem.size, 0)) for name, problem in problems.items()}
    errors: list[InputError | None] = []
    for column, case in enumerate(names):
        findings = [(problem, driven) for name, problem in problems.items()
                    if (driven := engaged_modes(problem, columns[name][:, column], layout.length)) is not None]
        errors.append(mechanism_error(member, case, findings) if findings else None)
    displacement = {name: _solve_free(problem, columns[name]) for name, problem in problems.items()}
    if not all(np.isfinite(values).all() for values in displacement.values()):
        raise InputError(member.source, "", "the solution is not a finite number: the member's loads, supports and "
                         "stiffness are too far apart in size to compute", "give values within the ranges of docs/limits.md")
    positions = np.array([s.at for s in member.supports], dtype=float)
    reactions = column_reactions(problems, layout, displacement, list(zip(points, lines)), fixed, positions)
    solutions: list[CaseSolution | None] = []
    for column, case in enumerate(names):
        if errors[column] is not None:
            solutions.append(None)
            continue
        field = None
        if stiffness is not None:
            field = case_field(problems, layout, displacement, column, terms[column][1], fixed[column], stiffness)
        solutions.append(CaseSolution(case, member.length, positions, reactions[column], points[column], lines[column], field, layout.tol))
    return _Solved(solutions, errors)


def case_field(problems: dict[str, Problem], layout: Layout, displacement: dict[str, np.ndarray], column: int,
           terms: Terms, fixed: np.ndarray, stiffness: Stiffness) -> Field:
    """Nodal displacements of one column for interpolation."""
    def at(name: str, freedoms: np.ndarray) -> np.ndarray:
        return displacement[name][freedoms, column][:, None]

    xy, xz = problems["xy"], problems["xz"]
    return Field(layout.nodes, at("axial", problems["axial"].translation), at("torsion", problems["torsion"].translation),
                  at("xy", xy.translation), at("xy", xy.rotations[0]), at("xy", xy.rotations[1]),
                  at("xz", xz.translation), at("xz", xz.rotations[0]), at("xz", xz.rotations[1]),
                  terms.weighted(np.ones(1)), fixed[:, None], stiffness, layout.tol)


def solve_case(member: Member, loads: Sequence[Load], stiffness: Stiffness | None, case: str = "") -> CaseSolution:
    """Solve one load case (loads all of that case). stiffness None: unit rigidities, forces only.
    Raises InputError for a mechanism, for anything off the member, and when stiffness is None and
    the member has springs (forces would depend on the stiffness)."""
    solved = solve_columns(member, [list(loads)], [case], stiffness)
    if solved.errors[0] is not None:
        raise solved.errors[0]
    solution = solved.solutions[0]
    assert solution is not None
    return solution
