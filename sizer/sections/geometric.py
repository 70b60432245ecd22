"""The geometric tier: what a section's outline alone settles, in member axes and SI units, exact
for the outline polygon (sizer.sections.polygon) and computed in well under a millisecond without
sectionproperties: area, centroid, second moments and principal axes, elastic moduli and extreme
fibres, radii of gyration, the monosymmetry integrals Py and Pz, bounding box, perimeter, and the
peak normal stress per unit N, My and Mz.

Normal stress is exactly linear over the section (sigma = N / A + b y + c z, b and c from My, Mz
and the second moments), so its largest value over any set of points inside the outline is at an
outline corner: the corners with the linear field are the normal stresses of the full field
(normal_stress_field), and sigma_peak is their largest magnitude. sectionproperties' mesh keeps
every corner as a node, so its unit stress fields give the same peaks to round-off.

Axes as in sizer.sections.properties: member y = Y (depth), member z = -X.
"""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np

from sizer.errors import InputError
from sizer.sections.fields import UnitStressField
from sizer.sections.geometry import MM, outline_rings
from sizer.sections.polygon import PolygonMoments, plane_moments, polygon_moments
from sizer.sections.spec import SectionSpec

GEOMETRIC_NAMES: tuple[str, ...] = (
    "area", "centroid_y", "centroid_z", "Iz", "Iy", "Iyz", "I11", "I22", "principal_angle",
    "Sz_top", "Sz_bottom", "Sy_plus", "Sy_minus", "y_top", "y_bottom", "z_plus", "z_minus",
    "rz", "ry", "Py", "Pz", "depth", "width", "perimeter", "sigma_peak_N", "sigma_peak_My", "sigma_peak_Mz",
)


def geometric_scalars(spec: SectionSpec) -> dict[str, float]:
    """The geometric tier of `spec`: GEOMETRIC_NAMES -> value (SI, member axes; see
    sizer.sections.properties.SectionProperties for each)."""
    moments, corners = _moments_and_corners(spec)
    return _scalars(moments, corners)


@lru_cache(maxsize=256)
def normal_stress_field(spec: SectionSpec) -> UnitStressField:
    """Normal stresses per unit N, My, Mz at the outline's corners (points from the centroid, member
    axes); no shear stresses (shear_known False). Remembered for the sections last asked for. Only
    the moments up to the second order are needed (sizer.sections.polygon.plane_moments)."""
    exterior, holes = outline_rings(spec)
    area, centroid, xx, yy, xy = plane_moments(exterior, holes)
    corners = _corners(spec, exterior, holes, area, centroid)
    scalars = _second_moments(area, xx, yy, xy)
    sigma = np.vstack([np.full(len(corners), 1.0 / scalars["area"]), *(corners @ per_moment for per_moment in bending_coefficients(scalars))])
    return UnitStressField(corners, sigma, np.zeros((3, len(corners), 2)), shear_known=False)


def _moments_and_corners(spec: SectionSpec) -> tuple[PolygonMoments, np.ndarray]:
    """The outline's moments (mm) and every corner of outline and holes as (y, z) from the centroid, m."""
    exterior, holes = outline_rings(spec)
    moments = polygon_moments(exterior, holes)
    return moments, _corners(spec, exterior, holes, moments.area, moments.centroid)


def _corners(spec: SectionSpec, exterior: np.ndarray, holes: list[np.ndarray], area: float, centroid: tuple[float, float]) -> np.ndarray:
    """Every corner of outline and holes as (y, z) from the centroid, m (outline in mm); bad input
    where the outline encloses no area (only past the catalogue's checks: a section built in code)."""
    if not area > 0:
        raise InputError(spec.source, "sections", f"section {spec.name!r}: its outline encloses no area",
                         "check the dimensions or the polygon's points", spec.line)
    cx, cy = centroid
    points = np.vstack([exterior, *holes])
    return np.column_stack([(points[:, 1] - cy) / MM, -(points[:, 0] - cx) / MM])


