"""Section outlines, the mesh rule and the mesh.

The outline is built in millimetres (sectionproperties' own examples and tolerances are in mm;
results are converted to SI in sizer.sections.properties), drawn with the depth along
sectionproperties' Y axis and "across" along its X axis: the corners its section library draws for
each shape, computed here in numpy (`outline_rings`; `outline` is the same as a sectionproperties
Geometry, for drawings and reference analyses). `mesh` meshes it as sectionproperties would.

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
500 elements (IPE 300: 374), 20 to 50 ms of analysis on one core (sizer.sections.tri6).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np

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


Ring = np.ndarray  # (n, 2) points (across, up) in mm, in order around a ring


def outline_rings(spec: SectionSpec) -> tuple[Ring, list[Ring]]:
    """The outline and its holes (mm, across along X, depth along Y): the points that
    sectionproperties' own section library draws for the shape (same radii, same arithmetic), or
    the polygon's points. Pure numpy: the geometric properties need no sectionproperties."""
    if spec.shape == "polygon":
        return np.asarray(spec.points, dtype=float) * MM, [np.asarray(hole, dtype=float) * MM for hole in spec.holes]
    d = {key: value * MM for key, value in spec.dims.items()}
    if spec.shape == "rectangle":
        return _points((0, 0), (d["width"], 0), (d["width"], d["depth"]), (0, d["depth"])), []
    if spec.shape == "round":
        return _circle(0.5 * d["diameter"]), []
    if spec.shape == "round_tube":
        return _circle(0.5 * d["diameter"]), [_circle(0.5 * d["diameter"] - d["thickness"])]
    if spec.shape == "rectangular_tube":
        return _tube_rings(d["depth"], d["width"], d["thickness"], d["outer_radius"])
    return _OPEN_SHAPES[spec.shape](d), []


def _points(*points: Any) -> Ring:
    """Points and arcs (each a point or an (n, 2) array) joined in order into one ring."""
    return np.vstack([np.atleast_2d(np.asarray(point, dtype=float)) for point in points])


def _arc(centre: tuple[float, float], r: float, theta: float, clockwise: bool = False, n: int = N_RADIUS) -> Ring:
    """n points on a quarter circle of radius r about `centre` from angle theta (the centre alone
    when r = 0), as sectionproperties' draw_radius places them."""
    if r == 0:
        return np.array([centre], dtype=float)
    cos, sin = _quarter_turn(theta, clockwise, n)
    return np.column_stack([centre[0] + r * cos, centre[1] + r * sin])


@lru_cache(maxsize=64)
def _quarter_turn(theta: float, clockwise: bool, n: int) -> tuple[np.ndarray, np.ndarray]:
    """cos and sin of the n angles of a quarter turn from theta (read only: shared by every arc of that turn)."""
    turn = (-1 if clockwise else 1) * np.arange(n) * 1.0 / max(1, n - 1) * (np.pi * 0.5) + theta
    cos, sin = np.cos(turn), np.sin(turn)
    cos.flags.writeable = sin.flags.writeable = False
    return cos, sin


def _circle(radius: float) -> Ring:
    """N_CIRCLE points on a circle about the origin, the first on the +X axis."""
    theta = np.arange(N_CIRCLE) * 2 * np.pi * 1.0 / N_CIRCLE
    return np.column_stack([radius * np.cos(theta), radius * np.sin(theta)])


def _tube_rings(depth: float, width: float, t: float, r_out: float) -> tuple[Ring, list[Ring]]:
    """A rectangular tube: outer corners of radius r_out, inner corners of radius max(r_out - t, 0)."""
    b, d, r_in = width, depth, max(r_out - t, 0)
    outer = _points(_arc((r_out, r_out), r_out, np.pi), _arc((b - r_out, r_out), r_out, 1.5 * np.pi),
                    _arc((b - r_out, d - r_out), r_out, 0), _arc((r_out, d - r_out), r_out, 0.5 * np.pi))
    inner = _points(_arc((t + r_in, t + r_in), r_in, np.pi), _arc((b - t - r_in, t + r_in), r_in, 1.5 * np.pi),
                    _arc((b - t - r_in, d - t - r_in), r_in, 0), _arc((t + r_in, d - t - r_in), r_in, 0.5 * np.pi))
    return outer, [inner]


def _i_beam(d: dict[str, float]) -> Ring:
    b, h, tf, tw, r = d["width"], d["depth"], d["flange_thickness"], d["web_thickness"], d["root_radius"]
    return _points((0, 0), (b, 0), (b, tf), _arc((b * 0.5 + tw * 0.5 + r, tf + r), r, 1.5 * np.pi, True),
                   _arc((b * 0.5 + tw * 0.5 + r, h - tf - r), r, np.pi, True), (b, h - tf), (b, h), (0, h), (0, h - tf),
                   _arc((b * 0.5 - tw * 0.5 - r, h - tf - r), r, 0.5 * np.pi, True), _arc((b * 0.5 - tw * 0.5 - r, tf + r), r, 0, True),
                   (0, tf))


def _channel(d: dict[str, float]) -> Ring:
    b, h, tf, tw, r = d["width"], d["depth"], d["flange_thickness"], d["web_thickness"], d["root_radius"]
    return _points((0, 0), (b, 0), (b, tf), _arc((tw + r, tf + r), r, 1.5 * np.pi, True), _arc((tw + r, h - tf - r), r, np.pi, True),
                   (b, h - tf), (b, h), (0, h))


