"""Lateral-torsional buckling (docs/design.md sections 7 and 10): the bending allowable reduced for sideways
buckling, from the eigen-solve on the member as it is.

For each combination with major-axis bending: critical_moment = load_factor x the peak |Mz| along the
member; sigma_cr = critical_moment / the elastic modulus of the fibre it compresses; the reduced
allowable Fb_LT = min(Fb, Fb rho, sigma_cr / SF) (sizer.checks.reduction; rho = 1 up to the plateau
lambda_LT = sqrt(Fy / sigma_cr) <= 0.2 of EN 1993-1-1 6.3.2.2, the general case, then the Johnson curve). A combination
under which the member cannot buckle sideways (held along its length) keeps Fb and adds no row;
when none can, the check is not made and says why; demand = the peak major-axis bending stress, |Mz| x the section's
largest stress per unit Mz (exact: the field is linear). Stresses in Pa, moments in N*m.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sizer.checks.reduction import PLATEAU_LATERAL, reduced_allowable, slenderness
from sizer.checks.results import CheckResult
from sizer.checks.stability import StabilityReport
from sizer.design import Design
from sizer.phrase import phrase, q


@dataclass(frozen=True)
class LateralBuckling:
    """One combination's lateral-torsional buckling (see the module docstring)."""

    combination: str
    moment: float  # peak |Mz|, N*m
    at: float  # m
    load_factor: float
    critical_moment: float  # N*m
    critical_stress: float  # Pa
    allowable: float  # Fb_LT, Pa
    demand: float  # Pa

    @property
    def utilization(self) -> float:
        return self.demand / self.allowable if self.allowable > 0 else math.inf


def lateral_buckling(design: Design, report: StabilityReport, bending_allowable: float) -> list[LateralBuckling | None]:
    """Per combination (None where it has no major-axis bending or the check does not apply)."""
    found: list[LateralBuckling | None] = []
    for entry in report.combinations:
        if entry.lateral is None or math.isinf(entry.lateral.load_factor):  # cannot buckle sideways: Fb stands
            found.append(None)
            continue
        found.append(lateral_entry(design, bending_allowable, entry.combination, entry.moment, entry.moment_at, entry.moment_sign,
                                   entry.lateral.load_factor))
    return found


def lateral_entry(design: Design, bending_allowable: float, combination: str, moment: float, at: float, sign: float,
                  load_factor: float) -> LateralBuckling:
    """One combination's LateralBuckling from its peak |Mz| (N*m) at `at` (m), the sign of Mz there
    and its load factor."""
    critical, sigma_cr, allowable = lateral_allowables(design, bending_allowable, np.array([moment]), np.array([sign]), load_factor)
    return LateralBuckling(combination, moment, at, load_factor, float(critical[0]), float(sigma_cr[0]), float(allowable[0]),
                           moment * design.props.sigma_peak[2])


def lateral_allowables(design: Design, bending_allowable: float, moment: np.ndarray, sign: np.ndarray,
                       load_factor: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(critical moment N*m, sigma_cr Pa, Fb_LT Pa) of combinations with peak |Mz| `moment` (N*m),
    the sign of Mz there and one load factor: Fb_LT never rises as the load factor falls (the
    reduction factor never rises with slenderness, sizer.checks.reduction)."""
    props, material, settings = design.props, design.known_material, design.member.checks
    critical = load_factor * moment
    sigma_cr = critical / np.where(sign > 0, props.Sz_top, props.Sz_bottom)
    return critical, sigma_cr, reduced_allowable(bending_allowable, sigma_cr, material.yield_strength, settings.buckling_safety_factor,
                                                 PLATEAU_LATERAL)


def lateral_check(entries: list[LateralBuckling | None], report: StabilityReport, design: Design) -> CheckResult:
    """The largest utilization of any combination against its Fb_LT."""
    if report.lateral_reason:
        return CheckResult("lateral-torsional", None, detail=report.lateral_reason)
    made = [entry for entry in entries if entry is not None]
    if not made:
        if any(entry.lateral is not None for entry in report.combinations):
            return CheckResult("lateral-torsional", None, detail="no sideways buckling mode: the restraints hold the member along its length")
        return CheckResult("lateral-torsional", None, detail="no bending about the section's major axis")
    worst = max(made, key=lambda entry: entry.utilization)
    factor = design.member.checks.buckling_safety_factor
    detail = phrase(f"load factor {worst.load_factor:.3g} on the combination, M_cr = ", q("M_cr", worst.critical_moment, "kN·m", ".4g"),
                    ", σcr = ", q("sigma_cr", worst.critical_stress, "MPa", ".4g"), ", Fb_LT = ", q("Fb_LT", worst.allowable, "MPa", ".4g"),
                    f" (safety factor {factor:g})")
    extra = {"critical_moment": worst.critical_moment, "load_factor": worst.load_factor, "mode": "lateral-torsional",
             "plateau_slenderness": PLATEAU_LATERAL}
    fy = design.known_material.yield_strength
    if fy:
        extra["slenderness"] = float(slenderness(worst.critical_stress, fy))
        detail += f", λ_LT = {extra['slenderness']:.3g} (no reduction up to {PLATEAU_LATERAL:g})"
    return CheckResult("lateral-torsional", worst.utilization, worst.demand, worst.allowable, worst.at, worst.combination, detail=detail,
                       extra=extra)