def bending_coefficients(s: dict[str, float]) -> tuple[np.ndarray, np.ndarray]:
    """(b, c) of sigma = b y + c z per unit My and per unit Mz (Pa per N*m, y and z in m): from
    My = integral sigma z dA and Mz = -integral sigma y dA (docs/design.md section 2 signs)."""
    det = s["Iz"] * s["Iy"] - s["Iyz"] ** 2
    return np.array([-s["Iyz"], s["Iz"]]) / det, np.array([-s["Iy"], s["Iyz"]]) / det


def _second_moments(area: float, xx: float, yy: float, xy: float) -> dict[str, float]:
    """area, Iz, Iy, Iyz (m^2, m^4, member axes) from the outline's area and second moments about its
    centroid (mm^2, mm^4); a product of inertia below 1e-9 of sqrt(Iz Iy) is exactly zero (a
    symmetric section's round-off)."""
    inertia = 1 / MM**4
    Iz, Iy, Iyz = xx * inertia, yy * inertia, -xy * inertia
    return {"area": area * (1 / MM**2), "Iz": Iz, "Iy": Iy, "Iyz": 0.0 if abs(Iyz) < 1e-9 * math.sqrt(Iz * Iy) else Iyz}


def _scalars(m: PolygonMoments, corners: np.ndarray) -> dict[str, float]:
    x_min, x_max, y_min, y_max = m.bounds
    cx, cy = m.centroid
    length, fifth = 1 / MM, 1 / MM**5
    s = {
        **_second_moments(m.area, m.xx, m.yy, m.xy),
        "centroid_y": (cy - (y_min + y_max) / 2) * length, "centroid_z": -(cx - (x_min + x_max) / 2) * length,
        "y_top": (y_max - cy) * length, "y_bottom": (cy - y_min) * length, "z_plus": (cx - x_min) * length, "z_minus": (x_max - cx) * length,
        "Py": (m.third[(0, 3)] + m.third[(2, 1)]) * fifth, "Pz": -(m.third[(1, 2)] + m.third[(3, 0)]) * fifth,
        "depth": (y_max - y_min) * length, "width": (x_max - x_min) * length, "perimeter": m.perimeter * length,
    }
    _without_noise(s)
    s["I11"], s["I22"], s["principal_angle"] = _principal(s["Iz"], s["Iy"], s["Iyz"])
    s.update(Sz_top=s["Iz"] / s["y_top"], Sz_bottom=s["Iz"] / s["y_bottom"], Sy_plus=s["Iy"] / s["z_plus"], Sy_minus=s["Iy"] / s["z_minus"],
             rz=math.sqrt(s["Iz"] / s["area"]), ry=math.sqrt(s["Iy"] / s["area"]), sigma_peak_N=1.0 / s["area"])
    per_my, per_mz = bending_coefficients(s)
    s["sigma_peak_My"], s["sigma_peak_Mz"] = float(np.abs(corners @ per_my).max()), float(np.abs(corners @ per_mz).max())
    return {name: float(s[name]) for name in GEOMETRIC_NAMES}


def _principal(Iz: float, Iy: float, Iyz: float) -> tuple[float, float, float]:
    """(I11, I22, angle): principal second moments and the 11 axis' angle in [-pi/2, pi/2) from the z
    axis, positive about +x (I11 = Iz cos^2 a + Iy sin^2 a + Iyz sin 2a); 0 when the z axis is
    the 11 axis to 1e-12."""
    half = math.hypot((Iz - Iy) / 2, Iyz)
    i11, i22 = (Iz + Iy) / 2 + half, (Iz + Iy) / 2 - half
    angle = 0.0 if abs(Iz - i11) < 1e-12 * i11 else math.atan2(Iz - i11, -Iyz)
    return i11, i22, (angle + math.pi / 2) % math.pi - math.pi / 2


def _without_noise(s: dict[str, float]) -> None:
    """Round-off set to exactly zero: centroid offsets below 1e-5 of the section's size and
    monosymmetry integrals below 1e-7 of (Iz + Iy) size (a symmetric section's; the product of
    inertia: _second_moments)."""
    size = max(s["depth"], s["width"])
    for name in ("centroid_y", "centroid_z"):
        if abs(s[name]) < 1e-5 * size:
            s[name] = 0.0
    for name in ("Py", "Pz"):
        if abs(s[name]) < 1e-7 * (s["Iz"] + s["Iy"]) * size:
            s[name] = 0.0

