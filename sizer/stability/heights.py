"""Where transverse loads act on the section, for the stability solver: each load along the depth
(the section's y) at height a above the shear centre adds 1/2 q a phi^2 to the second-order work
(1/2 P a phi^2 at a point): a downward load above the shear centre lowers the buckling load, below
it raises it.

Heights: a load's `height` ("top", "centre" = the shear centre, "bottom", or metres above the
shear centre), else the face it pushes on (top for a downward load, bottom for an upward one: the
unfavourable side). Self-weight acts at the centroid. The matrices come keyed by the section scalar
that weights them: "top" (y_top - y0), "bottom" (-y_bottom - y0), "centroid" (-y0), and "fixed"
(numbers given in the member file, already included).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Sequence

import numpy as np

from sizer.model import LineLoad, Member, PointLoad
from sizer.stability.elements import Quadrature, integral
from sizer.stability.matrices import as_matrix, assemble

if TYPE_CHECKING:
    from sizer.stability.section import StabilitySection
    from sizer.stability.terms import Coefficient

PHI = 2
HEIGHT_KEYS: tuple[str, ...] = ("top", "bottom", "centroid", "fixed")


def depth_axis(orientation: str) -> int:
    """The member axis (1 y, 2 z) along the section's depth: y for "major", z for "minor"."""
    return 1 if orientation == "major" else 2


def height_terms(quad: Quadrature, member: Member, orientation: str, weights: np.ndarray, cases: Sequence[str]) -> dict[str, np.ndarray]:
    """The load-height matrices of one load set: `weights` (n_cases + 1,) factors on `cases` and, last,
    on the unit self-weight (N/m along gravity), as MemberSolution.weights gives them."""
    axis = depth_axis(orientation)
    out = _Sums(quad.mesh.size, quad.mesh.sparse)
    factor = dict(zip(cases, weights[:-1]))
    for load in member.loads:
        f = float(factor.get(load.case, 0.0))
        if f == 0.0:
            continue
        if isinstance(load, PointLoad):
            _add_point(out, quad, f * load.force[axis], load.at, load.height)
        elif isinstance(load, LineLoad):
            _add_line(out, quad, f, load, axis)
    gravity_axis, sign = member.gravity
    if gravity_axis == axis and weights[-1] != 0.0:
        out["centroid"] += integral(quad, np.full_like(quad.x, sign * float(weights[-1])), (PHI, "value"), (PHI, "value"))
    return dict(out.sums)


class _Sums:
    """Matrices by height key, made on first use (dense or sparse: sizer.stability.matrices)."""

    def __init__(self, size: int, sparse: bool) -> None:
        self.size, self.sparse = size, sparse
        self.sums: dict[str, np.ndarray] = {}

    def __getitem__(self, key: str) -> np.ndarray:
        if key not in self.sums:
            self.sums[key] = as_matrix(0.0, self.size, self.sparse)
        return self.sums[key]

    def __setitem__(self, key: str, value: np.ndarray) -> None:
        self.sums[key] = value


def _add(out: "_Sums", matrix: np.ndarray, height: str | float | None, default: str) -> None:
    """Add a load's matrix (already times its intensity) under its height's key."""
    if height is None:
        out[default] += matrix
    elif isinstance(height, str):
        if height != "centre":
            out[height] += matrix
    else:
        out["fixed"] += height * matrix


def _add_point(out: "_Sums", quad: Quadrature, force: float, at: float, height: str | float | None) -> None:
    if force == 0.0 or height == "centre":
        return
    key = ("top" if force < 0 else "bottom") if height is None else (height if isinstance(height, str) else "fixed")
    scale = height if isinstance(height, float) else 1.0
    dof = np.array([quad.mesh.value[quad.mesh.node_at(at), PHI]])
    out[key] += assemble((out.size, out.size), dof, dof, np.array([force * scale]), out.sparse)


def _add_line(out: "_Sums", quad: Quadrature, factor: float, load: LineLoad, axis: int) -> None:
    q0, q1 = load.q_start[axis], load.q_end[axis]
    if q0 == 0.0 and q1 == 0.0:
        return
    middle = (quad.mesh.nodes[:-1] + quad.mesh.nodes[1:]) / 2
    inside = ((middle > load.start) & (middle < load.end))[:, None]
    q = factor * (q0 + (q1 - q0) * (quad.x - load.start) / (load.end - load.start)) * inside
    if load.height is not None:
        _add(out, integral(quad, q, (PHI, "value"), (PHI, "value")), load.height, "top")
        return
    # the mesh has a node where q changes sign, so each part is a polynomial on its elements
    for part, face in ((np.minimum(q, 0.0), "top"), (np.maximum(q, 0.0), "bottom")):
        if np.any(part):
            _add(out, integral(quad, part, (PHI, "value"), (PHI, "value")), None, face)


def height_coefficients(section: StabilitySection) -> dict[str, Coefficient]:
    """The section scalars that weight the height matrices (m)."""
    return {"top": section.face_height("top"), "bottom": section.face_height("bottom"),
            "centroid": section.face_height("centroid"), "fixed": 1.0}
