"""The stability of one member: its mesh, the elastic matrices, the supports' constraints, and the
geometric matrices of any load set, from the member solution's internal actions at the Gauss points
(exact between nodes: the method of sections).

Two solves per load set (a combination, with its self-weight):
- axial: the axial force alone (flexural buckling about either axis, torsional and
  flexural-torsional buckling, with the member's supports and restraints);
- lateral: the bending moment about the section's major axis with the heights of the transverse
  loads (lateral-torsional buckling); the axial force enters the checks through the interaction.
"""

from __future__ import annotations

import copy
import math
from functools import cached_property
from typing import Any, Callable, Iterable

import numpy as np

from sizer.analysis import MemberSolution
from sizer.analysis.section_axes import to_section_axes
from sizer.model import Member
from sizer.stability.boundary import admissible_basis, restraint_rows, spring_diagonal, support_rows, warping_held, warping_rows
from sizer.stability.elements import quadrature
from sizer.stability.heights import HEIGHT_KEYS, height_coefficients, height_terms
from sizer.stability.mesh import ELEMENTS_PER_LENGTH, FIELDS, Mesh, build_mesh, graded, halved
from sizer.stability.section import StabilitySection
from sizer.stability.matrices import as_matrix, diagonal, largest_entry
from sizer.stability.solve import Buckling, reduced
from sizer.stability.terms import Coefficient, axial_coefficients, axial_terms, elastic_coefficients, elastic_terms, moment_coefficients, moment_terms, weighted_sum

N, MY, MZ = 0, 4, 5


