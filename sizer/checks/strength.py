"""The stress checks (docs/design.md section 7): axial, bending, interaction, shear and equivalent. Each reads the full-field peaks and the user's allowables
(Pa); a missing allowable is bad input only when the check has a demand.
"""

from __future__ import annotations

import math

import numpy as np

from sizer.checks.field import FieldPeaks
from sizer.checks.reduction import PLATEAU_SHEAR
from sizer.checks.results import ZERO_ACTION, CheckResult
from sizer.checks.web import shear_panels, shear_slenderness
from sizer.design import Design
from sizer.errors import InputError
from sizer.model import Material, Member
from sizer.phrase import phrase, q


def _place(found: tuple[float, tuple[int, int]], xs: np.ndarray, names: tuple[str, ...]) -> tuple[float, float, str]:
    """(value, x, combination) from FieldPeaks.largest's answer."""
    value, (c, n) = found
    return value, float(xs[n]), names[c]


def _locate(values: np.ndarray, xs: np.ndarray, names: tuple[str, ...]) -> tuple[float, float, str]:
    """(largest value, x, combination) of a (n_combinations, n_stations) array."""
    c, s = np.unravel_index(int(np.argmax(values)), values.shape)
    return float(values[c, s]), float(xs[s]), names[c]


def needs_allowable(member: Member, material: Material, which: str, check: str) -> float:
    value = getattr(material.allowable, which)
    if value is None:
        raise InputError(material.source or member.source, f"materials.{material.name}.allowable.{which}",
                         f"the {check} check needs the '{which}' allowable stress, which is not given",
                         f'add {which} = "... MPa" from your governing code under [materials.{material.name}.allowable]')
    return value


def axial_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """N / A against the tension or compression allowable, whichever governs."""
    member, material = design.member, design.known_material
    results = []
    for sense, which in ((1.0, "tension"), (-1.0, "compression")):
        value, at, combination = _locate(np.maximum(sense * stress.axial, 0.0), xs, names)
        if value * design.props.area <= ZERO_ACTION:
            continue
        allowable = needs_allowable(member, material, which, "axial")
        results.append(CheckResult("axial", value / allowable, value, allowable, at, combination, detail=which))
    if not results:
        return CheckResult("axial", None, detail="no axial force")
    return max(results, key=lambda r: r.made_utilization)


def bending_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """Peak bending stress from My and Mz together (full field) against the bending allowable."""
    if stress.bending_upper.max() <= 0.0:
        return CheckResult("bending", None, detail="no bending moment")
    allowable = needs_allowable(design.member, design.known_material, "bending", "bending")
    value, at, combination = _place(stress.largest(stress.bending_upper, lambda rows, exact: exact[:, 0]), xs, names)
    return CheckResult("bending", value / allowable, value, allowable, at, combination, detail="My and Mz together")


def compression_allowables(design: Design, columns: list) -> np.ndarray:
    """Fa of each combination for the interaction (Pa): the compression allowable, reduced to the
    combination's buckling stress / safety factor where lower; infinite without compression."""
    factor = design.member.checks.buckling_safety_factor
    if all(column is None for column in columns):
        return np.full(len(columns), math.inf)
    allowable = needs_allowable(design.member, design.known_material, "compression", "interaction")
    return np.array([math.inf if column is None else min(allowable, column.stress / factor) for column in columns])


