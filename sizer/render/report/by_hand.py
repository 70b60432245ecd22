"""Section 6 of the calculation record: the governing station worked by hand. At the station of the
largest stress utilization, each stress is written out as its textbook formula with the numbers put
in (N/A, M/S about each axis, V Q / (I t) at the neutral axis, the torsion formula of the shape),
beside the peak of the full section field that the checks use, with a sentence on why they differ;
then the stability hand checks (render.report.hand_stability): column buckling with KL from the eigen-solve, and the
lateral-torsional closed form beside the eigen value.

Q and t come from the section's outline (shapely): Q is the first moment about the neutral axis
of the part beyond it, t the width of the section along the neutral axis. Values in display units.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from sizer import units
from sizer.analysis.section_axes import to_section_axes
from sizer.checks import CheckReport
from sizer.design import Design
from sizer.render.report.hand_stability import hand_stability_html
from sizer.render.report.markup import _e, _fmt
from sizer.render.report.segment import cut_side, governing_cut

if TYPE_CHECKING:
    from sizer.sections.fields import UnitStressField

STRESS_CHECKS = ("axial", "bending", "interaction", "shear", "equivalent", "lateral-torsional", "local")
CLOSE = 0.02  # formula and field within 2 %: "they agree"


@dataclass(frozen=True)
class Station:
    """The station worked by hand: combination, x (m), side of the cut, the check it is for, and the
    actions there in the section's own axes (N, Vy, Vz, T, My, Mz; N and N*m)."""

    combination: str
    x: float
    side: str
    check: str
    actions: np.ndarray
    bimoment: float = 0.0  # B, N*m^2
    warping_torque: float = 0.0  # Tw, N*m (T in actions is the total torque)


def hand_station(design: Design, report: CheckReport, checks: tuple[str, ...] = STRESS_CHECKS) -> Station:
    """The station of the made check among `checks` with the largest utilization (the governing cut
    when there is none)."""
    made = [c for c in report.checks if c.made and c.check in checks and c.at is not None and c.combination]
    if made:
        chosen = max(made, key=lambda c: c.made_utilization)
        assert chosen.combination is not None and chosen.at is not None  # chosen from those that name both
        combination, x, check = chosen.combination, float(chosen.at), chosen.check
    else:
        (combination, x), check = governing_cut(design, report), "largest bending moment"
    side = cut_side(design, report, combination, x)
    from sizer.checks.torsion import torsion_actions

    member_actions = design.solution.actions(combination, [x], side)
    torsion = torsion_actions(design, np.array([x]), np.array([side]))
    row = design.solution.combination_names.index(combination)
    member_actions[:, 3] = torsion.torque[row]
    actions = to_section_axes(member_actions, design.member.orientation)[0]
    scale = 1e-9 * max(1.0, abs(float(torsion.torque[row, 0])) * design.member.length)  # round-off of the twist solve
    bimoment, warping_torque = (float(v[row, 0]) for v in (torsion.bimoment, torsion.warping_torque))
    return Station(combination, x, side, check, np.where(np.abs(actions) < 1e-9, 0.0, actions),
                   bimoment if abs(bimoment) > scale else 0.0, warping_torque if abs(warping_torque) > scale else 0.0)


def neutral_axis_cut(design: Design, across: str) -> tuple[float, float]:
    """(Q in m^3, t in m) for shear along the section's y (`across` = "y": the neutral axis is the
    horizontal line through the centroid) or z (a vertical line)."""
    from shapely.geometry import LineString, box

    from sizer.sections.geometry import MM, outline

    shape = outline(design.spec).geom
    minx, miny, maxx, maxy = shape.bounds
    cy, cz = design.props.centroid
    x_c, y_c = (minx + maxx) / 2 - cz * MM, (miny + maxy) / 2 + cy * MM  # the centroid in outline coordinates (mm)
    if across == "y":
        beyond = shape.intersection(box(minx - 1, y_c, maxx + 1, maxy + 1))
        arm = abs(beyond.centroid.y - y_c) if not beyond.is_empty else 0.0
        chord = LineString([(minx - 1, y_c), (maxx + 1, y_c)])
    else:
        beyond = shape.intersection(box(minx - 1, miny - 1, x_c, maxy + 1))
        arm = abs(beyond.centroid.x - x_c) if not beyond.is_empty else 0.0
        chord = LineString([(x_c, miny - 1), (x_c, maxy + 1)])
    return beyond.area * arm / MM**3, shape.intersection(chord).length / MM


