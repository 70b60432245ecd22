"""The look shared by every sizer figure: the sheet's sizes in inches of paper, the inks (greyscale
safe), matplotlib's settings, the output formats (PNG at DPI dots per inch, or SVG, without a
creation date) and the two marks every drawing is made of, a straight arrow and a small label,
placed in data coordinates.

matplotlib is imported inside the functions (lazily), so importing this module stays cheap.
"""

from __future__ import annotations

import io
from pathlib import Path
from typing import TYPE_CHECKING, Any

from sizer.errors import InputError

if TYPE_CHECKING:
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure
    from matplotlib.typing import RcKeyType

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


def style() -> dict[RcKeyType, Any]:
    """matplotlib settings for every sizer figure."""
    return {
        "font.size": 8.0,
        "axes.linewidth": 0.6,
        "hatch.linewidth": 0.45,
        "svg.fonttype": "none",
        "xtick.labelsize": 7.5,
        "ytick.labelsize": 7.5,
        "axes.titlesize": 8.5,
        "axes.unicode_minus": False,  # one minus sign in every output: the hyphen-minus of the text
    }


def check_plot_path(path: str | Path) -> str:
    """The image format ("png" or "svg") for `path`, from its extension; InputError otherwise."""
    suffix = Path(path).suffix.lower()
    if suffix not in PLOT_FORMATS:
        raise InputError("", "--plot", f"cannot draw to {str(path)!r}: the file name must end in .png or .svg",
                         "give a file name such as diagrams.png or diagrams.svg")
    return PLOT_FORMATS[suffix]


def figure_bytes(figure: Figure, image_format: str) -> bytes:
    """The figure rendered to PNG or SVG bytes (fixed size: FIG_WIDTH wide at DPI)."""
    import matplotlib

    buffer = io.BytesIO()
    with matplotlib.rc_context(style()):
        keep_texts_inside(figure)
        figure.savefig(buffer, format=image_format, dpi=DPI, metadata=_metadata(image_format))
    return buffer.getvalue()


EDGE_MARGIN = 0.12  # inches kept clear between any text and the sheet's edges


def keep_texts_inside(figure: Figure) -> None:
    """Keep every text (titles, labels, legends' texts) inside the sheet, and a text clipped to its
    panel inside the panel: one that runs past the right or left edge moves back in by the overhang
    (plus EDGE_MARGIN at the sheet's edges); a panel title, or a text that would then cross the
    other edge, is wrapped at whole words to the room it has. Nothing is cut off."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.text import Annotation, Text

    renderer = FigureCanvasAgg(figure).get_renderer()
    margin = EDGE_MARGIN * figure.dpi
    titles = {id(title) for ax in figure.axes
              for title in (ax.title, ax._left_title, ax._right_title)}  # type: ignore[attr-defined]  # private texts, not in matplotlib's stubs
    for text in figure.findobj(Text):
        if not text.get_visible() or not text.get_text():
            continue
        clip = text.axes.bbox if text.get_clip_on() and text.axes is not None else None  # drawn clipped to its panel
        low, high = (clip.x0 + 2, clip.x1 - 2) if clip is not None else (margin, figure.bbox.width - margin)
        box = text.get_window_extent(renderer)
        shift = min(high - box.x1, 0.0) or max(low - box.x0, 0.0)
        if not shift:
            continue
        if id(text) in titles or box.x0 + shift < low or box.x1 + shift > high:
            _wrap_to(text, (high - max(box.x0, low)) / box.width)
        elif isinstance(text, Annotation) and text.anncoords == "offset points":
            text.xyann = (text.xyann[0] + shift * 72 / figure.dpi, text.xyann[1])
        elif not isinstance(text, Annotation):
            x, y = text.get_transform().transform(text.get_position())
            text.set_position(tuple(text.get_transform().inverted().transform((x + shift, y))))


def _wrap_to(text: Any, share: float) -> None:
    """Wrap a text's lines at whole words to `share` (0..1) of their present width."""
    import textwrap

    lines = text.get_text().split("\n")
    longest = max(len(line) for line in lines)
    chars = max(12, int(longest * share) - 1)
    text.set_text("\n".join(textwrap.fill(line, chars) for line in lines))


def _metadata(image_format: str) -> dict[str, Any]:
    """Reproducible files: no creation date."""
    return {"Date": None} if image_format == "svg" else {"Software": "sizer"}


def axes_width() -> float:
    """Width of the panels in inches."""
    return FIG_WIDTH - LEFT - RIGHT


def draw_arrow(ax: Axes, tail: tuple[float, float], tip: tuple[float, float], color: str = LOAD_INK,
               lw: float = 1.3, zorder: int = 5) -> None:
    """A straight arrow from tail to tip (data coordinates)."""
    ax.annotate("", xy=tip, xytext=tail, zorder=zorder,
                arrowprops={"arrowstyle": "-|>", "color": color, "lw": lw, "shrinkA": 0, "shrinkB": 0, "mutation_scale": 9})


def draw_text(ax: Axes, x: float, y: float, text: str, color: str = LOAD_INK, **kw: Any) -> None:
    """Small text at (x, y) in data coordinates, centred above the point unless told otherwise."""
    kw.setdefault("ha", "center")
    kw.setdefault("va", "bottom")
    kw.setdefault("fontsize", 7.5)
    kw.setdefault("bbox", {"facecolor": "white", "edgecolor": "none", "pad": 0.4, "alpha": 0.9})  # guide lines pass behind
    ax.text(x, y, text, color=color, zorder=8, **kw)
