"""Deflection limits as engineers give them: the single keys, and `[[checks.deflection]]` entries
with `limit`, `overhang_limit`, `combinations` and `relative_to_supports`; one test per form, and
the sizing screen against the check for every form.

References (Euler-Bernoulli beams, AISC Manual Table 3-23 and Roark Table 8.1, from memory):
- simply supported, uniform w: deflection(x) = w x (L^3 - 2 L x^2 + x^3) / (24 EI), 5wL^4/(384EI) at midspan;
- simply supported, moment M_B at one end (sagging positive): deflection(x) = M_B x (L^2 - x^2) / (6 EI L)
  (downward positive), so a hogging M_B = -P a lifts the span;
- overhang a beyond a simple span L, P at the tip: tip deflection P a^2 (L + a) / (3 EI);
- two equal spans, one span loaded: support moment -wL^2/16 (docs/references.md, continuous-beam table),
  so the loaded span deflects as the first two cases together (about 0.0092 wL^4/EI, the table's
  value from memory);
- a rigid beam on a spring k at one end settles R / k there, and the chord carries it linearly
  (Hooke's law, common practice).
Rectangle I = b h^3 / 12 (docs/references.md); E = 200 GPa (tests/steel.py). sectionproperties' I of a
rectangle is within 1e-3 of b h^3 / 12 on its mesh.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from sizer.cli import app
from sizer.sections import build_catalogue, load_catalogue
from steel import STEEL_TOML

E = 200e9
SECTIONS = {"B 20x80": (0.020, 0.080), "B 40x60": (0.040, 0.060)}  # width, depth (m)
MESH = 1e-3  # relative: deflections on sectionproperties' I against b h^3 / 12
SAME = 1e-9


def inertia(name: str) -> float:
    b, h = SECTIONS[name]
    return b * h**3 / 12


@pytest.fixture(scope="module")
def stock(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("deflection-stock")
    entries = [STEEL_TOML] + [f'[[sections]]\nname = "{name}"\nshape = "rectangle"\nwidth = "{b * 1e3:g} mm"\ndepth = "{h * 1e3:g} mm"\n'
                              for name, (b, h) in SECTIONS.items()]
    (folder / "stock.toml").write_text("\n".join(entries), encoding="utf-8")
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("SIZER_CACHE_DIR", str(tmp_path_factory.getbasetemp() / "section-cache"))
        build_catalogue(list(load_catalogue([folder]).sections.values()))
    return folder


def member(supports: list[tuple[float, str]], length: float, loads: str, checks: str, section: str = "B 20x80") -> str:
    """A member file: supports (position m, type or springs), loads and checks as given; held
    sideways and in twist along its length; no self-weight."""
    text = f'[member]\nlength = "{length!r} m"\nmaterial = "steel"\nsection = "{section}"\nself_weight = false\n'
    for at, kind in supports:
        text += f'[[supports]]\nat = "{at!r} m"\n' + (f'type = "{kind}"\n' if kind in ("pin", "roller") else kind + "\n")
    text += f'[[restraints]]\nfrom = "0 m"\nto = "{length!r} m"\nhold = ["lateral", "twist"]\n'
    return text + loads + checks + STEEL_TOML


def uniform(case: str, w: float, pattern: bool = False) -> str:
    return f'[[loads]]\ntype = "line"\ncase = "{case}"\nwy = "{-w!r} N/m"\n' + ("pattern = true\n" if pattern else "")


def run_check(folder: Path, text: str, stock: Path) -> dict:
    path = folder / "member.toml"
    path.write_text(text, encoding="utf-8")
    result = CliRunner().invoke(app, ["check", str(path), "--catalogue", str(stock), "--json"])
    assert result.exit_code in (0, 1), result.stdout + result.stderr
    return json.loads(result.stdout)


def deflection(document: dict) -> dict:
    return next(entry for entry in document["checks"] if entry["check"] == "deflection")


def simple_span(x: np.ndarray, w: float, L: float, EI: float) -> np.ndarray:
    """Downward deflection of a simply supported span under uniform w."""
    return w * x * (L**3 - 2 * L * x**2 + x**3) / (24 * EI)


def end_moment(x: np.ndarray, moment: float, L: float, EI: float) -> np.ndarray:
    """Downward deflection of a simply supported span under a sagging end moment at x = L."""
    return moment * x * (L**2 - x**2) / (6 * EI * L)


# ----------------------------------------------------------------------------------------------
# one test per form

def test_single_keys_still_work(tmp_path: Path, stock: Path) -> None:
    """deflection_limit = 250 on a simple span: 5wL^4/(384EI) against L/250."""
    L, w = 3.0, 2000.0
    document = run_check(tmp_path, member([(0.0, "pin"), (L, "roller")], L, uniform("imposed", w), "[checks]\ndeflection_limit = 250\n"), stock)
    found = deflection(document)
    assert found["demand"] == pytest.approx(5 * w * L**4 / (384 * E * inertia("B 20x80")), rel=MESH)
    assert found["allowable"] == pytest.approx(L / 250, rel=SAME) and found["limit"] == 250
    assert any("Deflection limits: span/250, overhang/125" in note for note in document["assumptions"])


def test_an_entry_limits_spans_and_halves_for_overhangs(tmp_path: Path, stock: Path) -> None:
    """limit = 300 alone: the overhang gets 300 / 2. A tip load P on a 1 m overhang of a 3 m span:
    the tip deflects P a^2 (L + a) / (3 EI) against a / 150; the span lifts under the end moment
    -P a (its largest found here on a fine grid) against L / 300."""
    L, a, P = 3.0, 1.0, 1500.0
    EI = E * inertia("B 20x80")
    loads = f'[[loads]]\ntype = "point"\nat = "{L + a!r} m"\nfy = "{-P!r} N"\n'
    document = run_check(tmp_path, member([(0.0, "pin"), (L, "roller")], L + a, loads, "[[checks.deflection]]\nlimit = 300\n"), stock)
    tip = P * a**2 * (L + a) / (3 * EI)
    lift = np.abs(end_moment(np.linspace(0, L, 20001), -P * a, L, EI)).max()
    assert tip / (a / 150) > lift / (L / 300)  # the overhang governs
    found = deflection(document)
    assert found["demand"] == pytest.approx(tip, rel=MESH) and found["allowable"] == pytest.approx(a / 150, rel=SAME)
    assert found["at"] == pytest.approx(L + a) and "overhang" in found["detail"] and found["limit"] == 150


def test_an_overhang_limit_alone_checks_the_overhangs_only(tmp_path: Path, stock: Path) -> None:
    """overhang_limit = 200 without limit: the overhang is checked (a / 200); a member without an
    overhang has nothing this limit applies to, and says so."""
    L, a, P = 3.0, 1.0, 1500.0
    loads = f'[[loads]]\ntype = "point"\nat = "{L + a!r} m"\nfy = "{-P!r} N"\n'
    entry = "[[checks.deflection]]\noverhang_limit = 200\n"
    found = deflection(run_check(tmp_path, member([(0.0, "pin"), (L, "roller")], L + a, loads, entry), stock))
    assert found["demand"] == pytest.approx(P * a**2 * (L + a) / (3 * E * inertia("B 20x80")), rel=MESH)
    assert found["allowable"] == pytest.approx(a / 200, rel=SAME)
    none = deflection(run_check(tmp_path, member([(0.0, "pin"), (L, "roller")], L, uniform("imposed", 1000.0), entry), stock))
    assert none["made"] is False and "overhangs only" in none["detail"]


def test_an_entry_applies_to_its_combinations_and_all_their_arrangements(tmp_path: Path, stock: Path) -> None:
    """limit = 360 in "imposed only" on two equal spans with patterned imposed load: the worst
    arrangement is one span loaded, the span deflecting as a simple span plus the end moment
    -wL^2/16 (about 0.0092 wL^4/EI); the dead load is not in that combination."""
    L, w, dead = 3.0, 3000.0, 5000.0
    EI = E * inertia("B 20x80")
    loads = uniform("imposed", w, pattern=True) + uniform("dead", dead)
    checks = ('[combinations]\n"imposed only" = { imposed = 1.0 }\n"dead + imposed" = { dead = 1.0, imposed = 1.0 }\n'
              '[[checks.deflection]]\nlimit = 360\ncombinations = ["imposed only"]\n')
    found = deflection(run_check(tmp_path, member([(0.0, "pin"), (L, "roller"), (2 * L, "roller")], 2 * L, loads, checks), stock))
    x = np.linspace(0.0, L, 20001)
    expected = (simple_span(x, w, L, EI) + end_moment(x, -w * L**2 / 16, L, EI)).max()
    assert expected == pytest.approx(0.0092 * w * L**4 / EI, abs=0.00005 * w * L**4 / EI)  # the table's value, to its digits
    assert found["demand"] == pytest.approx(expected, rel=MESH)
    assert found["combination"] in ("imposed only (imposed on span 1)", "imposed only (imposed on span 2)")


def test_relative_to_supports_false_counts_the_settlement(tmp_path: Path, stock: Path) -> None:
    """A simple span on a pin and a spring k: measured from the chord, 5wL^4/(384EI); from the
    original position, the most of the span deflection plus the settlement R/k carried linearly."""
    L, w, k = 3.0, 2000.0, 2e6
    EI = E * inertia("B 20x80")
    supports = [(0.0, "pin"), (L, 'restrain = ["uz", "rx"]\nsprings = { uy = "2000 kN/m" }')]
    x = np.linspace(0.0, L, 20001)
    absolute = (simple_span(x, w, L, EI) + (w * L / 2 / k) * x / L).max()
    for relative, expected in (("true", 5 * w * L**4 / (384 * EI)), ("false", absolute)):
        checks = f"[[checks.deflection]]\nlimit = 100\nrelative_to_supports = {relative}\n"
        found = deflection(run_check(tmp_path, member(supports, L, uniform("imposed", w), checks), stock))
        assert found["demand"] == pytest.approx(expected, rel=MESH), relative
    assert "from the original position" in found["detail"]


def test_several_entries_report_the_worst_and_name_it(tmp_path: Path, stock: Path) -> None:
    """span/360 under imposed alone and span/240 under the total (building practice, docs/references.md):
    both are checked and the worse is reported, naming its entry."""
    L, imposed, dead = 3.0, 2000.0, 2500.0
    EI = E * inertia("B 20x80")
    checks = ('[combinations]\n"imposed only" = { imposed = 1.0 }\n"total" = { dead = 1.0, imposed = 1.0 }\n'
              '[[checks.deflection]]\nlimit = 360\ncombinations = ["imposed only"]\n[[checks.deflection]]\nlimit = 240\n')
    document = run_check(tmp_path, member([(0.0, "pin"), (L, "roller")], L, uniform("imposed", imposed) + uniform("dead", dead), checks), stock)
    first = 5 * imposed * L**4 / (384 * EI) / (L / 360)
    second = 5 * (imposed + dead) * L**4 / (384 * EI) / (L / 240)
    assert second > first
    found = deflection(document)
    assert found["utilization"] == pytest.approx(second, rel=MESH)
    assert found["combination"] == "total" and "limit 2 of 2" in found["detail"] and found["limit"] == 240
    assert any("Deflection limits, each checked" in note for note in document["assumptions"])


@pytest.mark.parametrize(("checks", "key"), [
    ("[checks]\ndeflection_limit = 300\n[[checks.deflection]]\nlimit = 200\n", "checks.deflection_limit"),
    ("[[checks.deflection]]\ncombinations = []\nlimit = 200\n", "checks.deflection[1].combinations"),
    ('[[checks.deflection]]\nlimit = 200\ncombinations = ["wind"]\n', "checks.deflection[1].combinations"),
    ("[[checks.deflection]]\nrelative_to_supports = false\n", "checks.deflection[1]"),
    ('[[checks.deflection]]\nlimit = 200\nrelative_to_supports = "no"\n', "checks.deflection[1].relative_to_supports"),
    ("[[checks.deflection]]\nlimit = -5\n", "checks.deflection[1].limit"),
    ("[checks]\ndeflection = 300\n", "checks.deflection"),
])
def test_bad_deflection_limits_are_one_line_and_exit_2(tmp_path: Path, stock: Path, checks: str, key: str) -> None:
    path = tmp_path / "bad.toml"
    path.write_text(member([(0.0, "pin"), (3.0, "roller")], 3.0, uniform("imposed", 1000.0), checks), encoding="utf-8")
    result = CliRunner().invoke(app, ["check", str(path), "--catalogue", str(stock)])
    assert result.exit_code == 2, result.stdout
    [line] = result.stderr.strip().splitlines()
    assert key in line and "fix:" in line


# ----------------------------------------------------------------------------------------------
# the sizing screen honours every limit

def test_screen_gives_the_check_value_for_every_form(tmp_path: Path, stock: Path) -> None:
    """sizing's deflection screen (one matrix product for every section) against the check of each
    section on its own, for a member with patterned load, an overhang, several entries (one
    overhang-only, one absolute, one for some combinations) and self-weight: the same value."""
    from sizer import api
    from sizer.analysis import solve_member
    from sizer.checks import check_design
    from sizer.design import catalogue_for, resolve_material
    from sizer.model import Stiffness
    from sizer.sections import unit_stress_field
    from sizer.sizing import candidate_sections, design_for, screen

    loads = uniform("imposed", 1500.0, pattern=True) + uniform("dead", 800.0)
    checks = ('[combinations]\n"imposed only" = { imposed = 1.0 }\n"dead + imposed" = { dead = 1.0, imposed = 1.0 }\n'
              '[[checks.deflection]]\nlimit = 360\ncombinations = ["imposed only"]\n[[checks.deflection]]\nlimit = 240\n'
              'relative_to_supports = false\n[[checks.deflection]]\noverhang_limit = 100\n')
    text = member([(0.0, "pin"), (2.5, "roller"), (5.0, "roller")], 5.8, loads, checks).replace("self_weight = false", 'self_weight = "dead"')
    path = tmp_path / "screened.toml"
    path.write_text(text, encoding="utf-8")
    given = api.as_member(api.read_member(path))
    catalogue = catalogue_for(given, [stock])
    material = resolve_material(given, catalogue)
    candidates, table = candidate_sections(catalogue, given, material, (), None, None)
    found = screen(table, given, material, solve_member(given, Stiffness.unit(), None))
    for candidate in candidates:
        report = check_design(design_for(given, material, candidate), unit_stress_field(candidate.spec))
        checked = next(result for result in report.checks if result.check == "deflection")
        assert found.exact["deflection"][candidate.index] == pytest.approx(checked.utilization, rel=SAME), candidate.name
