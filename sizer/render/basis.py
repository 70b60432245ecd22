"""The basis of each check in one line of words and display-unit numbers: what the demand is, and
for the stability checks the load factor, the elastic critical value and the reduced allowable
(taken from CheckResult.demand, .allowable and .extra, never from the SI `detail` text); a check
not made says why. Shared by the terminal table (the dim line under each row) and the record.
"""

from __future__ import annotations

import math

from sizer import units
from sizer.checks import CheckReport, CheckResult
from sizer.design import Design
from sizer.render.phrases import in_display_units

WHAT = {
    "bending": "peak stress of My, Mz and the bimoment (warping) together, full section field",
    "shear": "peak stress of Vy, Vz and T (Saint-Venant and warping) together, full section field",
    "equivalent": "peak von Mises stress, full section field",
}


def basis_text(result: CheckResult, design: Design, report: CheckReport, system: str) -> str:
    """The basis of `result` (no combination: the caller adds it); for the governing check, what
    second order did to it."""
    text = _basis(result, design, report, system)
    extra = second_order_text(result, system) if result is report.governing else ""
    return f"{text}; {extra}" if extra else text


def second_order_text(result: CheckResult, system: str) -> str:
    """"second order: M = 24.1 kN·m here (first order 22.5 kN·m), amplification 1.07" for a check made
    on second-order actions ("" for the others)."""
    if not result.made:
        return ""
    if "first_order_moment" in result.extra:
        amplification = result.extra.get("amplification")
        factor = f"; the combination's amplification {amplification:.3f}" if amplification is not None else ""
        return (f"second order: M = {units.fmt(result.extra['moment'], 'moment', system)} here "
                f"(first order {units.fmt(result.extra['first_order_moment'], 'moment', system)}){factor}")
    if "first_order" in result.extra and result.quantity == "deflection":
        return f"second order (first order {units.fmt(result.extra['first_order'], 'deflection', system)})"
    return ""


def _basis(result: CheckResult, design: Design, report: CheckReport, system: str) -> str:
    if not result.made:
        return in_display_units(result.detail, system)
    if result.check == "axial":
        return f"N/A in {result.detail}"
    if result.check == "buckling":
        return buckling_basis(result, design, system)
    if result.check == "lateral-torsional":
        return lateral_basis(result, design, report, system)
    if result.check == "local":
        return local_basis(result, design, system)
    if result.check == "shear" and "critical_shear_stress" in result.extra:
        return WHAT["shear"] + "; " + web_shear_basis(result, design, system)
    if result.check in WHAT:
        return WHAT[result.check]
    return in_display_units(result.detail, system)


def plateau_text(result: CheckResult, symbol: str) -> str:
    """"λ_p = 0.91 (no reduction up to 0.673)" from the check's slenderness and plateau ("" without a yield strength)."""
    lam, plateau = result.extra.get("slenderness"), result.extra.get("plateau_slenderness")
    if lam is None or plateau is None:
        return ""
    return f"; {symbol} = {lam:.3g} ({'within' if lam <= plateau else 'beyond'} the plateau {plateau:.3g})"


def web_shear_basis(result: CheckResult, design: Design, system: str) -> str:
    """The web panel, its shear buckling stress and the reduced shear allowable."""
    critical, k_tau, length = result.extra["critical_shear_stress"], result.extra["k_tau"], result.extra["panel_length"]
    return (f"web shear buckling, panel a = {units.fmt(length, 'length', system)}, k_τ = {k_tau:.3g}, "
            f"τ_cr = {units.fmt(critical, 'stress', system)}{plateau_text(result, 'λ_w')}; "
            f"Fv reduced to {units.fmt(result.allowable, 'stress', system)} with {safety_text(design)}")


def safety_text(design: Design) -> str:
    """"SF 2.5", or "default SF 2" when the member file gives none."""
    settings = design.member.checks
    return ("" if settings.buckling_safety_factor_given else "default ") + f"SF {settings.buckling_safety_factor:g}"


def buckling_basis(result: CheckResult, design: Design, system: str) -> str:
    """Mode, load factor and critical load, and the allowable load sigma A / SF with its formula."""
    critical = float(result.extra.get("critical_load") or math.inf)
    mode = in_display_units(result.extra.get("mode", ""), system)
    factor = critical / result.demand if result.demand else math.inf
    area, sf = design.props.area, design.member.checks.buckling_safety_factor
    assert result.allowable is not None  # a made buckling check has its allowable load
    stress = result.allowable * sf / area
    formula = "Euler" if math.isclose(stress, critical / area, rel_tol=1e-9) else "Johnson parabola"
    return (f"{mode}: load factor {factor:.3g}, P_cr = {units.fmt(critical, 'force', system)}; "
            f"allowable load σ A / SF = {units.fmt(stress, 'stress', system)} x {units.fmt(area, 'area', system)} / {sf:g} = "
            f"{units.fmt(result.allowable, 'force', system)} ({formula}, {safety_text(design)})")


def lateral_sigma(design: Design, report: CheckReport, result: CheckResult) -> float:
    """sigma_cr = M_cr / S of the fibre the governing combination compresses (Pa)."""
    critical = result.extra.get("critical_moment")
    if critical is None:
        return math.inf
    sign = 1.0
    stability = report.stability
    if stability is not None:
        found = [c for c in stability.combinations if c.combination == result.combination]
        sign = found[0].moment_sign if found else 1.0
    modulus = design.props.Sz_top if sign > 0 else design.props.Sz_bottom
    return float(critical) / modulus


def lateral_basis(result: CheckResult, design: Design, report: CheckReport, system: str) -> str:
    """Load factor, M_cr, sigma_cr and Fb_LT."""
    factor = result.extra.get("load_factor")
    if factor is None:
        return "no sideways buckling mode: the restraints hold the member along its length; Fb_LT = Fb"
    critical = float(result.extra["critical_moment"])
    sigma = lateral_sigma(design, report, result)
    return (f"load factor {factor:.3g} on the combination: M_cr = {units.fmt(critical, 'moment', system)}, "
            f"σ_cr = M_cr / S = {units.fmt(sigma, 'stress', system)}{plateau_text(result, 'λ_LT')}; Fb_LT = {units.fmt(result.allowable, 'stress', system)} "
            f"with {safety_text(design)}")


def local_basis(result: CheckResult, design: Design, system: str) -> str:
    """The wall, its plate buckling stress and the reduced allowable."""
    critical = result.extra.get("critical_stress")
    wall = result.extra.get("element", "wall")
    critical_text = units.fmt(float(critical), "stress", system) if critical is not None else "none"
    return (f"{wall}: plate buckling σ_cr = {critical_text}{plateau_text(result, 'λ_p')}; reduced allowable {units.fmt(result.allowable, 'stress', system)} "
            f"with {safety_text(design)}; demand = peak compression in that wall")


def combination_text(result: CheckResult) -> str:
    return f"combination {result.combination}" if result.combination else ""
