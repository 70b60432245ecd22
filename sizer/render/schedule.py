"""Output of `sizer schedule` and `sizer span-table`: terminal tables, JSON, CSV, the schedule's HTML
record (linking each member's own calculation record) and the span-table plot.

Everything here works on the JSON documents (plain dicts in SI base units), so every form shows the
same numbers.
"""

from __future__ import annotations

import csv
import io
import math
import re
from typing import TYPE_CHECKING, Any, Sequence

from sizer import units
from sizer.printable import printable
from sizer.render.common import cautions_panel, notes_panel
from sizer.results.notes import CAUTIONS
from sizer.render.phrases import in_display_units

if TYPE_CHECKING:
    from sizer.render.text import Ledger
    from rich.table import Table
    from rich.console import JustifyMethod

SCHEDULE_CSV_COLUMNS = (("mark", "mark"), ("file", "file"), ("do", "do"), ("section", "section"), ("passes", "passes"),
                        ("utilization", "utilization"), ("governing", "governing"), ("mass_per_length", "mass_per_length_kg_per_m"),
                        ("quantity", "quantity"), ("length", "length_m"), ("total_mass", "total_mass_kg"), ("reserve_factor", "reserve_factor"),
                        ("cost", "cost"), ("currency", "currency"))
ORDER_CSV_COLUMNS = ("order_section", "pieces", "total_length_m", "mass_kg", "cost", "currency", "bars_to_order", "metres_bought_m", "offcut_m")
CHECK_SHORT = {"axial": "axial", "bending": "bend", "interaction": "inter", "shear": "shear", "equivalent": "equiv",
               "deflection": "defl", "buckling": "buck", "lateral-torsional": "LTB", "local": "local", "web": "web",
               "second-order": "2nd"}


# ----------------------------------------------------------------------------------------------
# schedule: documents

def schedule_csv(document: dict) -> str:
    """One line per member (SI base units; the column names carry the units), then the cautions as
    comment lines."""
    out = io.StringIO()
    writer = _TextOnlyWriter(out)
    writer.writerow([header for _, header in SCHEDULE_CSV_COLUMNS])
    for row in document["members"]:
        writer.writerow(["" if row[key] is None else _csv_value(row[key]) for key, _ in SCHEDULE_CSV_COLUMNS])
    for error in document["bad_rows"]:
        writer.writerow([error["mark"], "", "", "", "", "", f"bad input: {error['message']}"])
    totals = document["totals"]
    if orders_to_show(totals):
        writer.writerow([])
        writer.writerow(ORDER_CSV_COLUMNS)
    for entry in totals["by_section"] if orders_to_show(totals) else ():
        writer.writerow([entry["section"], entry["quantity"], repr(entry["length"]), repr(entry["mass"]),
                         "" if entry.get("cost") is None else repr(entry["cost"]), totals.get("currency") or "",
                         bars_to_order_text(entry), repr(entry.get("metres", 0.0)), repr(entry.get("offcut", 0.0))])
    for caution in CAUTIONS:
        writer.writerow([f"# {caution}"])
    return out.getvalue()


def orders_to_show(totals: dict) -> bool:
    """Whether the catalogue gave prices or stock lengths for a section of the totals (then the cost
    and the bars to order are shown)."""
    return bool(totals.get("ordering"))


def bars_to_order_text(entry: dict, system: str = "si") -> str:
    """A section's bars to order in words: "4 x 12.00 m + 1 x 6.000 m" (and any pieces no bar is long enough for)."""
    parts = [f"{bar['count']} x {units.fmt(bar['length'], 'length', system)}" + (" cut to length" if bar["cut_to_length"] else "")
             for bar in entry.get("bars", [])]
    missing = [f"{units.fmt(length, 'length', system)} pieces: longer than every stock length" for length in entry.get("not_available", [])]
    return " + ".join(parts) + ("; " if parts and missing else "") + "; ".join(missing)


