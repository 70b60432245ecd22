"""Envelopes over many combinations (every pattern arrangement is a combination of its own): the
largest and smallest value of each action along the member, with where and in which combination;
the same for each support's reactions; and the curves of the largest and smallest at any stations,
for drawing.

The values along the member are exact extremes: for each combination the stations of `stations`
(both sides of every concentrated item, an even spacing), its zero-shear points (where the bending
moments peak) and the points where its summed line load changes sign (where N, V and T peak), as
`stations.extremes` does for one combination. Actions: N, Vy, Vz, T, My, Mz (N, N*m) and the beam
convention V = -Vy, M = Mz. Positions in m.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np
from numpy.typing import ArrayLike

from sizer.analysis.layout import distinct
from sizer.analysis.member_solution import MemberSolution
from sizer.analysis.stations import EXTREME_ACTIONS, extreme_positions, segment_ends, stations

CHUNK = 64  # combinations evaluated together (memory: CHUNK x stations x 6 values)


@dataclass(frozen=True)
class Bound:
    """One end of an envelope: the value (N or N*m), where (m) and the combination that gives it."""

    value: float
    at: float
    combination: str


@dataclass(frozen=True)
class ActionEnvelope:
    """The largest and smallest value of one action over the member and the combinations."""

    action: str
    largest: Bound
    smallest: Bound


@dataclass(frozen=True)
class ReactionEnvelope:
    """The largest and smallest of each reaction component (Fx, Fy, Fz, Mx, My, Mz; N, N*m) of one
    support over the combinations, with the combination that gives each."""

    support: int  # index in member.supports
    largest: tuple[tuple[float, str], ...]  # (value, combination) per component
    smallest: tuple[tuple[float, str], ...]


def with_beam_convention(values: np.ndarray) -> np.ndarray:
    """(..., 8) the six actions (..., 6) followed by V = -Vy and M = Mz."""
    return np.concatenate([values, -values[..., 1:2], values[..., 5:6]], axis=-1)


def action_envelope(solution: MemberSolution, combinations: Sequence[str], n_even: int = 400) -> dict[str, ActionEnvelope]:
    """The largest and smallest of every action (EXTREME_ACTIONS) along the member over
    `combinations`, each with x and the combination; the first combination in order wins a tie."""
    if not combinations:
        raise ValueError("an envelope needs at least one combination")
    base_x, base_side = stations(solution.member, n_even)
    high = np.full(len(EXTREME_ACTIONS), -np.inf)
    low = np.full(len(EXTREME_ACTIONS), np.inf)
    high_at, low_at = np.zeros(len(EXTREME_ACTIONS)), np.zeros(len(EXTREME_ACTIONS))
    high_name, low_name = [""] * len(EXTREME_ACTIONS), [""] * len(EXTREME_ACTIONS)
    extra = extreme_positions(solution, combinations)
    x = np.concatenate([base_x, extra])
    side = np.concatenate([base_side, np.full(extra.size, "right")])
    for start in range(0, len(combinations), CHUNK):
        names = list(combinations[start:start + CHUNK])
        values = with_beam_convention(solution.weighted_actions(solution.combination_weights(names), x, side))  # (c, n, 8)
        flat = values.reshape(-1, values.shape[-1])
        for column in range(flat.shape[1]):
            top, bottom = int(np.argmax(flat[:, column])), int(np.argmin(flat[:, column]))
            if flat[top, column] > high[column]:
                high[column], high_at[column], high_name[column] = flat[top, column], x[top % x.size], names[top // x.size]
            if flat[bottom, column] < low[column]:
                low[column], low_at[column], low_name[column] = flat[bottom, column], x[bottom % x.size], names[bottom // x.size]
    return {name: ActionEnvelope(name, Bound(float(high[k]), float(high_at[k]), high_name[k]), Bound(float(low[k]), float(low_at[k]), low_name[k]))
            for k, name in enumerate(EXTREME_ACTIONS)}


def envelope_curves(solution: MemberSolution, combinations: Sequence[str], x: ArrayLike,
                    side: str | ArrayLike = "right") -> tuple[np.ndarray, np.ndarray]:
    """(largest, smallest), each (n, 8): the envelope of the actions (EXTREME_ACTIONS order) at the
    stations x (m) over `combinations`."""
    xs = np.atleast_1d(np.asarray(x, dtype=float))
    high, low = np.full((xs.size, len(EXTREME_ACTIONS)), -np.inf), np.full((xs.size, len(EXTREME_ACTIONS)), np.inf)
    for start in range(0, len(combinations), CHUNK):
        names = list(combinations[start:start + CHUNK])
        values = with_beam_convention(solution.weighted_actions(solution.combination_weights(names), xs, side))
        high, low = np.maximum(high, values.max(axis=0)), np.minimum(low, values.min(axis=0))
    return high, low


def reaction_envelope(solution: MemberSolution, combinations: Sequence[str]) -> list[ReactionEnvelope]:
    """Each support's reactions at their largest and smallest over `combinations`."""
    weights = solution.combination_weights(list(combinations))
    stack = [case.reactions for case in solution.cases.values()]
    count = len(solution.member.supports)
    stack.append(solution.self_weight.reactions if solution.self_weight is not None else np.zeros((count, 6)))
    values = np.tensordot(weights, np.stack(stack), axes=1)  # (c, supports, 6)
    top, bottom = values.argmax(axis=0), values.argmin(axis=0)
    found = []
    for s in range(count):
        found.append(ReactionEnvelope(
            s, tuple((float(values[top[s, k], s, k]), combinations[top[s, k]]) for k in range(6)),
            tuple((float(values[bottom[s, k], s, k]), combinations[bottom[s, k]]) for k in range(6))))
    return found


