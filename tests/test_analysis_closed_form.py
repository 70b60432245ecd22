"""The member analysis against closed-form beam, shaft and bar results.

Sources (all from memory, as listed in docs/references.md): AISC Steel Construction Manual Table 3-23
"Shears, Moments and Deflections"; Roark's Formulas for Stress and Strain Table 8.1; Gere and
Timoshenko, Mechanics of Materials (beam deflection appendix). Where a value follows from statics
or compatibility by hand, the derivation is given beside it.

Signs (docs/design.md section 2): actions on the +x face of the left segment; beam convention V = -Vy,
M = Mz (sagging positive); reactions are what the support exerts on the member.
Tolerances: rel 1e-9 for statics, 1e-6 for deflections and slopes.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from sizer.analysis import (
    SIDES,
    Extreme,
    extremes,
    self_weight_load,
    solve_case,
    solve_member,
    stations,
    zero_shear_points,
)
from sizer.errors import InputError
from sizer.model import SUPPORT_TYPES, Hinge, LineLoad, Load, Member, PointLoad, Stiffness, Support
from sizer.units import GRAVITY

# IPE 300 in steel (docs/references.md, handbook values from memory): A = 53.8 cm^2, I major = 8356 cm^4,
# I minor = 604 cm^4, It = 20.1 cm^4; E = 200 GPa, G = 77 GPa (common practice for steel).
E, G = 200e9, 77e9
I_MAJOR, I_MINOR, AREA, J_TORSION = 8.356e-5, 6.04e-6, 53.8e-4, 20.1e-8
STEEL = Stiffness(EA=E * AREA, GJ=G * J_TORSION, EIz=E * I_MAJOR, EIy=E * I_MINOR)
EI = STEEL.EIz
STATICS = 1e-9
DEFLECTION = 1e-6

# action columns
N, VY, VZ, T, MY, MZ = range(6)
# reaction columns
FX, FY, FZ, MX, RMY, RMZ = range(6)
# displacement columns
UX, UY, UZ, RX, RY, RZ = range(6)


def support(at: float, kind: str) -> Support:
    return Support(at=at, restrain=SUPPORT_TYPES[kind], label=kind)


def member_of(length: float, supports: list[Support], loads: list[Load], hinges: tuple[Hinge, ...] = ()) -> Member:
    return Member(length=length, material="steel", supports=tuple(supports), loads=tuple(loads),
                  combinations={"all": {"load": 1.0}}, self_weight_case=None, hinges=hinges, source="beam.toml")


def uniform(wy: float, start: float, end: float, wz: float = 0.0, wx: float = 0.0, mx: float = 0.0) -> LineLoad:
    q = (wx, wy, wz, mx)
    return LineLoad("load", start, end, q, q)


def point(at: float, fx: float = 0.0, fy: float = 0.0, fz: float = 0.0, mx: float = 0.0, my: float = 0.0, mz: float = 0.0) -> PointLoad:
    return PointLoad("load", at, (fx, fy, fz), (mx, my, mz))


def solve(length: float, supports: list[Support], loads: list[Load], hinges: tuple[Hinge, ...] = (), stiffness=STEEL):
    member = member_of(length, supports, loads, hinges)
    return solve_case(member, loads, stiffness, "load")


def value(solution, column: int, x: float, side: str = "right", kind: str = "actions") -> float:
    fn = solution.actions if kind == "actions" else solution.displacements
    return float(fn(np.array([x]), side)[0, column])


# --------------------------------------------------------------------------------------------
# The beam table of docs/references.md
# --------------------------------------------------------------------------------------------


def test_simply_supported_uniform_load():
    length, w = 6.0, 12e3  # w acts downward (-y)
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [uniform(-w, 0.0, length)])
    # AISC Table 3-23 case 1: R = wL/2, V = wL/2 at the ends, M max = wL^2/8 at midspan,
    # deflection 5wL^4/(384EI); end slope wL^3/(24EI) (Roark Table 8.1, from memory).
    np.testing.assert_allclose(s.reactions[:, FY], [w * length / 2] * 2, rtol=STATICS)
    assert -value(s, VY, 0.0) == pytest.approx(w * length / 2, rel=STATICS)  # beam V = -Vy
    assert -value(s, VY, length, "left") == pytest.approx(-w * length / 2, rel=STATICS)
    assert value(s, MZ, length / 2) == pytest.approx(w * length**2 / 8, rel=STATICS)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-5 * w * length**4 / (384 * EI), rel=DEFLECTION)
    assert value(s, RZ, 0.0, kind="u") == pytest.approx(-w * length**3 / (24 * EI), rel=DEFLECTION)
    assert value(s, RZ, length, kind="u") == pytest.approx(w * length**3 / (24 * EI), rel=DEFLECTION)


def test_simply_supported_central_point_load():
    length, p = 5.0, 40e3
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [point(length / 2, fy=-p)])
    # AISC Table 3-23 case 7: M = PL/4 under the load, deflection PL^3/(48EI); end slope
    # PL^2/(16EI) (Roark Table 8.1, from memory).
    assert value(s, MZ, length / 2) == pytest.approx(p * length / 4, rel=STATICS)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-p * length**3 / (48 * EI), rel=DEFLECTION)
    assert value(s, RZ, 0.0, kind="u") == pytest.approx(-p * length**2 / (16 * EI), rel=DEFLECTION)


def test_simply_supported_point_load_off_centre():
    length, p, a = 7.0, 25e3, 2.0
    b = length - a
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [point(a, fy=-p)])
    # AISC Table 3-23 case 8: R left = Pb/L, R right = Pa/L, M under load = Pab/L,
    # deflection under the load Pa^2 b^2 / (3EIL).
    assert s.reactions[0, FY] == pytest.approx(p * b / length, rel=STATICS)
    assert s.reactions[1, FY] == pytest.approx(p * a / length, rel=STATICS)
    assert value(s, MZ, a) == pytest.approx(p * a * b / length, rel=STATICS)
    assert value(s, UY, a, kind="u") == pytest.approx(-p * a**2 * b**2 / (3 * EI * length), rel=DEFLECTION)


def test_cantilever_tip_point_load():
    length, p = 3.0, 10e3
    s = solve(length, [support(0.0, "fixed")], [point(length, fy=-p)])
    # AISC Table 3-23 case 22: M at root = -PL (hogging), tip deflection PL^3/(3EI),
    # tip slope PL^2/(2EI); the support gives Fy = P and Mz = PL (statics).
    assert value(s, MZ, 0.0) == pytest.approx(-p * length, rel=STATICS)
    assert s.reactions[0, FY] == pytest.approx(p, rel=STATICS)
    assert s.reactions[0, RMZ] == pytest.approx(p * length, rel=STATICS)
    assert value(s, UY, length, kind="u") == pytest.approx(-p * length**3 / (3 * EI), rel=DEFLECTION)
    assert value(s, RZ, length, kind="u") == pytest.approx(-p * length**2 / (2 * EI), rel=DEFLECTION)


def test_cantilever_uniform_load():
    length, w = 2.5, 8e3
    s = solve(length, [support(0.0, "fixed")], [uniform(-w, 0.0, length)])
    # AISC Table 3-23 case 19: M at root = -wL^2/2, tip deflection wL^4/(8EI); tip slope
    # wL^3/(6EI) (Roark Table 8.1, from memory).
    assert value(s, MZ, 0.0) == pytest.approx(-w * length**2 / 2, rel=STATICS)
    assert value(s, UY, length, kind="u") == pytest.approx(-w * length**4 / (8 * EI), rel=DEFLECTION)
    assert value(s, RZ, length, kind="u") == pytest.approx(-w * length**3 / (6 * EI), rel=DEFLECTION)


def test_fixed_both_ends_uniform_load():
    length, w = 8.0, 15e3
    s = solve(length, [support(0.0, "fixed"), support(length, "fixed")], [uniform(-w, 0.0, length)])
    # AISC Table 3-23 case 15: M ends = -wL^2/12, M midspan = wL^2/24, deflection wL^4/(384EI).
    assert value(s, MZ, 0.0) == pytest.approx(-w * length**2 / 12, rel=STATICS)
    assert value(s, MZ, length, "left") == pytest.approx(-w * length**2 / 12, rel=STATICS)
    assert value(s, MZ, length / 2) == pytest.approx(w * length**2 / 24, rel=STATICS)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-w * length**4 / (384 * EI), rel=DEFLECTION)


def test_propped_cantilever_uniform_load():
    length, w = 6.0, 10e3
    # prop (roller) at x = 0, fixed end at x = L
    member = member_of(length, [support(0.0, "roller"), support(length, "fixed")], [uniform(-w, 0.0, length)])
    s = solve_case(member, member.loads, STEEL, "load")
    # AISC Table 3-23 case 12: prop R = 3wL/8, fixed R = 5wL/8, M fixed = -wL^2/8,
    # M max = 9wL^2/128 at 3L/8 from the prop; deflection y = w x (L^3 - 3 L x^2 + 2 x^3)/(48EI)
    # from the prop, so wL^4/(192EI) at midspan.
    assert s.reactions[0, FY] == pytest.approx(3 * w * length / 8, rel=STATICS)
    assert s.reactions[1, FY] == pytest.approx(5 * w * length / 8, rel=STATICS)
    assert value(s, MZ, length, "left") == pytest.approx(-w * length**2 / 8, rel=STATICS)
    assert value(s, MZ, 3 * length / 8) == pytest.approx(9 * w * length**2 / 128, rel=STATICS)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-w * length**4 / (192 * EI), rel=DEFLECTION)
    solution = solve_member(member, STEEL, None)
    np.testing.assert_allclose(zero_shear_points(solution, "all"), [3 * length / 8], rtol=STATICS)
    found = extremes(solution, "all")
    assert found["M"].max_value == pytest.approx(9 * w * length**2 / 128, rel=STATICS)
    assert found["M"].max_at == pytest.approx(3 * length / 8, rel=STATICS)
    assert found["M"].min_value == pytest.approx(-w * length**2 / 8, rel=STATICS)
    assert found["M"].min_at == pytest.approx(length, rel=STATICS)
    # Beam V = -Vy: +3wL/8 just right of the prop, R_prop - wL = -5wL/8 just left of the fixed end.
    assert found["V"].max_value == pytest.approx(3 * w * length / 8, rel=STATICS)
    assert found["V"].min_value == pytest.approx(-5 * w * length / 8, rel=STATICS)


# --------------------------------------------------------------------------------------------
# More layouts
# --------------------------------------------------------------------------------------------


def test_overhang_with_load_at_the_tip():
    span, overhang, p = 5.0, 1.5, 20e3
    length = span + overhang
    s = solve(length, [support(0.0, "pin"), support(span, "roller")], [point(length, fy=-p)])
    # AISC Table 3-23 case 25 (beam overhanging one support, load at the end of the overhang):
    # R1 = Pa/L (downward), R2 = P(L + a)/L, M at R2 = -Pa, tip deflection Pa^2 (L + a)/(3EI).
    assert s.reactions[0, FY] == pytest.approx(-p * overhang / span, rel=STATICS)
    assert s.reactions[1, FY] == pytest.approx(p * (span + overhang) / span, rel=STATICS)
    assert value(s, MZ, span) == pytest.approx(-p * overhang, rel=STATICS)
    assert value(s, UY, length, kind="u") == pytest.approx(-p * overhang**2 * (span + overhang) / (3 * EI), rel=DEFLECTION)


def test_two_equal_continuous_spans_uniform_load():
    span, w = 4.0, 10e3
    s = solve(2 * span, [support(0.0, "pin"), support(span, "roller"), support(2 * span, "roller")], [uniform(-w, 0.0, 2 * span)])
    # AISC Table 3-23 case 29 (continuous beam, two equal spans, uniform load): end R = 3wL/8,
    # interior R = 10wL/8 = 1.25 wL, M at the interior support = -wL^2/8, M max = 9wL^2/128 at 3L/8.
    np.testing.assert_allclose(s.reactions[:, FY], [3 * w * span / 8, 1.25 * w * span, 3 * w * span / 8], rtol=STATICS)
    assert value(s, MZ, span) == pytest.approx(-w * span**2 / 8, rel=STATICS)
    assert value(s, MZ, 3 * span / 8) == pytest.approx(9 * w * span**2 / 128, rel=STATICS)


def test_three_equal_continuous_spans_uniform_load():
    span, w = 5.0, 6e3
    layout = [support(0.0, "pin"), support(span, "roller"), support(2 * span, "roller"), support(3 * span, "roller")]
    s = solve(3 * span, layout, [uniform(-w, 0.0, 3 * span)])
    # Classic continuous-beam coefficients (AISC Table 3-23 / any structural analysis text, from
    # memory): R = 0.4, 1.1, 1.1, 0.4 wL; M at interior supports = -0.1 wL^2; M in the middle span at
    # midspan = 0.025 wL^2; M max in the end spans = 0.08 wL^2 at 0.4 L from the end.
    np.testing.assert_allclose(s.reactions[:, FY], np.array([0.4, 1.1, 1.1, 0.4]) * w * span, rtol=STATICS)
    assert value(s, MZ, span) == pytest.approx(-0.1 * w * span**2, rel=STATICS)
    assert value(s, MZ, 2 * span) == pytest.approx(-0.1 * w * span**2, rel=STATICS)
    assert value(s, MZ, 1.5 * span) == pytest.approx(0.025 * w * span**2, rel=STATICS)
    assert value(s, MZ, 0.4 * span) == pytest.approx(0.08 * w * span**2, rel=STATICS)


def test_triangular_load_on_a_simple_span():
    length, w = 6.0, 9e3  # zero at x = 0 rising to w (downward) at x = L
    member = member_of(length, [support(0.0, "pin"), support(length, "roller")],
                       [LineLoad("load", 0.0, length, (0.0, 0.0, 0.0, 0.0), (0.0, -w, 0.0, 0.0))])
    s = solve_case(member, member.loads, STEEL, "load")
    # AISC Table 3-23 case 2 (load increasing uniformly to one end): R1 = wL/6, R2 = wL/3 (W/3, 2W/3
    # with W = wL/2), M max = wL^2/(9 sqrt 3) at x = L/sqrt 3, deflection
    # y = w x (7L^4 - 10 L^2 x^2 + 3 x^4) / (360 EI L); at midspan 5wL^4/(768EI) (half the uniform case, by symmetry).
    assert s.reactions[0, FY] == pytest.approx(w * length / 6, rel=STATICS)
    assert s.reactions[1, FY] == pytest.approx(w * length / 3, rel=STATICS)
    x_max = length / math.sqrt(3)
    assert value(s, MZ, x_max) == pytest.approx(w * length**2 / (9 * math.sqrt(3)), rel=STATICS)
    np.testing.assert_allclose(zero_shear_points(solve_member(member, STEEL, None), "all"), [x_max], rtol=STATICS)
    for x in (length / 4, length / 2, x_max):
        expected = w * x * (7 * length**4 - 10 * length**2 * x**2 + 3 * x**4) / (360 * EI * length)
        assert value(s, UY, x, kind="u") == pytest.approx(-expected, rel=DEFLECTION)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-5 * w * length**4 / (768 * EI), rel=DEFLECTION)


def test_partial_uniform_load_on_a_simple_span():
    length, w, a, b = 8.0, 5e3, 2.0, 5.0  # w downward over [a, b]
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [uniform(-w, a, b)])
    # Statics: resultant W = w (b - a) at (a + b)/2; R left = W (L - (a + b)/2) / L; M at x in the
    # loaded part = R x - w (x - a)^2 / 2 (method of sections by hand).
    total, centre = w * (b - a), (a + b) / 2
    r_left = total * (length - centre) / length
    assert s.reactions[0, FY] == pytest.approx(r_left, rel=STATICS)
    assert s.reactions[1, FY] == pytest.approx(total - r_left, rel=STATICS)
    x = 3.7
    assert value(s, MZ, x) == pytest.approx(r_left * x - w * (x - a) ** 2 / 2, rel=STATICS)


def test_fixed_both_ends_central_point_load():
    length, p = 6.0, 30e3
    s = solve(length, [support(0.0, "fixed"), support(length, "fixed")], [point(length / 2, fy=-p)])
    # AISC Table 3-23 case 16: M ends = -PL/8, M at centre = PL/8, deflection PL^3/(192EI).
    assert value(s, MZ, 0.0) == pytest.approx(-p * length / 8, rel=STATICS)
    assert value(s, MZ, length / 2) == pytest.approx(p * length / 8, rel=STATICS)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-p * length**3 / (192 * EI), rel=DEFLECTION)


def test_two_spans_with_central_point_loads_given_as_close_pairs():
    # Each span's central load P is given as two loads of P/2 a hair either side of midspan: the
    # result must equal the single-load case to round-off (no ill-conditioning from close positions).
    span, p, gap = 5.0, 40e3, 1e-7
    loads = [point(span / 2 - gap, fy=-p / 2), point(span / 2 + gap, fy=-p / 2),
             point(1.5 * span - gap, fy=-p / 2), point(1.5 * span + gap, fy=-p / 2)]
    s = solve(2 * span, [support(0.0, "pin"), support(span, "roller"), support(2 * span, "roller")], loads)
    # AISC Table 3-23 case 30 (two equal spans, concentrated load at the centre of each span):
    # end R = 5P/16, interior R = 22P/16, M at the interior support = -3PL/16, M under the loads = 5PL/32.
    np.testing.assert_allclose(s.reactions[:, FY], np.array([5, 22, 5]) * p / 16, rtol=1e-7)
    assert value(s, MZ, span) == pytest.approx(-3 * p * span / 16, rel=1e-7)
    assert value(s, MZ, span / 2) == pytest.approx(5 * p * span / 32, rel=1e-7)


def test_internal_hinge_makes_a_propped_layout_determinate():
    # Fixed at 0, hinge at a, roller at L, uniform w downward over the whole length.
    length, a, w = 7.0, 2.0, 10e3
    s = solve(length, [support(0.0, "fixed"), support(length, "roller")], [uniform(-w, 0.0, length)], hinges=(Hinge(a),))
    # Statics by hand: the part a..L is simply supported by the hinge and the roller, so the roller
    # carries w (L - a)/2 and so does the hinge; the cantilever 0..a carries w a plus that hinge
    # force at its tip: R0 = w a + w (L - a)/2, M at the root = -(w a^2 / 2 + w (L - a)/2 * a).
    hinge_force = w * (length - a) / 2
    assert s.reactions[1, FY] == pytest.approx(hinge_force, rel=STATICS)
    assert s.reactions[0, FY] == pytest.approx(w * a + hinge_force, rel=STATICS)
    assert value(s, MZ, 0.0) == pytest.approx(-(w * a**2 / 2 + hinge_force * a), rel=STATICS)
    for side in SIDES:
        assert abs(value(s, MZ, a, side)) <= STATICS * w * length**2
    # Deflection at the hinge = tip of the cantilever 0..a under w and the tip load hinge_force
    # (AISC Table 3-23 cases 19 and 22 superposed): w a^4/(8EI) + P a^3/(3EI).
    expected = w * a**4 / (8 * EI) + hinge_force * a**3 / (3 * EI)
    assert value(s, UY, a, kind="u") == pytest.approx(-expected, rel=DEFLECTION)
    # The slope jumps at the hinge: left = cantilever tip slope w a^3/(6EI) + P a^2/(2EI) (same cases);
    # right = slope of the simply supported part at its end: chord (deflection/(L-a)) minus the
    # end slope w (L-a)^3/(24EI) of a simple span (AISC case 1).
    left = -(w * a**3 / (6 * EI) + hinge_force * a**2 / (2 * EI))
    right = expected / (length - a) - w * (length - a) ** 3 / (24 * EI)
    assert value(s, RZ, a, "left", kind="u") == pytest.approx(left, rel=DEFLECTION)
    assert value(s, RZ, a, "right", kind="u") == pytest.approx(right, rel=DEFLECTION)


def test_hinge_over_a_support_gives_two_simple_spans():
    # A hinge exactly over the middle support: each span is simply supported (statics).
    span, w = 4.0, 10e3
    layout = [support(0.0, "pin"), support(span, "fixed"), support(2 * span, "roller")]
    s = solve(2 * span, layout, [uniform(-w, 0.0, 2 * span)], hinges=(Hinge(span),))
    np.testing.assert_allclose(s.reactions[:, FY], [w * span / 2, w * span, w * span / 2], rtol=STATICS)
    assert s.reactions[1, RMZ] == 0.0  # the support holds the hinge pin; no moment passes
    assert value(s, MZ, span / 2) == pytest.approx(w * span**2 / 8, rel=STATICS)


def test_simple_span_on_a_spring():
    # Pin at 0, spring k on uy at L, central load P: determinate, so the spring force is P/2 and the
    # spring shortens by P/(2k); midspan deflection = PL^3/(48EI) + half the end settlement.
    length, p, k = 6.0, 30e3, 20e6  # 20 kN/mm
    spring = Support(length, frozenset({"uz", "rx"}), {"uy": k}, "spring")
    s = solve(length, [support(0.0, "pin"), spring], [point(length / 2, fy=-p)])
    assert s.reactions[1, FY] == pytest.approx(p / 2, rel=STATICS)
    settlement = p / (2 * k)
    assert value(s, UY, length, kind="u") == pytest.approx(-settlement, rel=DEFLECTION)
    assert s.reactions[1, FY] == pytest.approx(-k * value(s, UY, length, kind="u"), rel=DEFLECTION)
    assert value(s, UY, length / 2, kind="u") == pytest.approx(-(p * length**3 / (48 * EI) + settlement / 2), rel=DEFLECTION)


def test_propped_cantilever_on_a_spring_prop():
    # Fixed at 0, spring prop k at L, uniform w. Compatibility: tip deflection of the cantilever under w
    # (wL^4/(8EI), AISC case 19) less that under the prop force R (RL^3/(3EI), AISC case 22) equals
    # the spring's shortening R/k, so R = (wL^4/(8EI)) / (L^3/(3EI) + 1/k).
    length, w, k = 5.0, 12e3, 5e6
    spring = Support(length, frozenset(), {"uy": k}, "spring")
    s = solve(length, [support(0.0, "fixed"), spring], [uniform(-w, 0.0, length)])
    prop = (w * length**4 / (8 * EI)) / (length**3 / (3 * EI) + 1 / k)
    assert s.reactions[1, FY] == pytest.approx(prop, rel=DEFLECTION)
    assert value(s, UY, length, kind="u") == pytest.approx(-prop / k, rel=DEFLECTION)
    assert s.reactions[0, FY] + s.reactions[1, FY] == pytest.approx(w * length, rel=STATICS)


def test_3d_cantilever_lateral_load_torque_and_vertical_load():
    length, pz, py, torque = 2.0, 4e3, -6e3, 1.5e3
    s = solve(length, [support(0.0, "fixed")], [point(length, fy=py, fz=pz, mx=torque)])
    # Statics with right-handed axes: the root holds Fz = -Pz and My = +Pz L (moment of the tip force
    # about the root is L e_x x Pz e_z = -Pz L e_y), Mx = -T. On the +x face of the left segment:
    # Vz = Pz, My(x) = -Pz (L - x), T = torque; Mz(x) = Py (L - x) as in the x-y cantilever.
    assert s.reactions[0, FZ] == pytest.approx(-pz, rel=STATICS)
    assert s.reactions[0, RMY] == pytest.approx(pz * length, rel=STATICS)
    assert s.reactions[0, MX] == pytest.approx(-torque, rel=STATICS)
    x = 0.5
    assert value(s, VZ, x) == pytest.approx(pz, rel=STATICS)
    assert value(s, MY, 0.0) == pytest.approx(-pz * length, rel=STATICS)
    assert value(s, MY, x) == pytest.approx(-pz * (length - x), rel=STATICS)
    assert value(s, T, x) == pytest.approx(torque, rel=STATICS)
    assert value(s, MZ, x) == pytest.approx(py * (length - x), rel=STATICS)
    # AISC Table 3-23 case 22 about the minor axis: tip uz = Pz L^3/(3 EIy), and ry = -duz/dx =
    # -Pz L^2/(2 EIy); the x-y part uses EIz. Twist of a shaft TL/(GJ) (Roark, torsion, from memory).
    assert value(s, UZ, length, kind="u") == pytest.approx(pz * length**3 / (3 * STEEL.EIy), rel=DEFLECTION)
    assert value(s, RY, length, kind="u") == pytest.approx(-pz * length**2 / (2 * STEEL.EIy), rel=DEFLECTION)
    assert value(s, UY, length, kind="u") == pytest.approx(py * length**3 / (3 * STEEL.EIz), rel=DEFLECTION)
    assert value(s, RX, length, kind="u") == pytest.approx(torque * length / STEEL.GJ, rel=DEFLECTION)


def test_3d_cantilever_tip_moment_about_y():
    length, couple = 3.0, 2e3
    s = solve(length, [support(0.0, "fixed")], [point(length, my=couple)])
    # A couple C about +y at the tip: My = C all along (statics), ry = C x / EIy, and since a
    # rotation about +y turns +x towards -z, uz = -C x^2 / (2 EIy) (Roark Table 8.1 end couple, from memory).
    assert value(s, MY, 1.0) == pytest.approx(couple, rel=STATICS)
    assert s.reactions[0, RMY] == pytest.approx(-couple, rel=STATICS)
    assert value(s, RY, length, kind="u") == pytest.approx(couple * length / STEEL.EIy, rel=DEFLECTION)
    assert value(s, UZ, length, kind="u") == pytest.approx(-couple * length**2 / (2 * STEEL.EIy), rel=DEFLECTION)


def test_uniform_lateral_load_on_a_simple_span_about_the_minor_axis():
    length, w = 4.0, 3e3
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [uniform(0.0, 0.0, length, wz=w)])
    # AISC Table 3-23 case 1 in x-z: R = wL/2 against the load, deflection 5wL^4/(384 EIy) along +z,
    # and |My| = wL^2/8 at midspan. Sign by statics of the left half: the reaction -wL/2 at a = 0 and
    # the load w on [0, L/2] give My = sum (a - x) Fz = (-L/2)(-wL/2) - w (L/2)^2 / 2 = +wL^2/8
    # (consistent with My = -EIy uz'', uz bulging towards +z).
    np.testing.assert_allclose(s.reactions[:, FZ], [-w * length / 2] * 2, rtol=STATICS)
    assert value(s, MY, length / 2) == pytest.approx(w * length**2 / 8, rel=STATICS)
    assert value(s, UZ, length / 2, kind="u") == pytest.approx(5 * w * length**4 / (384 * STEEL.EIy), rel=DEFLECTION)


def test_axial_load():
    length, p = 3.0, 50e3
    s = solve(length, [support(0.0, "fixed")], [point(length, fx=p)])
    # Tension N = P along the bar; elongation PL/(EA) (any mechanics of materials text).
    assert value(s, N, 1.0) == pytest.approx(p, rel=STATICS)
    assert s.reactions[0, FX] == pytest.approx(-p, rel=STATICS)
    assert value(s, UX, length, kind="u") == pytest.approx(p * length / STEEL.EA, rel=DEFLECTION)


def test_post_under_its_own_weight():
    # A post standing on a pin at x = 0 with gravity along -x: N(x) = -q (L - x) (compression) and the
    # top moves down by qL^2/(2EA) (integral of N/EA, by hand), q = m g.
    length, mass = 4.0, 42.2  # kg/m
    member = Member(length=length, material="steel", supports=(support(0.0, "fixed"),), loads=(),
                    combinations={"dead": {"dead": 1.35}}, self_weight_case="dead", gravity=(0, -1))
    solution = solve_member(member, STEEL, mass)
    q = mass * GRAVITY
    assert self_weight_load(member).q_start == (-1.0, 0.0, 0.0, 0.0)
    actions = solution.actions("dead", np.array([0.0, 1.0]))
    np.testing.assert_allclose(actions[:, N], -1.35 * q * (length - np.array([0.0, 1.0])), rtol=STATICS)
    top = solution.displacements("dead", np.array([length]))[0, UX]
    assert top == pytest.approx(-1.35 * q * length**2 / (2 * STEEL.EA), rel=DEFLECTION)


def test_distributed_torque_on_a_cantilever():
    length, t = 2.4, 800.0  # N*m per m
    s = solve(length, [support(0.0, "fixed")], [uniform(0.0, 0.0, length, mx=t)])
    # T(x) = t (L - x) (statics); tip twist = t L^2 / (2GJ) (integral of T/GJ, Roark torsion, from memory).
    for x in (0.0, 0.7, 2.0):
        assert value(s, T, x) == pytest.approx(t * (length - x), rel=STATICS)
    assert value(s, RX, length, kind="u") == pytest.approx(t * length**2 / (2 * STEEL.GJ), rel=DEFLECTION)


def test_jump_in_shear_at_a_point_load_equals_the_load():
    length, p, a = 6.0, 18e3, 2.5
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [point(a, fy=-p), uniform(-2e3, 0.0, length)])
    left, right = s.actions(np.array([a]), "left")[0], s.actions(np.array([a]), "right")[0]
    # Statics of a slice at the load: Vy(right) - Vy(left) = -(fy) = P; the moment is continuous.
    assert right[VY] - left[VY] == pytest.approx(p, rel=STATICS)
    assert right[MZ] == pytest.approx(left[MZ], rel=STATICS)


def test_actions_vanish_outside_the_member():
    length = 6.0
    s = solve(length, [support(0.0, "fixed"), support(4.0, "roller")], [point(length, fy=-5e3, fz=2e3, mx=300.0), uniform(-2e3, 1.0, 5.5)])
    scale = 5e3 * length
    # Common practice: nothing acts left of x = 0 or right of x = L.
    assert np.all(np.abs(s.actions(np.array([0.0]), "left")) <= STATICS * scale)
    assert np.all(np.abs(s.actions(np.array([length]), "right")) <= STATICS * scale)


def test_combinations_and_self_weight_scale_by_superposition():
    length, mass = 6.0, 42.2
    loads = (LineLoad("dead", 0.0, length, (0, -2e3, 0, 0), (0, -2e3, 0, 0)), PointLoad("imposed", 3.0, (0.0, -10e3, 0.0)))
    member = Member(length=length, material="steel", supports=(support(0.0, "pin"), support(length, "roller")), loads=loads,
                    combinations={"uls": {"dead": 1.35, "imposed": 1.5}, "sls": {"dead": 1.0, "imposed": 1.0}},
                    self_weight_case="dead", gravity=(1, -1))
    solution = solve_member(member, STEEL, mass)
    # AISC Table 3-23 cases 1 and 7 superposed: M midspan = (w + m g) L^2 / 8 * 1.35 + P L / 4 * 1.5.
    w = 2e3 + mass * GRAVITY
    assert solution.actions("uls", np.array([3.0]))[0, MZ] == pytest.approx(1.35 * w * length**2 / 8 + 1.5 * 10e3 * length / 4, rel=STATICS)
    assert solution.reactions("sls")[0, FY] == pytest.approx(w * length / 2 + 5e3, rel=STATICS)
    stacked = solution.all_actions(np.array([1.0, 3.0]))
    np.testing.assert_allclose(stacked[0], solution.actions("uls", np.array([1.0, 3.0])), rtol=STATICS)
    without = solution.all_actions(np.array([3.0]), mass_per_length=None)
    assert without[1, 0, MZ] == pytest.approx(2e3 * length**2 / 8 + 10e3 * length / 4, rel=STATICS)
    assert solution.weights().shape == (2, len(solution.cases) + 1)


# --------------------------------------------------------------------------------------------
# Bad input and free freedoms
# --------------------------------------------------------------------------------------------


def test_mechanism_along_the_axis_is_bad_input():
    # Two rollers hold nothing along x; an axial load would slide the member away (common practice).
    with pytest.raises(InputError) as caught:
        solve(5.0, [support(0.0, "roller"), support(5.0, "roller")], [point(2.0, fx=1e3)])
    assert caught.value.key == "supports"
    assert "ux" in caught.value.problem and "mechanism" in caught.value.problem
    assert caught.value.file == "beam.toml"


def test_mechanism_in_bending_is_bad_input():
    # One pin cannot hold a transverse load: the member turns about it (common practice).
    with pytest.raises(InputError) as caught:
        solve(5.0, [support(0.0, "pin")], [point(3.0, fy=-1e3)])
    assert "rz" in caught.value.problem
    # A hinge in a simply supported span is a mechanism too.
    with pytest.raises(InputError) as caught:
        solve(5.0, [support(0.0, "pin"), support(5.0, "roller")], [point(3.0, fy=-1e3)], hinges=(Hinge(2.0),))
    assert "mechanism" in caught.value.problem


def test_unengaged_free_freedom_is_not_an_error():
    # Rollers at both ends leave ux free; with transverse loads only, N = 0 and ux = 0 (the free
    # motion is left out). Values as the simple span (AISC Table 3-23 case 1).
    length, w = 6.0, 4e3
    s = solve(length, [support(0.0, "roller"), support(length, "roller")], [uniform(-w, 0.0, length)])
    assert np.all(s.actions(np.linspace(0.0, length, 7))[:, N] == 0.0)
    assert value(s, MZ, length / 2) == pytest.approx(w * length**2 / 8, rel=STATICS)
    assert np.all(s.displacements(np.linspace(0.0, length, 7))[:, UX] == 0.0)


def test_off_member_and_coincident_supports_are_bad_input():
    with pytest.raises(InputError, match="off the member"):
        solve(5.0, [support(0.0, "fixed")], [point(5.5, fy=-1e3)])
    with pytest.raises(InputError, match="off the member"):
        solve(5.0, [support(0.0, "fixed"), support(6.0, "roller")], [point(2.0, fy=-1e3)])
    with pytest.raises(InputError, match="two supports"):
        solve(5.0, [support(2.0, "fixed"), support(2.0, "roller")], [point(3.0, fy=-1e3)])


def test_springs_need_a_stiffness_and_displacements_need_one():
    spring = Support(6.0, frozenset({"uz", "rx"}), {"uy": 1e7}, "spring")
    with pytest.raises(InputError) as caught:
        solve(6.0, [support(0.0, "pin"), spring], [point(3.0, fy=-1e3)], stiffness=None)
    assert caught.value.key == "member.section"
    s = solve(6.0, [support(0.0, "pin"), support(6.0, "roller")], [point(3.0, fy=-1e3)], stiffness=None)
    assert value(s, MZ, 3.0) == pytest.approx(1e3 * 6.0 / 4, rel=STATICS)  # AISC case 7, PL/4
    with pytest.raises(ValueError):
        s.displacements(np.array([3.0]))


def test_stations_cover_both_sides_of_every_concentrated_item():
    member = member_of(6.0, [support(0.0, "pin"), support(6.0, "roller")], [point(2.0, fy=-1e3), uniform(-1e3, 1.0, 4.0)])
    x, side = stations(member, n_even=13)
    pairs = set(zip(np.round(x, 12), side))
    for at in (1.0, 2.0, 4.0):
        assert (at, "left") in pairs and (at, "right") in pairs
    assert (0.0, "right") in pairs and (6.0, "left") in pairs
    assert np.all(np.diff(x) >= 0)
    found = extremes(solve_member(member, STEEL, None), "all")
    assert isinstance(found["Mz"], Extreme)


def test_self_weight_mechanism_counts_only_when_the_weight_does():
    # A post on two rollers with gravity along -x slides under its own weight (nothing holds ux), but
    # without a mass per length (no section: self weight left out) the transverse load still solves.
    length = 4.0
    member = Member(length=length, material="steel", supports=(support(0.0, "roller"), support(length, "roller")),
                    loads=(point(2.0, fy=-1e3),), combinations={"all": {"load": 1.0, "dead": 1.0}},
                    self_weight_case="dead", gravity=(0, -1), source="post.toml")
    solution = solve_member(member, None, None)
    assert solution.actions("all", np.array([2.0]))[0, MZ] == pytest.approx(1e3 * length / 4, rel=STATICS)  # AISC case 7
    with pytest.raises(InputError, match="ux"):
        solution.weights(10.0)
    with pytest.raises(InputError, match="self weight"):
        solve_member(member, STEEL, 10.0)


def test_point_items_are_the_loads_then_the_reactions():
    length, p = 4.0, 8e3
    s = solve(length, [support(0.0, "pin"), support(length, "roller")], [point(1.0, fy=-p)])
    at, forces = s.point_items()
    np.testing.assert_allclose(at, [1.0, 0.0, length])
    # Statics: R = P b / L and P a / L (AISC Table 3-23 case 8).
    np.testing.assert_allclose(forces[:, FY], [-p, p * 3.0 / length, p * 1.0 / length], rtol=STATICS)


def test_deflection_curve_evaluated_a_few_stations_at_a_time(monkeypatch: pytest.MonkeyPatch):
    """The element loads' integrals evaluated a small block of stations at a time (as for a very long
    patterned member) give the same deflection curve: AISC Table 3-23 case 2, as above."""
    from sizer.analysis import element_loads

    monkeypatch.setattr(element_loads, "BLOCK_ENTRIES", 7)
    length, w = 6.0, 9e3
    member = member_of(length, [support(0.0, "pin"), support(length, "roller")],
                       [LineLoad("load", 0.0, length, (0.0, 0.0, 0.0, 0.0), (0.0, -w, 0.0, 0.0))])
    s = solve_case(member, member.loads, STEEL, "load")
    xs = np.linspace(0.0, length, 37)
    expected = w * xs * (7 * length**4 - 10 * length**2 * xs**2 + 3 * xs**4) / (360 * EI * length)
    np.testing.assert_allclose(s.displacements(xs)[:, UY], -expected, rtol=DEFLECTION, atol=DEFLECTION * expected.max())
