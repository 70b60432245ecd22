"""Stresses per unit action over a section (UnitStressField): the full field at the mesh nodes from
sectionproperties, or the normal stresses alone at the outline's corners (sizer.sections.geometric).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property

import numpy as np


@dataclass(frozen=True, eq=False)
class UnitStressField:
    """Stresses at points of the section per unit action, member axes, Pa.

    points (p, 2): positions (y, z) from the centroid, m.
    sigma (3, p): sigma_xx (tension +) per unit N (1 N), My (1 N*m), Mz (1 N*m).
    tau (3, p, 2): (tau_xy, tau_xz) per unit Vy (1 N), Vz (1 N), T (1 N*m), through the shear centre.
    shear_known: False for a field of normal stresses alone (tau is zero there, not computed).
    """

    points: np.ndarray
    sigma: np.ndarray
    tau: np.ndarray
    shear_known: bool = True

    @cached_property
    def sigma_peak(self) -> np.ndarray:
        """(3,) largest |sigma| per unit N, My, Mz."""
        return np.abs(self.sigma).max(axis=1)

    @cached_property
    def tau_peak(self) -> np.ndarray:
        """(3,) largest shear stress magnitude per unit Vy, Vz, T."""
        return np.hypot(self.tau[..., 0], self.tau[..., 1]).max(axis=1)

    def stresses(self, N: float = 0.0, Vy: float = 0.0, Vz: float = 0.0, T: float = 0.0,
                 My: float = 0.0, Mz: float = 0.0) -> tuple[np.ndarray, np.ndarray]:
        """sigma_xx (p,) and (tau_xy, tau_xz) (p, 2) in Pa for one set of actions (N, N*m)."""
        sigma = N * self.sigma[0] + My * self.sigma[1] + Mz * self.sigma[2]
        tau = Vy * self.tau[0] + Vz * self.tau[1] + T * self.tau[2]
        return sigma, tau