class _TextOnlyWriter:
    """A CSV writer whose text cells have their control characters written as visible escapes
    (sizer.printable): a mark or name cannot send escape sequences to whoever prints the file; nor
    can it become a spreadsheet formula (`inert`)."""

    def __init__(self, out: io.StringIO) -> None:
        self.writer = csv.writer(out, lineterminator="\n")

    def writerow(self, cells: Sequence[Any]) -> None:
        self.writer.writerow([inert(printable(cell)) if isinstance(cell, str) else cell for cell in cells])


FORMULA_STARTS = ("=", "+", "-", "@")  # what makes a spreadsheet read a cell as a formula (OWASP, CSV injection)


def inert(text: str) -> str:
    """A text cell that a spreadsheet opening the CSV file shows as text: one that starts as a formula
    would ("=", "+", "-", "@") and is not a number gets a leading apostrophe (OWASP's advice on CSV
    injection); numbers (a negative value's "-1.5") and other text are kept as they are."""
    if not text.startswith(FORMULA_STARTS):
        return text
    try:
        float(text)
    except ValueError:
        return "'" + text
    return text


def _csv_value(value: Any) -> Any:
    return repr(value) if isinstance(value, float) else value


# ----------------------------------------------------------------------------------------------
# schedule: terminal

def schedule_renderables(document: dict, system: str) -> list[Any]:
    """The members table, totals by section, bad rows, assumptions and cautions, in `system`'s units."""
    from rich.text import Text

    parts: list[Any] = [Text(document["title"] or "Schedule", style="bold"), _members_table(document["members"], system),
                        _totals_table(document["totals"], system)]
    totals = document["totals"]
    parts.append(Text("Every member passes." if totals["passes"] else f"These members fail: {', '.join(totals['failing'])}.", style="bold"))
    if document["bad_rows"]:
        parts.append(notes_panel([error["message"] for error in document["bad_rows"]], "Bad rows (not run)"))
    parts.append(notes_panel(shown_notes(document["members"], document["assumptions"]), system=system))
    parts.append(cautions_panel())
    return parts


def shown_notes(rows: list[dict], run_notes: list[str]) -> list[str]:
    """The assumptions once each: those every member shares, the schedule's own (overrides), the run's;
    a last line says where each member's own are (its JSON and its calculation record)."""
    shared = set.intersection(*(set(row["assumptions"]) for row in rows)) if rows else set()
    notes = [note for note in rows[0]["assumptions"] if note in shared] if rows else []
    for row in rows:
        own = [note for note in row["assumptions"] if note not in shared]
        marked = [note for note in own if note.startswith(f"{row['mark']}: ")]
        notes += marked
    if rows:
        notes.append("Each member's own assumptions (its section and self-weight, supports and restraints for stability, deflection "
                     "limits, stations and mesh) are listed with it in --json and in its calculation record (-o).")
    return list(dict.fromkeys(notes + run_notes))


def _members_table(rows: list[dict], system: str) -> Ledger:
    """The members as a ledger: a column that does not fit at the terminal's width moves to the row's
    second line with its header (a number is never cut short)."""
    from rich.markup import escape

    from sizer.render.text import Column, Ledger

    priced = any(row.get("cost") is not None for row in rows)
    columns = [Column("mark"), Column("do"), Column("section"), Column("util.", right=True), Column("reserve", right=True, fold=True),
               Column("governing"), Column("verdict"), Column(units.unit_label("mass_per_length", system), right=True, fold=True),
               Column("qty", right=True, fold=True), Column("length", right=True, fold=True), Column("mass", right=True, fold=True)]
    columns += [Column("cost", right=True, fold=True)] if priced else []
    table = Ledger("Members", columns)
    for row in rows:
        utilization = row["utilization"]
        verdict = "passes" if row["passes"] else ("[reverse]nothing passes[/]" if row["section"] is None else "[reverse]fails[/]")
        reserve = row.get("reserve_factor")
        table.add_row(escape(row["mark"]), row["do"], escape(row["section"] or "none passes"), _utilization_text(utilization),
                      "—" if reserve is None else f"{reserve:.2f}",
                      row["governing"] or "—", verdict, _number(row["mass_per_length"], 1, "mass_per_length", system), str(row["quantity"]),
                      units.fmt(row["length"], "length", system, digits=3), _mass(row["total_mass"], system),
                      *([_money(row.get("cost"), row.get("currency"))] if priced else []))
    return table


