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
"""

from __future__ import annotations

import io
import math
import textwrap
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Sequence

import numpy as np

from sizer import units
from sizer.analysis import extremes, self_weight_load
from sizer.checks import CheckReport, check_stations
from sizer.design import Design
from sizer.errors import InputError
from sizer.files import write_atomic
from sizer.model import Member, PointLoad, Support
from sizer.render.forces import is_planar

PLOT_FORMATS: dict[str, str] = {".png": "png", ".svg": "svg"}
DPI = 150  # dots per inch of PNG output

# layout, inches of paper
FIG_WIDTH = 8.0
LEFT = 1.0
RIGHT = 0.35
TITLE_HEIGHT = 0.55  # plus SUBTITLE_LINE per line of subtitle
SUBTITLE_LINE = 0.19
SUBTITLE_CHARS = 118
BOTTOM = 0.75
GAP = 0.42  # between panels (room for a panel's title)
DIAGRAM_HEIGHT = 1.3
END_PAD = 0.6  # beyond each member end in a member view
BELOW_AXIS = 1.45  # room under the member axis for supports, their labels and the dimension chain
BEAM_HALF = 0.045  # half depth of the drawn member
BAND_GAP = 0.07  # between stacked line-load bands
BAND_HEIGHT = 0.34  # tallest line-load band
BAND_MIN_HEIGHT = 0.1
LABEL_HEIGHT = 0.17  # one line of small text
ARROW_MIN, ARROW_MAX = 0.3, 0.6  # point-force arrow lengths
ARC_RADIUS = 0.2

# greyscale-safe styling: black structure, one dark ink for loads, hatching for signs
INK = "#111111"
LOAD_INK = "#1d3557"
REACTION_INK = "#2d5016"
CUT_INK = "#8a1c1c"
GOVERNING_INK = "#8a1c1c"
FILL_POSITIVE = "#d4d4d4"
FILL_NEGATIVE = "#f2f2f2"
LOAD_FILL = "#e6ebf2"
SELF_WEIGHT_FILL = "#eeeeee"
GUIDE = "#9a9a9a"

TITLES = {
    "N": ("Axial force N", "force", "+ tension"),
    "V": ("Shear force V = −Vy", "force", "+ turns its segment clockwise"),
    "M": ("Bending moment M = Mz", "moment", "+ sagging (concave up)"),
    "Vz": ("Shear force Vz", "force", "+ along +z on the +x face"),
    "My": ("Bending moment My", "moment", "+ about +y on the +x face"),
    "T": ("Torque T", "moment", "+ about +x on the +x face"),
}


def style() -> dict[str, Any]:
    """matplotlib settings for every sizer figure."""
    return {
        "font.size": 8.0,
        "axes.linewidth": 0.6,
        "hatch.linewidth": 0.45,
        "svg.fonttype": "none",
        "xtick.labelsize": 7.5,
        "ytick.labelsize": 7.5,
        "axes.titlesize": 8.5,
    }


# ----------------------------------------------------------------------------------------------
# entry points

def check_plot_path(path: str | Path) -> str:
    """The image format ("png" or "svg") for `path`, from its extension; InputError otherwise."""
    suffix = Path(path).suffix.lower()
    if suffix not in PLOT_FORMATS:
        raise InputError("", "--plot", f"cannot draw to {str(path)!r}: the file name must end in .png or .svg",
                         "give a file name such as diagrams.png or diagrams.svg")
    return PLOT_FORMATS[suffix]


def plot_member(design: Design, path: str | Path, combination: str, report: CheckReport | None = None,
                system: str = "si") -> None:
    """Draw the member and its diagrams for `combination` to `path` (.png or .svg), atomically."""
    image_format = check_plot_path(path)
    write_atomic(path, figure_bytes(build_figure(design, combination, report, system), image_format))


def figure_bytes(figure: Any, image_format: str) -> bytes:
    """The figure rendered to PNG or SVG bytes (fixed size: FIG_WIDTH wide at DPI)."""
    import matplotlib

    buffer = io.BytesIO()
    with matplotlib.rc_context(style()):
        figure.savefig(buffer, format=image_format, dpi=DPI, metadata=_metadata(image_format))
    return buffer.getvalue()


def _metadata(image_format: str) -> dict[str, Any]:
    """Reproducible files: no creation date."""
    return {"Date": None} if image_format == "svg" else {"Software": "sizer"}


def build_figure(design: Design, combination: str, report: CheckReport | None = None, system: str = "si") -> Any:
    """The matplotlib Figure of the member and its diagrams for `combination`. Its attribute
    `sizer_panels` lists the panels top to bottom: elevation, [plan], N, V, M, [Vz, My, T], [deflection]."""
    import matplotlib
    from matplotlib.figure import Figure

    member = design.member
    planar = is_planar(member)
    points, lines = factored_loads(design, combination)
    views = {plane: layout_member_view(member, points, lines, plane, system) for plane in (["elevation"] if planar else ["elevation", "plan"])}
    names = ["N", "V", "M"] + ([] if planar else ["Vz", "My", "T"])
    panels = [(plane, view.height) for plane, view in views.items()] + [(name, DIAGRAM_HEIGHT) for name in names]
    if design.solution.has_displacements:
        panels.append(("deflection", DIAGRAM_HEIGHT))
    subtitle = _subtitle_lines(design, combination, report, system)
    top = TITLE_HEIGHT + SUBTITLE_LINE * len(subtitle)
    height = top + sum(h for _, h in panels) + GAP * (len(panels) - 1) + BOTTOM
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(FIG_WIDTH, height), dpi=DPI)
        axes = _panel_axes(figure, panels, height, top)
        pad = END_PAD * views["elevation"].m_per_inch
        for ax in axes.values():
            ax.set_xlim(-pad, member.length + pad)
        for plane, view in views.items():
            draw_member_view(axes[plane], view, member, points)
        _draw_diagrams(axes, design, combination, names, system, planar)
        governing = _governing_for(report)
        if governing is not None:
            _mark_governing(axes, governing)
        _length_axis(axes, member.length, system)
        _title_block(figure, member, subtitle, height)
        _footer(figure, planar)
    figure.sizer_panels = list(axes)
    return figure


def _draw_diagrams(axes: dict[str, Any], design: Design, combination: str, names: list[str], system: str, planar: bool) -> None:
    """The action diagrams, the deflected shape and the guide lines at supports and hinges."""
    samples = diagram_samples(design, combination)
    for name in names:
        draw_action_diagram(axes[name], name, samples, design, combination, system)
    if "deflection" in axes:
        draw_deflection(axes["deflection"], design, combination, samples.x, samples.sides, system, planar)
    _mark_guides(axes, design.member)


def _length_axis(axes: dict[str, Any], length: float, system: str) -> None:
    """Ticks along x at round values of the display length unit (the data stay in metres), labelled
    under the bottom panel."""
    from matplotlib.ticker import FixedLocator, FuncFormatter, MaxNLocator

    shown_length = units.to_display(length, "length", system)
    shown = MaxNLocator(nbins=10, steps=[1, 2, 2.5, 5, 10]).tick_values(0.0, shown_length)
    shown = shown[(shown >= 0) & (shown <= shown_length * (1 + 1e-9))]
    factor = units.DISPLAY[system]["length"].factor
    for ax in axes.values():
        ax.xaxis.set_major_locator(FixedLocator(shown * factor))
        ax.xaxis.set_major_formatter(FuncFormatter(lambda value, _: f"{value / factor:g}"))
    bottom = list(axes.values())[-1]
    bottom.tick_params(labelbottom=True)
    bottom.set_xlabel(f"x from end A [{units.unit_label('length', system)}]")


def _panel_axes(figure: Any, panels: list[tuple[str, float]], height: float, title_height: float) -> dict[str, Any]:
    """One axes per panel, stacked top to bottom at fixed inch positions."""
    axes: dict[str, Any] = {}
    top = height - title_height
    width = (FIG_WIDTH - LEFT - RIGHT) / FIG_WIDTH
    for name, panel_height in panels:
        bottom = top - panel_height
        ax = figure.add_axes((LEFT / FIG_WIDTH, bottom / height, width, panel_height / height))
        if name in ("elevation", "plan"):
            ax.set_axis_off()
        else:
            ax.tick_params(labelbottom=False, direction="in", length=3)
            ax.spines[["top", "right"]].set_visible(False)
        ax.set_label(name)
        axes[name] = ax
        top = bottom - GAP
    return axes


def _governing_for(report: CheckReport | None) -> Any:
    if report is None or report.governing is None or report.governing.at is None:
        return None
    return report.governing


def _title_block(figure: Any, member: Member, lines: list[str], height: float) -> None:
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
        where = units.fmt(governing.at, "length", system)
        text = (f"Governing check: {governing.check}, utilization {governing.utilization:.3f} at x = {where}"
                f" in combination '{governing.combination}' ({'PASSES' if report.passes else 'FAILS'})")
        if governing.combination != combination:
            text += "; the dash-dot line marks its position"
        lines.append(text)
    return [part for line in lines for part in textwrap.wrap(line, SUBTITLE_CHARS)]


def _footer(figure: Any, planar: bool) -> None:
    text = "Diagrams: positive up, hatched //// where positive and \\\\\\\\ where negative; values of this combination."
    if not planar:
        text += "\nPlan view seen from +y: +z points down the page; a double-headed arrow is a torque about x (right-hand rule)."
    figure.text(LEFT / FIG_WIDTH, 0.1 / figure.get_figheight(), text, fontsize=7, color="#444444", va="bottom", linespacing=1.4)


# ----------------------------------------------------------------------------------------------
# loads of a combination

@dataclass(frozen=True)
class DrawnPoint:
    """A factored point load: position (m), forces (fx, fy, fz) N and moments (mx, my, mz) N*m."""

    at: float
    force: tuple[float, float, float]
    moment: tuple[float, float, float]


@dataclass(frozen=True)
class DrawnLine:
    """A factored line load from start to end (m); q = (wx, wy, wz, mx) in N/m and N*m/m."""

    start: float
    end: float
    q_start: tuple[float, float, float, float]
    q_end: tuple[float, float, float, float]
    self_weight: bool = False


def factored_loads(design: Design, combination: str) -> tuple[list[DrawnPoint], list[DrawnLine]]:
    """The loads of `combination`, each multiplied by its case's factor, with the self-weight as a line load."""
    member = design.member
    factors = member.combinations[combination]
    points: list[DrawnPoint] = []
    lines: list[DrawnLine] = []
    for load in member.loads:
        factor = factors.get(load.case, 0.0)
        if factor == 0.0:
            continue
        if isinstance(load, PointLoad):
            points.append(DrawnPoint(load.at, _scaled(load.force, factor), _scaled(load.moment, factor)))
        elif load.end > load.start:
            lines.append(DrawnLine(load.start, load.end, _scaled(load.q_start, factor), _scaled(load.q_end, factor)))
    weight = self_weight_intensity(design, combination)
    if weight:
        own = self_weight_load(member, weight)
        lines.append(DrawnLine(own.start, own.end, own.q_start, own.q_end, self_weight=True))
    return points, lines


