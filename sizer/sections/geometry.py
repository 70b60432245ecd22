"""Section outlines for sectionproperties, and the mesh rule.

The outline is built in millimetres (sectionproperties' own examples and tolerances are in mm;
results are converted to SI in sizer.sections.properties), drawn with the depth along
sectionproperties' Y axis and "across" along its X axis.

Curves: N_RADIUS points per quarter-circle root or corner radius (the chords add 0.1 % to an
IPE 300's area, 0.5 % to its J); N_CIRCLE points per full circle, so a polygon's area is 0.07 %
below pi d^2/4 (an inscribed regular n-gon has n/(2 pi) sin(2 pi/n) of the circle's area).

Mesh rule (quadratic six-node triangles): largest element area
    min((t_min / WALL_DIVISOR)^2, A / MIN_ELEMENTS)
t_min: the thinnest wall (flange or web thickness, tube wall, smaller side of a flat, diameter of a
bar; for a polygon 2 A / perimeter, the wall of a thin strip). Triangle's 30-degree quality bound
refines further along radii. With these values J is within 0.3 % of a mesh with elements 9 times
smaller for every shape of the shipped catalogue (benchmarks/bench_sections.py prints the figures;
tests/test_sections_properties.py holds IPE 300 and an angle to 1 %), and a section gets 300 to
500 elements (IPE 300: 374), about 0.2 s of analysis on one core.
"""

from __future__ import annotations

from typing import Any

from sizer.errors import InputError
from sizer.sections.shapes import thinnest_wall
from sizer.sections.spec import SectionSpec

N_RADIUS = 8
N_CIRCLE = 96
WALL_DIVISOR = 1.25
MIN_ELEMENTS = 200
MIN_ANGLE = 30.0
MM = 1e3  # mm per m


def mesh_settings() -> dict[str, float]:
    """Everything about meshing that changes results (part of the cache key)."""
    return {"n_radius": N_RADIUS, "n_circle": N_CIRCLE, "wall_divisor": WALL_DIVISOR,
            "min_elements": MIN_ELEMENTS, "min_angle": MIN_ANGLE}


def outline(spec: SectionSpec) -> Any:
    """The section's sectionproperties Geometry (mm), depth along Y, not yet meshed."""
    from sectionproperties.pre.library import primitive_sections as primitive
    from sectionproperties.pre.library import steel_sections as steel

    d = {key: value * MM for key, value in spec.dims.items()}
    builders = {
        "rectangle": lambda: primitive.rectangular_section(d=d["depth"], b=d["width"]),
        "round": lambda: primitive.circular_section(d=d["diameter"], n=N_CIRCLE),
        "rectangular_tube": lambda: steel.rectangular_hollow_section(d=d["depth"], b=d["width"], t=d["thickness"], r_out=d["outer_radius"], n_r=N_RADIUS),
        "round_tube": lambda: steel.circular_hollow_section(d=d["diameter"], t=d["thickness"], n=N_CIRCLE),
        "i_beam": lambda: steel.i_section(d=d["depth"], b=d["width"], t_f=d["flange_thickness"], t_w=d["web_thickness"], r=d["root_radius"], n_r=N_RADIUS),
        "channel": lambda: steel.channel_section(d=d["depth"], b=d["width"], t_f=d["flange_thickness"], t_w=d["web_thickness"], r=d["root_radius"], n_r=N_RADIUS),
        "tee": lambda: steel.tee_section(d=d["depth"], b=d["width"], t_f=d["flange_thickness"], t_w=d["web_thickness"], r=d["root_radius"], n_r=N_RADIUS),
        "angle": lambda: steel.angle_section(d=d["depth"], b=d["width"], t=d["thickness"], r_r=d["root_radius"], r_t=0.0, n_r=N_RADIUS),
        "polygon": lambda: _polygon_geometry(spec),
    }
    return builders[spec.shape]()


def _polygon_geometry(spec: SectionSpec) -> Any:
    from sectionproperties.pre.geometry import Geometry
    from shapely.geometry import Polygon
    from shapely.geometry.polygon import orient

    def mm(ring: tuple[tuple[float, float], ...]) -> list[tuple[float, float]]:
        return [(x * MM, y * MM) for x, y in ring]

    return Geometry(orient(Polygon(mm(spec.points), [mm(hole) for hole in spec.holes]), 1.0))


def max_element_area(spec: SectionSpec, geometry: Any) -> float:
    """The mesh rule (mm^2): min((t_min / WALL_DIVISOR)^2, A / MIN_ELEMENTS)."""
    area = geometry.calculate_area()
    if spec.shape == "polygon":
        wall = 2.0 * area / geometry.calculate_perimeter()
    else:
        wall = thinnest_wall(spec.shape, spec.dims) * MM
    return min((wall / WALL_DIVISOR) ** 2, area / MIN_ELEMENTS)


def meshed_section(spec: SectionSpec) -> Any:
    """A sectionproperties Section of the spec, meshed by the mesh rule (not yet analysed)."""
    from sectionproperties.analysis import Section

    try:
        geometry = outline(spec)
        geometry.create_mesh(mesh_sizes=max_element_area(spec, geometry), min_angle=MIN_ANGLE)
        return Section(geometry)
    except Exception as exc:  # the mesher's failures on an outline that passed our checks
        raise InputError(spec.source, "sections", f"section {spec.name!r}: the shape cannot be meshed ({type(exc).__name__}: {exc})",
                         "check the dimensions or the polygon's points", spec.line) from None
