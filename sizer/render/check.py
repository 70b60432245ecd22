"""`sizer check` output: the verdict, the checks, the reactions, assumptions and cautions in the
terminal (the JSON document is sizer.results.check).

The terminal look is our own: each check is one row of numbers with its basis as a dim line under
it (render.basis); a neutral gauge (no colour scale) shows the utilization against a mark at 1.0; a
failing row's status is shown in reverse video, the governing row in bold with "governs" in its basis
line. The words are one pair everywhere: "passes" and "fails"."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

import math

from sizer import units
from sizer.checks import CheckReport, CheckResult, spans
from sizer.design import Design
from sizer.render.basis import basis_text, combination_text
from sizer.render.axis_names import inertia_pair
from sizer.render.common import cautions_panel, notes_panel, patterned
from sizer.render.forces import plural, reactions_ledger_values
from sizer.results.jsonable import reactions_without_round_off
from sizer.render.text import Column, Heading, Ledger, Paragraph
from sizer.results.check import second_order_json

if TYPE_CHECKING:
    from rich.console import Console, ConsoleOptions, RenderResult

QUANTITY_KINDS = {"stress": "stress", "deflection": "deflection", "force": "force"}
GAUGE_WIDTH = 6  # cells from 0 to a utilization of 1.0
REACTIONS_LISTED = 12  # combinations whose reactions are listed one by one; beyond, their largest and smallest
PASSES, FAILS = "passes", "fails"  # the one pair of status words of every output


# ----------------------------------------------------------------------------------------------
# terminal

def status_word(passes: bool) -> str:
    return PASSES if passes else FAILS


def utilization_style(value: float) -> str:
    """The emphasis of a utilization (a rich style): reverse video when over 1.0 (it fails), none
    otherwise. No colour scale."""
    return "reverse" if value > 1.0 else "none"


def gauge(value: float, width: int = GAUGE_WIDTH) -> str:
    """A neutral gauge of a utilization: eighth blocks from 0 to 1.0, then a mark "│" at 1.0, and
    "»" beyond it when the utilization is over 1.0."""
    blocks = " ▏▎▍▌▋▊▉█"
    eighths = round(min(max(value, 0.0), 1.0) * width * 8)
    full, part = divmod(eighths, 8)
    bar = "█" * full + (blocks[part] if part else "")
    return bar.ljust(width) + ("│»" if value > 1.0 else "│")


def utilization_cell(value: float) -> str:
    """The utilization to 3 decimals beside its gauge."""
    number = f"[{utilization_style(value)}]{value:.3f}[/]"
    return f"{number} [dim]{gauge(value)}[/]"


def _value_text(result: CheckResult, value: float | None, system: str) -> str:
    if value is None:
        return "—"
    if result.quantity == "ratio":
        return f"{value:.3f}"
    return units.fmt(value, QUANTITY_KINDS[result.quantity], system)


def checks_ledger(report: CheckReport, design: Design, system: str) -> Ledger:
    """One row per check with its basis on a dim line under it; the governing row in bold."""
    from rich.markup import escape

    governing = report.governing
    ledger = Ledger("Checks · utilization = demand / allowable", [
        Column("check"), Column("demand", right=True), Column("allowable", right=True), Column("utilization"),
        Column("at", right=True, fold=True), Column("status", fold=True)])
    for result in report.checks:
        basis = escape(basis_text(result, design, report, system))
        if not result.made:
            ledger.add_row(f"[dim]{result.check}[/]", "—", "—", "—", "", "[dim]not made[/]", note=basis)
            continue
        is_governing = governing is result
        status = PASSES if result.passes else f"[reverse]{FAILS}[/]"
        where = combination_text(result)
        note = "; ".join(part for part in (("governs" if is_governing else ""), basis, escape(where)) if part)
        ledger.add_row(result.check, _value_text(result, result.demand, system), _value_text(result, result.allowable, system),
                       utilization_cell(result.made_utilization), units.fmt(result.at, "length", system) if result.at is not None else "—",
                       status, note=note, style="bold" if is_governing else "")
    return ledger


TORSION_ROWS = {"torque": ("torque T", "moment"), "saint_venant_torque": ("Saint-Venant torque T - Tw", "moment"),
                "warping_torque": ("warping torque Tw", "moment"), "bimoment": ("bimoment B", "bimoment")}


def torsion_ledger(report: CheckReport, system: str) -> Ledger | None:
    """The largest torque, its Saint-Venant and warping parts and the bimoment, with where each is."""
    from rich.markup import escape

    summary = report.torsion
    if summary is None:
        return None
    a = f"torsion parameter a = {units.fmt(summary.parameter, 'length', system)}" if summary.parameter else "uniform torsion (G J only)"
    offset = math.hypot(*summary.centroid_offset)
    where = f"centroid {units.fmt(offset, 'dimension', system)} from the shear centre" if offset else "centroid on the shear centre"
    ledger = Ledger(f"Torsion · largest values; {where}; {a}", [
        Column("action"), Column("value", right=True), Column("at", right=True), Column("combination", fold=True)])
    for peak in summary.peaks:
        label, kind = TORSION_ROWS[peak.name]
        ledger.add_row(label, units.fmt(peak.value, kind, system), units.fmt(peak.at, "length", system), escape(peak.combination))
    return ledger


AMPLIFICATIONS_LISTED = 12  # combinations listed in the second-order table; beyond, the most amplified


def second_order_ledger(report: CheckReport, system: str) -> Ledger | None:
    """Each combination's peak moments of first and second order and the amplification; a
    combination at or beyond its buckling load says so. None when second order is off."""
    from rich.markup import escape

    document = second_order_json(report)
    if document is None:
        return None
    rows = document["combinations"]
    caption = ""
    if len(rows) > AMPLIFICATIONS_LISTED:
        caption = f"the {AMPLIFICATIONS_LISTED} most amplified of {len(rows)} combinations"
        rows = sorted(rows, key=lambda row: (not row["beyond_buckling"], -(row["amplification"] or 0.0)))[:AMPLIFICATIONS_LISTED]
    ledger = Ledger("Second order · amplification = peak moment, second / first order",
                    [Column("combination"), Column("first order", right=True), Column("second order", right=True),
                     Column("amplification", right=True)], caption=caption)
    for row in rows:
        if row["beyond_buckling"]:
            factor = row["load_factor"]
            note = f"load factor {factor:.3g}" if factor is not None else ""
            ledger.add_row(escape(row["combination"]), units.fmt(row["first_order_moment"], "moment", system), "—",
                           f"[reverse]{FAILS}[/]", note=("at or beyond its elastic buckling load" + (f": {note}" if note else "")))
            continue
        amplification = row["amplification"]
        ledger.add_row(escape(row["combination"]), units.fmt(row["first_order_moment"], "moment", system),
                       units.fmt(row["moment"], "moment", system), f"{amplification:.3f}" if amplification is not None else "—")
    return ledger


def reactions_ledger(design: Design, system: str) -> Ledger:
    """The reactions of every combination: a group line per combination, a row per support; the
    unit of each column in its header. Beyond REACTIONS_LISTED combinations (pattern arrangements),
    each support's reactions at their largest and smallest, with the combination of each."""
    from rich.markup import escape

    names = design.solution.combination_names
    if len(names) > REACTIONS_LISTED or patterned(design.member):
        from sizer.render.forces import reaction_envelope_table

        return reaction_envelope_table(design.solution, list(names), system)
    values = {name: reactions_without_round_off(design.solution.reactions(name), design.member.length) for name in names}
    return reactions_ledger_values("Reactions per combination (support on member)", design.member, values, system,
                                   grouped=len(names) > 1, escape=escape)