def self_weight_intensity(design: Design, combination: str) -> float:
    """Factored self-weight of `combination` in N/m (0 when none)."""
    solution = design.solution
    row = solution.combination_names.index(combination)
    return float(solution.weights()[row, -1])


def _scaled(values: Sequence[float], factor: float) -> tuple:
    return tuple(float(v) * factor for v in values)


# ----------------------------------------------------------------------------------------------
# member views

@dataclass(frozen=True)
class PlaneSpec:
    """Which freedoms and load components a view shows."""

    name: str
    transverse: int  # 1: y (elevation), 2: z (plan)
    page_sign: float  # page-up direction per + transverse: +1 for y, -1 for z
    translation: str  # "uy" / "uz"
    rotation: str  # "rz" / "ry"
    axis_label: str


PLANES = {
    "elevation": PlaneSpec("elevation", 1, 1.0, "uy", "rz", "y"),
    "plan": PlaneSpec("plan", 2, -1.0, "uz", "ry", "z"),
}


@dataclass
class Band:
    """A line load drawn as a filled outline stacked above the member axis (inches)."""

    load: DrawnLine
    component: int  # 0 wx, 1 wy, 2 wz, 3 mx
    base: float = 0.0
    scale: float = 0.0  # inches per N/m (or N*m/m)

    def intensity(self, x: np.ndarray) -> np.ndarray:
        load = self.load
        t = (x - load.start) / (load.end - load.start)
        return load.q_start[self.component] * (1 - t) + load.q_end[self.component] * t

    @property
    def peak(self) -> float:
        return max(abs(self.load.q_start[self.component]), abs(self.load.q_end[self.component]))

    @property
    def top(self) -> float:
        return self.base + self.peak * self.scale + LABEL_HEIGHT


