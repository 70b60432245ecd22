"""The upright sketch of a member that stands on end (gravity along its axis, `gravity = "-x"` or
"+x"): the member drawn vertical, to scale, with its supports, restraints and factored loads, its
ends named and its height dimensioned, beside the views and diagrams that run along x. The page's
right is the member's +y, so +z points into the page when x points up (gravity along -x) and out
of it when x points down; a force along z is written beside its point with that direction.
Panel coordinates are inches of paper.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from sizer import units
from sizer.model import Member
from sizer.render.plots.combination_loads import DrawnLine, DrawnPoint
from sizer.render.plots.style import BEAM_HALF, GUIDE, INK, LOAD_INK, draw_arrow, draw_text
from sizer.render.plots.support_symbols import support_caption

if TYPE_CHECKING:
    from sizer.model import Restraint
    from sizer.model import Support
    from matplotlib.axes import Axes

UPRIGHT_HEIGHT = 3.0  # inches of the panel
MARGIN = 0.6  # inches kept above and below the member (room for the loads at its ends)
POST_X = 1.6  # inches from the panel's left edge to the member's axis
ARROW = 0.45  # inches of a point-load arrow


def stands_upright(member: Member) -> bool:
    """True when gravity acts along the member's axis: a post or a hanger, drawn vertical."""
    return member.gravity[0] == 0


def height_of(member: Member, x: float) -> float:
    """Height (inches) in the panel of the point x (m) of the member: end A at the bottom when
    gravity acts along -x (the member rises from A), at the top when along +x."""
    scale = (UPRIGHT_HEIGHT - 2 * MARGIN) / member.length
    return MARGIN + x * scale if member.gravity[1] < 0 else UPRIGHT_HEIGHT - MARGIN - x * scale


def draw_upright(ax: Axes, member: Member, points: list[DrawnPoint], lines: list[DrawnLine], system: str) -> None:
    """The member vertical, with its supports, restraints and factored loads (see the module docstring)."""
    from matplotlib.figure import Figure
    from matplotlib.patches import Rectangle

    figure = ax.figure
    assert isinstance(figure, Figure)  # drawn on a whole figure, not a subfigure
    width = ax.get_position().width * figure.get_figwidth()
    ax.set_xlim(0.0, width)
    ax.set_ylim(0.0, UPRIGHT_HEIGHT)
    ax.set_axis_off()
    bottom, top = sorted((height_of(member, 0.0), height_of(member, member.length)))
    ax.add_patch(Rectangle((POST_X - BEAM_HALF, bottom), 2 * BEAM_HALF, top - bottom, facecolor="#bdbdbd", edgecolor=INK, lw=1.0, zorder=3))
    _dimension(ax, member, system)
    for support in member.supports:
        _support(ax, member, support, system)
    for restraint in member.restraints:
        _restraint(ax, member, restraint)
    for point in points:
        _point_load(ax, member, point, system)
    for at in sorted({point.at for point in points}):
        _point_notes(ax, member, [point for point in points if point.at == at], system)
    for line in lines:
        _line_load(ax, member, line, system)
    _triad(ax, member)
    ax.set_title("The member as it stands (vertical, to scale): supports, restraints and factored loads", loc="left", pad=2)


def _dimension(ax: Axes, member: Member, system: str) -> None:
    x = POST_X + 1.9
    low, high = sorted((height_of(member, 0.0), height_of(member, member.length)))
    ax.plot([x, x], [low, high], color=INK, lw=0.6)
    for y in (low, high):
        ax.plot([x - 0.05, x + 0.05], [y, y], color=INK, lw=0.6)
        ax.plot([POST_X + BEAM_HALF, x], [y, y], color=GUIDE, lw=0.4, ls=":", zorder=1)
    draw_text(ax, x + 0.08, (low + high) / 2, units.fmt(member.length, "length", system), color=INK, ha="left", va="center", fontsize=7)
    for end, at in (("A", 0.0), ("B", member.length)):
        draw_text(ax, x + 0.08, height_of(member, at), f"end {end}, x = {units.fmt(at, 'length', system)}", color=INK, ha="left", va="center",
                  fontsize=7)


def _support(ax: Axes, member: Member, support: Support, system: str) -> None:
    """A base (a hatched ground line across the member) where it holds the member along x, side
    holds (short hatched walls on both sides) where it holds it only sideways; its caption beside."""
    y = height_of(member, support.at)
    outward = -1.0 if y <= UPRIGHT_HEIGHT / 2 else 1.0  # away from the member
    if "ux" in support.restrain:
        ax.plot([POST_X - 0.35, POST_X + 0.35], [y, y], color=INK, lw=1.4, zorder=4)
        for k in np.linspace(-0.32, 0.28, 7):
            ax.plot([POST_X + k, POST_X + k + 0.06], [y + 0.08 * outward, y], color=INK, lw=0.6)
    else:
        for side in (-1.0, 1.0):
            wall = POST_X + side * (BEAM_HALF + 0.08)
            ax.plot([wall, wall], [y - 0.12, y + 0.12], color=INK, lw=1.2, zorder=4)
            for k in np.linspace(-0.1, 0.1, 4):
                ax.plot([wall, wall + side * 0.06], [y + k, y + k - 0.05], color=INK, lw=0.6)
    draw_text(ax, POST_X + 0.4, y + 0.12 * outward, support_caption(support, system).replace("\n", ", "), color=INK, ha="left",
              va="bottom" if outward > 0 else "top", fontsize=7)


