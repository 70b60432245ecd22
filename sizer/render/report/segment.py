"""The cut the record shows and its left segment in numbers: the governing cut (combination, x in
m) and which face of it; every factored load, reaction and line-load resultant on [0, x] (positions
in m, forces in N, moments in N*m); and the equations of equilibrium solved for the actions on the
cut face, beside the analysis's values.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from sizer import units
from sizer.checks import CheckReport
from sizer.design import Design
from sizer.results.jsonable import without_round_off
from sizer.render.forces import governing_moment

CHECK_ACTIONS = {"axial": (0,), "buckling": (0,), "bending": (4, 5), "shear": (1, 2, 3)}  # actions that drive a check


def governing_cut(design: Design, report: CheckReport) -> tuple[str, float]:
    """(combination, x) of the governing check; without one, of the largest bending moment."""
    governing = report.governing
    if governing is not None and governing.at is not None and governing.combination:
        return governing.combination, float(governing.at)
    name, _, at = governing_moment(design.solution)
    return name or design.solution.combination_names[0], float(at)


@dataclass(frozen=True)
class SegmentItem:
    """One force or couple on the left segment: position (m) and (Fx, Fy, Fz, Mx, My, Mz) in N, N*m
    (moments are the item's own couples; a line load's resultant acts at its centroid)."""

    label: str
    at: float
    vector: np.ndarray


@dataclass(frozen=True)
class SegmentBalance:
    """The left segment [0, x] of a combination and the actions that keep it in equilibrium."""

    combination: str
    x: float
    side: str
    items: list[SegmentItem]
    found: np.ndarray  # (6,) N, Vy, Vz, T, My, Mz from the equations
    analysis: np.ndarray  # (6,) the same from the analysis (MemberSolution.actions)


def _on_segment(at: float, x: float, side: str, tol: float) -> bool:
    return at <= x + tol if side == "right" else at < x - tol


def segment_items(design: Design, combination: str, x: float, side: str, system: str = "si") -> list[SegmentItem]:
    """Every factored point load, reaction and line-load resultant on [0, x], taken from each case's
    solution (CaseSolution.point_items and line_items) times the combination's weights; labels
    give positions in the display units of `system`."""
    solution, member = design.solution, design.member
    tol = 1e-9 * member.length
    weights = solution.weights()[solution.combination_names.index(combination)]
    cases = list(solution.cases.items()) + ([("self-weight", solution.self_weight)] if solution.self_weight is not None else [])
    n_supports = len(member.supports)
    reactions = np.zeros((n_supports, 6))
    items: list[SegmentItem] = []
    for (name, case), weight in zip(cases, weights):
        if weight == 0.0 or case is None:
            continue
        at, forces = case.point_items()
        loads = forces[: len(at) - n_supports]
        reactions += weight * forces[len(at) - n_supports:]
        factor = "" if name == "self-weight" else f" ×{weight:g}"
        for position, vector in zip(at[: len(loads)], loads):
            if _on_segment(position, x, side, tol):
                items.append(SegmentItem(f"point load, case {name}{factor}", float(position), weight * vector))
        items += _line_items(case, weight, x, name, factor, system)
    for index, support in enumerate(member.supports):
        if _on_segment(support.at, x, side, tol):
            items.append(SegmentItem(f"reaction of S{index + 1} ({support.label})", support.at, reactions[index]))
    return items


def _line_items(case: Any, weight: float, x: float, name: str, factor: str, system: str) -> list[SegmentItem]:
    """Resultants of a case's line loads over [start, min(end, x)], one item per component, at the
    component's centroid (a pure couple when the resultant vanishes)."""
    items = []
    starts, ends, q_starts, q_ends = case.line_items()
    for start, end, q0, q1 in zip(starts, ends, q_starts, q_ends):
        stop = min(end, x)
        if stop <= start:
            continue
        length = stop - start
        q_stop = q0 + (q1 - q0) * (stop - start) / (end - start)
        for component, label in enumerate(("wx", "wy", "wz", "mx")):
            a, b = weight * q0[component], weight * q_stop[component]
            if a == 0.0 and b == 0.0:
                continue
            resultant = (a + b) / 2 * length
            first_moment = length * (a * (2 * start + stop) + b * (start + 2 * stop)) / 6  # ∫ q(s) s ds
            what = "self-weight" if name == "self-weight" else f"line load {label}, case {name}{factor}"
            where = f"{units.fmt_number(units.to_display(start, 'length', system))} to {units.fmt(stop, 'length', system)}"
            items.append(_line_item(f"{what}, {where}", component, resultant, first_moment, start))
    return items


def _line_item(label: str, component: int, resultant: float, first_moment: float, start: float) -> SegmentItem:
    vector = np.zeros(6)
    index = 3 if component == 3 else component
    if abs(resultant) > 1e-12 * (1.0 + abs(first_moment)) or component in (0, 3):
        vector[index] = resultant
        at = first_moment / resultant if component in (1, 2) else start
        return SegmentItem(label + " (resultant)", at, vector)
    couple = np.zeros(6)  # zero resultant: a couple, moment about any point = first moment
    couple[5 if component == 1 else 4] = first_moment if component == 1 else -first_moment
    return SegmentItem(label + " (couple)", start, couple)


def segment_balance(design: Design, combination: str, x: float, side: str, system: str = "si") -> SegmentBalance:
    """The equations of equilibrium of the left segment solved for the actions on its cut face:
    N = -ΣFx, Vy = -ΣFy, Vz = -ΣFz, T = -ΣMx, Mz = -ΣMz - Σ(a - x)Fy, My = -ΣMy + Σ(a - x)Fz."""
    items = segment_items(design, combination, x, side, system)
    found = np.zeros(6)
    for item in items:
        arm = item.at - x
        found[:4] -= item.vector[:4]
        found[4] += -item.vector[4] + arm * item.vector[2]
        found[5] += -item.vector[5] - arm * item.vector[1]
    analysis = design.solution.actions(combination, [x], side)[0]
    scale = max([float(np.abs(item.vector).max()) for item in items] + [float(np.abs(analysis).max()), 1.0])
    return SegmentBalance(combination, x, side, items, without_round_off(found, scale), without_round_off(analysis, scale))


def cut_side(design: Design, report: CheckReport, combination: str, x: float) -> str:
    """Which face of the cut to show: where the governing check's actions are larger (left on a tie),
    the right face at x = 0."""
    if x <= 1e-9 * design.member.length:
        return "right"
    left, right = (design.solution.actions(combination, [x], side)[0] for side in ("left", "right"))
    governing = report.governing
    columns = list(CHECK_ACTIONS.get(governing.check if governing else "", range(6)))
    return "right" if np.linalg.norm(right[columns]) > np.linalg.norm(left[columns]) * (1 + 1e-9) else "left"