@dataclass
class MemberView:
    """Layout of one member view: x in m along the page, y in inches from the member axis."""

    plane: PlaneSpec
    m_per_inch: float
    bands: list[Band]
    above: float  # inches needed above the axis
    below: float = BELOW_AXIS
    system: str = "si"  # display units of the labels

    @property
    def height(self) -> float:
        return self.above + self.below

    def dx(self, inches: float) -> float:
        """A horizontal distance in inches of paper, in metres along the member."""
        return inches * self.m_per_inch


def axes_width() -> float:
    """Width of the panels in inches."""
    return FIG_WIDTH - LEFT - RIGHT


def layout_member_view(member: Member, points: list[DrawnPoint], lines: list[DrawnLine], plane: str, system: str = "si") -> MemberView:
    """Lay out a member view: stack its line-load bands and find the height its point loads need."""
    spec = PLANES[plane]
    m_per_inch = member.length / (axes_width() - 2 * END_PAD)
    bands = stack_bands(_bands_for(lines, spec), BEAM_HALF + BAND_GAP)
    above = max([band.top for band in bands] + [BEAM_HALF + 0.5])
    for point in points:
        if _transverse_force(point, spec):
            above = max(above, _stack_top(bands, point.at) + ARROW_MAX + LABEL_HEIGHT)
    return MemberView(spec, m_per_inch, bands, above + 0.15, system=system)


