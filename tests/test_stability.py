"""Member stability (sizer.stability and the buckling / lateral-torsional checks) against published
closed forms, each source named beside its value:

- fork-supported beam under uniform moment: Mcr = (pi/L) sqrt(E Iy G J) sqrt(1 + pi^2 E Iw / (G J L^2))
  (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., ch. 6; from memory);
- narrow rectangle, loads at the centroid, Iw neglected (same source, from memory): cantilever with an
  end load Pcr = 4.013 sqrt(E Iy G J) / L^2; simply supported, central load 16.94 sqrt(...) / L^2;
  simply supported, uniform load (qL)cr = 28.3 sqrt(...) / L^2;
- monosymmetric beam under uniform moment: Mcr = (pi^2 E Iy / L^2) [beta/2 + sqrt((beta/2)^2 + Iw/Iy
  + G J L^2 / (pi^2 E Iy))], beta positive with the larger flange in compression (Trahair,
  Flexural-Torsional Buckling of Structures, from memory);
- three-factor formula for the load-height effect (approximate factors: C1 about 1.13, C2 about 0.45
  for a uniform load on a simply supported beam; docs/references.md, from memory);
- pinned singly symmetric column: the lower root of (P - Pb)(P - Pt) r0^2 - P^2 y0^2 = 0 (Timoshenko &
  Gere ch. 5, from memory).
The section values of the I-beam are the handbook IPE 300 (EN 10365 dimensions; docs/references.md, from
memory); the solver is given them directly, so only the solver is tested here.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sizer.analysis import solve_member
from sizer.api import member_from_text
from sizer.model import Restraint, Stiffness
from sizer.stability import MemberStability, StabilitySection, mode_name

E, G = 200e9, 77e9  # Pa, structural steel (docs/references.md, common practice)
IPE300 = dict(area=53.8e-4, Iz=8356e-8, Iy=604e-8, J=20.1e-8, Iw=125.9e3 * 1e-12, h=0.300)  # handbook (docs/references.md)
FINE = 64  # elements per length for the convergence check (8x the default)


def section(area: float, Iz: float, Iy: float, J: float, Iw: float, h: float, y0: float = 0.0, Py: float = 0.0,
            y_top: float | None = None) -> StabilitySection:
    """A StabilitySection from handbook-style values (y0: shear centre above the centroid, m)."""
    top = h / 2 if y_top is None else y_top
    return StabilitySection(EIz=E * Iz, EIy=E * Iy, EIyz=0.0, GJ=G * J, EIw=E * Iw, area=area, Iz=Iz, Iy=Iy, Iyz=0.0,
                            y0=y0, z0=0.0, Py=Py, Pz=0.0, y_top=top, y_bottom=h - top)


def beam(length: float, supports: str, loads: str, restraints: str = "") -> tuple[MemberStability, np.ndarray]:
    """A member from member-file text (no self-weight): its stability model and its one combination's weights."""
    text = f'[member]\nlength = "{length} m"\nmaterial = "steel"\nself_weight = false\n{supports}\n{loads}\n{restraints}'
    member = member_from_text(text)
    solution = solve_member(member, Stiffness.unit(), None)
    return MemberStability(member, solution), solution.weights(None)[0]


SIMPLE = '[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{L} m"\ntype = "roller"'


def uniform_moment(L: float, moment: float = 10e3) -> tuple[MemberStability, np.ndarray]:
    """Couples at the ends that make Mz = `moment` (N*m, sagging positive) all along."""
    loads = f'[[loads]]\ntype = "moment"\nat = "0 m"\nmz = "{-moment} N*m"\n[[loads]]\ntype = "moment"\nat = "{L} m"\nmz = "{moment} N*m"'
    return beam(L, SIMPLE.format(L=L), loads)


def timoshenko_uniform_moment(L: float, s: dict) -> float:
    """Mcr of a fork-supported doubly symmetric beam under uniform moment (Timoshenko & Gere)."""
    return math.pi / L * math.sqrt(E * s["Iy"] * G * s["J"] * (1 + math.pi**2 * E * s["Iw"] / (G * s["J"] * L**2)))


