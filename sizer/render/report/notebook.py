"""Short HTML summaries for notebooks (`_repr_html_` of the API's results), built from the
calculation record's own pieces (style, verdict, check rows, cautions) so the two cannot disagree.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from sizer import units
from sizer.render.basis import basis_text
from sizer.render.check import status_word
from sizer.results.check import check_json
from sizer.results.notes import CAUTIONS
from sizer.render.report.checks import checks_section, verdict_box
from sizer.render.report.markup import STYLE, _e, _row, _table
from sizer.render.phrases import in_display_units

if TYPE_CHECKING:
    from sizer.sizing import SizingResult
    from sizer.checks import CheckReport
    from sizer.design import Design


def _page(body: str) -> str:
    """A self-contained fragment: the record's style sheet scoped to one block, then the body."""
    return f'<div class="sizer-summary"><style>{STYLE}</style>{body}{_cautions()}</div>'


def _cautions() -> str:
    items = "".join(f"<li>{_e(caution)}</li>" for caution in CAUTIONS)
    return f'<section class="cautions"><h2>⚠ Cautions</h2><ul>{items}</ul></section>'


def _notes(notes: list[str], system: str = "si") -> str:
    items = "".join(f"<li>{_e(in_display_units(note, system))}</li>" for note in notes)
    return f"<details><summary>Assumptions ({len(notes)})</summary><ul class=\"notes\">{items}</ul></details>"


def check_summary_html(design: Design, report: CheckReport, notes: list[str], system: str = "si") -> str:
    """The verdict, every check and the assumptions of one section's check."""
    document = check_json(design, report, notes)
    bases = [basis_text(result, design, report, system) for result in report.checks]
    return _page(verdict_box(document, system) + checks_section(document, system, bases) + _notes(notes, system))


def size_summary_html(result: SizingResult, notes: list[str], top: int, system: str = "si") -> str:
    """The lightest passing section and the candidates around it."""
    from sizer.results.size import shown_candidates

    chosen = result.chosen
    if chosen is not None:
        head = (f'<section class="verdict pass"><span class="word">{_e(chosen.name)}</span> the lightest passing section, '
                f'{units.fmt(chosen.mass_per_length, "mass_per_length", system)}, utilization {chosen.utilization:.3f} '
                f'({_e(chosen.governing)}).</section>')
    else:
        head = '<section class="verdict fail"><span class="word">NONE</span> no catalogue section passes every check.</section>'
    rows = [_row([f"<td>{_e(c.name)}</td>", f'<td class="num">{units.fmt(c.mass_per_length, "mass_per_length", system)}</td>',
                  f'<td class="num">{c.utilization:.3f}</td>', f"<td>{_e(c.governing)}</td>",
                  f"<td>{'not checked' if c.unchecked else status_word(c.passes)}</td>", f"<td>{_e(c.decided_by)}</td>"],
                 css="governing" if c is chosen else "") for c in shown_candidates(result, top)]
    table = _table(["section", "mass", "utilization", "governing", "verdict", "basis"], rows, (1, 2))
    return _page(head + table + _notes(notes, system))


def forces_summary_html(design: Design, combinations: list[str], notes: list[str], system: str = "si") -> str:
    """Each combination's reactions and the extremes of its internal actions."""
    from sizer.analysis import extremes
    from sizer.render.forces import ACTION_KINDS, REACTION_KINDS
    from sizer.results.forces import REACTION_NAMES

    parts = []
    for name in combinations:
        reactions = design.solution.reactions(name)
        rows = [_row([f"<td>{_e(s.label)} at {units.fmt(s.at, 'length', system)}</td>"]
                     + [f'<td class="num">{units.fmt(v, kind, system)}</td>' for v, kind in zip(reactions[i], REACTION_KINDS)])
                for i, s in enumerate(design.member.supports)]
        found = extremes(design.solution, name)
        lines = [_row([f"<td>{action}</td>", f'<td class="num">{units.fmt(e.max_value, ACTION_KINDS[action], system)}</td>',
                       f'<td class="num">{units.fmt(e.max_at, "length", system)}</td>',
                       f'<td class="num">{units.fmt(e.min_value, ACTION_KINDS[action], system)}</td>',
                       f'<td class="num">{units.fmt(e.min_at, "length", system)}</td>']) for action, e in found.items()]
        parts.append(f"<h3>Combination {_e(name)}</h3>" + _table(["support", *REACTION_NAMES], rows, range(1, 7))
                     + _table(["action", "largest", "at", "smallest", "at"], lines, (1, 2, 3, 4)))
    return _page("".join(parts) + _notes(notes, system))