def displacement_bounds(solution: MemberSolution, combinations: Sequence[str], x: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    """(largest, smallest), each (n, 6): ux, uy, uz (m), rx, ry, rz (rad) at the stations x (m) over
    `combinations`; ValueError without the member's stiffness (a section)."""
    xs = np.atleast_1d(np.asarray(x, dtype=float))
    high, low = np.full((xs.size, 6), -np.inf), np.full((xs.size, 6), np.inf)
    for start in range(0, len(combinations), CHUNK):
        names = list(combinations[start:start + CHUNK])
        values = solution.weighted_displacements(solution.combination_weights(names), xs)
        high, low = np.maximum(high, values.max(axis=0)), np.minimum(low, values.min(axis=0))
    return high, low


@dataclass(frozen=True)
class LargestDeflection:
    """The largest transverse deflection sqrt(uy^2 + uz^2) (m) over the combinations: where (m),
    in which combination, and its uy and uz there (m)."""

    value: float
    at: float
    combination: str
    uy: float
    uz: float


def largest_deflection(solution: MemberSolution, combinations: Sequence[str], n: int = 801) -> LargestDeflection | None:
    """The largest transverse deflection over `combinations` at n even points, the supports, hinges
    and load positions;
    None without the member's stiffness (a section)."""
    if not solution.has_displacements:
        return None
    xs = distinct(np.concatenate([np.linspace(0.0, solution.member.length, n), segment_ends(solution.member)]))
    best: LargestDeflection | None = None
    for start in range(0, len(combinations), CHUNK):
        names = list(combinations[start:start + CHUNK])
        moved = solution.weighted_displacements(solution.combination_weights(names), xs)
        size = np.hypot(moved[..., 1], moved[..., 2])
        c, k = np.unravel_index(int(np.argmax(size)), size.shape)
        if best is None or size[c, k] > best.value:
            best = LargestDeflection(float(size[c, k]), float(xs[k]), names[c], float(moved[c, k, 1]), float(moved[c, k, 2]))
    return best
