"""What each restraint must carry: its required force and stiffness, by the stability-bracing rules
of the American steel specification (AISC 360-16 Appendix 6, from memory), common practice for
bracing design ("2 % of the compression flange force"):

- a point restraint holding the member sideways (`hold` includes "lateral"):
      force      P_br = 0.02 M_r C_d / h_o  +  0.01 P_r                 (A-6-7 beams, A-6-3 columns)
      stiffness  k_br = Omega (10 M_r C_d / (L_br h_o)  +  8 P_r / L_br)  (A-6-8, A-6-4), Omega = 2.00;
- a continuous restraint (a deck) holding it sideways, as panel bracing:
      shear      V_br = 0.01 M_r C_d / h_o  +  0.005 P_r                (A-6-5, A-6-1);
      stiffness not assessed (it depends on the deck's own fixings; stated);
- a restraint holding twist (also with a lateral hold): moment M_br = 0.02 M_r (A-6-11); stiffness not assessed (stated).
M_r: the largest |major-axis moment| and P_r the largest axial compression over the lengths the
restraint braces (from the neighbouring braced points, supports or member ends on each side, or over
a continuous restraint's own length), in the combination that needs the most; h_o the distance
between the flanges' centroids (depth - flange thickness; tubes, angles depth - t; other shapes half
the depth, the safe side); L_br the shorter of the braced lengths beside a point restraint; C_d = 2
where the moment changes sign over those lengths (double curvature), else 1.
Units: N, N*m, N/m, m.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.checks.results import ZERO_ACTION
from sizer.design import Design
from sizer.model import Restraint
from sizer.phrase import phrase, q

OMEGA_BRACE = 2.00  # AISC 360-16 Appendix 6, allowable strength design (from memory)
RULE = ("AISC 360-16 Appendix 6 (stability bracing, from memory): a point brace carries 2 % of the compression flange force "
        "(0.02 M_r C_d / h_o) plus 1 % of the axial compression, with stiffness 2.00 x (10 M_r C_d / (L_br h_o) + 8 P_r / L_br); "
        "a continuous one 1 % of the flange force plus 0.5 % of the compression as shear (stiffness not assessed); "
        "a hold against twist 2 % of M_r as a moment (stiffness not assessed)")


@dataclass(frozen=True)
class BraceDemand:
    """One restraint's requirement: `force` N (a point lateral brace), N for the shear of a continuous
    one, N*m (moment) for a twist-only one, see `kind`; `stiffness` N/m or None (not assessed)."""

    restraint: str
    kind: str  # "lateral point", "lateral continuous", "twist"
    force: float
    stiffness: float | None
    combination: str
    moment: float  # M_r, N*m
    compression: float  # P_r, N
    lever: float  # h_o, m
    braced_length: float | None  # L_br, m
    cd: float

    def to_json(self) -> dict:
        return {"restraint": self.restraint, "kind": self.kind, "required_force": self.force if self.kind != "twist" else None,
                "required_moment": self.force if self.kind == "twist" else None, "required_stiffness": self.stiffness,
                "combination": self.combination, "M_r": self.moment, "P_r": self.compression, "h_o": self.lever,
                "L_br": self.braced_length, "C_d": self.cd}


def flange_lever(shape: str, dims: dict[str, float]) -> float:
    """h_o (m): the lever arm between the flange forces (module docstring)."""
    if shape in ("i_beam", "channel", "tee"):
        return dims["depth"] - dims["flange_thickness"]
    if shape in ("rectangular_tube", "angle"):
        return dims["depth"] - dims["thickness"]
    depth = dims.get("depth") or dims.get("diameter") or 0.0
    return depth / 2.0


def _braced_points(design: Design) -> list[float]:
    """Positions held sideways: supports that hold the sideways movement, point lateral restraints,
    the ends of continuous ones, the member's ends."""
    member = design.member
    side = "uz" if member.orientation == "major" else "uy"
    points = {0.0, member.length}
    points |= {s.at for s in member.supports if side in s.restrain or side in s.springs}
    for r in member.restraints:
        if r.lateral:
            points |= {r.start, r.end}
    return sorted(points)


def _label(restraint: Restraint, index: int) -> str:
    where = phrase(q("at", restraint.start, "m")) if not restraint.continuous else \
        phrase(q("from", restraint.start, "m"), " to ", q("to", restraint.end, "m"))
    return phrase(f"restraint {index} at ", where)


