"""Torsion of the checked member: where across the section its loads act (the torque of each about
the shear centre), and the non-uniform torsion of every combination on the design's section
(sizer.analysis.torsion): total torque T, warping torque Tw and bimoment B at the check stations.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.analysis.layout import position_tolerance
from sizer.analysis.torsion import TwistFree, member_torque_columns, solve_torsion
from sizer.design import Design
from sizer.errors import InputError
from sizer.model import Member, PointLoad
from sizer.phrase import joined, phrase, q

WARPING_SIZE_RATIO = 1.0  # a below this x the section's size: uniform torsion (see warping_rigidity)
SYMMETRIC_SHAPES = frozenset({"rectangle", "round", "rectangular_tube", "round_tube", "i_beam"})  # shear centre at the centroid


def member_axes_offset(design: Design) -> tuple[float, float]:
    """(dy, dz) (m) of the centroid from the shear centre in member axes (the section's own axes
    turned a quarter turn for orientation "minor": member (y, z) = (-z_s, y_s))."""
    ys, zs = design.props.shear_centre
    if design.member.orientation == "minor":
        return zs, -ys
    return -ys, -zs


def may_twist(member: Member, shape: str) -> bool:
    """Whether the member's loads can twist a section of this shape: a given torque, a load placed
    off the shear centre by a distance, or a load at the centroid of a shape whose shear centre is
    elsewhere."""
    for load in member.loads:
        torque = load.moment[0] if isinstance(load, PointLoad) else max(abs(load.q_start[3]), abs(load.q_end[3]))
        if torque or isinstance(load.across, float) and load.across != 0.0:
            return True
        if load.across == "centroid" and shape not in SYMMETRIC_SHAPES:
            return True
    return member.self_weight_case is not None and shape not in SYMMETRIC_SHAPES


def check_across(design: Design, points: np.ndarray) -> None:
    """InputError for a load placed across the section outside the section's extent along member z
    (the shear centre itself included: a bracket may carry a load there); points (p, 2): the
    section's points (y, z) from the centroid in its own axes."""
    ys, zs = design.props.shear_centre
    minor = design.member.orientation == "minor"
    sc_z, along = (ys, points[:, 0]) if minor else (zs, points[:, 1])
    extent = (min(float(along.min()), sc_z), max(float(along.max()), sc_z)) if len(along) else (sc_z, sc_z)
    for index, load in enumerate(design.member.given_loads, start=1):
        if isinstance(load.across, float):
            z = sc_z + load.across
            if not extent[0] - 1e-9 <= z <= extent[1] + 1e-9:
                low, high = (1e3 * (v - sc_z) for v in extent)
                raise InputError(design.member.source, f"loads[{index}].across",
                                 f"{load.across * 1e3:+.4g} mm from the shear centre is outside section {design.spec.name} "
                                 f"({low:+.4g} mm to {high:+.4g} mm along z from its shear centre)",
                                 'give a distance within the section, or "centroid" / "shear-centre"')


def warping_rigidity(design: Design) -> float:
    """E Iw for the twist solve (N*m^4): the section's, or 0 (uniform torsion) where its torsion
    parameter a = sqrt(E Iw / G J) is below its size (closed tubes, solid shapes, angles and tees:
    there warping settles within about one section size of where it is held, Saint-Venant's
    principle, and is left out as is common practice; open I and channel shapes have a of 2 to 7
    times their size)."""
    props = design.props
    eiw = design.known_material.elastic_modulus * props.Iw
    if eiw <= 0.0 or np.sqrt(eiw / design.known_stiffness.GJ) < WARPING_SIZE_RATIO * max(props.depth, props.width):
        return 0.0
    return eiw


@dataclass(frozen=True)
class TorsionActions:
    """Torsion of every combination at the stations: (C, n) each."""

    torque: np.ndarray  # T, N*m
    warping_torque: np.ndarray  # Tw, N*m (Saint-Venant torque T - Tw)
    bimoment: np.ndarray  # B, N*m^2

    def warping(self) -> np.ndarray:
        """(C, n, 2) B and Tw, the extra columns of the stress field."""
        return np.stack([self.bimoment, self.warping_torque], axis=-1)


@dataclass(frozen=True)
class TorsionPeak:
    """The largest |value| of one torsion quantity over the stations and combinations."""

    name: str  # "torque", "saint_venant_torque", "warping_torque", "bimoment"
    value: float  # signed, N*m or N*m^2
    at: float  # m
    combination: str