def _bands_for(lines: list[DrawnLine], spec: PlaneSpec) -> list[Band]:
    """Bands of a view: transverse components; in elevation also wx and the torque per length."""
    components = (spec.transverse,) if spec.name == "plan" else (1, 0, 3)
    bands = [Band(line, c) for line in lines for c in components
             if line.q_start[c] or line.q_end[c]]
    for group in ({0, 1, 2}, {3}):
        members = [b for b in bands if b.component in group]
        largest = max([b.peak for b in members], default=0.0)
        for band in members:
            band.scale = BAND_HEIGHT / largest if largest else 0.0
            if band.peak * band.scale < BAND_MIN_HEIGHT:
                band.scale = BAND_MIN_HEIGHT / band.peak
    return bands


def stack_bands(bands: list[Band], base: float) -> list[Band]:
    """Place each band on the lowest level free over its x range (first come, lowest)."""
    placed: list[Band] = []
    for band in bands:
        under = [other.top for other in placed if other.load.start < band.load.end and band.load.start < other.load.end]
        band.base = max(under + [base - BAND_GAP]) + BAND_GAP
        placed.append(band)
    return placed


def _stack_top(bands: list[Band], x: float) -> float:
    """Top of the band stack at x (inches above the axis)."""
    return max([b.top for b in bands if b.load.start <= x <= b.load.end] + [BEAM_HALF])


def _transverse_force(point: DrawnPoint, spec: PlaneSpec) -> float:
    return point.force[spec.transverse]


def draw_member_view(ax: Any, view: MemberView, member: Member, points: list[DrawnPoint]) -> None:
    """The member to scale with its supports, hinges and factored loads."""
    ax.set_ylim(-view.below, view.above)
    draw_beam(ax, 0.0, member.length)
    for band in view.bands:
        draw_band(ax, view, band)
    for support in member.supports:
        draw_support(ax, view, support, member.length)
    for hinge in member.hinges:
        draw_hinge(ax, hinge.at)
    draw_point_loads(ax, view, points, member.length)
    draw_dimension_chain(ax, view, _chain_positions(member), -view.below + 0.45)
    draw_triad(ax, view, -END_PAD * view.m_per_inch, view.above)
    title = "Member in elevation (x-y plane)" if view.plane.name == "elevation" else "Member in plan (x-z plane, seen from +y)"
    ax.set_title(title + ": supports and factored loads", loc="left", pad=2)


