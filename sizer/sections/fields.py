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
    omega (p,): warping normal stress per unit bimoment B (1 N*m^2): omega / Iw; None: not known (zero).
    tau_w (p, 2): warping shear stress per unit warping torque Tw (1 N*m); None: not known (zero).
    """

    points: np.ndarray
    sigma: np.ndarray
    tau: np.ndarray
    shear_known: bool = True
    omega: np.ndarray | None = None
    tau_w: np.ndarray | None = None

    @cached_property
    def warping_sigma(self) -> np.ndarray:
        """(p,) warping normal stress per unit bimoment (zeros when not known)."""
        return np.zeros(len(self.points)) if self.omega is None else np.asarray(self.omega)

    @cached_property
    def warping_tau(self) -> np.ndarray:
        """(p, 2) warping shear stress per unit warping torque (zeros when not known)."""
        return np.zeros((len(self.points), 2)) if self.tau_w is None else np.asarray(self.tau_w)

    @cached_property
    def warping_peaks(self) -> np.ndarray:
        """(2,) largest |warping normal stress| per unit B and largest warping shear per unit Tw."""
        if not len(self.points):
            return np.zeros(2)
        return np.array([np.abs(self.warping_sigma).max(), np.hypot(self.warping_tau[:, 0], self.warping_tau[:, 1]).max()])

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