def _money(value: float | None, currency: str | None) -> str:
    from sizer.render.cost import money

    return "—" if value is None else money(value, currency)


def _utilization_text(value: float | None) -> str:
    """The utilization to 3 decimals, emphasised as `sizer check` does where it fails."""
    from sizer.render.check import utilization_style

    if value is None:
        return "—"
    style = utilization_style(value)
    return f"[{style}]{value:.3f}[/]" if style else f"{value:.3f}"


def _totals_table(totals: dict, system: str) -> Table:
    from rich import box
    from rich.table import Table

    table = Table(title="Totals by section (for ordering)", title_justify="left", header_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
    ordering = orders_to_show(totals)
    columns: tuple[tuple[str, JustifyMethod], ...] = (("section", "left"), ("pieces", "right"), ("total length", "right"), ("mass", "right"))
    for name, justify in columns + ((("cost", "right"), ("bars to order", "left")) if ordering else ()):
        table.add_column(name, justify=justify, no_wrap=name != "bars to order")
    currency = totals.get("currency")
    for entry in totals["by_section"]:
        table.add_row(entry["section"], str(entry["quantity"]), units.fmt(entry["length"], "length", system), _mass(entry["mass"], system),
                      *((_money(entry.get("cost"), currency), bars_to_order_text(entry, system)) if ordering else ()))
    total_cost = totals.get("cost")
    cost_text = _money(total_cost, currency) if total_cost is not None else (
        f"≥ {_money(totals.get('priced_cost'), currency)}" if totals.get("priced_cost") else "—")
    table.add_row("[bold]all[/]", str(sum(e["quantity"] for e in totals["by_section"])),
                  units.fmt(sum(e["length"] for e in totals["by_section"]), "length", system), f"[bold]{_mass(totals['mass'], system)}[/]",
                  *((f"[bold]{cost_text}[/]", "") if ordering else ()))
    return table


def _number(value: float | None, decimals: int, kind: str, system: str) -> str:
    """An SI value in `system`'s display unit of `kind`, to `decimals` decimals, without its unit."""
    return "—" if value is None else f"{units.to_display(value, kind, system):.{decimals}f}"


def _mass(value: float | None, system: str) -> str:
    """A mass (kg) in whole display units with the unit: "507 kg", "1118 lb"."""
    return "—" if value is None else f"{_number(value, 0, 'mass', system)} {units.unit_label('mass', system)}"


# ----------------------------------------------------------------------------------------------
# schedule: HTML record

def record_names(marks: Sequence[str]) -> dict[str, str]:
    """A file name for each member's calculation record (from its mark; unique)."""
    names: dict[str, str] = {}
    for index, mark in enumerate(marks, start=1):
        stem = re.sub(r"[^A-Za-z0-9._-]+", "_", mark).strip("._") or "member"
        name = f"{stem}.html"
        if name.lower() in {known.lower() for known in names.values()}:
            name = f"{stem}-{index}.html"
        names[mark] = name
    return names


def schedule_html(document: dict, links: dict[str, str], system: str) -> str:
    """The schedule's HTML record: verdict, cautions, the members (each linking its calculation record
    where made), totals, bad rows and assumptions; the JSON document embedded whole."""
    from sizer import __version__
    from sizer.render.common import dumps
    from sizer.render.report.markup import STYLE, _e

    title = document["title"] or "Schedule"
    totals = document["totals"]
    verdict = ("<div class=\"verdict pass\"><span class=\"word\">passes</span>every member passes every check</div>" if totals["passes"]
               else f"<div class=\"verdict fail\"><span class=\"word\">fails</span>these members fail: {_e(', '.join(totals['failing']))}</div>")
    cautions = "".join(f"<li>{_e(c)}</li>" for c in CAUTIONS)
    member_rows = "".join(_member_html_row(row, links.get(row["mark"]), system) for row in document["members"])
    total_rows = "".join(f"<tr><td>{_e(e['section'])}</td><td class=\"num\">{e['quantity']}</td><td class=\"num\">{_e(units.fmt(e['length'], 'length', system))}</td>"
                         f"<td class=\"num\">{_mass(e['mass'], system)}</td></tr>" for e in totals["by_section"])
    bad = "".join(f"<li>{_e(error['message'])}</li>" for error in document["bad_rows"])
    notes = "".join(f"<li>{_e(in_display_units(note, system))}</li>" for note in shown_notes(document["members"], document["assumptions"]))
    data = dumps(document).replace("</", "<\\/")
    body = (f"<header><h1>Schedule: {_e(title)}</h1><p class=\"meta\">made by sizer {_e(__version__)}</p></header>{verdict}"
            f"<section class=\"cautions\"><h2>⚠ Cautions</h2><ul>{cautions}</ul></section>"
            "<h2>Members</h2><table><tr><th>mark</th><th>do</th><th>section</th><th class=\"num\">utilization</th><th>governing</th>"
            f"<th>verdict</th><th class=\"num\">{units.unit_label('mass_per_length', system)}</th><th class=\"num\">quantity</th><th class=\"num\">length</th><th class=\"num\">mass</th>"
            f"<th>calculation record</th></tr>{member_rows}</table>"
            "<h2>Totals by section</h2><table><tr><th>section</th><th class=\"num\">pieces</th><th class=\"num\">total length</th>"
            f"<th class=\"num\">mass</th></tr>{total_rows}<tr><td><b>all</b></td><td class=\"num\">{sum(e['quantity'] for e in totals['by_section'])}</td>"
            f"<td class=\"num\">{_e(units.fmt(sum(e['length'] for e in totals['by_section']), 'length', system))}</td>"
            f"<td class=\"num\"><b>{_mass(totals['mass'], system)}</b></td></tr></table>"
            + (f"<h2>Bad rows (not run)</h2><ul class=\"notes\">{bad}</ul>" if bad else "")
            + f"<h2>Assumptions</h2><ul class=\"notes\">{notes}</ul>"
            f"<section class=\"cautions\"><h2>⚠ Cautions</h2><ul>{cautions}</ul></section>"
            "<footer>The embedded data (id sizer-data) is the <code>sizer schedule --json</code> document in SI base units.</footer>")
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            f"<title>Schedule: {_e(title)}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n<main>\n{body}\n</main>\n"
            f"<script type=\"application/json\" id=\"sizer-data\">{data}</script>\n</body>\n</html>\n")


