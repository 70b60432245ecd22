"""Diagrams of one member for one combination: the member to scale with its supports and factored
loads, then N, V, M (and Vz, My, T when loaded out of plane) and the deflected shape, with the
extremes and the governing station marked. Also the free body of the left segment at a cut, for the
calculation record.

Drawing conventions (our own): in a member view, x runs along the page in metres to scale and the
transverse direction is schematic, measured in inches of paper from the member axis. The elevation
view shows the x-y plane with +y up the page; the plan view (out-of-plane loading only) shows the
x-z plane seen from +y, so +z points down the page. A moment about the axis pointing at the viewer
(mz in elevation, my in plan) is a curved arrow, counter-clockwise when positive; a moment whose
axis lies in the page (the torque mx) is a double-headed arrow along its axis (right-hand rule).
Diagrams plot positive values up the page, hatched //// where positive and \\\\ where negative,
so that they read in greyscale print.

matplotlib is imported inside the functions (lazily), and figures are built on matplotlib.figure.Figure
directly (Agg canvas for PNG, no pyplot state).

Modules, each importing only those above it:
  style              sheet sizes (inches), inks, matplotlib settings, PNG/SVG bytes, arrow and label marks
  combination_loads  the factored loads of a combination and its self-weight (SI)
  view_layout        what a member view shows and where: planes, stacked line-load bands, heights
  support_symbols    pins, rollers, clamps, springs and their captions
  load_symbols       line-load bands, point forces, moments and torques
  member_view        the member view panel: member, supports, hinges, loads, dimensions, triad
  diagrams           N, V, M (Vz, My, T) and the deflected shape; extremes, guides, governing station
  free_body          the free body of the left segment at a cut, for the calculation record
  figure             the whole figure (title block, stacked panels, x axis) and plot_member
  envelope           the envelope over many combinations (pattern arrangements included) and plot_envelope
"""

from sizer.render.plots.envelope import build_envelope_figure, plot_envelope
from sizer.render.plots.figure import build_figure, plot_member
from sizer.render.plots.free_body import build_free_body_figure
from sizer.render.plots.style import (
    DPI,
    FIG_WIDTH,
    check_plot_path,
    figure_bytes,
    style,
)

__all__ = [
    "DPI",
    "FIG_WIDTH",
    "build_envelope_figure",
    "build_figure",
    "build_free_body_figure",
    "check_plot_path",
    "figure_bytes",
    "plot_envelope",
    "plot_member",
    "style",
]
