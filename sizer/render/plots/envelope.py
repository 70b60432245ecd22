"""The envelope figure: for each action (N, V, M, and Vz, My, T when loaded out of plane) the
largest and smallest value at every station over a set of combinations (every pattern arrangement
included), the band between them shaded, the largest as a solid line and the smallest dashed; the
extremes marked with their value, position and combination; then the deflected shapes' bounds (uy,
and uz out of plane) when a section is given. Display units along x in metres, as the diagrams.
"""

from __future__ import annotations

import textwrap
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from sizer import units
from sizer.analysis import EXTREME_ACTIONS, action_envelope, displacement_bounds, envelope_curves
from sizer.checks import check_stations
from sizer.design import Design
from sizer.files import write_atomic
from sizer.results.forces import is_planar
from sizer.render.plots.diagrams import TITLES
from sizer.render.plots.style import (
    BOTTOM,
    DIAGRAM_HEIGHT,
    FIG_WIDTH,
    FILL_POSITIVE,
    GAP,
    GUIDE,
    INK,
    LEFT,
    SUBTITLE_CHARS,
    SUBTITLE_LINE,
    TITLE_HEIGHT,
    check_plot_path,
    figure_bytes,
    style,
)

if TYPE_CHECKING:
    from matplotlib.figure import Figure
    from matplotlib.axes import Axes

LABEL_CHARS = 70  # a mark's label is wrapped to this many characters


def plot_envelope(design: Design, path: str | Path, combinations: list[str], system: str = "si") -> None:
    """Draw the envelope over `combinations` to `path` (.png or .svg), atomically."""
    image_format = check_plot_path(path)
    write_atomic(path, figure_bytes(build_envelope_figure(design, combinations, system), image_format))


def build_envelope_figure(design: Design, combinations: list[str], system: str = "si") -> Figure:
    """The matplotlib Figure; its attribute `sizer_panels` lists the panels top to bottom."""
    import matplotlib
    from matplotlib.figure import Figure

    from sizer.render.plots.figure import length_axis, panel_axes

    member = design.member
    planar = is_planar(member)
    names = ["N", "V", "M"] + ([] if planar else ["Vz", "My", "T"])
    panels = names + (["deflection"] if design.solution.has_displacements else [])
    title = member.title or (Path(member.source).name if member.source else "member")
    subtitle = textwrap.wrap(f"Envelope over {len(combinations)} combination{'s' if len(combinations) != 1 else ''} (pattern arrangements "
                             "included), loads factored: the largest (solid) and smallest (dashed) value at each station, the band "
                             "between them shaded; the extremes marked with the combination that gives each.", SUBTITLE_CHARS)
    top = TITLE_HEIGHT + SUBTITLE_LINE * len(subtitle)
    height = top + len(panels) * DIAGRAM_HEIGHT + (len(panels) - 1) * GAP + BOTTOM
    xs, sides = check_stations(design, 400)
    high, low = envelope_curves(design.solution, combinations, xs, sides)
    found = action_envelope(design.solution, combinations)
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(FIG_WIDTH, height))
        axes = panel_axes(figure, [(name, DIAGRAM_HEIGHT) for name in panels], height, top)
        for name in names:
            column = EXTREME_ACTIONS.index(name)
            _draw_band(axes[name], name, xs, high[:, column], low[:, column], found[name], member.length, system)
        if "deflection" in axes:
            _draw_deflection_bounds(axes["deflection"], design, combinations, planar, system)
        for ax in axes.values():
            for x in sorted({s.at for s in member.supports} | {h.at for h in member.hinges}):
                ax.axvline(x, color=GUIDE, lw=0.5, ls=":", zorder=1)
        length_axis(axes, member.length, system)
        figure.text(LEFT / FIG_WIDTH, 1 - 0.16 / height, title, fontsize=12, fontweight="bold", va="top")
        figure.text(LEFT / FIG_WIDTH, 1 - 0.42 / height, "\n".join(subtitle), fontsize=8, va="top", linespacing=1.5)
    setattr(figure, "sizer_panels", panels)  # our own attribute on matplotlib's Figure
    return figure