@pytest.mark.parametrize("L", [3.0, 6.0, 12.0])
def test_uniform_moment_on_a_fork_supported_i_beam(L: float) -> None:
    model, weights = uniform_moment(L)
    found = model.lateral_buckling(section(**IPE300), weights)
    assert found.load_factor * 10e3 == pytest.approx(timoshenko_uniform_moment(L, IPE300), rel=1e-4)


NARROW = dict(b=0.012, h=0.240)  # m: a deep flat bar, Iw negligible


def narrow_rectangle() -> tuple[StabilitySection, float]:
    """The flat bar with Iw = 0 (as the closed forms assume) and sqrt(E Iy G J)."""
    b, h = NARROW["b"], NARROW["h"]
    J = h * b**3 / 3 * (1 - 0.63 * b / h)  # thin rectangle (Roark Table 10.1, from memory)
    flat = section(b * h, b * h**3 / 12, h * b**3 / 12, J, 0.0, h)
    return flat, math.sqrt(flat.EIy * flat.GJ)


@pytest.mark.parametrize(("case", "coefficient"), [("cantilever end load", 4.013), ("central load", 16.94), ("uniform load", 28.3)])
def test_narrow_rectangle_coefficients(case: str, coefficient: float) -> None:
    L = 4.0
    flat, root = narrow_rectangle()
    if case == "cantilever end load":
        model, weights = beam(L, '[[supports]]\nat = "0 m"\ntype = "fixed"',
                              f'[[loads]]\ntype = "point"\nat = "{L} m"\nfy = "-1 kN"\nheight = "centre"')
        total = 1e3
    elif case == "central load":
        model, weights = beam(L, SIMPLE.format(L=L), f'[[loads]]\ntype = "point"\nat = "{L / 2} m"\nfy = "-1 kN"\nheight = "centre"')
        total = 1e3
    else:
        model, weights = beam(L, SIMPLE.format(L=L), '[[loads]]\ntype = "line"\nwy = "-1 kN/m"\nheight = "centre"')
        total = 1e3 * L
    critical = model.lateral_buckling(flat, weights).load_factor * total
    assert critical == pytest.approx(coefficient * root / L**2, rel=2e-3)  # the coefficients are given to 4 figures


def test_mesh_convergence() -> None:
    """The default mesh against one four times finer: the buckling loads agree to 1e-4."""
    L = 4.0
    flat, _ = narrow_rectangle()
    for supports, loads in [(SIMPLE.format(L=L), '[[loads]]\ntype = "line"\nwy = "-1 kN/m"'),
                            ('[[supports]]\nat = "0 m"\ntype = "fixed"', f'[[loads]]\ntype = "point"\nat = "{L} m"\nfy = "-1 kN"')]:
        model, weights = beam(L, supports, loads)
        fine = MemberStability(model.member, model.solution, per_length=FINE)
        for sec in (flat, section(**IPE300)):
            coarse_value = model.lateral_buckling(sec, weights).load_factor
            assert coarse_value == pytest.approx(fine.lateral_buckling(sec, weights).load_factor, rel=1e-4)


def test_a_restraint_at_mid_length_halves_the_buckling_length() -> None:
    L = 8.0
    model, weights = uniform_moment(L)
    held = replace(model.member, restraints=(Restraint(L / 2, L / 2, True, True, "centre"),))
    braced = MemberStability(held, model.solution)
    assert braced.lateral_buckling(section(**IPE300), weights).load_factor * 10e3 == pytest.approx(
        timoshenko_uniform_moment(L / 2, IPE300), rel=1e-4)


def test_load_height_against_the_three_factor_formula() -> None:
    """A uniform load on the top flange, the shear centre, and the bottom flange of an IPE 300: the
    solver's Mcr against the three-factor formula, whose factors are approximate (within 6 %), and
    the order top < centre < bottom (a load above the shear centre destabilizes: common practice)."""
    L = 6.0
    s = section(**IPE300)
    found = {}
    for height in ("top", "centre", "bottom"):
        model, weights = beam(L, SIMPLE.format(L=L), f'[[loads]]\ntype = "line"\nwy = "-1 kN/m"\nheight = "{height}"')
        found[height] = model.lateral_buckling(s, weights).load_factor * 1e3 * L**2 / 8
    assert found["top"] < found["centre"] < found["bottom"]
    C1, C2 = 1.13, 0.45  # docs/references.md (approximate)
    for height, zg in (("top", IPE300["h"] / 2), ("centre", 0.0)):
        base = math.pi**2 * E * IPE300["Iy"] / L**2
        inner = IPE300["Iw"] / IPE300["Iy"] + L**2 * G * IPE300["J"] / (math.pi**2 * E * IPE300["Iy"]) + (C2 * zg) ** 2
        three_factor = C1 * base * (math.sqrt(inner) - C2 * zg)
        assert found[height] == pytest.approx(three_factor, rel=0.06)


