"""Stability of the support layout, decided from the supports alone (docs/design.md section 3): the rigid-body
movements of the unloaded member that its supports and hinges leave free.

- Sideways movements (uy, uz) and rotations about y and z, of the whole member or of any part
  between hinges, must be held whatever the loads: a layout that balances today's loads on a
  mechanism is still a mechanism, and is bad input.
- Sliding along x (ux) and twist (rx) may stay free only while no load of the member file acts
  along x (fx, wx) or about x (mx): the outputs then say so (`free_movement_notes`). Self-weight
  along x counts where it is counted: the solve reports a mechanism it drives (`mechanisms`).

A spring holds its freedom only when it is stiff enough to matter beside the member itself:

    k L^3 / EI >= SPRING_HOLDS   (uy with EIz, uz with EIy)
    k L / EI   >= SPRING_HOLDS   (rz with EIz, ry with EIy)
    k L / EA   >= SPRING_HOLDS   (ux),   k L / GJ >= SPRING_HOLDS   (rx)

L the member's length (m), k in N/m or N*m/rad, rigidities in N or N*m^2. A spring at the limit
lets the member move as a rigid body about a million times further than it bends under the same
load (a cantilever's tip: 3 EI / (k L^3) = 3e6); a softer one counts as free.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from sizer.analysis.layout import Layout
from sizer.errors import InputError
from sizer.model import Load, Member, PointLoad, Stiffness, Support

SPRING_HOLDS = 1e-6  # smallest k L^p / rigidity of a spring that holds its freedom (see the docstring)
RANK_TOLERANCE = 1e-10  # relative singular value below which a set of holds leaves a movement free

# bending plane -> (sideways freedom, rotation freedom, rigidity name)
PLANES: dict[str, tuple[str, str, str]] = {"xy": ("uy", "rz", "EIz"), "xz": ("uz", "ry", "EIy")}
RIGIDITY_OF: dict[str, str] = {"ux": "EA", "rx": "GJ", "uy": "EIz", "rz": "EIz", "uz": "EIy", "ry": "EIy"}
_WORDS = {"ux": "sliding along x", "rx": "twist about x", "uy": "sideways along y", "uz": "sideways along z",
          "rz": "rotation about z", "ry": "rotation about y"}


@dataclass(frozen=True)
class FreeMovement:
    """A rigid-body movement the supports leave free: the freedoms it moves and how each part moves."""

    freedoms: tuple[str, ...]
    parts: tuple[str, ...]  # e.g. "the part from 4 m to 6 m turns about x = 4 m"


def spring_ratio(support: Support, freedom: str, stiffness: Stiffness, length: float) -> float:
    """k L^p / rigidity of the support's spring on `freedom` (p = 3 for uy, uz; else 1)."""
    power = 3 if freedom in ("uy", "uz") else 1
    return support.springs[freedom] * length**power / getattr(stiffness, RIGIDITY_OF[freedom])


def holds(support: Support, freedom: str, stiffness: Stiffness | None, length: float) -> bool:
    """True when the support holds `freedom`: rigidly, or by a spring stiff enough (SPRING_HOLDS).
    Without rigidities (no section) any spring counts as holding."""
    if freedom in support.restrain:
        return True
    if freedom not in support.springs:
        return False
    return stiffness is None or spring_ratio(support, freedom, stiffness, length) >= SPRING_HOLDS


def _parts(layout: Layout) -> list[tuple[float, float]]:
    cuts = [0.0] + [float(x) for x in layout.nodes[layout.split]] + [layout.length]
    return list(zip(cuts[:-1], cuts[1:]))


def _plane_constraints(member: Member, layout: Layout, plane: str, stiffness: Stiffness | None) -> tuple[np.ndarray, list[tuple[float, float]]]:
    """Rows (k, 2 n_parts) that the rigid-body parameters (a_j, b_j) must satisfy, where part j
    moves as v(x) = a_j + b_j (x - c_j) / L: continuity at each hinge, zero v at each support that
    holds the sideways freedom, zero b at each support that holds the rotation (not at a hinge)."""
    sideways, rotation, _ = PLANES[plane]
    parts = _parts(layout)
    centres = [(lo + hi) / 2 for lo, hi in parts]
    hinges = layout.nodes[layout.split]
    width = 2 * len(parts)

    def at(part: int, x: float) -> np.ndarray:
        row = np.zeros(width)
        row[2 * part], row[2 * part + 1] = 1.0, (x - centres[part]) / layout.length
        return row

    rows = [at(k, hi) - at(k + 1, hi) for k, (_, hi) in enumerate(parts[:-1])]
    for support, node in zip(member.supports, layout.support_nodes):
        x = float(layout.nodes[node])
        part = int(np.sum(hinges < x - layout.tol))
        if holds(support, sideways, stiffness, layout.length):
            rows.append(at(part, x))
        if not layout.released[node] and holds(support, rotation, stiffness, layout.length):
            row = np.zeros(width)
            row[2 * part + 1] = 1.0
            rows.append(row)
    return (np.array(rows) if rows else np.zeros((0, width))), parts


def _null_space(rows: np.ndarray, width: int) -> np.ndarray:
    """Orthonormal basis (width, r) of the vectors every row is orthogonal to."""
    if rows.shape[0] == 0:
        return np.eye(width)
    _, singular, vh = np.linalg.svd(rows, full_matrices=True)
    rank = int(np.sum(singular > RANK_TOLERANCE * max(1.0, singular[0])))
    return vh[rank:].T


