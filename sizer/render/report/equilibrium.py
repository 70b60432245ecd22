"""Sections 2 and 4 of the calculation record: the reactions of every combination with the overall
equilibrium of the member written out, and the method of sections at the governing cut (the free
body of the left segment, the loads and reactions on it, the six equations with the numbers put in,
and the actions they give beside the analysis's). Values in display units.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from sizer import units
from sizer.checks import CheckReport
from sizer.design import Design
from sizer.render.common import combinations_words, patterned
from sizer.render.forces import REACTION_KINDS
from sizer.results.forces import REACTION_NAMES, is_planar
from sizer.results.jsonable import without_round_off
from sizer.render.plots.free_body import build_free_body_figure
from sizer.render.report.markup import _cell, _e, _figure, _fmt, _num, _row, _table
from sizer.render.report.segment import (
    SegmentBalance,
    cut_side,
    segment_balance,
    segment_items,
)

ACTION_NAMES = ("N", "Vy", "Vz", "T", "My", "Mz")
ACTION_KINDS = ("force", "force", "force", "moment", "moment", "moment")


REACTIONS_LISTED = 12  # combinations whose reactions are listed one by one; beyond, their largest and smallest


def reactions_section(design: Design, document: dict[str, Any], combination: str, system: str) -> str:
    reactions = document["reactions"]
    if len(reactions) > REACTIONS_LISTED or patterned(design.member):
        return ('<section id="reactions"><h2>2. Reactions</h2><p>Forces and moments that each support exerts on the member, '
                f"along and about +x, +y, +z, at their largest and smallest over {combinations_words(design.member, len(reactions))} (factored), with the combination that gives each; every combination's reactions are in the embedded "
                "data.</p>" + _reaction_bounds(design, system) + _overall_equilibrium(design, combination, system) + "</section>")
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


def _reaction_bounds(design: Design, system: str) -> str:
    """Each support's reactions at their largest and smallest over every combination."""
    from sizer.analysis import reaction_envelope

    found = reaction_envelope(design.solution, design.solution.combination_names)
    shown = [k for k in range(6) if any(abs(e.largest[k][0]) > 1e-9 or abs(e.smallest[k][0]) > 1e-9 for e in found)] or [1]
    rows = []
    for entry in found:
        support = design.member.supports[entry.support]
        for k in shown:
            (high, high_name), (low, low_name) = entry.largest[k], entry.smallest[k]
            rows.append(_row([f"<td>S{entry.support + 1} ({_e(support.label)})</td>", _cell(_fmt(support.at, "length", system), support.at),
                              f"<td>{REACTION_NAMES[k]}</td>", _cell(_fmt(high, REACTION_KINDS[k], system), high), f"<td>{_e(high_name)}</td>",
                              _cell(_fmt(low, REACTION_KINDS[k], system), low), f"<td>{_e(low_name)}</td>"]))
    return _table(["support", "at", "reaction", "largest", "in combination", "smallest", "in combination"], rows, (1, 3, 5))


def _overall_equilibrium(design: Design, combination: str, system: str) -> str:
    """The whole member as a free body in the governing combination: the sums of forces and of moments
    about end A of every load and reaction, written out (each is zero to round-off)."""
    items = segment_items(design, combination, design.member.length, "right", system)
    scale = max([float(np.abs(item.vector).max()) for item in items] + [1.0]) * max(1.0, design.member.length)

    def forces(i: int) -> list[float]:
        return [float(item.vector[i]) for item in items if item.vector[i] != 0.0]

    def total(values: list[float]) -> float:
        return float(without_round_off(np.array([sum(values)]), scale)[0])

    def moments(own: int, force: int, sign: float) -> str:
        terms = [f"+ ({_num(item.vector[own], 'moment', system)})" for item in items if item.vector[own] != 0.0]
        terms += [f"{'+' if sign > 0 else '-'} ({_num(item.at, 'length', system)})·({_num(item.vector[force], 'force', system)})"
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
                  f"ΣMy about A = Σmy - Σa·Fz = {moments(4, 2, -1.0)} {m_unit}"]
    return (f"<h3>Overall equilibrium, combination {_e(combination)}</h3><p class=\"note\">The whole member as a free body: "
            "every factored load (line loads by their resultants) and every reaction. Each sum is zero to round-off.</p>"
            f'<div class="eq">{_e(chr(10).join(lines))}</div>')