def tee_section() -> tuple[StabilitySection, float]:
    """A thin-walled tee, flange 200 x 10 on top, stem 10 x 190 below (mm), by thin-wall formulas
    (any steel text; the shear centre at the flange-stem junction): its section and beta_y (m)."""
    bf, tf, hw, tw = 0.200, 0.010, 0.190, 0.010
    af, aw = bf * tf, hw * tw
    area = af + aw
    yf = 0.0  # flange mid-plane
    yw = -(tf / 2 + hw / 2)
    yc = (af * yf + aw * yw) / area  # centroid
    flange_y, web_y = yf - yc, yw - yc
    Iz = af * flange_y**2 + bf * tf**3 / 12 + aw * web_y**2 + tw * hw**3 / 12
    Iy = tf * bf**3 / 12 + hw * tw**3 / 12
    J = (bf * tf**3 + hw * tw**3) / 3
    # P_y = integral y (y^2 + z^2) dA: the flange as a strip at flange_y; the web as a strip along y
    web_top, web_bottom = web_y + hw / 2, web_y - hw / 2
    Py = flange_y * (af * flange_y**2 + tf * bf**3 / 12) + tw * (web_top**4 - web_bottom**4) / 4
    y0 = flange_y  # shear centre at the junction of the two plates
    tee = section(area, Iz, Iy, J, 0.0, tf + hw, y0=y0, Py=Py, y_top=flange_y + tf / 2)
    return tee, Py / Iz - 2 * y0


def test_monosymmetric_tee_under_uniform_moment() -> None:
    """Flange in compression (sagging, the flange on top) is stiffer than flange in tension; both
    against the monosymmetric closed form (Trahair, from memory; beta_T = -beta_y here, because
    beta_y is defined with y up and the sagging moment compresses the top)."""
    L = 4.0
    tee, beta_y = tee_section()
    base = math.pi**2 * tee.EIy / L**2
    for sign in (1.0, -1.0):
        model, weights = uniform_moment(L, 10e3 * sign)
        found = model.lateral_buckling(tee, weights).load_factor * 10e3
        beta = -beta_y * sign
        expected = base * (beta / 2 + math.sqrt((beta / 2) ** 2 + tee.GJ * L**2 / (math.pi**2 * tee.EIy)))
        assert found == pytest.approx(expected, rel=1e-3)
    assert -beta_y > 0  # the flange on top is the larger one


def test_flexural_torsional_buckling_of_a_pinned_tee_column() -> None:
    L = 3.0
    tee, _ = tee_section()
    model, weights = beam(L, SIMPLE.format(L=L), f'[[loads]]\ntype = "point"\nat = "{L} m"\nfx = "-1 kN"')
    found = model.axial_buckling(tee, weights)
    r0 = tee.polar_radius_squared
    Pb = math.pi**2 * tee.EIy / L**2  # about the axis of symmetry
    Pt = (tee.GJ + math.pi**2 * tee.EIw / L**2) / r0
    a, b, c = r0 - tee.y0**2, -(Pb + Pt) * r0, Pb * Pt * r0
    lower = (-b - math.sqrt(b * b - 4 * a * c)) / (2 * a)
    major = math.pi**2 * tee.EIz / L**2
    assert found.load_factor * 1e3 == pytest.approx(min(lower, major), rel=1e-4)
    assert mode_name(model.energy_shares(tee, found.mode)) == "flexural-torsional"


def test_euler_column_modes_are_named() -> None:
    """A pinned doubly symmetric column: flexural about the minor axis, pi^2 E Iy / L^2 (Euler)."""
    L = 5.0
    model, weights = beam(L, SIMPLE.format(L=L), f'[[loads]]\ntype = "point"\nat = "{L} m"\nfx = "-1 kN"')
    found = model.axial_buckling(section(**IPE300), weights)
    assert found.load_factor * 1e3 == pytest.approx(math.pi**2 * E * IPE300["Iy"] / L**2, rel=1e-4)
    assert mode_name(model.energy_shares(section(**IPE300), found.mode)) == "flexural minor"