def _chain_positions(member: Member) -> list[float]:
    xs = {0.0, member.length} | {s.at for s in member.supports} | {h.at for h in member.hinges}
    return sorted(xs)


def draw_beam(ax: Any, start: float, end: float) -> None:
    from matplotlib.patches import Rectangle

    ax.add_patch(Rectangle((start, -BEAM_HALF), end - start, 2 * BEAM_HALF, facecolor="#bdbdbd", edgecolor=INK, lw=1.0, zorder=3))


def draw_hinge(ax: Any, x: float) -> None:
    """An internal hinge: an open circle on the member axis."""
    ax.plot([x], [0.0], marker="o", markersize=7, markerfacecolor="white", markeredgecolor=INK, markeredgewidth=1.2, zorder=6)


def draw_arrow(ax: Any, tail: tuple[float, float], tip: tuple[float, float], color: str = LOAD_INK,
               lw: float = 1.3, zorder: int = 5) -> None:
    """A straight arrow from tail to tip (data coordinates)."""
    ax.annotate("", xy=tip, xytext=tail, zorder=zorder,
                arrowprops={"arrowstyle": "-|>", "color": color, "lw": lw, "shrinkA": 0, "shrinkB": 0, "mutation_scale": 9})


def draw_text(ax: Any, x: float, y: float, text: str, color: str = LOAD_INK, **kw: Any) -> None:
    """Small text at (x, y) in data coordinates, centred above the point unless told otherwise."""
    kw.setdefault("ha", "center")
    kw.setdefault("va", "bottom")
    kw.setdefault("fontsize", 7.5)
    ax.text(x, y, text, color=color, zorder=8, **kw)


# supports ---------------------------------------------------------------------------------------

def draw_support(ax: Any, view: MemberView, support: Support, length: float) -> None:
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


def _ground(ax: Any, view: MemberView, x: float, y: float, half_width: float) -> None:
    """A ground line at height y (inches) with short hatch strokes under it."""
    ax.plot([x - view.dx(half_width), x + view.dx(half_width)], [y, y], color=INK, lw=1.1, zorder=4)
    for k in np.linspace(-half_width, half_width - 0.06, 6):
        ax.plot([x + view.dx(k + 0.06), x + view.dx(k)], [y, y - 0.06], color=INK, lw=0.7, zorder=4)


def draw_pin(ax: Any, view: MemberView, x: float, roller: bool) -> float:
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


def draw_clamp(ax: Any, view: MemberView, x: float, end: str, guided: bool) -> float:
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


def draw_translation_spring(ax: Any, view: MemberView, x: float) -> float:
    """A zigzag spring from the member down to the ground. Returns its depth."""
    top, length, half = -BEAM_HALF, 0.36, 0.06
    ys = np.linspace(top, top - length, 10)
    xs = np.array([0.0] + [half if i % 2 else -half for i in range(1, 9)] + [0.0])
    ax.plot(x + view.dx(1) * xs, ys, color=INK, lw=1.0, zorder=4)
    _ground(ax, view, x, top - length, 0.14)
    return length + 0.1


def draw_rotation_spring(ax: Any, view: MemberView, x: float, side: float) -> None:
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


# loads --------------------------------------------------------------------------------------------

def draw_band(ax: Any, view: MemberView, band: Band) -> None:
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


def _band_arrows(ax: Any, view: MemberView, band: Band) -> None:
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


def _axial_marks(ax: Any, view: MemberView, x: float, y: float, sign: float, double: bool) -> None:
    """Small arrows along x inside a band (double-headed for a torque per length)."""
    half = view.dx(0.08)
    draw_arrow(ax, (x - sign * half, y), (x + sign * half, y), lw=0.7)
    if double:
        draw_arrow(ax, (x - sign * half, y), (x + sign * (half - view.dx(0.05)), y), lw=0.7)


def _band_label(ax: Any, view: MemberView, band: Band) -> None:
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