def _member_html_row(row: dict, link: str | None, system: str) -> str:
    from sizer.render.report.markup import _e

    utilization = row["utilization"]
    verdict = ("<td class=\"ok\">passes</td>" if row["passes"]
               else f"<td class=\"fails\">{'nothing passes' if row['section'] is None else 'fails'}</td>")
    record = f"<a href=\"{_e(link)}\">{_e(link)}</a>" if link else "— (no section passes)" if row["section"] is None else "—"
    return (f"<tr><td>{_e(row['mark'])}</td><td>{_e(row['do'])}</td><td>{_e(row['section'] or '—')}</td>"
            f"<td class=\"num\">{f'{utilization:.3f}' if utilization is not None else '—'}</td><td>{_e(row['governing'] or '—')}</td>{verdict}"
            f"<td class=\"num\">{_number(row['mass_per_length'], 1, 'mass_per_length', system)}</td><td class=\"num\">{row['quantity']}</td>"
            f"<td class=\"num\">{_e(units.fmt(row['length'], 'length', system))}</td><td class=\"num\">{_mass(row['total_mass'], system)}</td><td>{record}</td></tr>")


# ----------------------------------------------------------------------------------------------
# span table

def _load_text(value: float, kind: str, system: str) -> str:
    return units.fmt(value, "force_per_length" if kind == "line" else "force", system, digits=3)