# ----------------------------------------------------------------------------------------------
# properties (hypothesis)

LENGTHS = st.floats(2.0, 12.0)
FRACTIONS = st.floats(0.05, 0.95)


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(L=LENGTHS, at=FRACTIONS, scale=st.floats(0.1, 20.0), height=st.sampled_from(["top", "centre", "bottom"]))
def test_load_factor_scales_inversely_with_the_loads(L: float, at: float, scale: float, height: str) -> None:
    """Linear buckling: the load factor of k x the loads is the load factor / k (common practice)."""
    loads = f'[[loads]]\ntype = "point"\nat = "{at * L} m"\nfy = "-{{f}} N"\nheight = "{height}"'
    one, w1 = beam(L, SIMPLE.format(L=L), loads.format(f=1000.0))
    many, wk = beam(L, SIMPLE.format(L=L), loads.format(f=1000.0 * scale))
    s = section(**IPE300)
    assert many.lateral_buckling(s, wk).load_factor == pytest.approx(one.lateral_buckling(s, w1).load_factor / scale, rel=1e-6)


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(L=LENGTHS, at=FRACTIONS, lateral=st.booleans(), twist=st.booleans(), height=st.sampled_from(["top", "centre", "bottom"]))
def test_a_restraint_never_lowers_the_load_factor(L: float, at: float, lateral: bool, twist: bool, height: str) -> None:
    """Holding more can only raise the buckling load (common practice; the admissible shapes shrink).
    The restraint's node and bays change the mesh, so the two agree to the mesh's accuracy (1e-4)."""
    model, weights = beam(L, SIMPLE.format(L=L), '[[loads]]\ntype = "line"\nwy = "-1 kN/m"')
    held = replace(model.member, restraints=(Restraint(at * L, at * L, lateral or not twist, twist, height),))
    braced = MemberStability(held, model.solution)
    s = section(**IPE300)
    assert braced.lateral_buckling(s, weights).load_factor >= model.lateral_buckling(s, weights).load_factor * (1 - 1e-4)


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(L=LENGTHS, height=st.sampled_from(["top", "centre", "bottom"]), moment=st.floats(-5e4, 5e4).filter(lambda m: abs(m) > 1.0))
def test_held_along_its_whole_length_it_does_not_buckle_sideways(L: float, height: str, moment: float) -> None:
    """A continuous lateral and twist restraint leaves no sideways buckling mode (common practice)."""
    model, weights = uniform_moment(L, moment)
    held = replace(model.member, restraints=(Restraint(0.0, L, True, True, height),))
    assert math.isinf(MemberStability(held, model.solution).lateral_buckling(section(**IPE300), weights).load_factor)


@settings(max_examples=40, deadline=None)
@given(size=st.integers(2, 60), seed=st.integers(0, 2**32 - 1), gap=st.floats(1e-3, 1.0))
def test_largest_eigenpair_by_inverse_iteration_matches_numpy_eigh(size: int, seed: int, gap: float) -> None:
    """The solver's largest eigenvalue (eigvalsh) and its vector (inverse iteration) against numpy's
    full symmetric eigen-solver (LAPACK syevd), the reference: the value to round-off, the vector to
    1e-8 up to its sign, on symmetric matrices whose largest eigenvalue stands `gap` (relative) above
    the next, with eigenvalues of both signs (as C = L^-1 B L^-T has)."""
    from sizer.stability.solve import largest_eigenpairs

    rng = np.random.default_rng(seed)
    q, _ = np.linalg.qr(rng.standard_normal((size, size)))
    values = np.sort(rng.uniform(-1.0, 1.0, size))
    values[-1] = values[-2] + gap * max(1.0, abs(values[-2]))  # the largest stands apart by `gap`
    c = (q * values) @ q.T
    c = (c + c.T) / 2
    found, vectors = largest_eigenpairs(c, 1)
    reference_values, reference_vectors = np.linalg.eigh(c)
    assert found[0] == pytest.approx(reference_values[-1], rel=1e-12, abs=1e-12)
    vector, reference = vectors[:, 0], reference_vectors[:, -1]
    assert np.linalg.norm(vector) == pytest.approx(1.0, rel=1e-12)
    assert min(np.abs(vector - reference).max(), np.abs(vector + reference).max()) < 1e-8


