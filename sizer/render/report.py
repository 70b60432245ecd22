"""`sizer report`: one self-contained HTML calculation record for a reviewer.

Contents: the verdict and the cautions first; the inputs (member, supports, loads, cases and
combinations, material and allowables, the section with its properties and outline); reactions;
the diagrams; the method of sections at the governing cut (free body of the left segment, each
load and reaction on it, the equilibrium equations with the numbers put in, and the actions they
give beside the analysis's); every check; the verdict; the assumptions; the cautions again.

Every check number shown is taken from render.check.check_json (the `sizer check --json`
document), which is also embedded whole as <script type="application/json" id="sizer-data">,
so the record and the JSON cannot disagree. Pictures are inline (base64 SVG), styles inline.
"""

from __future__ import annotations

import base64
import datetime
import html
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Iterable, Sequence

import numpy as np

from sizer import __version__, units
from sizer.checks import CheckReport, buckling_axes, spans
from sizer.design import Design
from sizer.errors import InputError
from sizer.files import write_atomic
from sizer.model import FREEDOMS, LineLoad, PointLoad
from sizer.render.check import check_json
from sizer.render.common import CAUTIONS, dumps, without_round_off
from sizer.render.forces import REACTION_KINDS, REACTION_NAMES, governing_moment, is_planar
from sizer.render.plots import build_figure, build_free_body_figure, figure_bytes, style

