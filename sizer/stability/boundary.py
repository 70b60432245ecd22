"""How supports, springs and restraints hold the stability fields, in the section's own axes.

Supports: for stability every pin and roller is a fork (sideways movement and twist held, warping
and sideways rotation free, as its freedoms say); a support holding rx, ry and rz (fixed) also holds
warping; `warping = "free" | "held"` on a support overrides that. A warping hold acts only where
the section's warping length sqrt(EIw / GJ) reaches the next element (see warping_rows). A freedom held in the member's
analysis is held here too; springs add their stiffness. Orientation "major": v = uy, v' = rz,
w = uz, w' = -ry; "minor" (the section turned a quarter turn): v = uz, v' = -ry, w = -uy, w' = -rz.
A support at a hinge holds the hinge pin only (no rotation), as in the analysis.

Restraints: a lateral hold at height h (m above the shear centre) holds the sideways movement of
that fibre, w + h phi = 0; a twist hold, phi = 0. A continuous restraint also holds the slopes
(w' + h phi' = 0, phi' = 0) at every node of its zone, which holds it exactly along the whole zone
(both fields are cubic Hermite with the same shape functions).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from sizer.model import Member
from sizer.stability.matrices import assemble
from sizer.stability.mesh import Mesh

if TYPE_CHECKING:
    from sizer.model import Support
    from sizer.stability.section import StabilitySection

V, W, PHI = 0, 1, 2
_FREEDOMS = {"major": {V: ("uy", "rz"), W: ("uz", "ry")}, "minor": {V: ("uz", "ry"), W: ("uy", "rz")}}
Row = dict[int, float]


def warping_held(support: Support) -> bool:
    """True when the support holds warping: as given, else when it holds rx, ry and rz (built in)."""
    if support.warping is not None:
        return support.warping == "held"
    return {"rx", "ry", "rz"} <= set(support.restrain)


def height_value(height: str | float, section: StabilitySection | None) -> float:
    """A restraint's or load's height above the shear centre (m): a face or a number (`section`
    may be None where no height is a face other than the centre)."""
    if height == "centre":
        return 0.0
    if isinstance(height, str):
        assert section is not None  # a face's height needs the section
        return float(section.face_height(height))
    return float(height)


def _hinge_nodes(member: Member, mesh: Mesh) -> set[int]:
    return {mesh.node_at(h.at) for h in member.hinges}


def support_rows(member: Member, mesh: Mesh, orientation: str) -> list[Row]:
    """Constraint rows (freedom -> coefficient, each row = 0) of the supports."""
    rows: list[Row] = []
    released = _hinge_nodes(member, mesh)
    for support in member.supports:
        node = mesh.node_at(support.at)
        held = set(support.restrain)
        for field, (translation, rotation) in _FREEDOMS[orientation].items():
            if translation in held:
                rows.append({int(mesh.value[node, field]): 1.0})
            if rotation in held and node not in released:
                rows += _slope_rows(mesh, node, field)
        if "rx" in held:
            rows.append({int(mesh.value[node, PHI]): 1.0})
    return rows


def warping_rows(member: Member, mesh: Mesh) -> list[Row]:
    """Constraint rows of the supports that hold warping (phi' = 0). Where the section's warping
    length sqrt(EIw / GJ) is shorter than the elements next to the support, the twist has a boundary
    layer there: the mesh is graded towards the support (sizer.stability.mesh.graded) and refined
    until the load factor converges, so the hold is kept."""
    rows: list[Row] = []
    for support in member.supports:
        if warping_held(support):
            rows += _slope_rows(mesh, mesh.node_at(support.at), PHI)
    return rows


def _slope_rows(mesh: Mesh, node: int, field: int) -> list[Row]:
    left, right = int(mesh.slope_left[node, field]), int(mesh.slope_right[node, field])
    return [{left: 1.0}] + ([{right: 1.0}] if right != left else [])


def restraint_rows(member: Member, mesh: Mesh, section: StabilitySection | None) -> list[Row]:
    """Constraint rows of the restraints (heights from `section`)."""
    rows: list[Row] = []
    for restraint in member.restraints:
        h = height_value(restraint.height, section)
        inside = np.flatnonzero((mesh.nodes >= restraint.start - mesh.tol) & (mesh.nodes <= restraint.end + mesh.tol))
        for node in inside:
            sides = []
            if restraint.continuous:  # the slopes on the sides of the node that lie inside the zone
                sides = ([] if node == inside[0] else [mesh.slope_left]) + ([] if node == inside[-1] else [mesh.slope_right])
            if restraint.lateral:
                rows.append(_combined(int(mesh.value[node, W]), int(mesh.value[node, PHI]), h))
                rows += [_combined(int(side[node, W]), int(side[node, PHI]), h) for side in sides]
            if restraint.twist:
                rows.append({int(mesh.value[node, PHI]): 1.0})
                rows += [{int(side[node, PHI]): 1.0} for side in sides]
    return rows


def _combined(w: int, phi: int, h: float) -> Row:
    """w + h phi = 0 (the sideways movement of the fibre at height h)."""
    return {w: 1.0, phi: h} if h else {w: 1.0}


def spring_diagonal(member: Member, mesh: Mesh, orientation: str) -> np.ndarray:
    """(size,) stiffness of the supports' springs on the freedoms they act on (N/m, N*m/rad)."""
    out = np.zeros(mesh.size)
    released = _hinge_nodes(member, mesh)
    for support in member.supports:
        node = mesh.node_at(support.at)
        for field, (translation, rotation) in _FREEDOMS[orientation].items():
            out[mesh.value[node, field]] += support.springs.get(translation, 0.0)
            if node not in released:
                out[mesh.slope_left[node, field]] += support.springs.get(rotation, 0.0)
        out[mesh.value[node, PHI]] += support.springs.get("rx", 0.0)
    return out


def admissible_basis(size: int, rows: list[Row], sparse: bool) -> np.ndarray:
    """(size, k) orthonormal basis (dense or sparse: sizer.stability.matrices) of the freedoms that
    satisfy every row (its null space), built
    group by group: rows that share no freedom are independent, so each group of rows linked by
    shared freedoms (a node's holds: a handful of freedoms) gets the null space of its own small
    matrix, and every column of the basis touches one group only (the matrices stay banded). The
    groups' matrices of one shape are decomposed together (one batched SVD)."""
    touched = sorted({dof for row in rows for dof in row})
    untouched = np.ones(size, bool)
    untouched[touched] = False
    free = np.flatnonzero(untouched)  # (np.setdiff1d would import numpy.ma, 12 ms of every command)
    groups = _linked_groups(rows)
    nulls = _null_spaces([_group_matrix(group_rows, group_dofs) for group_rows, group_dofs in groups])
    dofs: list[int] = []
    columns: list[int] = []
    count = len(free)
    for (_, group_dofs), null in zip(groups, nulls):  # each null space's entries row by row, as null.ravel()
        k = null.shape[1]
        dofs += [dof for dof in group_dofs for _ in range(k)]
        columns += [count + j for _ in group_dofs for j in range(k)]
        count += k
    values = np.concatenate([np.ones(len(free))] + [null.ravel() for null in nulls])
    return assemble((size, count), np.concatenate([free, np.array(dofs, int)]),
                    np.concatenate([np.arange(len(free)), np.array(columns, int)]), values, sparse)


def _group_matrix(group_rows: list[Row], group_dofs: list[int]) -> np.ndarray:
    """The rows of one group as a matrix over its sorted freedoms."""
    matrix = np.zeros((len(group_rows), len(group_dofs)))
    column = {dof: k for k, dof in enumerate(group_dofs)}
    for r, row in enumerate(group_rows):
        for dof, coefficient in row.items():
            matrix[r, column[dof]] += coefficient
    return matrix


def _null_spaces(matrices: list[np.ndarray]) -> list[np.ndarray]:
    """The orthonormal null space (columns) of each matrix, from the SVDs of the matrices of each
    shape taken together (singular values below 1e-12 of the largest, or of 1, count as zero)."""
    out: list[np.ndarray] = [np.zeros((0, 0))] * len(matrices)
    shapes: dict[tuple[int, ...], list[int]] = {}
    for k, matrix in enumerate(matrices):
        shapes.setdefault(matrix.shape, []).append(k)
    for members in shapes.values():
        _, singular, vh = np.linalg.svd(np.stack([matrices[k] for k in members]))
        ranks = np.sum(singular > 1e-12 * np.maximum(1.0, singular.max(axis=1, initial=0.0))[:, None], axis=1)
        for k, rank, v in zip(members, ranks, vh):
            out[k] = v[int(rank):].T
    return out


def _linked_groups(rows: list[Row]) -> list[tuple[list[Row], list[int]]]:
    """The rows in groups linked by shared freedoms, each with its sorted freedoms."""
    parent: dict[int, int] = {}

    def root(dof: int) -> int:
        while parent.setdefault(dof, dof) != dof:
            parent[dof] = parent[parent[dof]]
            dof = parent[dof]
        return dof

    for row in rows:
        first, *others = row
        for dof in others:
            parent[root(dof)] = root(first)
    groups: dict[int, tuple[list[Row], set[int]]] = {}
    for row in rows:
        found = groups.setdefault(root(next(iter(row))), ([], set()))
        found[0].append(row)
        found[1].update(row)
    return [(group_rows, sorted(dofs)) for group_rows, dofs in groups.values()]
