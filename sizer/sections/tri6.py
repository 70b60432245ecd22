"""Saint-Venant torsion and flexural shear of a section on six-node triangles, every element at
once (numpy), in the section's drawing axes (X across, Y up), mm, with E = 1 and Poisson's ratio 0.

The formulation is the one sectionproperties implements (W. D. Pilkey, Analysis and Design of
Elastic Beams, Wiley 2002, chapter 6, from memory): the warping function omega solves
K omega = f_torsion, the shear functions Psi and Phi solve K Psi = f_psi and K Phi = f_phi, each
with the integral of the function held at zero by a Lagrange multiplier; then J, the shear centre,
the warping constant and the shear areas are integrals of these; the shear stresses at each
element's six Gauss points are extrapolated to its nodes and averaged at every node with the Gauss
weights. Stiffness, loads and integrals use the 4-point rule, stresses the 6-point rule, as there.
tests/test_tiers.py holds every result to sectionproperties' own on the same mesh.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from sizer.sections.geometry import Mesh


def _six_point_rule() -> np.ndarray:
    """The 6-point rule on a triangle (weight, then the area coordinates eta, xi, zeta)."""
    g1 = (8 - np.sqrt(10) + np.sqrt(38 - 44 * np.sqrt(2.0 / 5))) / 18
    g2 = (8 - np.sqrt(10) - np.sqrt(38 - 44 * np.sqrt(2.0 / 5))) / 18
    w1 = (620 + np.sqrt(213125 - 53320 * np.sqrt(10))) / 3720
    w2 = (620 - np.sqrt(213125 - 53320 * np.sqrt(10))) / 3720
    return np.array([[w2, 1 - 2 * g2, g2, g2], [w2, g2, 1 - 2 * g2, g2], [w2, g2, g2, 1 - 2 * g2],
                     [w1, g1, g1, 1 - 2 * g1], [w1, 1 - 2 * g1, g1, g1], [w1, g1, 1 - 2 * g1, g1]])


RULE_4 = np.array([[-27 / 48, 1 / 3, 1 / 3, 1 / 3], [25 / 48, 0.6, 0.2, 0.2], [25 / 48, 0.2, 0.6, 0.2], [25 / 48, 0.2, 0.2, 0.6]])
RULE_6 = _six_point_rule()


def shape_functions(points: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """N (G, 6) and dN / d(eta, xi, zeta) (G, 3, 6) at points (G, 3) in area coordinates."""
    eta, xi, zeta = points.T
    zero = np.zeros_like(eta)
    n = np.column_stack([eta * (2 * eta - 1), xi * (2 * xi - 1), zeta * (2 * zeta - 1), 4 * eta * xi, 4 * xi * zeta, 4 * eta * zeta])
    derivatives = np.stack([
        np.column_stack([4 * eta - 1, zero, zero, 4 * xi, zero, 4 * zeta]),
        np.column_stack([zero, 4 * xi - 1, zero, 4 * eta, 4 * zeta, zero]),
        np.column_stack([zero, zero, 4 * zeta - 1, zero, 4 * xi, 4 * eta]),
    ], axis=1)
    return n, derivatives


# values at the 6 Gauss points -> values at the 6 nodes (exact for the element's quadratics)
EXTRAPOLATION = np.linalg.inv(shape_functions(RULE_6[:, 1:])[0])


@dataclass(frozen=True)
class Quadrature:
    """One rule over every element: weight (E, G) = Gauss weight x Jacobian (the area it stands for),
    n (G, 6) shape functions, b (E, G, 2, 6) their x and y derivatives, xy (E, G, 2) the points."""

    weight: np.ndarray
    n: np.ndarray
    b: np.ndarray
    xy: np.ndarray


def quadrature(coords: np.ndarray, rule: np.ndarray) -> Quadrature:
    """The rule on elements with node coordinates coords (E, 6, 2)."""
    n, derivatives = shape_functions(rule[:, 1:])
    jacobian = np.ones((len(coords), len(rule), 3, 3))
    jacobian[..., 1:] = derivatives[None] @ coords[:, None]
    b = np.linalg.solve(jacobian, np.broadcast_to(derivatives, jacobian.shape[:2] + derivatives.shape[1:]))[..., 1:, :]
    return Quadrature(rule[:, 0] * 0.5 * np.linalg.det(jacobian), n, b, np.einsum("gk,ekd->egd", n, coords))


@dataclass(frozen=True)
class Inertia:
    """The section's area (mm^2) and second moments about its centroid (mm^4): ixx = integral of y^2,
    iyy of x^2, ixy of x y."""

    area: float
    ixx: float
    iyy: float
    ixy: float


@dataclass(frozen=True)
class Warping:
    """What the torsion and shear solutions give (mm, E = 1, Poisson's ratio 0): J (mm^4), the shear
    centre (x, y) from the centroid (mm), the warping constant (mm^6), the shear areas along x and y
    (mm^2); per node (n, 2) the shear stresses (tau_zx, tau_zy) per unit torque (per N mm) and per
    unit shear force along x and along y (per N), N/mm^2."""

    j: float
    shear_centre: tuple[float, float]
    warping_constant: float
    shear_area_x: float
    shear_area_y: float
    tau_torque: np.ndarray
    tau_vx: np.ndarray
    tau_vy: np.ndarray
    omega: np.ndarray  # (n,) warping function about the shear centre, normalised (integral of omega, x omega, y omega zero), mm^2
    tau_warping: np.ndarray  # (n, 2) (tau_zx, tau_zy) per unit warping torque (N/mm^2 per N mm); zero when omega is


def solve_warping(mesh: Mesh, centroid: tuple[float, float], inertia: Inertia) -> Warping:
    """The torsion and shear-flexure solution over `mesh`, coordinates taken from `centroid` (mm)."""
    from scipy.sparse import bmat, coo_matrix
    from scipy.sparse.linalg import splu

    elements, count = mesh.elements, len(mesh.nodes)
    coords = (mesh.nodes - np.asarray(centroid))[elements]  # (E, 6, 2)
    four = quadrature(coords, RULE_4)
    w, x, y = four.weight, four.xy[..., 0], four.xy[..., 1]
    stiffness = coo_matrix((np.einsum("eg,egik,egil->ekl", w, four.b, four.b).ravel(),
                            (np.repeat(elements, 6, axis=1).ravel(), np.tile(elements, (1, 6)).ravel())), shape=(count, count))
    constraint = _assembled(elements, count, np.einsum("eg,gk->ek", w, four.n))
    loads = np.column_stack([
        _assembled(elements, count, np.einsum("eg,egdk,egd->ek", w, four.b, np.stack([y, -x], axis=-1))),  # torsion
        _assembled(elements, count, np.einsum("eg,gk,eg->ek", w, four.n, 2 * (inertia.ixx * x - inertia.ixy * y))),  # Psi
        _assembled(elements, count, np.einsum("eg,gk,eg->ek", w, four.n, 2 * (inertia.iyy * y - inertia.ixy * x))),  # Phi
    ])
    bordered = splu(bmat([[stiffness, constraint[:, None]], [constraint[None, :], None]], format="csc"))
    omega, psi, phi = bordered.solve(np.vstack([loads, np.zeros((1, 3))])).T[:, :count]
    j = inertia.ixx + inertia.iyy - omega @ loads[:, 0]
    delta = 2 * (inertia.ixx * inertia.iyy - inertia.ixy**2)
    x_se, y_se = -loads[:, 0] @ phi / delta, loads[:, 0] @ psi / delta
    at_points = np.einsum("gk,ek->eg", four.n, omega[elements])
    q_omega, i_omega = np.sum(w * at_points), np.sum(w * at_points**2)
    i_x_omega, i_y_omega = np.sum(w * x * at_points), np.sum(w * y * at_points)
    kappa = [np.sum(w[..., None] * np.einsum("egdk,ek->egd", four.b, values[elements]) ** 2) for values in (psi, phi)]
    six = quadrature(coords, RULE_6)
    normal = _normalised_warping(omega, mesh.nodes - np.asarray(centroid), inertia, (q_omega, i_x_omega, i_y_omega))
    warping_torque = _warping_shear(bordered, four, six, elements, count, normal)
    torque = (np.einsum("egdk,ek->egd", six.b, omega[elements]) - np.stack([six.xy[..., 1], -six.xy[..., 0]], axis=-1)) / j
    return Warping(
        j=float(j), shear_centre=(float(x_se), float(y_se)),
        warping_constant=float(i_omega - q_omega**2 / inertia.area - y_se * i_x_omega + x_se * i_y_omega),
        shear_area_x=float(delta**2 / kappa[0]), shear_area_y=float(delta**2 / kappa[1]),
        tau_torque=_at_nodes(elements, count, torque),
        tau_vx=_at_nodes(elements, count, np.einsum("egdk,ek->egd", six.b, psi[elements]) / delta),
        tau_vy=_at_nodes(elements, count, np.einsum("egdk,ek->egd", six.b, phi[elements]) / delta),
        omega=normal, tau_warping=warping_torque,
    )


def _normalised_warping(omega: np.ndarray, xy: np.ndarray, inertia: Inertia, integrals: tuple[float, float, float]) -> np.ndarray:
    """(n,) the warping function about the shear centre: omega less its L2 projection on 1, x and y
    (coordinates from the centroid; x and y are exact on six-node elements), so that its integral and
    its first moments vanish and the integral of its square is the warping constant (mm^2)."""
    gram = np.array([[inertia.area, 0.0, 0.0], [0.0, inertia.iyy, inertia.ixy], [0.0, inertia.ixy, inertia.ixx]])
    c0, cx, cy = np.linalg.solve(gram, np.asarray(integrals))
    return omega - c0 - cx * xy[:, 0] - cy * xy[:, 1]


def _warping_shear(bordered: Any, four: Quadrature, six: Quadrature, elements: np.ndarray, count: int, omega: np.ndarray) -> np.ndarray:
    """(n, 2) shear stresses (tau_zx, tau_zy) per unit warping torque Tw (N/mm^2 per N mm): tau = grad chi
    with laplacian(chi) = omega / Iw and no stress across the outline (equilibrium with the warping
    normal stress B omega / Iw, dB/dx = -Tw). Zero when the warping constant is zero. `bordered`:
    scipy's SuperLU factor of the bordered stiffness (scipy is untyped)."""
    at_points = np.einsum("gk,ek->eg", four.n, omega[elements])
    warping_constant = float(np.sum(four.weight * at_points**2))
    if warping_constant <= 0.0:
        return np.zeros((count, 2))
    load = -_assembled(elements, count, np.einsum("eg,gk,eg->ek", four.weight, four.n, at_points)) / warping_constant
    chi = bordered.solve(np.append(load, 0.0))[:count]
    return _at_nodes(elements, count, np.einsum("egdk,ek->egd", six.b, chi[elements]))


def _assembled(elements: np.ndarray, count: int, per_element: np.ndarray) -> np.ndarray:
    """(count,) the element vectors (E, 6) added into the nodes."""
    return np.bincount(elements.ravel(), weights=per_element.ravel(), minlength=count)


def _at_nodes(elements: np.ndarray, count: int, at_gauss_points: np.ndarray) -> np.ndarray:
    """(count, 2) values at each element's six Gauss points (E, 6, 2), extrapolated to its nodes and
    averaged at every node with the Gauss weights of the element's local node numbers."""
    nodal = np.einsum("kg,egd->ekd", EXTRAPOLATION, at_gauss_points)
    weights = np.broadcast_to(RULE_6[:, 0], elements.shape)
    total = np.column_stack([_assembled(elements, count, nodal[..., d] * weights) for d in range(2)])
    return total / _assembled(elements, count, weights)[:, None]
