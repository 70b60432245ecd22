"""Second-order elastic actions of a member: the internal actions and displacements of each load set
(a combination with its self-weight) with the member's own geometric stiffness, on the stability
mesh (thin-walled beam elements: v along the section's depth, w sideways, twist phi with warping).

For one section and one load set: K the elastic matrix (EIz, EIy, EIyz, GJ, EIw and the supports'
springs, on the freedoms the supports and restraints leave free) and G the load set's geometric
matrix, the terms of the buckling solves (sizer.stability.terms): the axial force N(x) (P-delta in
both bending planes, and the flexural-torsional terms), the major-axis moment Mz(x) with its Wagner
term (the coupling of sideways bending and twist) and the loads' heights (see SectionSolver.geometric).
The first-order solve K u1 = f and the second-order solve (K + G) u2 = f - G u0 (u0: the initial
bow, a multiple of the lowest buckling mode, or zero) give the increment of the actions, u2's minus
u1's on the same mesh: added to the exact first-order actions of sizer.analysis, most of the mesh's
error cancels. Compression (N < 0)
makes K + G softer and the moments larger; tension stiffer and the moments smaller.

For a given load set of the geometric terms (its N(x) and M(x)) the response is linear in the
transverse loads f: a pattern of transverse loads under one axial force distribution may be
superposed (the geometric matrix, not the loads, carries the nonlinearity).

Actions from the fields (section axes, the member file's signs): Mz = EIz v'' + EIyz w'',
My = -(EIyz v'' + EIy w''), Vy = -dMz/dx, Vz = dMy/dx, T = GJ phi' - EIw phi''' (the whole torque),
the warping torque Tw = -EIw phi''' and the bimoment B = EIw phi'' (as sizer.analysis.torsion).
Loads across the section (off the shear centre) add their torques (sizer.analysis.torsion). The mesh is refined
(elements per member length doubled) until the increments of the moments at the check stations
change by less than CONVERGED of the largest second-order moment, up to FINEST elements.

A load set at or beyond its elastic buckling load (K + G not positive definite: the lowest load
factor on the whole load set is at most 1) has no second-order equilibrium: `beyond` marks it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Any, Sequence, TypeVar

import numpy as np

from sizer.analysis import MemberSolution
from sizer.analysis.section_axes import to_member_axes, to_section_axes
from sizer.model import LineLoad, Member, PointLoad
from sizer.stability.elements import Quadrature, hermite
from sizer.stability.matrices import as_matrix
from sizer.stability.mesh import ELEMENTS_PER_LENGTH, Mesh
from sizer.stability.problem import MemberStability, term_coefficients
from sizer.stability.section import StabilitySection
from sizer.stability.solve import Reduced
from sizer.stability.terms import axial_coefficients, weighted_sum

V, W, PHI = 0, 1, 2
N, VY, VZ, T, MY, MZ = range(6)
FIRST_LEVEL = 8  # elements per member length of the first mesh (at least; the stability mesh's rules add more)
FINEST = 256  # elements per member length at most
ZERO_ACTION = 1e-9  # N or N*m: below this an action is absent (as in sizer.checks)
CONVERGED = 2e-3  # the moments' increments changed by less than this fraction of the largest moment: converged


@dataclass(frozen=True)
class LoadSetResponse:
    """One load set's solves on the mesh of `model`: u1 (first order) and u2 (second order) on every
    freedom; `beyond`: at or beyond its elastic buckling load (no u1, u2); `load_factor`: its lowest
    buckling load factor on the whole load set where it was found (for the bow, or when beyond), else None."""

    model: MemberStability | None  # None: first order exactly (not solved)
    section: StabilitySection
    u1: np.ndarray | None
    u2: np.ndarray | None
    beyond: bool
    load_factor: float | None = None

    @property
    def increment(self) -> np.ndarray:
        """u2 - u1: the second-order increment of the fields (ValueError where not solved)."""
        if self.u1 is None or self.u2 is None:
            raise ValueError("no second-order solution for this load set")
        return self.u2 - self.u1

    def actions(self, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
        """(S, 6) increments of the actions (second minus first order) in member axes at stations xs
        (m), each on its side; zero when beyond buckling."""
        if self.beyond or self.model is None:
            return np.zeros((len(xs), 6))
        increment = field_derivatives(self.model, self.increment, xs, right)  # the actions are linear in the fields
        return to_member_axes(section_actions(increment, self.section), self.model.orientation)

    def warping(self, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
        """(S, 2) increments of the bimoment B = E Iw phi'' (N*m^2) and the warping torque
        Tw = -E Iw phi''' (N*m) at stations xs (m); zero when beyond buckling."""
        if self.beyond or self.model is None:
            return np.zeros((len(xs), 2))
        phi = field_derivatives(self.model, self.increment, xs, right)[PHI]
        return np.column_stack([self.section.EIw * phi[2], -self.section.EIw * phi[3]])

    def displacements(self, xs: np.ndarray, right: np.ndarray | None = None) -> np.ndarray:
        """(S, 6) increments of the displacements ux..rz (m, rad) in member axes; zero when beyond buckling."""
        if self.beyond or self.model is None:
            return np.zeros((len(xs), 6))
        right = np.ones(len(xs), bool) if right is None else right
        return member_displacements(field_derivatives(self.model, self.increment, xs, right), self.model.orientation)


def load_vectors(model: MemberStability, member: Member, orientation: str) -> np.ndarray:
    """(n_cases + 1, size) the consistent nodal loads on v, w and phi of each load-case column of
    `member` (the solution's, patterns expanded) and last of the unit self-weight (1 N/m along gravity)."""
    from sizer.analysis.loads import self_weight_load

    mesh, quad = model.mesh, model.quad
    cases = model.cases
    out = np.zeros((len(cases) + 1, mesh.size))
    column = {name: k for k, name in enumerate(cases)}
    loads = [(column[load.case], load) for load in member.loads if load.case in column]
    loads.append((len(cases), self_weight_load(member)))
    for k, load in loads:
        if isinstance(load, PointLoad):
            _add_point_load(out[k], model, load, orientation)
        elif isinstance(load, LineLoad) and load.end > load.start:
            _add_line_load(out[k], model, quad, load, orientation)
    return out


def torque_vectors(model: MemberStability, member: Member, centroid: tuple[float, float]) -> np.ndarray:
    """(n_cases + 1, size) the nodal torques on phi of each load-case column and of the unit
    self-weight from the transverse loads acting off the shear centre (their `across`; the self-weight
    at the centroid): `centroid` (dy, dz) of the centroid from the shear centre, m, member axes."""
    from sizer.analysis.loads import self_weight_load
    from sizer.analysis.torsion import across_torque_loads

    out = np.zeros((len(model.cases) + 1, model.mesh.size))
    sets = [[load for load in member.loads if load.case == name] for name in model.cases] + [[self_weight_load(member)]]
    for k, loads in enumerate(sets):
        for load in across_torque_loads(loads, centroid):
            if isinstance(load, PointLoad):
                _add_point_load(out[k], model, load, member.orientation)
            elif load.end > load.start:
                _add_line_load(out[k], model, model.quad, load, member.orientation)
    return out


Force = TypeVar("Force", float, np.ndarray)  # one force component, or its values at many points


def _section_forces(force: Sequence[Force], orientation: str) -> tuple[Force, Force]:
    """(along v, along w) of a member-axes force (fx, fy, fz): v = uy, w = uz ("major"); v = uz, w = -uy ("minor")."""
    return (force[1], force[2]) if orientation != "minor" else (force[2], -force[1])


def _add_point_load(out: np.ndarray, model: MemberStability, load: PointLoad, orientation: str) -> None:
    mesh = model.mesh
    node = mesh.node_at(load.at)
    fv, fw = _section_forces(load.force, orientation)
    _, my, mz = load.moment
    out[mesh.value[node, V]] += fv
    out[mesh.value[node, W]] += fw
    out[mesh.value[node, PHI]] += load.moment[0]
    if orientation != "minor":  # rz = v', ry = -w'
        on_v, on_w = mz, -my
    else:  # ry = -v', rz = -w'
        on_v, on_w = -my, -mz
    out[mesh.slope_left[node, V]] += on_v
    out[mesh.slope_left[node, W]] += on_w


def _add_line_load(out: np.ndarray, model: MemberStability, quad: Quadrature, load: LineLoad, orientation: str) -> None:
    mesh = model.mesh
    middle = (mesh.nodes[:-1] + mesh.nodes[1:]) / 2
    inside = ((middle > load.start) & (middle < load.end))[:, None]
    t = (quad.x - load.start) / (load.end - load.start)
    q = [(np.asarray(load.q_start[k]) + (load.q_end[k] - load.q_start[k]) * t) * inside for k in range(4)]
    qv, qw = _section_forces(q[:3], orientation)
    shapes = quad.shapes[0]  # (E, G, 4) values
    for field, intensity in ((V, qv), (W, qw), (PHI, q[3])):
        if not np.any(intensity):
            continue
        blocks = np.einsum("eg,egi->ei", intensity * quad.weight, shapes)
        np.add.at(out, mesh.element_freedoms(field), blocks)


def dense(matrix: Any) -> np.ndarray:  # an ndarray or a scipy sparse matrix (scipy is untyped)
    """A stability matrix as a dense array (long meshes assemble sparse ones: sizer.stability.matrices);
    the second-order solves here are dense, on meshes of a few hundred freedoms."""
    return matrix.toarray() if hasattr(matrix, "toarray") else matrix


class SectionSolver:
    """The elastic matrix of one section on one mesh, reduced to the admissible freedoms, with its
    free movements (a twist nothing holds, say) set apart."""

    def __init__(self, model: MemberStability, section: StabilitySection) -> None:
        self.model, self.section = model, section
        self.K = dense(model.stiffness(section))
        self.reduced = Reduced(self.K, dense(model.basis(section)))
        free = self.reduced.free
        self.keep = None if free is None else _complement(free)
        self._columns: dict[tuple[int, bool], Any] = {}

    def geometric(self, weights: np.ndarray) -> np.ndarray:
        """G (size, size) of a load set (weights as a row of MemberSolution.weights, self-weight
        included): the second-order work of its axial force and of its major-axis moment Mz with its
        Wagner term and its loads' heights (the terms of the buckling solves); K + lam G is singular
        at buckling. The minor-axis moment's term My v'' phi is left out: with v'' the in-plane
        curvature under the major-axis loads it is the prebuckling curvature's effect, which lowers
        the sideways response and which classical theory neglects. The sum of its load-case columns'
        matrices (the terms are linear in the weights; a load's default height follows the sign of
        its factor), each made once for this section; the columns' term matrices are the model's,
        shared by every section."""
        out = np.zeros((self.model.mesh.size,) * 2)
        for column, weight in enumerate(np.asarray(weights, dtype=float)):
            if weight != 0.0:
                out += abs(weight) * dense(self._column(column, bool(weight > 0)))
        return out

    def _column(self, column: int, positive: bool) -> Any:
        """G of one load-case column at weight +1 or -1 for this section (made once)."""
        key = (column, positive)
        if key not in self._columns:
            total = as_matrix(0.0, self.model.mesh.size, self.model.mesh.sparse)
            for kind in ("axial", "lateral"):
                coefficients = axial_coefficients(self.section) if kind == "axial" else term_coefficients(kind, self.section)
                total = total + weighted_sum(self.model.column_terms(kind, column, positive), coefficients)
            self._columns[key] = total
        return self._columns[key]

    def _project(self, matrix: np.ndarray) -> np.ndarray:
        m = self.reduced.project(matrix)
        return m if self.keep is None else self.keep.T @ m @ self.keep

    def _load(self, f: np.ndarray) -> np.ndarray:
        r = self.reduced.scale * (self.reduced.basis.T @ f)
        return r if self.keep is None else self.keep.T @ r

    def _full(self, reduced: np.ndarray) -> np.ndarray:
        r = reduced if self.keep is None else self.keep @ reduced
        return self.reduced.basis @ (self.reduced.scale * r)

    def elastic(self) -> np.ndarray:
        return self.reduced.k if self.keep is None else self.keep.T @ self.reduced.k @ self.keep

    def solve(self, f: np.ndarray, G: np.ndarray, bow: np.ndarray | None) -> tuple[np.ndarray, np.ndarray, np.ndarray | None] | None:
        """(u1, u2, b) full displacement vectors of K u1 = f, (K + G) u2 = f and (K + G) b = -G bow
        (None without a bow), so that u2 + b is the response with the bow and u2 - b with it
        reversed; None when K + G is not positive definite (at or beyond buckling)."""
        k = self.elastic()
        stiffness = k + self._project(G)
        try:
            np.linalg.cholesky(stiffness)
        except np.linalg.LinAlgError:
            return None
        load = self._load(f)
        rhs = load[:, None] if bow is None else np.column_stack([load, self._load(-(G @ bow))])
        second = np.linalg.solve(stiffness, rhs)
        u1 = np.linalg.solve(k, load)
        return self._full(u1), self._full(second[:, 0]), None if bow is None else self._full(second[:, 1])


def _complement(free: np.ndarray) -> np.ndarray:
    q, _ = np.linalg.qr(free, mode="complete")
    return q[:, free.shape[1]:]


def field_derivatives(model: MemberStability, u: np.ndarray, xs: np.ndarray, right: np.ndarray) -> np.ndarray:
    """(3 fields, 4 orders, S) value, slope, curvature and third derivative of v, w, phi at stations xs
    (m), each on its side (`right` True: the element after x)."""
    mesh = model.mesh
    nodes, tol = mesh.nodes, mesh.tol
    after = np.searchsorted(nodes, xs + tol, side="right") - 1
    before = np.searchsorted(nodes, xs - tol, side="left") - 1
    e = np.clip(np.where(right, after, before), 0, len(nodes) - 2)
    le = nodes[e + 1] - nodes[e]
    xi = np.clip((xs - nodes[e]) / le, 0.0, 1.0)
    shapes = hermite(xi, le)  # (3, S, 4)
    third = np.stack([12 / le**3, 6 / le**2, -12 / le**3, 6 / le**2], axis=-1)
    shapes = np.concatenate([shapes, third[None]])  # (4, S, 4)
    out = np.empty((3, 4, len(xs)))
    for field in range(3):
        dofs = u[mesh.element_freedoms(field)[e]]  # (S, 4)
        out[field] = np.einsum("osi,si->os", shapes, dofs)
    return out


def section_actions(d: np.ndarray, section: StabilitySection) -> np.ndarray:
    """(S, 6) N, Vy, Vz, T, My, Mz in the section's axes from field_derivatives (N left zero)."""
    v, w, phi = d
    out = np.zeros((d.shape[2], 6))
    out[:, MZ] = section.EIz * v[2] + section.EIyz * w[2]
    out[:, MY] = -(section.EIyz * v[2] + section.EIy * w[2])
    out[:, VY] = -(section.EIz * v[3] + section.EIyz * w[3])
    out[:, VZ] = -(section.EIyz * v[3] + section.EIy * w[3])
    out[:, T] = section.GJ * phi[1] - section.EIw * phi[3]
    return out


def member_displacements(d: np.ndarray, orientation: str) -> np.ndarray:
    """(S, 6) ux, uy, uz, rx, ry, rz in member axes from field_derivatives (ux left zero)."""
    v, w, phi = d
    out = np.zeros((d.shape[2], 6))
    if orientation != "minor":
        out[:, 1], out[:, 2], out[:, 5], out[:, 4] = v[0], w[0], v[1], -w[1]
    else:  # v = uz, w = -uy
        out[:, 2], out[:, 1], out[:, 4], out[:, 5] = v[0], -w[0], -v[1], -w[1]
    out[:, 3] = phi[0]
    return out


SAME_MODE = 1e-3  # load factors this close (relative) to the lowest count as one repeated mode (a round bar's, a square tube's)


def bow_shape(reduced: Reduced, K: np.ndarray, mesh: Mesh, section: StabilitySection, G: np.ndarray, f: np.ndarray,
              bow: float) -> tuple[np.ndarray | None, float]:
    """(u0, lowest load factor): the lowest buckling mode of the load set (K on `reduced`) scaled so
    that its largest movement (v or w, or the twist times the polar radius about the shear centre)
    is `bow` (m) (either side: SecondOrder takes the unfavourable one). Where the lowest mode repeats (equal load factors, as for a round bar), the shape in its
    modes that the loads work on most (the projection of K^-1 f on them, K-orthonormal: the same
    whatever basis of them the eigen-solve returns). u0 None where the load set cannot buckle the member."""
    found = [(mode.load_factor, mode.mode) for mode in reduced.modes(-G, 3)
             if mode.mode is not None and math.isfinite(mode.load_factor) and mode.load_factor > 0.0]
    if not found:
        return None, math.inf
    lowest = found[0][0]
    repeated = [shape for factor, shape in found if factor <= lowest * (1 + SAME_MODE)]
    shape = repeated[0]
    if len(repeated) > 1:
        modes = np.column_stack(repeated)
        lower = np.linalg.cholesky(modes.T @ K @ modes)
        basis = np.linalg.solve(lower, modes.T).T  # K-orthonormal columns spanning the repeated modes
        shape = basis @ (basis.T @ f)
    if not np.any(shape):
        shape = repeated[0]
    radius = math.sqrt(float(section.polar_radius_squared))
    size = max(np.abs(shape[mesh.value[:, V]]).max(), np.abs(shape[mesh.value[:, W]]).max(), radius * np.abs(shape[mesh.value[:, PHI]]).max())
    if size <= 0.0:
        return None, lowest
    return bow / size * shape, lowest


_SHARED: dict[tuple[int, int], tuple[Member, MemberStability, np.ndarray]] = {}
SHARED_MOST = 8  # meshes kept for reuse across sections


def shared_model(member: Member, solution: MemberSolution, per_length: int) -> tuple[MemberStability, np.ndarray]:
    """The stability model of `member` on a mesh of `per_length` elements and its load vectors, made
    once for every section of a member without springs (its internal actions, and so its geometric
    matrices, do not depend on the section); made anew with springs."""
    if member.has_springs:
        model = MemberStability(member, solution, per_length)
        return model, load_vectors(model, member, member.orientation)
    key = (id(member.loads), per_length)  # the loads: shared by the member's pattern arrangements' variants (analysis.patterns)
    found = _SHARED.get(key)
    if found is None or not _same_but_combinations(found[0], member):
        if len(_SHARED) >= SHARED_MOST:
            _SHARED.pop(next(iter(_SHARED)))
        model = MemberStability(member, solution, per_length)
        model.share_columns(next((other for _, other, _ in _SHARED.values() if other.same_columns(model)), None))
        found = _SHARED[key] = (member, model, load_vectors(model, member, member.orientation))
    return found[1].for_solution(solution), found[2]


def _same_but_combinations(kept: Member, member: Member) -> bool:
    """Whether two members differ at most in their combinations (pattern arrangements)."""
    return kept is member or (kept.loads is member.loads and replace(kept, combinations=member.combinations, patterning=member.patterning) == member)


def share_first_level(member: Member, model: MemberStability) -> None:
    """Take `model` (the stability model of `member` on its default mesh, from a solution of `member`
    itself, patterns not expanded, without springs) as the first level of the second-order solves of
    every section of `member`: the same mesh and internal actions, so its term matrices, made for the
    buckling solves, are made once for both."""
    if member.has_springs or model.member is not member or FIRST_LEVEL != ELEMENTS_PER_LENGTH:
        return
    if len(_SHARED) >= SHARED_MOST:
        _SHARED.pop(next(iter(_SHARED)))
    _SHARED[(id(member), FIRST_LEVEL)] = (member, model, load_vectors(model, member, member.orientation))


class SecondOrder:
    """The second-order increments of every combination of one section on one member (see the
    module docstring). `bow` (m): the initial bow's amplitude (0: none); `mass` (kg/m): the section's
    self-weight where the member has one (0: none); `centroid`: where the centroid is from the shear
    centre (loads across the section, and the self-weight at the centroid, add their torques)."""

    def __init__(self, member: Member, solution: MemberSolution, section: StabilitySection, bow: float = 0.0,
                 mass: float = 0.0, centroid: tuple[float, float] = (0.0, 0.0)) -> None:
        self.member = solution.member  # patterns expanded
        self.solution = solution
        self.mass = mass  # kg/m of self-weight (0: none)
        self.centroid = centroid  # (dy, dz) m of the centroid from the shear centre, member axes
        self.section = section
        self.bow = bow
        self.orientation = member.orientation
        self.levels: dict[int, tuple[MemberStability, SectionSolver, np.ndarray]] = {}
        self.elements = 0  # elements per member length of the mesh used

    def _level(self, per_length: int) -> tuple[MemberStability, SectionSolver, np.ndarray]:
        if per_length not in self.levels:
            model, loads = shared_model(self.member, self.solution, per_length)
            loads = loads + torque_vectors(model, self.member, self.centroid)
            self.levels[per_length] = (model, SectionSolver(model, self.section), loads)
        return self.levels[per_length]

    def _respond(self, per_length: int, combination: int) -> LoadSetResponse:
        model, solver, loads = self._level(per_length)
        weights = self.solution.weights(self.mass)[combination]
        f = weights @ loads
        G = solver.geometric(weights)
        u0, factor = (None, None)
        if self.bow > 0.0 and np.any(G):
            u0, factor = bow_shape(solver.reduced, solver.K, model.mesh, self.section, G, f, self.bow)
        found = solver.solve(f, G, u0)
        if found is None:
            if factor is None:
                factor = solver.reduced.modes(-G, 1)[0].load_factor
            return LoadSetResponse(model, self.section, None, None, True, factor)
        u1, u2, b = found
        if b is not None:
            assert u0 is not None  # b is found only with a bow
            u2 = _unfavourable(model, self.section, u2, b, u0)
        return LoadSetResponse(model, self.section, u1, u2, False, factor)

    def responses(self, xs: np.ndarray, right: np.ndarray, first_order: np.ndarray) -> list[LoadSetResponse]:
        """Each combination's response, each on a mesh refined until its moment
        increments at stations xs (m, sides `right`) change by less than CONVERGED of its largest
        second-order moment; `first_order` (C, S, 6) the sets' exact first-order actions (member
        axes). A set without axial force, sideways load, torque or bow is first order exactly (its
        geometric terms act on sideways bending and twist only, which nothing drives): not solved."""
        found = []
        for row, base in enumerate(first_order):
            if self.bow == 0.0 and _first_order_exact(to_section_axes(base, self.orientation)):
                found.append(LoadSetResponse(None, self.section, None, None, False))
                continue
            per_length = FIRST_LEVEL
            previous = self._respond(per_length, row)
            before = previous.actions(xs, right)
            while per_length < FINEST:
                per_length *= 2
                finer = self._respond(per_length, row)
                after = finer.actions(xs, right)
                done = _converged(previous, finer, before, after, base)
                previous, before = finer, after
                if done:
                    break
            self.elements = max(self.elements, per_length)
            found.append(previous)
        return found


def _first_order_exact(actions: np.ndarray) -> bool:
    """Whether (S, 6) section-axes actions have no axial force, no sideways shear or moment and no torque."""
    return bool(np.abs(actions[:, [N, VZ, T, MY]]).max(initial=0.0) <= ZERO_ACTION)


TIE = 1e-6  # peak moments this close (relative) with the bow on either side: a tie


def _unfavourable(model: MemberStability, section: StabilitySection, u2: np.ndarray, b: np.ndarray, bow: np.ndarray) -> np.ndarray:
    """u2 + b or u2 - b, whichever has the larger peak moment; on a tie (a symmetric response) the
    side on which the bow's largest movement is positive, so that every mesh picks the same side."""
    plus, minus = _peak_moment(model, section, u2 + b), _peak_moment(model, section, u2 - b)
    if abs(plus - minus) <= TIE * max(plus, minus):
        values = bow[model.mesh.value[:, :2].ravel()]
        return u2 + b if values[np.argmax(np.abs(values))] >= 0 else u2 - b
    return u2 + b if plus > minus else u2 - b


def _peak_moment(model: MemberStability, section: StabilitySection, u: np.ndarray) -> float:
    """The largest resultant moment (N*m) of a displacement vector on either side of every node: the
    bow's side is the one that gives the larger (unfavourable)."""
    nodes = np.concatenate([model.mesh.nodes, model.mesh.nodes])
    right = np.arange(len(nodes)) < len(model.mesh.nodes)
    actions = section_actions(field_derivatives(model, u, nodes, right), section)
    return float(np.hypot(actions[:, MY], actions[:, MZ]).max())


def _converged(coarse: LoadSetResponse, fine: LoadSetResponse, before: np.ndarray, after: np.ndarray, first_order: np.ndarray) -> bool:
    """Whether one load set's moment increments at the stations settled between two meshes."""
    if coarse.beyond or fine.beyond:
        return coarse.beyond == fine.beyond
    moments = np.abs(first_order[:, MY:MZ + 1] + after[:, MY:MZ + 1]).max(initial=0.0)
    change = np.abs(after[:, MY:MZ + 1] - before[:, MY:MZ + 1]).max(initial=0.0)
    return bool(change <= CONVERGED * moments + 1e-9)