def draw_point_loads(ax: Any, view: MemberView, points: list[DrawnPoint], member_length: float) -> None:
    """Point forces as arrows (length scaled to the largest), moments as curved or double arrows."""
    plane = view.plane
    transverse = [abs(_transverse_force(p, plane)) for p in points]
    largest = max(transverse + [0.0])
    for point in points:
        force = _transverse_force(point, plane)
        if force:
            length = ARROW_MIN + (ARROW_MAX - ARROW_MIN) * abs(force) / largest
            draw_transverse_force(ax, view, point.at, force, _stack_top(view.bands, point.at), length, LOAD_INK)
        if plane.name == "elevation" and point.force[0]:
            draw_axial_force(ax, view, point.at, point.force[0], member_length, LOAD_INK)
        turning = point.moment[2] if plane.name == "elevation" else point.moment[1]
        if turning:
            draw_turning_moment(ax, view, point.at, turning, units.fmt(abs(turning), "moment", view.system, 3), LOAD_INK)
        if plane.name == "elevation" and point.moment[0]:
            draw_moment_vector(ax, view, point.at, point.moment[0], -0.3, "mx " + units.fmt(abs(point.moment[0]), "moment", view.system, 3),
                               LOAD_INK, label_side="below")


def draw_transverse_force(ax: Any, view: MemberView, x: float, force: float, clear: float, length: float, color: str) -> None:
    """A point force across the member, drawn above the axis: pushing onto it, or pulling away."""
    page_up = force * view.plane.page_sign > 0
    near, far = BEAM_HALF + 0.02, clear + length
    tail, tip = ((x, near), (x, far)) if page_up else ((x, far), (x, near))
    draw_arrow(ax, tail, tip, color=color, lw=1.5)
    draw_text(ax, x, far + 0.03, units.fmt(abs(force), "force", view.system, 3), color=color)


