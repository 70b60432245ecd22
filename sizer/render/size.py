"""`sizer size` output: the lightest passing section with its checks, and the candidates around it
(terminal; the JSON document is sizer.results.size), in the look of `sizer check` (render.check)."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from sizer import units
from sizer.render.check import FAILS, PASSES, VerdictBlock, checks_ledger, second_order_ledger, utilization_cell
from sizer.render.common import cautions_panel, notes_panel
from sizer.render.cost import bars_text, money, reserve_sentence
from sizer.render.forces import plural
from sizer.render.phrases import in_display_units
from sizer.render.text import Column, Heading, Ledger, Paragraph
from sizer.results.size import shown_candidates
from sizer.sizing import Candidate, SizingResult

if TYPE_CHECKING:
    from rich.console import Console


RANKED = {"mass": ("mass per length", "the lightest"), "cost": ("cost", "the cheapest"), "depth": ("depth", "the shallowest")}


def ranked_by(result: SizingResult) -> str:
    """The ranking in effect: --by cost without any priced candidate ranks by mass (its notes say so)."""
    by = result.ranking.by
    if by == "cost" and all(c.costing is None or c.costing.cost is None for c in result.candidates):
        return "mass"
    return by


def candidates_ledger(result: SizingResult, top: int, system: str) -> Ledger:
    """Sections ranked before the choice that fail (with why), the choice, and the next ones that
    pass. A utilization from the screen is a proven lower bound, shown with ">=" before it. With
    costs: the member's cost in each section and the bars it takes."""
    from rich.markup import escape

    ranking, by = result.ranking, ranked_by(result)
    costs = any(c.costing is not None and (c.costing.cost is not None or not c.costing.available or c.costing.terms.stock_lengths)
                for c in result.candidates)
    columns = [Column("section")] + ([Column("depth", right=True)] if by == "depth" else []) + [Column("mass", right=True)] + (
        [Column("cost", right=True)] if costs else [])
    ledger = Ledger(f"Candidates by {RANKED[by][0]}", columns + [
        Column("utilization"), Column("governing", fold=True), Column("status", fold=True), Column("decided by", fold=True)],
        caption="decided by: \"full field\" = the full stress-field check, as `sizer check` makes it; \"screen\" = "
                "ruled out by a proven lower bound of that check (the true utilization is at least the one shown)." + (
                    " \"bounds only\" = a runner-up that no proven lower bound rules out, not checked in full: it may pass or fail "
                    "(--check-runners-up checks it)." if any(c.unchecked for c in shown_candidates(result, top)) else ""))
    for candidate in shown_candidates(result, top):
        is_chosen = candidate is result.chosen
        bound = candidate.report is None
        cell = utilization_cell(candidate.utilization)
        status = "not checked" if candidate.unchecked else PASSES if candidate.passes else f"[reverse]{FAILS}[/]"
        cost_cell = [money(candidate.costing.cost, ranking.currency) if candidate.costing.available or candidate.costing.cost is not None
                     else "n/a"] if costs else []
        notes = [f"chosen: {RANKED[by][1]} that passes"] if is_chosen else []
        if costs and candidate.costing.order is not None:
            notes.append(escape(bars_text(candidate.costing.order, system)))
        if not candidate.costing.available:
            unavailable = escape(in_display_units(candidate.costing.unavailable, system))
            notes.append(unavailable + ": ranked after the available sections" if not ranking.include_unstocked else unavailable)
        depth_cell = [units.fmt(candidate.rank[1], "dimension", system)] if by == "depth" else []  # the rank's depth as installed
        ledger.add_row(escape(candidate.name), *depth_cell, units.fmt(candidate.mass_per_length, "mass_per_length", system), *cost_cell,
                       (">=" if bound else "  ") + cell, escape(candidate.governing or ""), status,
                       _decided_by(candidate), note="; ".join(notes), style="bold" if is_chosen else "")
    return ledger


def _decided_by(candidate: Candidate) -> str:
    """The candidates ledger's "decided by" cell."""
    if candidate.report is not None:
        return "full field"
    return "bounds only" if candidate.unchecked else "screen"


def sizing_verdict(result: SizingResult, system: str) -> VerdictBlock:
    """The choice, or that nothing passes and by how much the strongest section fails."""
    from rich.markup import escape

    chosen = result.chosen
    if chosen is not None:
        governing = chosen.full_report.governing
        assert governing is not None  # a section is chosen on its made checks
        by = ranked_by(result)
        cost = f", cost {money(chosen.costing.cost, result.ranking.currency)} ({escape(bars_text(chosen.costing.order, system))})" \
            if chosen.costing is not None and chosen.costing.cost is not None else ""
        return VerdictBlock(
            f"[bold]{escape(chosen.name)}[/] [bold]{PASSES}[/]: {RANKED[by][1]} passing section, "
            f"{units.fmt(chosen.mass_per_length, 'mass_per_length', system)}{cost}, utilization {chosen.utilization:.3f}, governed by "
            f"[bold]{governing.check}[/] at x = {units.fmt(governing.at, 'length', system)} in combination "
            f"{escape(governing.combination or '')}." + reserve_sentence(chosen.full_report.reserve), True)
    strongest = result.strongest
    assert strongest is not None  # nothing passes: the least utilized section is kept
    governing = strongest.full_report.governing
    assert governing is not None
    over = (strongest.utilization - 1.0) * 100
    return VerdictBlock(
        f"No section passes: even [bold]{escape(strongest.name)}[/] [bold reverse]{FAILS}[/] {governing.check} with utilization "
        f"{strongest.utilization:.3f} ({over:.0f} % over) at x = {units.fmt(governing.at, 'length', system)} in combination "
        f"{escape(governing.combination or '')}.", False)


def size_renderables(result: SizingResult, notes: list[str], top: int, system: str) -> list[Any]:
    """The terminal summary of `sizer size`, as rich renderables in order."""
    from rich.markup import escape

    from sizer.sizing import design_for

    member = result.member
    out: list[Any] = [Heading(f"sizer size · {escape(member.title or member.source)}"),
                      Paragraph(f"Member length {units.fmt(member.length, 'length', system)}, material {escape(result.material.name)}, "
                                f"{plural(len(result.candidates), 'candidate')}, {result.full_checks} checked on the full stress field"),
                      "", sizing_verdict(result, system), ""]
    chosen = result.chosen
    if chosen is not None:
        out += [checks_ledger(chosen.full_report, chosen.design or design_for(member, result.material, chosen), system), ""]
        amplified = second_order_ledger(chosen.full_report, system)
        out += [amplified, ""] if amplified is not None else []
    return out + [candidates_ledger(result, top, system), "", notes_panel(notes, system=system), cautions_panel()]


def print_size(console: Console, result: SizingResult, notes: list[str], top: int, system: str) -> None:
    """The terminal summary of `sizer size`."""
    for renderable in size_renderables(result, notes, top, system):
        console.print(renderable)