class MemberStability:
    """Everything about one member's stability that does not depend on the section."""

    def __init__(self, member: Member, solution: MemberSolution, per_length: int = ELEMENTS_PER_LENGTH, mesh: Mesh | None = None) -> None:
        self.member = member
        self.solution = solution
        self.orientation = member.orientation
        self.mesh = mesh if mesh is not None else build_mesh(member, per_length)
        self.quad = quadrature(self.mesh)
        self.elastic = elastic_terms(self.quad)
        self.springs = spring_diagonal(member, self.mesh, self.orientation)
        self.supports = support_rows(member, self.mesh, self.orientation)
        self.cases = list(solution.cases)
        self._columns: dict[tuple[str, int, bool], dict[str, np.ndarray]] = {}
        self._live: dict[str, frozenset[int]] = {}
        self._meshes: dict[bytes, MemberStability] = {}
        self._kept: tuple[tuple[float, ...], SectionStability] | None = None  # see for_section

    def same_columns(self, other: "MemberStability") -> bool:
        """Whether `other`'s load-case columns give this model's term matrices exactly: the same mesh,
        orientation, loads and restraints, and the same case solutions (the same objects: a member
        that differs from this one in its combinations alone, solved once, as the reserve factor's
        scaled members are)."""
        mine, theirs = self.solution, other.solution
        return (other is not self and self.orientation == other.orientation and self.mesh.size == other.mesh.size
                and self.mesh.nodes.tobytes() == other.mesh.nodes.tobytes()
                and self.member.loads == other.member.loads and self.member.restraints == other.member.restraints
                and list(mine.cases) == list(theirs.cases) and all(mine.cases[name] is theirs.cases[name] for name in mine.cases)
                and mine.self_weight is theirs.self_weight)

    def share_columns(self, other: "MemberStability | None") -> None:
        """Use `other`'s load-case column matrices (made once for both; see same_columns)."""
        if other is not None:
            self._columns, self._live = other._columns, other._live

    def on_mesh(self, mesh: Mesh) -> "MemberStability":
        """This member on another mesh (made once per set of nodes)."""
        key = mesh.nodes.tobytes()
        if key == self.mesh.nodes.tobytes():
            return self
        if key not in self._meshes:
            self._meshes[key] = MemberStability(self.member, self.solution, mesh=mesh)
        return self._meshes[key].for_solution(self.solution)

    def for_solution(self, solution: MemberSolution) -> "MemberStability":
        """This model for another solution of the same load cases (more pattern arrangements among
        its combinations): everything but the combinations' rows shared, the meshes and terms too."""
        if solution is self.solution:
            return self
        moved = copy.copy(self)
        moved.member, moved.solution = solution.member, solution
        moved.__dict__.pop("rows", None)
        return moved

    def refined(self) -> "MemberStability":
        """This member on its mesh with every element cut in two."""
        return self.on_mesh(halved(self.member, self.mesh))

    def graded_for(self, section: StabilitySection) -> "MemberStability":
        """This member on its mesh graded towards the supports that hold warping, for the section's
        warping length sqrt(EIw / GJ) (see sizer.stability.mesh.graded); itself when nothing is added."""
        holds = [support.at for support in self.member.supports if warping_held(support)]
        if not holds or not float(section.GJ) > 0.0:
            return self
        length = math.sqrt(max(float(section.EIw), 0.0) / float(section.GJ))
        return self.on_mesh(graded(self.member, self.mesh, holds, length))

    def actions(self, weights: np.ndarray) -> np.ndarray:
        """(E, G, 6) internal actions in the section's axes at the Gauss points of the load set
        `weights` (n_cases + 1,), as MemberSolution.weights gives a row."""
        values = self.solution.weighted_actions(np.asarray(weights)[None, :], self.quad.points)[0]
        return to_section_axes(values, self.orientation).reshape(self.quad.x.shape + (6,))

    def stiffness(self, section: StabilitySection) -> np.ndarray:
        """K (size, size): the elastic matrices weighted by the section's rigidities, plus springs."""
        return weighted_sum(self.elastic, elastic_coefficients(section)) + diagonal(self.springs, self.mesh.sparse)

    def basis(self, section: StabilitySection) -> np.ndarray:
        """The admissible freedoms: supports and restraints (heights and warping holds depend on the section)."""
        rows = self.supports + warping_rows(self.member, self.mesh) + restraint_rows(self.member, self.mesh, section)
        return admissible_basis(self.mesh.size, rows, self.mesh.sparse)

    def load_set_terms(self, kind: str, weights: np.ndarray) -> dict[str, np.ndarray]:
        """The geometric term matrices G_t of a load set (weights (n_cases + 1,)): for "axial" its
        axial force; for "lateral" its major-axis moment and its loads' heights."""
        actions = self.actions(weights)
        if kind == "axial":
            return axial_terms(self.quad, actions[..., N])
        terms = moment_terms(self.quad, actions[..., MZ], np.zeros_like(actions[..., MZ]))  # the major-axis moment alone
        terms.update(height_terms(self.quad, self.member, self.orientation, np.asarray(weights), self.cases))
        return terms

    @cached_property
    def rows(self) -> tuple[np.ndarray, np.ndarray]:
        """(C, n_cases + 1) weights of every combination's loads alone, and per kg/m of self-weight."""
        loads = self.solution.weights(None)
        return loads, self.solution.weights(1.0) - loads

    def live_columns(self, kind: str) -> frozenset[int]:
        """The load-case columns that give some geometric term of this kind (a sideways wind gives
        none in the lateral solve): the others are left out of the load sets that solves share."""
        if kind not in self._live:
            self._live[kind] = frozenset(column for column in range(len(self.cases) + 1)
                                         if any(largest_entry(matrix) > 0.0 for matrix in self.column_terms(kind, column, True).values()))
        return self._live[kind]

    def column_terms(self, kind: str, column: int, positive: bool) -> dict[str, np.ndarray]:
        """load_set_terms of one load-case column at weight +1 or -1 (made once)."""
        key = (kind, column, positive)
        if key not in self._columns:
            unit = np.zeros(len(self.cases) + 1)
            unit[column] = 1.0
            if positive:
                self._columns[key] = self.load_set_terms(kind, unit)
            else:  # linear in the actions, so negated; only the default load heights follow the factor's sign
                terms = {name: -matrix for name, matrix in self.column_terms(kind, column, True).items() if name not in HEIGHT_KEYS}
                if kind == "lateral":
                    terms.update(height_terms(self.quad, self.member, self.orientation, -unit, self.cases))
                self._columns[key] = terms
        return self._columns[key]

    def geometry(self, kind: str, section: StabilitySection, weights: np.ndarray) -> np.ndarray | float:
        """B = -G of a load set for a section."""
        return as_matrix(-weighted_sum(self.load_set_terms(kind, weights), term_coefficients(kind, section)), self.mesh.size, self.mesh.sparse)

    def axial_buckling(self, section: StabilitySection, weights: np.ndarray) -> Buckling:
        """The lowest load factor of a load set's axial force (flexural, torsional, flexural-torsional)."""
        return self.for_section(section).axial(weights)

    def lateral_buckling(self, section: StabilitySection, weights: np.ndarray) -> Buckling:
        """The lowest load factor of a load set's major-axis bending (lateral-torsional)."""
        return self.for_section(section).lateral(weights)

    def for_section(self, section: StabilitySection, keep: bool = False) -> "SectionStability":
        """The solves of one section, its stiffness and admissible freedoms made once: on this mesh
        graded towards the warping holds for the section, refined until converged (SectionStability);
        the buckled shapes are given on this mesh. `keep`: kept for the next call for the same
        section (values equal) on this model, which takes it with the solves made so far (a sizing
        seed's unrefined solves, then the section's full check)."""
        key = _section_key(section)
        kept, self._kept = self._kept, None
        if kept is not None and kept[0] == key and kept[1].model.solution is self.solution and kept[1].base is self.mesh:
            return kept[1]
        model = self.graded_for(section)
        found = SectionStability(model, section, model.stiffness(section), model.basis(section), self.mesh)
        if keep and key is not None:
            self._kept = (key, found)
        return found

    def energy_shares(self, section: StabilitySection, mode: np.ndarray) -> dict[str, float]:
        """Share of a buckled shape's strain energy in each field: "v" (bending in the depth plane),
        "w" (sideways bending) and "phi" (twisting and warping)."""
        elastic = self.elastic
        parts = {
            "v": section.EIz * mode @ elastic["EIz"] @ mode,
            "w": section.EIy * mode @ elastic["EIy"] @ mode,
            "phi": section.GJ * mode @ elastic["GJ"] @ mode + section.EIw * mode @ elastic["EIw"] @ mode,
        }
        total = sum(parts.values()) or 1.0
        return {name: float(value / total) for name, value in parts.items()}

    def shape(self, mode: np.ndarray, xs: np.ndarray) -> dict[str, np.ndarray]:
        """The buckled shape's fields v, w (m per unit mode) and phi (rad) at positions xs (m)."""
        from sizer.stability.elements import hermite

        nodes = self.mesh.nodes
        e = np.clip(np.searchsorted(nodes, xs, side="right") - 1, 0, len(nodes) - 2)
        le = nodes[e + 1] - nodes[e]
        shapes = hermite((xs - nodes[e]) / le, le)[0]
        return {name: np.einsum("ni,ni->n", shapes, mode[self.mesh.element_freedoms(k)[e]]) for k, name in enumerate(FIELDS)}


