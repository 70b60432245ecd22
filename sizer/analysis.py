"""Member analysis: reactions, internal actions and displacements of one straight member.

Method. A straight member splits into four uncoupled 1-D problems:

- axial: ux, rigidity EA, loads fx and wx;
- torsion: rx, rigidity GJ, loads mx (point) and mx per length;
- bending in x-y: uy and rz = duy/dx, rigidity EIz, loads fy, mz and wy;
- bending in x-z: uz and ry = -duz/dx, rigidity EIy, loads fz, my and wz.

Each is solved by the stiffness method with nodes at both ends, every support and every hinge.
Point loads and (partial, linearly varying) line loads between nodes enter through their exact
fixed-end forces, written with singularity (Macaulay) functions, so the nodal values are exact for
Euler-Bernoulli theory. (Nodes at load positions as well would be no more exact, and a node very
close to another makes a very stiff short element whose stiffness swamps the long element next to
it in floating point: k_short + k_long == k_short once the gap is below about 1e-5 of the span.)
The x-z problem is solved as an x-y problem in (uz, theta = duz/dx) with the moment my entering as
-my (it does work on ry = -theta).
An internal hinge releases My and Mz: its node has separate rotation freedoms on each side in both
bending problems. A support at a hinge holds the hinge pin, so its ry/rz restraints and rotational
springs act on nothing (the moment is zero on both sides of a hinge); a hinge at an end releases the
member's end from the support's rotational restraint in the same way.

Internal actions at x come from the method of sections: every load and reaction on the left
segment [0, x] is summed exactly (line loads in closed form). They are the actions on the +x face
of the left segment (SPEC section 2): N, Vy, Vz, T, My, Mz, with
    N = -sum fx,  Vy = -sum fy,  Vz = -sum fz,  T = -sum mx,
    Mz = -sum mz - sum (a - x) fy,  My = -sum my + sum (a - x) fz.
Beam convention for x-y loading: V = -Vy, M = Mz (sagging positive).

Displacements inside an element: Hermite cubic (linear for axial and twist) from the nodal values
plus the fixed-fixed particular solution of the element's loads, in singularity functions.

Load combinations are superpositions of the solved cases; self weight is one unit (1 N/m) case
scaled by mass per length * GRAVITY and the combination's factor on the self-weight case.
"""

from __future__ import annotations

import copy
from dataclasses import dataclass, replace
from typing import Sequence

import numpy as np
from numpy.typing import ArrayLike

from sizer.errors import InputError
from sizer.model import ACTIONS, FREEDOMS, LineLoad, Load, Member, PointLoad, Stiffness
from sizer.units import GRAVITY

SIDES: tuple[str, ...] = ("left", "right")
POSITION_TOLERANCE = 1e-9  # relative to the member length: positions closer than this coincide
ENGAGED_TOLERANCE = 1e-9  # relative work of a load on a free rigid-body motion that counts as a mechanism
NULL_TOLERANCE = 1e-10  # relative singular value below which a rigid-body constraint set is deficient
EXTREME_ACTIONS: tuple[str, ...] = ACTIONS + ("V", "M")

# ----------------------------------------------------------------------------------------------
# loads as arrays


@dataclass(frozen=True)
class _Points:
    """Concentrated items: positions (k,) in m and forces (k, 6): Fx, Fy, Fz, Mx, My, Mz (N, N*m)."""

    at: np.ndarray
    forces: np.ndarray


@dataclass(frozen=True)
class _Lines:
    """Line loads: start, end (J,) in m; q0 (J, 4) intensity at start and slope (J, 4) per m, for
    (wx, wy, wz, mx) in N/m and N*m/m."""

    start: np.ndarray
    end: np.ndarray
    q0: np.ndarray
    slope: np.ndarray


def _points_of(loads: Sequence[Load]) -> _Points:
    """The point loads and moments among `loads` as arrays."""
    points = [load for load in loads if isinstance(load, PointLoad)]
    at = np.array([p.at for p in points], dtype=float)
    forces = np.array([tuple(p.force) + tuple(p.moment) for p in points], dtype=float).reshape(-1, 6)
    return _Points(at, forces)


def _lines_of(loads: Sequence[Load]) -> _Lines:
    """The line loads among `loads` (zero-length ones dropped) as arrays."""
    lines = [load for load in loads if isinstance(load, LineLoad) and load.end > load.start]
    start = np.array([ln.start for ln in lines], dtype=float)
    end = np.array([ln.end for ln in lines], dtype=float)
    q0 = np.array([ln.q_start for ln in lines], dtype=float).reshape(-1, 4)
    q1 = np.array([ln.q_end for ln in lines], dtype=float).reshape(-1, 4)
    slope = (q1 - q0) / (end - start)[:, None] if lines else np.zeros((0, 4))
    return _Lines(start, end, q0, slope)


def _concat_points(first: _Points, second: _Points) -> _Points:
    return _Points(np.concatenate([first.at, second.at]), np.vstack([first.forces, second.forces]))


def self_weight_load(member: Member, intensity: float = 1.0) -> LineLoad:
    """Uniform line load of `intensity` N/m along member.gravity over the whole member, in
    member.self_weight_case (case "" when the member has none)."""
    axis, sign = member.gravity
    q = [0.0, 0.0, 0.0, 0.0]
    q[axis] = float(sign) * intensity
    return LineLoad(member.self_weight_case or "", 0.0, member.length, tuple(q), tuple(q))


# ----------------------------------------------------------------------------------------------
# checks of the input


def _tolerance(member: Member) -> float:
    return POSITION_TOLERANCE * member.length


def _load_key(member: Member, load: Load) -> str:
    """'loads[i]' (1-based, as counted in the file) for a load of the member, else 'loads'."""
    for index, candidate in enumerate(member.loads):
        if candidate is load:
            return f"loads[{index + 1}]"
    return "loads"


def _off_member(member: Member, value: float) -> bool:
    tol = _tolerance(member)
    return not np.isfinite(value) or value < -tol or value > member.length + tol


def _check_geometry(member: Member) -> None:
    """Length, supports, springs and hinges on the member; no two supports at one position."""
    file, length = member.source, member.length
    if not (np.isfinite(length) and length > 0):
        raise InputError(file, "member.length", f"the length must be a positive finite value, got {length!r}", 'give e.g. "6 m"')
    for index, support in enumerate(member.supports):
        if _off_member(member, support.at):
            raise InputError(file, f"supports[{index + 1}].at", f"the support at {support.at:g} m is off the member (0 to {length:g} m)",
                             "place it between the member's ends")
        for freedom, k in support.springs.items():
            if freedom not in FREEDOMS or not (np.isfinite(k) and k > 0):
                raise InputError(file, f"supports[{index + 1}].springs.{freedom}", f"a spring must be a positive finite stiffness on one of "
                                 f"{', '.join(FREEDOMS)}, got {k!r}", 'give e.g. uy = "20 kN/mm"')
    ats = sorted((s.at, i) for i, s in enumerate(member.supports))
    for (a, _), (b, j) in zip(ats, ats[1:]):
        if b - a <= _tolerance(member):
            raise InputError(file, f"supports[{j + 1}].at", f"two supports at {b:g} m", "merge them into one support with the union of their freedoms")
    for index, hinge in enumerate(member.hinges):
        if _off_member(member, hinge.at):
            raise InputError(file, f"hinges[{index + 1}].at", f"the hinge at {hinge.at:g} m is off the member (0 to {length:g} m)",
                             "place it between the member's ends")


def _check_loads(member: Member, loads: Sequence[Load]) -> None:
    """Every load on the member and finite; no bending moment exactly at a hinge."""
    file, length, tol = member.source, member.length, _tolerance(member)
    hinges = np.array([h.at for h in member.hinges], dtype=float)
    for load in loads:
        key = _load_key(member, load)
        if isinstance(load, PointLoad):
            if not np.all(np.isfinite(np.r_[load.force, load.moment])):
                raise InputError(file, key, "a load value is not finite", "give finite values")
            if _off_member(member, load.at):
                raise InputError(file, f"{key}.at", f"the load at {load.at:g} m is off the member (0 to {length:g} m)",
                                 "place it between the member's ends")
            if (load.moment[1] or load.moment[2]) and np.any(np.abs(hinges - load.at) <= tol):
                raise InputError(file, f"{key}.at", f"a bending moment at {load.at:g} m acts on a hinge, which cannot take it",
                                 "move it slightly to the side of the hinge where it acts")
        else:
            if not np.all(np.isfinite(np.r_[load.q_start, load.q_end])):
                raise InputError(file, key, "a load value is not finite", "give finite values")
            for name, value in (("from", load.start), ("to", load.end)):
                if _off_member(member, value):
                    raise InputError(file, f"{key}.{name}", f"the line load reaches {value:g} m, off the member (0 to {length:g} m)",
                                     "keep `from` and `to` between the member's ends")
            if load.end < load.start - tol:
                raise InputError(file, f"{key}.to", f"the line load ends ({load.end:g} m) before it starts ({load.start:g} m)",
                                 "give `to` greater than `from`")


