"""Where the checks look and what acts there: the check stations along the member (m) and the six
internal actions N, Vy, Vz, T (N, N*m), My, Mz (N*m) of every combination at them, in member or
section axes.
"""

from __future__ import annotations

import numpy as np

from sizer.analysis import extreme_positions, stations
from sizer.design import Design


def check_stations(design: Design, n_even: int = 200) -> tuple[np.ndarray, np.ndarray]:
    """Stations x (m) and sides: supports, loads, hinges (both sides), even spacing, the zero-shear
    points of every combination (local extremes of the bending moments) and the points where a line
    load changes sign (local extremes of the shear forces, axial force and torque); for pattern
    arrangements, the extremes of their envelope (analysis.stations.extreme_positions)."""
    xs, sides = stations(design.member, n_even)
    names = design.solution.combination_names
    extra = extreme_positions(design.solution, names)
    xs = np.concatenate([xs, extra])
    sides = np.concatenate([sides, np.full(extra.shape, "right")])
    order = np.argsort(xs, kind="stable")
    return xs[order], sides[order]


def member_actions(design: Design, xs: np.ndarray, sides: np.ndarray) -> np.ndarray:
    """(n_combinations, n_stations, 6) actions N, Vy, Vz, T, My, Mz at each station, each on its side."""
    return design.solution.all_actions(xs, sides)
