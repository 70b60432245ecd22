"""The section as installed, seen on the +x cut face: its outline in page coordinates (m, page x =
-z, page y = y, origin at the centroid, turned a quarter for minor orientation), and a picture with
the centroid, the shear centre, the member axes and the stress-analysis mesh nodes (its size written
in display units).

matplotlib and the section geometry are imported inside the functions (lazily).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

import numpy as np

from sizer import units
from sizer.design import Design
from sizer.render.plots.style import style

if TYPE_CHECKING:
    from matplotlib.figure import Figure
    from matplotlib.axes import Axes


def section_outline(design: Design) -> list[tuple[np.ndarray, list[np.ndarray]]]:
    """The section's outline as drawn on the cut face: (exterior, holes) rings of page points (m),
    page x = -z (member), page y = y (member), origin at the centroid; turned for minor orientation."""
    from sizer.sections.geometry import MM, outline

    geometry = outline(design.spec).geom
    polygons = list(getattr(geometry, "geoms", [geometry]))
    cy, cz = design.props.centroid
    minx, miny, maxx, maxy = geometry.bounds
    centre = np.array([(minx + maxx) / 2 / MM - cz, (miny + maxy) / 2 / MM + cy])  # page (X, Y) of the centroid

    def page(ring: Any) -> np.ndarray:
        points = np.asarray(ring.coords) / MM - centre
        return _turned(points, design.member.orientation)

    return [(page(p.exterior), [page(h) for h in p.interiors]) for p in polygons]


def _turned(points: np.ndarray, orientation: str) -> np.ndarray:
    """A quarter turn counter-clockwise for minor orientation (section depth along member z)."""
    if orientation != "minor":
        return points
    return np.column_stack([-points[:, 1], points[:, 0]])


def section_picture(design: Design, system: str = "si") -> Figure:
    """A drawing of the section outline with its centroid, shear centre, member axes and mesh nodes."""
    import matplotlib
    from matplotlib.figure import Figure
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path as MplPath

    from sizer.sections import unit_stress_field

    rings = section_outline(design)
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(3.0, 3.0))
        ax = figure.add_axes((0.1, 0.1, 0.8, 0.8))
        for exterior, holes in rings:
            vertices = np.concatenate([exterior] + holes) * 1e3
            codes = np.concatenate([_ring_codes(len(r)) for r in [exterior] + holes])
            ax.add_patch(PathPatch(MplPath(vertices, codes), facecolor="#e3e3e3", edgecolor="#111111", hatch="////", lw=1.2))
        nodes = np.asarray(unit_stress_field(design.spec).points)  # (y, z) from the centroid
        page_nodes = _turned(np.column_stack([-nodes[:, 1], nodes[:, 0]]), design.member.orientation) * 1e3
        ax.plot(page_nodes[:, 0], page_nodes[:, 1], ls="none", marker=".", markersize=0.8, color="#555555")
        ys, zs = design.props.shear_centre
        centre = _turned(np.array([[-zs, ys]]), design.member.orientation)[0] * 1e3
        ax.plot([0], [0], marker="$\\oplus$", markersize=11, color="#111111", ls="none")
        ax.plot([centre[0]], [centre[1]], marker="x", markersize=8, mew=1.6, color="#8a1c1c", ls="none")
        _section_axes(ax, rings, system)
        ax.set_aspect("equal")
        ax.set_axis_off()
    return figure


def _ring_codes(count: int) -> np.ndarray:
    from matplotlib.path import Path as MplPath

    codes = np.full(count, MplPath.LINETO)
    codes[0] = MplPath.MOVETO
    codes[-1] = MplPath.CLOSEPOLY
    return codes


def _section_axes(ax: Axes, rings: list[tuple[np.ndarray, list[np.ndarray]]], system: str = "si") -> None:
    """Member y (up) and z (left) through the centroid, with the size in display units."""
    every = np.concatenate([exterior for exterior, _ in rings]) * 1e3
    (minx, miny), (maxx, maxy) = every.min(axis=0), every.max(axis=0)
    reach = 0.62 * max(maxx - minx, maxy - miny)
    ax.annotate("", xy=(0, reach), xytext=(0, 0), arrowprops={"arrowstyle": "-|>", "lw": 0.8, "color": "#1d3557"})
    ax.annotate("", xy=(-reach, 0), xytext=(0, 0), arrowprops={"arrowstyle": "-|>", "lw": 0.8, "color": "#1d3557"})
    ax.text(0, reach * 1.04, "y", ha="center", va="bottom", color="#1d3557", fontsize=9)
    ax.text(-reach * 1.04, 0, "z", ha="right", va="center", color="#1d3557", fontsize=9)
    wide, deep = (units.fmt((high - low) / 1e3, "dimension", system) for low, high in ((minx, maxx), (miny, maxy)))
    ax.text((minx + maxx) / 2, miny - 0.08 * reach, f"{wide} wide × {deep} deep", ha="center", va="top", fontsize=7.5)
    margin = 0.12 * reach
    ax.set_xlim(min(minx, -reach) - 3 * margin, max(maxx, 0) + margin)
    ax.set_ylim(miny - 3 * margin, max(maxy, reach) + 2 * margin)