def _tee(d: dict[str, float]) -> Ring:
    b, h, tf, tw, r = d["width"], d["depth"], d["flange_thickness"], d["web_thickness"], d["root_radius"]
    return _points((b * 0.5 - tw * 0.5, 0), (b * 0.5 + tw * 0.5, 0), _arc((b * 0.5 + tw * 0.5 + r, h - tf - r), r, np.pi, True),
                   (b, h - tf), (b, h), (0, h), (0, h - tf), _arc((b * 0.5 - tw * 0.5 - r, h - tf - r), r, 0.5 * np.pi, True))


def _angle(d: dict[str, float]) -> Ring:
    """An angle with sharp toes: the heel at the origin, legs along +X (width) and +Y (depth)."""
    b, h, t, r = d["width"], d["depth"], d["thickness"], d["root_radius"]
    return _points((0, 0), (b, 0), (b, t), _arc((t + r, t + r), r, 1.5 * np.pi, True), (t, h), (0, h))


_OPEN_SHAPES = {"i_beam": _i_beam, "channel": _channel, "tee": _tee, "angle": _angle}


def outline(spec: SectionSpec) -> Any:
    """The section's sectionproperties Geometry (mm) of the outline_rings, depth along Y, not yet meshed."""
    from sectionproperties.pre.geometry import Geometry
    from shapely.geometry import Polygon
    from shapely.geometry.polygon import orient

    exterior, holes = outline_rings(spec)
    return Geometry(orient(Polygon(exterior, holes), 1.0))


def max_element_area(spec: SectionSpec, geometry: Any) -> float:
    """The mesh rule (mm^2) for a sectionproperties Geometry of the outline."""
    return _mesh_rule(spec, geometry.calculate_area(), geometry.calculate_perimeter())


def _mesh_rule(spec: SectionSpec, area: float, perimeter: float) -> float:
    """min((t_min / WALL_DIVISOR)^2, A / MIN_ELEMENTS), mm^2, from the outline's area and perimeter (mm)."""
    wall = 2.0 * area / perimeter if spec.shape == "polygon" else thinnest_wall(spec.shape, spec.dims) * MM
    return min((wall / WALL_DIVISOR) ** 2, area / MIN_ELEMENTS)


@dataclass(frozen=True)
class Mesh:
    """Six-node triangles over the outline (mm): nodes (n, 2) as (X, Y); elements (E, 6) node numbers,
    the corners anticlockwise, then the mid-side nodes of the edges 0-1, 1-2 and 2-0."""

    nodes: np.ndarray
    elements: np.ndarray
    max_area: float  # the mesh rule's largest element area, mm^2


def mesh(spec: SectionSpec) -> Mesh:
    """The outline meshed by the mesh rule with Triangle (through cytriangle), given exactly what
    sectionproperties gives it for a Geometry of the outline (corners rounded to 1e-12 mm, one
    region, holes by an inner point, the 30-degree quality bound, quadratic elements), so the mesh
    is the one sectionproperties would analyse. InputError when Triangle fails."""
    import cytriangle
    from shapely.geometry import Polygon
    from shapely.geometry.polygon import orient

    exterior, holes = outline_rings(spec)
    drawn = orient(Polygon(exterior, holes), 1.0)
    polygon = Polygon(np.round(drawn.exterior.coords, 12), [np.round(ring.coords, 12) for ring in drawn.interiors])
    rings = [np.asarray(polygon.exterior.coords)[:-1]] + [np.asarray(ring.coords)[:-1] for ring in polygon.interiors]
    starts = np.cumsum([0] + [len(ring) for ring in rings])
    facets = [(int(start + i), int(start + (i + 1) % (end - start))) for start, end in zip(starts[:-1], starts[1:]) for i in range(end - start)]
    inner, largest = polygon.representative_point(), _mesh_rule(spec, polygon.area, polygon.exterior.length)
    task = {"vertices": np.vstack(rings).tolist(), "segments": facets, "regions": [[inner.x, inner.y, 0, largest]]}
    if len(rings) > 1:
        task["holes"] = [list(Polygon(ring).representative_point().coords[0]) for ring in rings[1:]]
    try:
        made = cytriangle.triangulate(task, f"pq{MIN_ANGLE:.1f}Aao2")
        elements = np.array(made["triangles"], dtype=int)
        elements[:, [3, 4, 5]] = elements[:, [5, 3, 4]]  # Triangle puts the mid-side node opposite each corner
        return Mesh(np.array(made["vertices"], dtype=float), elements, largest)
    except Exception as exc:  # the mesher's failures on an outline that passed our checks
        raise InputError(spec.source, "sections", f"section {spec.name!r}: the shape cannot be meshed ({type(exc).__name__}: {exc})",
                         "check the dimensions or the polygon's points", spec.line) from None


def meshed_section(spec: SectionSpec) -> Any:
    """A sectionproperties Section of the spec on its mesh (not yet analysed): the reference the
    tests hold sizer's own finite elements to."""
    from sectionproperties.analysis import Section

    geometry = outline(spec)
    made = mesh(spec)
    elements = made.elements.copy()
    elements[:, [5, 3, 4]] = elements[:, [3, 4, 5]]  # back to Triangle's order, which Section expects
    geometry.mesh = {"vertices": made.nodes, "triangles": elements, "triangle_attributes": np.zeros((len(elements), 1))}
    return Section(geometry)
