"""Loads as arrays: point loads and moments, and linearly varying line loads, in SI.

Points: positions (m) and 6-vectors Fx, Fy, Fz (N), Mx, My, Mz (N*m). Lines: start and end (m),
intensity at the start and slope per metre for (wx, wy, wz) in N/m and mx in N*m/m.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from sizer.model import LineLoad, Load, Member, PointLoad


@dataclass(frozen=True)
class Points:
    """Concentrated items: positions (k,) in m and forces (k, 6): Fx, Fy, Fz, Mx, My, Mz (N, N*m)."""

    at: np.ndarray
    forces: np.ndarray


@dataclass(frozen=True)
class Lines:
    """Line loads: start, end (J,) in m; q0 (J, 4) intensity at start and slope (J, 4) per m, for
    (wx, wy, wz, mx) in N/m and N*m/m."""

    start: np.ndarray
    end: np.ndarray
    q0: np.ndarray
    slope: np.ndarray


def points_of(loads: Sequence[Load]) -> Points:
    """The point loads and moments among `loads` as arrays."""
    points = [load for load in loads if isinstance(load, PointLoad)]
    at = np.array([p.at for p in points], dtype=float)
    forces = np.array([tuple(p.force) + tuple(p.moment) for p in points], dtype=float).reshape(-1, 6)
    return Points(at, forces)


def lines_of(loads: Sequence[Load]) -> Lines:
    """The line loads among `loads` (zero-length ones dropped) as arrays."""
    lines = [load for load in loads if isinstance(load, LineLoad) and load.end > load.start]
    start = np.array([ln.start for ln in lines], dtype=float)
    end = np.array([ln.end for ln in lines], dtype=float)
    q0 = np.array([ln.q_start for ln in lines], dtype=float).reshape(-1, 4)
    q1 = np.array([ln.q_end for ln in lines], dtype=float).reshape(-1, 4)
    slope = (q1 - q0) / (end - start)[:, None] if lines else np.zeros((0, 4))
    return Lines(start, end, q0, slope)


def concat_points(first: Points, second: Points) -> Points:
    return Points(np.concatenate([first.at, second.at]), np.vstack([first.forces, second.forces]))


def self_weight_load(member: Member, intensity: float = 1.0) -> LineLoad:
    """Uniform line load of `intensity` N/m along member.gravity over the whole member, in
    member.self_weight_case (case "" when the member has none)."""
    axis, sign = member.gravity
    q = [0.0, 0.0, 0.0, 0.0]
    q[axis] = float(sign) * intensity
    wx, wy, wz, mx = q
    return LineLoad(member.self_weight_case or "", 0.0, member.length, (wx, wy, wz, mx), (wx, wy, wz, mx))