def _describe(plane: str, basis: np.ndarray, parts: list[tuple[float, float]], layout: Layout) -> FreeMovement:
    """The freedoms and part movements of a basis of free rigid-body movements in one plane."""
    sideways, rotation, _ = PLANES[plane]
    names: list[str] = []
    texts: list[str] = []
    for vector in basis.T:
        size = np.max(np.abs(vector))
        for part, (lo, hi) in enumerate(parts):
            a, b = vector[2 * part], vector[2 * part + 1]
            if max(abs(a), abs(b)) <= 1e-6 * size:
                continue
            whole = "the member" if len(parts) == 1 else f"the part from {lo:g} m to {hi:g} m"
            if abs(b) <= 1e-6 * size:
                found, text = [sideways], f"{whole} moves {_WORDS[sideways]} ({sideways})"
            else:
                pivot = (lo + hi) / 2 - a * layout.length / b
                inside = lo - layout.tol <= pivot <= hi + layout.tol
                found = [rotation] if inside else [sideways, rotation]
                text = f"{whole} turns about x = {pivot:.4g} m ({', '.join(found)})" if inside else \
                    f"{whole} moves and turns ({sideways}, {rotation})"
            names += [name for name in found if name not in names]
            if text not in texts:
                texts.append(text)
    return FreeMovement(tuple(names), tuple(texts))


def free_bending_movements(member: Member, layout: Layout, stiffness: Stiffness | None) -> dict[str, FreeMovement]:
    """plane ("xy", "xz") -> the rigid-body movement its supports leave free, for planes with one."""
    found = {}
    for plane in PLANES:
        rows, parts = _plane_constraints(member, layout, plane, stiffness)
        basis = _null_space(rows, 2 * len(parts))
        if basis.shape[1]:
            found[plane] = _describe(plane, basis, parts, layout)
    return found


def _acts(load: Load, freedom: str) -> bool:
    """True when `load` has a component along x (freedom "ux": fx, wx) or about x ("rx": mx)."""
    if isinstance(load, PointLoad):
        return bool(load.force[0]) if freedom == "ux" else bool(load.moment[0])
    index = 0 if freedom == "ux" else 3
    return bool(load.q_start[index] or load.q_end[index])


def _soft_springs(member: Member, freedoms: Sequence[str], stiffness: Stiffness | None) -> list[str]:
    """Texts naming the springs on `freedoms` that are too soft to hold them."""
    if stiffness is None:
        return []
    found = []
    for index, support in enumerate(member.supports, start=1):
        for freedom in freedoms:
            if freedom in support.springs and not holds(support, freedom, stiffness, member.length):
                ratio = spring_ratio(support, freedom, stiffness, member.length)
                power = "³" if freedom in ("uy", "uz") else ""
                found.append(f"the spring supports[{index}].springs.{freedom} has k L{power}/{RIGIDITY_OF[freedom]} = {ratio:.2g}, "
                             f"below {SPRING_HOLDS:g}, so it counts as free")
    return found


_BENDING_FIX = {
    "xy": "hold uy at two supports (pin or roller), or make one support fixed (holds rz), on each part between hinges",
    "xz": "hold uz at two supports (pin or roller), or make one support fixed (holds ry), on each part between hinges",
}
_BAR_FIX = {
    "ux": "hold ux at one support (a pin or fixed support holds it), or remove the loads along x (fx, wx)",
    "rx": "hold rx at one support (fixed, pin and roller all hold it), or remove the torques (mx)",
}


def check_support_stability(member: Member, layout: Layout, stiffness: Stiffness | None) -> None:
    """InputError naming the free movement and what would hold it, when the supports leave the
    member free to move sideways or to rotate about y or z, or free to slide along x or twist while
    a load of the member file acts that way."""
    for plane, movement in free_bending_movements(member, layout, stiffness).items():
        soft = _soft_springs(member, PLANES[plane][:2], stiffness)
        detail = "; ".join(list(movement.parts) + soft)
        raise InputError(member.source, "supports", f"mechanism: the supports leave the member free to move in "
                         f"{', '.join(movement.freedoms)} whatever the loads ({detail})", _BENDING_FIX[plane])
    for freedom in ("ux", "rx"):
        if any(holds(support, freedom, stiffness, member.length) for support in member.supports):
            continue
        acting = [index for index, load in enumerate(member.loads, start=1) if _acts(load, freedom)]
        if acting:
            springs = "".join(f"; {text}" for text in _soft_springs(member, (freedom,), stiffness))
            raise InputError(member.source, "supports", f"mechanism: no support holds {freedom} ({_WORDS[freedom]}) and "
                             f"loads[{acting[0]}] acts {'along' if freedom == 'ux' else 'about'} x{springs}", _BAR_FIX[freedom])


def free_movement_notes(member: Member) -> list[str]:
    """Notes for the outputs: sliding along x or twist left free (allowed while no load acts so)."""
    notes = []
    for freedom, action in (("ux", "axial force N"), ("rx", "torque T")):
        if not any(freedom in support.restrain or freedom in support.springs for support in member.supports):
            notes.append(f"No support holds {_WORDS[freedom]} ({freedom}); no load of the file acts that way, so the member "
                         f"is taken as staying in place in {freedom} ({action} = 0).")
    return notes