QUANTITY_KINDS = {"stress": "stress", "deflection": "deflection", "force": "force"}
ACTION_NAMES = ("N", "Vy", "Vz", "T", "My", "Mz")
ACTION_KINDS = ("force", "force", "force", "moment", "moment", "moment")
CHECK_ACTIONS = {"axial": (0,), "buckling": (0,), "bending": (4, 5), "shear": (1, 2, 3)}  # actions that drive a check

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
.bar { display: inline-block; height: 9px; border: 1px solid var(--ink); width: 90px; vertical-align: middle;
       background: #fff; position: relative; }
.bar span { display: block; height: 100%; background: repeating-linear-gradient(135deg, #444 0 2px, #bbb 2px 4px); }
.bar.over span { background: var(--fail); }
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
    return html.escape(str(text), quote=True)


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


# ----------------------------------------------------------------------------------------------
# entry points

REPORT_SUFFIXES = (".html", ".htm", ".pdf")


def check_report_path(path: str | Path) -> None:
    """InputError unless `path` ends in .html, .htm or .pdf (checked before any work)."""
    if Path(path).suffix.lower() not in REPORT_SUFFIXES:
        raise InputError("", "-o", f"cannot write a report to {str(path)!r}: the file name must end in .html (or .pdf)",
                         "give a file name such as record.html")


def write_report(design: Design, report: CheckReport, notes: list[str], out_path: str | Path, system: str = "si") -> list[Path]:
    """Write the HTML record to `out_path` atomically; returns the files written. When `out_path`
    ends in .pdf, the HTML goes beside it (.html) and the PDF is made with weasyprint if that is
    importable (it is not a dependency of sizer)."""
    out = Path(out_path)
    text = report_html(design, report, notes, system)
    if out.suffix.lower() != ".pdf":
        write_atomic(out, text)
        return [out]
    html_path = out.with_suffix(".html")
    write_atomic(html_path, text)
    pdf = pdf_bytes(text)
    if pdf is None:
        return [html_path]
    write_atomic(out, pdf)
    return [html_path, out]


def pdf_bytes(text: str) -> bytes | None:
    """The HTML rendered to PDF by weasyprint, or None when weasyprint is not installed."""
    try:
        import weasyprint  # type: ignore[import-not-found]
    except ImportError:
        return None
    return weasyprint.HTML(string=text).write_pdf()


def report_html(design: Design, report: CheckReport, notes: list[str], system: str = "si") -> str:
    """The calculation record as one HTML document (inline styles and pictures)."""
    document = check_json(design, report, notes)
    member = design.member
    title = member.title or (Path(member.source).name if member.source else "Member")
    combination, x = governing_cut(design, report)
    parts = [
        _header(design, title),
        _verdict_box(document, system),
        _cautions_box(),
        _contents(),
        _inputs_section(design, system),
        _reactions_section(design, document, combination, system),
        _diagrams_section(design, report, combination, system),
        _cut_section(design, report, combination, x, system),
        _checks_section(document, system),
        _final_verdict(document, system),
        _assumptions_section(notes),
        _cautions_box(final=True),
        f"<footer>Calculation record made by sizer {_e(__version__)}, shown in {'SI' if system == 'si' else 'US customary'} "
        "display units; the embedded data (id sizer-data) is the <code>sizer check --json</code> document in SI base units.</footer>",
    ]
    data = dumps(document).replace("</", "<\\/")
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
            f"<title>Calculation record: {_e(title)}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n<main>\n"
            + "\n".join(parts)
            + f"\n</main>\n<script type=\"application/json\" id=\"sizer-data\">{data}</script>\n</body>\n</html>\n")


def governing_cut(design: Design, report: CheckReport) -> tuple[str, float]:
    """(combination, x) of the governing check; without one, of the largest bending moment."""
    governing = report.governing
    if governing is not None and governing.at is not None and governing.combination:
        return governing.combination, float(governing.at)
    name, _, at = governing_moment(design.solution)
    return name or design.solution.combination_names[0], float(at)


# ----------------------------------------------------------------------------------------------
# head, verdict, cautions

def _header(design: Design, title: str) -> str:
    member = design.member
    source = _e(member.source) if member.source else "(built in memory)"
    today = datetime.date.today().isoformat()
    return (f"<header><h1>Calculation record: {_e(title)}</h1>"
            f"<p class=\"meta\">Member file {source} · section {_e(design.spec.name)} · made by sizer {_e(__version__)} on {today}</p></header>")


def _verdict_text(document: dict[str, Any], system: str) -> str:
    checks = {c["check"]: c for c in document["checks"]}
    governing = checks.get(document["governing"]) if document["governing"] else None
    word = "PASSES" if document["passes"] else "FAILS"
    if governing is None:
        return f'<span class="word">{word}</span> no check could be made.'
    return (f'<span class="word">{word}</span> Section <b>{_e(document["section"])}</b>: governing check '
            f'<b>{_e(governing["check"])}</b>, utilization <b data-value="{governing["utilization"]!r}">{governing["utilization"]:.3f}</b> '
            f'at x = {_fmt(governing["at"], "length", system)} in combination <b>{_e(governing["combination"])}</b>.')


def _verdict_box(document: dict[str, Any], system: str) -> str:
    css = "pass" if document["passes"] else "fail"
    return f'<section class="verdict {css}" id="verdict">{_verdict_text(document, system)}</section>'


def _cautions_box(final: bool = False) -> str:
    items = "".join(f"<li>{_e(c)}</li>" for c in CAUTIONS)
    ident = "cautions-end" if final else "cautions"
    return f'<section class="cautions" id="{ident}"><h2>⚠ Cautions</h2><ul>{items}</ul></section>'


def _contents() -> str:
    entries = [("inputs", "Inputs"), ("reactions", "Reactions"), ("diagrams", "Internal actions and deflection"),
               ("cut", "Method of sections at the governing cut"), ("checks", "Stresses and checks"),
               ("final", "Verdict"), ("assumptions", "Assumptions")]
    items = "".join(f'<li><a href="#{key}">{_e(name)}</a></li>' for key, name in entries)
    return f"<nav><ol>{items}</ol></nav>"


# ----------------------------------------------------------------------------------------------
# inputs

def _inputs_section(design: Design, system: str) -> str:
    return "\n".join([
        '<section id="inputs"><h2>1. Inputs</h2>',
        _member_table(design, system),
        _supports_table(design, system),
        _loads_table(design, system),
        _combinations_table(design),
        _material_table(design, system),
        _section_block(design, system),
        _settings_table(design, system),
        "</section>",
    ])


def _member_table(design: Design, system: str) -> str:
    member = design.member
    axis, sign = member.gravity
    weight = (f"case '{_e(member.self_weight_case)}', {_fmt(design.mass_per_length, 'mass_per_length', system)} "
              f"along {'+' if sign > 0 else '−'}{'xyz'[axis]}") if member.self_weight_case else "not included"
    span_text = ", ".join(f"{'overhang' if s.overhang else 'span'} {_fmt(s.start, 'length', system)} to {_fmt(s.end, 'length', system)}"
                          for s in spans(member)) or "none"
    rows = [("Length", _fmt(member.length, "length", system)), ("Section", f"{_e(design.spec.name)} ({_e(design.spec.shape)})"),
            ("Orientation", _e(member.orientation)), ("Material", _e(design.material.name)), ("Self-weight", weight),
            ("Spans", span_text),
            ("Internal hinges", ", ".join(_fmt(h.at, "length", system) for h in member.hinges) or "none")]
    body = "".join(_row([f"<th>{name}</th>", f"<td>{value}</td>"]) for name, value in rows)
    return f"<h3>1.1 Member</h3><table><tbody>{body}</tbody></table>"


def _supports_table(design: Design, system: str) -> str:
    rows = []
    for index, support in enumerate(design.member.supports, start=1):
        held = " ".join(f for f in FREEDOMS if f in support.restrain) or "—"
        springs = ", ".join(f"{f} {_fmt(k, 'translational_stiffness' if f.startswith('u') else 'rotational_stiffness', system)}"
                            for f, k in support.springs.items()) or "—"
        rows.append(_row([f"<td>S{index}</td>", _cell(_fmt(support.at, "length", system), support.at),
                          f"<td>{_e(support.label)}</td>", f"<td>{_e(held)}</td>", f"<td>{_e(springs)}</td>"]))
    return "<h3>1.2 Supports</h3>" + _table(["support", "at", "type", "holds", "springs"], rows, numeric=[1])


def _load_values(load: PointLoad | LineLoad, system: str) -> str:
    """The non-zero components of a load as given (unfactored)."""
    if isinstance(load, PointLoad):
        parts = [(n, v, "force") for n, v in zip(("fx", "fy", "fz"), load.force)]
        parts += [(n, v, "moment") for n, v in zip(("mx", "my", "mz"), load.moment)]
        return ", ".join(f"{n} = {_fmt(v, kind, system)}" for n, v, kind in parts if v) or "zero"
    texts = []
    for i, name in enumerate(("wx", "wy", "wz", "mx")):
        a, b = load.q_start[i], load.q_end[i]
        if a or b:
            kind = "moment_per_length" if i == 3 else "force_per_length"
            texts.append(f"{name} = {_fmt(a, kind, system)}" if a == b else f"{name} = {_fmt(a, kind, system)} → {_fmt(b, kind, system)}")
    return ", ".join(texts) or "zero"


def _loads_table(design: Design, system: str) -> str:
    rows = []
    for index, load in enumerate(design.member.loads, start=1):
        if isinstance(load, PointLoad):
            kind = "moment" if not any(load.force) else "point"
            where = _fmt(load.at, "length", system)
        else:
            kind, where = "line", f"{_fmt(load.start, 'length', system)} to {_fmt(load.end, 'length', system)}"
        rows.append(_row([f"<td>L{index}</td>", f"<td>{_e(load.case)}</td>", f"<td>{kind}</td>", f"<td>{where}</td>",
                          f"<td>{_e(_load_values(load, system))}</td>"]))
    member = design.member
    if member.self_weight_case:
        axis, sign = member.gravity
        rows.append(_row(["<td>SW</td>", f"<td>{_e(member.self_weight_case)}</td>", "<td>line</td>",
                          f"<td>0 m to {_fmt(member.length, 'length', system)}</td>",
                          f"<td>self-weight {_fmt(design.mass_per_length * units.GRAVITY, 'force_per_length', system)} "
                          f"along {'+' if sign > 0 else '−'}{'xyz'[axis]} (mass per length × g)</td>"]))
    text = "<h3>1.3 Loads (as given, before factors)</h3>"
    if not rows:
        return text + "<p>No loads.</p>"
    return text + _table(["load", "case", "type", "where", "components (+ along +x, +y, +z; moments about them)"], rows)


def _combinations_table(design: Design) -> str:
    member = design.member
    cases = list(member.cases)
    for factors in member.combinations.values():
        cases += [c for c in factors if c not in cases]
    rows = []
    for name, factors in member.combinations.items():
        cells = [f"<td>{_e(name)}</td>"] + [_cell(f"{factors[c]:g}" if c in factors else "—", factors.get(c)) for c in cases]
        rows.append(_row(cells))
    return "<h3>1.4 Load cases and combinations (factors)</h3>" + _table(["combination"] + cases, rows, range(1, len(cases) + 1))


def _material_table(design: Design, system: str) -> str:
    material = design.material
    allowable = material.allowable
    rows = [("Elastic modulus E", _fmt(material.elastic_modulus, "modulus", system)),
            ("Shear modulus G", _fmt(material.shear_modulus, "modulus", system)),
            ("Density", _fmt(material.density, "density", system)),
            ("Yield strength", _fmt(material.yield_strength, "stress", system) if material.yield_strength else "not given")]
    rows += [(f"Allowable {name}", _fmt(getattr(allowable, name), "stress", system) if getattr(allowable, name) is not None else "not given")
             for name in ("tension", "compression", "bending", "shear", "equivalent")]
    body = "".join(_row([f"<th>{_e(name)}</th>", f'<td class="num">{value}</td>']) for name, value in rows)
    source = Path(material.source).name if material.source else "the member file"
    return (f"<h3>1.5 Material {_e(material.name)} and allowable stresses</h3>"
            f"<p class=\"note\">From {_e(source)}. The allowable stresses are the user's, taken from the governing code.</p>"
            f"<table><tbody>{body}</tbody></table>")


SECTION_ROWS = (
    ("area", "Area A", "area"), ("Iz", "Second moment Iz (about the horizontal axis)", "inertia"),
    ("Iy", "Second moment Iy (about the vertical axis)", "inertia"), ("Iyz", "Product of inertia Iyz", "inertia"),
    ("I11", "Principal I11", "inertia"), ("I22", "Principal I22", "inertia"),
    ("Sz_top", "Elastic modulus Sz, top fibre", "modulus_section"), ("Sz_bottom", "Elastic modulus Sz, bottom fibre", "modulus_section"),
    ("Sy_plus", "Elastic modulus Sy, +z fibre", "modulus_section"), ("Sy_minus", "Elastic modulus Sy, −z fibre", "modulus_section"),
    ("Zz", "Plastic modulus Zz", "modulus_section"), ("Zy", "Plastic modulus Zy", "modulus_section"),
    ("rz", "Radius of gyration rz", "dimension"), ("ry", "Radius of gyration ry", "dimension"),
    ("J", "Torsion constant J", "inertia"), ("Iw", "Warping constant Iw", "warping"),
    ("depth", "Depth", "dimension"), ("width", "Width", "dimension"),
)


def _section_block(design: Design, system: str) -> str:
    props, spec = design.props, design.spec
    dims = ", ".join(f"{_e(key.replace('_', ' '))} {_fmt(value, 'dimension', system)}" for key, value in spec.dims.items() if value)
    rows = [_row([f"<th>{_e(label)}</th>", _cell(_large(getattr(props, name), kind, system), float(getattr(props, name)))])
            for name, label, kind in SECTION_ROWS]
    ys, zs = props.shear_centre
    rows.append(_row(["<th>Shear centre (y, z) from the centroid</th>",
                      f'<td class="num">{_num(ys, "dimension", system)}, {_num(zs, "dimension", system)} {units.unit_label("dimension", system)}</td>']))
    rows.append(_row(["<th>Mass per length</th>", _cell(_fmt(design.mass_per_length, "mass_per_length", system), design.mass_per_length)]))
    rows.append(_row(["<th>Mesh</th>", f'<td class="num">{props.mesh_elements} elements, {props.mesh_nodes} nodes</td>']))
    table = f"<table><tbody>{''.join(rows)}</tbody></table>"
    picture = _figure(section_picture(design), "The section as installed, seen on the +x cut face (y up, z to the left); "
                      "centroid ⊕, shear centre ×, dots: the stress-analysis mesh nodes.", width=300)
    orientation = ("Properties in the section's own axes (depth along y); in <b>minor</b> orientation the section is turned a "
                   "quarter turn on the member, so member x-y bending uses Iy." if design.member.orientation == "minor" else
                   "Properties in the section's own axes (depth along y), which are the member's axes in major orientation.")
    return (f"<h3>1.6 Section {_e(spec.name)}</h3><p>Shape {_e(spec.shape)}: {dims or 'polygon outline'}. "
            f"Computed from the geometry with sectionproperties. {orientation}</p>"
            f'<div class="two"><div>{table}</div><div>{picture}</div></div>')


def _settings_table(design: Design, system: str) -> str:
    settings = design.member.checks
    deflection = ("not checked (no deflection_limit)" if settings.deflection_limit is None else
                  f"span / {settings.deflection_limit:g}, overhang / {settings.deflection_limit_overhang or settings.deflection_limit / 2:g}; "
                  f"combinations: {', '.join(settings.deflection_combinations or design.solution.combination_names)}")
    rows = [_row(["<th>Deflection limits</th>", f"<td>{_e(deflection)}</td>"]),
            _row(["<th>Buckling safety factor</th>",
                  f"<td>{settings.buckling_safety_factor:g} ({'given' if settings.buckling_safety_factor_given else 'default'})</td>"])]
    axes = buckling_axes(design.member, design.props, design.material)
    axis_rows = [_row([f"<td>{_e(a.axis)}</td>", _cell(_fmt(a.length, "length", system), a.length),
                       _cell(_fmt(a.radius, "dimension", system), a.radius), _cell(f"{a.slenderness:.1f}", a.slenderness),
                       f"<td>{_e(a.formula)}</td>", _cell(_fmt(a.critical_stress, "stress", system), a.critical_stress)])
                 for a in axes]
    return (f"<h3>1.7 Check settings</h3><table><tbody>{''.join(rows)}</tbody></table>"
            + _table(["buckling axis", "length KL", "radius r", "KL/r", "formula", "critical stress σcr"], axis_rows, (1, 2, 3, 5)))


# ----------------------------------------------------------------------------------------------
# pictures

def _figure(figure: Any, caption: str, width: int | None = None) -> str:
    """A matplotlib figure inline as a base64 SVG image, with its caption."""
    data = base64.b64encode(figure_bytes(figure, "svg")).decode("ascii")
    style = f' style="width:{width}px"' if width else ""
    return (f'<figure><img{style} alt="{_e(caption)}" src="data:image/svg+xml;base64,{data}">'
            f"<figcaption>{_e(caption)}</figcaption></figure>")


def section_outline(design: Design) -> list[tuple[np.ndarray, list[np.ndarray]]]:
    """The section's outline as drawn on the cut face: (exterior, holes) rings of page points (m),
    page x = -z (member), page y = y (member), origin at the centroid; turned for minor orientation."""
    from sizer.sections.geometry import MM, outline

    geometry = outline(design.spec).geom
    polygons = list(getattr(geometry, "geoms", [geometry]))
    cy, cz = design.props.centroid
    minx, miny, maxx, maxy = geometry.bounds
    centre = np.array([(minx + maxx) / 2 / MM - cz, (miny + maxy) / 2 / MM + cy])  # page (X, Y) of the centroid

    def page(ring: Any) -> np.ndarray:
        points = np.asarray(ring.coords) / MM - centre
        return _turned(points, design.member.orientation)

    return [(page(p.exterior), [page(h) for h in p.interiors]) for p in polygons]


def _turned(points: np.ndarray, orientation: str) -> np.ndarray:
    """A quarter turn counter-clockwise for minor orientation (section depth along member z)."""
    if orientation != "minor":
        return points
    return np.column_stack([-points[:, 1], points[:, 0]])


def section_picture(design: Design) -> Any:
    """A drawing of the section outline with its centroid, shear centre, member axes and mesh nodes."""
    import matplotlib
    from matplotlib.figure import Figure
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path as MplPath

    from sizer.sections import unit_stress_field

    rings = section_outline(design)
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(3.0, 3.0))
        ax = figure.add_axes((0.1, 0.1, 0.8, 0.8))
        for exterior, holes in rings:
            vertices = np.concatenate([exterior] + holes) * 1e3
            codes = np.concatenate([_ring_codes(len(r)) for r in [exterior] + holes])
            ax.add_patch(PathPatch(MplPath(vertices, codes), facecolor="#e3e3e3", edgecolor="#111111", hatch="////", lw=1.2))
        nodes = np.asarray(unit_stress_field(design.spec).points)  # (y, z) from the centroid
        page_nodes = _turned(np.column_stack([-nodes[:, 1], nodes[:, 0]]), design.member.orientation) * 1e3
        ax.plot(page_nodes[:, 0], page_nodes[:, 1], ls="none", marker=".", markersize=0.8, color="#555555")
        ys, zs = design.props.shear_centre
        centre = _turned(np.array([[-zs, ys]]), design.member.orientation)[0] * 1e3
        ax.plot([0], [0], marker="$\\oplus$", markersize=11, color="#111111", ls="none")
        ax.plot([centre[0]], [centre[1]], marker="x", markersize=8, mew=1.6, color="#8a1c1c", ls="none")
        _section_axes(ax, rings)
        ax.set_aspect("equal")
        ax.set_axis_off()
    return figure


def _ring_codes(count: int) -> np.ndarray:
    from matplotlib.path import Path as MplPath

    codes = np.full(count, MplPath.LINETO)
    codes[0] = MplPath.MOVETO
    codes[-1] = MplPath.CLOSEPOLY
    return codes


def _section_axes(ax: Any, rings: list[tuple[np.ndarray, list[np.ndarray]]]) -> None:
    """Member y (up) and z (left) through the centroid, with the size in mm."""
    every = np.concatenate([exterior for exterior, _ in rings]) * 1e3
    (minx, miny), (maxx, maxy) = every.min(axis=0), every.max(axis=0)
    reach = 0.62 * max(maxx - minx, maxy - miny)
    ax.annotate("", xy=(0, reach), xytext=(0, 0), arrowprops={"arrowstyle": "-|>", "lw": 0.8, "color": "#1d3557"})
    ax.annotate("", xy=(-reach, 0), xytext=(0, 0), arrowprops={"arrowstyle": "-|>", "lw": 0.8, "color": "#1d3557"})
    ax.text(0, reach * 1.04, "y", ha="center", va="bottom", color="#1d3557", fontsize=9)
    ax.text(-reach * 1.04, 0, "z", ha="right", va="center", color="#1d3557", fontsize=9)
    ax.text((minx + maxx) / 2, miny - 0.08 * reach, f"{maxx - minx:.4g} mm wide × {maxy - miny:.4g} mm deep",
            ha="center", va="top", fontsize=7.5)
    margin = 0.12 * reach
    ax.set_xlim(min(minx, -reach) - 3 * margin, max(maxx, 0) + margin)
    ax.set_ylim(miny - 3 * margin, max(maxy, reach) + 2 * margin)


# ----------------------------------------------------------------------------------------------
# reactions and diagrams

def _reactions_section(design: Design, document: dict[str, Any], combination: str, system: str) -> str:
    reactions = document["reactions"]
    shown = [i for i, name in enumerate(REACTION_NAMES)
             if any(abs(entry[name]) > 1e-9 for entries in reactions.values() for entry in entries)] or [1]
    rows = []
    for name, entries in reactions.items():
        for index, entry in enumerate(entries, start=1):
            cells = [f"<td>{_e(name) if index == 1 else ''}</td>", f"<td>S{index} ({_e(entry['type'])})</td>",
                     _cell(_fmt(entry["at"], "length", system), entry["at"])]
            cells += [_cell(_fmt(entry[REACTION_NAMES[i]], REACTION_KINDS[i], system), entry[REACTION_NAMES[i]]) for i in shown]
            rows.append(_row(cells, attrs=f' data-combination="{_e(name)}"'))
    return ('<section id="reactions"><h2>2. Reactions</h2><p>Forces and moments that each support exerts on the member, '
            "along and about +x, +y, +z, for each combination (factored).</p>"
            + _table(["combination", "support", "at"] + [REACTION_NAMES[i] for i in shown], rows, range(2, 3 + len(shown)))
            + _overall_equilibrium(design, combination, system) + "</section>")


def _overall_equilibrium(design: Design, combination: str, system: str) -> str:
    """The whole member as a free body in the governing combination: the sums of forces and of moments
    about end A of every load and reaction, written out (each is zero to round-off)."""
    items = segment_items(design, combination, design.member.length, "right")
    scale = max([float(np.abs(item.vector).max()) for item in items] + [1.0]) * max(1.0, design.member.length)

    def forces(i: int) -> list[float]:
        return [float(item.vector[i]) for item in items if item.vector[i] != 0.0]

    def total(values: list[float]) -> float:
        return float(without_round_off(np.array([sum(values)]), scale)[0])

    def moments(own: int, force: int, sign: float) -> str:
        terms = [f"+ ({_num(item.vector[own], 'moment', system)})" for item in items if item.vector[own] != 0.0]
        terms += [f"{'+' if sign > 0 else '−'} ({_num(item.at, 'length', system)})·({_num(item.vector[force], 'force', system)})"
                  for item in items if item.vector[force] != 0.0]
        summed = total([item.vector[own] + sign * item.at * item.vector[force] for item in items])
        written = " ".join(terms).removeprefix("+ ") or "0"
        return f"{written} = {_num(summed, 'moment', system)}"

    f_unit, m_unit = units.unit_label("force", system), units.unit_label("moment", system)
    lines = [f"ΣFx = {_terms(forces(0), 'force', system)} = {_num(total(forces(0)), 'force', system)} {f_unit}",
             f"ΣFy = {_terms(forces(1), 'force', system)} = {_num(total(forces(1)), 'force', system)} {f_unit}",
             f"ΣMz about A = Σmz + Σa·Fy = {moments(5, 1, 1.0)} {m_unit}"]
    if not is_planar(design.member):
        lines += [f"ΣFz = {_terms(forces(2), 'force', system)} = {_num(total(forces(2)), 'force', system)} {f_unit}",
                  f"ΣMx = {_terms(forces(3), 'moment', system)} = {_num(total(forces(3)), 'moment', system)} {m_unit}",
                  f"ΣMy about A = Σmy − Σa·Fz = {moments(4, 2, -1.0)} {m_unit}"]
    return (f"<h3>Overall equilibrium, combination {_e(combination)}</h3><p class=\"note\">The whole member as a free body: "
            "every factored load (line loads by their resultants) and every reaction. Each sum is zero to round-off.</p>"
            f'<div class="eq">{_e(chr(10).join(lines))}</div>')


def _diagrams_section(design: Design, report: CheckReport, combination: str, system: str) -> str:
    figure = build_figure(design, combination, report, system)
    caption = (f"Member, factored loads and diagrams for combination '{combination}' (the governing one). "
               "The dash-dot line marks the governing station.")
    planar = is_planar(design.member)
    convention = ("Beam convention for this in-plane member: V = −Vy is positive when it turns its segment clockwise, "
                  "M = Mz is positive when it bends the member concave upward (sagging)." if planar else
                  "The member is loaded out of its x-y plane, so Vz, My and T are drawn too, each positive along or about "
                  "the positive axis on the +x face of the left segment.")
    return f'<section id="diagrams"><h2>3. Internal actions and deflection</h2><p>{_e(convention)}</p>{_figure(figure, caption)}</section>'


# ----------------------------------------------------------------------------------------------
# method of sections

@dataclass(frozen=True)
class SegmentItem:
    """One force or couple on the left segment: position (m) and (Fx, Fy, Fz, Mx, My, Mz) in N, N*m
    (moments are the item's own couples; a line load's resultant acts at its centroid)."""

    label: str
    at: float
    vector: np.ndarray


@dataclass(frozen=True)
class SegmentBalance:
    """The left segment [0, x] of a combination and the actions that keep it in equilibrium."""

    combination: str
    x: float
    side: str
    items: list[SegmentItem]
    found: np.ndarray  # (6,) N, Vy, Vz, T, My, Mz from the equations
    analysis: np.ndarray  # (6,) the same from the analysis (MemberSolution.actions)


def _on_segment(at: float, x: float, side: str, tol: float) -> bool:
    return at <= x + tol if side == "right" else at < x - tol


def segment_items(design: Design, combination: str, x: float, side: str) -> list[SegmentItem]:
    """Every factored point load, reaction and line-load resultant on [0, x], taken from each case's
    solution (CaseSolution.point_items and line_items) times the combination's weights."""
    solution, member = design.solution, design.member
    tol = 1e-9 * member.length
    weights = solution.weights()[solution.combination_names.index(combination)]
    cases = list(solution.cases.items()) + ([("self-weight", solution.self_weight)] if solution.self_weight is not None else [])
    n_supports = len(member.supports)
    reactions = np.zeros((n_supports, 6))
    items: list[SegmentItem] = []
    for (name, case), weight in zip(cases, weights):
        if weight == 0.0 or case is None:
            continue
        at, forces = case.point_items()
        loads = forces[: len(at) - n_supports]
        reactions += weight * forces[len(at) - n_supports:]
        factor = "" if name == "self-weight" else f" ×{weight:g}"
        for position, vector in zip(at[: len(loads)], loads):
            if _on_segment(position, x, side, tol):
                items.append(SegmentItem(f"point load, case {name}{factor}", float(position), weight * vector))
        items += _line_items(case, weight, x, name, factor)
    for index, support in enumerate(member.supports):
        if _on_segment(support.at, x, side, tol):
            items.append(SegmentItem(f"reaction of S{index + 1} ({support.label})", support.at, reactions[index]))
    return items


def _line_items(case: Any, weight: float, x: float, name: str, factor: str) -> list[SegmentItem]:
    """Resultants of a case's line loads over [start, min(end, x)], one item per component, at the
    component's centroid (a pure couple when the resultant vanishes)."""
    items = []
    starts, ends, q_starts, q_ends = case.line_items()
    for start, end, q0, q1 in zip(starts, ends, q_starts, q_ends):
        stop = min(end, x)
        if stop <= start:
            continue
        length = stop - start
        q_stop = q0 + (q1 - q0) * (stop - start) / (end - start)
        for component, label in enumerate(("wx", "wy", "wz", "mx")):
            a, b = weight * q0[component], weight * q_stop[component]
            if a == 0.0 and b == 0.0:
                continue
            resultant = (a + b) / 2 * length
            first_moment = length * (a * (2 * start + stop) + b * (start + 2 * stop)) / 6  # ∫ q(s) s ds
            what = "self-weight" if name == "self-weight" else f"line load {label}, case {name}{factor}"
            items.append(_line_item(f"{what}, {start:g}–{stop:g} m", component, resultant, first_moment, start))
    return items


def _line_item(label: str, component: int, resultant: float, first_moment: float, start: float) -> SegmentItem:
    vector = np.zeros(6)
    index = 3 if component == 3 else component
    if abs(resultant) > 1e-12 * (1.0 + abs(first_moment)) or component in (0, 3):
        vector[index] = resultant
        at = first_moment / resultant if component in (1, 2) else start
        return SegmentItem(label + " (resultant)", at, vector)
    couple = np.zeros(6)  # zero resultant: a couple, moment about any point = first moment
    couple[5 if component == 1 else 4] = first_moment if component == 1 else -first_moment
    return SegmentItem(label + " (couple)", start, couple)


def segment_balance(design: Design, combination: str, x: float, side: str) -> SegmentBalance:
    """The equations of equilibrium of the left segment solved for the actions on its cut face:
    N = -ΣFx, Vy = -ΣFy, Vz = -ΣFz, T = -ΣMx, Mz = -ΣMz - Σ(a - x)Fy, My = -ΣMy + Σ(a - x)Fz."""
    items = segment_items(design, combination, x, side)
    found = np.zeros(6)
    for item in items:
        arm = item.at - x
        found[:4] -= item.vector[:4]
        found[4] += -item.vector[4] + arm * item.vector[2]
        found[5] += -item.vector[5] - arm * item.vector[1]
    analysis = design.solution.actions(combination, [x], side)[0]
    scale = max([float(np.abs(item.vector).max()) for item in items] + [float(np.abs(analysis).max()), 1.0])
    return SegmentBalance(combination, x, side, items, without_round_off(found, scale), without_round_off(analysis, scale))


def cut_side(design: Design, report: CheckReport, combination: str, x: float) -> str:
    """Which face of the cut to show: where the governing check's actions are larger (left on a tie),
    the right face at x = 0."""
    if x <= 1e-9 * design.member.length:
        return "right"
    left, right = (design.solution.actions(combination, [x], side)[0] for side in ("left", "right"))
    governing = report.governing
    columns = list(CHECK_ACTIONS.get(governing.check if governing else "", range(6)))
    return "right" if np.linalg.norm(right[columns]) > np.linalg.norm(left[columns]) * (1 + 1e-9) else "left"


def _cut_section(design: Design, report: CheckReport, combination: str, x: float, system: str) -> str:
    side = cut_side(design, report, combination, x)
    balance = segment_balance(design, combination, x, side)
    other = "right" if side == "left" else "left"
    other_actions = design.solution.actions(combination, [x], other)[0]
    mark = "⁻" if side == "left" else "⁺"
    where = _fmt(x, "length", system)
    intro = (f"<p>The member is cut at x = {where} (the governing station), just {'left' if side == 'left' else 'right'} of it "
             f"(x{mark}: items exactly at x are {'not ' if side == 'left' else ''}on the segment), in combination "
             f"<b>{_e(combination)}</b>. The left segment [0, {where}{mark}] is taken as a free body: the internal actions on its "
             "cut face (outward normal +x) balance every load and reaction on it.</p>")
    figure = _figure(build_free_body_figure(design, combination, x, side, system), "Free body of the left segment.")
    parts = ['<section id="cut"><h2>4. Method of sections at the governing cut</h2>', intro, figure,
             _items_table(balance, system), _equations(balance, design, system), _result_table(balance, system)]
    if np.any(np.abs(other_actions - balance.analysis) > 1e-9 * (1 + np.abs(balance.analysis).max())):
        values = ", ".join(f"{n} = {_fmt(v, k, system)}" for n, v, k in zip(ACTION_NAMES, other_actions, ACTION_KINDS))
        parts.append(f"<p class=\"note\">A concentrated item sits at x; on the other face (x{'⁺' if side == 'left' else '⁻'}) "
                     f"the actions are {values}.</p>")
    parts.append("</section>")
    return "\n".join(parts)


def _items_table(balance: SegmentBalance, system: str) -> str:
    shown = [i for i in range(6) if any(abs(item.vector[i]) > 0 for item in balance.items)] or [1]
    names = ("Fx", "Fy", "Fz", "Mx", "My", "Mz")
    rows = []
    for item in balance.items:
        arm = item.at - balance.x
        cells = [f"<td>{_e(item.label)}</td>", _cell(_fmt(item.at, "length", system), item.at),
                 _cell(_fmt(arm, "length", system), arm)]
        cells += [_cell(_fmt(item.vector[i], REACTION_KINDS[i], system), float(item.vector[i])) for i in shown]
        rows.append(_row(cells))
    return ("<h3>Loads and reactions on the segment</h3><p class=\"note\">a: position of the force (a line load's resultant "
            "at its centroid); a − x: its lever arm to the cut. Loads factored; reactions of the combination.</p>"
            + _table(["item", "a", "a − x"] + [names[i] for i in shown], rows, range(1, 3 + len(shown))))


def _terms(values: list[float], kind: str, system: str) -> str:
    """A sum written out term by term, e.g. "(24.74) + (−18.00)"."""
    if not values:
        return "0"
    return " + ".join(f"({_num(v, kind, system)})" for v in values)


def _equations(balance: SegmentBalance, design: Design, system: str) -> str:
    """The six equations of equilibrium of the segment with the numbers put in (display units)."""
    items, x = balance.items, balance.x
    f_unit, m_unit = units.unit_label("force", system), units.unit_label("moment", system)
    planar = is_planar(design.member)

    def column(i: int) -> list[float]:
        return [float(item.vector[i]) for item in items if item.vector[i] != 0.0]

    def arms(i: int) -> list[str]:
        return [f"({_num(item.at - x, 'length', system)})·({_num(item.vector[i], 'force', system)})" for item in items if item.vector[i] != 0.0]

    found = balance.found
    lines = [
        f"ΣFx = 0:  N + ΣFx = 0   ⇒  N = −[{_terms(column(0), 'force', system)}] = {_num(found[0], 'force', system)} {f_unit}",
        f"ΣFy = 0:  Vy + ΣFy = 0  ⇒  Vy = −[{_terms(column(1), 'force', system)}] = {_num(found[1], 'force', system)} {f_unit}",
        f"ΣMz about the cut = 0:  Mz + ΣMz + Σ(a − x)·Fy = 0\n"
        f"   ⇒  Mz = −[{_terms(column(5), 'moment', system)}] − [{' + '.join(arms(1)) or '0'}]\n"
        f"        = {_num(found[5], 'moment', system)} {m_unit}",
    ]
    if not planar or any(column(2)) or any(column(3)) or any(column(4)):
        lines += [
            f"ΣFz = 0:  Vz + ΣFz = 0  ⇒  Vz = −[{_terms(column(2), 'force', system)}] = {_num(found[2], 'force', system)} {f_unit}",
            f"ΣMx = 0:  T + ΣMx = 0   ⇒  T = −[{_terms(column(3), 'moment', system)}] = {_num(found[3], 'moment', system)} {m_unit}",
            f"ΣMy about the cut = 0:  My + ΣMy − Σ(a − x)·Fz = 0\n"
            f"   ⇒  My = −[{_terms(column(4), 'moment', system)}] + [{' + '.join(arms(2)) or '0'}]\n"
            f"        = {_num(found[4], 'moment', system)} {m_unit}",
        ]
    if planar:
        lines.append(f"Beam convention:  V = −Vy = {_num(-found[1], 'force', system)} {f_unit},   "
                     f"M = Mz = {_num(found[5], 'moment', system)} {m_unit}")
    note = ("<p class=\"note\">Moments about the cut point of a force F at a: (a − x) ex × F, so Fy turns about +z with "
            "(a − x)·Fy and Fz about +y with −(a − x)·Fz. Terms in " + _e(f_unit) + " and " + _e(m_unit) +
            ", lengths in m, rounded to 4 significant figures; the sums use the full values.</p>")
    return "<h3>Equilibrium of the segment</h3>" + note + f'<div class="eq">{_e(chr(10).join(lines))}</div>'


def _result_table(balance: SegmentBalance, system: str) -> str:
    rows = []
    for i, name in enumerate(ACTION_NAMES):
        found, analysis = float(balance.found[i]), float(balance.analysis[i])
        rows.append(_row([f"<td>{name}</td>", _cell(_fmt(found, ACTION_KINDS[i], system), found),
                          _cell(_fmt(analysis, ACTION_KINDS[i], system), analysis)], attrs=f' data-action="{name}"'))
    return ("<h3>Actions on the cut face</h3><p class=\"note\">From the equations above, and from the analysis "
            "(stiffness method, then the same method of sections in closed form); they agree.</p>"
            + _table(["action", "from the equations", "from the analysis"], rows, (1, 2)))


# ----------------------------------------------------------------------------------------------
# checks, verdict, assumptions

def _check_value(entry: dict[str, Any], value: float | None, system: str) -> str:
    if value is None:
        return "—"
    if entry["quantity"] == "ratio":
        return f"{value:.3f}"
    return units.fmt(value, QUANTITY_KINDS[entry["quantity"]], system)


def _bar(utilization: float) -> str:
    width = min(utilization, 1.0) * 100
    over = " over" if utilization > 1.0 else ""
    return f'<span class="bar{over}"><span style="width:{width:.0f}%"></span></span>'


def _check_row(entry: dict[str, Any], governing: str | None, system: str) -> str:
    attrs = f' data-check="{_e(entry["check"])}"'
    if not entry["made"]:
        return _row([f"<td>{_e(entry['check'])}</td>", '<td class="num">—</td>' * 3, "<td></td>", '<td class="num">—</td>',
                     "<td>—</td>", "<td>not made</td>", f"<td>{_e(entry['detail'])}</td>"], css="not-made", attrs=attrs)
    utilization = entry["utilization"]
    status = '<td class="fails">FAILS</td>' if utilization > 1.0 else '<td class="ok">ok</td>'
    if entry["check"] == governing:
        status = status.replace("</td>", " · governs</td>")
    cells = [f"<td>{_e(entry['check'])}</td>",
             _cell(_check_value(entry, entry["demand"], system), entry["demand"], "demand"),
             _cell(_check_value(entry, entry["allowable"], system), entry["allowable"], "allowable"),
             _cell(f"{utilization:.3f}", utilization, "utilization"),
             f"<td>{_bar(utilization)}</td>", _cell(_fmt(entry["at"], "length", system), entry["at"]),
             f"<td>{_e(entry['combination'])}</td>", status, f"<td>{_e(entry['detail'])}</td>"]
    return _row(cells, css="governing" if entry["check"] == governing else "", attrs=attrs)


def _checks_section(document: dict[str, Any], system: str) -> str:
    rows = [_check_row(entry, document["governing"], system) for entry in document["checks"]]
    table = _table(["check", "demand", "allowable", "utilization", "", "at", "combination", "status", "basis"], rows, (1, 2, 3, 5))
    text = ("<p>Stresses come from the full cross-section stress field (sectionproperties' unit stress fields at every mesh "
            "node, combined linearly for the actions at every station and combination); each demand is the peak over the section "
            "and the member. Utilization = demand / allowable; the interaction check is the sum fa/Fa + fb/Fb itself. "
            "Deflections are relative to the span's supports.</p>")
    return f'<section id="checks"><h2>5. Stresses and checks</h2>{text}{table}</section>'


def _final_verdict(document: dict[str, Any], system: str) -> str:
    css = "pass" if document["passes"] else "fail"
    return (f'<section id="final"><h2>6. Verdict</h2><div class="verdict {css}">{_verdict_text(document, system)}</div>'
            "<p class=\"note\">The section passes when every check that could be made has a utilization of 1.000 or less.</p></section>")


def _assumptions_section(notes: list[str]) -> str:
    items = "".join(f"<li>{_e(note)}</li>" for note in notes)
    return f'<section id="assumptions"><h2>7. Assumptions</h2><ul class="notes">{items}</ul></section>'
