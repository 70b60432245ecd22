"""Second-order actions (sizer.stability.second_order, the checks on them, `sizer forces --second-order`)
against published closed forms, each source beside its value:

- pinned beam-column, uniform load w, axial compression P: M_max = (w / k^2) (sec(kL/2) - 1), k^2 = P / EI;
  in tension: M_max = (w / k^2) (1 - sech(kL/2)); equal end moments M0 in single curvature:
  M_max = M0 sec(kL/2) (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., ch. 1; from memory);
- the amplification of a beam-column's moment approaches 1 / (1 - P/Pe), Pe = pi^2 EI / L^2
  (same source; for a uniform load the exact factor is within a few per cent above it; from memory);
- a pinned column with an initial sinusoidal bow e0 under P: M_max = P e0 / (1 - P/Pe) (same source, ch. 1,
  from memory);
- a fork-supported I-beam under uniform major-axis moment M: each sine harmonic n of a sideways load
  is amplified by 1 / (1 - (M / Mcr_n)^2), Mcr_n^2 = (n pi / L)^2 EIy (GJ + (n pi / L)^2 EIw), from the
  equations EIy w'''' + (M phi)'' = q, EIw phi'''' - GJ phi'' + M w'' = 0 (Timoshenko & Gere ch. 6, from
  memory); a uniform load's harmonics are 4 q / (n pi) for odd n (Fourier series, common practice).
The section values of the I-beam are the handbook IPE 300 (tests/test_stability.py); the audit case
uses the shipped HE 200 A (EN 10365).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer.analysis import solve_member
from sizer.api import member_from_text
from sizer.cli import app
from sizer.model import Stiffness
from sizer.stability.second_order import SecondOrder
from test_stability import IPE300, E, G, section

MY, MZ = 4, 5
SUPPORTS = '[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{L} m"\ntype = "roller"\n'


HELD = '[[restraints]]\nfrom = "0 m"\nto = "{L} m"\nhold = ["lateral", "twist"]\n'  # no sideways buckling: in-plane tests


def solved(L: float, loads: str, orientation: str = "major", bow: float = 0.0, held: bool = False):
    """(first-order actions, second-order actions, xs, responses) of a pinned member from member-file
    text, no self-weight, on the IPE 300 of tests/test_stability.py; `held`: sideways and in twist
    all along (a major-axis beam-column cannot then buckle about its minor axis)."""
    text = (f'[member]\nlength = "{L} m"\nmaterial = "steel"\nself_weight = false\norientation = "{orientation}"\n'
            + SUPPORTS.format(L=L) + (HELD.format(L=L) if held else "") + loads)
    member = member_from_text(text)
    solution = solve_member(member, Stiffness.unit(), None)
    xs = np.linspace(0.0, L, 401)
    right = np.ones(xs.size, bool)
    first = solution.all_actions(xs)
    solver = SecondOrder(member, solution, section(**IPE300), bow)
    responses = solver.responses(xs, right, first)
    return first, first + np.stack([r.actions(xs, right) for r in responses]), xs, responses


def axial(P: float, L: float) -> str:
    """An axial force P (N, compression positive) at end B, held at the pin at A."""
    return f'[[loads]]\ntype = "point"\nat = "{L} m"\nfx = "{-P} N"\n'


def peak(actions: np.ndarray) -> float:
    return float(np.abs(actions[..., MY:MZ + 1]).max())


@pytest.mark.parametrize("orientation, EI, axis", [("major", E * IPE300["Iz"], "wy"), ("minor", E * IPE300["Iy"], "wy"),
                                                   ("major", E * IPE300["Iy"], "wz")])
@pytest.mark.parametrize("ratio", [0.2, 0.6, 0.9])
def test_beam_column_under_uniform_load_in_compression(orientation: str, EI: float, axis: str, ratio: float) -> None:
    L, w = 6.0, 5e3
    P = ratio * math.pi**2 * EI / L**2
    _, second, _, _ = solved(L, f'[[loads]]\ntype = "line"\n{axis} = "{-w} N/m"\n' + axial(P, L), orientation,
                             held=(orientation, axis) == ("major", "wy"))
    k = math.sqrt(P / EI)
    expected = w / k**2 * (1 / math.cos(k * L / 2) - 1)  # Timoshenko & Gere ch. 1 (from memory)
    assert peak(second) == pytest.approx(expected, rel=2e-3)


@pytest.mark.parametrize("ratio", [0.5, 2.0, 10.0])
def test_tension_lowers_the_moment(ratio: float) -> None:
    L, w, EI = 6.0, 5e3, E * IPE300["Iz"]
    T = ratio * math.pi**2 * EI / L**2
    first, second, _, _ = solved(L, f'[[loads]]\ntype = "line"\nwy = "{-w} N/m"\n' + axial(-T, L))
    k = math.sqrt(T / EI)
    expected = w / k**2 * (1 - 1 / math.cosh(k * L / 2))  # Timoshenko & Gere ch. 1 (from memory)
    assert peak(second) == pytest.approx(expected, rel=2e-3)
    assert peak(second) < peak(first) == pytest.approx(w * L**2 / 8, rel=1e-12)  # wL^2/8 (AISC Table 3-23, from memory)


@pytest.mark.parametrize("ratio", [0.3, 0.8])
def test_equal_end_moments_in_single_curvature(ratio: float) -> None:
    L, M0, EI = 5.0, 20e3, E * IPE300["Iz"]
    P = ratio * math.pi**2 * EI / L**2
    couples = f'[[loads]]\ntype = "moment"\nat = "0 m"\nmz = "{-M0} N*m"\n[[loads]]\ntype = "moment"\nat = "{L} m"\nmz = "{M0} N*m"\n'
    _, second, xs, _ = solved(L, couples + axial(P, L), held=True)
    k = math.sqrt(P / EI)
    assert peak(second) == pytest.approx(M0 / math.cos(k * L / 2), rel=2e-3)  # M0 sec(kL/2), Timoshenko & Gere ch. 1
    assert abs(second[0, 200, MZ]) == pytest.approx(peak(second), rel=1e-9)  # the peak at midspan (symmetry)


def test_amplification_approaches_one_over_one_minus_p_over_pe() -> None:
    L, w, EI = 6.0, 5e3, E * IPE300["Iz"]
    Pe = math.pi**2 * EI / L**2
    for ratio in (0.5, 0.8, 0.95):
        first, second, _, _ = solved(L, f'[[loads]]\ntype = "line"\nwy = "{-w} N/m"\n' + axial(ratio * Pe, L), held=True)
        amplification = peak(second) / peak(first)
        # 1 / (1 - P/Pe) and the exact factor for a uniform load a little above it (Timoshenko & Gere ch. 1, from memory),
        # at most the share of the load's first sine harmonic in its moment, 32 / pi^3 (Fourier series, common practice)
        assert 1.0 < amplification * (1 - ratio) < 32 / math.pi**3 * (1 + 1e-3)


def test_initial_bow_in_the_lowest_mode() -> None:
    L, EI = 6.0, E * IPE300["Iy"]
    Pe = math.pi**2 * EI / L**2
    P, e0 = 0.5 * Pe, L / 1000
    _, second, _, responses = solved(L, axial(P, L), bow=e0)
    assert responses[0].load_factor == pytest.approx(Pe / P, rel=1e-4)  # the lowest mode: Euler about the minor axis
    assert peak(second) == pytest.approx(P * e0 / (1 - P / Pe), rel=2e-3)  # P e0 / (1 - P/Pe), Timoshenko & Gere ch. 1


def test_sideways_load_on_a_beam_under_uniform_moment_is_amplified_by_the_twist_coupling() -> None:
    L, M, q = 6.0, 60e3, 500.0  # M / Mcr about 0.7
    EIy, GJ, EIw = E * IPE300["Iy"], G * IPE300["J"], E * IPE300["Iw"]
    couples = f'[[loads]]\ntype = "moment"\nat = "0 m"\nmz = "{-M} N*m"\n[[loads]]\ntype = "moment"\nat = "{L} m"\nmz = "{M} N*m"\n'
    first, second, xs, _ = solved(L, couples + f'[[loads]]\ntype = "line"\nwz = "{q} N/m"\n')
    series = 0.0
    for n in range(1, 400, 2):  # Fourier harmonics of the uniform load, each amplified (Timoshenko & Gere ch. 6, from memory)
        a = (n * math.pi / L) ** 2
        mcr_squared = a * EIy * (GJ + a * EIw)
        series += 4 * q * L**2 / (n * math.pi) ** 3 * (-1) ** ((n - 1) // 2) / (1 - M**2 / mcr_squared)
    assert abs(first[0, 200, MY]) == pytest.approx(q * L**2 / 8, rel=1e-12)
    assert abs(second[0, 200, MY]) == pytest.approx(series, rel=3e-3)
    assert abs(second[0, 200, MY]) > 1.5 * abs(first[0, 200, MY])  # a real amplification


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(ratio=st.floats(0.05, 0.9), sign=st.sampled_from([-1.0, 1.0]), w=st.floats(1e3, 2e4))
def test_compression_raises_and_tension_lowers_every_peak(ratio: float, sign: float, w: float) -> None:
    """Invariant (common practice): compression softens a pinned beam-column, tension stiffens it."""
    L, EI = 4.0, E * IPE300["Iz"]
    first, second, _, _ = solved(L, f'[[loads]]\ntype = "line"\nwy = "{-w} N/m"\n' + axial(sign * ratio * math.pi**2 * EI / L**2, L),
                                 held=True)
    assert (peak(second) > peak(first)) is (sign > 0)


# ----------------------------------------------------------------------------------------------
# the command line

runner = CliRunner()
AUDIT = """title = "Audit beam-column (invented scenario)"
[member]
length = "6 m"
material = "mild-steel"
section = "HE 200 A"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "6 m"
type = "roller"