def torsion_formula(design: Design) -> tuple[str, float] | None:
    """(formula text, peak shear stress per unit torque, Pa per N*m) of the shape, or None (polygon)."""
    spec, J = design.spec, design.props.J
    d = spec.dims
    if spec.shape in ("round", "round_tube"):
        return "τ = T r / J", d["diameter"] / 2 / J
    if spec.shape == "rectangular_tube":
        t = d["thickness"]
        enclosed = (d["depth"] - t) * (d["width"] - t)
        return "τ = T / (2 A_m t) (thin closed wall, A_m enclosed by the wall's mid-line)", 1.0 / (2 * enclosed * t)
    if spec.shape == "polygon":
        return None
    t = max(d.get(key, 0.0) for key in ("thickness", "flange_thickness", "web_thickness"))
    if spec.shape == "rectangle":
        t = min(d["depth"], d["width"])
    return "τ = T t_max / J (open section of thin walls)", t / J


def _pct(formula: float, field: float) -> str:
    """How the field compares with the formula, in words."""
    if formula == 0 and field == 0:
        return "both zero"
    if abs(field - formula) <= CLOSE * max(abs(formula), abs(field)):
        return "they agree within 2 %"
    return f"the field is {100 * (field - formula) / formula:+.1f} % against the formula" if formula else "the formula gives zero"


def _stress(value: float, system: str) -> str:
    return _fmt(value, "stress", system)


def by_hand_lines(design: Design, station: Station, unit_field: UnitStressField, system: str) -> list[tuple[str, str, str]]:
    """(what, the formula with numbers, the full field and how it compares) for each stress."""
    props = design.props
    N, Vy, Vz, T, My, Mz = (float(v) for v in station.actions)
    B, Tw = station.bimoment, station.warping_torque
    _, tau = unit_field.stresses(N=N, Vy=Vy, Vz=Vz, T=T - Tw, My=My, Mz=Mz)
    tau = tau + Tw * unit_field.warping_tau
    bend_only, _ = unit_field.stresses(My=My, Mz=Mz)
    f, s = units.fmt, system
    rows = []
    fa = N / props.area
    rows.append(("axial", f"fa = N / A = {f(N, 'force', s)} / {f(props.area, 'area', s)} = {_stress(fa, s)}",
                 f"uniform over the section: {_stress(fa, s)}"))
    fbz = abs(Mz) / min(props.Sz_top, props.Sz_bottom)
    fby = abs(My) / min(props.Sy_plus, props.Sy_minus)
    field_bending = float(np.abs(bend_only).max(initial=0.0))
    text = f"fbz = |Mz| / Sz = {f(abs(Mz), 'moment', s)} / {f(min(props.Sz_top, props.Sz_bottom), 'modulus_section', s)} = {_stress(fbz, s)}"
    if My:
        text += (f"; fby = |My| / Sy = {f(abs(My), 'moment', s)} / {f(min(props.Sy_plus, props.Sy_minus), 'modulus_section', s)} = "
                 f"{_stress(fby, s)}; fbz + fby = {_stress(fbz + fby, s)}")
    rows.append(("bending", text, f"peak {_stress(field_bending, s)}: {_pct(fbz + fby, field_bending)}"))
    if B:
        omega_max = float(unit_field.warping_peaks[0]) * props.Iw
        warping = abs(B) * omega_max / props.Iw
        with_warping = float(np.abs(bend_only + B * unit_field.warping_sigma).max(initial=0.0))
        rows.append(("warping", f"σw = |B| ω_max / Iw = {f(abs(B), 'bimoment', s)} x {omega_max * 1e6:.4g} mm² / "
                                f"{f(props.Iw, 'warping', s)} = {_stress(warping, s)}; at most fbz + fby + σw = {_stress(fbz + fby + warping, s)}",
                     f"bending and warping together: peak {_stress(with_warping, s)} (ω and bending stress peak at different points, "
                     "or with opposite signs)"))
    shear_parts, hand_shear = [], 0.0
    for name, V, inertia, across, label in (("Vy", Vy, props.Iz, "y", "Iz"), ("Vz", Vz, props.Iy, "z", "Iy")):
        if V == 0:
            continue
        Q, t = neutral_axis_cut(design, across)
        value = abs(V) * Q / (inertia * t) if t > 0 else math.inf
        hand_shear += value
        shear_parts.append(f"τ = |{name}| Q / ({label} t) = {f(abs(V), 'force', s)} x {f(Q, 'modulus_section', s)} / "
                           f"({f(inertia, 'inertia', s)} x {f(t, 'dimension', s)}) = {_stress(value, s)}")
    torsion = torsion_formula(design)
    if T - Tw and torsion is not None:
        value = abs(T - Tw) * torsion[1]
        hand_shear += value
        named = "the Saint-Venant torque T - Tw " if Tw else ""
        shear_parts.append(f"{torsion[0]}: {named}{f(abs(T - Tw), 'moment', s)} gives {_stress(value, s)}")
    if shear_parts:
        field_shear = float(np.hypot(tau[:, 0], tau[:, 1]).max(initial=0.0))
        text = "; ".join(shear_parts) + (f"; sum {_stress(hand_shear, s)}" if len(shear_parts) > 1 else "")
        rows.append(("shear", text, f"peak {_stress(field_shear, s)}: {_pct(hand_shear, field_shear)}"))
    return rows


