"""Property tests of the member analysis over random support layouts and loads.

Every expected value here is computed independently of sizer.analysis: resultants of the loads
by direct summation and by scipy.integrate.quad_vec, stability of a layout by a rigid-piece
kinematic count, and derivatives by central finite differences.

Sign relations used (derived from docs/design.md section 2; statics of the left segment [0, x], any
mechanics of materials text): the actions on the +x face of the left segment balance every
concentrated item and line load on it, so

    (N, Vy, Vz) = -(sum of forces on [0, x]),  (T, My, Mz) = -(moments about the cut of them),

and by whole-member equilibrium they also equal the resultant of the right segment [x, L] taken
about the cut. Differentiating between concentrated items, with a force (Fx, Fy, Fz) at distance
(a - x) along x giving moment (0, -(a - x) Fz, (a - x) Fy):
    dMz/dx = -Vy,  dMy/dx = Vz,  dVy/dx = -wy,  dVz/dx = -wz,  dN/dx = -wx,  dT/dx = -mx.
Cross-check (AISC Manual Table 3-23, from memory): a simply supported beam under downward w has
beam-convention shear V = -Vy = wL/2 at the left end falling to -wL/2, and M = Mz with
dM/dx = V; both are asserted in test_simply_supported_beam_fixes_the_signs below.
Elasticity (small deflection): N = EA dux/dx, T = GJ drx/dx, Mz = EIz drz/dx, My = EIy dry/dx,
with rz = duy/dx and ry = -duz/dx.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np
import pytest
from hypothesis import HealthCheck, Phase, assume, given, settings
from hypothesis import strategies as st
from scipy.integrate import quad_vec

from sizer.analysis import extremes, load_sign_change_points, load_sign_change_positions, solve_case, solve_member, zero_shear_points, zero_shear_positions
from sizer.errors import InputError
from sizer.model import Hinge, LineLoad, Member, PointLoad, Stiffness, Support, SUPPORT_TYPES

# IPE 300 on steel (docs/references.md handbook values, from memory; European axis names): A = 53.8 cm^2,
# strong axis 8356 cm^4 (our EIz), weak axis 604 cm^4 (our EIy), It = 20.1 cm^4; E = 200 GPa,
# G = 77 GPa (common practice).
STEEL_IPE300 = Stiffness(EA=200e9 * 53.8e-4, GJ=77e9 * 20.1e-8, EIz=200e9 * 8356e-8, EIy=200e9 * 604e-8)
GRID = 20  # supports and hinges sit on multiples of L / GRID
LOAD_GRID = 4000  # loads start, end or sit on multiples of L / LOAD_GRID (supports lie on it too)
RTOL = 1e-6  # equilibrium and superposition, relative to the scale of the problem
PROPERTY_SETTINGS = settings(
    max_examples=50, deadline=None, suppress_health_check=[HealthCheck.filter_too_much, HealthCheck.too_slow]
)
SIDES = ("left", "right")


# --------------------------------------------------------------------------------------------
# Random members
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Problem:
    """A random member and its load cases (names in order)."""

    member: Member
    cases: tuple[str, ...]

    def loads(self, case: str) -> list[PointLoad | LineLoad]:
        """The loads of one case, in the member's order."""
        return [load for load in self.member.loads if load.case == case]


def component() -> st.SearchStrategy[float]:
    """A load component: often zero, otherwise up to 50 kN (or kN*m, kN/m)."""
    return st.one_of(st.just(0.0), st.floats(-50e3, 50e3, allow_nan=False).filter(lambda v: abs(v) > 1.0))


@st.composite
def point_loads(draw, case: str, length: float, hinge_positions: list[float]) -> PointLoad:
    """A concentrated force and/or couple anywhere on the load grid (sometimes exactly on a
    support), never on a hinge (a couple there would have no side to act on)."""
    at = draw(st.integers(0, LOAD_GRID).map(lambda j: grid_position(j, length, LOAD_GRID)).filter(lambda a: a not in hinge_positions))
    kind = draw(st.sampled_from(["force", "couple", "both"]))
    force = tuple(draw(component()) for _ in range(3)) if kind != "couple" else (0.0, 0.0, 0.0)
    moment = tuple(draw(component()) for _ in range(3)) if kind != "force" else (0.0, 0.0, 0.0)
    return PointLoad(case=case, at=at, force=force, moment=moment)


@st.composite
def line_loads(draw, case: str, length: float) -> LineLoad:
    """A partial, linearly varying line load in wx, wy, wz and torque per length."""
    j_start = draw(st.integers(0, LOAD_GRID - 1))
    j_end = draw(st.integers(j_start + 1, LOAD_GRID))
    start, end = grid_position(j_start, length, LOAD_GRID), grid_position(j_end, length, LOAD_GRID)
    q_start = tuple(draw(component()) * 0.4 for _ in range(4))
    q_end = tuple(draw(component()) * 0.4 for _ in range(4))
    return LineLoad(case=case, start=start, end=end, q_start=q_start, q_end=q_end)