def _check_springs_need_stiffness(member: Member, stiffness: Stiffness | None) -> None:
    if stiffness is None and member.has_springs:
        raise InputError(member.source, "member.section", "the support springs make the forces depend on the member's stiffness, "
                         "and no section is given", "give a section")


# ----------------------------------------------------------------------------------------------
# the layout: nodes, hinges and the support freedoms of the four problems


@dataclass(frozen=True)
class _Layout:
    """Nodes (m) and where supports and hinges sit on them."""

    length: float
    tol: float
    nodes: np.ndarray  # (m,) sorted
    split: np.ndarray  # (m,) bool: an interior hinge (separate rotations each side)
    released: np.ndarray  # (m,) bool: any hinge (support rotations about y and z act on nothing)
    support_nodes: np.ndarray  # (n_supports,) node index of each support

    @property
    def lengths(self) -> np.ndarray:
        return np.diff(self.nodes)

    def node_of(self, at: np.ndarray) -> np.ndarray:
        """Index of the node nearest each position."""
        at = np.atleast_1d(np.asarray(at, dtype=float))
        right = np.clip(np.searchsorted(self.nodes, at), 1, len(self.nodes) - 1)
        left = right - 1
        return np.where(np.abs(self.nodes[left] - at) <= np.abs(self.nodes[right] - at), left, right)


def distinct(values: ArrayLike) -> np.ndarray:
    """Sorted distinct values of a 1-D array: np.unique without its masked-array test, which imports
    numpy.ma (about 7 ms of every command's start-up)."""
    ordered = np.sort(np.asarray(values).ravel())
    return ordered[np.concatenate([[True], ordered[1:] != ordered[:-1]])] if ordered.size else ordered


def _merge_positions(positions: np.ndarray, tol: float) -> np.ndarray:
    """Sorted positions with those closer than `tol` to the previous kept one merged."""
    ordered = np.sort(positions)
    kept = [ordered[0]]
    for value in ordered[1:]:
        if value - kept[-1] > tol:
            kept.append(value)
    return np.array(kept)


def _layout(member: Member) -> _Layout:
    """Nodes at the ends, supports and hinges."""
    length, tol = member.length, _tolerance(member)
    xs = [0.0, length] + [s.at for s in member.supports] + [h.at for h in member.hinges]
    nodes = _merge_positions(np.clip(np.array(xs, dtype=float), 0.0, length), tol)
    nodes[0], nodes[-1] = 0.0, length
    layout = _Layout(length, tol, nodes, np.zeros(len(nodes), bool), np.zeros(len(nodes), bool), np.zeros(0, int))
    hinge_nodes = layout.node_of(np.array([h.at for h in member.hinges], dtype=float)) if member.hinges else np.zeros(0, int)
    released = np.zeros(len(nodes), bool)
    released[hinge_nodes] = True
    split = released.copy()
    split[[0, -1]] = False
    support_nodes = layout.node_of(np.array([s.at for s in member.supports], dtype=float)) if member.supports else np.zeros(0, int)
    return _Layout(length, tol, nodes, split, released, support_nodes)


# ----------------------------------------------------------------------------------------------
# the four 1-D problems


@dataclass(frozen=True)
class _Problem:
    """One 1-D stiffness problem. Freedoms: `translation[i]` and `rot_left[i]`, `rot_right[i]` of
    node i (bending; equal except at a split hinge), or `translation[i]` only (axial, torsion)."""

    name: str  # "axial", "torsion", "xy", "xz"
    rigidity: float  # EA, GJ, EIz or EIy
    moving: tuple[str, ...]  # freedom names of the member: translation[, rotation]
    stiffness: np.ndarray  # (n, n) member stiffness (springs not included)
    held: np.ndarray  # (n,) bool: rigidly restrained
    springs: np.ndarray  # (n,) spring stiffness on the freedom, 0 if none
    modes: np.ndarray  # (n, r) free rigid-body motions (null space), zero on held or sprung freedoms
    mode_parts: list[tuple[float, float]]  # extent (m) of each part between hinges
    mode_params: np.ndarray  # (2 * n_parts, r): (a, b) of each part for each mode (v = a + b (x - c) / L)
    translation: np.ndarray  # (m,) freedom index of each node's translation
    rot_left: np.ndarray | None  # (m,) rotation freedom at the left side of each node
    rot_right: np.ndarray | None  # (m,) rotation freedom at the right side of each node

    @property
    def size(self) -> int:
        return len(self.held)

    @property
    def bending(self) -> bool:
        return self.rot_left is not None


# which freedoms of a support belong to which problem, and in which problem component
_PROBLEM_FREEDOMS = {"axial": ("ux", None), "torsion": ("rx", None), "xy": ("uy", "rz"), "xz": ("uz", "ry")}
_RIGIDITY = {"axial": "EA", "torsion": "GJ", "xy": "EIz", "xz": "EIy"}
_POINT_COMPONENT = {"axial": (0, None), "torsion": (3, None), "xy": (1, 5), "xz": (2, 4)}  # (force, moment) in 6-vectors
_MOMENT_SIGN = {"xy": 1.0, "xz": -1.0}  # theta = rz in x-y; theta = -ry in x-z


def _bar_stiffness(lengths: np.ndarray, rigidity: float) -> np.ndarray:
    """Stiffness of a chain of two-node bar elements (N/m or N*m/rad)."""
    m = len(lengths) + 1
    k = rigidity / lengths
    matrix = np.zeros((m, m))
    idx = np.arange(m - 1)
    np.add.at(matrix, (idx, idx), k)
    np.add.at(matrix, (idx + 1, idx + 1), k)
    np.add.at(matrix, (idx, idx + 1), -k)
    np.add.at(matrix, (idx + 1, idx), -k)
    return matrix


def _beam_element_matrices(lengths: np.ndarray, rigidity: float) -> np.ndarray:
    """(ne, 4, 4) Euler-Bernoulli element stiffness, freedoms (v1, theta1, v2, theta2)."""
    le = lengths[:, None, None]
    unit = np.array([[12, 6, -12, 6], [6, 4, -6, 2], [-12, -6, 12, -6], [6, 2, -6, 4]], dtype=float)
    power = np.array([[3, 2, 3, 2], [2, 1, 2, 1], [3, 2, 3, 2], [2, 1, 2, 1]])
    return rigidity * unit[None] / le ** power[None]


def _beam_freedoms(layout: _Layout) -> tuple[np.ndarray, np.ndarray, np.ndarray, int]:
    """Freedom numbers: translation, rotation left and right of each node; total count."""
    m = len(layout.nodes)
    translation, rot_left, rot_right = np.zeros(m, int), np.zeros(m, int), np.zeros(m, int)
    count = 0
    for i in range(m):
        translation[i], rot_left[i] = count, count + 1
        count += 2
        if layout.split[i]:
            rot_right[i] = count
            count += 1
        else:
            rot_right[i] = rot_left[i]
    return translation, rot_left, rot_right, count


def _element_freedoms(translation: np.ndarray, rot_left: np.ndarray, rot_right: np.ndarray) -> np.ndarray:
    """(ne, 4) freedoms (v1, theta1, v2, theta2) of each beam element."""
    return np.stack([translation[:-1], rot_right[:-1], translation[1:], rot_left[1:]], axis=1)


def _parts(layout: _Layout) -> list[tuple[float, float]]:
    """Extents of the parts between interior hinges."""
    cuts = [0.0] + [float(x) for x in layout.nodes[layout.split]] + [layout.length]
    return list(zip(cuts[:-1], cuts[1:]))


def _part_of(layout: _Layout, node: int, side: str) -> int:
    """Index of the part holding `node` on `side`; a split hinge node is in two parts."""
    x = layout.nodes[node]
    hinges = layout.nodes[layout.split]
    return int(np.sum(hinges < x - layout.tol) if side == "left" else np.sum(hinges <= x + layout.tol))


def _rigid_modes(layout: _Layout, holds_translation: np.ndarray, holds_rotation: np.ndarray, bending: bool) -> np.ndarray:
    """Orthonormal basis (2 * n_parts, r) of the rigid-body motions (a, b) of the parts allowed by the
    hinges and the held (rigid or sprung) freedoms. v_j(x) = a_j + b_j (x - c_j) / L; rotation b_j / L.
    For axial and torsion (no bending), one part that only translates (b = 0)."""
    parts = _parts(layout) if bending else [(0.0, layout.length)]
    centres = [(lo + hi) / 2 for lo, hi in parts]
    n = 2 * len(parts)
    rows: list[np.ndarray] = []

    def translation_row(part: int, x: float) -> np.ndarray:
        row = np.zeros(n)
        row[2 * part], row[2 * part + 1] = 1.0, (x - centres[part]) / layout.length
        return row

    def part_at(node: int) -> int:
        return _part_of(layout, node, "left") if bending else 0

    for k, (_, hi) in enumerate(parts[:-1]):
        rows.append(translation_row(k, hi) - translation_row(k + 1, hi))
    for node in np.flatnonzero(holds_translation):
        rows.append(translation_row(part_at(node), float(layout.nodes[node])))
    for node in np.flatnonzero(holds_rotation):
        row = np.zeros(n)
        row[2 * part_at(node) + 1] = 1.0
        rows.append(row)
    if not bending:
        for part in range(len(parts)):
            row = np.zeros(n)
            row[2 * part + 1] = 1.0
            rows.append(row)
    if not rows:
        return np.eye(n)
    _, singular, vh = np.linalg.svd(np.array(rows), full_matrices=True)
    rank = int(np.sum(singular > NULL_TOLERANCE * max(1.0, singular[0])))
    return vh[rank:].T