def by_hand_section(design: Design, report: CheckReport, system: str) -> str:
    """The HTML of section 6."""
    from sizer.sections import unit_stress_field

    station = hand_station(design, report)
    unit_field = unit_stress_field(design.spec)
    rows = by_hand_lines(design, station, unit_field, system)
    shear = hand_station(design, report, ("shear",))
    if shear.check == "shear" and not any(what == "shear" for what, _, _ in rows):
        where = f"shear, at the shear check's station x = {_fmt(shear.x, 'length', system)} in {shear.combination}"
        rows += [(where, formula, field) for what, formula, field in by_hand_lines(design, shear, unit_field, system) if what == "shear"]
    actions = ", ".join(f"{name} = {_fmt(value, kind, system)}" for name, value, kind in
                        zip(("N", "Vy", "Vz", "T", "My", "Mz"), station.actions, ("force",) * 3 + ("moment",) * 3) if value)
    body = "".join(f"<tr><th>{_e(what)}</th><td class=\"eq-cell\">{_e(formula)}</td><td>{_e(field)}</td></tr>"
                   for what, formula, field in rows)
    intro = (f"<p>At x = {_fmt(station.x, 'length', system)} ({station.side} face) in combination <b>{_e(station.combination)}</b>, "
             f"the station of the {_e(station.check)} check, the actions in the section's own axes are {_e(actions or 'all zero')}. "
             "Each stress by its textbook formula, beside the peak of the full section field that the checks use:</p>")
    why = ("<p class=\"note\">Why they may differ: the formulas assume the simple beam theory of thin walls and take each action "
           "on its own; the field is the finite-element elasticity solution over the real outline, so it carries the root radii and "
           "fillets (more area near the web, which lowers the shear stress against V Q / (I t)), the stress concentrations at "
           "re-entrant corners (which raise the torsional shear above T t / J), and it adds the actions at one point instead of "
           "adding their separate peaks. For bending about a principal axis the two agree, since S is taken from the same outline.</p>")
    table = f"<table><thead><tr><th></th><th>formula with the numbers</th><th>full field</th></tr></thead><tbody>{body}</tbody></table>"
    return (f'<section id="by-hand"><h2>6. The governing station by hand</h2>{intro}{table}{why}{torsion_paragraph(design, report, system)}'
            f"{hand_stability_html(design, report, system)}</section>")


TORSION_WORDS = {"torque": ("torque T", "moment"), "saint_venant_torque": ("Saint-Venant torque T - Tw", "moment"),
                 "warping_torque": ("warping torque Tw", "moment"), "bimoment": ("bimoment B", "bimoment")}


def torsion_paragraph(design: Design, report: CheckReport, system: str) -> str:
    """The member's torsion in words: where the loads act across the section, the torsion parameter
    and the largest T, T - Tw, Tw and B with where each is ("" when nothing twists the member)."""
    summary = report.torsion
    if summary is None:
        return ""
    offset = math.hypot(*summary.centroid_offset)
    parts = ", ".join(f"{TORSION_WORDS[p.name][0]} {_fmt(p.value, TORSION_WORDS[p.name][1], system)} at x = {_fmt(p.at, 'length', system)} "
                      f"({p.combination})" for p in summary.peaks)
    if summary.parameter:
        solved = (f"Twist by non-uniform torsion, torsion parameter a = √(E Iw / G J) = {_fmt(summary.parameter, 'length', system)}: "
                  "the bimoment B = E Iw φ″ gives the warping normal stress B ω / Iw and the warping torque Tw = -E Iw φ‴ the warping "
                  "shear, both in the full field.")
    else:
        solved = "Twist by uniform torsion (G J): the section's warping settles within about its own size and is left out."
    where = f"the centroid is {_fmt(offset, 'dimension', system)} from the shear centre" if offset else "the centroid is the shear centre"
    return f"<h3>Torsion</h3><p>{_e(solved)} Loads act across the section where `across` says ({_e(where)}). Largest values: {_e(parts)}.</p>"
