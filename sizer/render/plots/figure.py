"""The diagrams figure of one member for one combination, and `plot_member` that writes it: a title
block, the member views (elevation, and plan when loaded out of plane), the action diagrams and the
deflected shape stacked on one x axis in metres (ticks at round values of the display length unit),
each panel at a fixed height in inches of paper, FIG_WIDTH wide.
"""

from __future__ import annotations

import textwrap
from pathlib import Path
from typing import TYPE_CHECKING, Any

from sizer import units
from sizer.checks import CheckReport, CheckResult
from sizer.design import Design
from sizer.files import write_atomic
from sizer.model import Member
from sizer.render.check import status_word
from sizer.results.forces import is_planar
from sizer.render.plots.buckled_shape import buckling_pick, draw_buckled_shape
from sizer.render.plots.combination_loads import factored_loads
from sizer.render.plots.diagrams import draw_diagrams, mark_governing
from sizer.render.plots.member_view import draw_member_view
from sizer.render.plots.upright import UPRIGHT_HEIGHT, draw_upright, stands_upright
from sizer.render.plots.style import (
    BOTTOM,
    DIAGRAM_HEIGHT,
    DPI,
    END_PAD,
    FIG_WIDTH,
    GAP,
    LEFT,
    RIGHT,
    SUBTITLE_CHARS,
    SUBTITLE_LINE,
    TITLE_HEIGHT,
    check_plot_path,
    figure_bytes,
    style,
)
from sizer.render.plots.view_layout import layout_member_view

if TYPE_CHECKING:
    from matplotlib.figure import Figure


def plot_member(design: Design, path: str | Path, combination: str, report: CheckReport | None = None,
                system: str = "si") -> None:
    """Draw the member and its diagrams for `combination` to `path` (.png or .svg), atomically."""
    image_format = check_plot_path(path)
    write_atomic(path, figure_bytes(build_figure(design, combination, report, system), image_format))


def build_figure(design: Design, combination: str, report: CheckReport | None = None, system: str = "si",
                 buckled: bool = True) -> Figure:
    """The matplotlib Figure of the member and its diagrams for `combination`, and with a report the
    buckled shape of its governing stability check (unless `buckled` is False). Its attribute `sizer_panels` lists the panels top
    to bottom: [upright], elevation, [plan], N, V, M, [Vz, My, T], [deflection], [sideways, twist]; "upright" is the member drawn
    vertical, for a member that stands on end (gravity along x)."""
    import matplotlib
    from matplotlib.figure import Figure

    member = design.member
    planar = is_planar(member)
    points, lines = factored_loads(design, combination)
    views = {plane: layout_member_view(member, points, lines, plane, system) for plane in (["elevation"] if planar else ["elevation", "plan"])}
    names = ["N", "V", "M"] + ([] if planar else ["Vz", "My", "T"])
    upright = stands_upright(member)
    panels = ([("upright", UPRIGHT_HEIGHT)] if upright else []) + [(plane, view.height) for plane, view in views.items()]
    panels += [(name, DIAGRAM_HEIGHT) for name in names]
    if design.solution.has_displacements:
        panels.append(("deflection", DIAGRAM_HEIGHT))
    pick = buckling_pick(report) if buckled else None
    if pick is not None:
        panels += [("sideways", DIAGRAM_HEIGHT), ("twist", DIAGRAM_HEIGHT)]
    subtitle = _subtitle_lines(design, combination, report, system)
    top = TITLE_HEIGHT + SUBTITLE_LINE * len(subtitle)
    height = top + sum(h for _, h in panels) + GAP * (len(panels) - 1) + BOTTOM
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(FIG_WIDTH, height), dpi=DPI)
        axes = panel_axes(figure, panels, height, top)
        if upright:
            draw_upright(axes.pop("upright"), member, points, lines, system)
        pad = END_PAD * views["elevation"].m_per_inch
        for ax in axes.values():
            ax.set_xlim(-pad, member.length + pad)
        for plane, view in views.items():
            draw_member_view(axes[plane], view, member, points)
        draw_diagrams(axes, design, combination, names, system, planar)
        if pick is not None:
            draw_buckled_shape(axes["sideways"], axes["twist"], design, pick, system)
        governing = _governing_for(report)
        if governing is not None:
            mark_governing(axes, governing)
        length_axis(axes, member.length, system)
        _title_block(figure, member, subtitle, height)
        _footer(figure, planar, bool(member.restraints))
    setattr(figure, "sizer_panels", (["upright"] if upright else []) + list(axes))  # our own attribute on matplotlib's Figure
    return figure


