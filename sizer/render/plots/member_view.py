"""A member view panel: the member to scale along x (metres) with its supports, hinges and factored
loads, the chain of dimensions between its ends, supports and hinges (display length units), and
the axis triad. Heights in inches of paper from the member axis.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from sizer import units
from sizer.model import Member
from sizer.render.plots.combination_loads import DrawnPoint
from sizer.render.plots.load_symbols import draw_band, draw_point_loads
from sizer.render.plots.style import (
    BEAM_HALF,
    END_PAD,
    GUIDE,
    INK,
    REACTION_INK,
    draw_arrow,
    draw_text,
)
from sizer.render.plots.support_symbols import draw_support
from sizer.render.plots.view_layout import MemberView

if TYPE_CHECKING:
    from sizer.model import Restraint
    from matplotlib.axes import Axes


def draw_member_view(ax: Axes, view: MemberView, member: Member, points: list[DrawnPoint]) -> None:
    """The member to scale with its supports, hinges and factored loads."""
    ax.set_ylim(-view.below, view.above)
    draw_beam(ax, 0.0, member.length)
    for band in view.bands:
        draw_band(ax, view, band)
    for support in member.supports:
        draw_support(ax, view, support, member.length)
    for hinge in member.hinges:
        draw_hinge(ax, hinge.at)
    for restraint in member.restraints:
        draw_restraint(ax, restraint)
    draw_point_loads(ax, view, points, member.length)
    draw_dimension_chain(ax, view, _chain_positions(member), -view.below + 0.45)
    draw_triad(ax, view, -END_PAD * view.m_per_inch, view.above)
    title = "Member in elevation (x-y plane)" if view.plane.name == "elevation" else "Member in plan (x-z plane, seen from +y)"
    if member.gravity[0] == 0:  # it stands on end: drawn upright above; here laid along x like the diagrams
        title = title.replace("Member in", "Member laid along x, in") + ", end A on the left"
    ax.set_title(title + ": supports and factored loads", loc="left", pad=2)


def _chain_positions(member: Member) -> list[float]:
    xs = {0.0, member.length} | {s.at for s in member.supports} | {h.at for h in member.hinges}
    return sorted(xs)


def draw_beam(ax: Axes, start: float, end: float) -> None:
    from matplotlib.patches import Rectangle

    ax.add_patch(Rectangle((start, -BEAM_HALF), end - start, 2 * BEAM_HALF, facecolor="#bdbdbd", edgecolor=INK, lw=1.0, zorder=3))


def draw_restraint(ax: Axes, restraint: Restraint) -> None:
    """A restraint against buckling: a filled square on the member at a point, a hatched strip just
    under the member where it is continuous (what it holds is in the record's inputs)."""
    from matplotlib.patches import Rectangle

    if restraint.continuous:
        ax.add_patch(Rectangle((restraint.start, -BEAM_HALF - 0.07), restraint.end - restraint.start, 0.06, facecolor="none",
                               edgecolor=REACTION_INK, hatch="xxxx", lw=0.6, zorder=2))
        return
    ax.plot([restraint.start], [0.0], marker="s", markersize=5, markerfacecolor=REACTION_INK, markeredgecolor="white", zorder=7, ls="none")


def draw_hinge(ax: Axes, x: float) -> None:
    """An internal hinge: an open circle on the member axis."""
    ax.plot([x], [0.0], marker="o", markersize=7, markerfacecolor="white", markeredgecolor=INK, markeredgewidth=1.2, zorder=6)


def draw_dimension_chain(ax: Axes, view: MemberView, positions: list[float], y: float) -> None:
    """A chain of dimensions between the given positions (m), with the distances written under."""
    ax.plot([positions[0], positions[-1]], [y, y], color=INK, lw=0.6)
    for x in positions:
        ax.plot([x, x], [y - 0.05, y + 0.05], color=INK, lw=0.6)
        ax.plot([x, x], [y + 0.05, -0.05], color=GUIDE, lw=0.4, ls=":", zorder=1)
    for a, b in zip(positions, positions[1:]):
        if (b - a) / view.m_per_inch > 0.3:
            draw_text(ax, (a + b) / 2, y - 0.03, units.fmt(b - a, "length", view.system, 4), color=INK, va="top", fontsize=7)


def draw_triad(ax: Axes, view: MemberView, x: float, y: float) -> None:
    """Axis arrows in the view's upper left corner: x to the right, y up or z down."""
    origin = (x + view.dx(0.12), y - 0.35 if view.plane.page_sign > 0 else y - 0.12)
    draw_arrow(ax, origin, (origin[0] + view.dx(0.3), origin[1]), color=INK, lw=0.8)
    draw_text(ax, origin[0] + view.dx(0.34), origin[1], "x", color=INK, ha="left", va="center")
    step = 0.2 * view.plane.page_sign
    draw_arrow(ax, origin, (origin[0], origin[1] + step), color=INK, lw=0.8)
    draw_text(ax, origin[0], origin[1] + step + (0.02 if step > 0 else -0.02), view.plane.axis_label, color=INK,
              va="bottom" if step > 0 else "top")