def _modes_on_freedoms(layout: _Layout, params: np.ndarray, problem_freedoms: tuple[np.ndarray, np.ndarray | None, np.ndarray | None],
                       size: int, bending: bool) -> np.ndarray:
    """Rigid-body modes (size, r) evaluated on the freedoms of a problem."""
    translation, rot_left, rot_right = problem_freedoms
    parts = _parts(layout) if bending else [(0.0, layout.length)]
    centres = np.array([(lo + hi) / 2 for lo, hi in parts])
    modes = np.zeros((size, params.shape[1]))
    for node, x in enumerate(layout.nodes):
        left = _part_of(layout, node, "left") if bending else 0
        modes[translation[node]] = params[2 * left] + params[2 * left + 1] * (x - centres[left]) / layout.length
        if bending:
            right = _part_of(layout, node, "right")
            modes[rot_left[node]] = params[2 * left + 1] / layout.length
            modes[rot_right[node]] = params[2 * right + 1] / layout.length
    return modes


def _support_holds(member: Member, layout: _Layout, freedom: str | None, rotation: bool) -> tuple[np.ndarray, np.ndarray]:
    """Per node: rigidly held (bool) and spring stiffness on `freedom`. Rotations about y and z at a
    hinge are released (the support holds the hinge pin only)."""
    m = len(layout.nodes)
    held, springs = np.zeros(m, bool), np.zeros(m)
    if freedom is None:
        return held, springs
    for support, node in zip(member.supports, layout.support_nodes):
        if rotation and freedom in ("ry", "rz") and layout.released[node]:
            continue
        if freedom in support.restrain:
            held[node] = True
        elif freedom in support.springs:
            springs[node] += support.springs[freedom]
    return held, springs


def _build_problem(name: str, member: Member, layout: _Layout, rigidity: float) -> _Problem:
    """Stiffness, supports and free rigid-body motions of one 1-D problem."""
    main, rotation = _PROBLEM_FREEDOMS[name]
    held_t, spring_t = _support_holds(member, layout, main, rotation=False)
    held_r, spring_r = _support_holds(member, layout, rotation, rotation=True)
    bending = rotation is not None
    parts = _parts(layout) if bending else [(0.0, layout.length)]
    params = _rigid_modes(layout, held_t | (spring_t > 0), held_r | (spring_r > 0), bending)
    if bending:
        translation, rot_left, rot_right, size = _beam_freedoms(layout)
        matrix = np.zeros((size, size))
        dofs = _element_freedoms(translation, rot_left, rot_right)
        ke = _beam_element_matrices(layout.lengths, rigidity)
        np.add.at(matrix, (dofs[:, :, None], dofs[:, None, :]), ke)
        held, springs = np.zeros(size, bool), np.zeros(size)
        held[translation], springs[translation] = held_t, spring_t
        held[rot_left] |= held_r
        springs[rot_left] += spring_r
    else:
        size = len(layout.nodes)
        translation, rot_left, rot_right = np.arange(size), None, None
        matrix = _bar_stiffness(layout.lengths, rigidity)
        held, springs = held_t, spring_t
    modes = _modes_on_freedoms(layout, params, (translation, rot_left, rot_right), size, bending)
    return _Problem(name, rigidity, (main,) + ((rotation,) if rotation else ()), matrix, held, springs, modes, parts, params,
                    translation, rot_left, rot_right)


def _build_problems(member: Member, layout: _Layout, stiffness: Stiffness) -> dict[str, _Problem]:
    for name in _RIGIDITY:
        value = getattr(stiffness, _RIGIDITY[name])
        if not (np.isfinite(value) and value > 0):
            raise ValueError(f"{_RIGIDITY[name]} must be positive and finite, got {value!r}")
    return {name: _build_problem(name, member, layout, getattr(stiffness, _RIGIDITY[name])) for name in _RIGIDITY}


# ----------------------------------------------------------------------------------------------
# loads between nodes: singularity terms and fixed-end forces


@dataclass(frozen=True)
class _Terms:
    """The loads between nodes as singularity-function terms, element by element.

    Term i acts in element `element[i]` at local position `at[i]` (m from the element start) with
    order `power[i]`: the load resultant on [0, s] of the element is sum coef <s - at>^power / power!
    (power 0: point force; 1: uniform line load from `at` on; 2: line load rising from `at` on with
    slope coef; -1: a couple, which adds only to the moment). Columns of `coef` are the problems in
    _PROBLEM_ORDER: axial force, torque, force along y, force along z; a couple's coefficient is
    -mz in the x-y column and +my in the x-z column (moment about the cut = sum of coef <s - at>^0)."""

    element: np.ndarray
    at: np.ndarray
    power: np.ndarray
    coef: np.ndarray  # (T, ..., 4)

    def values(self, s: np.ndarray, elements: np.ndarray, shifts: Sequence[int]) -> list[np.ndarray]:
        """For each shift: (n, ..., 4) sums over the terms in elements[j] of
        coef <s_j - at>^(power + shift) / (power + shift)!. Shift 0: load resultant on [0, s];
        1: its moment about s (for bars: its integral); 2, 3: further integrals from the element start."""
        out = [np.zeros((len(s),) + self.coef.shape[1:]) for _ in shifts]
        for element in sorted(set(elements.tolist()) & set(self.element.tolist())):  # one element at a time: small blocks
            rows, cols = np.flatnonzero(elements == element), np.flatnonzero(self.element == element)
            gap = np.maximum(s[rows, None] - self.at[None, cols], 0.0)
            for values, shift in zip(out, shifts):
                order = self.power[cols] + shift
                powers = np.where((gap > 0) & (order >= 0), gap ** np.maximum(order, 0) / _FACTORIAL[np.maximum(order, 0)], 0.0)
                values[rows] = np.tensordot(powers, self.coef[cols], axes=(1, 0))
        return out

    def weighted(self, factors: np.ndarray) -> "_Terms":
        """The terms of one case (coef (T, 4)) with coef scaled by each factor: coef (T, len(factors), 4)."""
        return _Terms(self.element, self.at, self.power, self.coef[:, None, :] * factors[None, :, None])


def _concat_terms(parts: Sequence[_Terms]) -> _Terms:
    return _Terms(np.concatenate([t.element for t in parts]), np.concatenate([t.at for t in parts]),
                  np.concatenate([t.power for t in parts]), np.concatenate([t.coef for t in parts]))


_PROBLEM_ORDER: tuple[str, ...] = ("axial", "torsion", "xy", "xz")
_FACTORIAL = np.array([1.0, 1.0, 2.0, 6.0, 24.0, 120.0])


def _case_terms(layout: _Layout, loads: Sequence[Load]) -> tuple[np.ndarray, _Terms]:
    """Point loads on nodes (m, 6) and the singularity terms of the loads between nodes."""
    nodal = np.zeros((len(layout.nodes), 6))
    element, at, power, coef = [], [], [], []

    def add(e: int, position: float, order: int, values: np.ndarray) -> None:
        element.append(e)
        at.append(position)
        power.append(order)
        coef.append(values)

    x = layout.nodes
    for load in loads:
        if isinstance(load, PointLoad):
            values = np.array(tuple(load.force) + tuple(load.moment), dtype=float)
            node = int(layout.node_of(np.array([load.at]))[0])
            if abs(x[node] - load.at) <= layout.tol:
                nodal[node] += values
                continue
            e = int(np.searchsorted(x, load.at) - 1)
            add(e, load.at - x[e], 0, values[[0, 3, 1, 2]])
            add(e, load.at - x[e], -1, np.array([0.0, 0.0, -values[5], values[4]]))
            continue
        if load.end <= load.start:
            continue
        q0, q1 = np.array(load.q_start, dtype=float), np.array(load.q_end, dtype=float)
        slope = ((q1 - q0) / (load.end - load.start))[[0, 3, 1, 2]]
        for e in np.flatnonzero((x[1:] > load.start) & (x[:-1] < load.end)):
            lo, hi = max(load.start, x[e]), min(load.end, x[e + 1])
            q_lo = (q0 + (q1 - q0) * (lo - load.start) / (load.end - load.start))[[0, 3, 1, 2]]
            q_hi = q_lo + slope * (hi - lo)
            add(e, lo - x[e], 1, q_lo)
            add(e, lo - x[e], 2, slope)
            add(e, hi - x[e], 1, -q_hi)
            add(e, hi - x[e], 2, -slope)
    terms = _Terms(np.array(element, dtype=int), np.array(at, dtype=float), np.array(power, dtype=int),
                   np.array(coef, dtype=float).reshape(-1, 4))
    return nodal, terms