def test_combinations_that_only_scale_a_load_set_share_its_solve() -> None:
    """A combination's load factor equals a direct solve of its own load set (common practice:
    linear buckling scales inversely with the loads), also where the solver reuses the solve of an
    earlier combination whose load set is the same up to a factor: a sideways wind gives no
    major-axis moment, so "dead + wind" buckles sideways as "dead" does, and "uplift" (0.6 x dead)
    at 1/0.6 of its load factor; the wind's end compression is shared the same way."""
    model, solution = dead_and_wind_member()
    s = section(**IPE300)
    solver = model.for_section(s)
    weights = solution.weights(None)
    for c in range(len(solution.combination_names)):
        shared = solver.combination("lateral", c, 0.0)
        direct = model.lateral_buckling(s, weights[c])
        assert shared.load_factor == pytest.approx(direct.load_factor, rel=1e-9)
        if c:  # every combination but "dead" compresses the member
            assert solver.combination("axial", c, 0.0).load_factor == pytest.approx(model.axial_buckling(s, weights[c]).load_factor, rel=1e-9)
    assert solver.combination("lateral", 2, 0.0).load_factor == pytest.approx(solver.combination("lateral", 0, 0.0).load_factor / 0.6, rel=1e-12)
    solves = {kind: sum(len(found) for found in solver._solved[kind].groups.values()) for kind in ("axial", "lateral")}
    assert solves == {"axial": 1, "lateral": 1}  # one load shape each


def dead_and_wind_member() -> tuple[MemberStability, object]:
    """An invented 6 m beam: dead load down, wind sideways with an end compression; combinations that
    repeat or scale each other's load sets for one kind of solve or the other."""
    L = 6.0
    loads = ('[[loads]]\ntype = "line"\ncase = "dead"\nwy = "-4 kN/m"\n'
             '[[loads]]\ntype = "line"\ncase = "wind"\nwz = "1.5 kN/m"\n'
             f'[[loads]]\ntype = "point"\ncase = "wind"\nat = "{L} m"\nfx = "-40 kN"\n'
             '[combinations]\n"dead" = { dead = 1.0 }\n"dead + wind" = { dead = 1.0, wind = 1.0 }\n'
             '"uplift" = { dead = 0.6, wind = 1.0 }\n"dead + less wind" = { dead = 1.0, wind = 0.75 }\n')
    text = f'[member]\nlength = "{L} m"\nmaterial = "steel"\nself_weight = true\n{SIMPLE.format(L=L)}\n{loads}'
    member = member_from_text(text)
    solution = solve_member(member, Stiffness.unit(), None)
    return MemberStability(member, solution), solution


def test_the_sizing_bounds_share_solves_as_the_check_does() -> None:
    """The Rayleigh-Ritz bounds of the sizing screen treat the same combinations as one, with the
    factor that scales their load factors, for every mass of self-weight (which here is in the dead
    case, so 0.6 x dead scales it too)."""
    from sizer.sizing.stability_bounds import same_load_sets

    model, _ = dead_and_wind_member()
    keys = {(kind, c) for kind in ("axial", "lateral") for c in range(4)} - {("axial", 0)}
    alias = same_load_sets(model, keys)
    assert alias[("lateral", 1)] == (("lateral", 0), pytest.approx(1.0)) and alias[("lateral", 3)] == (("lateral", 0), pytest.approx(1.0))
    assert alias[("lateral", 2)] == (("lateral", 0), pytest.approx(0.6))
    assert alias[("axial", 2)] == (("axial", 1), pytest.approx(1.0)) and alias[("axial", 3)] == (("axial", 1), pytest.approx(0.75))


def test_a_bound_without_trial_shapes_says_nothing() -> None:
    """Where every trial shape was held entirely by the strictest constraints (none left), the
    Rayleigh-Ritz bound is no bound (an infinite load factor), not a failure."""
    from sizer.stability.ritz import largest_inverse

    assert np.all(np.isinf(largest_inverse(np.zeros((3, 0, 0)), np.zeros((3, 0, 0)))))