def interaction_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design,
                      fa_allowed: np.ndarray, fb_allowed: np.ndarray) -> CheckResult:
    """fa/Fa + fb/Fb at every station (linear interaction); Fa and Fb per combination (arrays of
    (C,) Pa): Fa in compression reduced for column buckling, Fb for lateral-torsional buckling."""
    has_axial = np.abs(stress.axial).max() * design.props.area > ZERO_ACTION
    if not has_axial or stress.bending_upper.max() <= 0.0:
        return CheckResult("interaction", None, detail="needs axial force and bending together")
    needs_allowable(design.member, design.known_material, "bending", "interaction")
    tension = design.known_material.allowable.tension
    if tension is None and (stress.axial > 0).any():
        tension = needs_allowable(design.member, design.known_material, "tension", "interaction")
    stations = stress.shape[1]
    compression = np.repeat(fa_allowed, stations).reshape(stress.shape)
    bending = np.repeat(fb_allowed, stations)
    fa_ratio = np.where(stress.axial >= 0, stress.axial / (tension or math.inf), -stress.axial / compression).reshape(-1)
    found = stress.largest(fa_ratio + stress.bending_upper / bending, lambda rows, exact: fa_ratio[rows] + exact[:, 0] / bending[rows])
    value, at, combination = _place(found, xs, names)
    c, s = found[1]
    fb = float(stress.exact(np.array([c * stations + s]))[0, 0])
    fa_used = compression[c, s] if stress.axial[c, s] < 0 else (tension if tension is not None else math.inf)
    detail = phrase("fa = ", q("fa", stress.axial[c, s], "MPa", ".3g"), ", fb = ", q("fb", fb, "MPa", ".3g"), ", Fa = ",
                    q("Fa", fa_used, "MPa", ".4g"), ", Fb = ", q("Fb", fb_allowed[c], "MPa", ".4g"))
    return CheckResult("interaction", value, value, 1.0, at, combination, quantity="ratio", detail=detail)


def shear_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """Peak shear stress from Vy, Vz and T together (full field) against the shear allowable, reduced
    where a web panel carrying that row's shear buckles first (sizer.checks.web: the lower of the
    panels along y and z that carry shear in the row)."""
    if stress.shear_upper.max() <= 0.0:
        return CheckResult("shear", None, detail="no shear force or torque")
    allowable = needs_allowable(design.member, design.known_material, "shear", "shear")
    panels = shear_panels(design, xs, allowable)
    if panels is None:
        value, at, combination = _place(stress.largest(stress.shear_upper, lambda rows, exact: exact[:, 1]), xs, names)
        return CheckResult("shear", value / allowable, value, allowable, at, combination, detail="Vy, Vz and T together")
    stations = len(xs)
    station = np.tile(np.arange(stations), stress.shape[0])
    carries = np.abs(stress.flat[:, 1:3]) > ZERO_ACTION  # (rows, 2): shear along y, z
    per_row = np.min(np.where(carries, panels.allowable[:, station].T, allowable), axis=1)
    found = stress.largest(stress.shear_upper / per_row, lambda rows, exact: exact[:, 1] / per_row[rows])
    utilization, (c, s) = found
    row = c * stations + s
    demand, fv = utilization * per_row[row], float(per_row[row])
    detail, extra = "Vy, Vz and T together", {}
    if fv < allowable:
        axis = int(np.argmin(np.where(carries[row], panels.allowable[:, s], np.inf)))
        critical = float(panels.critical[axis, s])
        lam = shear_slenderness(critical, design.known_material.yield_strength)
        extra = {"critical_shear_stress": critical, "k_tau": float(panels.k_tau[axis, s]), "panel_length": float(panels.length[s]),
                 "element": "web" if axis == 0 else "walls across the depth", "plateau_slenderness": PLATEAU_SHEAR}
        if lam is not None:
            extra["slenderness"] = lam
        detail += phrase("; web shear buckling: h = ", q("h", panels.h[axis], "mm", ".4g"), ", t = ", q("t", panels.t[axis], "mm", ".4g"),
                         ", a = ", q("a", panels.length[s], "m", ".4g"), f", k_tau = {panels.k_tau[axis, s]:.3g}, tau_cr = ",
                         q("tau_cr", critical, "MPa", ".4g"), ", ",
                         f"lambda_w = {lam:.3g} (no reduction up to {PLATEAU_SHEAR:g}), " if lam is not None else "",
                         "Fv reduced to ", q("Fv", fv, "MPa", ".4g"), f" (SF {design.member.checks.buckling_safety_factor:g})")
    return CheckResult("shear", float(utilization), float(demand), fv, float(xs[s]), names[c], detail=detail, extra=extra)


def equivalent_check(stress: FieldPeaks, xs: np.ndarray, names: tuple[str, ...], design: Design) -> CheckResult:
    """Peak von Mises stress against the `equivalent` allowable, where given (optional check)."""
    allowable = design.known_material.allowable.equivalent
    if allowable is None:
        return CheckResult("equivalent", None, detail="no 'equivalent' allowable given for the material")
    value, at, combination = _place(stress.largest(stress.equivalent_upper, lambda rows, exact: exact[:, 2]), xs, names)
    return CheckResult("equivalent", value / allowable, value, allowable, at, combination, detail="von Mises")
