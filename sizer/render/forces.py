"""`sizer forces` output: reactions, actions and displacements at cuts, extremes and deflections
(terminal; the JSON document is sizer.results.forces), and with --envelope the largest and smallest of each over every combination
(pattern arrangements included)."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

import numpy as np

from sizer import units
from sizer.analysis import (
    MemberSolution,
    action_envelope,
    displacement_bounds,
    envelope_curves,
    extremes,
    largest_deflection,
    reaction_envelope,
)
from sizer.model import ACTIONS, Member
from sizer.render.common import cautions_panel, combinations_words, notes_panel
from sizer.results.jsonable import reactions_without_round_off
from sizer.results.forces import (
    DISPLACEMENT_KINDS,
    DISPLACEMENT_NAMES,
    REACTION_NAMES,
    TINY_FORCE,
    Cut,
    action_dict,
    clean_force,
    concentrated_positions,
    cut_displacements,
    cuts_for,
    deflection_summary,
    direction_words,
    displacement_words,
    is_planar,
    shown_actions,
)
from sizer.render.text import Column, Heading, Ledger, Paragraph

if TYPE_CHECKING:
    from rich.console import Console

ACTION_KINDS = {"N": "force", "Vy": "force", "Vz": "force", "T": "moment", "My": "moment", "Mz": "moment", "V": "force", "M": "moment"}
REACTION_KINDS = ("force", "force", "force", "moment", "moment", "moment")
MANY_COMBINATIONS = 12  # beyond this many combinations the terminal points to --envelope
EXTREME_COLUMNS = {name: k for k, name in enumerate(ACTIONS + ("V", "M"))}  # columns of analysis.envelope_curves


# ----------------------------------------------------------------------------------------------
# terminal

def plural(count: int, word: str) -> str:
    """"1 support", "2 supports"."""
    return f"{count} {word}" + ("" if count == 1 else "s")


def _number(value: float, kind: str, system: str) -> str:
    """A value in the display unit of `kind` without the unit (it is in the column's header)."""
    return units.fmt_number(units.to_display(0.0 if abs(value) < TINY_FORCE else value, kind, system))


def _header(name: str, kind: str, system: str) -> str:
    return f"{name} ({units.unit_label(kind, system)})"


def reactions_ledger_values(title: str, member: Member, values: dict[str, np.ndarray], system: str, grouped: bool,
                            escape: Any = str) -> Ledger:
    """Reactions (N, N*m) of each combination in `values`, a row per support; the reaction columns
    shown are those not zero in any combination; with `grouped` a line names each combination."""
    stacked = np.stack(list(values.values()))
    shown = [i for i in range(6) if np.any(np.abs(stacked[..., i]) > TINY_FORCE)] or [1]
    columns = [Column("support"), Column(_header("at", "length", system), right=True)]
    columns += [Column(_header(REACTION_NAMES[i], REACTION_KINDS[i], system), right=True) for i in shown]
    ledger = Ledger(title, columns)
    for name, reactions in values.items():
        if grouped:
            ledger.add_group(f"combination {escape(name)}")
        for index, support in enumerate(member.supports):
            ledger.add_row(f"S{index + 1} {escape(support.label)}", _number(support.at, "length", system),
                           *[_number(reactions[index, i], REACTION_KINDS[i], system) for i in shown])
    return ledger


def reactions_table(solution: MemberSolution, combination: str, system: str) -> Ledger:
    from rich.markup import escape

    reactions = reactions_without_round_off(solution.reactions(combination), solution.member.length)
    return reactions_ledger_values("Reactions (support on member)", solution.member, {combination: reactions}, system, False, escape)


def cuts_table(cuts: list[Cut], planar: bool, system: str, length: float = np.inf) -> Ledger:
    """Actions at the requested cuts (both sides where a concentrated item makes them jump); the
    unit of each column is in its header."""
    names = shown_actions(planar)
    columns = [Column(_header("x", "length", system), right=True), Column("side")]
    columns += [Column(_header(name, ACTION_KINDS[name], system), right=True) for name in names]
    ledger = Ledger("Internal actions at cuts (+x face of the left segment)", columns)
    for cut in cuts:
        sides: tuple[tuple[str, np.ndarray], ...]
        if cut.jump and cut.at < length * (1 - 1e-12) and cut.at > 0:
            sides = (("x-", cut.left), ("x+", cut.right))
        else:
            sides = (("", cut.left if cut.at >= length * (1 - 1e-12) else cut.right),)
        for label, values in sides:
            actions = action_dict(values)
            ledger.add_row(_number(cut.at, "length", system), label, *[_number(actions[n], ACTION_KINDS[n], system) for n in names])
    return ledger


def extremes_table(solution: MemberSolution, combination: str, planar: bool, system: str) -> Ledger:
    found = extremes(solution, combination)
    length = units.unit_label("length", system)
    ledger = Ledger("Extremes along the member", [Column("action"), Column("largest", right=True), Column(f"at ({length})", right=True),
                                                  Column("smallest", right=True), Column(f"at ({length})", right=True)])
    for name in shown_actions(planar):
        extreme = found[name]
        kind = ACTION_KINDS[name]
        ledger.add_row(name, units.fmt(0.0 if abs(extreme.max_value) < TINY_FORCE else extreme.max_value, kind, system),
                       _number(extreme.max_at, "length", system),
                       units.fmt(0.0 if abs(extreme.min_value) < TINY_FORCE else extreme.min_value, kind, system),
                       _number(extreme.min_at, "length", system))
    return ledger


def deflection_line(solution: MemberSolution, combination: str, system: str) -> str | None:
    """The largest deflection of a combination with its direction; None without a section."""
    deflection = deflection_summary(solution, combination)
    if deflection is None:
        return None
    member = solution.member
    parts = [f"{key} = {units.fmt(deflection[key], 'deflection', system)}, {direction_words(member, key, deflection[key])}"
             for key in ("uy", "uz") if deflection[key] != 0]
    return (f"Largest deflection: [bold]{units.fmt(deflection['max'], 'deflection', system)}[/] at x = "
            f"{units.fmt(deflection['at'], 'length', system)}: {'; '.join(parts) or 'none'}")


def governing_moment(solution: MemberSolution) -> tuple[str, float, float]:
    """(combination, |M| largest, x) over all combinations: the headline figure."""
    best = ("", -1.0, 0.0)
    found = action_envelope(solution, solution.combination_names)
    for action in ("Mz", "My"):
        for bound in (found[action].largest, found[action].smallest):
            if abs(bound.value) > best[1]:
                best = (bound.combination, abs(bound.value), bound.at)
    return best


def displacements_table(solution: MemberSolution, combination: str, xs: np.ndarray, system: str) -> Ledger:
    """ux, uy, uz and the twist rx at each cut, with their directions in words under each row."""
    from rich.markup import escape

    columns = [Column(_header("x", "length", system), right=True)]
    columns += [Column(_header(name, kind, system), right=True) for name, kind in zip(DISPLACEMENT_NAMES, DISPLACEMENT_KINDS)]
    ledger = Ledger("Displacements and twist at cuts", columns)
    member = solution.member
    for x, moved in zip(xs, cut_displacements(solution, combination, xs)):
        words = "; ".join(f"{name} {displacement_words(member, name, value)}" for name, value in zip(DISPLACEMENT_NAMES, moved) if value != 0)
        ledger.add_row(_number(x, "length", system), *[units.fmt_number(units.to_display(value, kind, system))
                                                        for value, kind in zip(moved, DISPLACEMENT_KINDS)], note=escape(words or "no movement"))
    return ledger


def envelope_table(solution: MemberSolution, combinations: list[str], planar: bool, system: str) -> Ledger:
    """The largest and smallest of each action along the member over the combinations, with where
    and (in the line under each row) which combination gives it."""
    from rich.markup import escape

    found = action_envelope(solution, combinations)
    length = units.unit_label("length", system)
    ledger = Ledger("Internal actions along the member: largest and smallest", [
        Column("action"), Column("largest", right=True), Column(f"at ({length})", right=True),
        Column("smallest", right=True), Column(f"at ({length})", right=True)])
    for name in shown_actions(planar):
        high, low = found[name].largest, found[name].smallest
        kind = ACTION_KINDS[name]
        ledger.add_row(name, units.fmt(clean_force(high.value), kind, system), _number(high.at, "length", system),
                       units.fmt(clean_force(low.value), kind, system), _number(low.at, "length", system),
                       note=_bounds_note(high.value, high.combination, low.value, low.combination, escape))
    return ledger


def reaction_envelope_table(solution: MemberSolution, combinations: list[str], system: str) -> Ledger:
    """Each support's reactions at their largest and smallest over the combinations (the
    components not zero in every combination), the combinations in the line under each row."""
    from rich.markup import escape

    found = reaction_envelope(solution, combinations)
    shown = [k for k in range(6) if any(abs(e.largest[k][0]) > TINY_FORCE or abs(e.smallest[k][0]) > TINY_FORCE for e in found)] or [1]
    ledger = Ledger(f"Reactions: largest and smallest over {combinations_words(solution.member, len(combinations))} (support on member)", [
        Column("support"), Column(_header("at", "length", system), right=True), Column("reaction"),
        Column("largest", right=True), Column("smallest", right=True)])
    for entry in found:
        support = solution.member.supports[entry.support]
        for k in shown:
            (high, high_name), (low, low_name) = entry.largest[k], entry.smallest[k]
            ledger.add_row(f"S{entry.support + 1} {escape(support.label)}", _number(support.at, "length", system), REACTION_NAMES[k],
                           units.fmt(clean_force(high), REACTION_KINDS[k], system), units.fmt(clean_force(low), REACTION_KINDS[k], system),
                           note=_bounds_note(high, high_name, low, low_name, escape))
    return ledger


def _bounds_note(high: float, high_name: str, low: float, low_name: str, escape: Any) -> str:
    """The line under an envelope row: which combination gives each bound (none when both are zero)."""
    if clean_force(high) == 0 and clean_force(low) == 0:
        return "zero in every combination"
    if high_name == low_name:
        return f"both in {escape(high_name)}"
    return f"largest in {escape(high_name)}; smallest in {escape(low_name)}"


def cut_envelope_table(solution: MemberSolution, combinations: list[str], xs: np.ndarray, planar: bool, system: str) -> Ledger:
    """The largest and smallest of each action at each cut over the combinations (both sides where
    a concentrated item makes them jump)."""
    names = shown_actions(planar)
    columns = [Column(_header("x", "length", system), right=True), Column("side"), Column("bound")]
    columns += [Column(_header(name, ACTION_KINDS[name], system), right=True) for name in names]
    ledger = Ledger("Internal actions at cuts: largest and smallest over the combinations", columns)
    length = solution.member.length
    jumps = concentrated_positions(solution.member)
    for x in xs:
        inside = 0 < x < length * (1 - 1e-12)
        jump = inside and bool(np.any(np.abs(jumps - x) <= max(length, 1.0) * 1e-12))
        sides = (("x-", "left"), ("x+", "right")) if jump else (("", "left" if x >= length * (1 - 1e-12) else "right"),)
        for label, side in sides:
            high, low = envelope_curves(solution, combinations, [x], side)
            for bound, values in (("largest", high[0]), ("smallest", low[0])):
                ledger.add_row(_number(x, "length", system), label, bound,
                               *[_number(values[EXTREME_COLUMNS[n]], ACTION_KINDS[n], system) for n in names])
    return ledger


def cut_displacement_bounds_table(solution: MemberSolution, combinations: list[str], xs: np.ndarray, system: str) -> Ledger:
    """ux, uy, uz and the twist rx at each cut: the largest and smallest over the combinations."""
    columns = [Column(_header("x", "length", system), right=True), Column("bound")]
    columns += [Column(_header(name, kind, system), right=True) for name, kind in zip(DISPLACEMENT_NAMES, DISPLACEMENT_KINDS)]
    ledger = Ledger("Displacements and twist at cuts: largest and smallest over the combinations", columns)
    high, low = displacement_bounds(solution, combinations, xs)
    for k, x in enumerate(xs):
        for bound, values in (("largest", high[k]), ("smallest", low[k])):
            ledger.add_row(_number(x, "length", system), bound, *[units.fmt_number(units.to_display(values[j], kind, system))
                                                                   for j, kind in enumerate(DISPLACEMENT_KINDS)])
    return ledger


def envelope_renderables(solution: MemberSolution, combinations: list[str], xs: np.ndarray | None, planar: bool, system: str) -> list[Any]:
    """The envelope block of the terminal summary: actions, reactions, the largest deflection and,
    at any cuts, the actions and displacements at their largest and smallest."""
    from rich.markup import escape

    out: list[Any] = ["", Heading(f"Envelope of {plural(len(combinations), 'combination')} (pattern arrangements included)", rule="─"),
                      envelope_table(solution, combinations, planar, system), "", reaction_envelope_table(solution, combinations, system)]
    if xs is not None and len(xs):
        out += ["", cut_envelope_table(solution, combinations, xs, planar, system)]
        if solution.has_displacements:
            out += ["", cut_displacement_bounds_table(solution, combinations, xs, system)]
    deflection = largest_deflection(solution, combinations)
    if deflection is not None:
        parts = [f"{key} = {units.fmt(value, 'deflection', system)}, {direction_words(solution.member, key, value)}"
                 for key, value in (("uy", deflection.uy), ("uz", deflection.uz)) if value != 0]
        out.append(Paragraph(f"Largest deflection: [bold]{units.fmt(deflection.value, 'deflection', system)}[/] at x = "
                             f"{units.fmt(deflection.at, 'length', system)} in combination [bold]{escape(deflection.combination)}[/]: "
                             f"{'; '.join(parts) or 'none'}"))
    return out


def forces_renderables(solution: MemberSolution, combinations: list[str], xs: np.ndarray | None,
                       notes: list[str], system: str, section_line: str, envelope: bool = False) -> list[Any]:
    """The terminal summary of `sizer forces`, as rich renderables in order; with `envelope` the
    envelope over the combinations in place of each combination's block."""
    from rich.markup import escape

    member = solution.member
    planar = is_planar(member)
    out: list[Any] = [Heading(f"sizer forces · {escape(member.title or member.source)}"),
                      Paragraph(f"Member length [bold]{units.fmt(member.length, 'length', system)}[/], "
                                f"{plural(len(member.supports), 'support')}, {plural(len(member.given_loads), 'load')}, "
                                f"section: {escape(section_line)}")]
    if planar:
        out.append(Paragraph("[dim]Planar member (x-y): V = -Vy (positive turns its segment clockwise), M = Mz (positive sagging).[/]"))
    name, moment, at = governing_moment(solution)
    out.append(Paragraph(f"Largest bending moment: [bold]{units.fmt(moment, 'moment', system)}[/] "
                         f"at x = {units.fmt(at, 'length', system)} in combination [bold]{escape(name)}[/]"))
    if envelope:
        return out + envelope_renderables(solution, combinations, xs, planar, system) + ["", notes_panel(notes, system=system), cautions_panel()]
    if len(combinations) > MANY_COMBINATIONS:
        out.append(Paragraph(f"[dim]{len(combinations)} combinations (pattern arrangements included) follow one by one; "
                             "--envelope gives the largest and smallest of each action over them all.[/]"))
    for combination in combinations:
        out += ["", Heading(f"Combination {escape(combination)}", rule="─")]
        out.append(reactions_table(solution, combination, system))
        if xs is not None and len(xs):
            out += ["", cuts_table(cuts_for(solution, combination, xs), planar, system, member.length)]
            if solution.has_displacements:
                out += ["", displacements_table(solution, combination, xs, system)]
        out += ["", extremes_table(solution, combination, planar, system)]
        line = deflection_line(solution, combination, system)
        if line is not None:
            out.append(Paragraph(line))
    return out + ["", notes_panel(notes, system=system), cautions_panel()]


def print_forces(console: Console, solution: MemberSolution, combinations: list[str], xs: np.ndarray | None,
                 notes: list[str], system: str, section_line: str, envelope: bool = False) -> None:
    """The terminal summary of `sizer forces` (with `envelope`: the envelope over the combinations)."""
    for renderable in forces_renderables(solution, combinations, xs, notes, system, section_line, envelope):
        console.print(renderable)
