"""The stability mesh of a member: nodes (m) at its ends, supports, hinges, restraints, point loads,
line-load ends and the points where a line load changes sign, with each stretch between them cut
into elements no longer than length / ELEMENTS_PER_LENGTH nor than its bay (between neighbouring
supports or restraints) / ELEMENTS_PER_BAY; and the numbering of its freedoms.

Three fields along the member, in the section's own axes: v (displacement along the depth, y),
w (sideways, along z) and phi (twist about x, rad), each a cubic Hermite field with its slope
(v', w', phi'; phi' is the warping freedom). Per node: v, w, phi, then the three slopes on the
node's left side and the three on its right side (the same freedoms, except at an interior hinge,
where bending and warping are released: the slopes are separate on each side).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sizer.analysis.layout import merge_positions, position_tolerance
from sizer.model import LineLoad, Member, PointLoad
from sizer.stability.matrices import dense_limit

ELEMENTS_PER_LENGTH = 8  # elements over the member length, at least
ELEMENTS_PER_BAY = 6  # elements between neighbouring supports or restraints, at least (a buckled half-wave fits in a bay)
ELEMENTS_AT_MOST = 400  # ... but elements no shorter than length / this (dense restraints: one element per short bay)
# Every load factor is then refined until converged (sizer.stability.problem.SectionStability).
FIELDS: tuple[str, ...] = ("v", "w", "phi")


@dataclass(frozen=True)
class Mesh:
    """Nodes and freedoms. `value[i, f]`: freedom of field f's value at node i; `slope_left[i, f]`
    and `slope_right[i, f]`: its slope on each side of node i."""

    nodes: np.ndarray  # (m,) m, sorted
    value: np.ndarray  # (m, 3) int
    slope_left: np.ndarray  # (m, 3) int
    slope_right: np.ndarray  # (m, 3) int
    size: int
    tol: float
    sparse: bool = False  # its matrices sparse (sizer.stability.matrices.dense_limit)

    @property
    def lengths(self) -> np.ndarray:
        return np.diff(self.nodes)

    def node_at(self, x: float) -> int:
        """Index of the node at x (m); every item of the member has one."""
        return int(np.argmin(np.abs(self.nodes - x)))

    def element_freedoms(self, field: int) -> np.ndarray:
        """(E, 4) freedoms (value, slope) at the start and (value, slope) at the end of each element."""
        v, left, right = self.value[:, field], self.slope_left[:, field], self.slope_right[:, field]
        return np.stack([v[:-1], right[:-1], v[1:], left[1:]], axis=1)

    def field_of(self) -> np.ndarray:
        """(size,) field index (0 v, 1 w, 2 phi) of every freedom."""
        out = np.empty(self.size, int)
        for table in (self.value, self.slope_left, self.slope_right):
            out[table] = np.arange(3)[None, :]
        return out


def item_positions(member: Member, extra: list[float] | None = None) -> list[float]:
    """Where the mesh needs a node: ends, supports, hinges, restraints (points and zone ends), point
    loads, line-load ends and where a line load's transverse intensity changes sign (m)."""
    xs = [0.0, member.length] + [s.at for s in member.supports] + [h.at for h in member.hinges]
    for restraint in member.restraints:
        xs += [restraint.start, restraint.end]
    for load in member.loads:
        if isinstance(load, PointLoad):
            xs.append(load.at)
        elif isinstance(load, LineLoad):
            xs += [load.start, load.end] + sign_changes(load)
    return xs + list(extra or [])


def sign_changes(load: LineLoad) -> list[float]:
    """Positions (m) inside a line load where one of its transverse intensities (wy, wz) crosses zero."""
    found = []
    for k in (1, 2):
        q0, q1 = load.q_start[k], load.q_end[k]
        if q0 * q1 < 0:
            found.append(load.start + (load.end - load.start) * q0 / (q0 - q1))
    return found


def build_mesh(member: Member, per_length: int = ELEMENTS_PER_LENGTH, extra: list[float] | None = None) -> Mesh:
    """The stability mesh of `member` (see the module docstring)."""
    tol = position_tolerance(member)
    items = merge_positions(np.clip(np.array(item_positions(member, extra), dtype=float), 0.0, member.length), tol)
    items[0], items[-1] = 0.0, member.length
    bays = merge_positions(np.array([0.0, member.length] + [s.at for s in member.supports]
                                    + [x for r in member.restraints for x in (r.start, r.end)]), tol)
    nodes = [items[:1]]
    for a, b in zip(items[:-1], items[1:]):
        bay = np.searchsorted(bays, (a + b) / 2)
        largest = max(min(member.length / per_length, (bays[bay] - bays[bay - 1]) / ELEMENTS_PER_BAY), member.length / ELEMENTS_AT_MOST)
        count = max(1, math.ceil((b - a) / largest - 1e-9))
        nodes.append(np.linspace(a, b, count + 1)[1:])
    return mesh_on_nodes(member, np.concatenate(nodes), tol)


def mesh_on_nodes(member: Member, nodes: np.ndarray, tol: float) -> Mesh:
    """The mesh of `member` on the sorted node positions `nodes` (m), which include every item's."""
    hinges = {int(np.argmin(np.abs(nodes - h.at))) for h in member.hinges}
    m = len(nodes)
    value, left, right = np.zeros((m, 3), int), np.zeros((m, 3), int), np.zeros((m, 3), int)
    count = 0
    for i in range(m):
        value[i] = np.arange(count, count + 3)
        left[i] = np.arange(count + 3, count + 6)
        count += 6
        if i in hinges and 0 < i < m - 1:
            right[i] = np.arange(count, count + 3)
            count += 3
        else:
            right[i] = left[i]
    return Mesh(nodes, value, left, right, count, tol, count > dense_limit(len(member.cases) + 1))


def halved(member: Member, mesh: Mesh) -> Mesh:
    """`mesh` with every element cut in two (its nodes kept: the finer mesh's shapes include the
    coarser's, so its buckling load factors are no higher)."""
    middles = (mesh.nodes[:-1] + mesh.nodes[1:]) / 2
    return mesh_on_nodes(member, np.sort(np.concatenate([mesh.nodes, middles])), mesh.tol)


GRADING = (0.25, 0.5, 1.0, 2.0, 4.0)  # node distances from a warping hold, in warping lengths


def graded(member: Member, mesh: Mesh, holds: list[float], warping_length: float) -> Mesh:
    """`mesh` with nodes added at GRADING x `warping_length` (m) from each warping hold at `holds`
    (m), inside the elements next to it that are longer than one warping length: the twist's boundary layer
    there (it decays over about one warping length sqrt(EIw / GJ)) is then followed by the elements.
    The nodes of `mesh` are kept (its shapes are included). `mesh` itself when nothing is added."""
    added = []
    for at in holds:
        node = mesh.node_at(at)
        for side, neighbour in ((-1, node - 1), (1, node + 1)):
            if 0 <= neighbour < len(mesh.nodes):
                span = abs(mesh.nodes[neighbour] - mesh.nodes[node])
                if span > warping_length:
                    added += [mesh.nodes[node] + side * d for d in np.array(GRADING) * warping_length if mesh.tol < d < span - mesh.tol]
    if not added:
        return mesh
    return mesh_on_nodes(member, merge_positions(np.concatenate([mesh.nodes, added]), mesh.tol), mesh.tol)