CONVERGED = 1e-4  # a load factor is taken within this (relative) of the converged value
RATE = 4.0  # each halving of the elements is taken to cut a load factor's error by at least this (see SectionStability)
HALVINGS = 5  # at most this many halvings of the elements (and SIZE_LIMIT freedoms)
SIZE_LIMIT = 200_000


class SectionStability:
    """One section on the member: K and the admissible freedoms made once, for any load set. Every
    load factor is converged: the solve is made again with every element cut in two (the finer
    mesh's shapes include the coarser's, so the load factors fall as the mesh is refined, towards
    the member's) until the error left is at most CONVERGED (relative). Each halving is taken to cut
    the error by at least RATE (the cubic elements converge as h^4, 16 per halving once the mesh
    follows the mode; the lowest ratio of successive changes measured on the demos is 4.0), or by
    the ratio of the last two changes where that is lower (not below 2): the error left is then at
    most the last change / (ratio - 1). Taken:
    - the last value where its change is at most CONVERGED (at most CONVERGED above the converged
      value, even for a ratio of 2);
    - else, where the error left is at most CONVERGED, the last value less it (the extrapolated value,
      at or below the converged one: the safe side; within CONVERGED of it) and `lowered` says so.
    Should HALVINGS halvings not reach that, the last value less its last change is taken (on the
    safe side while each halving at least halves the error) and `converged` says so."""

    def __init__(self, model: MemberStability, section: StabilitySection, stiffness: np.ndarray, basis: np.ndarray,
                 base: Mesh | None = None) -> None:
        self.model, self.section = model, section
        self.reduced = reduced(stiffness, basis)
        self.base = model.mesh if base is None else base  # the mesh the buckled shapes are given on
        self._columns: dict[tuple[str, int, bool], np.ndarray] = {}
        self._solved = {"axial": SameLoadSets(), "lateral": SameLoadSets()}
        self._finer: SectionStability | None = None
        self.elements = len(model.mesh.nodes) - 1  # the most elements an accepted load factor needed
        self.converged = True  # False when some load factor was not converged within HALVINGS
        self.lowered = False  # True when some load factor was taken extrapolated (less the error left: see above)

    def warping_elements(self) -> float:
        """The shortest element (m) next to a support that holds warping, on this level's mesh."""
        mesh = self.model.mesh
        nodes = [mesh.node_at(support.at) for support in self.model.member.supports if warping_held(support)]
        lengths = mesh.lengths
        return min((float(lengths[max(node - 1, 0):node + 1].min()) for node in nodes), default=0.0)

    def finer(self) -> "SectionStability":
        """This section on the mesh with every element cut in two (made once)."""
        if self._finer is None:
            fine = self.model.refined()
            self._finer = SectionStability(fine, self.section, fine.stiffness(self.section), fine.basis(self.section), self.base)
        return self._finer

    def axial(self, weights: np.ndarray) -> Buckling:
        return self._converged(lambda level, hint: level.reduced.modes(level.model.geometry("axial", level.section, weights), 1, hint)[0])

    def lateral(self, weights: np.ndarray) -> Buckling:
        return self._converged(lambda level, hint: level.reduced.modes(level.model.geometry("lateral", level.section, weights), 1, hint)[0])

    def _converged(self, solve: Callable[["SectionStability", float], Buckling]) -> Buckling:
        """The converged load factor of `solve` (on a level, with a hint: the coarser level's load
        factor, at or above the finer one's) on this mesh and its halvings (see the class
        docstring), with the buckled shape on the base mesh."""
        level, found, previous = self, solve(self, math.inf), math.inf
        if found.free_movement:
            return Buckling(found.load_factor, level.on_base(found.mode), True)
        for _ in range(HALVINGS):
            if level.model.mesh.size * 2 > SIZE_LIMIT:
                break
            finer = level.finer()
            fine = solve(finer, found.load_factor)
            if fine.free_movement or _agree(found.load_factor, fine.load_factor):
                self.elements = max(self.elements, len(finer.model.mesh.nodes) - 1)
                return Buckling(fine.load_factor, finer.on_base(fine.mode), fine.free_movement)
            extrapolated = _extrapolated(previous, found.load_factor, fine.load_factor)
            if extrapolated is not None:
                self.elements = max(self.elements, len(finer.model.mesh.nodes) - 1)
                self.lowered = True
                return Buckling(extrapolated, finer.on_base(fine.mode))
            level, found, previous = finer, fine, found.load_factor
        self.converged = False
        self.elements = max(self.elements, len(level.model.mesh.nodes) - 1)
        bound = max(found.load_factor - abs(previous - found.load_factor), 0.0) if math.isfinite(previous) else found.load_factor
        return Buckling(bound, level.on_base(found.mode))

    def on_base(self, mode: np.ndarray | None) -> np.ndarray | None:
        """A buckled shape on this level's mesh as values and slopes at the base mesh's nodes (which
        this mesh has), largest |value| 1."""
        if mode is None or self.model.mesh is self.base:
            return mode
        mesh, base = self.model.mesh, self.base
        nodes = np.array([mesh.node_at(x) for x in base.nodes])
        out = np.zeros(base.size)
        for table in ("value", "slope_left", "slope_right"):
            out[getattr(base, table)] = mode[getattr(mesh, table)[nodes]]
        peak = np.abs(out).max(initial=0.0)
        return out / peak if peak > 0 else out

    def combination(self, kind: str, combination: int, mass: float) -> Buckling:
        """The lowest load factor of a combination (self-weight of `mass` kg/m) for `kind` "axial" or
        "lateral", converged. Combinations whose load sets for this kind are the same up to a
        positive factor share one solve (the load factor scales inversely with the loads, the
        buckled shape is the same): a case that gives no geometric term of the kind (a sideways wind
        in the lateral solve, say) counts as absent, and a combination that only scales another
        (0.6 x dead) is solved once."""
        loads, per_mass = self.model.rows
        return self.load_set(kind, loads[combination] + mass * per_mass[combination])

    def load_set(self, kind: str, weights: np.ndarray) -> Buckling:
        """The lowest load factor of a load set (weights as a row of MemberSolution.weights, self-weight
        included) for `kind`, converged, from the load cases' own matrices (as `combination`)."""
        live = self.model.live_columns(kind)
        shape, scale = load_shape((column, weight) for column, weight in enumerate(weights) if column in live)
        if not shape:
            return Buckling(math.inf, None)
        found = self._converged(lambda level, hint: level._shape_solve(kind, shape, hint))
        return Buckling(found.load_factor / scale, found.mode, found.free_movement)

    def unrefined(self, kind: str, weights: np.ndarray) -> Buckling:
        """The lowest load factor of a load set (as in load_set) on this level's mesh alone, not
        converged (at or above the converged one: the finer meshes hold this one's shapes), with its
        shape on this level's mesh; the solve is the one load_set starts from (made once per shape)."""
        live = self.model.live_columns(kind)
        shape, scale = load_shape((column, weight) for column, weight in enumerate(weights) if column in live)
        if not shape:
            return Buckling(math.inf, None)
        found = self._shape_solve(kind, shape, math.inf)
        return Buckling(found.load_factor / scale, found.mode, found.free_movement)

    def _shape_solve(self, kind: str, shape: "LoadShape", hint: float) -> Buckling:
        """The lowest load factor of a load shape on this level's mesh (made once per shape; `hint`:
        see Reduced.modes)."""
        found = self._solved[kind].find(shape)
        if found is None:
            b = sum(share * self._column(kind, column, positive) for column, positive, share in shape)
            found = self.reduced.modes(b, 1, hint)[0]
            self._solved[kind].add(shape, found)
        return found

    def load_matrix(self, kind: str, weights: np.ndarray) -> np.ndarray:
        """B of a load set (weights as a row of MemberSolution.weights, self-weight included) for this
        section, projected as Reduced.project: the sum of its live columns' matrices."""
        return self.reduced.project(self.load_matrix_full(kind, weights))

    def load_matrix_full(self, kind: str, weights: np.ndarray) -> Any:
        """B of a load set on this level's mesh before projection (what Reduced.modes takes)."""
        live = self.model.live_columns(kind)
        parts = [abs(weight) * self._column(kind, column, weight > 0)
                 for column, weight in enumerate(np.asarray(weights, dtype=float)) if weight != 0.0 and column in live]
        return sum(parts[1:], parts[0]) if parts else np.zeros((self.model.mesh.size,) * 2)

    def _column(self, kind: str, column: int, positive: bool) -> np.ndarray:
        """B of one load-case column at weight +1 or -1 for this section (made once; a load shape's B,
        their sum, is projected onto the admissible freedoms once)."""
        key = (kind, column, positive)
        if key not in self._columns:
            terms = self.model.column_terms(kind, column, positive)
            self._columns[key] = as_matrix(-weighted_sum(terms, term_coefficients(kind, self.section)), self.model.mesh.size, self.model.mesh.sparse)
        return self._columns[key]


