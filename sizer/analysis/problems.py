"""The four uncoupled 1-D stiffness problems of a straight member and their element matrices:

- axial: ux, rigidity EA (N); torsion: rx, rigidity GJ (N*m^2);
- bending in x-y: uy and rz = duy/dx, rigidity EIz; bending in x-z: uz and theta = duz/dx = -ry,
  rigidity EIy (N*m^2).

Bars have two-node linear elements (N/m or N*m/rad); beams Euler-Bernoulli cubic elements with
freedoms (v1, theta1, v2, theta2). A split hinge gives its node a rotation on each side. Each problem
also keeps its free rigid-body motions (part by part between hinges) for the mechanism test.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.analysis.layout import Layout
from sizer.model import Member, Stiffness

NULL_TOLERANCE = 1e-10  # relative singular value below which a rigid-body constraint set is deficient


@dataclass(frozen=True)
class Problem:
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

    @property
    def rotations(self) -> tuple[np.ndarray, np.ndarray]:
        """(rot_left, rot_right) of a bending problem (ValueError for one without rotations)."""
        if self.rot_left is None or self.rot_right is None:
            raise ValueError(f"the {self.name} problem has no rotations")
        return self.rot_left, self.rot_right


# which freedoms of a support belong to which problem, and in which problem component
_PROBLEM_FREEDOMS = {"axial": ("ux", None), "torsion": ("rx", None), "xy": ("uy", "rz"), "xz": ("uz", "ry")}
_RIGIDITY = {"axial": "EA", "torsion": "GJ", "xy": "EIz", "xz": "EIy"}
POINT_COMPONENT = {"axial": (0, None), "torsion": (3, None), "xy": (1, 5), "xz": (2, 4)}  # (force, moment) in 6-vectors
MOMENT_SIGN = {"xy": 1.0, "xz": -1.0}  # theta = rz in x-y; theta = -ry in x-z


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


def beam_element_matrices(lengths: np.ndarray, rigidity: float) -> np.ndarray:
    """(ne, 4, 4) Euler-Bernoulli element stiffness, freedoms (v1, theta1, v2, theta2)."""
    le = lengths[:, None, None]
    unit = np.array([[12, 6, -12, 6], [6, 4, -6, 2], [-12, -6, 12, -6], [6, 2, -6, 4]], dtype=float)
    power = np.array([[3, 2, 3, 2], [2, 1, 2, 1], [3, 2, 3, 2], [2, 1, 2, 1]])
    return rigidity * unit[None] / le ** power[None]


def _beam_freedoms(layout: Layout) -> tuple[np.ndarray, np.ndarray, np.ndarray, int]:
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


def element_freedoms(translation: np.ndarray, rot_left: np.ndarray, rot_right: np.ndarray) -> np.ndarray:
    """(ne, 4) freedoms (v1, theta1, v2, theta2) of each beam element."""
    return np.stack([translation[:-1], rot_right[:-1], translation[1:], rot_left[1:]], axis=1)


def _parts(layout: Layout) -> list[tuple[float, float]]:
    """Extents of the parts between interior hinges."""
    cuts = [0.0] + [float(x) for x in layout.nodes[layout.split]] + [layout.length]
    return list(zip(cuts[:-1], cuts[1:]))


def _part_of(layout: Layout, node: int, side: str) -> int:
    """Index of the part holding `node` on `side`; a split hinge node is in two parts."""
    x = layout.nodes[node]
    hinges = layout.nodes[layout.split]
    return int(np.sum(hinges < x - layout.tol) if side == "left" else np.sum(hinges <= x + layout.tol))


def _rigid_modes(layout: Layout, holds_translation: np.ndarray, holds_rotation: np.ndarray, bending: bool) -> np.ndarray:
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
    for node in np.flatnonzero(holds_translation).tolist():
        rows.append(translation_row(part_at(node), float(layout.nodes[node])))
    for node in np.flatnonzero(holds_rotation).tolist():
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


def _modes_on_freedoms(layout: Layout, params: np.ndarray, problem_freedoms: tuple[np.ndarray, np.ndarray | None, np.ndarray | None],
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
            assert rot_left is not None and rot_right is not None  # a bending problem has rotations
            right = _part_of(layout, node, "right")
            modes[rot_left[node]] = params[2 * left + 1] / layout.length
            modes[rot_right[node]] = params[2 * right + 1] / layout.length
    return modes


def _support_holds(member: Member, layout: Layout, freedom: str | None, rotation: bool) -> tuple[np.ndarray, np.ndarray]:
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


def _build_problem(name: str, member: Member, layout: Layout, rigidity: float) -> Problem:
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
        dofs = element_freedoms(translation, rot_left, rot_right)
        ke = beam_element_matrices(layout.lengths, rigidity)
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
    return Problem(name, rigidity, (main,) + ((rotation,) if rotation else ()), matrix, held, springs, modes, parts, params,
                    translation, rot_left, rot_right)


def build_problems(member: Member, layout: Layout, stiffness: Stiffness) -> dict[str, Problem]:
    for name in _RIGIDITY:
        value = getattr(stiffness, _RIGIDITY[name])
        if not (np.isfinite(value) and value > 0):
            raise ValueError(f"{_RIGIDITY[name]} must be positive and finite, got {value!r}")
    return {name: _build_problem(name, member, layout, getattr(stiffness, _RIGIDITY[name])) for name in _RIGIDITY}
