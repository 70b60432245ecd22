"""Element integrals of the stability solver: cubic Hermite shape functions at Gauss points, and
the assembly of integrals of the form  integral f(x) a_i(x) b_j(x) dx  into (size, size) matrices,
where a and b are a field's value, slope or curvature shape functions and f is sampled at the Gauss
points (an internal action, a load intensity, or 1).

Four Gauss points per element integrate polynomials up to degree 7 exactly: every integrand here
is exact, because the mesh has a node wherever the internal actions or loads change form (so within
an element N is at most quadratic, M at most cubic, a load at most linear).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.stability.matrices import assemble
from sizer.stability.mesh import Mesh

GAUSS_POINTS = 4
_POINTS, _WEIGHTS = np.polynomial.legendre.leggauss(GAUSS_POINTS)
GAUSS_XI = (_POINTS + 1) / 2  # on [0, 1]
GAUSS_WEIGHT = _WEIGHTS / 2
ORDER = {"value": 0, "slope": 1, "curvature": 2}


def hermite(xi: np.ndarray, le: np.ndarray) -> np.ndarray:
    """(3, ..., 4) cubic Hermite shape functions (v1, theta1, v2, theta2) and their first and second
    derivatives along x, at local positions xi (0..1) of elements of length le (same shape)."""
    xi2, xi3 = xi * xi, xi * xi * xi
    value = np.stack([1 - 3 * xi2 + 2 * xi3, le * (xi - 2 * xi2 + xi3), 3 * xi2 - 2 * xi3, le * (xi3 - xi2)], axis=-1)
    slope = np.stack([(6 * xi2 - 6 * xi) / le, 1 - 4 * xi + 3 * xi2, (6 * xi - 6 * xi2) / le, 3 * xi2 - 2 * xi], axis=-1)
    curvature = np.stack([(12 * xi - 6) / le**2, (6 * xi - 4) / le, (6 - 12 * xi) / le**2, (6 * xi - 2) / le], axis=-1)
    return np.stack([value, slope, curvature])


@dataclass(frozen=True)
class Quadrature:
    """Gauss points of every element: positions x (E, G) in m, weights (E, G) in m, and the shape
    functions shapes[order] (E, G, 4) for order 0 value, 1 slope, 2 curvature."""

    mesh: Mesh
    x: np.ndarray
    weight: np.ndarray
    shapes: np.ndarray

    @property
    def points(self) -> np.ndarray:
        """Every Gauss point's x (m), flat, element by element."""
        return self.x.ravel()


def quadrature(mesh: Mesh) -> Quadrature:
    """The Gauss points and shape functions of every element of `mesh`."""
    le = mesh.lengths[:, None]
    xi = np.broadcast_to(GAUSS_XI[None, :], (len(le), GAUSS_POINTS))
    x = mesh.nodes[:-1, None] + le * xi
    return Quadrature(mesh, x, le * GAUSS_WEIGHT[None, :], hermite(xi, np.broadcast_to(le, xi.shape)))


def integral(quad: Quadrature, f: np.ndarray, first: tuple[int, str], second: tuple[int, str], symmetric: bool = True) -> np.ndarray:
    """(size, size) matrix (dense or sparse: sizer.stability.matrices) of integral f a_i b_j dx (plus its transpose when `symmetric` and the two
    parts differ: the form's symmetric matrix). `first`, `second`: (field, "value" | "slope" |
    "curvature"). `f`: (E, G) values at the Gauss points."""
    (fa, oa), (fb, ob) = first, second
    a, b = quad.shapes[ORDER[oa]], quad.shapes[ORDER[ob]]
    blocks = np.einsum("eg,egi,egj->eij", f * quad.weight, a, b)
    da, db = quad.mesh.element_freedoms(fa), quad.mesh.element_freedoms(fb)
    rows, columns = np.broadcast_arrays(da[:, :, None], db[:, None, :])
    out = assemble((quad.mesh.size, quad.mesh.size), rows, columns, blocks, quad.mesh.sparse)
    if symmetric and first != second:
        out = out + out.T
    return out
