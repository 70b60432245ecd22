"""Non-uniform (warping) torsion of the member: the twist phi (rad) from G J phi'''' ... exactly,

    E Iw phi'''' - G J phi'' = m(x)        (m: distributed torque, N*m/m, about +x)

on elements between the nodes (ends, supports, point torques, ends of line torques), each solved
exactly: phi = c1 + c2 s + c3 g3(s) + c4 g4(s) + the particular part of a linear m, with g3, g4
hyperbolic (cosh, sinh) on short elements and decaying exponentials on long ones (s along the
element, a = sqrt(E Iw / G J) the torsion parameter). Freedoms per node: phi and phi' (warping).
Twist is held where a support holds rx (springs on rx add stiffness); warping where the support
holds it (Support.holds_warping). With Iw = 0 it is uniform torsion (bar elements, no bimoment).

Outputs at any x: total torque T = G J phi' - E Iw phi''' (on the +x face, as in sizer.analysis.cuts),
warping torque Tw = -E Iw phi''' (Saint-Venant torque T - Tw) and bimoment B = E Iw phi'' (N*m^2),
so that the warping normal stress is B omega / Iw with omega the warping function (u = omega phi').
Torques from loads across the section: torque = dy Fz - dz Fy for a force (Fy, Fz) acting at
(dy, dz) from the shear centre (member axes).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from sizer.analysis.layout import distinct
from sizer.analysis.loads import self_weight_load
from sizer.model import LineLoad, Load, Member, PointLoad

SHORT = 1.0  # elements with length / a up to this use cosh and sinh; longer ones decaying exponentials


@dataclass(frozen=True)
class TorqueLoads:
    """Torques on the member for C load columns: point torques (k,) positions (m) with values (k, C)
    (N*m); line torques from start to end (J,) (m), intensity at start m0 (J, C) (N*m/m) and slope
    (J, C) (N*m/m per m)."""

    at: np.ndarray
    point: np.ndarray
    start: np.ndarray
    end: np.ndarray
    m0: np.ndarray
    slope: np.ndarray

    @property
    def columns(self) -> int:
        return self.point.shape[1]

    @property
    def any(self) -> bool:
        return bool(np.any(self.point) or np.any(self.m0) or np.any(self.slope))


def lever(load: Load, centroid: tuple[float, float]) -> tuple[float, float]:
    """(dy, dz) (m) of the line a transverse load acts on, from the shear centre, member axes:
    `across` "shear-centre" (0, 0), "centroid" `centroid` (the centroid from the shear centre), or a
    distance along z."""
    if load.across == "shear-centre":
        return 0.0, 0.0
    if load.across == "centroid":
        return centroid
    return 0.0, float(load.across)


def load_torque(force_y: float, force_z: float, at: tuple[float, float]) -> float:
    """Torque about the shear centre (N*m, about +x) of a force (Fy, Fz) acting at (dy, dz)."""
    return at[0] * force_z - at[1] * force_y


def across_torque_loads(loads: Sequence[Load], centroid: tuple[float, float]) -> list[Load]:
    """The torques (as `moment` point loads and `mx` line loads, same cases and places) that the
    transverse forces among `loads` exert about the shear centre from where across the section they
    act; `centroid`: (dy, dz) of the centroid from the shear centre (m, member axes). Adding these to
    the member's loads gives a member whose torques are all explicit (for solvers that read mx only)."""
    made: list[Load] = []
    for load in loads:
        if isinstance(load, PointLoad):
            torque = load_torque(load.force[1], load.force[2], lever(load, centroid))
            if torque:
                made.append(PointLoad(load.case, load.at, moment=(torque, 0.0, 0.0), pattern=load.pattern, across="shear-centre"))
        elif isinstance(load, LineLoad):
            arm = lever(load, centroid)
            first, last = (load_torque(q[1], q[2], arm) for q in (load.q_start, load.q_end))
            if first or last:
                made.append(LineLoad(load.case, load.start, load.end, (0.0, 0.0, 0.0, first), (0.0, 0.0, 0.0, last), pattern=load.pattern,
                                     across="shear-centre"))
    return made