def grid_position(k: int, length: float, grid: int = GRID) -> float:
    """Position of point k of a grid of `grid` intervals (m); the last one is exactly the end B.
    A point of the fine load grid that is also on the support grid gets the very same float."""
    if grid != GRID and k % (grid // GRID) == 0:
        return grid_position(k // (grid // GRID), length)
    return length if k == grid else k * length / grid


@st.composite
def layouts(draw) -> tuple[float, tuple[Support, ...], tuple[Hinge, ...]]:
    """Length 1-20 m, 1-4 supports (pin/roller/fixed; a single one is a fixed end), at most one
    support softened to a spring on uy, at most one internal hinge off the supports."""
    length = draw(st.floats(1.0, 20.0))
    n_supports = draw(st.integers(1, 4))
    if n_supports == 1:
        ks = [draw(st.sampled_from([0, GRID]))]
        kinds = ["fixed"]
    else:
        ks = sorted(draw(st.lists(st.integers(0, GRID), min_size=n_supports, max_size=n_supports, unique=True)))
        kinds = [draw(st.sampled_from(["pin", "roller", "fixed"])) for _ in ks]
    supports = [Support(at=grid_position(k, length), restrain=SUPPORT_TYPES[kind], label=kind) for k, kind in zip(ks, kinds)]
    spring_index = draw(st.one_of(st.none(), st.integers(0, len(supports) - 1)))
    if spring_index is not None:
        old = supports[spring_index]
        stiffness = draw(st.floats(1e5, 1e9))  # N/m: 0.1 to 1000 kN/mm
        supports[spring_index] = Support(
            at=old.at, restrain=old.restrain - {"uy"}, springs={"uy": stiffness}, label="spring"
        )
    hinges: tuple[Hinge, ...] = ()
    free_ks = [k for k in range(1, GRID) if k not in ks]
    if draw(st.booleans()) and free_ks:
        hinges = (Hinge(grid_position(draw(st.sampled_from(free_ks)), length)),)
    return length, tuple(supports), hinges


@st.composite
def problems(draw, min_cases: int = 2, max_cases: int = 3) -> Problem:
    """A random member with 2-3 load cases of 1-4 loads each."""
    length, supports, hinges = draw(layouts())
    hinge_positions = [h.at for h in hinges]
    cases = tuple(f"case{i}" for i in range(draw(st.integers(min_cases, max_cases))))
    loads = []
    for case in cases:
        for _ in range(draw(st.integers(1, 4))):
            if draw(st.booleans()):
                loads.append(draw(point_loads(case, length, hinge_positions)))
            else:
                loads.append(draw(line_loads(case, length)))
    factors = {case: draw(st.floats(-1.5, 1.5)) for case in cases}
    member = Member(
        length=length,
        material="steel",
        supports=supports,
        loads=tuple(loads),
        combinations={"all": {case: 1.0 for case in cases}, "mixed": factors},
        self_weight_case=None,
        hinges=hinges,
    )
    return Problem(member, cases)


# --------------------------------------------------------------------------------------------
# Independent mechanics: stability by rigid pieces, resultants of loads and reactions
# --------------------------------------------------------------------------------------------


def bending_mechanism(member: Member, plane: str) -> bool:
    """True if the member can move as rigid pieces (split at hinges) in the x-y ("y") or x-z
    ("z") plane without straining: the kinematic constraint matrix has a null space."""
    w, r = ("uy", "rz") if plane == "y" else ("uz", "ry")
    cuts = sorted(h.at for h in member.hinges)
    n_pieces = len(cuts) + 1
    rows = []
    for i, at in enumerate(cuts):  # deflection continuous across each hinge: a_i + b_i x = a_j + b_j x
        row = np.zeros(2 * n_pieces)
        row[2 * i : 2 * i + 2] = [1.0, at]
        row[2 * i + 2 : 2 * i + 4] = [-1.0, -at]
        rows.append(row)
    for s in member.supports:
        piece = int(np.searchsorted(cuts, s.at))
        if w in s.restrain or w in s.springs:
            row = np.zeros(2 * n_pieces)
            row[2 * piece : 2 * piece + 2] = [1.0, s.at]
            rows.append(row)
        if r in s.restrain or r in s.springs:
            row = np.zeros(2 * n_pieces)
            row[2 * piece + 1] = 1.0
            rows.append(row)
    if not rows:
        return True
    return np.linalg.matrix_rank(np.array(rows) / max(member.length, 1.0)) < 2 * n_pieces


def engaged(loads, indices: tuple[int, ...]) -> bool:
    """True if any load has a nonzero component among indices of (fx, fy, fz, mx, my, mz)."""
    for load in loads:
        if isinstance(load, PointLoad):
            values = (*load.force, *load.moment)
        else:
            peak = [max(abs(a), abs(b)) for a, b in zip(load.q_start, load.q_end)]
            values = (*peak, 0.0, 0.0)  # wx, wy, wz, mx; no distributed my, mz
        if any(values[i] != 0.0 for i in indices):
            return True
    return False


def unheld_freedoms(member: Member, loads) -> list[str]:
    """Why the member cannot be solved (docs/design.md section 3; empty list: it can): a sideways or
    rotational mechanism of the layout, whatever the loads; sliding (ux) or twist (rx) that no
    support holds while any load of the member (or `loads`) acts along or about x."""
    out = []
    every = list(member.loads) + list(loads)
    if engaged(every, (0,)) and not any("ux" in s.restrain or "ux" in s.springs for s in member.supports):
        out.append("ux")
    if engaged(every, (3,)) and not any("rx" in s.restrain or "rx" in s.springs for s in member.supports):
        out.append("rx")
    if bending_mechanism(member, "y"):
        out.append("x-y bending")
    if bending_mechanism(member, "z"):
        out.append("x-z bending")
    return out


def stable(problem: Problem) -> bool:
    """True when no case engages a mechanism."""
    return not any(unheld_freedoms(problem.member, problem.loads(case)) for case in problem.cases)


def moment_about(position: float, force: np.ndarray, moment: np.ndarray, about: np.ndarray) -> np.ndarray:
    """Moment about point `about` of a force and couple applied at (position, 0, 0) on the axis."""
    arm = np.array([position, 0.0, 0.0]) - about
    return moment + np.cross(arm, force)


def line_load_intensity(load: LineLoad, x: float) -> np.ndarray:
    """(wx, wy, wz, mx) of a line load at x; zero outside [start, end]."""
    if x < load.start or x > load.end:
        return np.zeros(4)
    t = (x - load.start) / (load.end - load.start)
    return np.array(load.q_start) + t * (np.array(load.q_end) - np.array(load.q_start))


def line_load_resultant(load: LineLoad, lo: float, hi: float, about: np.ndarray) -> np.ndarray:
    """Force and moment about `about` (6,) of the part of a line load on [lo, hi], by quad_vec."""
    a, b = max(lo, load.start), min(hi, load.end)
    if b <= a:
        return np.zeros(6)

    def integrand(x: float) -> np.ndarray:
        q = line_load_intensity(load, x)
        force = q[:3]
        moment = moment_about(x, force, np.array([q[3], 0.0, 0.0]), about)
        return np.concatenate([force, moment])

    size = float(np.max(np.abs([*load.q_start, *load.q_end]))) * (b - a) * (1.0 + b + float(np.linalg.norm(about)))
    if size == 0.0:
        return np.zeros(6)
    value, _ = quad_vec(integrand, a, b, epsabs=1e-13 * size, epsrel=1e-12)
    return value


def point_load_items(loads) -> list[tuple[float, np.ndarray]]:
    """(position, (Fx, Fy, Fz, Mx, My, Mz)) of the concentrated loads."""
    return [(load.at, np.array([*load.force, *load.moment], dtype=float)) for load in loads if isinstance(load, PointLoad)]


def reaction_items(member: Member, reactions: np.ndarray) -> list[tuple[float, np.ndarray]]:
    """(position, reaction) of each support."""
    return [(s.at, np.asarray(reactions[i], dtype=float)) for i, s in enumerate(member.supports)]


def resultant(items, loads, lo: float, hi: float, about: np.ndarray, take) -> np.ndarray:
    """Force and moment about `about` of the concentrated items whose position passes take(a)
    and of the line loads on [lo, hi]."""
    total = np.zeros(6)
    for at, item in items:
        if take(at):
            total[:3] += item[:3]
            total[3:] += moment_about(at, item[:3], item[3:], about)
    for load in loads:
        if isinstance(load, LineLoad):
            total += line_load_resultant(load, lo, hi, about)
    return total


def sorted_items(items) -> np.ndarray:
    """Concentrated items as rows (position, 6 components) in lexicographic order."""
    rows = np.array([[at, *item] for at, item in items], dtype=float).reshape(-1, 7)
    return rows[np.lexsort(rows.T[::-1])]


def problem_scale(member: Member, loads, reactions: np.ndarray) -> tuple[float, float]:
    """Force (N) and moment (N*m) scales of a solved case: sums of magnitudes."""
    force = np.sum(np.abs(reactions[:, :3]))
    moment = np.sum(np.abs(reactions[:, 3:]))
    for load in loads:
        if isinstance(load, PointLoad):
            force += np.sum(np.abs(load.force))
            moment += np.sum(np.abs(load.moment))
        else:
            total = (np.abs(load.q_start) + np.abs(load.q_end)) * (load.end - load.start)
            force += np.sum(total[:3])
            moment += total[3]
    # Couples make forces of order couple / length and forces make moments of order force * length.
    force_scale = max(force + moment / member.length, 1.0)
    return force_scale, force_scale * member.length


def displacement_noise(member: Member, force_scale: float) -> np.ndarray:
    """A floor (6,) under which displacement differences are round-off, not error: 1e-9 of the
    movements a force of force_scale would cause on the whole length (F L / EA, F L^3 / EI,
    F L^2 / GJ for twist, F L^2 / EI for rotations). Needed where a case's own response is tiny,
    e.g. a patch load of a fraction of a millimetre next to a fixed end."""
    length, k = member.length, STEEL_IPE300
    ei = min(k.EIz, k.EIy)
    translation, rotation = force_scale * length**3 / ei, force_scale * length**2 / ei
    return 1e-9 * np.array([force_scale * length / k.EA, translation, translation, force_scale * length**2 / k.GJ, rotation, rotation])


def tolerance(force_scale: float, moment_scale: float) -> np.ndarray:
    """Absolute tolerance per action component (N, N, N, N*m, N*m, N*m)."""
    return RTOL * np.array([force_scale] * 3 + [moment_scale] * 3)


def breakpoints(member: Member, loads) -> np.ndarray:
    """Every position where an action or its slope may jump."""
    points = {0.0, member.length}
    points.update(s.at for s in member.supports)
    points.update(h.at for h in member.hinges)
    for load in loads:
        points.update([load.at] if isinstance(load, PointLoad) else [load.start, load.end])
    return np.array(sorted(points))


def snap_to_items(x: float, positions: list[float], length: float) -> float:
    """x moved onto an item closer than 1e-6 L: positions that close count as one (the analysis
    merges positions within 1e-9 L; a cut between them has no meaning for a user)."""
    near = [a for a in positions if abs(a - x) < 1e-6 * length]
    return near[0] if near else x


@st.composite
def smooth_points(draw, member: Member, loads) -> tuple[float, float]:
    """A point x inside a gap between breakpoints and a step h with [x - 2h, x + 2h] in the gap."""
    points = breakpoints(member, loads)
    gaps = [(a, b) for a, b in zip(points[:-1], points[1:]) if b - a > 1e-2 * member.length]
    a, b = draw(st.sampled_from(gaps))
    x = a + draw(st.floats(0.25, 0.75)) * (b - a)
    return x, 0.005 * (b - a)


def central_difference(fn, x: float, h: float) -> np.ndarray:
    """Fourth-order central difference of fn (array valued at arrays of x) at x."""
    values = np.asarray(fn(np.array([x - 2 * h, x - h, x + h, x + 2 * h])), dtype=float)
    return (values[0] - 8 * values[1] + 8 * values[2] - values[3]) / (12 * h)


def line_intensity_total(loads, x: float) -> np.ndarray:
    """Sum of (wx, wy, wz, mx) of every line load at x."""
    return sum((line_load_intensity(load, x) for load in loads if isinstance(load, LineLoad)), np.zeros(4))


# --------------------------------------------------------------------------------------------
# The signs, fixed once on a textbook beam
# --------------------------------------------------------------------------------------------


def test_simply_supported_beam_fixes_the_signs():
    """Simply supported, uniform w = 10 kN/m down, span 6 m (AISC Manual Table 3-23, from
    memory): R = wL/2 = 30 kN up; beam-convention V = -Vy = +wL/2 at x = 0+, M = Mz = wL^2/8 =
    45 kN*m sagging at midspan, and dM/dx = V (so dMz/dx = -Vy)."""
    length, w = 6.0, 10e3
    loads = (LineLoad(case="d", start=0.0, end=length, q_start=(0, -w, 0, 0), q_end=(0, -w, 0, 0)),)
    member = Member(
        length=length, material="steel",
        supports=(Support(0.0, SUPPORT_TYPES["pin"], label="pin"), Support(length, SUPPORT_TYPES["roller"], label="roller")),
        loads=loads, combinations={"all": {"d": 1.0}}, self_weight_case=None,
    )
    solution = solve_case(member, loads, STEEL_IPE300, "d")
    np.testing.assert_allclose(solution.reactions[:, 1], [w * length / 2] * 2, rtol=1e-9)
    actions = solution.actions(np.array([0.0, length / 2, 1.0]))
    assert -actions[0, 1] == pytest.approx(w * length / 2, rel=1e-9)  # V = -Vy
    assert actions[1, 5] == pytest.approx(w * length**2 / 8, rel=1e-9)  # M = Mz, sagging
    slope = central_difference(solution.actions, 1.0, 1e-3)
    assert slope[5] == pytest.approx(-actions[2, 1], rel=1e-6)  # dM/dx = V = -Vy
    # midspan deflection 5wL^4/(384 EI) downward (same table)
    deflection = solution.displacements(np.array([length / 2]))[0, 1]
    assert deflection == pytest.approx(-5 * w * length**4 / (384 * STEEL_IPE300.EIz), rel=1e-9)


@pytest.mark.parametrize("gravity", [(1, -1), (2, 1)])
def test_self_weight_of_a_propped_cantilever(gravity: tuple[int, int]):
    """Self weight alone, factored 1.35, on a propped cantilever (fixed at 0, roller at 6 m).
    IPE 300 mass 42.2 kg/m (EN 10365 handbook value, from memory); g = 9.80665 m/s^2 (standard
    gravity). Uniform w (AISC Manual Table 3-23, from memory): fixed R = 5wL/8, prop R = 3wL/8,
    moment at the fixed end -wL^2/8 (hogging; Mz for gravity -y and, mirrored, My for +z)."""
    length, mass, factor = 6.0, 42.2, 1.35
    member = Member(
        length=length, material="steel",
        supports=(Support(0.0, SUPPORT_TYPES["fixed"], label="fixed"), Support(length, SUPPORT_TYPES["roller"], label="roller")),
        loads=(), combinations={"dead only": {"dead": factor}}, self_weight_case="dead", gravity=gravity,
    )
    solution = solve_member(member, STEEL_IPE300, mass)
    w = factor * mass * 9.80665
    axis, sign = gravity
    reactions = solution.reactions("dead only")
    np.testing.assert_allclose(reactions[:, axis], [-sign * 5 * w * length / 8, -sign * 3 * w * length / 8], rtol=1e-9)
    moment_column = 5 if axis == 1 else 4
    fixed_end = solution.actions("dead only", np.array([0.0]))[0, moment_column]
    assert fixed_end == pytest.approx(-w * length**2 / 8, rel=1e-9)


@pytest.mark.parametrize("gap", [1e-2, 1e-3, 1e-4])
def test_load_close_to_a_spring_support_keeps_equilibrium(gap: float):
    """Pin at 0, spring 1 kN/mm on uy at 4 m, 10 kN down at `gap` m before the spring. The beam
    is statically determinate, so the spring reaction is P a / L by statics (moments about the
    pin; common practice), whatever the stiffness. A load a fraction of a millimetre off a
    support is ordinary input (a rounded position)."""
    length, k, force = 4.0, 1e6, -10e3
    at = length - gap
    loads = (PointLoad(case="p", at=at, force=(0.0, force, 0.0)),)
    spring = Support(at=length, restrain=frozenset({"uz", "rx"}), springs={"uy": k}, label="spring")
    member = Member(
        length=length, material="steel", supports=(Support(0.0, SUPPORT_TYPES["pin"], label="pin"), spring),
        loads=loads, combinations={"all": {"p": 1.0}}, self_weight_case=None,
    )
    reactions = solve_case(member, loads, STEEL_IPE300, "p").reactions
    np.testing.assert_allclose(reactions[:, 1], [-force * (length - at) / length, -force * at / length], rtol=1e-6)


# --------------------------------------------------------------------------------------------
# Properties
# --------------------------------------------------------------------------------------------


@PROPERTY_SETTINGS
@given(problems())
def test_mechanism_is_bad_input_and_a_stable_layout_solves(problem: Problem):
    """A layout with a free sideways or rotational movement, or free sliding or twist under a load
    acting that way, is InputError whatever the loads (docs/design.md section 3: balanced loads do not make
    a mechanism stable); any other layout always solves."""
    member = problem.member
    for case in problem.cases:
        loads = problem.loads(case)
        if unheld_freedoms(member, loads):
            with pytest.raises(InputError, match="mechanism"):
                solve_case(member, loads, STEEL_IPE300, case)
            continue
        solution = solve_case(member, loads, STEEL_IPE300, case)
        assert np.all(np.isfinite(solution.reactions))


@PROPERTY_SETTINGS
@given(problems(), st.floats(-30.0, 30.0), st.floats(-5.0, 5.0), st.floats(-5.0, 5.0), st.booleans())
def test_whole_member_equilibrium(problem: Problem, px: float, py: float, pz: float, unit: bool):
    """Loads plus reactions: zero force and zero moment about any point in space."""
    assume(stable(problem))
    about = np.array([px, py, pz])
    member = problem.member
    for case in problem.cases:
        loads = problem.loads(case)
        has_springs = any(s.springs for s in member.supports)
        stiffness = None if unit and not has_springs else STEEL_IPE300
        solution = solve_case(member, loads, stiffness, case)
        reactions = np.asarray(solution.reactions, dtype=float)
        assert reactions.shape == (len(member.supports), 6)
        items = point_load_items(loads) + reaction_items(member, reactions)
        total = resultant(items, loads, 0.0, member.length, about, lambda a: True)
        force_scale, moment_scale = problem_scale(member, loads, reactions)
        moment_scale += force_scale * float(np.linalg.norm(about))
        assert np.all(np.abs(total) <= tolerance(force_scale, moment_scale)), (case, total)
        # point_items() lists the same concentrated loads and reactions
        positions, forces = solution.point_items()
        assert sorted_items(list(zip(positions, forces))) == pytest.approx(sorted_items(items), abs=1e-9 * force_scale * member.length)


@PROPERTY_SETTINGS
@given(problems(), st.data())
def test_either_segment_gives_the_same_actions(problem: Problem, data):
    """Actions at a cut (left segment, from the API) equal the resultant about the cut of the
    right segment's loads and reactions, computed here."""
    assume(stable(problem))
    member = problem.member
    case = data.draw(st.sampled_from(problem.cases))
    loads = problem.loads(case)
    solution = solve_case(member, loads, STEEL_IPE300, case)
    reactions = np.asarray(solution.reactions, dtype=float)
    items = point_load_items(loads) + reaction_items(member, reactions)
    positions = [at for at, _ in items] + [h.at for h in member.hinges]
    force_scale, moment_scale = problem_scale(member, loads, reactions)
    for _ in range(4):
        x = data.draw(st.one_of(st.floats(0.0, member.length), st.sampled_from(positions)))
        x = snap_to_items(x, positions, member.length)
        side = data.draw(st.sampled_from(SIDES))
        about = np.array([x, 0.0, 0.0])
        take = (lambda a: a > x) if side == "right" else (lambda a: a >= x)
        right = resultant(items, loads, x, member.length, about, take)
        actions = np.asarray(solution.actions(np.array([x]), side=side), dtype=float)[0]
        assert np.all(np.abs(actions - right) <= tolerance(force_scale, moment_scale)), (x, side, actions, right)


@PROPERTY_SETTINGS
@given(problems(), st.data())
def test_derivatives_of_actions(problem: Problem, data):
    """Away from concentrated items: dMz/dx = -Vy, dMy/dx = Vz, d(N, Vy, Vz, T)/dx = -(wx, wy,
    wz, mx)."""
    assume(stable(problem))
    member = problem.member
    case = data.draw(st.sampled_from(problem.cases))
    loads = problem.loads(case)
    solution = solve_case(member, loads, STEEL_IPE300, case)
    force_scale, _ = problem_scale(member, loads, np.asarray(solution.reactions, dtype=float))
    x, h = data.draw(smooth_points(member, loads))
    slope = central_difference(solution.actions, x, h)
    actions = np.asarray(solution.actions(np.array([x])), dtype=float)[0]
    w = line_intensity_total(loads, x)
    atol = 1e-6 * force_scale  # N or N/m*m; finite differences of piecewise cubics
    np.testing.assert_allclose(slope[5], -actions[1], rtol=0, atol=atol, err_msg="dMz/dx = -Vy")
    np.testing.assert_allclose(slope[4], actions[2], rtol=0, atol=atol, err_msg="dMy/dx = Vz")
    atol_w = 1e-6 * force_scale / member.length
    np.testing.assert_allclose(slope[[0, 1, 2, 3]], -w, rtol=0, atol=atol_w, err_msg="dN,dVy,dVz,dT = -w")


@PROPERTY_SETTINGS
@given(problems(), st.data())
def test_actions_follow_from_displacements(problem: Problem, data):
    """Elastic relations: N = EA dux/dx, T = GJ drx/dx, My = EIy dry/dx, Mz = EIz drz/dx, and the
    rotations are slopes: rz = duy/dx, ry = -duz/dx."""
    assume(stable(problem))
    member = problem.member
    case = data.draw(st.sampled_from(problem.cases))
    loads = problem.loads(case)
    solution = solve_case(member, loads, STEEL_IPE300, case)
    x, h = data.draw(smooth_points(member, loads))
    slope = central_difference(solution.displacements, x, h)
    disp = np.asarray(solution.displacements(np.array([x])), dtype=float)[0]
    actions = np.asarray(solution.actions(np.array([x])), dtype=float)[0]
    k = STEEL_IPE300
    from_disp = np.array([k.EA * slope[0], k.GJ * slope[3], k.EIy * slope[4], k.EIz * slope[5]])
    expected = actions[[0, 3, 4, 5]]
    force_scale, moment_scale = problem_scale(member, loads, np.asarray(solution.reactions, dtype=float))
    atol = 1e-6 * np.array([force_scale, moment_scale, moment_scale, moment_scale])
    assert np.all(np.abs(from_disp - expected) <= atol), ("N, T, My, Mz from strains", from_disp, expected)
    rotations = np.array([slope[1], -slope[2]])
    along = np.asarray(solution.displacements(np.linspace(0.0, member.length, 41)), dtype=float)
    atol = RTOL * float(np.max(np.abs(along[:, [4, 5]]))) + displacement_noise(member, force_scale)[4]
    np.testing.assert_allclose(rotations, disp[[5, 4]], rtol=0, atol=atol, err_msg="rz = duy/dx, ry = -duz/dx")


@PROPERTY_SETTINGS
@given(problems(), st.data())
def test_supports_hold_and_springs_push_back(problem: Problem, data):
    """A rigidly held freedom does not move; a spring's reaction is -k times its displacement."""
    assume(stable(problem))
    member = problem.member
    case = data.draw(st.sampled_from(problem.cases))
    loads = problem.loads(case)
    solution = solve_case(member, loads, STEEL_IPE300, case)
    reactions = np.asarray(solution.reactions, dtype=float)
    positions = np.array([s.at for s in member.supports])
    freedoms = ("ux", "uy", "uz", "rx", "ry", "rz")
    along = np.asarray(solution.displacements(np.linspace(0.0, member.length, 41)), dtype=float)
    force_scale, _ = problem_scale(member, loads, reactions)
    held_tolerance = 1e-9 * np.max(np.abs(along), axis=0) + displacement_noise(member, force_scale)
    for side in SIDES:
        disp = np.asarray(solution.displacements(positions, side=side), dtype=float)
        for i, s in enumerate(member.supports):
            for j, name in enumerate(freedoms):
                if name in s.restrain:
                    assert abs(disp[i, j]) <= held_tolerance[j], (s, name, side, disp[i, j])
                if name in s.springs:
                    expected = -s.springs[name] * disp[i, j]
                    assert reactions[i, j] == pytest.approx(expected, rel=1e-7, abs=1e-6), (s, name)


@PROPERTY_SETTINGS
@given(problems())
def test_superposition_of_cases(problem: Problem):
    """Solving the cases one by one and adding equals solving all their loads as one case:
    reactions, actions (both sides of every item) and displacements."""
    assume(stable(problem))
    member = problem.member
    union = [dataclasses.replace(load, case="union") for load in member.loads]
    together = solve_case(member, union, STEEL_IPE300, "union")
    apart = [solve_case(member, problem.loads(case), STEEL_IPE300, case) for case in problem.cases]
    stations = np.unique(np.concatenate([breakpoints(member, member.loads), np.linspace(0.0, member.length, 17)]))
    reactions = np.asarray(together.reactions, dtype=float)
    force_scale, moment_scale = problem_scale(member, member.loads, reactions)
    atol = tolerance(force_scale, moment_scale)
    assert np.all(np.abs(sum(np.asarray(s.reactions, dtype=float) for s in apart) - reactions) <= atol)
    for side in SIDES:
        expected = np.asarray(together.actions(stations, side=side), dtype=float)
        summed = sum(np.asarray(s.actions(stations, side=side), dtype=float) for s in apart)
        assert np.all(np.abs(summed - expected) <= atol), side
        disp = np.asarray(together.displacements(stations, side=side), dtype=float)
        disp_sum = sum(np.asarray(s.displacements(stations, side=side), dtype=float) for s in apart)
        scale = np.max(np.abs(disp), axis=0)  # per freedom
        noise = displacement_noise(member, force_scale)
        assert np.all(np.abs(disp_sum - disp) <= RTOL * scale + noise), (side, disp_sum - disp)


@PROPERTY_SETTINGS
@given(problems())
def test_combinations_add_the_cases_with_their_factors(problem: Problem):
    """solve_member: a combination is the factored sum of its cases (actions, reactions,
    displacements); all_actions stacks the combinations in combination_names order."""
    assume(stable(problem))
    member = problem.member
    solution = solve_member(member, STEEL_IPE300, 0.0)
    factors = member.combinations["mixed"]
    stations = np.linspace(0.0, member.length, 23)
    cases = solution.cases
    expected_actions = sum(f * np.asarray(cases[c].actions(stations), dtype=float) for c, f in factors.items())
    expected_reactions = sum(f * np.asarray(cases[c].reactions, dtype=float) for c, f in factors.items())
    expected_disp = sum(f * np.asarray(cases[c].displacements(stations), dtype=float) for c, f in factors.items())
    force_scale, moment_scale = problem_scale(member, member.loads, expected_reactions)
    atol = 1.5 * tolerance(force_scale, moment_scale)
    assert np.all(np.abs(np.asarray(solution.actions("mixed", stations), dtype=float) - expected_actions) <= atol)
    assert np.all(np.abs(np.asarray(solution.reactions("mixed"), dtype=float) - expected_reactions) <= atol)
    disp_tolerance = RTOL * np.max(np.abs(expected_disp), axis=0) + displacement_noise(member, force_scale)
    assert np.all(np.abs(np.asarray(solution.displacements("mixed", stations), dtype=float) - expected_disp) <= disp_tolerance)
    stacked = np.asarray(solution.all_actions(stations, "right"), dtype=float)
    names = list(solution.combination_names)
    assert sorted(names) == ["all", "mixed"]
    assert stacked.shape == (2, len(stations), 6)
    np.testing.assert_allclose(stacked[names.index("mixed")], solution.actions("mixed", stations), rtol=0, atol=1e-9 * force_scale * member.length)


@PROPERTY_SETTINGS
@given(problems())
def test_free_ends_hinges_and_pinned_ends_carry_no_moment(problem: Problem):
    """Actions vanish beyond the ends (x = L right side, x = 0 left side); My = Mz = 0 at a
    hinge (both sides) and at a pin or roller end without an applied couple there."""
    assume(stable(problem))
    member = problem.member
    length = member.length
    for case in problem.cases:
        loads = problem.loads(case)
        solution = solve_case(member, loads, STEEL_IPE300, case)
        force_scale, moment_scale = problem_scale(member, loads, np.asarray(solution.reactions, dtype=float))
        atol = tolerance(force_scale, moment_scale)
        assert np.all(np.abs(np.asarray(solution.actions(np.array([length]), side="right"))[0]) <= atol)
        assert np.all(np.abs(np.asarray(solution.actions(np.array([0.0]), side="left"))[0]) <= atol)
        for hinge in member.hinges:
            for side in SIDES:
                moments = np.asarray(solution.actions(np.array([hinge.at]), side=side), dtype=float)[0, 4:]
                assert np.all(np.abs(moments) <= atol[4:]), (hinge, side, moments)
        couples_at = {load.at for load in loads if isinstance(load, PointLoad) and any(load.moment)}
        for s in member.supports:
            end_side = {0.0: "right", length: "left"}.get(s.at)
            if end_side is None or s.label == "fixed" or s.at in couples_at:
                continue
            if {"ry", "rz"} & (s.restrain | set(s.springs)):
                continue
            moments = np.asarray(solution.actions(np.array([s.at]), side=end_side), dtype=float)[0, 4:]
            assert np.all(np.abs(moments) <= atol[4:]), (s, end_side, moments)


@PROPERTY_SETTINGS
@given(problems())
def test_zero_shear_points_are_all_found_and_real(problem: Problem):
    """zero_shear_points: the shear vanishes at each point returned, and every sign change of the
    shear inside a span between concentrated items (found here by dense sampling) has one."""
    assume(stable(problem))
    member = problem.member
    solution = solve_member(member, STEEL_IPE300, None)
    force_scale, _ = problem_scale(member, member.loads, np.asarray(solution.reactions("all"), dtype=float))
    tol = RTOL * force_scale
    points = breakpoints(member, member.loads)
    for column, action in ((1, "Vy"), (2, "Vz")):
        found = np.asarray(zero_shear_points(solution, "all", action), dtype=float)
        if found.size:
            assert np.all(np.abs(solution.actions("all", found)[:, column]) <= tol), action
        for a, b in zip(points[:-1], points[1:]):
            x = np.linspace(a, b, 202)[1:-1]
            v = solution.actions("all", x)[:, column]
            crossings = np.flatnonzero((np.sign(v[:-1]) * np.sign(v[1:]) < 0) & (np.abs(v[:-1]) > tol) & (np.abs(v[1:]) > tol))
            for i in crossings:
                assert np.any((found >= x[i]) & (found <= x[i + 1])), (action, x[i], x[i + 1], found)


@PROPERTY_SETTINGS
@given(problems())
def test_zero_shear_and_load_sign_change_positions_of_all_combinations_at_once(problem: Problem):
    """The batched searches (every combination in one pass, as the check uses them) find exactly the
    union of what the one-combination searches find."""
    assume(stable(problem))
    solution = solve_member(problem.member, STEEL_IPE300, None)
    names = list(solution.combination_names)
    one_by_one = np.unique(np.concatenate([zero_shear_points(solution, name, action) for name in names for action in ("Vy", "Vz")]))
    np.testing.assert_allclose(zero_shear_positions(solution, names), one_by_one, rtol=0, atol=1e-12 * problem.member.length)
    one_by_one = np.unique(np.concatenate([load_sign_change_points(solution, name) for name in names]))
    np.testing.assert_allclose(load_sign_change_positions(solution, names), one_by_one, rtol=0, atol=1e-12 * problem.member.length)


@PROPERTY_SETTINGS
@given(problems(), st.floats(0.05, 20.0), st.floats(0.05, 20.0))
def test_a_unit_rigidity_solution_rescaled_equals_solving_with_the_section(problem: Problem, bending_ratio: float, axial_ratio: float):
    """Without springs every stiffness matrix is rigidity x its unit-rigidity matrix (common practice:
    linear stiffness method), so for_section (no new solve) gives the same reactions and actions and
    displacements scaled by 1 / rigidity; with a spring it refuses."""
    assume(stable(problem))
    member = problem.member
    section = Stiffness(EA=STEEL_IPE300.EA * axial_ratio, GJ=STEEL_IPE300.GJ, EIz=STEEL_IPE300.EIz, EIy=STEEL_IPE300.EIy * bending_ratio)
    unit = solve_member(member, Stiffness.unit(), None)
    if any(support.springs for support in member.supports):
        with pytest.raises(ValueError):
            unit.for_section(section, None)
        return
    rescaled, solved = unit.for_section(section, None), solve_member(member, section, None)
    x = np.linspace(0.0, member.length, 37)
    force_scale, moment_scale = problem_scale(member, member.loads, np.asarray(solved.reactions("all"), dtype=float))
    atol = tolerance(force_scale, moment_scale)
    for name in solved.combination_names:
        assert np.all(np.abs(rescaled.actions(name, x) - solved.actions(name, x)) <= atol)
        assert np.all(np.abs(rescaled.reactions(name) - solved.reactions(name)) <= atol)
        expected = solved.displacements(name, x)
        disp_tolerance = RTOL * np.max(np.abs(expected), axis=0) + displacement_noise(member, force_scale)
        assert np.all(np.abs(rescaled.displacements(name, x) - expected) <= disp_tolerance)


EXTREME_NAMES = ("N", "Vy", "Vz", "T", "My", "Mz", "V", "M")


@pytest.mark.parametrize("names", [("My", "Mz", "M"), ("N", "Vy", "Vz", "T", "V")], ids=["moments", "forces-and-torque"])
@settings(PROPERTY_SETTINGS, phases=[Phase.explicit, Phase.reuse, Phase.generate])  # no shrinking: each example is slow
@given(problem=problems())
def test_extremes_bound_the_diagrams(names: tuple[str, ...], problem: Problem):
    """extremes: each reported largest / smallest value is at least as far out as every value of
    a dense sampling (both sides of every concentrated item on the member, 2001 even points), and
    is the action found at the reported position (on one side of it). V = -Vy, M = Mz (docs/design.md section 2).
    Moments peak at items or where the shear is zero; N, shears and T also peak inside a span
    where a line load's intensity changes sign."""
    assume(stable(problem))
    member = problem.member
    solution = solve_member(member, STEEL_IPE300, None)
    points = breakpoints(member, member.loads)
    # both sides of every item on the member (not the left of x = 0 nor the right of x = L)
    x = np.concatenate([points[1:], points[:-1], np.linspace(0.0, member.length, 2001)[:-1]])
    side = np.array(["left"] * (points.size - 1) + ["right"] * (points.size - 1) + ["right"] * 2000)
    values = solution.actions("all", x, side)
    table = np.column_stack([values, -values[:, 1], values[:, 5]])
    force_scale, moment_scale = problem_scale(member, member.loads, np.asarray(solution.reactions("all"), dtype=float))
    tol = np.concatenate([tolerance(force_scale, moment_scale), [RTOL * force_scale, RTOL * moment_scale]])
    found = extremes(solution, "all")
    for name in names:
        column = EXTREME_NAMES.index(name)
        extreme = found[name]
        assert extreme.max_value >= np.max(table[:, column]) - tol[column], (name, extreme, np.max(table[:, column]))
        assert extreme.min_value <= np.min(table[:, column]) + tol[column], (name, extreme, np.min(table[:, column]))
        for value, at in ((extreme.max_value, extreme.max_at), (extreme.min_value, extreme.min_at)):
            here = solution.actions("all", np.array([at, at]), np.array(["left", "right"]))
            here = np.column_stack([here, -here[:, 1], here[:, 5]])[:, column]
            assert np.min(np.abs(here - value)) <= tol[column], (name, value, at, here)
