"""The reserve factor of a checked section: the largest factor on every load of the governing
combination (self-weight included: it is a load of that combination) at which every check of that
combination still passes.

Found on the full check itself (check_design on the member with that combination alone, its factors
scaled and solved again), so whatever makes the checks non-linear in the loads (buckling reductions,
the Johnson parabola, second-order actions) is in it. The search starts from 1 / utilization (exact
where every check is linear), brackets the factor between a passing and a failing one, and closes
the bracket (secant steps on the utilization kept inside it, then bisection) until
the failing factor is within TOLERANCE of the passing one; the passing one is given (the safe side).
Passing is taken to be monotone in the factor (more load never helps).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from sizer.analysis import solve_member
from sizer.checks.results import CheckReport
from sizer.design import Design

if TYPE_CHECKING:
    from sizer.sections.fields import UnitStressField

TOLERANCE = 0.005  # the failing factor is at most this much (relative) above the factor given
LARGEST = 1e6  # a reserve above this is reported as unbounded
MOST_EVALUATIONS = 40
SECANT_STEPS = 6  # evaluations with secant steps; then plain bisection, which always closes the bracket
SAFE_SIDE = 1 - 1e-7  # a linear step lands just inside, not on the limit's round-off


@dataclass(frozen=True)
class Reserve:
    """factor: the reserve factor (None when no check has any demand in the combination, or it is
    above LARGEST); combination: the governing combination it scales; evaluations: full checks made;
    self_weight: whether the member carries its self-weight (then scaled with the other loads)."""

    factor: float | None
    combination: str | None
    evaluations: int = 0
    self_weight: bool = True

    @property
    def scaled_words(self) -> str:
        """What the factor multiplies, in words."""
        return "self-weight included" if self.self_weight else "no self-weight (self_weight = false)"

    @property
    def note(self) -> str:
        """The reserve in words, with what was scaled."""
        if self.combination is None:
            return "Reserve factor: not found (no check has a governing combination)."
        if self.factor is None:
            return f"Reserve factor: unbounded (no check of combination '{self.combination}' fails below {LARGEST:g} x its loads)."
        return (f"Reserve factor {self.factor:.3f}: every load of combination '{self.combination}', {self.scaled_words}, times this "
                f"factor still passes every check (full checks with the loads scaled, to {TOLERANCE:.1%}; "
                f"{self.evaluations} full checks).")


def governing_combination(report: CheckReport) -> str | None:
    """The combination of the governing check (else of the most utilized check that names one)."""
    named = [c for c in report.made if c.combination is not None]
    return max(named, key=lambda c: c.made_utilization).combination if named else None


def scaled_design(design: Design, combination: str, factor: float) -> Design:
    """The design with `combination` alone, every factor of it (self-weight's case included) times
    `factor`: the design's case solutions with these combinations (solved again where patterns were expanded)."""
    member = design.member
    scaled = {case: value * factor for case, value in member.combinations[combination].items()}
    alone = replace(member, combinations={combination: scaled})
    mass = design.mass_per_length if member.self_weight_case else None
    if design.solution.member is member:  # no pattern expanded: the same case solutions, nothing solved again
        solution = design.solution.with_combinations(alone, mass)
    else:
        solution = solve_member(alone, design.stiffness, mass)
    return Design(alone, solution, design.material, design.spec, design.props, design.stiffness, design.mass_per_length)


def reserve_factor(design: Design, report: CheckReport, unit_field: UnitStressField, tolerance: float = TOLERANCE) -> Reserve:
    """The reserve factor of the checked design (its CheckReport at the loads as given)."""
    from sizer.checks.design_check import check_design

    combination = governing_combination(report)
    if combination is None:
        return Reserve(None, None)
    count = 0

    def utilization(factor: float) -> tuple[bool, float]:
        nonlocal count
        count += 1
        known = (report.stability, factor) if report.stability is not None else None
        checked = check_design(scaled_design(design, combination, factor), unit_field, scaled=known)
        return checked.passes, checked.utilization

    passing, failing = (1.0, math.inf) if report.passes else (0.0, 1.0)
    factor, value = 1.0, report.utilization
    while failing > passing * (1 + tolerance) and count < MOST_EVALUATIONS:
        factor = _next_factor(factor, value, passing, failing, tolerance, count >= SECANT_STEPS)
        if factor > LARGEST:
            return Reserve(None, combination, count, bool(design.member.self_weight_case))
        passes, value = utilization(factor)
        passing, failing = (factor, failing) if passes else (passing, factor)
    return Reserve(passing, combination, count, bool(design.member.self_weight_case))


def _next_factor(factor: float, value: float, passing: float, failing: float, tolerance: float, bisect: bool) -> float:
    """The next factor to try: the linear step factor / utilization (just inside), clipped to at least
    a tolerance inside the bracket [passing, failing]; with `bisect`, or where the bracket is too
    narrow to clip into, its geometric middle (its plain middle while no factor has passed)."""
    step = factor / value * SAFE_SIDE if value > 0 else math.inf
    low, high = passing * (1 + tolerance), failing / (1 + tolerance / 2)
    if math.isinf(failing):
        return max(step, low)
    if bisect or low >= high:
        return math.sqrt(passing * failing) if passing > 0 else failing / 2
    return min(max(step, low), high)