[[loads]]
type = "point"
at = "6 m"
fx = "{P}"
[[loads]]
type = "line"
wz = "-0.49 kN/m"
"""


def check(tmp_path: Path, text: str, *extra: str) -> tuple[int, dict]:
    path = tmp_path / "member.toml"
    path.write_text(text, encoding="utf-8")
    result = runner.invoke(app, ["check", str(path), "--json", *extra])
    return result.exit_code, json.loads(result.stdout)


def by_name(document: dict, name: str) -> dict:
    return next(entry for entry in document["checks"] if entry["check"] == name)


def test_the_audit_beam_column_now_fails(tmp_path: Path) -> None:
    """HE 200 A, 6 m, 327 kN with 0.49 kN/m about the minor axis, safety factor 2 (the audit of the
    issue): first order passed at 0.999; the amplified moment makes the interaction fail."""
    code, document = check(tmp_path, AUDIT.format(P="-327 kN"))
    assert code == 1 and document["passes"] is False
    assert document["governing"] == "interaction"
    row = document["second_order"]["combinations"][0]
    assert row["first_order_moment"] == pytest.approx(0.49e3 * 36 / 8, rel=1e-9)  # wL^2/8 (AISC Table 3-23, from memory)
    EI = 200e9 * 1336e-8  # E Iz of HE 200 A about its minor axis (EN 10365 handbook, 1336 cm^4; from memory)
    k = math.sqrt(327e3 / EI)
    expected = 0.49e3 / k**2 * (1 / math.cos(k * 3) - 1)  # Timoshenko & Gere ch. 1 (from memory)
    assert row["moment"] == pytest.approx(expected, rel=0.01)  # the catalogue's Iy from its own outline, within 1 %
    assert row["amplification"] == pytest.approx(expected / (0.49e3 * 36 / 8), rel=0.01)
    governing = by_name(document, "interaction")
    assert governing["amplification"] == pytest.approx(row["amplification"], rel=1e-12)
    assert governing["first_order_moment"] == pytest.approx(row["first_order_moment"], rel=1e-9)
    off, first_order = check(tmp_path, AUDIT.format(P="-327 kN") + "[checks]\nsecond_order = false\n")
    assert first_order["second_order"] is None and by_name(first_order, "second-order")["made"] is False
    assert by_name(first_order, "interaction")["utilization"] < 1.0 < governing["utilization"]  # first order passed at 0.999
    assert off == 0


def test_a_combination_past_its_buckling_load_fails_without_an_error(tmp_path: Path) -> None:
    code, document = check(tmp_path, AUDIT.format(P="-900 kN"))  # above the minor-axis Euler load (about 730 kN)
    assert code == 1
    failing = by_name(document, "second-order")
    assert failing["made"] and failing["utilization"] > 1.0
    assert 0.0 < failing["load_factor"] < 1.0
    assert failing["load_factor"] == pytest.approx(math.pi**2 * 200e9 * 1336e-8 / 36 / 900e3, rel=0.01)  # Euler (from memory)
    assert document["second_order"]["combinations"][0]["beyond_buckling"] is True
    assert "beyond its elastic buckling load" in failing["detail"]


def test_forces_stay_first_order_unless_asked(tmp_path: Path) -> None:
    path = tmp_path / "member.toml"
    path.write_text(AUDIT.format(P="-327 kN"), encoding="utf-8")
    plain = json.loads(runner.invoke(app, ["forces", str(path), "--at", "3m", "--json"]).stdout)
    second = json.loads(runner.invoke(app, ["forces", str(path), "--at", "3m", "--json", "--second-order"]).stdout)
    assert plain["combinations"][0]["cuts"][0]["My"] == pytest.approx(-0.49e3 * 36 / 8, rel=1e-9)
    _, checked = check(tmp_path, AUDIT.format(P="-327 kN"))
    assert abs(second["combinations"][0]["cuts"][0]["My"]) == pytest.approx(checked["second_order"]["combinations"][0]["moment"], rel=1e-6)


@pytest.mark.parametrize("value", ['"L/abc"', '"L/5"', '"0 mm"', '"2 m"', '1000', '"5 kN"'])
def test_a_bad_imperfection_is_bad_input(tmp_path: Path, value: str) -> None:
    path = tmp_path / "member.toml"
    path.write_text(AUDIT.format(P="-327 kN") + f"[checks]\nimperfection = {value}\n", encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2
    assert "checks.imperfection" in result.output and "Traceback" not in result.output


def test_second_order_must_be_true_or_false(tmp_path: Path) -> None:
    path = tmp_path / "member.toml"
    path.write_text(AUDIT.format(P="-327 kN") + '[checks]\nsecond_order = "yes"\n', encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2 and "checks.second_order" in result.output


def test_a_couple_at_a_cantilever_tip_is_the_published_case(tmp_path: Path) -> None:
    """A narrow rectangle cantilever under an end couple: M_cr = (pi / 2L) sqrt(E Iy G J) (Timoshenko &
    Gere, Theory of Elastic Stability, ch. 6, from memory: half of a simply supported beam of length 2L
    under uniform moment); the record's assumptions say how the couple acts."""
    from test_stability import beam

    b, h, L = 0.012, 0.240, 3.0
    Iy, J = h * b**3 / 12, h * b**3 / 3  # rectangle (common practice); J of a thin strip
    strip = section(area=b * h, Iz=b * h**3 / 12, Iy=Iy, J=J, Iw=0.0, h=h)
    model, weights = beam(L, '[[supports]]\nat = "0 m"\ntype = "fixed"', f'[[loads]]\ntype = "moment"\nat = "{L} m"\nmz = "1 kN*m"')
    assert model.lateral_buckling(strip, weights).load_factor * 1e3 == pytest.approx(math.pi / (2 * L) * math.sqrt(E * Iy * G * J), rel=1e-4)
    text = ('[member]\nlength = "2 m"\nmaterial = "mild-steel"\nsection = "HE 200 A"\n[[supports]]\nat = "0 m"\ntype = "fixed"\n'
            '[[loads]]\ntype = "moment"\nat = "2 m"\nmz = "-10 kN*m"\n')
    _, document = check(tmp_path, text)
    assert any("Couple at the free end (2 m)" in note and "quasi-tangential" in note for note in document["assumptions"])


def test_a_channel_loaded_at_its_centroid_twists_more_under_its_moment(tmp_path: Path) -> None:
    """C 200x80x7, 4 m, 5 kN/m at the centroid (tests/test_torsion.py has its first-order closed form):
    the load's torque twists the channel, and the major-axis moment couples that twist with sideways
    bending, so the peak stress rises; an elastic member's second-order response is amplified by at
    most about 1 / (1 - 1/lambda), lambda its lateral-torsional load factor (Trahair, Flexural-Torsional
    Buckling of Structures, from memory)."""
    from test_torsion import _check

    first, second = _check(tmp_path), _check(tmp_path, checks="")
    stress = {name: by_name(doc, "bending")["demand"] for name, doc in (("first", first), ("second", second))}
    factor = by_name(second, "lateral-torsional")["load_factor"]
    assert first["second_order"] is None and second["second_order"] is not None
    assert stress["first"] * 1.05 < stress["second"] < stress["first"] / (1 - 1 / factor)
