"""The torsion-and-warping tier and the unit stress fields: the outline meshed as sectionproperties
meshes it (sizer.sections.geometry.mesh), the Saint-Venant torsion and shear-flexure problems
solved on it (sizer.sections.tri6, the formulation sectionproperties implements, every element at
once: a few hundredths of a second a section, without importing sectionproperties), and the plastic
moduli from the outline polygon. Member axes and SI units (see sizer.sections.properties).

WARPING_NAMES: plastic moduli Zz, Zy (m^3); torsion constant J (m^4); warping constant Iw (m^6);
shear centre ys, zs from the centroid (m); shear areas Avy, Avz (m^2); tau_peak_Vy, _Vz, _T, the
largest shear stress per unit Vy, Vz (Pa per N) and T (Pa per N*m); and the mesh: elements,
nodes, largest element area (m^2).

Unit stress fields at the mesh nodes: sigma per unit N, My, Mz is the exact linear field of the
geometric tier; tau per unit Vy, Vz, T comes from the shear functions and the warping function
(loads through the shear centre, Poisson's ratio 0); the warping normal stress per unit bimoment is
omega / Iw (omega the warping function about the shear centre, u = omega dphi/dx) and the warping
shear per unit warping torque the gradient field in equilibrium with it.

`analyse` is sectionproperties' own analysis of the same mesh: the reference the tests compare with.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from sizer.errors import InputError
from sizer.sections.fields import UnitStressField
from sizer.sections.geometric import bending_coefficients
from sizer.sections.geometry import MM, mesh, meshed_section, outline_rings
from sizer.sections.polygon import oriented, plastic_modulus, polygon_moments
from sizer.sections.spec import SectionSpec
from sizer.sections.tri6 import Inertia, solve_warping

WARPING_NAMES: tuple[str, ...] = (
    "Zz", "Zy", "J", "Iw", "ys", "zs", "Avy", "Avz", "tau_peak_Vy", "tau_peak_Vz", "tau_peak_T",
    "mesh_elements", "mesh_nodes", "max_element_area",
)
_FORCE_TO_PA = 1e6  # stress in N/mm^2 per 1 N -> Pa per 1 N
_MOMENT_TO_PA = 1e9  # stress in N/mm^2 per 1 N*mm -> Pa per 1 N*m


def compute(spec: SectionSpec, geometric: dict[str, float]) -> tuple[dict[str, float], dict[str, np.ndarray]]:
    """The tier's scalars (WARPING_NAMES) and unit stress arrays (points, sigma, tau) of `spec`,
    computed now; `geometric` is the section's geometric tier."""
    made = mesh(spec)
    exterior, holes = outline_rings(spec)
    moments = polygon_moments(exterior, holes)
    try:
        found = solve_warping(made, moments.centroid, Inertia(moments.area, moments.xx, moments.yy, moments.xy))
    except Exception as exc:  # a singular system on a mesh that was made
        raise InputError(spec.source, "sections", f"section {spec.name!r}: its torsion could not be solved ({type(exc).__name__}: {exc})",
                         "check the dimensions or the polygon's points", spec.line) from None
    cx, cy = moments.centroid
    points = np.column_stack([(made.nodes[:, 1] - cy) / MM, -(made.nodes[:, 0] - cx) / MM])
    sigma = np.vstack([np.full(len(points), 1.0 / geometric["area"]), *(points @ per_moment for per_moment in bending_coefficients(geometric))])
    tau = np.stack([  # member (tau_xy, tau_xz) = (tau_zy, -tau_zx) of the drawing; unit Vz is a shear of -1 along X
        found.tau_vy[:, ::-1] * [1.0, -1.0] * _FORCE_TO_PA,
        found.tau_vx[:, ::-1] * [-1.0, 1.0] * _FORCE_TO_PA,
        found.tau_torque[:, ::-1] * [1.0, -1.0] * _MOMENT_TO_PA,
    ])
    tau_peak = UnitStressField(points, sigma, tau).tau_peak
    rings = oriented(exterior, holes)
    x_se, y_se = found.shear_centre
    scalars = {
        "Zz": plastic_modulus(rings, 1) / MM**3, "Zy": plastic_modulus(rings, 0) / MM**3,
        "J": found.j / MM**4, "Iw": found.warping_constant / MM**6, "ys": y_se / MM, "zs": -x_se / MM,
        "Avy": found.shear_area_y / MM**2, "Avz": found.shear_area_x / MM**2,
        "tau_peak_Vy": tau_peak[0], "tau_peak_Vz": tau_peak[1], "tau_peak_T": tau_peak[2],
        "mesh_elements": len(made.elements), "mesh_nodes": len(made.nodes), "max_element_area": made.max_area / MM**2,
    }
    scalars = _without_noise({name: float(value) for name, value in scalars.items()}, geometric)
    omega, tau_w = _warping_fields(found, scalars["Iw"])
    return scalars, {"points": points, "sigma": sigma, "tau": tau, "omega": omega, "tau_w": tau_w}


def _warping_fields(found: Any, warping_constant: float) -> tuple[np.ndarray, np.ndarray]:
    """Warping normal stress per unit bimoment, omega / Iw (Pa per N*m^2), and the warping shear
    stress (tau_xy, tau_xz) per unit warping torque (Pa per N*m) at the mesh nodes; zero where the
    warping constant is (solver noise)."""
    if warping_constant == 0.0:
        return np.zeros(len(found.omega)), np.zeros((len(found.omega), 2))
    omega = found.omega / MM**2 / warping_constant
    return omega, found.tau_warping[:, ::-1] * [1.0, -1.0] * _MOMENT_TO_PA


def _without_noise(s: dict[str, float], geometric: dict[str, float]) -> dict[str, float]:
    """Solver noise set to exactly zero: shear-centre offsets below 1e-5 of the section's size, a
    warping constant below 1e-9 of (Iz + Iy) size^2 (a circle's)."""
    size = max(geometric["depth"], geometric["width"])
    for name in ("ys", "zs"):
        if abs(s[name]) < 1e-5 * size:
            s[name] = 0.0
    if abs(s["Iw"]) < 1e-9 * (geometric["Iz"] + geometric["Iy"]) * size**2:
        s["Iw"] = 0.0
    return s


def analyse(spec: SectionSpec) -> Any:
    """sectionproperties' Section of `spec` on the same mesh after its geometric, warping and
    plastic analyses (mm): the reference for tests and benchmarks."""
    section = meshed_section(spec)
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    section.calculate_plastic_properties()
    return section
