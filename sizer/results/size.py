"""The `sizer size` document (SI base units) and the candidates each output lists: the choice, the
sections ranked before it (each with why it fails) and the next ones that pass."""

from __future__ import annotations

from typing import Any

from sizer.results.check import check_entry, second_order_json
from sizer.results.cost import costing_json
from sizer.results.notes import CAUTIONS
from sizer.sizing import Candidate, SizingResult


def shown_candidates(result: SizingResult, top: int) -> list[Candidate]:
    """The `top` failing sections ranked next before the choice, the choice, the next ones that pass,
    and those not available that would otherwise rank before the choice."""
    if result.chosen is None:
        return [c for c in result.candidates if c.report is not None]
    position = result.candidates.index(result.chosen)
    lighter = result.candidates[max(0, position - top):position]
    heavier = [c for c in result.candidates[position + 1:] if _runner_up(c) and c not in result.unavailable][:top]
    return lighter + [result.chosen] + heavier + result.unavailable


def _runner_up(candidate: Candidate) -> bool:
    """A heavier section shown after the choice: it passes its full check, or it is shown unchecked."""
    return (candidate.report is not None and candidate.report.passes) or candidate.unchecked


def candidate_entry(candidate: Candidate) -> dict[str, Any]:
    """A candidate in the JSON document; "passes" is null for a runner-up not checked in full."""
    return {
        "section": candidate.name,
        "mass_per_length": candidate.mass_per_length,
        "utilization": candidate.utilization,
        "passes": None if candidate.unchecked else candidate.passes,
        "governing": candidate.governing,
        "basis": candidate.decided_by,
        "utilization_is_lower_bound": candidate.report is None,
        "cost": candidate.costing.cost if candidate.costing is not None else None,
        **costing_json(candidate.costing),
    }


def listed_candidates(result: SizingResult) -> list[Candidate]:
    """Every section ranked before the choice (each with its governing check), the choice, the
    sections after it confirmed to pass, and those not available that would otherwise rank before
    the choice; every candidate when nothing passes."""
    chosen = result.chosen
    if chosen is None:
        return list(result.candidates)
    position = result.candidates.index(chosen)
    after = [c for c in result.candidates[position + 1:] if _runner_up(c) or c in result.unavailable]
    return result.candidates[:position + 1] + after


def size_json(result: SizingResult, notes: list[str]) -> dict[str, Any]:
    """docs/design.md section 6 `size` document (SI base units). Candidates: every lighter section (each with its
    governing check), the choice, and the heavier sections confirmed to pass."""
    chosen = result.chosen
    document: dict[str, Any] = {
        "section": chosen.name if chosen else None,
        "passes": chosen is not None,
        "mass_per_length": chosen.mass_per_length if chosen else None,
        "utilization": chosen.utilization if chosen else None,
        "governing": chosen.governing if chosen else None,
        "checks": [check_entry(c) for c in chosen.full_report.checks] if chosen else [],
        "restraints": [demand.to_json() for demand in chosen.full_report.restraints] if chosen else [],
        "ranked_by": result.ranking.by,
        "include_unstocked": result.ranking.include_unstocked,
        "currency": result.ranking.currency,
        "cost": chosen.costing.cost if chosen else None,
        "reserve_factor": _reserve_factor(chosen),
        "reserve_combination": chosen.full_report.reserve.combination if chosen and chosen.full_report.reserve else None,
        "second_order": second_order_json(chosen.full_report) if chosen else None,
        "candidates": [candidate_entry(c) for c in listed_candidates(result)],
    }
    if chosen is None and result.strongest is not None:
        document["strongest"] = candidate_entry(result.strongest)
    document.update({"units": "SI base units (m, N, N*m, Pa, kg/m)", "assumptions": notes, "cautions": list(CAUTIONS)})
    return document


def _reserve_factor(chosen: Candidate | None) -> float | None:
    return chosen.full_report.reserve.factor if chosen is not None and chosen.full_report.reserve is not None else None
