"""The section's own axes on the member. Orientation "major": the section's axes are the member's.
"minor": the section is turned a quarter turn, so its axes (y_s along its depth, z_s across) are
(member z, -member y): Vy_s = Vz, Vz_s = -Vy, My_s = Mz, Mz_s = -My (forces in N, moments in N*m).
"""

from __future__ import annotations

import numpy as np


def to_section_axes(actions: np.ndarray, orientation: str) -> np.ndarray:
    """Actions in the section's own axes (identity for "major"; quarter turn for "minor")."""
    if orientation != "minor":
        return actions
    turned = actions.copy()
    turned[..., 1], turned[..., 2] = actions[..., 2], -actions[..., 1]
    turned[..., 4], turned[..., 5] = actions[..., 5], -actions[..., 4]
    return turned


def to_member_axes(actions: np.ndarray, orientation: str) -> np.ndarray:
    """The inverse of to_section_axes: actions in the section's axes back in the member's."""
    if orientation != "minor":
        return actions
    out = actions.copy()
    out[..., 2], out[..., 1] = actions[..., 1], -actions[..., 2]
    out[..., 5], out[..., 4] = actions[..., 4], -actions[..., 5]
    return out
