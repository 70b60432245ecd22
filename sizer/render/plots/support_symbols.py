"""Support symbols in a member view, composed from the freedoms a support holds in the view's plane:
a pin or roller triangle for a held translation, a wall (at an end) or a hatched block for a held
rotation, zigzag and coil springs, the ground under them, and a caption with the support's type
and spring stiffnesses in display units. Sizes in inches of paper across the member, metres along it.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np

from sizer import units
from sizer.model import Support
from sizer.render.plots.style import BEAM_HALF, INK, draw_text
from sizer.render.plots.view_layout import MemberView

if TYPE_CHECKING:
    from matplotlib.axes import Axes


def draw_support(ax: Axes, view: MemberView, support: Support, length: float) -> None:
    """The support's symbol in this view, composed from the freedoms it holds in the view's plane."""
    held, springs = set(support.restrain), support.springs
    plane = view.plane
    x = support.at
    end = "A" if x <= 1e-9 * length else "B" if x >= length * (1 - 1e-9) else ""
    rotation, translation = plane.rotation in held, plane.translation in held
    depth = 0.0  # inches of symbol drawn below the axis
    if rotation:
        depth = draw_clamp(ax, view, x, end, guided=not translation and plane.translation not in springs)
    elif translation:
        depth = draw_pin(ax, view, x, roller="ux" not in held and "ux" not in springs)
    if plane.translation in springs:
        depth = max(depth, draw_translation_spring(ax, view, x))
    if plane.rotation in springs:
        draw_rotation_spring(ax, view, x, -1.0 if end != "B" else 1.0)
    if not (rotation or translation or plane.translation in springs or plane.rotation in springs):
        ax.plot([x], [0.0], marker="D", markersize=5.5, markerfacecolor="white", markeredgecolor=INK, zorder=6)
        depth = 0.1
    draw_text(ax, x, -max(depth, 0.3) - 0.08, support_caption(support, view.system), color=INK, va="top", fontsize=7)


def support_caption(support: Support, system: str = "si") -> str:
    """Short caption: its type (or the freedoms held) and any spring stiffnesses."""
    label = support.label.split(" + ")[0] if support.label in ("fixed", "pin", "roller") or " + " in support.label else ""
    text = label if label in ("fixed", "pin", "roller") else "holds " + (" ".join(sorted(support.restrain)) or "—")
    for freedom, k in support.springs.items():
        kind = "translational_stiffness" if freedom.startswith("u") else "rotational_stiffness"
        text += f"\nspring {freedom} {units.fmt(k, kind, system, 3)}"
    return text


def _ground(ax: Axes, view: MemberView, x: float, y: float, half_width: float) -> None:
    """A ground line at height y (inches) with short hatch strokes under it."""
    ax.plot([x - view.dx(half_width), x + view.dx(half_width)], [y, y], color=INK, lw=1.1, zorder=4)
    for k in np.linspace(-half_width, half_width - 0.06, 6):
        ax.plot([x + view.dx(k + 0.06), x + view.dx(k)], [y, y - 0.06], color=INK, lw=0.7, zorder=4)


def draw_pin(ax: Axes, view: MemberView, x: float, roller: bool) -> float:
    """A triangle under the axis; a roller stands on two small wheels. Returns its depth (inches)."""
    from matplotlib.patches import Polygon

    height, half = (0.17, 0.11) if roller else (0.22, 0.13)
    top = -BEAM_HALF
    base = top - height
    ax.add_patch(Polygon([(x, top), (x - view.dx(half), base), (x + view.dx(half), base)], closed=True,
                         facecolor="white", edgecolor=INK, lw=1.1, zorder=4))
    if roller:
        radius = 0.035
        for offset in (-0.055, 0.055):
            ax.plot([x + view.dx(offset)], [base - radius], marker="o", markersize=4.2, markerfacecolor="white",
                    markeredgecolor=INK, markeredgewidth=0.9, zorder=4)
        base -= 2 * radius + 0.005
    _ground(ax, view, x, base, half + 0.05)
    return -base + 0.06


def draw_clamp(ax: Axes, view: MemberView, x: float, end: str, guided: bool) -> float:
    """A wall (at an end) or a hatched block (inside) that holds the rotation. Returns its depth."""
    from matplotlib.patches import Rectangle

    half = 0.3
    if end:
        outward = -1.0 if end == "A" else 1.0
        gap = 0.09 if guided else 0.0
        wall = x + outward * view.dx(gap)
        ax.plot([wall, wall], [-half, half], color=INK, lw=1.6, zorder=4)
        for k in np.linspace(-half, half - 0.07, 7):
            ax.plot([wall, wall + outward * view.dx(0.07)], [k + 0.07, k], color=INK, lw=0.7, zorder=4)
        if guided:
            for y in (-0.12, 0.12):
                ax.plot([x + outward * view.dx(gap / 2)], [y], marker="o", markersize=4, markerfacecolor="white",
                        markeredgecolor=INK, zorder=4)
        return half
    ax.add_patch(Rectangle((x - view.dx(0.1), -0.24), view.dx(0.2), 0.48, facecolor="white", edgecolor=INK,
                           hatch="xxxx", lw=1.0, zorder=2))
    return 0.24


def draw_translation_spring(ax: Axes, view: MemberView, x: float) -> float:
    """A zigzag spring from the member down to the ground. Returns its depth."""
    top, length, half = -BEAM_HALF, 0.36, 0.06
    ys = np.linspace(top, top - length, 10)
    xs = np.array([0.0] + [half if i % 2 else -half for i in range(1, 9)] + [0.0])
    ax.plot(x + view.dx(1) * xs, ys, color=INK, lw=1.0, zorder=4)
    _ground(ax, view, x, top - length, 0.14)
    return length + 0.1


def draw_rotation_spring(ax: Axes, view: MemberView, x: float, side: float) -> None:
    """A coil (spiral) beside the support (side -1: to its left, +1: to its right), joined to the
    member at x: an elastic rotational restraint."""
    centre = x + side * view.dx(0.24)
    turns = np.linspace(0.0, 4.0 * math.pi, 120)
    radius = 0.025 + 0.09 * turns / turns[-1]
    ax.plot(centre + view.dx(1) * radius * np.cos(turns), radius * np.sin(turns), color=INK, lw=0.9, zorder=6)
    ax.plot([centre, x], [0.0, 0.0], color=INK, lw=0.9, zorder=6)
    anchor = centre + side * view.dx(0.115)
    ax.plot([anchor, anchor], [0.0, -0.22], color=INK, lw=0.9, zorder=6)
    _ground(ax, view, anchor, -0.22, 0.08)
