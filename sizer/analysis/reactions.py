"""Support reactions by statics, bay by bay between neighbouring acting supports, from the
well-conditioned end forces of each bay's longest element (no K u - F cancellation). Forces in N,
moments in N*m, each along or about +x, +y, +z on the member.
"""

from __future__ import annotations

import numpy as np

from sizer.analysis.cuts import section_actions
from sizer.analysis.element_loads import PROBLEM_ORDER
from sizer.analysis.layout import Layout
from sizer.analysis.loads import Lines, Points
from sizer.analysis.problems import MOMENT_SIGN, POINT_COMPONENT, Problem, beam_element_matrices, element_freedoms


def _element_start_actions(problem: Problem, layout: Layout, u: np.ndarray, fixed: np.ndarray, elements: np.ndarray) -> np.ndarray:
    """(C, len(elements), 2) internal (force, moment) actions of the problem just right of each element's
    start node for each of the C load columns (u (size, C), fixed (C, ne, 4, 4)), from the force the
    node exerts on the element: k u + fixed-end force (N, N*m; the global sign of the action, My for
    the x-z problem)."""
    le = layout.lengths[elements]
    forces = fixed[:, elements, PROBLEM_ORDER.index(problem.name)]  # (C, len(elements), 4)
    out = np.zeros((u.shape[1], len(elements), 2))
    if problem.bending:
        dofs = element_freedoms(problem.translation, *problem.rotations)[elements]
        ke = beam_element_matrices(le, problem.rigidity)
        end_forces = np.einsum("eij,ejc->cei", ke[:, :2, :], u[dofs]) + forces[:, :, :2]
        out[..., 0] = -end_forces[..., 0]
        out[..., 1] = -MOMENT_SIGN[problem.name] * end_forces[..., 1]
    else:
        nodes = problem.translation
        out[..., 0] = -(problem.rigidity / le * (u[nodes[elements]] - u[nodes[elements + 1]]).T + forces[:, :, 0])
    return out


def _active_supports(problem: Problem, layout: Layout) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Supports acting in this problem, by position: indices, and whether each holds (rigidly or by
    a spring) the translation and the rotation."""
    nodes = layout.support_nodes
    holds = problem.held | (problem.springs > 0)
    translation = holds[problem.translation[nodes]]
    rotation = holds[problem.rotations[0][nodes]] if problem.bending else np.zeros(len(nodes), bool)
    active = np.flatnonzero(translation | rotation)
    active = active[np.argsort(layout.nodes[nodes[active]], kind="stable")]
    return active, translation[active], rotation[active]


def _bay_cuts(problem: Problem, layout: Layout) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The supports acting in this problem (by position, and what each holds), the longest element of
    each bay between neighbouring ones, and the cuts (m): just right of each such element's start,
    and the member's end."""
    active, holds_translation, holds_rotation = _active_supports(problem, layout)
    nodes = layout.support_nodes[active]
    lengths = layout.lengths
    longest = np.array([start + int(np.argmax(lengths[start:stop])) for start, stop in zip(nodes[:-1], nodes[1:])], dtype=int)
    xs = np.concatenate([layout.nodes[longest], [layout.length]]) if len(active) else np.zeros(0)
    return active, holds_translation, holds_rotation, longest, xs


def _problem_reactions(problem: Problem, layout: Layout, u: np.ndarray, fixed: np.ndarray, positions: np.ndarray,
                       bays: tuple[np.ndarray, ...], from_loads: np.ndarray) -> np.ndarray:
    """(C, n_supports, 2) reactions (force, moment) of each support in this problem for each of the C
    load columns (u (size, C), fixed (C, ne, 4, 4)); `bays` as _bay_cuts gives them, `from_loads`
    (C, cuts, 6) the actions of the loads alone at its cuts.

    Computed by statics, bay by bay: between two neighbouring acting supports, the actions just
    right of the start of the bay's longest element (from its end forces, well conditioned) give
    the resultant of all reactions to its left; before the first support it is zero and after the
    last it balances the loads. Each reaction is the difference of neighbouring resultants. (The
    residual K u - F would lose digits on short elements.)"""
    count = u.shape[1]
    out = np.zeros((count, len(positions), 2))
    active, holds_translation, holds_rotation, longest, xs = bays
    if not len(active):
        return out
    force_col, moment_col = POINT_COMPONENT[problem.name]
    elastic = np.concatenate([_element_start_actions(problem, layout, u, fixed, longest), np.zeros((count, 1, 2))], axis=1)
    columns = [force_col] + ([moment_col] if moment_col is not None else [])
    of_reactions = elastic[:, :, : len(columns)] - from_loads[:, :, columns]
    start = np.zeros((count, 1))
    force = np.concatenate([start, -of_reactions[:, :, 0]], axis=1)  # resultant force of the reactions left of each bay
    reaction_force = np.diff(force, axis=1)
    out[:, active, 0] = np.where(holds_translation, reaction_force, 0.0)
    if moment_col is not None:
        # moment about the origin of the reactions left of each bay: -M(x) + x F (Mz) or -M(x) - x F (My)
        lever = 1.0 if moment_col == 5 else -1.0
        moment = np.concatenate([start, -of_reactions[:, :, 1] + lever * xs * force[:, 1:]], axis=1)
        reaction_moment = np.diff(moment, axis=1) - lever * positions[active] * reaction_force
        out[:, active, 1] = np.where(holds_rotation, reaction_moment, 0.0)
    return out


def column_reactions(problems: dict[str, Problem], layout: Layout, displacement: dict[str, np.ndarray],
                     loads: list[tuple[Points, Lines]], fixed: list[np.ndarray], positions: np.ndarray) -> list[np.ndarray]:
    """(n_supports, 6) reactions Fx, Fy, Fz, Mx, My, Mz of each support for each load column
    (`loads` and `fixed` one per column; displacement[name] (size, columns)): every column and every
    problem's cuts at once."""
    if not loads:
        return []
    reactions = np.zeros((len(loads), len(positions), 6))
    bays = {name: _bay_cuts(problem, layout) for name, problem in problems.items()}
    xs = np.concatenate([cuts[-1] for cuts in bays.values()])
    splits = np.cumsum([len(cuts[-1]) for cuts in bays.values()])[:-1]
    at_cuts = section_actions(loads, np.eye(len(loads)), xs, np.ones(xs.size, bool), layout.tol)  # (columns, cuts, 6)
    stacked = np.stack(fixed)
    for (name, problem), from_loads in zip(problems.items(), np.split(at_cuts, splits, axis=1)):
        values = _problem_reactions(problem, layout, displacement[name], stacked, positions, bays[name], from_loads)
        force_col, moment_col = POINT_COMPONENT[name]
        reactions[:, :, force_col] = values[..., 0]
        if moment_col is not None:
            reactions[:, :, moment_col] = values[..., 1]
    return list(reactions + 0.0)
