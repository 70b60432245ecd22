"""The free body of the left segment [0, x] cut from the member, for the calculation record: its
factored loads (blue), the support reactions on it (green) and the internal actions on the cut face
(red) drawn in their positive sense, each with its value in display units. Along x in metres at the
member views' scale (a very short segment is widened, and said to be); across in inches of paper.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from sizer import units
from sizer.design import Design
from sizer.model import Support
from sizer.results.forces import is_planar
from sizer.render.plots.combination_loads import DrawnLine, DrawnPoint, factored_loads
from sizer.render.plots.load_symbols import (
    draw_axial_force,
    draw_band,
    draw_moment_vector,
    draw_point_loads,
    draw_turning_moment,
)
from sizer.render.plots.member_view import draw_beam, draw_hinge, draw_triad
from sizer.render.plots.style import (
    ARROW_MAX,
    BAND_GAP,
    BEAM_HALF,
    CUT_INK,
    DPI,
    END_PAD,
    GAP,
    LABEL_HEIGHT,
    LEFT,
    REACTION_INK,
    RIGHT,
    axes_width,
    draw_arrow,
    draw_text,
    style,
)
from sizer.render.plots.view_layout import (
    PLANES,
    MemberView,
    bands_for,
    stack_bands,
    stack_top,
    transverse_force,
)

if TYPE_CHECKING:
    from matplotlib.figure import Figure
    from matplotlib.axes import Axes

FREE_BODY_LEFT_PAD = 1.3  # inches left of end A for the reactions there and their labels
FREE_BODY_RIGHT = 1.8  # inches right of the cut for the internal actions and their labels
FREE_BODY_BELOW = 1.15
FREE_BODY_MIN_LENGTH = 1.2  # inches: a shorter segment is widened to this (and said to be not to scale)


def clip_line(load: DrawnLine, x: float) -> DrawnLine | None:
    """The part of a line load on [0, x] (None when it starts at or beyond x)."""
    if load.start >= x:
        return None
    end = min(load.end, x)
    t = (end - load.start) / (load.end - load.start)
    wx, wy, wz, mx = (a + (b - a) * t for a, b in zip(load.q_start, load.q_end))
    return DrawnLine(load.start, end, load.q_start, (wx, wy, wz, mx), load.self_weight)


def free_body_items(design: Design, combination: str, x: float, side: str) -> tuple[list[DrawnPoint], list[DrawnLine], list[tuple[Support, np.ndarray]]]:
    """Factored point loads, line loads (clipped) and reactions on the left segment [0, x]: items at x
    are on it for side "right" and not for side "left"."""
    tol = 1e-9 * design.member.length

    def on_segment(at: float) -> bool:
        return at <= x + tol if side == "right" else at < x - tol

    points, lines = factored_loads(design, combination)
    reactions = design.solution.reactions(combination)
    kept_lines = [part for part in (clip_line(line, x) for line in lines) if part is not None]
    supports = [(s, reactions[i]) for i, s in enumerate(design.member.supports) if on_segment(s.at)]
    return [p for p in points if on_segment(p.at)], kept_lines, supports


def build_free_body_figure(design: Design, combination: str, x: float, side: str, system: str = "si") -> Figure:
    """The left segment [0, x] cut from the member: its factored loads, the support reactions on it
    and the internal actions on the cut face drawn in their positive sense with their values."""
    import matplotlib
    from matplotlib.figure import Figure

    member = design.member
    planar = is_planar(member)
    points, lines, supports = free_body_items(design, combination, x, side)
    actions = design.solution.actions(combination, [x], side)[0]
    m_per_inch = member.length / (axes_width() - 2 * END_PAD)  # the scale of the member views
    drawn_x = max(x, FREE_BODY_MIN_LENGTH * m_per_inch)
    axes_inches = FREE_BODY_LEFT_PAD + drawn_x / m_per_inch + FREE_BODY_RIGHT
    width = LEFT + axes_inches + RIGHT
    planes = ["elevation"] + ([] if planar else ["plan"])
    views = [_free_body_view(plane, m_per_inch, lines, points, system) for plane in planes]
    header = 0.82 + (0.14 if drawn_x != x else 0.0)
    height = header + sum(v.height for v in views) + GAP * (len(views) - 1) + 0.15
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(width, height), dpi=DPI)
        top = height - header
        for view in views:
            ax = figure.add_axes((LEFT / width, (top - view.height) / height, axes_inches / width, view.height / height))
            ax.set_axis_off()
            ax.set_xlim(-FREE_BODY_LEFT_PAD * m_per_inch, drawn_x + FREE_BODY_RIGHT * m_per_inch)
            ax.set_ylim(-view.below, view.above)
            ax.set_label("free body " + view.plane.name)
            _draw_free_body_view(ax, view, design, points, supports, actions, drawn_x, planar, system)
            top -= view.height + GAP
        sign = "⁻" if side == "left" else "⁺"
        lines_of_text = ["Factored loads (blue); support reactions (green, thick arrows under the member);",
                         "internal actions on the cut face in their positive sense (red), with the values found."]
        if drawn_x != x:
            lines_of_text.append("The segment is shorter than drawn (widened to show it; not to scale).")
        figure.text(LEFT / width, 1 - 0.12 / height, f"Free body of [0, {units.fmt(x, 'length', system)}{sign}], "
                    f"combination '{combination}'", fontsize=9, fontweight="bold", va="top")
        figure.text(LEFT / width, 1 - 0.34 / height, "\n".join(lines_of_text), fontsize=7, va="top", color="#444444",
                    linespacing=1.4)
    return figure


def _free_body_view(plane: str, m_per_inch: float, lines: list[DrawnLine], points: list[DrawnPoint], system: str) -> MemberView:
    spec = PLANES[plane]
    bands = stack_bands(bands_for(lines, spec), BEAM_HALF + BAND_GAP)
    above = max([band.top for band in bands] + [BEAM_HALF + 0.75])
    for point in points:
        if transverse_force(point, spec):
            above = max(above, stack_top(bands, point.at) + ARROW_MAX + LABEL_HEIGHT)
    return MemberView(spec, m_per_inch, bands, above + 0.1, FREE_BODY_BELOW, system)


def _draw_free_body_view(ax: Axes, view: MemberView, design: Design, points: list[DrawnPoint],
                         supports: list[tuple[Support, np.ndarray]], actions: np.ndarray, drawn_x: float, planar: bool,
                         system: str) -> None:
    draw_beam(ax, 0.0, drawn_x)
    ax.plot([drawn_x, drawn_x], [-0.16, 0.16], color=CUT_INK, lw=2.0, zorder=6)
    for band in view.bands:
        draw_band(ax, view, band)
    draw_point_loads(ax, view, points, design.member.length)
    for hinge in design.member.hinges:
        if hinge.at < drawn_x:
            draw_hinge(ax, hinge.at)
    for support, reaction in supports:
        draw_reaction(ax, view, support.at, reaction, design.member.length, system)
    draw_cut_actions(ax, view, drawn_x, actions, planar, system)
    title = "elevation (x-y plane)" if view.plane.name == "elevation" else "plan (x-z plane, seen from +y)"
    ax.set_title(title, loc="left", pad=2, fontsize=8)
    draw_triad(ax, view, -FREE_BODY_LEFT_PAD * view.m_per_inch, view.above)


def _signed(value: float, kind: str, system: str, tiny: float = 1e-9) -> str:
    """Value with its sign and unit; below `tiny` (round-off) it is shown as 0."""
    return units.fmt(0.0 if abs(value) < tiny else value, kind, system)


def draw_reaction(ax: Axes, view: MemberView, at: float, reaction: np.ndarray, member_length: float, system: str) -> None:
    """A support's reaction components in this view (green, open arrow heads), each labelled."""
    plane = view.plane
    tiny = 1e-9 * (1.0 + float(np.abs(reaction).max()))
    transverse = reaction[plane.transverse]
    if abs(transverse) > tiny:
        page_up = transverse * plane.page_sign > 0
        near, far = -BEAM_HALF - 0.02, -0.62
        tail, tip = ((at, far), (at, near)) if page_up else ((at, near), (at, far))
        draw_arrow(ax, tail, tip, color=REACTION_INK, lw=2.2)
        name = "Fy" if plane.transverse == 1 else "Fz"
        draw_text(ax, at, far - 0.04, f"{name} = {_signed(transverse, 'force', system, tiny)}", color=REACTION_INK, va="top")
    if plane.name == "elevation" and abs(reaction[0]) > tiny:
        draw_axial_force(ax, view, at, reaction[0], member_length, REACTION_INK, y=-0.2,
                         label=f"Fx = {_signed(reaction[0], 'force', system, tiny)}")
    turning = reaction[5] if plane.name == "elevation" else reaction[4]
    if abs(turning) > tiny:
        name = "Mz" if plane.name == "elevation" else "My"
        draw_turning_moment(ax, view, at, turning, f"{name} = {_signed(turning, 'moment', system, tiny)}", REACTION_INK, radius=0.3)
    if plane.name == "elevation" and abs(reaction[3]) > tiny:
        draw_moment_vector(ax, view, at, reaction[3], -0.98, f"Mx = {_signed(reaction[3], 'moment', system, tiny)}",
                           REACTION_INK, length=0.36, label_side="right")


