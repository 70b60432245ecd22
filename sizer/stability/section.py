"""What the stability solver needs of a section, in the section's own axes (y along the depth,
towards the top; z across), SI units. Fields may be floats (one section) or arrays (many sections
at once, for the sizing screen): every derived value below is elementwise.

Rigidities: EIz (major: bending in the depth plane), EIy (minor), EIyz (product), N*m^2; GJ
(N*m^2), EIw (N*m^4). Geometry: area (m^2); Iz, Iy, Iyz (m^4) about the centroid; shear-centre
offsets y0, z0 (m) from the centroid; Py = integral of y (y^2 + z^2) dA and Pz = integral of
z (y^2 + z^2) dA (m^5, from sectionproperties' monosymmetry integrals); y_top and y_bottom (m), the
distances from the centroid to the top and bottom fibres.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

if TYPE_CHECKING:
    from sizer.sections.properties import SectionProperties


@dataclass(frozen=True)
class StabilitySection:
    """A section's stiffness and geometry for the stability solver (see the module docstring)."""

    EIz: Any
    EIy: Any
    EIyz: Any
    GJ: Any
    EIw: Any
    area: Any
    Iz: Any
    Iy: Any
    Iyz: Any
    y0: Any
    z0: Any
    Py: Any
    Pz: Any
    y_top: Any
    y_bottom: Any

    @property
    def polar_radius_squared(self) -> Any:
        """r0^2 = (Iz + Iy) / A + y0^2 + z0^2 (m^2): polar radius of gyration about the shear centre."""
        return (self.Iz + self.Iy) / self.area + self.y0**2 + self.z0**2

    @property
    def wagner_major(self) -> Any:
        """d W / d Mz (m), where W = integral of sigma ((y - y0)^2 + (z - z0)^2) dA is the Wagner
        coefficient of the twist rate squared: -beta_y for a section symmetric about y, with
        beta_y = Py / Iz - 2 y0 the monosymmetry constant (negative when the larger flange is on top)."""
        det = self.Iz * self.Iy - self.Iyz**2
        return (-self.Iy * self.Py + self.Iyz * self.Pz) / det + 2 * self.y0

    @property
    def wagner_minor(self) -> Any:
        """d W / d My (m): beta_z = Pz / Iy - 2 z0 for a section symmetric about z."""
        det = self.Iz * self.Iy - self.Iyz**2
        return (-self.Iyz * self.Py + self.Iz * self.Pz) / det - 2 * self.z0

    def face_height(self, face: str) -> Any:
        """Height (m) above the shear centre of a face: "top", "centre" (the shear centre itself),
        "bottom" or "centroid"."""
        return {"top": self.y_top - self.y0, "bottom": -self.y_bottom - self.y0, "centre": 0.0 * self.y0,
                "centroid": -self.y0}[face]


def stability_section(props: SectionProperties, elastic_modulus: float, shear_modulus: float) -> StabilitySection:
    """The StabilitySection of one catalogue section (sizer.sections.SectionProperties, whose axes are
    the section's own whatever its orientation on the member) in a material (E, G in Pa)."""
    y0, z0 = props.shear_centre
    values = {name: getattr(props, name) for name in SCALARS if name not in ("ys", "zs")}
    return section_of(values | {"ys": y0, "zs": z0}, elastic_modulus, shear_modulus)


SCALARS = ("Iz", "Iy", "Iyz", "J", "Iw", "area", "ys", "zs", "Py", "Pz", "y_top", "y_bottom")  # section scalars by their table names


def section_of(values: Any, elastic_modulus: float, shear_modulus: float) -> StabilitySection:
    """The StabilitySection of section scalars by their table names (SCALARS; floats or arrays of
    many sections) in a material (E, G in Pa)."""
    E, G, v = elastic_modulus, shear_modulus, values
    return StabilitySection(EIz=E * v["Iz"], EIy=E * v["Iy"], EIyz=E * v["Iyz"], GJ=G * v["J"], EIw=E * v["Iw"], area=v["area"],
                            Iz=v["Iz"], Iy=v["Iy"], Iyz=v["Iyz"], y0=v["ys"], z0=v["zs"], Py=v["Py"], Pz=v["Pz"],
                            y_top=v["y_top"], y_bottom=v["y_bottom"])


def principal_inertias(section: Any) -> tuple[np.ndarray, np.ndarray]:
    """(I11, I22) (m^4): the section's largest and smallest second moments, about its principal
    axes (which differ from y and z where Iyz is not zero: angles, Z sections). `section`: anything
    with Iz, Iy and Iyz, one section's or many sections' at once (a StabilitySection, a table)."""
    Iz, Iy, Iyz = (np.asarray(getattr(section, name), float) for name in ("Iz", "Iy", "Iyz"))
    mean, half = (Iz + Iy) / 2, np.hypot((Iz - Iy) / 2, Iyz)
    return mean + half, mean - half


def has_weaker_axis(section: Any, tolerance: float = 1e-3) -> Any:
    """True where the principal second moments differ by more than `tolerance` (relative): False
    for round and square shapes, which bend alike about every axis."""
    i11, i22 = principal_inertias(section)
    return i11 > i22 * (1 + tolerance)


def minor_axis_is_weaker(section: Any, tolerance: float = 1e-3) -> Any:
    """True where bending about the section's z axis can buckle the member sideways: the section has
    a weaker principal axis (has_weaker_axis) and the z axis is not it, so that bending about z bends
    it about its stronger principal axis in part (cos^2 of the angle between z and the 11 axis,
    (Iz - I22) / (I11 - I22), above `tolerance`): every I, channel or tee bent about its major axis,
    and an angle (principal axes at some angle to its legs: an equal-leg angle has I11 / I22 of
    about 3.9, its legs' axes half way between) bent about either leg's axis."""
    i11, i22 = principal_inertias(section)
    share = (np.asarray(section.Iz, float) - i22) / np.where(i11 > i22, i11 - i22, 1.0)
    return has_weaker_axis(section, tolerance) & (share > tolerance)