def _agree(coarse: float, fine: float) -> bool:
    """True when two load factors of successive meshes agree to CONVERGED (both infinite: no buckling)."""
    if math.isinf(coarse) and math.isinf(fine):
        return True
    return abs(coarse - fine) <= CONVERGED * abs(fine)


def _extrapolated(before: float, coarse: float, fine: float) -> float | None:
    """The finer mesh's load factor less the error left after it, last change / (ratio - 1), when that
    is at most CONVERGED (relative), else None. The ratio: RATE, or that of the last two changes
    (`before`, `coarse`, `fine`: three successive meshes' load factors; `before` infinite when there
    were two) where lower, not below 2."""
    change = abs(coarse - fine)
    if not (math.isfinite(coarse) and math.isfinite(fine)) or fine <= 0.0:
        return None
    ratio = RATE
    if math.isfinite(before) and change > 0.0:
        ratio = max(min(RATE, abs(before - coarse) / change), 2.0)
    left = change / (ratio - 1.0)
    return fine - left if left <= CONVERGED * fine else None


LoadShape = tuple[tuple[int, bool, float], ...]  # (column, positive, |weight| / largest |weight|) of a load set
SAME_SHARE = 1e-12  # shares this close (relative) are the same load set: the solves differ by round-off only


def load_shape(weights: Iterable[tuple[int, float]]) -> tuple[LoadShape, float]:
    """A load set, (column, weight) pairs, as its shape (column, positive, |weight| / largest |weight|,
    zero weights left out) and that largest |weight|: load sets k > 0 times each other have one shape."""
    terms = [(column, float(weight)) for column, weight in weights if weight != 0.0]
    scale = max((abs(weight) for _, weight in terms), default=0.0)
    return tuple((column, weight > 0, abs(weight) / scale) for column, weight in terms), scale


