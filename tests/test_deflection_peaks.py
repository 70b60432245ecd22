"""The largest deflection of a span is found exactly, not on a grid: inside an element (at the point
where the slope is zero) and at a hinge, where the curve has a kink.

References (Euler-Bernoulli beams, AISC Manual Table 3-23, from memory):
- cantilever, point load P at the free end: tip deflection P a^3 / (3 EI);
- simply supported, point load P at distance b from the right support: largest deflection
  P b (L^2 - b^2)^(3/2) / (9 sqrt(3) L EI), at x = sqrt((L^2 - b^2) / 3) from the left support;
- simply supported, uniform w: 5 w L^4 / (384 EI) at midspan.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sizer.analysis import solve_member, spans
from sizer.checks.deflection import solution_span_deflections
from sizer.model import Hinge, LineLoad, Member, PointLoad, Stiffness, Support

EI = 3.7e6  # N m^2, any
STIFFNESS = Stiffness(1e9, 1e6, EI, 2 * EI)
EXACT = 1e-9  # relative: the peak against the closed form


def pin(at: float, label: str = "roller", held: frozenset = frozenset({"uy", "uz", "rx"})) -> Support:
    return Support(at, held, label=label)


def peaks(member: Member) -> list[tuple[float, float, str]]:
    solution = solve_member(member, STIFFNESS, None)
    return solution_span_deflections(solution, spans(solution.member), solution.combination_names)


@settings(max_examples=15, deadline=None)
@given(length=st.floats(3.0, 9.0), fraction=st.floats(0.2, 0.8), force=st.floats(1e3, 5e4))
def test_a_hinge_peak_is_found_at_the_kink(length: float, fraction: float, force: float) -> None:
    """Fixed at 0, hinge at a, roller at L, P at the hinge: the part a..L is simply supported by the
    hinge and the roller and carries nothing, so the hinge deflects as a cantilever's tip,
    P a^3 / (3 EI), and the part beyond it is straight: the span's largest deflection is at the kink."""
    a = fraction * length
    fixed = Support(0.0, frozenset({"ux", "uy", "uz", "rx", "ry", "rz"}), label="fixed")
    member = Member(length, "steel", (fixed, pin(length)), (PointLoad("load", a, (0.0, -force, 0.0)),), {"load": {"load": 1.0}},
                    self_weight_case=None, hinges=(Hinge(a),))
    [(value, at, name)] = peaks(member)
    assert value == pytest.approx(force * a**3 / (3 * EI), rel=EXACT)
    assert at == pytest.approx(a, abs=1e-9 * length) and name == "load"


@settings(max_examples=15, deadline=None)
@given(length=st.floats(2.0, 9.0), fraction=st.floats(0.05, 0.45), force=st.floats(1e3, 5e4))
def test_the_peak_inside_an_element_is_where_the_slope_is_zero(length: float, fraction: float, force: float) -> None:
    """A simple span with P at b from the right support: the largest deflection (between the load
    and the far support, where no grid point need fall) against the closed form, and its place."""
    b = fraction * length
    member = Member(length, "steel", (pin(0.0, "pin", frozenset({"ux", "uy", "uz", "rx"})), pin(length)),
                    (PointLoad("load", length - b, (0.0, -force, 0.0)),), {"load": {"load": 1.0}}, self_weight_case=None)
    [(value, at, _)] = peaks(member)
    assert value == pytest.approx(force * b * (length**2 - b**2) ** 1.5 / (9 * math.sqrt(3) * length * EI), rel=EXACT)
    assert at == pytest.approx(math.sqrt((length**2 - b**2) / 3), rel=1e-6)


def test_uniform_load_on_a_simple_span() -> None:
    length, w = 5.3, 7e3
    member = Member(length, "steel", (pin(0.0, "pin", frozenset({"ux", "uy", "uz", "rx"})), pin(length)),
                    (LineLoad("load", 0.0, length, (0.0, -w, 0.0, 0.0), (0.0, -w, 0.0, 0.0)),), {"load": {"load": 1.0}}, self_weight_case=None)
    [(value, at, _)] = peaks(member)
    assert value == pytest.approx(5 * w * length**4 / (384 * EI), rel=EXACT) and at == pytest.approx(length / 2, rel=1e-6)
