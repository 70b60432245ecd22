"""`sizer size` output: the lightest passing section with its check table, and the runners-up."""

from __future__ import annotations

from typing import Any

from sizer import units
from sizer.render.check import BAR_WIDTH, check_entry, checks_table, utilization_bar, utilization_style
from sizer.render.common import CAUTIONS, cautions_panel, notes_panel
from sizer.sizing import Candidate, SizingResult


def shown_candidates(result: SizingResult, top: int) -> list[Candidate]:
    """The `top` lighter failing sections next to the choice, the choice, and the heavier ones checked."""
    if result.chosen is None:
        return [c for c in result.candidates if c.report is not None]
    position = result.candidates.index(result.chosen)
    lighter = result.candidates[max(0, position - top):position]
    heavier = [c for c in result.candidates[position + 1:] if c.report is not None and c.report.passes][:top]
    return lighter + [result.chosen] + heavier


def candidate_entry(candidate: Candidate) -> dict[str, Any]:
    return {
        "section": candidate.name,
        "mass_per_length": candidate.mass_per_length,
        "utilization": candidate.utilization,
        "passes": candidate.passes,
        "governing": candidate.governing,
        "basis": candidate.decided_by,
        "utilization_is_lower_bound": candidate.report is None,
    }


def listed_candidates(result: SizingResult) -> list[Candidate]:
    """Every section lighter than the choice (each with its governing check), the choice, and the
    heavier sections confirmed to pass; every candidate when nothing passes."""
    chosen = result.chosen
    if chosen is None:
        return list(result.candidates)
    position = result.candidates.index(chosen)
    return result.candidates[:position + 1] + [c for c in result.candidates[position + 1:] if c.report is not None and c.report.passes]


def size_json(result: SizingResult, notes: list[str]) -> dict[str, Any]:
    """SPEC section 6 `size` document (SI base units). Candidates: every lighter section (each with its
    governing check), the choice, and the heavier sections confirmed to pass."""
    chosen = result.chosen
    document: dict[str, Any] = {
        "section": chosen.name if chosen else None,
        "passes": chosen is not None,
        "mass_per_length": chosen.mass_per_length if chosen else None,
        "utilization": chosen.utilization if chosen else None,
        "governing": chosen.governing if chosen else None,
        "checks": [check_entry(c) for c in chosen.report.checks] if chosen else [],
        "candidates": [candidate_entry(c) for c in listed_candidates(result)],
    }
    if chosen is None and result.strongest is not None:
        document["strongest"] = candidate_entry(result.strongest)
    document.update({"units": "SI base units (m, N, N*m, Pa, kg/m)", "assumptions": notes, "cautions": list(CAUTIONS)})
    return document


def runners_up_table(result: SizingResult, top: int, system: str) -> Any:
    """Lighter sections that fail (with why), the choice, and the heavier ones that pass."""
    from rich import box
    from rich.table import Table

    table = Table(title="Candidates by mass per length", title_justify="left", header_style="bold", box=box.SIMPLE_HEAD,
                  pad_edge=False, caption="basis: 'full' = the full stress-field check; 'screen' = ruled out by a proven lower "
                  "bound of that check (the true utilization is at least the one shown)", caption_justify="left")
    table.add_column("section", no_wrap=True)
    table.add_column("mass", justify="right", no_wrap=True)
    table.add_column("utilization", no_wrap=True, min_width=BAR_WIDTH + 7)
    table.add_column("governing", no_wrap=True)
    table.add_column("status", no_wrap=True)
    table.add_column("basis", no_wrap=True)
    for candidate in shown_candidates(result, top):
        is_chosen = candidate is result.chosen
        status = "[bold green]lightest ▶[/]" if is_chosen else ("[green]passes[/]" if candidate.passes else "[red]fails[/]")
        bar = utilization_bar(candidate.utilization)
        bar.append(f" {candidate.utilization:.3f}", style=utilization_style(candidate.utilization))
        table.add_row(candidate.name, units.fmt(candidate.mass_per_length, "mass_per_length", system), bar,
                      candidate.governing, status, "full" if candidate.report is not None else "screen",
                      style="bold" if is_chosen else "")
    return table


def size_renderables(result: SizingResult, notes: list[str], top: int, system: str) -> list[Any]:
    """The terminal summary of `sizer size`, as rich renderables in order."""
    from rich.panel import Panel
    from rich.rule import Rule

    member = result.member
    out: list[Any] = [Rule(f"[bold]sizer size[/] · {member.title or member.source}"),
                      f"Member length {units.fmt(member.length, 'length', system)}, material {result.material.name}, "
                      f"{len(result.candidates)} candidates, {result.full_checks} checked on the full stress field"]
    chosen = result.chosen
    if chosen is not None:
        governing = chosen.report.governing
        out.append(Panel(
            f"[bold green]{chosen.name}[/]  {units.fmt(chosen.mass_per_length, 'mass_per_length', system)}  "
            f"utilization [{utilization_style(chosen.utilization)}]{chosen.utilization:.3f}[/] "
            f"({governing.check} at x = {units.fmt(governing.at, 'length', system)}, combination {governing.combination})",
            title="Lightest passing section", border_style="green"))
        out.append(checks_table(chosen.report, system))
    else:
        strongest = result.strongest
        governing = strongest.report.governing
        over = (strongest.utilization - 1.0) * 100
        out.append(Panel(
            f"[bold red]No section passes.[/] Even {strongest.name} fails [bold]{governing.check}[/] with utilization "
            f"{strongest.utilization:.3f} ({over:.0f} % over) at x = {units.fmt(governing.at, 'length', system)}, "
            f"combination {governing.combination}.", title="Nothing passes", border_style="red"))
    return out + [runners_up_table(result, top, system), notes_panel(notes), cautions_panel()]


def print_size(console: Any, result: SizingResult, notes: list[str], top: int, system: str) -> None:
    """The terminal summary of `sizer size`."""
    for renderable in size_renderables(result, notes, top, system):
        console.print(renderable)