def torque_columns(load_sets: Sequence[Sequence[Load]], centroid: tuple[float, float]) -> TorqueLoads:
    """The torques of each load set (one column each): given torques (mx) plus the torque of every
    transverse force about the shear centre from where across the section it acts."""
    at, point, start, end, m0, slope = [], [], [], [], [], []
    columns = len(load_sets)
    for column, loads in enumerate(load_sets):
        for load in loads:
            values = np.zeros(columns)
            if isinstance(load, PointLoad):
                values[column] = load.moment[0] + load_torque(load.force[1], load.force[2], lever(load, centroid))
                if values[column]:
                    at.append(load.at)
                    point.append(values)
            elif isinstance(load, LineLoad) and load.end > load.start:
                arm = lever(load, centroid)
                first = load.q_start[3] + load_torque(load.q_start[1], load.q_start[2], arm)
                last = load.q_end[3] + load_torque(load.q_end[1], load.q_end[2], arm)
                if first or last:
                    start.append(load.start)
                    end.append(load.end)
                    values[column] = first
                    m0.append(values)
                    rate = np.zeros(columns)
                    rate[column] = (last - first) / (load.end - load.start)
                    slope.append(rate)
    return TorqueLoads(np.array(at, dtype=float), _rows(point, columns), np.array(start, dtype=float), np.array(end, dtype=float),
                       _rows(m0, columns), _rows(slope, columns))


def _rows(rows: list[np.ndarray], columns: int) -> np.ndarray:
    return np.array(rows, dtype=float).reshape(len(rows), columns)


def member_torque_columns(member: Member, case_names: Sequence[str], self_weight: bool, centroid: tuple[float, float]) -> TorqueLoads:
    """Torque columns of a solved member: each named case's loads, then the unit self weight (1 N/m
    along gravity, at the centroid) when `self_weight`."""
    sets: list[list[Load]] = [[load for load in member.loads if load.case == name] for name in case_names]
    if self_weight:
        sets.append([self_weight_load(member)])
    return torque_columns(sets, centroid)


def _sinh_less(t: np.ndarray) -> np.ndarray:
    """sinh(t) - t without cancellation for small t."""
    series = t**3 / 6 * (1 + t**2 / 20 * (1 + t**2 / 42 * (1 + t**2 / 72 * (1 + t**2 / 110))))
    return np.where(t < 0.1, series, np.sinh(t) - t)


def _basis(s: np.ndarray, length: float, a: float) -> np.ndarray:
    """(4, 4, n): derivative order 0-3 of the four homogeneous solutions 1, s, g3, g4 at s (m)."""
    one = np.ones_like(s)
    out = np.zeros((4, 4, s.size))
    out[0, 0], out[0, 1], out[1, 1] = one, s, one
    t = s / a
    if length / a <= SHORT:
        cosh_less, sinh = 2 * np.sinh(t / 2) ** 2, np.sinh(t)
        out[:, 2] = [a * a * cosh_less, a * sinh, np.cosh(t), sinh / a]
        out[:, 3] = [a**3 * _sinh_less(t), a * a * cosh_less, a * sinh, np.cosh(t)]
    else:
        left, right = np.exp(-t), np.exp(-(length - s) / a)
        out[:, 2] = [a * left, -left, left / a, -left / a**2]
        out[:, 3] = [a * right, right, right / a, right / a**2]
    return out


def _end_forces(derivatives: np.ndarray, gj: float, eiw: float) -> np.ndarray:
    """(4, k) generalized end forces (on phi1, phi1', phi2, phi2') of k solutions, from their
    derivatives (4, k, 2) at s = 0 and s = l: -T(0), -E Iw phi''(0), T(l), E Iw phi''(l)."""
    torque = gj * derivatives[1] - eiw * derivatives[3]
    return np.stack([-torque[:, 0], -eiw * derivatives[2][:, 0], torque[:, 1], eiw * derivatives[2][:, 1]])


def _particular(s: np.ndarray, m0: np.ndarray, m1: np.ndarray, gj: float) -> np.ndarray:
    """(4, C, n) derivatives 0-3 of phi_p = -(m0 s^2 / 2 + m1 s^3 / 6) / GJ (one column per load)."""
    s = s[None, :]
    m0, m1 = m0[:, None], m1[:, None]
    return np.stack([-(m0 * s**2 / 2 + m1 * s**3 / 6), -(m0 * s + m1 * s**2 / 2), -(m0 + m1 * s), -m1 + 0 * s]) / gj


