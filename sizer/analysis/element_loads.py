"""Loads between nodes as singularity-function (Macaulay) terms, element by element, their exact
fixed-end forces (Euler-Bernoulli), and the nodal load vector of each 1-D problem. Forces in N,
moments in N*m, positions in m from the element's start.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from sizer.analysis.cuts import contract
from sizer.analysis.layout import Layout
from sizer.analysis.problems import MOMENT_SIGN, POINT_COMPONENT, Problem, element_freedoms
from sizer.model import Load, PointLoad


@dataclass(frozen=True)
class Terms:
    """The loads between nodes as singularity-function terms, element by element.

    Term i acts in element `element[i]` at local position `at[i]` (m from the element start) with
    order `power[i]`: the load resultant on [0, s] of the element is sum coef <s - at>^power / power!
    (power 0: point force; 1: uniform line load from `at` on; 2: line load rising from `at` on with
    slope coef; -1: a couple, which adds only to the moment). Columns of `coef` are the problems in
    PROBLEM_ORDER: axial force, torque, force along y, force along z; a couple's coefficient is
    -mz in the x-y column and +my in the x-z column (moment about the cut = sum of coef <s - at>^0)."""

    element: np.ndarray
    at: np.ndarray
    power: np.ndarray
    coef: np.ndarray  # (T, ..., 4)

    def values(self, s: np.ndarray, elements: np.ndarray, shifts: Sequence[int]) -> list[np.ndarray]:
        """For each shift: (n, ..., 4) sums over the terms in elements[j] of
        coef <s_j - at>^(power + shift) / (power + shift)!. Shift 0: load resultant on [0, s];
        1: its moment about s (for bars: its integral); 2, 3: further integrals from the element start."""
        steps = np.asarray(shifts)
        out = np.zeros((len(steps), len(s)) + self.coef.shape[1:])
        count = len(self.element)
        order = self.power[None, None, :] + steps[:, None, None]  # (shifts, 1, terms)
        step = max(1, BLOCK_ENTRIES // max(count * len(steps), 1))
        for lo in range(0, len(s) if count else 0, step):  # every term at once, a block of stations at a time
            rows = slice(lo, lo + step)
            gap = np.where(elements[rows, None] == self.element[None, :], np.maximum(s[rows, None] - self.at[None, :], 0.0), 0.0)
            powers = np.where((gap > 0) & (order >= 0), gap ** np.maximum(order, 0) / _FACTORIAL[np.maximum(order, 0)], 0.0)
            block = contract(powers.reshape(-1, count), self.coef)
            out[:, rows] = block.reshape((len(steps), -1) + self.coef.shape[1:])
        return list(out)

    def weighted(self, factors: np.ndarray) -> "Terms":
        """The terms of one case (coef (T, 4)) with coef scaled by each factor: coef (T, len(factors), 4)."""
        return Terms(self.element, self.at, self.power, self.coef[:, None, :] * factors[None, :, None])


def concat_terms(parts: Sequence[Terms]) -> Terms:
    return Terms(np.concatenate([t.element for t in parts]), np.concatenate([t.at for t in parts]),
                  np.concatenate([t.power for t in parts]), np.concatenate([t.coef for t in parts]))


PROBLEM_ORDER: tuple[str, ...] = ("axial", "torsion", "xy", "xz")
_FACTORIAL = np.array([1.0, 1.0, 2.0, 6.0, 24.0, 120.0])
BLOCK_ENTRIES = 1 << 18  # stations x terms x shifts evaluated at once, at most (bounds the memory of a long patterned member)


def case_terms(layout: Layout, loads: Sequence[Load]) -> tuple[np.ndarray, Terms]:
    """Point loads on nodes (m, 6) and the singularity terms of the loads between nodes."""
    nodal = np.zeros((len(layout.nodes), 6))
    element, at, power, coef = [], [], [], []

    def add(e: int, position: float, order: int, values: np.ndarray) -> None:
        element.append(e)
        at.append(position)
        power.append(order)
        coef.append(values)

    x = layout.nodes
    for load in loads:
        if isinstance(load, PointLoad):
            values = np.array(tuple(load.force) + tuple(load.moment), dtype=float)
            node = int(layout.node_of(np.array([load.at]))[0])
            if abs(x[node] - load.at) <= layout.tol:
                nodal[node] += values
                continue
            e = int(np.searchsorted(x, load.at) - 1)
            add(e, load.at - x[e], 0, values[[0, 3, 1, 2]])
            add(e, load.at - x[e], -1, np.array([0.0, 0.0, -values[5], values[4]]))
            continue
        if load.end <= load.start:
            continue
        q0, q1 = np.array(load.q_start, dtype=float), np.array(load.q_end, dtype=float)
        slope = ((q1 - q0) / (load.end - load.start))[[0, 3, 1, 2]]
        for e in np.flatnonzero((x[1:] > load.start) & (x[:-1] < load.end)).tolist():
            lo, hi = max(load.start, x[e]), min(load.end, x[e + 1])
            q_lo = (q0 + (q1 - q0) * (lo - load.start) / (load.end - load.start))[[0, 3, 1, 2]]
            q_hi = q_lo + slope * (hi - lo)
            add(e, lo - x[e], 1, q_lo)
            add(e, lo - x[e], 2, slope)
            add(e, hi - x[e], 1, -q_hi)
            add(e, hi - x[e], 2, -slope)
    terms = Terms(np.array(element, dtype=int), np.array(at, dtype=float), np.array(power, dtype=int),
                   np.array(coef, dtype=float).reshape(-1, 4))
    return nodal, terms


def fixed_end_forces(layout: Layout, terms: Terms) -> np.ndarray:
    """(ne, 4 problems, 4) forces that rigid clamps at both element ends exert on the element under
    its loads: (R0, C0, R1, C1) at the start and end (bending, in the x-y form; x-z in theta), or
    (R0, 0, R1, 0) for axial and torsion. Bending: with v(0) = v'(0) = 0, the end conditions
    v'(l) = v(l) = 0 on EI v'' = M(s) = -C0 + R0 s + (moment of the loads about s) give
    R0 = 12 (F3 - F2 l / 2) / l^3 and C0 = (R0 l^2 / 2 + F2) / l; equilibrium gives the far end.
    Bars: u(l) = 0 on EA u' = -R0 - (load resultant) gives R0 = -F1 / l."""
    le = layout.lengths
    elements = np.arange(len(le))
    f0, f1, f2, f3 = terms.values(le, elements, range(4))
    out = np.zeros((len(le), 4, 4))
    l = le[:, None]
    r0 = 12 * (f3 - f2 * l / 2) / l**3
    c0 = (r0 * l**2 / 2 + f2) / l
    bar_r0 = -f1 / l
    for column, name in enumerate(PROBLEM_ORDER):
        if name in ("xy", "xz"):
            out[:, column] = np.stack([r0[:, column], c0[:, column], -r0[:, column] - f0[:, column],
                                       -c0[:, column] + le * r0[:, column] + f1[:, column]], axis=1)
        else:
            out[:, column, 0] = bar_r0[:, column]
            out[:, column, 2] = -bar_r0[:, column] - f0[:, column]
    return out


def load_vector(problem: Problem, nodal: np.ndarray, fixed: np.ndarray) -> np.ndarray:
    """Nodal load vector (size,) of one problem: loads on nodes plus the element loads as minus
    their fixed-end forces."""
    vector = np.zeros(problem.size)
    force_col, moment_col = POINT_COMPONENT[problem.name]
    forces = fixed[:, PROBLEM_ORDER.index(problem.name)]
    vector[problem.translation] += nodal[:, force_col]
    if problem.bending:
        rot_left, rot_right = problem.rotations
        np.add.at(vector, rot_left, MOMENT_SIGN[problem.name] * nodal[:, moment_col])
        dofs = element_freedoms(problem.translation, rot_left, rot_right)
        np.add.at(vector, dofs, -forces)
    else:
        np.add.at(vector, problem.translation[:-1], -forces[:, 0])
        np.add.at(vector, problem.translation[1:], -forces[:, 2])
    return vector