@dataclass(frozen=True)
class TorsionSummary:
    """Torsion of the checked member: its torsion parameter a = sqrt(E Iw / G J) (m; 0 for uniform
    torsion), where across the section its loads act, and the peaks of T, T - Tw, Tw and B."""

    parameter: float
    centroid_offset: tuple[float, float]  # (dy, dz) of the centroid from the shear centre, member axes, m
    peaks: tuple[TorsionPeak, ...]


def torsion_summary(design: Design, torsion: TorsionActions, xs: np.ndarray) -> TorsionSummary | None:
    """The peaks of the torsion actions (None when nothing twists the member)."""
    quantities = {"torque": torsion.torque, "saint_venant_torque": torsion.torque - torsion.warping_torque,
                  "warping_torque": torsion.warping_torque, "bimoment": torsion.bimoment}
    if not np.any(torsion.torque) and not np.any(torsion.bimoment):
        return None
    names = design.solution.combination_names
    eiw = warping_rigidity(design)
    if not eiw:
        quantities = {"torque": torsion.torque}
    peaks = []
    for name, values in quantities.items():
        c, s = np.unravel_index(int(np.argmax(np.abs(values))), values.shape)
        peaks.append(TorsionPeak(name, float(values[c, s]), float(xs[s]), names[c]))
    return TorsionSummary(float(np.sqrt(eiw / design.known_stiffness.GJ)), member_axes_offset(design), tuple(peaks))


def torsion_actions(design: Design, xs: np.ndarray, sides: np.ndarray) -> TorsionActions:
    """T, Tw and B of every combination at stations xs (m) on `sides`, from the non-uniform torsion
    solve on the design's section with every load's torque about the shear centre."""
    solution, member = design.solution, design.solution.member
    stiffness = design.known_stiffness
    columns = member_torque_columns(member, list(solution.cases), solution.self_weight is not None, member_axes_offset(design))
    if not columns.any:
        nothing = np.zeros((len(solution.combination_names), len(xs)))
        return TorsionActions(nothing, nothing, nothing)
    try:
        solved = solve_torsion(member, columns, stiffness.GJ, warping_rigidity(design), position_tolerance(member))
    except TwistFree:
        raise InputError(member.source, "supports", "loads twist the member (given torques, or loads off the shear centre: "
                         "see `across`) and no support holds its twist", 'hold rx at a support, or give across = "shear-centre"') from None
    weights = solution.weights()
    if solution.self_weight is None:
        weights = weights[:, :-1]
    per_column = solved.actions(xs, np.asarray(sides) == "right")  # (K, n, 3)
    combined = np.tensordot(weights, per_column, axes=1) + 0.0
    return TorsionActions(combined[..., 0], combined[..., 1], combined[..., 2])


def torsion_note(design: Design) -> str:
    """How torsion was found, and where across the section the loads act."""
    props = design.props
    dy, dz = member_axes_offset(design)
    places = sorted({load.across if isinstance(load.across, str) else phrase(q("across", load.across, "mm", "+g")) for load in design.member.given_loads
                     if not (isinstance(load, PointLoad) and not any(load.force))})
    offset: str
    if dy or dz:
        offset = phrase("centroid ", q("dz", dz, "mm", "+.3g"), " along z", phrase(", ", q("dy", dy, "mm", "+.3g"), " along y") if dy else "",
                        " from the shear centre")
    else:
        offset = "the centroid is the shear centre"
    weight = "self-weight at the centroid; " if design.member.self_weight_case else ""
    text = phrase("Torsion: loads act across the section at ", joined(", ", places) or "the centroid", " (", offset, f"); {weight}"
                  "each transverse load's torque about the shear centre is added to the given torques; the elastic critical values are "
                  "not changed by these torques (no geometric stiffness from a first-order torque in the linear buckling solve). ")
    eiw = warping_rigidity(design)
    if eiw:
        a = np.sqrt(eiw / design.known_stiffness.GJ)
        return text + phrase("Non-uniform torsion (G J and E Iw, torsion parameter a = ", q("a", a, "m", ".3g"), "): warping held at "
                             "fixed supports or as given, free at pins and rollers; bimoment B and warping torque Tw give the warping "
                             "normal stress B omega / Iw and the warping shear stress in the full field; local wall checks add the peak "
                             "warping stress as uniform compression.")
    a = np.sqrt(design.known_material.elastic_modulus * props.Iw / design.known_stiffness.GJ)
    return text + phrase("Uniform torsion (G J only): the section's torsion parameter a = sqrt(E Iw / G J) = ", q("a", a, "m", ".3g"),
                         " is below its size, so warping settles within about a section size of where it is held and is left out "
                         "(common practice for closed, solid, angle and tee shapes).")