def _restraint(ax: Axes, member: Member, restraint: Restraint) -> None:
    """A restraint: a filled square on the member at a point, a hatched strip along it when continuous."""
    from matplotlib.patches import Rectangle

    low, high = sorted((height_of(member, restraint.start), height_of(member, restraint.end)))
    holds = " and ".join(word for word, on in (("lateral", restraint.lateral), ("twist", restraint.twist)) if on)
    if restraint.continuous:
        ax.add_patch(Rectangle((POST_X - BEAM_HALF - 0.1, low), 0.08, high - low, facecolor="none", edgecolor=LOAD_INK, hatch="////",
                               lw=0.6, zorder=2))
        draw_text(ax, POST_X - BEAM_HALF - 0.14, (low + high) / 2, f"restraint: {holds}", ha="right", va="center", fontsize=6.5)
        return
    ax.plot([POST_X], [low], marker="s", markersize=5.5, color=LOAD_INK, zorder=6, ls="none")
    draw_text(ax, POST_X - 0.12, low - 0.04, f"restraint: {holds}", ha="right", va="top", fontsize=6.5)


def _point_load(ax: Axes, member: Member, point: DrawnPoint, system: str) -> None:
    """A factored point load: along the member as a vertical arrow to the point, along y as a
    horizontal one (_point_notes writes the rest)."""
    y = height_of(member, point.at)
    fx, fy, fz = point.force
    up = 1.0 if member.gravity[1] < 0 else -1.0  # page-up per +x
    if fx:
        direction = np.sign(fx) * up
        draw_arrow(ax, (POST_X + 0.2, y - direction * ARROW), (POST_X + 0.2, y))
        draw_text(ax, POST_X + 0.26, y - direction * ARROW / 2, f"{units.fmt(fx, 'force', system, 3)} along x", ha="left", va="center",
                  fontsize=7)
    if fy:
        draw_arrow(ax, (POST_X - np.sign(fy) * (ARROW + BEAM_HALF), y), (POST_X - np.sign(fy) * BEAM_HALF, y))
        draw_text(ax, POST_X - np.sign(fy) * (ARROW + BEAM_HALF + 0.05), y, f"fy {units.fmt(fy, 'force', system, 3)}",
                  ha="right" if fy > 0 else "left", va="center", fontsize=7)


def _point_notes(ax: Axes, member: Member, points: list[DrawnPoint], system: str) -> None:
    """The forces along z and the moments of the point loads at one position, written once, one per
    line, to the left of the member."""
    lines = []
    z_into_page = member.gravity[1] < 0  # x up the page and y to the right: +z points into the page
    for point in points:
        fz = point.force[2]
        if fz:
            lines.append(f"fz {units.fmt(fz, 'force', system, 3)} ({'into' if (fz > 0) == z_into_page else 'out of'} the page)")
        lines += [f"m{axis} {units.fmt(m, 'moment', system, 3)}" for axis, m in zip("xyz", point.moment) if m]
    if lines:
        draw_text(ax, POST_X - 0.3, height_of(member, points[0].at), "\n".join(lines), ha="right", va="center", fontsize=7, linespacing=1.3)


def _line_load(ax: Axes, member: Member, line: DrawnLine, system: str) -> None:
    """A factored line load: small arrows along its length (horizontal for wy, along the member for
    wx), its value written once; wz and torque per length written only."""
    low, high = sorted((height_of(member, line.start), height_of(member, line.end)))
    ys = np.linspace(low + 0.05, high - 0.05, max(2, int((high - low) / 0.25)))
    wx, wy, wz, mx = line.q_start
    name = "self-weight" if line.self_weight else "line load"
    up = 1.0 if member.gravity[1] < 0 else -1.0
    if wx:
        for y in ys:
            draw_arrow(ax, (POST_X - 0.16, y - np.sign(wx) * up * 0.09), (POST_X - 0.16, y + np.sign(wx) * up * 0.0), lw=0.7)
    if wy:
        for y in ys:
            draw_arrow(ax, (POST_X - np.sign(wy) * (BEAM_HALF + 0.25), y), (POST_X - np.sign(wy) * BEAM_HALF, y), lw=0.7)
    parts = [f"{name} {key} {units.fmt(value, 'force_per_length', system, 3)}" for key, value in (("wx", wx), ("wy", wy), ("wz", wz)) if value]
    if mx:
        parts.append(f"mx {units.fmt(mx, 'moment_per_length', system, 3)}")
    if parts:
        where = POST_X + (0.3 if not wy or wy > 0 else -0.3)
        draw_text(ax, where, (low + high) / 2 + (0.12 if line.self_weight else -0.12), ", ".join(parts), ha="left" if where > POST_X else "right",
                  va="center", fontsize=6.5)


def _triad(ax: Axes, member: Member) -> None:
    """The axes: x along the member (up the page when gravity is along -x), y to the right."""
    origin = (0.25, 0.35)
    up = 1.0 if member.gravity[1] < 0 else -1.0
    draw_arrow(ax, origin, (origin[0], origin[1] + 0.3 * up), color=INK, lw=0.8)
    draw_text(ax, origin[0] - 0.05, origin[1] + 0.3 * up, "x", color=INK, ha="right", va="center")
    draw_arrow(ax, origin, (origin[0] + 0.3, origin[1]), color=INK, lw=0.8)
    draw_text(ax, origin[0] + 0.34, origin[1], "y", color=INK, ha="left", va="center")