def draw_cut_actions(ax: Axes, view: MemberView, x: float, actions: np.ndarray, planar: bool, system: str) -> None:
    """N, Vy (Vz), Mz (My) and, out of plane, T on the cut face (+x normal), each drawn positive with its value."""
    plane = view.plane
    tiny = 1e-9 * (1.0 + float(np.abs(actions).max()))
    reach = view.dx(0.55)
    if plane.name == "elevation":
        draw_arrow(ax, (x, 0.0), (x + reach, 0.0), color=CUT_INK, lw=1.6)
        draw_text(ax, x + reach + view.dx(0.05), 0.0, f"N = {_signed(actions[0], 'force', system, tiny)}", color=CUT_INK,
                  ha="left", va="center")
        if not planar:
            draw_moment_vector(ax, view, x + view.dx(0.3), 1.0, -0.78, f"T = {_signed(actions[3], 'moment', system, tiny)}",
                               CUT_INK, length=0.45, label_side="right")
    shear, name = (actions[1], "Vy") if plane.name == "elevation" else (actions[2], "Vz")
    bottom, top = -0.4 * plane.page_sign, 0.4 * plane.page_sign
    draw_arrow(ax, (x + view.dx(0.06), bottom), (x + view.dx(0.06), top), color=CUT_INK, lw=1.6)
    draw_text(ax, x + view.dx(0.12), -0.46, f"{name} = {_signed(shear, 'force', system, tiny)}", color=CUT_INK, ha="left", va="top")
    moment, name = (actions[5], "Mz") if plane.name == "elevation" else (actions[4], "My")
    draw_turning_moment(ax, view, x, 1.0, f"{name} = {_signed(moment, 'moment', system, tiny)}", CUT_INK, radius=0.3, half=True)
