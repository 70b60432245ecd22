"""The calculation record as one HTML document, and writing it: the header, verdict and cautions,
the contents, the sections in order (inputs, reactions, diagrams of the governing and of every
combination, the cut, checks, the governing station by hand, stability, verdict, assumptions in
display units), the cautions again, and the `sizer check --json` document embedded whole (SI base
units); an HTML file, or HTML beside a PDF when weasyprint is importable.
"""

from __future__ import annotations

import datetime
import importlib.util
from pathlib import Path
from typing import Sequence

from sizer import __version__
from sizer.checks import CheckReport
from sizer.design import Design
from sizer.errors import InputError
from sizer.files import check_output, write_atomic
from sizer.render.common import combinations_words, dumps, patterned
from sizer.results.check import check_json
from sizer.results.forces import is_planar
from sizer.results.notes import CAUTIONS
from sizer.render.plots.figure import build_figure
from sizer.render.basis import basis_text
from sizer.render.report.by_hand import by_hand_section
from sizer.render.report.checks import checks_section, final_verdict, verdict_box
from sizer.render.report.equilibrium import cut_section, reactions_section
from sizer.render.report.inputs import inputs_section
from sizer.render.report.markup import STYLE, _e, _figure
from sizer.render.report.segment import governing_cut
from sizer.render.report.stability import stability_section
from sizer.render.phrases import in_display_units

REPORT_SUFFIXES = (".html", ".htm", ".pdf")


def check_report_path(path: str | Path, inputs: Sequence[str | Path] = ()) -> None:
    """InputError unless `path` ends in .html, .htm or .pdf and sizer may write it (files.check_output;
    `inputs`: the files the command reads); a PDF also needs weasyprint and the HTML beside it.
    Checked before any work."""
    path = Path(path)
    if path.suffix.lower() not in REPORT_SUFFIXES:
        raise InputError("", "-o", f"cannot write a report to {str(path)!r}: the file name must end in .html (or .pdf)",
                         "give a file name such as record.html")
    if path.suffix.lower() == ".pdf":
        if importlib.util.find_spec("weasyprint") is None:
            raise InputError("", "-o", f"cannot make the PDF {str(path)!r}: weasyprint is not installed",
                             "give -o record.html and print it to PDF from a browser, or install weasyprint")
        check_output(path.with_suffix(".html"), "-o", inputs)
    check_output(path, "-o", inputs)


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
        import weasyprint
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
        verdict_box(document, system),
        _cautions_box(),
        _contents(),
        inputs_section(design, system),
        reactions_section(design, document, combination, system),
        _diagrams_section(design, report, combination, system),
        cut_section(design, report, combination, x, system),
        checks_section(document, system, [basis_text(result, design, report, system) for result in report.checks]),
        by_hand_section(design, report, system),
        stability_section(design, report, system),
        final_verdict(document, system),
        _assumptions_section(notes, system),
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


def _header(design: Design, title: str) -> str:
    member = design.member
    source = _e(member.source) if member.source else "(built in memory)"
    today = datetime.date.today().isoformat()
    return (f"<header><h1>Calculation record: {_e(title)}</h1>"
            f"<p class=\"meta\">Member file {source} · section {_e(design.spec.name)} · made by sizer {_e(__version__)} on {today}</p></header>")


def _cautions_box(final: bool = False) -> str:
    items = "".join(f"<li>{_e(c)}</li>" for c in CAUTIONS)
    ident = "cautions-end" if final else "cautions"
    return f'<section class="cautions" id="{ident}"><h2>⚠ Cautions</h2><ul>{items}</ul></section>'


def _contents() -> str:
    entries = [("inputs", "Inputs"), ("reactions", "Reactions"), ("diagrams", "Internal actions and deflection"),
               ("cut", "Method of sections at the governing cut"), ("checks", "Stresses and checks"),
               ("by-hand", "The governing station by hand"), ("stability", "Stability"), ("final", "Verdict"),
               ("assumptions", "Assumptions")]
    items = "".join(f'<li><a href="#{key}">{_e(name)}</a></li>' for key, name in entries)
    return f"<nav><ol>{items}</ol></nav>"


COMBINATIONS_DRAWN = 20  # combinations drawn one by one in the record; beyond, their envelope only


def _diagrams_section(design: Design, report: CheckReport, combination: str, system: str) -> str:
    """The governing combination's member, loads and diagrams, then every combination together
    (when there are several, up to COMBINATIONS_DRAWN), each deflected shape with its direction, and
    the envelope of them all where loads are patterned or there are more."""
    from sizer.render.plots.combinations import build_combinations_figure
    from sizer.render.plots.envelope import build_envelope_figure

    figure = build_figure(design, combination, report, system, buckled=False)
    caption = (f"Member, factored loads and diagrams for combination '{combination}' (the governing one). "
               "The dash-dot line marks the governing station; the largest deflection is marked with its direction.")
    every = ""
    names = list(design.solution.combination_names)
    if 1 < len(names) <= COMBINATIONS_DRAWN and not patterned(design.member):  # pattern arrangements: their envelope only
        every = _figure(build_combinations_figure(design, system), "Every combination: the internal actions and the deflected "
                        "shape of each, one line style per combination.")
    if len(names) > 1 and (design.member.patterning is not None or len(names) > COMBINATIONS_DRAWN):
        every += _figure(build_envelope_figure(design, names, system), f"The envelope over {combinations_words(design.member, len(names))}: the largest and smallest value at each station, with the combination that gives "
                         "each extreme.")
    planar = is_planar(design.member)
    convention = ("Beam convention for this in-plane member: V = -Vy is positive when it turns its segment clockwise, "
                  "M = Mz is positive when it bends the member concave upward (sagging)." if planar else
                  "The member is loaded out of its x-y plane, so Vz, My and T are drawn too, each positive along or about "
                  "the positive axis on the +x face of the left segment.")
    return (f'<section id="diagrams"><h2>3. Internal actions and deflection</h2><p>{_e(convention)}</p>{_figure(figure, caption)}'
            f"{every}</section>")


def _assumptions_section(notes: list[str], system: str) -> str:
    items = "".join(f"<li>{_e(in_display_units(note, system))}</li>" for note in notes)
    return f'<section id="assumptions"><h2>9. Assumptions</h2><ul class="notes">{items}</ul></section>'
