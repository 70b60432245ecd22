"""Every combination on one figure: N, V, M (and Vz, My, T when loaded out of plane) and the
deflected shape, one curve per combination told apart by line style and ink (greyscale safe), in
display units along x; the legend names each combination. For the record, so that a reviewer sees
every combination, not only the governing one.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Sequence

import numpy as np

from sizer import units
from sizer.design import Design
from sizer.results.forces import is_planar
from sizer.render.plots.diagrams import TITLES, diagram_samples
from sizer.render.plots.style import DIAGRAM_HEIGHT, FIG_WIDTH, GAP, LEFT, style

if TYPE_CHECKING:
    from matplotlib.figure import Figure

LINE_STYLES = ("-", "--", "-.", ":")
INKS = ("#111111", "#1d3557", "#8a1c1c", "#2d5016", "#6b4a00")


def curve_style(index: int) -> dict[str, Any]:
    """Line style and ink of the index-th combination (4 x 5 distinct pairs before any repeats)."""
    return {"ls": LINE_STYLES[index % len(LINE_STYLES)], "color": INKS[(index // len(LINE_STYLES)) % len(INKS)]}


LEGEND_ROW = 0.19  # inches per row of the legend
LEGEND_CHARS = 96  # characters of legend text that fit across the sheet beside the line samples


def legend_columns(names: Sequence[str]) -> int:
    """How many legend columns fit across the sheet (at most 3) for these combination names."""
    longest = max((len(name) for name in names), default=1)
    return max(1, min(3, LEGEND_CHARS // (longest + 10)))


def build_combinations_figure(design: Design, system: str = "si") -> Figure:
    """The figure; its attribute `sizer_panels` lists the panels top to bottom."""
    import matplotlib
    from matplotlib.figure import Figure

    from sizer.render.plots.figure import length_axis, panel_axes

    planar = is_planar(design.member)
    names = ["N", "V", "M"] + ([] if planar else ["Vz", "My", "T"])
    panels = names + (["deflection"] if design.solution.has_displacements else [])
    combinations = design.solution.combination_names
    columns = legend_columns(combinations)
    top, bottom = 0.45 + LEGEND_ROW * -(-len(combinations) // columns), 0.6
    height = top + len(panels) * DIAGRAM_HEIGHT + (len(panels) - 1) * GAP + bottom
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(FIG_WIDTH, height))
        axes = panel_axes(figure, [(name, DIAGRAM_HEIGHT) for name in panels], height, top)
        for ax in axes.values():
            ax.axhline(0.0, color="#9a9a9a", lw=0.7)
        for index, combination in enumerate(combinations):
            _draw_combination(axes, design, combination, names, system, curve_style(index))
        length_axis(axes, design.member.length, system)
        handles, labels = axes[panels[0]].get_legend_handles_labels()
        figure.legend(handles, labels, loc="upper left", bbox_to_anchor=(LEFT / FIG_WIDTH, 1 - 0.08 / height), ncol=columns, fontsize=7.5,
                      frameon=False, title="Every combination (loads factored)", title_fontsize=9, alignment="left")
    setattr(figure, "sizer_panels", panels)  # our own attribute on matplotlib's Figure
    return figure


def _draw_combination(axes: dict[str, Any], design: Design, combination: str, names: list[str], system: str, look: dict) -> None:
    """One combination's curves on every panel."""
    samples = diagram_samples(design, combination)
    for name in names:
        title, kind, sense = TITLES[name]
        values = np.where(np.abs(samples.actions[name]) < samples.tiny, 0.0, samples.actions[name])
        axes[name].plot(samples.x, units.to_display(values, kind, system), lw=1.2, label=combination, **look)
        axes[name].set_title(f"{title} [{units.unit_label(kind, system)}]   {sense}", loc="left", pad=3)
    if "deflection" in axes:
        moved = design.solution.displacements(combination, samples.x, samples.sides)
        axes["deflection"].plot(samples.x, units.to_display(moved[:, 1], "deflection", system), lw=1.2, **look)
        if not is_planar(design.member):
            axes["deflection"].plot(samples.x, units.to_display(moved[:, 2], "deflection", system), lw=0.8, alpha=0.6, **look)
        unit = units.unit_label("deflection", system)
        sense = "uy, + along +y" + ("" if is_planar(design.member) else "; thin lines: uz, + along +z")
        axes["deflection"].set_title(f"Deflected shape [{unit}]   {sense}", loc="left", pad=3)
