"""Stresses on the full cross-section field: the section's unit stress fields weighted by the
actions (stress is linear in them) give the peak normal, shear and von Mises stress (Pa) over every
mesh node; FieldPeaks finds the largest over all rows without evaluating every row.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from sizer.checks.results import CHUNK_VALUES

if TYPE_CHECKING:
    from sizer.sections.fields import UnitStressField


@dataclass(frozen=True)
class StationStresses:
    """Peak stresses (Pa) at every combination and station, each from the full field over all nodes."""

    axial: np.ndarray  # N / A, signed
    bending: np.ndarray  # max |sigma from My and Mz|
    shear: np.ndarray  # max |tau vector from Vy, Vz, T|
    equivalent: np.ndarray  # max sqrt(sigma^2 + 3 tau^2), sigma from N, My, Mz


def extended_rows(actions: np.ndarray, warping: np.ndarray | None) -> np.ndarray:
    """(rows, 8) N, Vy, Vz, T - Tw (Saint-Venant torque), My, Mz, B, Tw from actions (..., 6) and
    warping (..., 2) = (B, Tw) (None: no warping)."""
    flat = actions.reshape(-1, 6)
    extra = np.zeros((len(flat), 2)) if warping is None else warping.reshape(-1, 2)
    rows = np.concatenate([flat, extra], axis=1)
    rows[:, 3] -= extra[:, 1]
    return rows


def full_field_stresses(actions: np.ndarray, unit_field: UnitStressField, area: float, warping: np.ndarray | None = None) -> StationStresses:
    """Peak stresses over the mesh nodes at each (combination, station); actions in section axes,
    warping (C, n, 2) the bimoment B (N*m^2) and warping torque Tw (N*m) (None: none). Bending is the
    normal stress from My, Mz and B (warping normal stress B omega / Iw); shear from Vy, Vz, the
    Saint-Venant torque T - Tw and Tw. Each block of stations is one matrix product per stress
    component: (n, 4) @ (4, nodes)."""
    flat = extended_rows(actions, warping)
    sigma = np.vstack([np.asarray(unit_field.sigma), unit_field.warping_sigma[None]])  # (4, p): N, My, Mz, B
    tau = np.concatenate([np.asarray(unit_field.tau), unit_field.warping_tau[None]])  # (4, p, 2): Vy, Vz, T, Tw
    tau_y, tau_z = np.ascontiguousarray(tau[..., 0]), np.ascontiguousarray(tau[..., 1])
    rows = max(1, CHUNK_VALUES // max(sigma.shape[1], 1))
    bending, shear, equivalent = (np.empty(len(flat)) for _ in range(3))
    shear_columns = [1, 2, 3, 7]
    for start in range(0, len(flat), rows):
        part = flat[start:start + rows]
        bend = part[:, 4:7] @ sigma[1:4]
        normal = bend + part[:, 0:1] * sigma[0]
        shear_sq = (part[:, shear_columns] @ tau_y) ** 2 + (part[:, shear_columns] @ tau_z) ** 2
        block = slice(start, start + len(part))
        bending[block] = np.abs(bend).max(axis=1)
        shear[block] = np.sqrt(shear_sq.max(axis=1))
        equivalent[block] = np.sqrt((normal * normal + 3.0 * shear_sq).max(axis=1))
    shape = actions.shape[:2]
    return StationStresses(actions[..., 0] / area, bending.reshape(shape), shear.reshape(shape), equivalent.reshape(shape))


class FieldPeaks:
    """Exact largest stresses over all mesh nodes and all (combination, station) rows, found without
    evaluating every row: rows are taken in order of a conservative upper bound (|sigma| <= sum of
    |action_i| x the unit field's peak_i, likewise for shear) and evaluation stops as soon as no
    remaining bound can beat the best exact value. The result equals evaluating every row."""

    FIRST_BATCH = 8  # rows evaluated first; each later batch is twice the one before

    def __init__(self, actions: np.ndarray, unit_field: UnitStressField, area: float, warping: np.ndarray | None = None) -> None:
        self.shape = actions.shape[:2]
        self.flat = actions.reshape(-1, 6)
        self.warping = None if warping is None else warping.reshape(-1, 2)
        self.unit_field = unit_field
        self.area = area
        self.axial = actions[..., 0] / area  # (C, N) exact, signed
        sigma_peak, tau_peak = unit_field.sigma_peak, unit_field.tau_peak
        size = np.abs(extended_rows(actions, warping))
        sigma_w, tau_w = unit_field.warping_peaks
        self.bending_upper = size[:, 4] * sigma_peak[1] + size[:, 5] * sigma_peak[2] + size[:, 6] * sigma_w
        self.shear_upper = size[:, 1:4] @ tau_peak + size[:, 7] * tau_w
        self.equivalent_upper = np.sqrt((size[:, 0] * sigma_peak[0] + self.bending_upper) ** 2 + 3.0 * self.shear_upper**2)
        self._exact: dict[int, tuple[float, float, float]] = {}

    def exact(self, rows: np.ndarray) -> np.ndarray:
        """(len(rows), 3) exact bending, shear and equivalent stress (Pa) of the given flat rows."""
        missing = [row for row in rows.tolist() if row not in self._exact]
        if missing:
            warping = None if self.warping is None else self.warping[missing][None]
            stress = full_field_stresses(self.flat[missing][None], self.unit_field, self.area, warping)
            for k, row in enumerate(missing):
                self._exact[row] = (stress.bending[0, k], stress.shear[0, k], stress.equivalent[0, k])
        return np.array([self._exact[row] for row in rows.tolist()]).reshape(-1, 3)

    def largest(self, upper: np.ndarray, value: Any) -> tuple[float, tuple[int, int]]:
        """(largest exact value, (combination, station)); `value(rows, exact)` gives the exact values
        of rows from their exact stresses, and `upper` bounds them row by row."""
        order = np.lexsort((np.arange(len(upper)), -upper))
        best, best_row = -np.inf, 0
        start, batch = 0, self.FIRST_BATCH
        while start < len(order):
            rows = order[start:start + batch]
            if upper[rows[0]] * (1 + 1e-9) + 1e-12 < best:
                break
            values = value(rows, self.exact(rows))
            for row, candidate in zip(rows.tolist(), values.tolist()):
                if candidate > best or (candidate == best and row < best_row):
                    best, best_row = candidate, row
            start, batch = start + batch, 2 * batch
        c, s = np.unravel_index(best_row, self.shape)
        return float(best), (int(c), int(s))
