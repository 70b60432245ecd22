"""`sizer forces` output: reactions, actions at cuts, extremes and deflections (terminal and JSON)."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from sizer import units
from sizer.analysis import MemberSolution, extremes
from sizer.model import ACTIONS, LineLoad, Member, PointLoad
from sizer.render.common import CAUTIONS, cautions_panel, notes_panel, reactions_without_round_off

ACTION_KINDS = {"N": "force", "Vy": "force", "Vz": "force", "T": "moment", "My": "moment", "Mz": "moment", "V": "force", "M": "moment"}
REACTION_NAMES = ("Fx", "Fy", "Fz", "Mx", "My", "Mz")
REACTION_KINDS = ("force", "force", "force", "moment", "moment", "moment")
TINY_FORCE = 1e-9  # N; smaller values are shown as zero (round-off)


def is_planar(member: Member) -> bool:
    """True when every load acts in the x-y plane (so V and M in the beam convention apply)."""
    if member.self_weight_case and member.gravity[0] == 2:
        return False
    for load in member.loads:
        if isinstance(load, PointLoad) and (load.force[2] or load.moment[0] or load.moment[1]):
            return False
        if isinstance(load, LineLoad) and (load.q_start[2] or load.q_end[2] or load.q_start[3] or load.q_end[3]):
            return False
    return True


def concentrated_positions(member: Member) -> np.ndarray:
    """Positions (m) where a point load, moment or support makes the actions jump."""
    xs = [load.at for load in member.loads if isinstance(load, PointLoad)] + [support.at for support in member.supports]
    return np.unique(np.asarray(xs, dtype=float))


def default_cuts(member: Member) -> np.ndarray:
    """Cuts shown when the user names none: ends, supports, hinges, point loads, line-load ends."""
    xs = [0.0, member.length] + [s.at for s in member.supports] + [h.at for h in member.hinges]
    for load in member.loads:
        xs += [load.at] if isinstance(load, PointLoad) else [load.start, load.end]
    return np.unique(np.round(np.asarray(xs, dtype=float), 12))


@dataclass(frozen=True)
class Cut:
    """Actions at one cut; `left`/`right` differ only on a concentrated load or support."""

    at: float
    left: np.ndarray  # (6,) N, Vy, Vz, T, My, Mz just left of the cut
    right: np.ndarray  # (6,) just right
    jump: bool


def cuts_for(solution: MemberSolution, combination: str, xs: np.ndarray) -> list[Cut]:
    """Actions at each x, both sides."""
    jumps = concentrated_positions(solution.member)
    left = solution.actions(combination, xs, side="left")
    right = solution.actions(combination, xs, side="right")
    scale = max(solution.member.length, 1.0) * 1e-12
    return [Cut(float(x), left[i], right[i], bool(np.any(np.abs(jumps - x) <= scale))) for i, x in enumerate(xs)]


def _action_dict(values: np.ndarray) -> dict[str, float]:
    out = {name: float(value) for name, value in zip(ACTIONS, values)}
    out["V"] = -out["Vy"]
    out["M"] = out["Mz"]
    return out


def deflection_summary(solution: MemberSolution, combination: str, n: int = 801) -> dict[str, float] | None:
    """Largest transverse deflection sqrt(uy^2 + uz^2) (m) and where; None without a section."""
    if not solution.has_displacements:
        return None
    xs = np.linspace(0.0, solution.member.length, n)
    for support in solution.member.supports:
        xs = np.append(xs, support.at)
    xs = np.unique(xs)
    moved = solution.displacements(combination, xs)
    transverse = np.hypot(moved[:, 1], moved[:, 2])
    index = int(np.argmax(transverse))
    return {"max": float(transverse[index]), "at": float(xs[index]), "uy": float(moved[index, 1]), "uz": float(moved[index, 2])}


def forces_document(solution: MemberSolution, combination: str, xs: np.ndarray) -> dict[str, Any]:
    """SPEC section 6 `forces` object for one combination (SI base units)."""
    reactions = reactions_without_round_off(solution.reactions(combination), solution.member.length)
    document: dict[str, Any] = {
        "combination": combination,
        "reactions": [
            {"at": support.at, "type": support.label, **{name: float(v) for name, v in zip(REACTION_NAMES, reactions[i])}}
            for i, support in enumerate(solution.member.supports)
        ],
        "cuts": [],
        "deflection": deflection_summary(solution, combination),
    }
    end = solution.member.length * (1 - 1e-12)
    for cut in cuts_for(solution, combination, xs):
        on_member = cut.left if cut.at >= end else cut.right  # at end B the x+ side is off the member
        entry: dict[str, Any] = {"at": cut.at, **_action_dict(on_member)}
        if cut.jump:
            entry["left"] = _action_dict(cut.left)
            entry["right"] = _action_dict(cut.right)
        document["cuts"].append(entry)
    return document


def forces_json(solution: MemberSolution, combinations: list[str], xs: np.ndarray, notes: list[str]) -> dict[str, Any]:
    """The whole --json document: one combination at top level, several under "combinations"."""
    documents = [forces_document(solution, name, xs) for name in combinations]
    head: dict[str, Any] = documents[0] if len(documents) == 1 else {"combinations": documents}
    return {**head, "units": "SI base units (m, N, N*m, Pa, kg/m)", "assumptions": notes, "cautions": list(CAUTIONS)}


# ----------------------------------------------------------------------------------------------
# terminal

def _fmt(value: float, kind: str, system: str) -> str:
    return units.fmt(0.0 if abs(value) < TINY_FORCE else value, kind, system)


def _shown_actions(planar: bool) -> tuple[str, ...]:
    return ("N", "V", "M") if planar else ACTIONS


def reactions_table(solution: MemberSolution, combination: str, system: str) -> Any:
    from rich import box
    from rich.table import Table

    reactions = reactions_without_round_off(solution.reactions(combination), solution.member.length)
    shown = [i for i in range(6) if np.any(np.abs(reactions[:, i]) > TINY_FORCE)] or [1]
    table = Table(title="Reactions (support on member)", title_justify="left", header_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
    table.add_column("support", no_wrap=True)
    table.add_column("at", justify="right", no_wrap=True)
    for i in shown:
        table.add_column(REACTION_NAMES[i], justify="right", no_wrap=True)
    for index, support in enumerate(solution.member.supports):
        cells = [_fmt(reactions[index, i], REACTION_KINDS[i], system) for i in shown]
        table.add_row(support.label, units.fmt(support.at, "length", system), *cells)
    return table


def cuts_table(cuts: list[Cut], planar: bool, system: str) -> Any:
    """Actions at the requested cuts; the unit of each column is in its header."""
    from rich import box
    from rich.table import Table

    table = Table(title="Internal actions at cuts (+x face of the left segment)", title_justify="left",
                  header_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
    table.add_column(f"x ({units.unit_label('length', system)})", justify="right", no_wrap=True)
    table.add_column("side", no_wrap=True)
    names = _shown_actions(planar)
    for name in names:
        table.add_column(f"{name} ({units.unit_label(ACTION_KINDS[name], system)})", justify="right", no_wrap=True)
    for cut in cuts:
        sides = (("x−", cut.left), ("x+", cut.right)) if cut.jump else (("", cut.right),)
        for label, values in sides:
            actions = _action_dict(values)
            cells = [units.fmt_number(units.to_display(0.0 if abs(actions[n]) < TINY_FORCE else actions[n], ACTION_KINDS[n], system))
                     for n in names]
            table.add_row(units.fmt_number(units.to_display(cut.at, "length", system)), label, *cells)
    return table


def extremes_table(solution: MemberSolution, combination: str, planar: bool, system: str) -> Any:
    from rich import box
    from rich.table import Table

    found = extremes(solution, combination)
    table = Table(title="Extremes along the member", title_justify="left", header_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
    for column in ("action", "largest", "at", "smallest", "at"):
        table.add_column(column, justify="left" if column == "action" else "right", no_wrap=True)
    for name in _shown_actions(planar):
        extreme = found[name]
        kind = ACTION_KINDS[name]
        table.add_row(name, _fmt(extreme.max_value, kind, system), units.fmt(extreme.max_at, "length", system),
                      _fmt(extreme.min_value, kind, system), units.fmt(extreme.min_at, "length", system))
    return table


def governing_moment(solution: MemberSolution) -> tuple[str, float, float]:
    """(combination, |M| largest, x) over all combinations: the headline figure."""
    best = ("", -1.0, 0.0)
    for name in solution.combination_names:
        found = extremes(solution, name)
        for action in ("Mz", "My"):
            extreme = found[action]
            for value, at in ((extreme.max_value, extreme.max_at), (extreme.min_value, extreme.min_at)):
                if abs(value) > best[1]:
                    best = (name, abs(value), at)
    return best


def forces_renderables(solution: MemberSolution, combinations: list[str], xs: np.ndarray | None,
                       notes: list[str], system: str, section_line: str) -> list[Any]:
    """The terminal summary of `sizer forces`, as rich renderables in order."""
    from rich.rule import Rule

    member = solution.member
    planar = is_planar(member)
    out: list[Any] = [Rule(f"[bold]sizer forces[/] · {member.title or member.source}"),
                      f"Member length [bold]{units.fmt(member.length, 'length', system)}[/], "
                      f"{len(member.supports)} support(s), {len(member.loads)} load(s), section: {section_line}"]
    if planar:
        out.append("[dim]Planar member (x-y): V = −Vy (positive turns its segment clockwise), M = Mz (positive sagging).[/]")
    name, moment, at = governing_moment(solution)
    out.append(f"Largest bending moment: [bold magenta]{units.fmt(moment, 'moment', system)}[/] "
               f"at x = {units.fmt(at, 'length', system)} in combination [bold]{name}[/]")
    for combination in combinations:
        out.append(Rule(f"combination [bold]{combination}[/]", style="blue"))
        out.append(reactions_table(solution, combination, system))
        if xs is not None and len(xs):
            out.append(cuts_table(cuts_for(solution, combination, xs), planar, system))
        out.append(extremes_table(solution, combination, planar, system))
        deflection = deflection_summary(solution, combination)
        if deflection is not None:
            out.append(f"Largest deflection: [bold]{units.fmt(deflection['max'], 'deflection', system)}[/] "
                       f"at x = {units.fmt(deflection['at'], 'length', system)}")
    return out + [notes_panel(notes), cautions_panel()]


def print_forces(console: Any, solution: MemberSolution, combinations: list[str], xs: np.ndarray | None,
                 notes: list[str], system: str, section_line: str) -> None:
    """The terminal summary of `sizer forces`."""
    for renderable in forces_renderables(solution, combinations, xs, notes, system, section_line):
        console.print(renderable)