def _draw_band(ax: Axes, name: str, xs: np.ndarray, high: np.ndarray, low: np.ndarray, found: Any, length: float, system: str) -> None:
    """One action's envelope: the band, its two bounds, the zero line and the extremes marked."""
    title, kind, sense = TITLES[name]
    tiny = 1e-9 * (1.0 + float(max(np.abs(high).max(initial=0.0), np.abs(low).max(initial=0.0))))
    top, bottom = (units.to_display(np.where(np.abs(v) < tiny, 0.0, v), kind, system) for v in (high, low))
    ax.fill_between(xs, bottom, top, facecolor=FILL_POSITIVE, edgecolor="none", zorder=2)
    ax.plot(xs, top, color=INK, lw=1.2, zorder=4)
    ax.plot(xs, bottom, color=INK, lw=1.0, ls="--", zorder=4)
    ax.axhline(0.0, color=INK, lw=0.7, zorder=3)
    unit = units.unit_label(kind, system)
    ax.set_title(f"{title} [{unit}]   {sense}", loc="left", pad=3)
    ax.set_ylabel(unit)
    if not np.any(top) and not np.any(bottom):
        ax.set_ylim(-1.0, 1.0)
        ax.text(0.5, 0.55, "zero along the member in every combination", transform=ax.transAxes, ha="center", fontsize=7.5, color="#555555",
                zorder=8, bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.4, "alpha": 0.9})
        return
    span = max(float(top.max()), 0.0) - min(float(bottom.min()), 0.0)
    ax.set_ylim(min(float(bottom.min()), 0.0) - 0.45 * span, max(float(top.max()), 0.0) + 0.45 * span)
    for bound, sign in ((found.largest, 1.0), (found.smallest, -1.0)):
        if bound.value * sign > tiny:
            _mark(ax, bound.at, bound.value, kind, system, sign, length, bound.combination)


def _mark(ax: Axes, at: float, value: float, kind: str, system: str, sign: float, length: float, combination: str) -> None:
    """A dot at an extreme, with its value, position and combination."""
    shown = units.to_display(value, kind, system)
    ax.plot([at], [shown], marker="o", markersize=3.6, color=INK, zorder=6)
    text = f"{'max' if sign > 0 else 'min'} {units.fmt(value, kind, system)} at {units.fmt(at, 'length', system)} in {combination}"
    left = at < 0.62 * length
    ax.annotate("\n".join(textwrap.wrap(text, LABEL_CHARS)), (at, shown), xytext=(4 if left else -4, 5 * sign), textcoords="offset points",
                ha="left" if left else "right", va="bottom" if sign > 0 else "top", fontsize=7, zorder=7,
                bbox={"boxstyle": "square,pad=0.12", "facecolor": "white", "edgecolor": "none", "alpha": 0.85})


def _draw_deflection_bounds(ax: Axes, design: Design, combinations: list[str], planar: bool, system: str) -> None:
    """The largest and smallest uy (and uz, thin, out of plane) at each point over the combinations."""
    xs = np.linspace(0.0, design.member.length, 401)
    high, low = displacement_bounds(design.solution, combinations, xs)
    unit = units.unit_label("deflection", system)
    ax.axhline(0.0, color=GUIDE, lw=2.2, zorder=1, solid_capstyle="butt")
    for column, width in ((1, 1.2),) + (() if planar else ((2, 0.7),)):
        top, bottom = (units.to_display(v[:, column], "deflection", system) for v in (high, low))
        ax.fill_between(xs, bottom, top, facecolor=FILL_POSITIVE, edgecolor="none", alpha=0.8, zorder=2)
        ax.plot(xs, top, color=INK, lw=width, zorder=4)
        ax.plot(xs, bottom, color=INK, lw=width, ls="--", zorder=4)
    sense = "uy, + along +y" + ("" if planar else "; thin lines: uz, + along +z")
    ax.set_title(f"Deflected shape, largest and smallest [{unit}]   {sense}", loc="left", pad=3)
    ax.set_ylabel(unit)