@dataclass(frozen=True)
class _Element:
    length: float
    h_inverse: np.ndarray  # (4, 4) end freedoms -> basis coefficients
    stiffness: np.ndarray  # (4, 4)


def _element(length: float, a: float, gj: float) -> _Element:
    """Exact stiffness of one element (freedoms phi1, phi1', phi2, phi2'); a = 0: a bar."""
    if a == 0.0:
        k = gj / length
        return _Element(length, np.zeros((4, 4)), k * np.array([[1.0, 0, -1, 0], [0, 0, 0, 0], [-1, 0, 1, 0], [0, 0, 0, 0]]))
    ends = _basis(np.array([0.0, length]), length, a)  # (4 orders, 4 basis, 2 ends)
    h = np.stack([ends[0, :, 0], ends[1, :, 0], ends[0, :, 1], ends[1, :, 1]])
    h_inverse = np.linalg.inv(h)
    stiffness = _end_forces(ends, gj, gj * a * a) @ h_inverse
    return _Element(length, h_inverse, (stiffness + stiffness.T) / 2)


class TorsionSolution:
    """The solved twist of C load columns: reactions and T, Tw, B at any x."""

    def __init__(self, nodes: np.ndarray, elements: list[_Element], loads: TorqueLoads, freedoms: np.ndarray, a: float, gj: float,
                 support_at: np.ndarray, reactions: np.ndarray, tol: float) -> None:
        self.nodes, self._elements, self._loads, self._d = nodes, elements, loads, freedoms
        self.a, self.gj, self.support_at, self.reactions, self._tol = a, gj, support_at, reactions, tol

    def torque(self, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
        """(C, n) total torque T (N*m) on the +x face at each x, by the method of sections."""
        loads, tol = self._loads, self._tol
        at = np.concatenate([loads.at, self.support_at])
        values = np.vstack([loads.point, self.reactions])
        cut = np.where(right[:, None], at[None, :] <= xs[:, None] + tol, at[None, :] < xs[:, None] - tol)
        total = cut.astype(float) @ values
        u = np.clip(xs[:, None], loads.start[None, :], loads.end[None, :]) - loads.start[None, :]
        total += u @ loads.m0 + (u * u / 2) @ loads.slope
        return -total.T + 0.0

    def warping(self, xs: np.ndarray, right: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(C, n) warping torque Tw (N*m) and bimoment B (N*m^2) at each x (zero for a = 0)."""
        columns = self._loads.columns
        tw, bimoment = np.zeros((columns, xs.size)), np.zeros((columns, xs.size))
        if self.a == 0.0:
            return tw, bimoment
        inner = self.nodes[1:-1]
        element = np.where(right, np.searchsorted(inner, xs + self._tol, side="right"), np.searchsorted(inner, xs - self._tol, side="left"))
        eiw = self.gj * self.a**2
        for e in distinct(element):
            where = element == e
            lo, item = self.nodes[e], self._elements[e]
            s = np.clip(xs[where] - lo, 0.0, item.length)
            m0, m1 = element_load(self._loads, self.nodes[e], self.nodes[e + 1], self._tol)
            ends = _particular(np.array([0.0, item.length]), m0, m1, self.gj)  # (4, C, 2)
            d_p = np.stack([ends[0, :, 0], ends[1, :, 0], ends[0, :, 1], ends[1, :, 1]])  # (4, C)
            coefficients = item.h_inverse @ (self._d[2 * e:2 * e + 4] - d_p)  # (4, C)
            basis = _basis(s, item.length, self.a)  # (4, 4, n)
            own = _particular(s, m0, m1, self.gj)  # (4, C, n)
            second = np.einsum("kn,kc->cn", basis[2], coefficients) + own[2]
            third = np.einsum("kn,kc->cn", basis[3], coefficients) + own[3]
            bimoment[:, where], tw[:, where] = eiw * second, -eiw * third
        return tw, bimoment

    def actions(self, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
        """(C, n, 3) T, Tw (N*m) and B (N*m^2) at each x."""
        tw, bimoment = self.warping(xs, right)
        return np.stack([self.torque(xs, right), tw, bimoment], axis=-1)


def element_load(loads: TorqueLoads, lo: float, hi: float, tol: float) -> tuple[np.ndarray, np.ndarray]:
    """(C,) intensity at lo and slope of the line torques on the element from lo to hi (m); nodes
    lie at every end of a line torque, so each covers an element whole or not at all."""
    on = (loads.start <= lo + tol) & (loads.end >= hi - tol)
    m0 = ((loads.m0 + loads.slope * (lo - loads.start)[:, None]) * on[:, None]).sum(axis=0)
    return m0, (loads.slope * on[:, None]).sum(axis=0)


class TwistFree(ValueError):
    """Torques on a member whose supports leave the twist free."""


def solve_torsion(member: Member, loads: TorqueLoads, gj: float, eiw: float, tol: float) -> TorsionSolution:
    """Solve the twist of every column of `loads` exactly (see the module docstring). Raises
    TwistFree when some torque acts and no support holds or springs the twist."""
    a = float(np.sqrt(eiw / gj)) if eiw > 0 else 0.0
    support_at = np.array([s.at for s in member.supports], dtype=float)
    marks = np.concatenate([[0.0, member.length], support_at, loads.at, loads.start, loads.end])
    nodes = distinct(np.clip(np.round(marks / tol) * tol if tol > 0 else marks, 0.0, member.length))
    n, columns = len(nodes), loads.columns
    node_of = lambda x: int(np.argmin(np.abs(nodes - x)))  # noqa: E731
    stiffness, force = np.zeros((2 * n, 2 * n)), np.zeros((2 * n, columns))
    elements = [_element(float(hi - lo), a, gj) for lo, hi in zip(nodes[:-1], nodes[1:])]
    for e, item in enumerate(elements):
        block = slice(2 * e, 2 * e + 4)
        stiffness[block, block] += item.stiffness
        force[block] += _equivalent_loads(item, *element_load(loads, nodes[e], nodes[e + 1], tol), a, gj)
    for x, values in zip(loads.at, loads.point):
        force[2 * node_of(x)] += values
    held, springs = np.zeros(2 * n, bool), np.zeros(2 * n)
    for support in member.supports:
        k = node_of(support.at)
        held[2 * k] |= "rx" in support.restrain
        springs[2 * k] += support.springs.get("rx", 0.0)
        held[2 * k + 1] |= support.holds_warping or a == 0.0
    if a == 0.0:
        held[1::2] = True
    if not (held[0::2].any() or springs.any()):
        if loads.any:
            raise TwistFree("torques act on the member and no support holds its twist")
        return TorsionSolution(nodes, elements, loads, np.zeros((2 * n, columns)), a, gj, support_at, np.zeros((len(support_at), columns)), tol)
    free = ~held
    matrix = stiffness[np.ix_(free, free)] + np.diag(springs[free])
    scale = np.sqrt(np.diag(matrix))
    d = np.zeros((2 * n, columns))
    d[free] = np.linalg.solve(matrix / np.outer(scale, scale), force[free] / scale[:, None]) / scale[:, None]
    exerted = np.where(held[:, None], stiffness @ d - force, -springs[:, None] * d)  # by the supports on the member
    reactions = np.zeros((len(support_at), columns))
    counted: set[int] = set()
    for j, support in enumerate(member.supports):
        k = node_of(support.at)
        if k not in counted:  # two supports at one node: the first carries the node's reaction
            counted.add(k)
            reactions[j] = exerted[2 * k]
    return TorsionSolution(nodes, elements, loads, d, a, gj, support_at, reactions, tol)


def _equivalent_loads(item: _Element, m0: np.ndarray, m1: np.ndarray, a: float, gj: float) -> np.ndarray:
    """(4, C) nodal loads equivalent to the line torque m0 + m1 s on the element (minus the end
    forces of the exact solution with its ends held)."""
    length = item.length
    if a == 0.0:
        return np.stack([m0 * length / 2 + m1 * length**2 / 6, 0 * m0, m0 * length / 2 + m1 * length**2 / 3, 0 * m0])
    ends = _particular(np.array([0.0, length]), m0, m1, gj)  # (4, C, 2)
    d_p = np.stack([ends[0, :, 0], ends[1, :, 0], ends[0, :, 1], ends[1, :, 1]])
    basis = _basis(np.array([0.0, length]), length, a)  # (4, 4, 2)
    held_part = _end_forces(basis, gj, gj * a * a) @ (item.h_inverse @ -d_p)
    return -(held_part + _end_forces(ends, gj, gj * a * a))