def _columns(document: dict, system: str) -> list[str]:
    """Column headings: the loads (mode span) or the spans (mode load)."""
    first = document["sections"][0]["rows"] if document["sections"] else []
    if document["mode"] == "span":
        return [_load_text(row["load"], row["kind"], system) for row in first]
    return [units.fmt(row["length"], "length", system, digits=3) for row in first]


def _span_text(value: float, resolution: float, system: str) -> str:
    """A span in display length units with as many decimals as the resolution needs (10 mm: 2)."""
    step = units.to_display(resolution, "length", system)
    decimals = max(0, math.ceil(-math.log10(step) - 1e-9))
    return f"{units.to_display(value, 'length', system):.{decimals}f} {units.unit_label('length', system)}"


def _cell_text(row: dict, mode: str, resolution: float | None, system: str) -> str:
    value = row["longest_span"] if mode == "span" else row["largest_load"]
    if value is None:
        return "none"
    if mode == "span":
        assert resolution is not None  # a span table has its resolution
        text = _span_text(value, resolution, system)
    else:
        text = _load_text(value, row["kind"], system)
    if row["beyond_limit"]:
        return "≥ " + text
    return f"{text} {CHECK_SHORT.get(row['governing'], row['governing'] or '')}"


def span_table_renderables(document: dict, width: int, system: str) -> list[Any]:
    """The table (sections down, columns across, split to fit `width`), the key, assumptions, cautions,
    in `system`'s units."""
    from rich import box
    from rich.table import Table
    from rich.text import Text

    mode = document["mode"]
    headings = _columns(document, system)
    per_table = max(1, (width - 26) // 17)
    what = "Longest span for each load" if mode == "span" else "Largest load at each span"
    parts: list[Any] = [Text(f"{document['title'] or 'Span table'}: {what.lower()}", style="bold")]
    for first in range(0, len(headings), per_table):
        shown = range(first, min(first + per_table, len(headings)))
        table = Table(title=what if first == 0 else None, title_justify="left", header_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
        table.add_column("section", no_wrap=True)
        table.add_column(units.unit_label("mass_per_length", system), justify="right", no_wrap=True)
        for k in shown:
            table.add_column(headings[k], justify="right", no_wrap=True)
        for entry in document["sections"]:
            table.add_row(entry["section"], _number(entry["mass_per_length"], 1, "mass_per_length", system),
                          *(_cell_text(entry["rows"][k], mode, document["resolution"], system) for k in shown))
        parts.append(table)
    key = ", ".join(f"{short} = {name}" for name, short in CHECK_SHORT.items() if short != name)
    parts.append(Text(f"After each value: the check that fails just beyond it ({key}); ≥: still passing at the search limit; "
                      "none: fails even at the smallest step.", style="dim"))
    parts.append(notes_panel(document["assumptions"], system=system))
    parts.append(cautions_panel())
    return parts


def span_table_csv(document: dict) -> str:
    """One line per cell (SI base units in the column names), then the cautions as comment lines."""
    out = io.StringIO()
    writer = _TextOnlyWriter(out)
    mode = document["mode"]
    if mode == "span":
        writer.writerow(["section", "mass_per_length_kg_per_m", "load_kind", "load_N_per_m_or_N", "longest_span_m", "governing", "beyond_limit"])
    else:
        writer.writerow(["section", "mass_per_length_kg_per_m", "length_m", "load_kind", "largest_load_N_per_m_or_N", "governing", "beyond_limit"])
    for entry in document["sections"]:
        for row in entry["rows"]:
            found = row["longest_span"] if mode == "span" else row["largest_load"]
            first = [row["kind"], repr(row["load"])] if mode == "span" else [repr(row["length"]), row["kind"]]
            writer.writerow([entry["section"], repr(entry["mass_per_length"]), *first, "" if found is None else repr(found),
                             row["governing"] or "", row["beyond_limit"]])
    for caution in CAUTIONS:
        writer.writerow([f"# {caution}"])
    return out.getvalue()


def span_curves(document: dict) -> list[tuple[str, list[float], list[float]]]:
    """(section, spans in m, loads in N/m or N, signed as in the table) for each section, cells with a value only."""
    curves = []
    for entry in document["sections"]:
        points = [(row["longest_span"], row["load"]) if document["mode"] == "span" else (row["length"], row["largest_load"])
                  for row in entry["rows"] if (row["longest_span"] if document["mode"] == "span" else row["largest_load"]) is not None]
        points.sort()
        curves.append((entry["section"], [p[0] for p in points], [p[1] for p in points]))
    return curves


FAMILY_INKS = ("#1d3557", "#a23b2a", "#2d6a4f", "#7b4f9d", "#b7791f", "#2b7a8c", "#555555", "#c2185b", "#6b8e23", "#8d6e63")
DASHES = ("-", "--", ":", "-.")
MARKS = "osD^vP"


def family_of(name: str) -> str:
    """A section's family for the plot: its name up to the first digit ("IPE 200" -> "IPE", "HE 100 A" -> "HE")."""
    head = re.split(r"\d", name, maxsplit=1)[0].strip()
    return head or name


def series_styles(names: Sequence[str]) -> list[dict[str, Any]]:
    """One look per series: a colour per family (FAMILY_INKS, in the order families first appear),
    and within a family a different dash and marker for each member, so no two series look alike."""
    families: dict[str, int] = {}
    count: dict[str, int] = {}
    looks = []
    for name in names:
        family = family_of(name)
        families.setdefault(family, len(families))
        k = count.get(family, 0)
        count[family] = k + 1
        looks.append({"color": FAMILY_INKS[families[family] % len(FAMILY_INKS)], "linestyle": DASHES[k % len(DASHES)],
                      "marker": MARKS[(k // len(DASHES) + families[family]) % len(MARKS)]})
    return looks


def span_plot_bytes(document: dict, image_format: str, system: str) -> bytes:
    """Load against span, one curve per section (matplotlib, imported here): a colour per family and
    a dash and marker per section, the legend beside the plot; the loads signed as in the table
    (negative: downward) with the heavier load drawn higher up."""
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    kinds = {row["kind"] for entry in document["sections"] for row in entry["rows"]}
    kind = "force_per_length" if kinds == {"line"} else "force" if kinds == {"point"} else None
    curves = span_curves(document)
    columns = 1 + len(curves) // 24
    figure = Figure(figsize=(8 + 1.7 * columns, 6), dpi=120)
    axes = figure.add_axes((0.08, 0.1, 0.62 if columns == 1 else 0.5, 0.82))
    for (name, spans, loads), look in zip(curves, series_styles([c[0] for c in curves])):
        if spans:
            axes.plot([units.to_display(v, "length", system) for v in spans], [units.to_display(v, kind, system) if kind else v for v in loads],
                      markersize=3.5, linewidth=1.2, label=name, **look)
    if curves and all(v <= 0 for _, _, loads in curves for v in loads):
        axes.invert_yaxis()  # downward loads are negative: the heavier load drawn higher up
    axes.set_xlabel(f"span ({units.unit_label('length', system)})")
    unit = f"{units.unit_label(kind, system)}" if kind else "N/m for uniform, N for point loads"
    axes.set_ylabel(f"load as in the table ({unit}; negative: downward)")
    axes.set_title(("Longest span for each load" if document["mode"] == "span" else "Largest load at each span")
                   + ": every check passes on and below each curve", fontsize=10, loc="left")
    axes.grid(True, linewidth=0.4, alpha=0.6)
    axes.legend(fontsize=6.5, ncol=columns, loc="upper left", bbox_to_anchor=(1.02, 1.0), borderaxespad=0.0, frameon=False,
                title="section (colour: family)", title_fontsize=7)
    figure.text(0.01, 0.01, "Check against the governing code before use; see the cautions in the table's output.", fontsize=7, color="0.35")
    buffer = io.BytesIO()
    figure.savefig(buffer, format=image_format, bbox_inches="tight")
    return buffer.getvalue()