def brace_demands(design: Design, actions: np.ndarray, xs: np.ndarray) -> list[BraceDemand]:
    """Every restraint's requirement; actions (C, S, 6) in section axes at stations xs (m)."""
    member = design.member
    if not member.restraints:
        return []
    names = design.solution.combination_names
    lever = flange_lever(design.spec.shape, design.spec.dims)
    moment, compression = actions[..., 5], np.maximum(-actions[..., 0], 0.0)
    points = _braced_points(design)
    tol = 1e-9 * member.length
    found = []
    for index, restraint in enumerate(member.restraints, start=1):
        if restraint.continuous:
            lo, hi = restraint.start, restraint.end
        else:
            lo = max([p for p in points if p < restraint.start - tol], default=restraint.start)
            hi = min([p for p in points if p > restraint.end + tol], default=restraint.end)
        inside = (xs >= lo - tol) & (xs <= hi + tol)
        if not inside.any():
            inside = np.abs(xs - restraint.start) == np.abs(xs - restraint.start).min()
        m_r = np.abs(moment[:, inside]).max(axis=1)
        p_r = compression[:, inside].max(axis=1)
        signs = np.sign(np.where(np.abs(moment[:, inside]) > ZERO_ACTION, moment[:, inside], 0.0))
        cd = np.where((signs > 0).any(axis=1) & (signs < 0).any(axis=1), 2.0, 1.0)
        label = _label(restraint, index)
        if restraint.lateral and not restraint.continuous:
            lengths = [length for length in (restraint.start - lo, hi - restraint.start) if length > tol]
            l_br = min(lengths) if lengths else member.length
            force = 0.02 * m_r * cd / lever + 0.01 * p_r
            stiffness = OMEGA_BRACE * (10.0 * m_r * cd / (l_br * lever) + 8.0 * p_r / l_br)
            c = int(np.argmax(stiffness))
            found.append(BraceDemand(label, "lateral point", float(force[c]), float(stiffness[c]), names[c], float(m_r[c]),
                                     float(p_r[c]), lever, l_br, float(cd[c])))
        elif restraint.lateral:
            shear = 0.01 * m_r * cd / lever + 0.005 * p_r
            c = int(np.argmax(shear))
            found.append(BraceDemand(label, "lateral continuous", float(shear[c]), None, names[c], float(m_r[c]), float(p_r[c]),
                                     lever, None, float(cd[c])))
        if restraint.twist:
            c = int(np.argmax(m_r))
            found.append(BraceDemand(label, "twist", float(0.02 * m_r[c]), None, names[c], float(m_r[c]), float(p_r[c]), lever, None, 1.0))
    return found


def brace_notes(demands: list[BraceDemand]) -> list[str]:
    """The rule, then one line per requirement (SI), for the assumptions."""
    if not demands:
        return []
    lines = [f"Restraints must carry, by {RULE}:"]
    for d in demands:
        basis = phrase("M_r = ", q("M_r", d.moment, "kN·m", ".4g"), ", P_r = ", q("P_r", d.compression, "kN", ".4g"), ", h_o = ",
                       q("h_o", d.lever, "mm", ".4g"))
        if d.kind == "lateral point":
            assert d.stiffness is not None and d.braced_length is not None  # assessed for a point lateral brace
            lines.append(phrase(d.restraint, ", sideways: force ", q("force", d.force, "kN", ".3g"), ", stiffness ",
                                q("stiffness", d.stiffness, "kN/mm", ".3g"), " (", basis, ", L_br = ", q("L_br", d.braced_length, "m", ".4g"),
                                f", C_d = {d.cd:g}; combination {d.combination})."))
        elif d.kind == "lateral continuous":
            lines.append(phrase(d.restraint, ", sideways: shear ", q("shear", d.force, "kN", ".3g"), " along it (", basis,
                                f", C_d = {d.cd:g}; combination {d.combination}); stiffness not assessed."))
        else:
            lines.append(phrase(d.restraint, ", twist: moment ", q("moment", d.force, "kN·m", ".3g"), " (M_r = ", q("M_r", d.moment, "kN·m", ".4g"),
                                f"; combination {d.combination}); stiffness not assessed."))
    return lines