def cut_section(design: Design, report: CheckReport, combination: str, x: float, system: str) -> str:
    """The method of sections at the governing cut, on first-order actions (statics of the undeformed
    member); where the checks used second-order actions, those follow."""
    solution = getattr(design.solution, "first_order", None)
    if solution is None:
        return _cut_section(design, report, combination, x, system, "")
    from dataclasses import replace

    side = cut_side(design, report, combination, x)
    second = design.solution.actions(combination, [x], side)[0]
    values = ", ".join(f"{n} = {_fmt(v, k, system)}" for n, v, k in zip(ACTION_NAMES, second, ACTION_KINDS))
    note = (f"<p class=\"note\">These are first-order actions (statics of the undeformed member). The checks use the "
            f"second-order actions of this combination, from the member's solve with its geometric stiffness: {values}.</p>")
    return _cut_section(replace(design, solution=solution), report, combination, x, system, note)


def _cut_section(design: Design, report: CheckReport, combination: str, x: float, system: str, second_order_note: str) -> str:
    side = cut_side(design, report, combination, x)
    balance = segment_balance(design, combination, x, side, system)
    other = "right" if side == "left" else "left"
    other_actions = design.solution.actions(combination, [x], other)[0]
    mark = "-" if side == "left" else "+"
    where = _fmt(x, "length", system)
    intro = (f"<p>The member is cut at x = {where} (the governing station), just {'left' if side == 'left' else 'right'} of it "
             f"(x{mark}: items exactly at x are {'not ' if side == 'left' else ''}on the segment), in combination "
             f"<b>{_e(combination)}</b>. The left segment, from end A to the cut, is taken as a free body: the internal actions on its "
             "cut face (outward normal +x) balance every load and reaction on it.</p>")
    figure = _figure(build_free_body_figure(design, combination, x, side, system), "Free body of the left segment.")
    parts = ['<section id="cut"><h2>4. Method of sections at the governing cut</h2>', intro, figure,
             _items_table(balance, system), _equations(balance, design, system), _result_table(balance, system)]
    if np.any(np.abs(other_actions - balance.analysis) > 1e-9 * (1 + np.abs(balance.analysis).max())):
        values = ", ".join(f"{n} = {_fmt(v, k, system)}" for n, v, k in zip(ACTION_NAMES, other_actions, ACTION_KINDS))
        parts.append(f"<p class=\"note\">A concentrated item sits at x; on the other face (x{'+' if side == 'left' else '-'}) "
                     f"the actions are {values}.</p>")
    if second_order_note:
        parts.append(second_order_note)
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
            "at its centroid); a - x: its lever arm to the cut. Loads factored; reactions of the combination.</p>"
            + _table(["item", "a", "a - x"] + [names[i] for i in shown], rows, range(1, 3 + len(shown))))


def _terms(values: list[float], kind: str, system: str) -> str:
    """A sum written out term by term, e.g. "(24.74) + (-18.00)"."""
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
        f"ΣFx = 0:  N + ΣFx = 0   ⇒  N = -[{_terms(column(0), 'force', system)}] = {_num(found[0], 'force', system)} {f_unit}",
        f"ΣFy = 0:  Vy + ΣFy = 0  ⇒  Vy = -[{_terms(column(1), 'force', system)}] = {_num(found[1], 'force', system)} {f_unit}",
        f"ΣMz about the cut = 0:  Mz + ΣMz + Σ(a - x)·Fy = 0\n"
        f"   ⇒  Mz = -[{_terms(column(5), 'moment', system)}] - [{' + '.join(arms(1)) or '0'}]\n"
        f"        = {_num(found[5], 'moment', system)} {m_unit}",
    ]
    if not planar or any(column(2)) or any(column(3)) or any(column(4)):
        lines += [
            f"ΣFz = 0:  Vz + ΣFz = 0  ⇒  Vz = -[{_terms(column(2), 'force', system)}] = {_num(found[2], 'force', system)} {f_unit}",
            f"ΣMx = 0:  T + ΣMx = 0   ⇒  T = -[{_terms(column(3), 'moment', system)}] = {_num(found[3], 'moment', system)} {m_unit}",
            f"ΣMy about the cut = 0:  My + ΣMy - Σ(a - x)·Fz = 0\n"
            f"   ⇒  My = -[{_terms(column(4), 'moment', system)}] + [{' + '.join(arms(2)) or '0'}]\n"
            f"        = {_num(found[4], 'moment', system)} {m_unit}",
        ]
    if planar:
        lines.append(f"Beam convention:  V = -Vy = {_num(-found[1], 'force', system)} {f_unit},   "
                     f"M = Mz = {_num(found[5], 'moment', system)} {m_unit}")
    note = ("<p class=\"note\">Moments about the cut point of a force F at a: (a - x) ex × F, so Fy turns about +z with "
            "(a - x)·Fy and Fz about +y with -(a - x)·Fz. Terms in " + _e(f_unit) + " and " + _e(m_unit) +
            f", lengths in {_e(units.unit_label('length', system))}, rounded to 4 significant figures; the sums use the full values.</p>")
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
