"""The analysis module against an independent reference: the member's differential equations
solved numerically with scipy.integrate.solve_bvp.

Reference model (Euler-Bernoulli beam, linear elastic, small deflection; any mechanics of materials
text): with deflection w along +y, EIz w'''' = wy, Mz = EIz w'' (sagging positive), Vy = -EIz w''',
rz = w'. In the x-z plane with w along +z: EIy w'''' = wz, My = -EIy w'', Vz = -EIy w''',
ry = -w'. Axial: EA u'' = -wx, N = EA u'. Torsion: GJ phi'' = -mx, T = GJ phi'.

Concentrated loads, supports, springs and hinges sit on segment boundaries: the member is split
into segments, each segment is mapped onto s in [0, 1] and all segments' states are stacked into
one vector for solve_bvp; the boundary conditions tie the segments together (continuity, jumps
by the concentrated force or moment, zero deflection or a spring reaction at a support, zero
moment on both sides of a hinge). No smoothing of a point load is used.
The problems are solved in dimensionless form (x / L, loads / q_ref) so that every state is of
order one for solve_bvp's tolerances.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import pytest
from scipy.integrate import solve_bvp

from sizer.analysis import solve_case
from sizer.model import Hinge, LineLoad, Member, PointLoad, Stiffness, Support, SUPPORT_TYPES

# IPE 300 handbook properties from docs/references.md (from memory; European axis names): A = 53.8 cm^2,
# strong axis 8356 cm^4 (our EIz), weak axis 604 cm^4 (our EIy), It = 20.1 cm^4; steel E = 200 GPa,
# G = 77 GPa (common practice).
E_STEEL = 200e9
G_STEEL = 77e9
STEEL_IPE300 = Stiffness(
    EA=E_STEEL * 53.8e-4, GJ=G_STEEL * 20.1e-8, EIz=E_STEEL * 8356e-8, EIy=E_STEEL * 604e-8
)
RTOL = 1e-6  # agreement asked for, relative to the largest value of each quantity


# --------------------------------------------------------------------------------------------
# The reference solver: a chain of segments, each with ORDER states.
# Bending (ORDER 4): (w, w', M, S) with M = EI w'' and S = EI w''' = dM/dx, dS/dx = q.
# Axial or torsion (ORDER 2): (u, F) with F = stiffness * u', dF/dx = -q.
# --------------------------------------------------------------------------------------------


@dataclass
class Node:
    """A segment boundary at x (m) for the reference solver.

    rigid_w / rigid_r: deflection / rotation held at zero; spring_w (N/m) / spring_r (N*m/rad):
    elastic restraint; hinge: moment released (w' may jump); force / moment: applied there, in
    the sense of the reference states (force along +w, moment adding to the chosen M sign below).
    """

    x: float
    rigid_w: bool = False
    rigid_r: bool = False
    spring_w: float = 0.0
    spring_r: float = 0.0
    hinge: bool = False
    force: float = 0.0
    moment: float = 0.0


@dataclass
class Chain:
    """A member of length `length` for the reference: nodes at both ends and at every boundary,
    distributed load q(x, segment midpoint) (N/m, or N*m/m for torsion) between them, rigidity
    (N*m^2 or N). Every end of a line load must be a node."""

    length: float
    nodes: list[Node]
    q: Callable[[np.ndarray, float], np.ndarray]
    rigidity: float
    order: int = 4
    q_ref: float = 1.0


@dataclass
class Reference:
    """A solved chain: callable in dimensional units via `states(x, side)`."""

    chain: Chain
    solution: object
    xs: np.ndarray  # node positions, m

    def states(self, x: np.ndarray, side: str = "right") -> np.ndarray:
        """Dimensional states at x, shape (n, order): bending (w m, w' rad, M N*m, S N);
        axial or torsion (u, F). At a node, side picks the segment to the right or left of it."""
        chain = self.chain
        length, q_ref, rigidity, order = chain.length, chain.q_ref, chain.rigidity, chain.order
        out = np.empty((len(x), order))
        for row, xi in enumerate(np.asarray(x, dtype=float)):
            seg = _segment_index(self.xs, xi, side)
            a, b = self.xs[seg], self.xs[seg + 1]
            s = (xi - a) / (b - a)
            values = self.solution.sol(s)[order * seg : order * (seg + 1)]
            out[row] = values * _scales(order, length, q_ref, rigidity)
        return out


def _segment_index(xs: np.ndarray, x: float, side: str) -> int:
    """Index of the segment holding x; at a node, the one on `side` of it."""
    n = len(xs) - 1
    if side == "right":
        seg = int(np.searchsorted(xs, x, side="right")) - 1
    else:
        seg = int(np.searchsorted(xs, x, side="left")) - 1
    return min(max(seg, 0), n - 1)


def _scales(order: int, length: float, q_ref: float, rigidity: float) -> np.ndarray:
    """Factors from dimensionless to dimensional states."""
    if order == 4:
        return np.array(
            [q_ref * length**4 / rigidity, q_ref * length**3 / rigidity, q_ref * length**2, q_ref * length]
        )
    return np.array([q_ref * length**2 / rigidity, q_ref * length])


def solve_chain(chain: Chain) -> Reference:
    """Solve the chain's boundary value problem with scipy.integrate.solve_bvp."""
    xs = np.array([node.x for node in chain.nodes])
    n_seg = len(xs) - 1
    order, length, q_ref, rigidity = chain.order, chain.length, chain.q_ref, chain.rigidity
    lo, hi = xs[:-1] / length, xs[1:] / length  # dimensionless segment ends

    def rhs(s: np.ndarray, y: np.ndarray) -> np.ndarray:
        dy = np.empty_like(y)
        for seg in range(n_seg):
            span = hi[seg] - lo[seg]
            xhat = lo[seg] + s * span
            qhat = chain.q(xhat * length, (lo[seg] + hi[seg]) / 2 * length) / q_ref
            block = y[order * seg : order * (seg + 1)]
            if order == 4:
                d = np.vstack([block[1], block[2], block[3], qhat])
            else:
                d = np.vstack([block[1], -qhat])
            dy[order * seg : order * (seg + 1)] = span * d
        return dy

    def bc(ya: np.ndarray, yb: np.ndarray) -> np.ndarray:
        residuals: list[float] = []
        for k, node in enumerate(chain.nodes):
            left = yb[order * (k - 1) : order * k] if k > 0 else None
            right = ya[order * k : order * (k + 1)] if k < n_seg else None
            residuals.extend(_node_conditions(node, left, right, order, length, q_ref, rigidity))
        return np.array(residuals)

    s = np.linspace(0.0, 1.0, 41)
    guess = np.zeros((order * n_seg, s.size))
    solution = solve_bvp(rhs, bc, s, guess, tol=1e-10, bc_tol=1e-12, max_nodes=200000)
    assert solution.success, solution.message
    return Reference(chain, solution, xs)


def _node_conditions(node, left, right, order, length, q_ref, rigidity) -> list[float]:
    """Boundary residuals at one node (dimensionless). An end sees zero forces outside the member.

    Jumps across the node: S (= dM/dx = -Vy) rises by the applied force plus the support reaction
    (-k w for a spring); M (= Mz) falls by the applied couple plus the reaction couple (-k_r w')."""
    kw = node.spring_w * length**3 / rigidity
    kr = node.spring_r * length / rigidity
    force = node.force / (q_ref * length)
    moment = node.moment / (q_ref * length**2)
    if order == 2:
        return _node_conditions_2(node, left, right, force, node.spring_w * length / rigidity)
    zero = np.zeros(4)
    lhs = left if left is not None else zero
    rhs = right if right is not None else zero
    here = right if right is not None else left  # kinematic state at the node
    out: list[float] = []
    if left is not None and right is not None:
        out.append(left[0] - right[0])  # deflection continuous
    out.append(here[0] if node.rigid_w else (rhs[3] - lhs[3]) - (force - kw * here[0]))
    if node.hinge:
        out.extend([lhs[2], rhs[2]])  # no moment on either side of the hinge
        return out
    if left is not None and right is not None:
        out.append(left[1] - right[1])  # slope continuous
    # M = EI w'' is Mz: Mz(x+) - Mz(x-) = -(applied moment + reaction moment -k_r w').
    out.append(here[1] if node.rigid_r else (rhs[2] - lhs[2]) + (moment - kr * here[1]))
    return out


def _node_conditions_2(node, left, right, force, k) -> list[float]:
    """Axial (or torsion) node: u continuous; F(x+) - F(x-) = -(applied + reaction -k u)."""
    zero = np.zeros(2)
    lhs = left if left is not None else zero
    rhs = right if right is not None else zero
    here = right if right is not None else left
    out: list[float] = []
    if left is not None and right is not None:
        out.append(left[0] - right[0])
    out.append(here[0] if node.rigid_w else (rhs[1] - lhs[1]) + (force - k * here[0]))
    return out


def linear_load(start: float, end: float, q_start: float, q_end: float):
    """q(x, mid): varying linearly from q_start at `start` to q_end at `end` (N/m) on a segment
    whose midpoint `mid` lies in [start, end], zero on other segments; x is an array (m). Deciding
    by segment keeps q smooth on each segment (no jump from rounding at its ends)."""

    def q(x: np.ndarray, mid: float) -> np.ndarray:
        if not start <= mid <= end:
            return np.zeros_like(x)
        return q_start + (q_end - q_start) * (x - start) / (end - start)

    return q


def no_load(x: np.ndarray, mid: float) -> np.ndarray:
    """No distributed load."""
    return np.zeros_like(x)


# --------------------------------------------------------------------------------------------
# Comparison helpers
# --------------------------------------------------------------------------------------------


def sample_points(xs: list[float]) -> tuple[np.ndarray, np.ndarray]:
    """Stations inside every segment plus both sides of every node on the member: (x, side)
    arrays (the left side of x = 0 and the right side of x = L are off the member)."""
    inner = []
    for a, b in zip(xs[:-1], xs[1:]):
        inner.extend(np.linspace(a, b, 13)[1:-1])
    x = np.array(inner + list(xs[1:]) + list(xs[:-1]))
    side = np.array(["right"] * len(inner) + ["left"] * (len(xs) - 1) + ["right"] * (len(xs) - 1))
    return x, side


def analysis_at(fn, x: np.ndarray, side: np.ndarray) -> np.ndarray:
    """Evaluate solution.actions or solution.displacements at x with a side per point."""
    out = np.empty((len(x), 6))
    for which in ("left", "right"):
        mask = side == which
        if mask.any():
            out[mask] = np.asarray(fn(x[mask], side=which), dtype=float)
    return out


def reference_at(ref: Reference, x: np.ndarray, side: np.ndarray) -> np.ndarray:
    """Reference states at x with a side per point."""
    out = np.empty((len(x), ref.chain.order))
    for which in ("left", "right"):
        mask = side == which
        if mask.any():
            out[mask] = ref.states(x[mask], which)
    return out


def assert_close_to_max(actual: np.ndarray, expected: np.ndarray, what: str) -> None:
    """|actual - expected| <= RTOL * max|expected| everywhere."""
    scale = np.max(np.abs(expected))
    assert scale > 0, f"{what}: reference is all zero, the comparison would be empty"
    np.testing.assert_allclose(actual, expected, rtol=0, atol=RTOL * scale, err_msg=what)


def compare_xy_bending(member: Member, loads, ref: Reference, stiffness=STEEL_IPE300) -> None:
    """Deflection uy, rotation rz, moment Mz and shear Vy of the analysis against the reference."""
    solution = solve_case(member, loads, stiffness, "load")
    x, side = sample_points([node.x for node in ref.chain.nodes])
    states = reference_at(ref, x, side)
    actions = analysis_at(solution.actions, x, side)
    disp = analysis_at(solution.displacements, x, side)
    assert_close_to_max(disp[:, 1], states[:, 0], "deflection uy")
    assert_close_to_max(disp[:, 5], states[:, 1], "rotation rz = duy/dx")
    assert_close_to_max(actions[:, 5], states[:, 2], "moment Mz = EIz uy''")
    assert_close_to_max(actions[:, 1], -states[:, 3], "shear Vy = -EIz uy'''")


def reaction_from_jump(ref: Reference, x: float, applied: float) -> float:
    """Support force along +w at x from the jump in S = dM/dx, less the applied force (N)."""
    left = ref.states(np.array([x]), "left")[0, 3] if x > 0 else 0.0
    right = ref.states(np.array([x]), "right")[0, 3] if x < ref.chain.length else 0.0
    return right - left - applied


# --------------------------------------------------------------------------------------------
# The reference checks itself against handbook closed forms first
# --------------------------------------------------------------------------------------------


def propped_cantilever_chain(length: float, w: float, rigidity: float) -> Chain:
    """Fixed at x = 0, prop (rigid deflection) at x = L, uniform load w along +y (N/m)."""
    nodes = [Node(0.0, rigid_w=True, rigid_r=True), Node(length, rigid_w=True)]
    return Chain(length, nodes, linear_load(0.0, length, w, w), rigidity, q_ref=abs(w))


def test_reference_reproduces_propped_cantilever_closed_form():
    """Propped cantilever, uniform w: prop R = 3wL/8, fixed R = 5wL/8, M fixed = -wL^2/8,
    M max = 9wL^2/128 at 3L/8 from the prop (AISC Manual Table 3-23 / Roark Table 8.1, from
    memory). Guards the reference itself before it judges the analysis."""
    length, w = 6.0, -10e3  # downward 10 kN/m
    ref = solve_chain(propped_cantilever_chain(length, w, STEEL_IPE300.EIz))
    load = -w  # magnitude, downward
    assert reaction_from_jump(ref, length, 0.0) == pytest.approx(3 * load * length / 8, rel=1e-9)
    assert reaction_from_jump(ref, 0.0, 0.0) == pytest.approx(5 * load * length / 8, rel=1e-9)
    assert ref.states(np.array([0.0]))[0, 2] == pytest.approx(-load * length**2 / 8, rel=1e-9)
    at_max = length - 3 * length / 8
    m_max = ref.states(np.array([at_max]))[0, 2]
    assert m_max == pytest.approx(9 * load * length**2 / 128, rel=1e-9)


# --------------------------------------------------------------------------------------------
# Indeterminate layouts: analysis against the reference
# --------------------------------------------------------------------------------------------


def support(at: float, kind: str) -> Support:
    return Support(at=at, restrain=SUPPORT_TYPES[kind], label=kind)


def make_member(length: float, supports, loads, hinges=()) -> Member:
    return Member(
        length=length,
        material="steel",
        supports=tuple(supports),
        loads=tuple(loads),
        combinations={"all": {"load": 1.0}},
        self_weight_case=None,
        hinges=tuple(hinges),
    )


def test_propped_cantilever_uniform_load():
    length, w = 6.0, -10e3
    loads = [LineLoad(case="load", start=0.0, end=length, q_start=(0, w, 0, 0), q_end=(0, w, 0, 0))]
    member = make_member(length, [support(0.0, "fixed"), support(length, "roller")], loads)
    ref = solve_chain(propped_cantilever_chain(length, w, STEEL_IPE300.EIz))
    compare_xy_bending(member, loads, ref)
    reactions = solve_case(member, loads, STEEL_IPE300, "load").reactions
    np.testing.assert_allclose(reactions[1, 1], reaction_from_jump(ref, length, 0.0), rtol=RTOL)
    np.testing.assert_allclose(reactions[0, 1], reaction_from_jump(ref, 0.0, 0.0), rtol=RTOL)


def test_fixed_fixed_partial_triangular_load():
    """Load rising from 0 at x = 2 m to 15 kN/m downward at x = 5 m, span 7 m, both ends fixed."""
    length, start, end, peak = 7.0, 2.0, 5.0, -15e3
    loads = [LineLoad(case="load", start=start, end=end, q_start=(0, 0, 0, 0), q_end=(0, peak, 0, 0))]
    member = make_member(length, [support(0.0, "fixed"), support(length, "fixed")], loads)
    nodes = [Node(0.0, rigid_w=True, rigid_r=True), Node(start), Node(end), Node(length, rigid_w=True, rigid_r=True)]
    chain = Chain(length, nodes, linear_load(start, end, 0.0, peak), STEEL_IPE300.EIz, q_ref=abs(peak))
    ref = solve_chain(chain)
    compare_xy_bending(member, loads, ref)
    reactions = solve_case(member, loads, STEEL_IPE300, "load").reactions
    # End moments: the reaction couple at A equals -Mz(0+); at B it equals Mz(L-).
    m_a, m_b = ref.states(np.array([0.0]))[0, 2], ref.states(np.array([length]), "left")[0, 2]
    scale = max(abs(m_a), abs(m_b))
    np.testing.assert_allclose(reactions[:, 5], [-m_a, m_b], rtol=0, atol=RTOL * scale)


def test_two_span_continuous_point_load_in_one_span():
    """Pin at 0, rollers at 5 m and 12 m; 40 kN down at 3 m in the first span."""
    length, at, force = 12.0, 3.0, -40e3
    loads = [PointLoad(case="load", at=at, force=(0, force, 0))]
    supports = [support(0.0, "pin"), support(5.0, "roller"), support(length, "roller")]
    member = make_member(length, supports, loads)
    nodes = [Node(0.0, rigid_w=True), Node(at, force=force), Node(5.0, rigid_w=True), Node(length, rigid_w=True)]
    chain = Chain(length, nodes, no_load, STEEL_IPE300.EIz, q_ref=abs(force) / length)
    ref = solve_chain(chain)
    compare_xy_bending(member, loads, ref)
    reactions = solve_case(member, loads, STEEL_IPE300, "load").reactions
    expected = [reaction_from_jump(ref, x, 0.0) for x in (0.0, 5.0, length)]
    np.testing.assert_allclose(reactions[:, 1], expected, rtol=0, atol=RTOL * abs(force))


def test_beam_on_interior_spring_support():
    """Pin at 0, spring 5 kN/mm on uy at 4 m, roller at 9 m; uniform 8 kN/m plus 25 kN at 6.5 m."""
    length, k, w, force, at = 9.0, 5e6, -8e3, -25e3, 6.5
    loads = [
        LineLoad(case="load", start=0.0, end=length, q_start=(0, w, 0, 0), q_end=(0, w, 0, 0)),
        PointLoad(case="load", at=at, force=(0, force, 0)),
    ]
    spring = Support(at=4.0, restrain=frozenset({"uz", "rx"}), springs={"uy": k}, label="spring")
    member = make_member(length, [support(0.0, "pin"), spring, support(length, "roller")], loads)
    nodes = [Node(0.0, rigid_w=True), Node(4.0, spring_w=k), Node(at, force=force), Node(length, rigid_w=True)]
    chain = Chain(length, nodes, linear_load(0.0, length, w, w), STEEL_IPE300.EIz, q_ref=abs(w))
    ref = solve_chain(chain)
    compare_xy_bending(member, loads, ref)
    solution = solve_case(member, loads, STEEL_IPE300, "load")
    deflection = ref.states(np.array([4.0]))[0, 0]
    # The spring pushes back: reaction = -k * deflection (Hooke's law).
    assert solution.reactions[1, 1] == pytest.approx(-k * deflection, rel=RTOL)


def test_cantilever_with_end_spring_and_point_moment():
    """Fixed at 0, spring 2 kN/mm on uy at the tip (5 m); tip force 10 kN down and a couple of
    +6 kN*m about z at 2 m (uy held by the spring only at the tip)."""
    length, k, force, couple = 5.0, 2e6, -10e3, 6e3
    loads = [
        PointLoad(case="load", at=length, force=(0, force, 0)),
        PointLoad(case="load", at=2.0, moment=(0, 0, couple)),
    ]
    tip = Support(at=length, restrain=frozenset({"uz"}), springs={"uy": k}, label="spring")
    member = make_member(length, [support(0.0, "fixed"), tip], loads)
    nodes = [Node(0.0, rigid_w=True, rigid_r=True), Node(2.0, moment=couple), Node(length, spring_w=k, force=force)]
    chain = Chain(length, nodes, no_load, STEEL_IPE300.EIz, q_ref=abs(force) / length)
    ref = solve_chain(chain)
    compare_xy_bending(member, loads, ref)


def test_end_held_by_a_rotational_spring():
    """Pin with a rotational spring 8 MN*m/rad about z at 0, roller at 7 m; partial uniform load
    9 kN/m down from 1 m to 6 m. The spring's couple is -k_r rz (Hooke's law)."""
    length, k_r, w = 7.0, 8e6, -9e3
    loads = [LineLoad(case="load", start=1.0, end=6.0, q_start=(0, w, 0, 0), q_end=(0, w, 0, 0))]
    end_a = Support(at=0.0, restrain=SUPPORT_TYPES["pin"], springs={"rz": k_r}, label="spring")
    member = make_member(length, [end_a, support(length, "roller")], loads)
    nodes = [Node(0.0, rigid_w=True, spring_r=k_r), Node(1.0), Node(6.0), Node(length, rigid_w=True)]
    chain = Chain(length, nodes, linear_load(1.0, 6.0, w, w), STEEL_IPE300.EIz, q_ref=abs(w))
    ref = solve_chain(chain)
    compare_xy_bending(member, loads, ref)
    rotation = ref.states(np.array([0.0]))[0, 1]
    reactions = solve_case(member, loads, STEEL_IPE300, "load").reactions
    assert reactions[0, 5] == pytest.approx(-k_r * rotation, rel=RTOL)


def test_beam_with_internal_hinge():
    """Fixed at 0, hinge at 3 m, rollers at 6 m and 10 m (once indeterminate); uniform 12 kN/m
    over the whole length and 30 kN at 8 m."""
    length, w, force = 10.0, -12e3, -30e3
    loads = [
        LineLoad(case="load", start=0.0, end=length, q_start=(0, w, 0, 0), q_end=(0, w, 0, 0)),
        PointLoad(case="load", at=8.0, force=(0, force, 0)),
    ]
    supports = [support(0.0, "fixed"), support(6.0, "roller"), support(length, "roller")]
    member = make_member(length, supports, loads, hinges=[Hinge(3.0)])
    nodes = [
        Node(0.0, rigid_w=True, rigid_r=True),
        Node(3.0, hinge=True),
        Node(6.0, rigid_w=True),
        Node(8.0, force=force),
        Node(length, rigid_w=True),
    ]
    chain = Chain(length, nodes, linear_load(0.0, length, w, w), STEEL_IPE300.EIz, q_ref=abs(w))
    ref = solve_chain(chain)
    compare_xy_bending(member, loads, ref)
    # The hinge lets the slope jump: both sides of the reference differ, and so must the analysis.
    solution = solve_case(member, loads, STEEL_IPE300, "load")
    left = solution.displacements(np.array([3.0]), side="left")[0, 5]
    right = solution.displacements(np.array([3.0]), side="right")[0, 5]
    ref_left, ref_right = ref.states(np.array([3.0]), "left")[0, 1], ref.states(np.array([3.0]), "right")[0, 1]
    assert abs(ref_left - ref_right) > 1e-3 * abs(ref_left)
    np.testing.assert_allclose([left, right], [ref_left, ref_right], rtol=RTOL)


def test_two_span_continuous_loaded_along_z():
    """Bending in the x-z plane (weak axis EIy): pin at 0, rollers at 4 m and 10 m; partial line
    load wz from 5 m to 9 m rising from 3 to 9 kN/m (+z) and 15 kN along -z at 2 m.
    My = -EIy uz'', Vz = -EIy uz''', ry = -duz/dx."""
    length, force = 10.0, -15e3
    loads = [
        LineLoad(case="load", start=5.0, end=9.0, q_start=(0, 0, 3e3, 0), q_end=(0, 0, 9e3, 0)),
        PointLoad(case="load", at=2.0, force=(0, 0, force)),
    ]
    supports = [support(0.0, "pin"), support(4.0, "roller"), support(length, "roller")]
    member = make_member(length, supports, loads)
    nodes = [
        Node(0.0, rigid_w=True),
        Node(2.0, force=force),
        Node(4.0, rigid_w=True),
        Node(5.0),
        Node(9.0),
        Node(length, rigid_w=True),
    ]
    chain = Chain(length, nodes, linear_load(5.0, 9.0, 3e3, 9e3), STEEL_IPE300.EIy, q_ref=9e3)
    ref = solve_chain(chain)
    solution = solve_case(member, loads, STEEL_IPE300, "load")
    x, side = sample_points([node.x for node in nodes])
    states = reference_at(ref, x, side)
    actions = analysis_at(solution.actions, x, side)
    disp = analysis_at(solution.displacements, x, side)
    assert_close_to_max(disp[:, 2], states[:, 0], "deflection uz")
    assert_close_to_max(disp[:, 4], -states[:, 1], "rotation ry = -duz/dx")
    assert_close_to_max(actions[:, 4], -states[:, 2], "moment My = -EIy uz''")
    assert_close_to_max(actions[:, 2], -states[:, 3], "shear Vz = -EIy uz'''")
    assert_close_to_max(solution.reactions[:, 2], [reaction_from_jump(ref, 0.0, 0.0),
                        reaction_from_jump(ref, 4.0, 0.0), reaction_from_jump(ref, length, 0.0)],
                        "reactions Fz")


@pytest.mark.parametrize("component", ["axial", "torsion"])
def test_fixed_fixed_axial_and_torsion(component: str):
    """Both ends fixed, 8 m: a partial linearly varying wx (or mx) from 1 m to 6 m plus a point
    fx (or torque) at 6.5 m. Axial: EA u'' = -wx, N = EA u'; torsion: GJ phi'' = -mx, T = GJ phi'."""
    length, start, end, q0, q1, point, at = 8.0, 1.0, 6.0, 4e3, -2e3, 20e3, 6.5
    if component == "axial":
        loads = [
            LineLoad(case="load", start=start, end=end, q_start=(q0, 0, 0, 0), q_end=(q1, 0, 0, 0)),
            PointLoad(case="load", at=at, force=(point, 0, 0)),
        ]
        rigidity, column = STEEL_IPE300.EA, 0
    else:
        loads = [
            LineLoad(case="load", start=start, end=end, q_start=(0, 0, 0, q0), q_end=(0, 0, 0, q1)),
            PointLoad(case="load", at=at, moment=(point, 0, 0)),
        ]
        rigidity, column = STEEL_IPE300.GJ, 3
    member = make_member(length, [support(0.0, "fixed"), support(length, "fixed")], loads)
    nodes = [Node(0.0, rigid_w=True), Node(start), Node(end), Node(at, force=point), Node(length, rigid_w=True)]
    chain = Chain(length, nodes, linear_load(start, end, q0, q1), rigidity, order=2, q_ref=abs(q0))
    ref = solve_chain(chain)
    solution = solve_case(member, loads, STEEL_IPE300, "load")
    x, side = sample_points([node.x for node in nodes])
    states = reference_at(ref, x, side)
    assert_close_to_max(analysis_at(solution.displacements, x, side)[:, column], states[:, 0], f"{component} displacement")
    assert_close_to_max(analysis_at(solution.actions, x, side)[:, column], states[:, 1], f"{component} action")
    # Reaction at A equals -N(0+) (or -T(0+)): the left segment's face balances it.
    np.testing.assert_allclose(solution.reactions[0, column], -ref.states(np.array([0.0]))[0, 1], rtol=RTOL)