class VerdictBlock:
    """The verdict: each line behind a heavy bar, the status word in bold (reverse when it fails)."""

    def __init__(self, text: str, passes: bool) -> None:
        self.text, self.passes = text, passes

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from rich.text import Text

        from sizer.render.text import wrap

        for line in wrap(self.text, max(1, options.max_width - 2)):
            yield Text("┃ ", style="bold") + line


def verdict_block(report: CheckReport, system: str) -> VerdictBlock:
    from rich.markup import escape

    governing = report.governing
    if governing is None:
        return VerdictBlock(f"[bold]{escape(report.section)}[/]: no check could be made.", True)
    word = f"[bold]{PASSES}[/]" if report.passes else f"[bold reverse]{FAILS}[/]"
    where = f" at x = {units.fmt(governing.at, 'length', system)}" if governing.at is not None else ""
    text = (f"[bold]{escape(report.section)}[/] {word}: utilization {governing.utilization:.3f}, governed by "
            f"[bold]{governing.check}[/]{where} in combination {escape(governing.combination or '')}.")
    from sizer.render.cost import reserve_sentence

    return VerdictBlock(text + reserve_sentence(report.reserve), report.passes)


def design_summary(design: Design, system: str) -> list[Any]:
    """Member, section, material and spans, one hanging paragraph each."""
    from rich.markup import escape

    member, props, material = design.member, design.props, design.known_material
    span_text = ", ".join(f"{'overhang' if s.overhang else 'span'} {units.fmt(s.length, 'length', system)}" for s in spans(member)) or "none"
    allow = material.allowable
    allowables = ", ".join(f"{name} {units.fmt(getattr(allow, name), 'stress', system)}"
                           for name in ("tension", "compression", "bending", "shear", "equivalent") if getattr(allow, name) is not None)
    rows = [("Member", f"length {units.fmt(member.length, 'length', system)}, {plural(len(member.supports), 'support')}, {span_text}"),
            ("Section", f"[bold]{escape(design.spec.name)}[/] ({design.spec.shape}, {member.orientation} orientation), "
                        f"{units.fmt(design.mass_per_length, 'mass_per_length', system)}, A = {units.fmt(props.area, 'area', system)}, "
                        + inertia_pair(props, lambda value: units.fmt(value, "inertia", system))),
            ("Material", f"{escape(material.name)}, E = {units.fmt(material.elastic_modulus, 'modulus', system)}; "
                         f"allowables: {allowables or 'none'}")]
    return [Paragraph(f"[dim]{label:<9}[/] {text}", hang=10) for label, text in rows]


def check_renderables(design: Design, report: CheckReport, notes: list[str], system: str) -> list[Any]:
    """The terminal summary of `sizer check`, as rich renderables in order."""
    from rich.markup import escape

    title = escape(design.member.title or design.member.source)
    return [Heading(f"sizer check · {title}"), *design_summary(design, system), "", verdict_block(report, system), "",
            checks_ledger(report, design, system), "", *_optional(second_order_ledger(report, system)),
            *_optional(torsion_ledger(report, system)), reactions_ledger(design, system), "",
            notes_panel(notes, system=system), cautions_panel()]


def _optional(block: Any) -> list[Any]:
    return [] if block is None else [block, ""]


def print_check(console: Console, design: Design, report: CheckReport, notes: list[str], system: str) -> None:
    """The terminal summary of `sizer check`."""
    for renderable in check_renderables(design, report, notes, system):
        console.print(renderable)