def draw_axial_force(ax: Any, view: MemberView, x: float, force: float, member_length: float, color: str,
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


def draw_turning_moment(ax: Any, view: MemberView, x: float, moment: float, label: str, color: str,
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


def draw_moment_vector(ax: Any, view: MemberView, x: float, moment: float, y: float, label: str, color: str,
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


def draw_dimension_chain(ax: Any, view: MemberView, positions: list[float], y: float) -> None:
    """A chain of dimensions between the given positions (m), with the distances written under."""
    ax.plot([positions[0], positions[-1]], [y, y], color=INK, lw=0.6)
    for x in positions:
        ax.plot([x, x], [y - 0.05, y + 0.05], color=INK, lw=0.6)
        ax.plot([x, x], [y + 0.05, -0.05], color=GUIDE, lw=0.4, ls=":", zorder=1)
    for a, b in zip(positions, positions[1:]):
        if (b - a) / view.m_per_inch > 0.3:
            draw_text(ax, (a + b) / 2, y - 0.03, units.fmt(b - a, "length", view.system, 4), color=INK, va="top", fontsize=7)


def draw_triad(ax: Any, view: MemberView, x: float, y: float) -> None:
    """Axis arrows in the view's upper left corner: x to the right, y up or z down."""
    origin = (x + view.dx(0.12), y - 0.35 if view.plane.page_sign > 0 else y - 0.12)
    draw_arrow(ax, origin, (origin[0] + view.dx(0.3), origin[1]), color=INK, lw=0.8)
    draw_text(ax, origin[0] + view.dx(0.34), origin[1], "x", color=INK, ha="left", va="center")
    step = 0.2 * view.plane.page_sign
    draw_arrow(ax, origin, (origin[0], origin[1] + step), color=INK, lw=0.8)
    draw_text(ax, origin[0], origin[1] + step + (0.02 if step > 0 else -0.02), view.plane.axis_label, color=INK,
              va="bottom" if step > 0 else "top")


# ----------------------------------------------------------------------------------------------
# diagrams

@dataclass(frozen=True)
class Samples:
    """Stations along the member (both sides at discontinuities) and the actions there (N, N*m)."""

    x: np.ndarray
    sides: np.ndarray
    actions: dict[str, np.ndarray]  # N, Vy, Vz, T, My, Mz, V, M
    tiny: float  # values smaller than this are round-off


def diagram_samples(design: Design, combination: str, n_even: int = 400) -> Samples:
    """Actions of `combination` at the check stations plus a fine even spacing."""
    xs, sides = check_stations(design, n_even)
    values = design.solution.actions(combination, xs, sides)
    actions = {name: values[:, i] for i, name in enumerate(("N", "Vy", "Vz", "T", "My", "Mz"))}
    actions["V"] = -actions["Vy"]
    actions["M"] = actions["Mz"]
    tiny = 1e-9 * (1.0 + float(np.abs(values).max(initial=0.0)))
    return Samples(xs, sides, actions, tiny)


def draw_action_diagram(ax: Any, name: str, samples: Samples, design: Design, combination: str, system: str) -> None:
    """One diagram: the curve, hatched fill by sign, zero line, and the extremes labelled."""
    title, kind, sense = TITLES[name]
    values = np.where(np.abs(samples.actions[name]) < samples.tiny, 0.0, samples.actions[name])
    shown = units.to_display(values, kind, system)
    _signed_fill(ax, samples.x, shown)
    ax.plot(samples.x, shown, color=INK, lw=1.2, zorder=4)
    ax.axhline(0.0, color=INK, lw=0.7, zorder=3)
    ax.set_title(f"{title} [{units.unit_label(kind, system)}]   {sense}", loc="left", pad=3)
    ax.set_ylabel(units.unit_label(kind, system))
    if not np.any(values):
        ax.set_ylim(-1.0, 1.0)
        ax.text(0.5, 0.55, "zero along the member", transform=ax.transAxes, ha="center", fontsize=7.5, color="#555555")
        return
    extreme = extremes(design.solution, combination)[name]
    marks = [(extreme.max_value, extreme.max_at, 1.0), (extreme.min_value, extreme.min_at, -1.0)]
    _set_limits(ax, shown)
    for value, at, sign in marks:
        if value * sign > samples.tiny:
            _label_extreme(ax, at, value, kind, system, sign, design.member.length)


def _signed_fill(ax: Any, x: np.ndarray, y: np.ndarray) -> None:
    ax.fill_between(x, 0.0, y, where=y >= 0, interpolate=True, facecolor=FILL_POSITIVE, edgecolor="#6e6e6e",
                    hatch="////", lw=0.0, zorder=2)
    ax.fill_between(x, 0.0, y, where=y <= 0, interpolate=True, facecolor=FILL_NEGATIVE, edgecolor="#6e6e6e",
                    hatch="\\\\\\\\", lw=0.0, zorder=2)


def _set_limits(ax: Any, shown: np.ndarray) -> None:
    low, high = min(0.0, float(shown.min())), max(0.0, float(shown.max()))
    span = high - low
    ax.set_ylim(low - 0.32 * span, high + 0.32 * span)


def _label_extreme(ax: Any, at: float, value: float, kind: str, system: str, sign: float, length: float) -> None:
    """A dot at an extreme, with its value and position."""
    shown = units.to_display(value, kind, system)
    ax.plot([at], [shown], marker="o", markersize=3.6, color=INK, zorder=6)
    text = f"{'max' if sign > 0 else 'min'} {units.fmt(value, kind, system)} at {units.fmt(at, 'length', system)}"
    left = at < 0.62 * length
    ax.annotate(text, (at, shown), xytext=(4 if left else -4, 5 * sign), textcoords="offset points",
                ha="left" if left else "right", va="bottom" if sign > 0 else "top", fontsize=7.5, zorder=7,
                bbox={"boxstyle": "square,pad=0.12", "facecolor": "white", "edgecolor": "none", "alpha": 0.85})


def draw_deflection(ax: Any, design: Design, combination: str, xs: np.ndarray, sides: np.ndarray, system: str, planar: bool) -> None:
    """The deflected shape: uy (and uz when loaded out of plane) in mm, with the largest marked."""
    moved = design.solution.displacements(combination, xs, sides)
    length = design.member.length
    ax.axhline(0.0, color=GUIDE, lw=2.2, zorder=1, solid_capstyle="butt")
    held = np.array([s.at for s in design.member.supports if {"uy", "uz"} & (set(s.restrain) | set(s.springs))])
    if held.size:
        at_supports = units.to_display(design.solution.displacements(combination, held)[:, 1], "deflection", system)
        ax.plot(held, at_supports, ls="none", marker="^", markersize=6, markerfacecolor="white", markeredgecolor=INK, zorder=5)
    curves = [("uy", 1, "-")] + ([] if planar else [("uz", 2, "--")])
    peaks = []
    for label, column, line_style in curves:
        values = moved[:, column]
        ax.plot(xs, units.to_display(values, "deflection", system), color=INK, lw=1.4, ls=line_style, label=label, zorder=4)
        index = int(np.argmax(np.abs(values)))
        peaks.append(float(np.abs(values[index])))
        if abs(values[index]) > 1e-15:
            _label_extreme_deflection(ax, label, float(xs[index]), float(values[index]), system, length)
    shown = units.to_display(moved[:, [c for _, c, _ in curves]], "deflection", system)
    if max(peaks) > 1e-15:
        _set_limits(ax, shown)
    unit = units.unit_label("deflection", system)
    sense = "uy + along +y" + ("" if planar else ", uz + along +z (dashed)")
    ax.set_title(f"Deflected shape [{unit}]   {sense}", loc="left", pad=3)
    ax.set_ylabel(unit)


def _label_extreme_deflection(ax: Any, label: str, at: float, value: float, system: str, length: float) -> None:
    shown = units.to_display(value, "deflection", system)
    sign = 1.0 if value > 0 else -1.0
    ax.plot([at], [shown], marker="s", markersize=3.6, color=INK, zorder=6)
    left = at < 0.62 * length
    ax.annotate(f"largest {label} {units.fmt(value, 'deflection', system)} at {units.fmt(at, 'length', system)}",
                (at, shown), xytext=(4 if left else -4, 5 * sign), textcoords="offset points", ha="left" if left else "right",
                va="bottom" if sign > 0 else "top", fontsize=7.5, zorder=7,
                bbox={"boxstyle": "square,pad=0.12", "facecolor": "white", "edgecolor": "none", "alpha": 0.85})


def _mark_guides(axes: dict[str, Any], member: Member) -> None:
    """Faint vertical lines at supports and hinges through every diagram."""
    positions = sorted({s.at for s in member.supports} | {h.at for h in member.hinges})
    for name, ax in axes.items():
        if name in ("elevation", "plan"):
            continue
        for x in positions:
            ax.axvline(x, color=GUIDE, lw=0.5, ls=":", zorder=1)


def _mark_governing(axes: dict[str, Any], governing: Any) -> None:
    """A dash-dot line at the governing station through every panel, tagged in the member view."""
    for ax in axes.values():
        low, high = ax.get_ylim()
        ax.plot([governing.at, governing.at], [low, high], color=GOVERNING_INK, lw=1.0, ls="-.", zorder=7)
        ax.set_ylim(low, high)
    view = axes["elevation"]
    low, high = view.get_xlim()
    right_half = governing.at > (low + high) / 2
    offset = 0.012 * (high - low) * (-1 if right_half else 1)
    draw_text(view, governing.at + offset, view.get_ylim()[0] + 0.04,
              f"governing station: {governing.check}, utilization {governing.utilization:.3f}", color=GOVERNING_INK,
              va="bottom", ha="right" if right_half else "left", fontsize=7.5, fontweight="bold")


# ----------------------------------------------------------------------------------------------
# free body of the left segment, for the calculation record

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
    q_end = tuple(a + (b - a) * t for a, b in zip(load.q_start, load.q_end))
    return DrawnLine(load.start, end, load.q_start, q_end, load.self_weight)


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


def build_free_body_figure(design: Design, combination: str, x: float, side: str, system: str = "si") -> Any:
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
    bands = stack_bands(_bands_for(lines, spec), BEAM_HALF + BAND_GAP)
    above = max([band.top for band in bands] + [BEAM_HALF + 0.75])
    for point in points:
        if _transverse_force(point, spec):
            above = max(above, _stack_top(bands, point.at) + ARROW_MAX + LABEL_HEIGHT)
    return MemberView(spec, m_per_inch, bands, above + 0.1, FREE_BODY_BELOW, system)


def _draw_free_body_view(ax: Any, view: MemberView, design: Design, points: list[DrawnPoint],
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


def draw_reaction(ax: Any, view: MemberView, at: float, reaction: np.ndarray, member_length: float, system: str) -> None:
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


def draw_cut_actions(ax: Any, view: MemberView, x: float, actions: np.ndarray, planar: bool, system: str) -> None:
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
