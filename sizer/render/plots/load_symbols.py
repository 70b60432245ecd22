"""Loads in a member view: a line load as a filled band above the axis scaled to its intensity, with
arrows and its value; point forces as arrows (length scaled to the largest); a moment about the
axis pointing at the viewer as a curved arrow, counter-clockwise when positive; a moment about the
member axis as a double-headed arrow along it (right-hand rule). Sizes in inches of paper across
the member, metres along it; values in display units.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np

from sizer import units
from sizer.render.plots.combination_loads import DrawnPoint
from sizer.render.plots.style import (
    ARC_RADIUS,
    ARROW_MAX,
    ARROW_MIN,
    BEAM_HALF,
    GUIDE,
    LOAD_FILL,
    LOAD_INK,
    SELF_WEIGHT_FILL,
    draw_arrow,
    draw_text,
)
from sizer.render.plots.view_layout import (
    Band,
    MemberView,
    stack_top,
    transverse_force,
)

if TYPE_CHECKING:
    from matplotlib.axes import Axes


def draw_band(ax: Axes, view: MemberView, band: Band) -> None:
    """A line load: filled, hatched outline above the axis, scaled to its intensity, with arrows."""
    from matplotlib.patches import Polygon

    load = band.load
    xs = _band_corners(band)
    heights = np.abs(band.intensity(xs)) * band.scale
    outline = [(load.start, band.base)] + list(zip(xs, band.base + heights)) + [(load.end, band.base)]
    fill = SELF_WEIGHT_FILL if load.self_weight else LOAD_FILL
    ax.add_patch(Polygon(outline, closed=True, facecolor=fill, edgecolor=GUIDE, hatch="---" if load.self_weight else None,
                         lw=0.0, zorder=2))
    ax.plot(*zip(*outline), color=LOAD_INK, lw=0.9, zorder=3, ls="--" if load.self_weight else "-")
    _band_arrows(ax, view, band)
    _band_label(ax, view, band)


def _band_corners(band: Band) -> np.ndarray:
    """x where the outline |q(x)| bends: the ends, and the zero crossing of a load that changes sign."""
    load = band.load
    q0, q1 = load.q_start[band.component], load.q_end[band.component]
    if q0 * q1 < 0:
        return np.array([load.start, load.start + (load.end - load.start) * q0 / (q0 - q1), load.end])
    return np.array([load.start, load.end])


def _band_arrows(ax: Axes, view: MemberView, band: Band) -> None:
    load = band.load
    count = max(2, int((load.end - load.start) / view.dx(0.28)) + 1)
    for x in np.linspace(load.start, load.end, count):
        q = float(band.intensity(np.array([x]))[0])
        h = abs(q) * band.scale
        if h < 0.03:
            continue
        if band.component == 0 or band.component == 3:
            _axial_marks(ax, view, x, band.base + h / 2, math.copysign(1.0, q), band.component == 3)
        else:
            up = q * view.plane.page_sign > 0
            low, high = band.base, band.base + h
            draw_arrow(ax, (x, low if up else high), (x, high if up else low), lw=0.7)


def _axial_marks(ax: Axes, view: MemberView, x: float, y: float, sign: float, double: bool) -> None:
    """Small arrows along x inside a band (double-headed for a torque per length)."""
    half = view.dx(0.08)
    draw_arrow(ax, (x - sign * half, y), (x + sign * half, y), lw=0.7)
    if double:
        draw_arrow(ax, (x - sign * half, y), (x + sign * (half - view.dx(0.05)), y), lw=0.7)


def _band_label(ax: Axes, view: MemberView, band: Band) -> None:
    load = band.load
    q0, q1 = load.q_start[band.component], load.q_end[band.component]
    kind = "moment_per_length" if band.component == 3 else "force_per_length"
    name = ("wx", "wy", "wz", "mx")[band.component]
    same_sign = q0 * q1 >= 0
    first, last = (abs(q0), abs(q1)) if same_sign else (q0, q1)
    value = units.fmt(first, kind, view.system, 3)
    if q0 != q1:
        value += f" → {units.fmt(last, kind, view.system, 3)}"
    text = ("self-weight " if load.self_weight else f"{name} ") + value
    x_mid = (load.start + load.end) / 2
    draw_text(ax, x_mid, band.base + band.peak * band.scale + 0.02, text, fontsize=7)


def draw_point_loads(ax: Axes, view: MemberView, points: list[DrawnPoint], member_length: float) -> None:
    """Point forces as arrows (length scaled to the largest), moments as curved or double arrows."""
    plane = view.plane
    transverse = [abs(transverse_force(p, plane)) for p in points]
    largest = max(transverse + [0.0])
    for point in points:
        force = transverse_force(point, plane)
        if force:
            length = ARROW_MIN + (ARROW_MAX - ARROW_MIN) * abs(force) / largest
            draw_transverse_force(ax, view, point.at, force, stack_top(view.bands, point.at), length, LOAD_INK)
        if plane.name == "elevation" and point.force[0]:
            draw_axial_force(ax, view, point.at, point.force[0], member_length, LOAD_INK)
        turning = point.moment[2] if plane.name == "elevation" else point.moment[1]
        if turning:
            draw_turning_moment(ax, view, point.at, turning, units.fmt(abs(turning), "moment", view.system, 3), LOAD_INK)
        if plane.name == "elevation" and point.moment[0]:
            draw_moment_vector(ax, view, point.at, point.moment[0], -0.3, "mx " + units.fmt(abs(point.moment[0]), "moment", view.system, 3),
                               LOAD_INK, label_side="below")


def draw_transverse_force(ax: Axes, view: MemberView, x: float, force: float, clear: float, length: float, color: str) -> None:
    """A point force across the member, drawn above the axis: pushing onto it, or pulling away."""
    page_up = force * view.plane.page_sign > 0
    near, far = BEAM_HALF + 0.02, clear + length
    tail, tip = ((x, near), (x, far)) if page_up else ((x, far), (x, near))
    draw_arrow(ax, tail, tip, color=color, lw=1.5)
    draw_text(ax, x, far + 0.03, units.fmt(abs(force), "force", view.system, 3), color=color)


def draw_axial_force(ax: Axes, view: MemberView, x: float, force: float, member_length: float, color: str,
                     length: float = 0.42, y: float | None = None, label: str | None = None) -> None:
    """A point force along the member, on the outer side of the nearer end; at the axis at an end,
    just under it inside the member (or at height y, inches, when given)."""
    sign = math.copysign(1.0, force)
    at_end = x <= 1e-9 * member_length or x >= member_length * (1 - 1e-9)
    y = (0.0 if at_end else -0.2) if y is None else y
    outside = -1.0 if x <= member_length / 2 else 1.0
    far = x + outside * view.dx(length)
    tail, tip = ((x, y), (far, y)) if sign * outside > 0 else ((far, y), (x, y))
    draw_arrow(ax, tail, tip, color=color, lw=1.5)
    draw_text(ax, far + outside * view.dx(0.04), y, label or units.fmt(abs(force), "force", view.system, 3), color=color,
              ha="left" if outside > 0 else "right", va="center")


def draw_turning_moment(ax: Axes, view: MemberView, x: float, moment: float, label: str, color: str,
                        radius: float = ARC_RADIUS, half: bool = False) -> None:
    """A moment about the axis pointing at the viewer: a curved arrow, counter-clockwise when positive.
    half: only the right half-circle (for a cut face), labelled at its upper right."""
    from matplotlib.patches import FancyArrowPatch
    from matplotlib.path import Path as MplPath

    if half:
        start, stop = math.radians(-95), math.radians(95)
    else:
        start, stop = math.radians(-60), math.radians(200)
    if moment < 0:
        start, stop = (math.radians(95), math.radians(-95)) if half else (math.radians(240), math.radians(-20))
    angles = np.linspace(start, stop, 40)
    vertices = np.column_stack([x + view.dx(1) * radius * np.cos(angles), radius * np.sin(angles)])
    ax.add_patch(FancyArrowPatch(path=MplPath(vertices), arrowstyle="-|>", mutation_scale=9, color=color, lw=1.3, zorder=6))
    if half:
        draw_text(ax, x + view.dx(radius * 0.75), radius * 0.8, label, color=color, ha="left")
    else:
        draw_text(ax, x + view.dx(radius * 0.8), -radius * 0.8, label, color=color, ha="left", va="top")


def draw_moment_vector(ax: Axes, view: MemberView, x: float, moment: float, y: float, label: str, color: str,
                       length: float = 0.4, label_side: str = "above") -> None:
    """A moment whose axis is the member axis: a double-headed arrow along +x or -x (right-hand rule),
    centred at x; the label "above", "below" or to the "right"."""
    sign = math.copysign(1.0, moment)
    tail, tip = x - sign * view.dx(length / 2), x + sign * view.dx(length / 2)
    draw_arrow(ax, (tail, y), (tip, y), color=color, lw=1.3)
    draw_arrow(ax, (tail, y), (tip - sign * view.dx(0.07), y), color=color, lw=1.3)
    if label_side == "below":
        draw_text(ax, x, y - 0.05, label, color=color, va="top")
    elif label_side == "right":
        draw_text(ax, x + view.dx(length / 2 + 0.05), y, label, color=color, ha="left", va="center")
    else:
        draw_text(ax, x, y + 0.04, label, color=color)