def _fixed_end_forces(layout: _Layout, terms: _Terms) -> np.ndarray:
    """(ne, 4 problems, 4) forces that rigid clamps at both element ends exert on the element under
    its loads: (R0, C0, R1, C1) at the start and end (bending, in the x-y form; x-z in theta), or
    (R0, 0, R1, 0) for axial and torsion. Bending: with v(0) = v'(0) = 0, the end conditions
    v'(l) = v(l) = 0 on EI v'' = M(s) = -C0 + R0 s + (moment of the loads about s) give
    R0 = 12 (F3 - F2 l / 2) / l^3 and C0 = (R0 l^2 / 2 + F2) / l; equilibrium gives the far end.
    Bars: u(l) = 0 on EA u' = -R0 - (load resultant) gives R0 = -F1 / l."""
    le = layout.lengths
    elements = np.arange(len(le))
    f0, f1, f2, f3 = terms.values(le, elements, range(4))
    out = np.zeros((len(le), 4, 4))
    l = le[:, None]
    r0 = 12 * (f3 - f2 * l / 2) / l**3
    c0 = (r0 * l**2 / 2 + f2) / l
    bar_r0 = -f1 / l
    for column, name in enumerate(_PROBLEM_ORDER):
        if name in ("xy", "xz"):
            out[:, column] = np.stack([r0[:, column], c0[:, column], -r0[:, column] - f0[:, column],
                                       -c0[:, column] + le * r0[:, column] + f1[:, column]], axis=1)
        else:
            out[:, column, 0] = bar_r0[:, column]
            out[:, column, 2] = -bar_r0[:, column] - f0[:, column]
    return out


def _load_vector(problem: _Problem, nodal: np.ndarray, fixed: np.ndarray) -> np.ndarray:
    """Nodal load vector (size,) of one problem: loads on nodes plus the element loads as minus
    their fixed-end forces."""
    vector = np.zeros(problem.size)
    force_col, moment_col = _POINT_COMPONENT[problem.name]
    forces = fixed[:, _PROBLEM_ORDER.index(problem.name)]
    vector[problem.translation] += nodal[:, force_col]
    if problem.bending:
        np.add.at(vector, problem.rot_left, _MOMENT_SIGN[problem.name] * nodal[:, moment_col])
        dofs = _element_freedoms(problem.translation, problem.rot_left, problem.rot_right)
        np.add.at(vector, dofs, -forces)
    else:
        np.add.at(vector, problem.translation[:-1], -forces[:, 0])
        np.add.at(vector, problem.translation[1:], -forces[:, 2])
    return vector


# ----------------------------------------------------------------------------------------------
# solving and mechanisms


def _engaged_modes(problem: _Problem, load: np.ndarray, length: float) -> np.ndarray | None:
    """The rigid-body motion (a, b per part) that the load drives, or None when it does no work on
    any free motion. `load`: (size,) nodal loads."""
    if problem.modes.shape[1] == 0:
        return None
    is_rotation = np.ones(problem.size, bool)
    is_rotation[problem.translation] = False
    scale = np.sum(np.abs(load[~is_rotation])) + np.sum(np.abs(load[is_rotation])) / length
    work = problem.modes.T @ load
    if scale == 0 or np.max(np.abs(work)) <= ENGAGED_TOLERANCE * scale:
        return None
    return problem.mode_params @ work


def _describe_motion(problem: _Problem, params: np.ndarray, length: float, tol: float) -> tuple[list[str], list[tuple[float, float]]]:
    """Freedom names and part extents of a driven rigid-body motion."""
    main = problem.moving[0]
    if not problem.bending:
        return [main], []
    rotation = problem.moving[1]
    size = np.max(np.abs(params))
    names: list[str] = []
    moving_parts: list[tuple[float, float]] = []
    for part, (lo, hi) in enumerate(problem.mode_parts):
        a, b = params[2 * part], params[2 * part + 1]
        if max(abs(a), abs(b)) <= 1e-6 * size:
            continue
        moving_parts.append((lo, hi))
        if abs(b) <= 1e-6 * size:
            found = [main]
        else:
            centre = (lo + hi) / 2
            pivot = centre - a * length / b
            found = [rotation] if lo - tol <= pivot <= hi + tol else [main, rotation]
        names += [name for name in found if name not in names]
    return names, moving_parts


_FIXES = {
    "axial": "hold ux at one support (a pin or fixed), or remove the axial loads (fx, wx)",
    "torsion": "hold rx at one support (fixed, pin and roller all hold it), or remove the torques (mx)",
    "xy": "hold uy at two supports or add a fixed support (holds rz) on each part between hinges, or remove the fy, wy and mz loads",
    "xz": "hold uz at two supports or add a fixed support (holds ry) on each part between hinges, or remove the fz, wz and my loads",
}


def _mechanism_error(member: Member, case: str, findings: list[tuple[_Problem, np.ndarray]], layout: _Layout) -> InputError:
    """The InputError for the driven rigid-body motions found in one load case."""
    names: list[str] = []
    parts: list[tuple[float, float]] = []
    for problem, params in findings:
        found_names, found_parts = _describe_motion(problem, params, layout.length, layout.tol)
        names += [name for name in found_names if name not in names]
        parts += [part for part in found_parts if part not in parts and len(problem.mode_parts) > 1]
    where = ""
    if parts:
        where = " (" + ", ".join(f"the part from {lo:g} m to {hi:g} m" for lo, hi in parts) + ")"
    label = case if case else "(unnamed)"
    fixes = "; ".join(_FIXES[problem.name] for problem, _ in findings)
    return InputError(member.source, "supports", f"mechanism: the member is free to move in {', '.join(names)}{where} under load case '{label}'", fixes)


def _solve_free(problem: _Problem, loads: np.ndarray) -> np.ndarray:
    """Displacements (size, c) for load columns (size, c), zero component along free rigid-body
    motions (which the loads must not drive). Diagonally scaled for conditioning."""
    free = ~problem.held
    matrix = problem.stiffness[np.ix_(free, free)] + np.diag(problem.springs[free])
    scale = np.sqrt(np.diag(matrix))
    scaled = matrix / np.outer(scale, scale)
    rhs = loads[free] / scale[:, None]
    modes = problem.modes[free] / scale[:, None]
    r = modes.shape[1]
    if r:
        modes = modes / np.linalg.norm(modes, axis=0)
        scaled = np.block([[scaled, modes], [modes.T, np.zeros((r, r))]])
        rhs = np.vstack([rhs, np.zeros((r, rhs.shape[1]))])
    solution = np.linalg.solve(scaled, rhs)[: int(free.sum())]
    displacement = np.zeros(loads.shape)
    displacement[free] = solution / scale[:, None]
    return displacement


# ----------------------------------------------------------------------------------------------
# results of one case


@dataclass(frozen=True)
class _Field:
    """Nodal displacements and element loads of C load sets (cases or combinations) on one layout,
    for displacements between nodes. Node arrays (m, C): ux, rx; uy, rz left/right; uz and
    theta = duz/dx left/right. terms.coef (T, C, 4); fixed (ne, C, 4, 4), see _fixed_end_forces."""

    nodes: np.ndarray
    axial: np.ndarray
    twist: np.ndarray
    v: np.ndarray
    rz_left: np.ndarray
    rz_right: np.ndarray
    w: np.ndarray
    theta_left: np.ndarray
    theta_right: np.ndarray
    terms: _Terms
    fixed: np.ndarray
    stiffness: Stiffness
    tol: float


_NODAL_FIELDS = ("axial", "twist", "v", "rz_left", "rz_right", "w", "theta_left", "theta_right")


def _combine_fields(fields: Sequence[_Field], weights: np.ndarray) -> _Field:
    """The field of the combinations weights (C, S) @ fields (S fields of one load set each)."""
    first = fields[0]
    nodal = {name: np.column_stack([getattr(f, name)[:, 0] for f in fields]) @ weights.T for name in _NODAL_FIELDS}
    terms = _concat_terms([_Terms(f.terms.element, f.terms.at, f.terms.power, f.terms.coef[:, 0, :]).weighted(weights[:, j])
                           for j, f in enumerate(fields)])
    fixed = np.einsum("cs,senk->ecnk", weights, np.stack([f.fixed[:, 0] for f in fields]))
    return _Field(first.nodes, **nodal, terms=terms, fixed=fixed, stiffness=first.stiffness, tol=first.tol)


