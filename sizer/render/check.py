"""`sizer check` output: the table of checks, the governing one, the verdict, reactions, assumptions
and cautions (terminal and JSON)."""

from __future__ import annotations

from typing import Any

from sizer import units
from sizer.checks import CheckReport, CheckResult, spans
from sizer.design import Design
from sizer.render.common import CAUTIONS, cautions_panel, notes_panel, reactions_without_round_off
from sizer.render.forces import REACTION_KINDS, REACTION_NAMES, TINY_FORCE

QUANTITY_KINDS = {"stress": "stress", "deflection": "deflection", "force": "force"}
BAR_WIDTH = 6


def check_json(design: Design, report: CheckReport, notes: list[str]) -> dict[str, Any]:
    """SPEC section 6 `check` document (SI base units)."""
    governing = report.governing
    return {
        "section": report.section,
        "passes": report.passes,
        "utilization": report.utilization,
        "governing": governing.check if governing else None,
        "checks": [check_entry(c) for c in report.checks],
        "reactions": reactions_json(design),
        "mass_per_length": design.mass_per_length,
        "units": "SI base units (m, N, N*m, Pa, kg/m)",
        "assumptions": notes,
        "cautions": list(CAUTIONS),
    }


def check_entry(result: CheckResult) -> dict[str, Any]:
    return {
        "check": result.check,
        "utilization": result.utilization,
        "demand": result.demand,
        "allowable": result.allowable,
        "at": result.at,
        "combination": result.combination,
        "made": result.made,
        "quantity": result.quantity,
        "detail": result.detail,
        **result.extra,
    }


def reactions_json(design: Design) -> dict[str, list[dict[str, float]]]:
    out = {}
    for name in design.solution.combination_names:
        reactions = reactions_without_round_off(design.solution.reactions(name), design.member.length)
        out[name] = [{"at": s.at, "type": s.label, **{k: float(v) for k, v in zip(REACTION_NAMES, reactions[i])}}
                     for i, s in enumerate(design.member.supports)]
    return out


# ----------------------------------------------------------------------------------------------
# terminal

def utilization_style(value: float) -> str:
    """Colour for a utilization: green with margin, yellow close to the limit, red over it."""
    if value > 1.0:
        return "bold red"
    if value > 0.9:
        return "yellow"
    return "green"


def utilization_bar(value: float) -> Any:
    """A bar of the utilization (full width = 1.0; an overflow mark beyond)."""
    from rich.text import Text

    filled = min(BAR_WIDTH, round(min(value, 1.0) * BAR_WIDTH))
    text = Text("█" * filled + "·" * (BAR_WIDTH - filled), style=utilization_style(value))
    if value > 1.0:
        text.append("▶", style="bold red")
    return text


def _value_text(result: CheckResult, value: float | None, system: str) -> str:
    if value is None:
        return "—"
    if result.quantity == "ratio":
        return f"{value:.3f}"
    return units.fmt(value, QUANTITY_KINDS[result.quantity], system)


def checks_table(report: CheckReport, system: str) -> Any:
    """One row per check; the governing row stands out (▶); the combination and basis of each check
    are listed below the table, numbered like the rows."""
    from rich import box
    from rich.table import Table

    governing = report.governing
    table = Table(title="Checks (utilization = demand / allowable)", title_justify="left", header_style="bold",
                  caption=check_basis_caption(report), caption_justify="left", box=box.SIMPLE_HEAD, pad_edge=False)
    table.add_column("check", no_wrap=True)
    table.add_column("demand", justify="right", no_wrap=True)
    table.add_column("allowable", justify="right", no_wrap=True)
    table.add_column("utilization", no_wrap=True, min_width=BAR_WIDTH + 7)
    table.add_column("at", justify="right", no_wrap=True)
    table.add_column("status", no_wrap=True)
    for index, result in enumerate(report.checks, start=1):
        if not result.made:
            table.add_row(f"[dim]({index}) {result.check}[/]", "—", "—", "[dim]not made[/]", "—", "[dim]—[/]")
            continue
        is_governing = governing is result
        status = "[bold red]FAILS[/]" if not result.passes else "[green]ok[/]"
        bar = utilization_bar(result.utilization)
        bar.append(f" {result.utilization:.3f}", style=utilization_style(result.utilization))
        name = f"({index}) {result.check}" + (" ▶" if is_governing else "")
        table.add_row(name, _value_text(result, result.demand, system), _value_text(result, result.allowable, system), bar,
                      units.fmt(result.at, "length", system), status, style="bold" if is_governing else "")
    return table