def length_axis(axes: dict[str, Any], length: float, system: str) -> None:
    """Ticks along x at round values of the display length unit (the data stay in metres), labelled
    under the bottom panel."""
    import numpy as np
    from matplotlib.ticker import FixedLocator, FuncFormatter, MaxNLocator

    shown_length = units.to_display(length, "length", system)
    shown = np.asarray(MaxNLocator(nbins=10, steps=[1, 2, 2.5, 5, 10]).tick_values(0.0, shown_length))
    shown = shown[(shown >= 0) & (shown <= shown_length * (1 + 1e-9))]
    factor = units.DISPLAY[system]["length"].factor
    for ax in axes.values():
        ax.xaxis.set_major_locator(FixedLocator((shown * factor).tolist()))
        ax.xaxis.set_major_formatter(FuncFormatter(lambda value, _: f"{value / factor:g}"))
    bottom = list(axes.values())[-1]
    bottom.tick_params(labelbottom=True)
    bottom.set_xlabel(f"x from end A [{units.unit_label('length', system)}]")


def panel_axes(figure: Figure, panels: list[tuple[str, float]], height: float, title_height: float) -> dict[str, Any]:
    """One axes per panel, stacked top to bottom at fixed inch positions."""
    axes: dict[str, Any] = {}
    top = height - title_height
    width = (FIG_WIDTH - LEFT - RIGHT) / FIG_WIDTH
    for name, panel_height in panels:
        bottom = top - panel_height
        ax = figure.add_axes((LEFT / FIG_WIDTH, bottom / height, width, panel_height / height))
        if name in ("upright", "elevation", "plan"):
            ax.set_axis_off()
        else:
            ax.tick_params(labelbottom=False, direction="in", length=3)
            ax.spines[["top", "right"]].set_visible(False)
        ax.set_label(name)
        axes[name] = ax
        top = bottom - GAP
    return axes


def _governing_for(report: CheckReport | None) -> CheckResult | None:
    if report is None or report.governing is None or report.governing.at is None:
        return None
    return report.governing


def _title_block(figure: Figure, member: Member, lines: list[str], height: float) -> None:
    """Title, then the combination and section, and the governing check when a report is given."""
    name = member.title or (Path(member.source).name if member.source else "member")
    figure.text(LEFT / FIG_WIDTH, 1 - 0.16 / height, name, fontsize=12, fontweight="bold", va="top")
    figure.text(LEFT / FIG_WIDTH, 1 - 0.42 / height, "\n".join(lines), fontsize=8, va="top", linespacing=1.5)


def _subtitle_lines(design: Design, combination: str, report: CheckReport | None, system: str) -> list[str]:
    """The lines under the title, wrapped to the figure width."""
    member = design.member
    section = f"section {design.spec.name}" if design.spec is not None else "no section: forces only, no self-weight"
    lines = [f"Combination '{combination}', loads factored · {section} · "
             f"length {units.fmt(member.length, 'length', system)}, drawn to scale along x"]
    governing = _governing_for(report)
    if governing is not None:
        assert report is not None  # the governing check is the report's
        where = units.fmt(governing.at, "length", system)
        text = (f"Governing check: {governing.check}, utilization {governing.utilization:.3f} at x = {where}"
                f" in combination '{governing.combination}' ({status_word(report.passes)})")
        if governing.combination != combination:
            text += "; the dash-dot line marks its position"
        lines.append(text)
    return [part for line in lines for part in textwrap.wrap(line, SUBTITLE_CHARS)]


def _footer(figure: Figure, planar: bool, restraints: bool) -> None:
    text = "Diagrams: positive up, hatched //// where positive and \\\\\\\\ where negative; values of this combination."
    if restraints:
        text += "\nRestraints against buckling: filled squares on the member at a point, a cross-hatched strip under it where continuous."
    if not planar:
        text += "\nPlan view seen from +y: +z points down the page; a double-headed arrow is a torque about x (right-hand rule)."
    figure.text(LEFT / FIG_WIDTH, 0.1 / figure.get_figheight(), text, fontsize=7, color="#444444", va="bottom", linespacing=1.4)