def _rescaled_field(f: _Field, stiffness: Stiffness) -> _Field:
    """The field of the same loads on rigidities `stiffness`: with no springs each of the four problems
    has stiffness matrix rigidity x (its unit-rigidity matrix), so its displacements scale as 1 / rigidity."""
    axial, torsion, xy, xz = (old / new for old, new in ((f.stiffness.EA, stiffness.EA), (f.stiffness.GJ, stiffness.GJ),
                                                        (f.stiffness.EIz, stiffness.EIz), (f.stiffness.EIy, stiffness.EIy)))
    return replace(f, axial=f.axial * axial, twist=f.twist * torsion, v=f.v * xy, rz_left=f.rz_left * xy, rz_right=f.rz_right * xy,
                   w=f.w * xz, theta_left=f.theta_left * xz, theta_right=f.theta_right * xz, stiffness=stiffness)


def _field_displacements(f: _Field, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
    """(C, n, 6) ux, uy, uz, rx, ry, rz of each load set of the field at stations xs."""
    count = np.where(right, np.searchsorted(f.nodes, xs + f.tol, "right"), np.searchsorted(f.nodes, xs - f.tol, "left"))
    e = np.clip(count - 1, 0, len(f.nodes) - 2)
    le = (f.nodes[e + 1] - f.nodes[e])[:, None]
    s = np.clip(xs[:, None] - f.nodes[e][:, None], 0.0, le)
    s = np.where(s <= f.tol, 0.0, np.where(s >= le - f.tol, le, s))  # on a node: exactly the nodal values
    xi = s / le
    value, slope = _particular(f, e, s[:, 0])
    interior = ((s > 0) & (s < le))[:, :, None]  # the particular solution vanishes at the nodes
    value, slope = value * interior, slope * interior
    out = np.empty((f.axial.shape[1], xs.size, 6))
    out[:, :, 0] = (f.axial[e] * (1 - xi) + f.axial[e + 1] * xi + value[:, :, 0]).T
    out[:, :, 3] = (f.twist[e] * (1 - xi) + f.twist[e + 1] * xi + value[:, :, 1]).T
    v, rz = _hermite(xi, le, f.v[e], f.rz_right[e], f.v[e + 1], f.rz_left[e + 1])
    w, theta = _hermite(xi, le, f.w[e], f.theta_right[e], f.w[e + 1], f.theta_left[e + 1])
    out[:, :, 1], out[:, :, 5] = (v + value[:, :, 2]).T, (rz + slope[:, :, 2]).T
    out[:, :, 2], out[:, :, 4] = (w + value[:, :, 3]).T, (-(theta + slope[:, :, 3])).T
    return out + 0.0


def _as_stations(x: ArrayLike, length: float, tol: float) -> np.ndarray:
    """x as a 1-D float array, checked to lie on the member."""
    xs = np.atleast_1d(np.asarray(x, dtype=float)).ravel()
    if xs.size and (not np.all(np.isfinite(xs)) or xs.min() < -tol or xs.max() > length + tol):
        raise ValueError(f"stations must lie on the member, 0 to {length:g} m")
    return xs


def _right_side(side: str | ArrayLike, n: int) -> np.ndarray:
    """Bool (n,): True where the value just right of x is wanted. `side`: "left", "right" or an
    array of those, one per station."""
    if isinstance(side, str):
        if side not in SIDES:
            raise ValueError(f"side must be one of {SIDES}, got {side!r}")
        return np.full(n, side == "right")
    sides = np.asarray(side)
    if sides.shape != (n,) or not np.all(np.isin(sides, SIDES)):
        raise ValueError(f"side must be 'left', 'right' or an array of those with one per station ({n})")
    return sides == "right"


def _hermite(xi: np.ndarray, le: np.ndarray, v1, t1, v2, t2) -> tuple[np.ndarray, np.ndarray]:
    """Cubic Hermite interpolation of end values and slopes: value and slope d/dx."""
    xi2, xi3 = xi * xi, xi * xi * xi
    value = (1 - 3 * xi2 + 2 * xi3) * v1 + le * (xi - 2 * xi2 + xi3) * t1 + (3 * xi2 - 2 * xi3) * v2 + le * (xi3 - xi2) * t2
    slope = ((6 * xi2 - 6 * xi) * v1 + le * (1 - 4 * xi + 3 * xi2) * t1 + (6 * xi - 6 * xi2) * v2 + le * (3 * xi2 - 2 * xi) * t2) / le
    return value, slope


def _particular(field: _Field, e: np.ndarray, s: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Fixed-fixed solutions at local positions s (n,) of elements e under the element loads:
    (n, C, 4) values (ux, rx, uy, uz) and slopes (-, -, duy/dx, duz/dx). Bending:
    EI v = -C0 s^2 / 2 + R0 s^3 / 6 + F3(s); bars: EA u = -R0 s - F1(s)."""
    k = field.stiffness
    rigidity = np.array([k.EA, k.GJ, k.EIz, k.EIy])
    f1, f2, f3 = field.terms.values(s, e, (1, 2, 3))
    r0, c0 = field.fixed[e, :, :, 0], field.fixed[e, :, :, 1]
    col = s[:, None, None]
    value = np.where([False, False, True, True], -c0 * col**2 / 2 + r0 * col**3 / 6 + f3, -r0 * col - f1) / rigidity
    slope = (-c0 * col + r0 * col**2 / 2 + f2) / rigidity
    return value, slope


def _section_actions(sources: Sequence[tuple[_Points, _Lines] | None], weights: np.ndarray, xs: np.ndarray, right: np.ndarray,
                     tol: float) -> np.ndarray:
    """(C, n, 6) N, Vy, Vz, T, My, Mz on the +x face of the left segment [0, x] for the C load sets
    weights (C, S) @ sources (S sets of concentrated items and line loads; None: nothing).
    Minus the resultant of the items (at a < x, or a <= x where `right`) and line loads on [0, x],
    moments about the cut: Mz = -sum mz - sum (a - x) Fy, My = -sum my + sum (a - x) Fz."""
    n_sets = weights.shape[0]
    used = [(j, src) for j, src in enumerate(sources) if src is not None]
    at = np.concatenate([src[0].at for _, src in used]) if used else np.zeros(0)
    forces = np.concatenate([src[0].forces[:, None, :] * weights[:, j][None, :, None] for j, src in used]) if used else np.zeros((0, n_sets, 6))
    cut = np.where(right[:, None], at[None, :] <= xs[:, None] + tol, at[None, :] < xs[:, None] - tol).astype(float)
    sums = np.tensordot(cut, forces, axes=(1, 0))  # (n, C, 6)
    first = np.tensordot(cut, at[:, None, None] * forces[:, :, :3], axes=(1, 0))  # (n, C, 3): sum of a * F
    lines = [(j, src[1]) for j, src in used if len(src[1].start)]
    if lines:
        start = np.concatenate([ln.start for _, ln in lines])
        end = np.concatenate([ln.end for _, ln in lines])
        q0 = np.concatenate([ln.q0[:, None, :] * weights[:, j][None, :, None] for j, ln in lines])  # (J, C, 4)
        slope = np.concatenate([ln.slope[:, None, :] * weights[:, j][None, :, None] for j, ln in lines])
        u = np.clip(xs[:, None], start[None, :], end[None, :]) - start[None, :]
        u2, u3 = u * u / 2, u**3 / 3
        sums[:, :, :4] += np.tensordot(u, q0, axes=(1, 0)) + np.tensordot(u2, slope, axes=(1, 0))
        lever = start[:, None, None]
        first += (np.tensordot(u, lever * q0, axes=(1, 0)) + np.tensordot(u2, lever * slope + q0, axes=(1, 0))
                  + np.tensordot(u3, slope, axes=(1, 0)))[:, :, :3]
    out = np.empty((n_sets, xs.size, 6))
    x = xs[:, None]
    out[:, :, :4] = -sums[:, :, :4].transpose(1, 0, 2)
    out[:, :, 4] = (-sums[:, :, 4] + first[:, :, 2] - x * sums[:, :, 2]).T
    out[:, :, 5] = (-sums[:, :, 5] - first[:, :, 1] + x * sums[:, :, 1]).T
    return out + 0.0  # no negative zeros


class CaseSolution:
    """One solved load case: reactions, and actions and displacements at any x (m)."""

    def __init__(self, case: str, length: float, positions: np.ndarray, reactions: np.ndarray, points: _Points, lines: _Lines,
                 field: _Field | None, tol: float) -> None:
        self.case = case
        self.length = length
        self.positions = positions
        self.reactions = reactions
        self.has_displacements = field is not None
        self._items = _concat_points(points, _Points(positions, reactions))
        self._lines = lines
        self._field = field
        self._tol = tol

    def point_items(self) -> tuple[np.ndarray, np.ndarray]:
        """Concentrated items: point loads (in the order given) then reactions (support order).
        Returns positions (k,) in m and forces (k, 6): Fx, Fy, Fz, Mx, My, Mz (N, N*m).
        Line loads are not included; see line_items()."""
        return self._items.at.copy(), self._items.forces.copy()

    def line_items(self) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
        """Line loads: start (J,), end (J,), intensities at start and end (J, 4): wx, wy, wz, mx."""
        lines = self._lines
        return lines.start.copy(), lines.end.copy(), lines.q0.copy(), lines.q0 + lines.slope * (lines.end - lines.start)[:, None]

    def actions(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) N, Vy, Vz, T, My, Mz (N, N*m) on the +x face of the left segment at each x, by the
        method of sections. side "left": concentrated items at x excluded; "right": included."""
        xs = _as_stations(x, self.length, self._tol)
        return _section_actions([self.sources()], np.ones((1, 1)), xs, _right_side(side, xs.size), self._tol)[0]

    def sources(self) -> tuple[_Points, _Lines]:
        """Concentrated items (loads and reactions) and line loads of this case, for sections."""
        return self._items, self._lines

    def displacements(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) ux, uy, uz (m) and rx, ry, rz (rad) at each x; side matters only for rotations at
        hinges. Raises ValueError when the case was solved without the member's stiffness."""
        if self._field is None:
            raise ValueError("displacements need the member's stiffness (a section); this case was solved with unit rigidities")
        xs = _as_stations(x, self.length, self._tol)
        return _field_displacements(self._field, xs, _right_side(side, xs.size))[0]

    def field(self) -> _Field | None:
        """The displacement field of this case (None without stiffness), for combining."""
        return self._field

    def on_rigidities(self, stiffness: Stiffness) -> "CaseSolution":
        """This case on other rigidities (see MemberSolution.for_section): the same forces, the
        displacements scaled by old / new rigidity, problem by problem."""
        if self._field is None:
            raise ValueError("this case was solved without rigidities; solve it with Stiffness.unit() to rescale it")
        moved = copy.copy(self)
        moved._field = _rescaled_field(self._field, stiffness)
        return moved


# ----------------------------------------------------------------------------------------------
# solving cases


def _element_start_actions(problem: _Problem, layout: _Layout, u: np.ndarray, fixed: np.ndarray, elements: np.ndarray) -> np.ndarray:
    """(len(elements), 2) internal (force, moment) actions of the problem just right of each element's
    start node, from the force the node exerts on the element: k u + fixed-end force (N, N*m; the
    global sign of the action, My for the x-z problem)."""
    le = layout.lengths[elements]
    forces = fixed[elements, _PROBLEM_ORDER.index(problem.name)]
    out = np.zeros((len(elements), 2))
    if problem.bending:
        dofs = _element_freedoms(problem.translation, problem.rot_left, problem.rot_right)[elements]
        ke = _beam_element_matrices(le, problem.rigidity)
        end_forces = np.einsum("eij,ej->ei", ke[:, :2, :], u[dofs]) + forces[:, :2]
        out[:, 0] = -end_forces[:, 0]
        out[:, 1] = -_MOMENT_SIGN[problem.name] * end_forces[:, 1]
    else:
        nodes = problem.translation
        out[:, 0] = -(problem.rigidity / le * (u[nodes[elements]] - u[nodes[elements + 1]]) + forces[:, 0])
    return out


def _active_supports(problem: _Problem, layout: _Layout) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Supports acting in this problem, by position: indices, and whether each holds (rigidly or by
    a spring) the translation and the rotation."""
    nodes = layout.support_nodes
    holds = problem.held | (problem.springs > 0)
    translation = holds[problem.translation[nodes]]
    rotation = holds[problem.rot_left[nodes]] if problem.bending else np.zeros(len(nodes), bool)
    active = np.flatnonzero(translation | rotation)
    active = active[np.argsort(layout.nodes[nodes[active]], kind="stable")]
    return active, translation[active], rotation[active]


def _problem_reactions(problem: _Problem, layout: _Layout, u: np.ndarray, loads: tuple[_Points, _Lines], fixed: np.ndarray,
                       positions: np.ndarray) -> np.ndarray:
    """(n_supports, 2) reactions (force, moment) of each support in this problem.

    Computed by statics, bay by bay: between two neighbouring acting supports, the actions just
    right of the start of the bay's longest element (from its end forces, well conditioned) give
    the resultant of all reactions to its left; before the first support it is zero and after the
    last it balances the loads. Each reaction is the difference of neighbouring resultants. (The
    residual K u - F would lose digits on short elements.)"""
    out = np.zeros((len(positions), 2))
    active, holds_translation, holds_rotation = _active_supports(problem, layout)
    if not len(active):
        return out
    force_col, moment_col = _POINT_COMPONENT[problem.name]
    nodes = layout.support_nodes[active]
    starts, stops = nodes[:-1], nodes[1:]
    lengths = layout.lengths
    longest = np.array([start + int(np.argmax(lengths[start:stop])) for start, stop in zip(starts, stops)], dtype=int)
    xs = np.concatenate([layout.nodes[longest], [layout.length]])
    elastic = np.vstack([_element_start_actions(problem, layout, u, fixed, longest), np.zeros((1, 2))])
    from_loads = _section_actions([loads], np.ones((1, 1)), xs, np.ones(xs.size, bool), layout.tol)[0]
    columns = [force_col] + ([moment_col] if moment_col is not None else [])
    of_reactions = elastic[:, : len(columns)] - from_loads[:, columns]
    force = np.concatenate([[0.0], -of_reactions[:, 0]])  # resultant force of the reactions left of each bay
    reaction_force = np.diff(force)
    out[active, 0] = np.where(holds_translation, reaction_force, 0.0)
    if moment_col is not None:
        # moment about the origin of the reactions left of each bay: -M(x) + x F (Mz) or -M(x) - x F (My)
        lever = 1.0 if moment_col == 5 else -1.0
        moment = np.concatenate([[0.0], -of_reactions[:, 1] + lever * xs * force[1:]])
        reaction_moment = np.diff(moment) - lever * positions[active] * reaction_force
        out[active, 1] = np.where(holds_rotation, reaction_moment, 0.0)
    return out


def _reactions(problems: dict[str, _Problem], layout: _Layout, displacement: dict[str, np.ndarray], column: int,
               loads: tuple[_Points, _Lines], fixed: np.ndarray, positions: np.ndarray) -> np.ndarray:
    """(n_supports, 6) reactions Fx, Fy, Fz, Mx, My, Mz of each support for one load column."""
    reactions = np.zeros((len(positions), 6))
    for name, problem in problems.items():
        values = _problem_reactions(problem, layout, displacement[name][:, column], loads, fixed, positions)
        force_col, moment_col = _POINT_COMPONENT[name]
        reactions[:, force_col] = values[:, 0]
        if moment_col is not None:
            reactions[:, moment_col] = values[:, 1]
    return reactions + 0.0


@dataclass
class _Solved:
    """Solutions of several load columns, or the mechanism error of each column that has one."""

    solutions: list[CaseSolution | None]
    errors: list[InputError | None]


def _solve_columns(member: Member, load_sets: Sequence[Sequence[Load]], names: Sequence[str], stiffness: Stiffness | None) -> _Solved:
    """Solve several load sets on one member with one factorization per problem."""
    _check_geometry(member)
    _check_loads(member, [load for loads in load_sets for load in loads])
    _check_springs_need_stiffness(member, stiffness)
    layout = _layout(member)
    problems = _build_problems(member, layout, stiffness or Stiffness.unit())
    points = [_points_of(loads) for loads in load_sets]
    lines = [_lines_of(loads) for loads in load_sets]
    terms = [_case_terms(layout, loads) for loads in load_sets]
    fixed = [_fixed_end_forces(layout, element_terms) for _, element_terms in terms]
    columns = {name: np.column_stack([_load_vector(problem, nodal, f) for (nodal, _), f in zip(terms, fixed)])
               if load_sets else np.zeros((problem.size, 0)) for name, problem in problems.items()}
    errors: list[InputError | None] = []
    for column, case in enumerate(names):
        findings = [(problem, driven) for name, problem in problems.items()
                    if (driven := _engaged_modes(problem, columns[name][:, column], layout.length)) is not None]
        errors.append(_mechanism_error(member, case, findings, layout) if findings else None)
    displacement = {name: _solve_free(problem, columns[name]) for name, problem in problems.items()}
    positions = np.array([s.at for s in member.supports], dtype=float)
    solutions: list[CaseSolution | None] = []
    for column, case in enumerate(names):
        if errors[column] is not None:
            solutions.append(None)
            continue
        field = None
        if stiffness is not None:
            field = _field(problems, layout, displacement, column, terms[column][1], fixed[column], stiffness)
        reactions = _reactions(problems, layout, displacement, column, (points[column], lines[column]), fixed[column], positions)
        solutions.append(CaseSolution(case, member.length, positions, reactions, points[column], lines[column], field, layout.tol))
    return _Solved(solutions, errors)


def _field(problems: dict[str, _Problem], layout: _Layout, displacement: dict[str, np.ndarray], column: int,
           terms: _Terms, fixed: np.ndarray, stiffness: Stiffness) -> _Field:
    """Nodal displacements of one column for interpolation."""
    def at(name: str, freedoms: np.ndarray) -> np.ndarray:
        return displacement[name][freedoms, column][:, None]

    xy, xz = problems["xy"], problems["xz"]
    return _Field(layout.nodes, at("axial", problems["axial"].translation), at("torsion", problems["torsion"].translation),
                  at("xy", xy.translation), at("xy", xy.rot_left), at("xy", xy.rot_right),
                  at("xz", xz.translation), at("xz", xz.rot_left), at("xz", xz.rot_right),
                  terms.weighted(np.ones(1)), fixed[:, None], stiffness, layout.tol)


def solve_case(member: Member, loads: Sequence[Load], stiffness: Stiffness | None, case: str = "") -> CaseSolution:
    """Solve one load case (loads all of that case). stiffness None: unit rigidities, forces only.
    Raises InputError for a mechanism, for anything off the member, and when stiffness is None and
    the member has springs (forces would depend on the stiffness)."""
    solved = _solve_columns(member, [list(loads)], [case], stiffness)
    if solved.errors[0] is not None:
        raise solved.errors[0]
    solution = solved.solutions[0]
    assert solution is not None
    return solution


# ----------------------------------------------------------------------------------------------
# every case and combinations


def _case_names(member: Member) -> tuple[str, ...]:
    """Load cases of the member, then any case named only in a combination."""
    names = list(member.cases)
    for factors in member.combinations.values():
        names += [name for name in factors if name not in names]
    return tuple(names)


class MemberSolution:
    """Every load case solved once, plus the unit self-weight case; combinations by superposition."""

    def __init__(self, member: Member, cases: dict[str, CaseSolution], self_weight: CaseSolution | None,
                 mass_per_length: float | None, stiffness: Stiffness | None, self_weight_error: InputError | None = None) -> None:
        self.member = member
        self.stiffness = stiffness
        self.cases = cases
        self.self_weight = self_weight
        self.mass_per_length = mass_per_length
        self.combination_names: tuple[str, ...] = tuple(member.combinations)
        self._self_weight_error = self_weight_error

    @property
    def has_displacements(self) -> bool:
        """True when solved with the member's stiffness (a section)."""
        return self.stiffness is not None

    def for_section(self, stiffness: Stiffness, mass_per_length: float | None) -> "MemberSolution":
        """The solution for a section of rigidities `stiffness` and mass per length (kg/m, None: no
        self weight), without solving again. Exact when no support has a spring: the reactions and
        internal actions do not depend on uniform rigidities, and the displacements scale as
        1 / rigidity. Needs a solution made with rigidities (e.g. Stiffness.unit()); ValueError with
        springs, whose forces depend on the stiffness."""
        if self.member.has_springs:
            raise ValueError("a member with springs must be solved for each stiffness")
        if self.stiffness is None:
            raise ValueError("rescaling needs a solution made with rigidities, e.g. Stiffness.unit()")
        if mass_per_length is not None and self._self_weight_error is not None:
            raise self._self_weight_error
        cases = {name: case.on_rigidities(stiffness) for name, case in self.cases.items()}
        self_weight = self.self_weight.on_rigidities(stiffness) if self.self_weight is not None else None
        return MemberSolution(self.member, cases, self_weight, mass_per_length, stiffness, self._self_weight_error)

    def weights(self, mass_per_length: float | None = ...) -> np.ndarray:  # type: ignore[assignment]
        """(n_combinations, n_cases + 1) factors on [each case in self.cases order..., unit self
        weight]; the last column is factor(self_weight_case) * mass_per_length * GRAVITY (N/m per
        unit case), 0 when mass is None. Default mass: self.mass_per_length."""
        mass = self.mass_per_length if mass_per_length is ... else mass_per_length
        names = list(self.cases)
        table = np.zeros((len(self.combination_names), len(names) + 1))
        sw_case = self.member.self_weight_case
        for row, combination in enumerate(self.combination_names):
            factors = self.member.combinations[combination]
            table[row, : len(names)] = [factors.get(name, 0.0) for name in names]
            if sw_case is not None and mass is not None:
                table[row, -1] = factors.get(sw_case, 0.0) * mass * GRAVITY
        if self._self_weight_error is not None and np.any(table[:, -1]):
            raise self._self_weight_error
        return table

    def _row(self, combination: str) -> np.ndarray:
        return self.combination_weights([combination])[0]

    def combination_weights(self, combinations: Sequence[str]) -> np.ndarray:
        """(len(combinations), n_cases + 1) rows of weights() for the named combinations, for
        weighted_actions and weighted_displacements; KeyError for an unknown name."""
        for combination in combinations:
            if combination not in self.member.combinations:
                raise KeyError(f"no combination {combination!r}; there are {', '.join(self.combination_names)}")
        return self.weights()[[self.combination_names.index(name) for name in combinations]]

    def _stations(self, x: ArrayLike, side: str | ArrayLike) -> tuple[np.ndarray, np.ndarray]:
        tol = _tolerance(self.member)
        xs = _as_stations(x, self.member.length, tol)
        return xs, _right_side(side, xs.size)

    def _solutions(self) -> list[CaseSolution | None]:
        """The case solutions in weights' column order: cases, then the unit self weight."""
        return list(self.cases.values()) + [self.self_weight]

    def weighted_actions(self, weights: np.ndarray, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(C, n, 6) actions of the load sets weights (C, n_cases + 1) @ [cases..., unit self weight],
        in one pass over the stations."""
        xs, right = self._stations(x, side)
        sources = [None if solution is None else solution.sources() for solution in self._solutions()]
        return _section_actions(sources, np.atleast_2d(weights), xs, right, _tolerance(self.member))

    def weighted_displacements(self, weights: np.ndarray, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(C, n, 6) displacements of the load sets weights (C, n_cases + 1) @ [cases..., unit self
        weight]; ValueError without stiffness."""
        if not self.has_displacements:
            raise ValueError("displacements need the member's stiffness (a section)")
        weights = np.atleast_2d(weights)
        xs, right = self._stations(x, side)
        kept = [(j, solution.field()) for j, solution in enumerate(self._solutions()) if solution is not None]
        if not kept:
            return np.zeros((weights.shape[0], xs.size, 6))
        field = _combine_fields([f for _, f in kept], weights[:, [j for j, _ in kept]])
        return _field_displacements(field, xs, right)

    def case_actions(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n_cases + 1, n, 6) actions of each case, the last the unit self weight (zeros if none)."""
        return self.weighted_actions(np.eye(len(self.cases) + 1), x, side)

    def case_displacements(self, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n_cases + 1, n, 6) displacements of each case, the last the unit self weight."""
        return self.weighted_displacements(np.eye(len(self.cases) + 1), x, side)

    def actions(self, combination: str, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) N, Vy, Vz, T, My, Mz of one combination."""
        return self.weighted_actions(self._row(combination)[None, :], x, side)[0]

    def all_actions(self, x: ArrayLike, side: str | ArrayLike = "right", mass_per_length: float | None = ...) -> np.ndarray:  # type: ignore[assignment]
        """(n_combinations, n, 6) = weights @ case_actions."""
        return self.weighted_actions(self.weights(mass_per_length), x, side)

    def reactions(self, combination: str) -> np.ndarray:
        """(n_supports, 6) Fx, Fy, Fz, Mx, My, Mz of each support on the member."""
        stack = [case.reactions for case in self.cases.values()]
        stack.append(self.self_weight.reactions if self.self_weight is not None else np.zeros((len(self.member.supports), 6)))
        return np.tensordot(self._row(combination), np.stack(stack), axes=1) + 0.0

    def displacements(self, combination: str, x: ArrayLike, side: str | ArrayLike = "right") -> np.ndarray:
        """(n, 6) ux, uy, uz, rx, ry, rz of one combination; ValueError without stiffness."""
        return self.weighted_displacements(self._row(combination)[None, :], x, side)[0]

    def all_displacements(self, x: ArrayLike, side: str | ArrayLike = "right", mass_per_length: float | None = ...) -> np.ndarray:  # type: ignore[assignment]
        """(n_combinations, n, 6) displacements of every combination."""
        return self.weighted_displacements(self.weights(mass_per_length), x, side)


def solve_member(member: Member, stiffness: Stiffness | None, mass_per_length: float | None) -> MemberSolution:
    """Solve every case in member.cases (loads grouped by case; cases named only in combinations
    too, as zero) and the unit self-weight case. A mechanism under the self weight alone is raised
    only when the self weight is counted (mass_per_length given, or later in weights())."""
    names = _case_names(member)
    load_sets: list[list[Load]] = [[load for load in member.loads if load.case == name] for name in names]
    sw_case = member.self_weight_case
    columns = list(names)
    if sw_case is not None:
        load_sets.append([self_weight_load(member)])
        columns.append(sw_case)
    solved = _solve_columns(member, load_sets, columns, stiffness)
    for error in solved.errors[: len(names)]:
        if error is not None:
            raise error
    cases = {name: solution for name, solution in zip(names, solved.solutions) if solution is not None}
    self_weight, self_weight_error = None, None
    if sw_case is not None:
        self_weight, self_weight_error = solved.solutions[-1], solved.errors[-1]
        if self_weight_error is not None:
            self_weight_error.problem += " (self weight)"
            if mass_per_length is not None:
                raise self_weight_error
    return MemberSolution(member, cases, self_weight, mass_per_length, stiffness, self_weight_error)


# ----------------------------------------------------------------------------------------------
# stations, zero shear and extremes


def _concentrated_positions(member: Member) -> np.ndarray:
    """Sorted distinct positions of supports, hinges, point loads and line-load ends (m)."""
    xs = [s.at for s in member.supports] + [h.at for h in member.hinges]
    for load in member.loads:
        xs += [load.at] if isinstance(load, PointLoad) else [load.start, load.end]
    if not xs:
        return np.zeros(0)
    return _merge_positions(np.clip(np.array(xs, dtype=float), 0.0, member.length), _tolerance(member))


def stations(member: Member, n_even: int = 200) -> tuple[np.ndarray, np.ndarray]:
    """Stations for checking: x (m) sorted, and side (array of 'left'/'right'). Includes 0 (right)
    and L (left), both sides of every support, hinge, point load and line-load end, and n_even
    evenly spaced points (right side). Left comes before right at one position."""
    length, tol = member.length, _tolerance(member)
    special = _concentrated_positions(member)
    inner = special[(special > tol) & (special < length - tol)]
    even = np.linspace(0.0, length, max(n_even, 2))
    even = even[np.all(np.abs(even[:, None] - special[None, :]) > tol, axis=1)] if special.size else even
    even = even[(even > tol) & (even < length - tol)]
    xs = np.concatenate([[0.0], inner, inner, even, [length]])
    right = np.concatenate([[True], np.zeros(inner.size, bool), np.ones(inner.size, bool), np.ones(even.size, bool), [False]])
    order = np.lexsort((right, xs))
    return xs[order], np.where(right[order], "right", "left")


def _quadratic_roots(v0: np.ndarray, vm: np.ndarray, v1: np.ndarray) -> list[np.ndarray]:
    """Roots t in (0, 1) of the quadratic through (0, v0), (1/2, vm), (1, v1), per segment; returns
    [segment index array, t array]."""
    scale = np.maximum.reduce([np.abs(v0), np.abs(vm), np.abs(v1)])
    safe = np.where(scale > 0, scale, 1.0)
    c, vm_, v1_ = v0 / safe, vm / safe, v1 / safe
    a = 2 * c - 4 * vm_ + 2 * v1_
    b = -3 * c + 4 * vm_ - v1_
    segments, roots = [], []
    quadratic = np.abs(a) > 1e-12
    linear = ~quadratic & (np.abs(b) > 1e-12)
    idx = np.flatnonzero(linear & (scale > 0))
    segments.append(idx)
    roots.append(-c[idx] / b[idx])
    disc = b * b - 4 * a * c
    idx = np.flatnonzero(quadratic & (scale > 0) & (disc >= 0))
    sq = np.sqrt(disc[idx])
    q = -0.5 * (b[idx] + np.where(b[idx] >= 0, sq, -sq))
    for t in (q / a[idx], np.divide(c[idx], q, out=np.full(idx.size, -1.0), where=q != 0)):
        segments.append(idx)
        roots.append(t)
    seg, t = np.concatenate(segments), np.concatenate(roots)
    inside = (t > 1e-12) & (t < 1 - 1e-12)
    return [seg[inside], t[inside]]


def _segments(member: Member) -> tuple[np.ndarray, np.ndarray]:
    """Starts and ends (m) of the segments between concentrated items (supports, hinges, point loads,
    line-load ends) and the member's ends."""
    ends = distinct(np.concatenate([[0.0, member.length], _concentrated_positions(member)]))
    ends = _merge_positions(ends, _tolerance(member))
    return ends[:-1], ends[1:]


def zero_shear_positions(solution: MemberSolution, combinations: Sequence[str], actions: Sequence[str] = ("Vy", "Vz")) -> np.ndarray:
    """Sorted distinct x (m) where the shear `actions` ("Vy", "Vz") of any of the combinations cross
    zero inside a segment between concentrated items (supports, point loads, line-load ends): the
    shear is quadratic there and its roots are found exactly, for every combination in one pass.
    The bending moments have their local extremes at these points."""
    for action in actions:
        if action not in ("Vy", "Vz"):
            raise ValueError(f"action must be 'Vy' or 'Vz', got {action!r}")
    if not combinations or not actions:
        return np.empty(0)
    lo, hi = _segments(solution.member)
    x = np.concatenate([lo, (lo + hi) / 2, hi])
    side = np.array(["right"] * (2 * lo.size) + ["left"] * hi.size)
    weights = solution.combination_weights(combinations)
    values = solution.weighted_actions(weights, x, side)[:, :, [ACTIONS.index(action) for action in actions]]  # (C, 3m, a)
    values = values.reshape(len(combinations), 3, lo.size, len(actions)).transpose(1, 0, 3, 2).reshape(3, -1)
    segment, t = _quadratic_roots(values[0], values[1], values[2])
    segment = segment % lo.size
    return distinct(lo[segment] + t * (hi[segment] - lo[segment]))


def zero_shear_points(solution: MemberSolution, combination: str, action: str = "Vy") -> np.ndarray:
    """x (m) where the shear `action` ("Vy" or "Vz") of one combination crosses zero (see
    zero_shear_positions)."""
    return zero_shear_positions(solution, [combination], [action])


def load_sign_change_positions(solution: MemberSolution, combinations: Sequence[str]) -> np.ndarray:
    """Sorted distinct x (m) where the summed line load wx, wy, wz or mx of any of the combinations
    changes sign inside a stretch between line-load ends: there N, Vy, Vz or T has a local extreme
    (dN/dx = -wx, and so on)."""
    pieces = []
    for column, case in enumerate(solution._solutions()):
        if case is not None:
            start, end, q_start, q_end = case.line_items()
            pieces.append((start, end, q_start, q_end, np.full(start.size, column)))
    if not combinations or not pieces:
        return np.empty(0)
    start, end, q_start, q_end, column = (np.concatenate(parts) for parts in zip(*pieces))
    if not start.size:
        return np.empty(0)
    weights = solution.combination_weights(combinations)[:, column]  # (C, J)
    ends = _merge_positions(distinct(np.concatenate([[0.0, solution.member.length], start, end])), _tolerance(solution.member))
    lo, hi = ends[:-1], ends[1:]
    slope = (q_end - q_start) / np.where(end > start, end - start, 1.0)[:, None]
    covers = (start[None, :] <= lo[:, None] + 1e-12) & (end[None, :] >= hi[:, None] - 1e-12)  # (stretches, J)

    def intensity(x: np.ndarray) -> np.ndarray:  # (C, stretches, 4) summed over the loads covering each stretch
        values = (q_start[None] + slope[None] * (x[:, None] - start[None, :])[..., None]) * covers[..., None]
        return np.einsum("cj,sjk->csk", weights, values)

    at_lo, at_hi = intensity(lo), intensity(hi)
    crossing = (at_lo * at_hi) < 0
    _, stretch, _ = np.nonzero(crossing)
    t = at_lo[crossing] / (at_lo[crossing] - at_hi[crossing])
    return distinct(lo[stretch] + t * (hi[stretch] - lo[stretch]))


def load_sign_change_points(solution: MemberSolution, combination: str) -> np.ndarray:
    """x (m) where one combination's summed line load changes sign (see load_sign_change_positions)."""
    return load_sign_change_positions(solution, [combination])


@dataclass(frozen=True)
class Extreme:
    """Largest and smallest value of one action over the member (N or N*m) and where (m)."""

    action: str
    max_value: float
    max_at: float
    min_value: float
    min_at: float


def extremes(solution: MemberSolution, combination: str, n_even: int = 400) -> dict[str, Extreme]:
    """Largest and smallest of N, Vy, Vz, T, My, Mz, V, M (beam convention V = -Vy, M = Mz) over the
    stations including zero-shear points and the points where a line load changes sign, both sides
    of every concentrated item."""
    x, side = stations(solution.member, n_even)
    extra = np.concatenate([zero_shear_positions(solution, [combination]), load_sign_change_positions(solution, [combination])])
    x = np.concatenate([x, extra])
    side = np.concatenate([side, np.full(extra.size, "right")])
    values = solution.actions(combination, x, side)
    table = np.column_stack([values, -values[:, 1], values[:, 5]])
    found: dict[str, Extreme] = {}
    for column, name in enumerate(EXTREME_ACTIONS):
        high, low = int(np.argmax(table[:, column])), int(np.argmin(table[:, column]))
        found[name] = Extreme(name, float(table[high, column]), float(x[high]), float(table[low, column]), float(x[low]))
    return found
