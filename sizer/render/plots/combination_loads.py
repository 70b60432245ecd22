"""The loads of one combination as the figures draw them: each load of the member file multiplied by
its case's factor, and the self-weight as one more line load. SI units: positions in m, forces in
N, moments in N*m, line loads in N/m (a torque per length in N*m/m).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

from sizer.analysis import self_weight_load
from sizer.design import Design
from sizer.model import PointLoad


@dataclass(frozen=True)
class DrawnPoint:
    """A factored point load: position (m), forces (fx, fy, fz) N and moments (mx, my, mz) N*m."""

    at: float
    force: tuple[float, float, float]
    moment: tuple[float, float, float]


@dataclass(frozen=True)
class DrawnLine:
    """A factored line load from start to end (m); q = (wx, wy, wz, mx) in N/m and N*m/m."""

    start: float
    end: float
    q_start: tuple[float, float, float, float]
    q_end: tuple[float, float, float, float]
    self_weight: bool = False


def factored_loads(design: Design, combination: str) -> tuple[list[DrawnPoint], list[DrawnLine]]:
    """The loads of `combination`, each multiplied by its case's factor, with the self-weight as a line load."""
    member = design.member
    factors = member.combinations[combination]
    points: list[DrawnPoint] = []
    lines: list[DrawnLine] = []
    for load in member.loads:
        factor = factors.get(load.case, 0.0)
        if factor == 0.0:
            continue
        if isinstance(load, PointLoad):
            points.append(DrawnPoint(load.at, _scaled(load.force, factor), _scaled(load.moment, factor)))
        elif load.end > load.start:
            lines.append(DrawnLine(load.start, load.end, _scaled(load.q_start, factor), _scaled(load.q_end, factor)))
    weight = self_weight_intensity(design, combination)
    if weight:
        own = self_weight_load(member, weight)
        lines.append(DrawnLine(own.start, own.end, own.q_start, own.q_end, self_weight=True))
    return points, lines


def self_weight_intensity(design: Design, combination: str) -> float:
    """Factored self-weight of `combination` in N/m (0 when none)."""
    solution = design.solution
    row = solution.combination_names.index(combination)
    return float(solution.weights()[row, -1])


def _scaled(values: Sequence[float], factor: float) -> tuple:
    return tuple(float(v) * factor for v in values)
