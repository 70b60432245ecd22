"""The verdict and section 5 of the calculation record, the checks: one row per check with its
demand and allowable in display units (a ratio to 3 decimals), the utilization with a neutral gauge,
where and in which combination it governs, and the basis of each (render.basis). Status words:
"passes" and "fails", as on every screen.
"""

from __future__ import annotations

from typing import Any

from sizer import units
from sizer.render.check import FAILS, PASSES
from sizer.render.report.markup import _cell, _e, _fmt, _row, _table
from sizer.render.phrases import in_display_units

QUANTITY_KINDS = {"stress": "stress", "deflection": "deflection", "force": "force"}


def _verdict_text(document: dict[str, Any], system: str) -> str:
    checks = {c["check"]: c for c in document["checks"]}
    governing = checks.get(document["governing"]) if document["governing"] else None
    word = PASSES if document["passes"] else FAILS
    if governing is None:
        return f'<span class="word">{word}</span> no check could be made.'
    return (f'<span class="word">{word}</span> Section <b>{_e(document["section"])}</b>: governing check '
            f'<b>{_e(governing["check"])}</b>, utilization <b data-value="{governing["utilization"]!r}">{governing["utilization"]:.3f}</b> '
            f'at x = {_fmt(governing["at"], "length", system)} in combination <b>{_e(governing["combination"])}</b>.'
            + _reserve_text(document))


def _reserve_text(document: dict[str, Any]) -> str:
    """The reserve factor (sizer.checks.reserve) in a sentence, where found."""
    factor, combination = document.get("reserve_factor"), document.get("reserve_combination")
    if factor is None or combination is None:
        return ""
    return (f' Reserve factor <b data-value="{factor!r}">{factor:.3f}</b>: every load of combination <b>{_e(combination)}</b>, '
            f'{"self-weight included" if document["reserve_self_weight"] else "no self-weight (self_weight = false)"}, '
            f'times {factor:.3f} {"still passes" if factor >= 1 else "is the most that would pass"} every check.')


def verdict_box(document: dict[str, Any], system: str) -> str:
    css = "pass" if document["passes"] else "fail"
    return f'<section class="verdict {css}" id="verdict">{_verdict_text(document, system)}</section>'


def _check_value(entry: dict[str, Any], value: float | None, system: str) -> str:
    if value is None:
        return "—"
    if entry["quantity"] == "ratio":
        return f"{value:.3f}"
    return units.fmt(value, QUANTITY_KINDS[entry["quantity"]], system)


def _bar(utilization: float) -> str:
    width = min(utilization, 1.0) * 100
    over = " over" if utilization > 1.0 else ""
    return f'<span class="bar{over}"><span style="width:{width:.0f}%"></span></span>'


def _check_row(entry: dict[str, Any], governing: str | None, system: str, basis: str) -> str:
    attrs = f' data-check="{_e(entry["check"])}"'
    if not entry["made"]:
        return _row([f"<td>{_e(entry['check'])}</td>", '<td class="num">—</td>' * 3, "<td></td>", '<td class="num">—</td>',
                     "<td>—</td>", "<td>not made</td>", f"<td>{_e(basis)}</td>"], css="not-made", attrs=attrs)
    utilization = entry["utilization"]
    status = f'<td class="fails">{FAILS}</td>' if utilization > 1.0 else f'<td class="ok">{PASSES}</td>'
    if entry["check"] == governing:
        status = status.replace("</td>", ", governs</td>")
    cells = [f"<td>{_e(entry['check'])}</td>",
             _cell(_check_value(entry, entry["demand"], system), entry["demand"], "demand"),
             _cell(_check_value(entry, entry["allowable"], system), entry["allowable"], "allowable"),
             _cell(f"{utilization:.3f}", utilization, "utilization"),
             f"<td>{_bar(utilization)}</td>", _cell(_fmt(entry["at"], "length", system), entry["at"]),
             f"<td>{_e(entry['combination'])}</td>", status, f"<td>{_e(basis)}</td>"]
    return _row(cells, css="governing" if entry["check"] == governing else "", attrs=attrs)


def checks_section(document: dict[str, Any], system: str, bases: list[str] | None = None) -> str:
    """The checks table; `bases`: the basis of each check in order (render.basis), else each entry's
    detail in display units."""
    bases = bases or [in_display_units(entry["detail"], system) for entry in document["checks"]]
    rows = [_check_row(entry, document["governing"], system, basis) for entry, basis in zip(document["checks"], bases)]
    table = _table(["check", "demand", "allowable", "utilization", "", "at", "combination", "status", "basis"], rows, (1, 2, 3, 5))
    text = ("<p>Stresses come from the full cross-section stress field (the unit stress fields of the section's finite-element "
            "elasticity solution at every mesh "
            "node, combined linearly for the actions at every station and combination); each demand is the peak over the section "
            "and the member. Utilization = demand / allowable; the interaction check is the sum fa/Fa + fb/Fb itself. "
            "Deflections are relative to the span's supports.</p>")
    return f'<section id="checks"><h2>5. Stresses and checks</h2>{text}{table}{second_order_table(document, system)}</section>'


def second_order_table(document: dict[str, Any], system: str) -> str:
    """Each combination's peak moments of first and second order and its amplification ("" when
    second order is off)."""
    found = document.get("second_order")
    if not found:
        return ""
    rows = []
    for row in found["combinations"]:
        second = "at or beyond its elastic buckling load" if row["beyond_buckling"] else _fmt(row["moment"], "moment", system)
        amplification = row["amplification"]
        rows.append(_row([f"<td>{_e(row['combination'])}</td>", _cell(_fmt(row["first_order_moment"], "moment", system), row["first_order_moment"]),
                          f"<td>{_e(second)}</td>", f"<td>{amplification:.3f}</td>" if amplification is not None else "<td>—</td>"]))
    table = _table(["combination", "peak moment, first order", "peak moment, second order", "amplification"], rows, (1, 2, 3))
    bow = f"an initial bow of {_fmt(found['bow'], 'dimension', system)} in each combination's lowest buckling mode" if found["bow"] else "no initial bow"
    text = (f"<p>Second order: the bending, interaction, shear, equivalent, local and deflection checks use each combination's "
            f"actions from a second-order elastic solve ({found['elements_per_length']} thin-walled beam elements per member length, "
            f"{_e(bow)}); amplification = second-order peak moment / first-order peak moment.</p>")
    return text + table


def final_verdict(document: dict[str, Any], system: str) -> str:
    css = "pass" if document["passes"] else "fail"
    return (f'<section id="final"><h2>8. Verdict</h2><div class="verdict {css}">{_verdict_text(document, system)}</div>'
            "<p class=\"note\">The section passes when every check that could be made has a utilization of 1.000 or less.</p></section>")
