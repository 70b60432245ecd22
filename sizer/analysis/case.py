"""One solved load case: its reactions (N, N*m), and actions and displacements at any x (m).
"""

from __future__ import annotations

import copy

import numpy as np
from numpy.typing import ArrayLike

from sizer.analysis.cuts import as_stations, right_side, section_actions
from sizer.analysis.displacements import Field, field_displacements, rescaled_field
from sizer.analysis.loads import Lines, Points, concat_points
from sizer.model import Stiffness


class CaseSolution:
    """One solved load case: reactions, and actions and displacements at any x (m)."""

    def __init__(self, case: str, length: float, positions: np.ndarray, reactions: np.ndarray, points: Points, lines: Lines,
                 field: Field | None, tol: float) -> None:
        self.case = case
        self.length = length
        self.positions = positions
        self.reactions = reactions
        self.has_displacements = field is not None
        self._items = concat_points(points, Points(positions, reactions))
        self._lines = lines
        self._field = field
        self._tol = tol

    def point_items(self) -> tuple[np.ndarray, np.ndarray]:
        """Concentrated items: point loads (in the order given) then reactions (support order).
        Returns positions (k,) in m and forces (k, 6): Fx, Fy, Fz, Mx, My, Mz (N, N*m).
        Line loads are not included; see line_items()."""
        return self._items.at.copy(), self._items.forces.copy()

    def line_items(self) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
        """Line loads: start (J,), end (J,), intensities at start and end (J, 4): wx, wy, wz, mx."""
        lines = self._lines
        return lines.start.copy(), lines.end.copy(), lines.q0.copy(), lines.q0 + lines.slope * (lines.end - lines.start)[:, None]

    def actions(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) N, Vy, Vz, T, My, Mz (N, N*m) on the +x face of the left segment at each x, by the
        method of sections. side "left": concentrated items at x excluded; "right": included."""
        xs = as_stations(x, self.length, self._tol)
        return section_actions([self.sources()], np.ones((1, 1)), xs, right_side(side, xs.size), self._tol)[0]

    def sources(self) -> tuple[Points, Lines]:
        """Concentrated items (loads and reactions) and line loads of this case, for sections."""
        return self._items, self._lines

    def displacements(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) ux, uy, uz (m) and rx, ry, rz (rad) at each x; side matters only for rotations at
        hinges. Raises ValueError when the case was solved without the member's stiffness."""
        if self._field is None:
            raise ValueError("displacements need the member's stiffness (a section); this case was solved with unit rigidities")
        xs = as_stations(x, self.length, self._tol)
        return field_displacements(self._field, xs, right_side(side, xs.size))[0]

    def field(self) -> Field:
        """The displacement field of this case, for combining (ValueError without stiffness)."""
        if self._field is None:
            raise ValueError("displacements need the member's stiffness (a section); this case was solved with unit rigidities")
        return self._field

    def on_rigidities(self, stiffness: Stiffness) -> "CaseSolution":
        """This case on other rigidities (see MemberSolution.for_section): the same forces, the
        displacements scaled by old / new rigidity, problem by problem."""
        if self._field is None:
            raise ValueError("this case was solved without rigidities; solve it with Stiffness.unit() to rescale it")
        moved = copy.copy(self)
        moved._field = rescaled_field(self._field, stiffness)
        return moved
