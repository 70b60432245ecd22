"""The HTML pieces of the calculation record: the inline style sheet, escaping, values in display
units (SI floats inside; a value below 1e-12 shows as 0), number cells that carry the exact SI value
in data-value, tables and rows, and pictures inline as base64 SVG.
"""

from __future__ import annotations

import base64
import html
from typing import TYPE_CHECKING, Any, Iterable, Sequence

from sizer import units
from sizer.printable import printable_lines
from sizer.render.plots.style import figure_bytes

if TYPE_CHECKING:
    from matplotlib.figure import Figure

STYLE = """
:root { --ink:#1b1b1b; --muted:#5a5a5a; --rule:#c9c9c9; --pass:#1f5e2e; --fail:#8a1c1c; --warn:#6b4a00; --band:#f4f4f1; }
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; color: var(--ink); margin: 0;
       line-height: 1.45; font-size: 14px; background: #fff; }
main { max-width: 1040px; margin: 0 auto; padding: 28px 34px 40px; }
h1 { font-size: 25px; margin: 0 0 4px; letter-spacing: .2px; }
h2 { font-size: 18px; margin: 34px 0 10px; padding-bottom: 4px; border-bottom: 2px solid var(--ink); }
h3 { font-size: 15px; margin: 22px 0 6px; }
p { margin: 6px 0; }
.meta { color: var(--muted); font-size: 12.5px; }
.verdict { margin: 18px 0 14px; padding: 12px 16px; border: 2px solid; border-left-width: 10px; }
.verdict.pass { border-color: var(--pass); }
.verdict.fail { border-color: var(--fail); }
.verdict .word { font-size: 24px; font-weight: 700; letter-spacing: 1px; margin-right: 12px; }
.verdict.pass .word { color: var(--pass); }
.verdict.fail .word { color: var(--fail); }
.cautions { border: 2px dashed var(--warn); background: #fffaf0; padding: 10px 16px 10px 16px; margin: 12px 0 18px; }
.cautions h2 { border: none; margin: 0 0 4px; padding: 0; font-size: 16px; color: var(--warn); }
.cautions li { margin: 3px 0; font-weight: 600; }
nav ol { columns: 2; margin: 4px 0 0; padding-left: 22px; font-size: 13px; }
table { border-collapse: collapse; margin: 6px 0 12px; font-size: 12.5px; }
th, td { padding: 3px 9px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
th { border-bottom: 1.5px solid var(--ink); font-weight: 600; background: var(--band); }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr.governing td { font-weight: 700; background: #efefe9; }
tr.not-made td { color: var(--muted); }
td.fails { color: var(--fail); font-weight: 700; }
td.ok { color: var(--pass); }
.bar { display: inline-block; height: 9px; border-right: 2px solid var(--ink); width: 90px; vertical-align: middle;
       background: #fff; position: relative; }
.bar span { display: block; height: 100%; background: repeating-linear-gradient(135deg, #444 0 2px, #bbb 2px 4px); }
.bar.over { border-right-style: double; }
figure { margin: 10px 0 16px; page-break-inside: avoid; }
figure img { max-width: 100%; height: auto; border: 1px solid var(--rule); }
figcaption { font-size: 12px; color: var(--muted); margin-top: 3px; }
.two { display: grid; grid-template-columns: auto auto; justify-content: start; gap: 0 30px; align-items: start; }
@media (max-width: 760px) { .two { grid-template-columns: auto; } }
.eq { font-family: "DejaVu Sans Mono", Consolas, monospace; font-size: 12.5px; background: var(--band);
      border-left: 3px solid var(--ink); padding: 8px 12px; margin: 6px 0 10px; white-space: pre-wrap; overflow-x: auto; }
.note { font-size: 12.5px; color: var(--muted); }
ul.notes li { margin: 2px 0; font-size: 13px; }
footer { margin-top: 30px; font-size: 12px; color: var(--muted); border-top: 1px solid var(--rule); padding-top: 8px; }
@media print { main { padding: 0; } h2 { page-break-after: avoid; } table, .eq { page-break-inside: avoid; } }
"""


def _e(text: Any) -> str:
    """Text as HTML text only: markup characters escaped, control characters shown as escapes."""
    return html.escape(printable_lines(str(text)), quote=True)


def _fmt(value: float | None, kind: str, system: str, digits: int = 4) -> str:
    if value is None:
        return "—"
    return units.fmt(0.0 if abs(value) < 1e-12 else value, kind, system, digits)


SUPERSCRIPTS = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _large(value: float, kind: str, system: str) -> str:
    """A section property: 4 significant figures, as m × 10ⁿ when it has six digits or more."""
    shown = units.to_display(value, kind, system)
    if abs(shown) < 1e5:
        return _fmt(value, kind, system)
    mantissa, exponent = f"{shown:.3e}".split("e")
    return f"{mantissa} × 10{str(int(exponent)).translate(SUPERSCRIPTS)} {units.unit_label(kind, system)}"


def _num(value: float, kind: str, system: str, digits: int = 4) -> str:
    """A value in display units without the unit label (for equations)."""
    shown = units.to_display(value, kind, system)
    return units.fmt_number(0.0 if abs(shown) < 1e-12 else shown, digits)


def _cell(text: str, value: float | None = None, field: str = "") -> str:
    """A right-aligned number cell; data-value carries the exact SI value, data-field its name."""
    data = f' data-value="{value!r}"' if value is not None else ""
    name = f' data-field="{field}"' if field else ""
    return f'<td class="num"{name}{data}>{text}</td>'


def _table(headers: Sequence[str], rows: Iterable[str], numeric: Iterable[int] = ()) -> str:
    """A table; the columns numbered in `numeric` have right-aligned headings."""
    numeric = set(numeric)
    head = "".join(f'<th class="num">{_e(h)}</th>' if i in numeric else f"<th>{_e(h)}</th>" for i, h in enumerate(headers))
    return f'<table><thead><tr>{head}</tr></thead><tbody>{"".join(rows)}</tbody></table>'


def _row(cells: Iterable[str], css: str = "", attrs: str = "") -> str:
    klass = f' class="{css}"' if css else ""
    return f"<tr{klass}{attrs}>{''.join(cells)}</tr>"


def _figure(figure: Figure, caption: str, width: int | None = None) -> str:
    """A matplotlib figure inline as a base64 SVG image, with its caption."""
    data = base64.b64encode(figure_bytes(figure, "svg")).decode("ascii")
    style = f' style="width:{width}px"' if width else ""
    return (f'<figure><img{style} alt="{_e(caption)}" src="data:image/svg+xml;base64,{data}">'
            f"<figcaption>{_e(caption)}</figcaption></figure>")