class SameLoadSets:
    """What was found for each load shape so far (a solve, or which combination was solved), looked
    up by shape: its columns and signs first, then its shares to round-off (SAME_SHARE)."""

    def __init__(self) -> None:
        self.groups: dict[tuple[tuple[int, bool], ...], list[tuple[LoadShape, Any]]] = {}

    def find(self, shape: LoadShape) -> Any:
        """What was kept for this shape, or None."""
        for known, value in self.groups.get(_columns_and_signs(shape), ()):
            if all(abs(a - b) <= SAME_SHARE * max(a, b) for (_, _, a), (_, _, b) in zip(known, shape)):
                return value
        return None

    def add(self, shape: LoadShape, value: Any) -> None:
        self.groups.setdefault(_columns_and_signs(shape), []).append((shape, value))


def _columns_and_signs(shape: LoadShape) -> tuple[tuple[int, bool], ...]:
    return tuple((column, positive) for column, positive, _ in shape)


def _section_key(section: StabilitySection) -> tuple[float, ...] | None:
    """A section's values as a key (None for a batch of sections: arrays)."""
    values = tuple(getattr(section, name) for name in section.__dataclass_fields__)
    return tuple(float(value) for value in values) if all(np.ndim(value) == 0 for value in values) else None


def term_coefficients(kind: str, section: StabilitySection) -> dict[str, Coefficient]:
    """The section scalars (floats or arrays) that weight each term matrix of a kind of solve."""
    if kind == "axial":
        return axial_coefficients(section)
    return {**moment_coefficients(section), **height_coefficients(section)}


def mode_name(shares: dict[str, float]) -> str:
    """The name of an axial buckling mode from its energy shares."""
    if shares["phi"] >= 0.9:
        return "torsional"
    if shares["v"] >= 0.9:
        return "flexural major"
    if shares["w"] >= 0.9:
        return "flexural minor"
    return "flexural-torsional"