def check_basis_caption(report: CheckReport) -> str:
    """The numbered basis of each check: combination and what the demand is, or why it was not made."""
    from rich.markup import escape

    lines = []
    for index, result in enumerate(report.checks, start=1):
        where = f"{result.combination}: " if result.combination else ""
        lines.append(escape(f"({index}) {where}{result.detail}"))
    return "\n".join(lines + ["▶ governing check"])


def reactions_table(design: Design, system: str) -> Any:
    import numpy as np
    from rich.table import Table

    combos = design.solution.combination_names
    all_reactions = np.stack([design.solution.reactions(name) for name in combos])
    shown = [i for i in range(6) if np.any(np.abs(all_reactions[..., i]) > TINY_FORCE)] or [1]
    table = Table(title="Reactions per combination (support on member)", title_justify="left", header_style="bold")
    table.add_column("combination")
    table.add_column("support")
    table.add_column("at", justify="right")
    for i in shown:
        table.add_column(REACTION_NAMES[i], justify="right")
    for c, name in enumerate(combos):
        for s, support in enumerate(design.member.supports):
            values = [units.fmt(0.0 if abs(v) < TINY_FORCE else v, REACTION_KINDS[i], system) for i, v in enumerate(all_reactions[c, s]) if i in shown]
            table.add_row(name if s == 0 else "", support.label, units.fmt(support.at, "length", system), *values,
                          end_section=s == len(design.member.supports) - 1)
    return table


def verdict_panel(report: CheckReport, system: str) -> Any:
    from rich.panel import Panel

    governing = report.governing
    if governing is None:
        return Panel("[yellow]No check could be made.[/]", border_style="yellow")
    word = "[bold green]PASSES[/]" if report.passes else "[bold red]FAILS[/]"
    where = f"at x = {units.fmt(governing.at, 'length', system)}" if governing.at is not None else ""
    text = (f"{report.section} {word}   governing: [bold]{governing.check}[/] "
            f"utilization [{utilization_style(governing.utilization)}]{governing.utilization:.3f}[/] {where}"
            f" in combination [bold]{governing.combination}[/]")
    return Panel(text, title="Verdict", border_style="green" if report.passes else "red")


def plural(count: int, word: str) -> str:
    return f"{count} {word}" + ("" if count == 1 else "s")


def design_summary(design: Design, system: str) -> str:
    """Member, section, material and spans in three lines."""
    member, props, material = design.member, design.props, design.material
    span_text = ", ".join(f"{'overhang' if s.overhang else 'span'} {units.fmt(s.length, 'length', system)}" for s in spans(member)) or "none"
    allow = material.allowable
    allowables = ", ".join(f"{name} {units.fmt(getattr(allow, name), 'stress', system)}"
                           for name in ("tension", "compression", "bending", "shear", "equivalent") if getattr(allow, name) is not None)
    return (f"Member: length {units.fmt(member.length, 'length', system)}, {plural(len(member.supports), 'support')}, {span_text}\n"
            f"Section: [bold]{design.spec.name}[/] ({design.spec.shape}, {member.orientation} orientation), "
            f"{units.fmt(design.mass_per_length, 'mass_per_length', system)}, A = {units.fmt(props.area, 'area', system)}, "
            f"Iz = {units.fmt(props.Iz, 'inertia', system)}, Iy = {units.fmt(props.Iy, 'inertia', system)}\n"
            f"Material: {material.name}, E = {units.fmt(material.elastic_modulus, 'modulus', system)}; allowables: {allowables or 'none'}")


def check_renderables(design: Design, report: CheckReport, notes: list[str], system: str) -> list[Any]:
    """The terminal summary of `sizer check`, as rich renderables in order."""
    from rich.rule import Rule

    return [Rule(f"[bold]sizer check[/] · {design.member.title or design.member.source}"), design_summary(design, system),
            verdict_panel(report, system), checks_table(report, system), reactions_table(design, system),
            notes_panel(notes), cautions_panel()]


def print_check(console: Any, design: Design, report: CheckReport, notes: list[str], system: str) -> None:
    """The terminal summary of `sizer check`."""
    for renderable in check_renderables(design, report, notes, system):
        console.print(renderable)
