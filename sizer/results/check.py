"""The `sizer check` document (SI base units): the verdict, every check with its numbers, the
reactions, the restraint demands, torsion and second order, the assumptions and the cautions."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from sizer.checks import CheckReport, CheckResult
from sizer.design import Design
from sizer.results.forces import REACTION_NAMES
from sizer.results.jsonable import reactions_without_round_off
from sizer.results.notes import CAUTIONS
from sizer.phrase import values_json

if TYPE_CHECKING:
    from sizer.checks.torsion import TorsionSummary


def check_json(design: Design, report: CheckReport, notes: list[str]) -> dict[str, Any]:
    """docs/design.md section 6 `check` document (SI base units)."""
    governing = report.governing
    return {
        "section": report.section,
        "passes": report.passes,
        "utilization": report.utilization,
        "governing": governing.check if governing else None,
        "checks": [check_entry(c) for c in report.checks],
        "reserve_factor": report.reserve.factor if report.reserve is not None else None,
        "reserve_combination": report.reserve.combination if report.reserve is not None else None,
        "reserve_self_weight": report.reserve.self_weight if report.reserve is not None else None,
        "reactions": reactions_json(design),
        "restraints": [demand.to_json() for demand in report.restraints],
        "torsion": torsion_json(report.torsion),
        "second_order": second_order_json(report),
        "mass_per_length": design.mass_per_length,
        "units": "SI base units (m, N, N*m, Pa, kg/m)",
        "assumptions": notes,
        "cautions": list(CAUTIONS),
    }


def check_entry(result: CheckResult) -> dict[str, Any]:
    """One check in the JSON documents: its numbers (SI), the SI `detail` sentence and that sentence's
    numbers as `values` ({name: {"value", "unit"}})."""
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
        "values": values_json(result.detail),
        **result.extra,
    }


def torsion_json(summary: TorsionSummary | None) -> dict[str, Any] | None:
    """The torsion peaks (SI: N*m, N*m^2, m), or None when nothing twists the member."""
    if summary is None:
        return None
    return {"torsion_parameter": summary.parameter, "centroid_from_shear_centre": list(summary.centroid_offset),
            "peaks": {peak.name: {"value": peak.value, "at": peak.at, "combination": peak.combination} for peak in summary.peaks}}


def second_order_json(report: CheckReport) -> dict[str, Any] | None:
    """Each combination's amplification (second-order peak moment / first-order peak moment, N*m),
    or None when the member file turns second order off."""
    found = report.second_order
    if found is None:
        return None
    from sizer.checks.second_order import peak_moment

    rows = []
    for c, (name, amplification, response) in enumerate(zip(found.names, found.amplification, found.responses)):
        rows.append({"combination": name, "amplification": amplification, "first_order_moment": peak_moment(found.first[c]),
                     "moment": peak_moment(found.actions[c]), "beyond_buckling": response.beyond, "load_factor": response.load_factor})
    return {"elements_per_length": found.elements, "bow": found.bow, "combinations": rows}


def reactions_json(design: Design) -> dict[str, list[dict[str, Any]]]:
    out = {}
    for name in design.solution.combination_names:
        reactions = reactions_without_round_off(design.solution.reactions(name), design.member.length)
        out[name] = [{"at": s.at, "type": s.label, **{k: float(v) for k, v in zip(REACTION_NAMES, reactions[i])}}
                     for i, s in enumerate(design.member.supports)]
    return out
