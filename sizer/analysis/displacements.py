"""Displacements between nodes: cubic Hermite interpolation of the nodal values (linear for axial
and twist) plus the fixed-fixed particular solution of each element's loads, exact for
Euler-Bernoulli theory with linearly varying loads. ux, uy, uz in m; rx, ry, rz in rad.
A field holds several load sets at once (cases or combinations) and rescales with the rigidities.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Sequence

import numpy as np

from sizer.analysis.element_loads import Terms, concat_terms
from sizer.model import Stiffness


@dataclass(frozen=True)
class Field:
    """Nodal displacements and element loads of C load sets (cases or combinations) on one layout,
    for displacements between nodes. Node arrays (m, C): ux, rx; uy, rz left/right; uz and
    theta = duz/dx left/right. terms.coef (T, C, 4); fixed (ne, C, 4, 4), see fixed_end_forces."""

    nodes: np.ndarray
    axial: np.ndarray
    twist: np.ndarray
    v: np.ndarray
    rz_left: np.ndarray
    rz_right: np.ndarray
    w: np.ndarray
    theta_left: np.ndarray
    theta_right: np.ndarray
    terms: Terms
    fixed: np.ndarray
    stiffness: Stiffness
    tol: float


_NODAL_FIELDS = ("axial", "twist", "v", "rz_left", "rz_right", "w", "theta_left", "theta_right")


def combine_fields(fields: Sequence[Field], weights: np.ndarray) -> Field:
    """The field of the combinations weights (C, S) @ fields (S fields of one load set each)."""
    first = fields[0]
    nodal = {name: np.column_stack([getattr(f, name)[:, 0] for f in fields]) @ weights.T for name in _NODAL_FIELDS}
    terms = concat_terms([Terms(f.terms.element, f.terms.at, f.terms.power, f.terms.coef[:, 0, :]).weighted(weights[:, j])
                           for j, f in enumerate(fields)])
    fixed = np.einsum("cs,senk->ecnk", weights, np.stack([f.fixed[:, 0] for f in fields]))
    return Field(first.nodes, **nodal, terms=terms, fixed=fixed, stiffness=first.stiffness, tol=first.tol)


def rescaled_field(f: Field, stiffness: Stiffness) -> Field:
    """The field of the same loads on rigidities `stiffness`: with no springs each of the four problems
    has stiffness matrix rigidity x (its unit-rigidity matrix), so its displacements scale as 1 / rigidity."""
    axial, torsion, xy, xz = (old / new for old, new in ((f.stiffness.EA, stiffness.EA), (f.stiffness.GJ, stiffness.GJ),
                                                        (f.stiffness.EIz, stiffness.EIz), (f.stiffness.EIy, stiffness.EIy)))
    return replace(f, axial=f.axial * axial, twist=f.twist * torsion, v=f.v * xy, rz_left=f.rz_left * xy, rz_right=f.rz_right * xy,
                   w=f.w * xz, theta_left=f.theta_left * xz, theta_right=f.theta_right * xz, stiffness=stiffness)


def field_displacements(f: Field, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
    """(C, n, 6) ux, uy, uz, rx, ry, rz of each load set of the field at stations xs."""
    count = np.where(right, np.searchsorted(f.nodes, xs + f.tol, "right"), np.searchsorted(f.nodes, xs - f.tol, "left"))
    e = np.clip(count - 1, 0, len(f.nodes) - 2)
    le = (f.nodes[e + 1] - f.nodes[e])[:, None]
    s = np.clip(xs[:, None] - f.nodes[e][:, None], 0.0, le)
    s = np.where(s <= f.tol, 0.0, np.where(s >= le - f.tol, le, s))  # on a node: exactly the nodal values
    xi = s / le
    value, slope = _particular(f, e, s[:, 0])
    interior = ((s > 0) & (s < le))[:, :, None]  # the particular solution vanishes at the nodes
    value, slope = value * interior, slope * interior
    out = np.empty((f.axial.shape[1], xs.size, 6))
    out[:, :, 0] = (f.axial[e] * (1 - xi) + f.axial[e + 1] * xi + value[:, :, 0]).T
    out[:, :, 3] = (f.twist[e] * (1 - xi) + f.twist[e + 1] * xi + value[:, :, 1]).T
    v, rz = _hermite(xi, le, f.v[e], f.rz_right[e], f.v[e + 1], f.rz_left[e + 1])
    w, theta = _hermite(xi, le, f.w[e], f.theta_right[e], f.w[e + 1], f.theta_left[e + 1])
    out[:, :, 1], out[:, :, 5] = (v + value[:, :, 2]).T, (rz + slope[:, :, 2]).T
    out[:, :, 2], out[:, :, 4] = (w + value[:, :, 3]).T, (-(theta + slope[:, :, 3])).T
    return out + 0.0


def _hermite(xi: np.ndarray, le: np.ndarray, v1, t1, v2, t2) -> tuple[np.ndarray, np.ndarray]:
    """Cubic Hermite interpolation of end values and slopes: value and slope d/dx."""
    xi2, xi3 = xi * xi, xi * xi * xi
    value = (1 - 3 * xi2 + 2 * xi3) * v1 + le * (xi - 2 * xi2 + xi3) * t1 + (3 * xi2 - 2 * xi3) * v2 + le * (xi3 - xi2) * t2
    slope = ((6 * xi2 - 6 * xi) * v1 + le * (1 - 4 * xi + 3 * xi2) * t1 + (6 * xi - 6 * xi2) * v2 + le * (3 * xi2 - 2 * xi) * t2) / le
    return value, slope


def _particular(field: Field, e: np.ndarray, s: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Fixed-fixed solutions at local positions s (n,) of elements e under the element loads:
    (n, C, 4) values (ux, rx, uy, uz) and slopes (-, -, duy/dx, duz/dx). Bending:
    EI v = -C0 s^2 / 2 + R0 s^3 / 6 + F3(s); bars: EA u = -R0 s - F1(s)."""
    k = field.stiffness
    rigidity = np.array([k.EA, k.GJ, k.EIz, k.EIy])
    f1, f2, f3 = field.terms.values(s, e, (1, 2, 3))
    r0, c0 = field.fixed[e, :, :, 0], field.fixed[e, :, :, 1]
    col = s[:, None, None]
    value = np.where([False, False, True, True], -c0 * col**2 / 2 + r0 * col**3 / 6 + f3, -r0 * col - f1) / rigidity
    slope = (-c0 * col + r0 * col**2 / 2 + f2) / rigidity
    return value, slope
