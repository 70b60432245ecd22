"""Span tables: the longest span and the largest load found on the full check, against closed forms.

Closed forms (simply supported beam under a uniform load w, span L): M max = w L^2 / 8 and midspan
deflection 5 w L^4 / (384 E I) (AISC Manual Table 3-23, from memory; docs/references.md). Cantilever:
M at the root = w L^2 / 2 (same table). Two equal continuous spans, uniform load on both: support
moment -0.125 w L^2 (a handbook's continuous-beam table, from memory; docs/references.md). Rectangle
b x h: S = b h^2 / 6, I = b h^3 / 12 (elementary beam theory). IPE 300: Wel,y = 557 cm^3,
Iy = 8356 cm^4 (handbook values, from memory; docs/references.md: about 1 %).
"""

from __future__ import annotations

import json
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer.cli import app
from sizer.span_table import Trial, largest_passing, read_span_table, run_span_table, trial_member
from tests.steel import STEEL_TOML

FB = 165e6  # bending allowable, Pa (tests/steel.py)
E = 200e9
B, H = 0.010, 0.100  # FL 100x10, m
S_FLAT, I_FLAT = B * H**2 / 6, B * H**3 / 12
S_IPE, I_IPE = 557e-6, 8356e-8  # handbook, from memory

# Without a yield strength the stability checks use elastic critical stresses / SF alone (docs/design.md section
# 10); for these sections (a deck holds them sideways) those lie far above the bending allowable, so
# bending governs as the closed form assumes. With one, the local check's Johnson reduction of the
# IPE flanges would govern by a few per cent.
CATALOGUE = STEEL_TOML.replace('yield_strength = "250 MPa"\n', "") + """
[[sections]]
name = "FL 100x10"
shape = "rectangle"
depth = "100 mm"
width = "10 mm"

[[sections]]
name = "IPE 300"
shape = "i_beam"
depth = "300 mm"
width = "150 mm"
web_thickness = "7.1 mm"
flange_thickness = "10.7 mm"
root_radius = "15 mm"
"""


def table_file(tmp_path, body: str, name: str = "table.toml"):
    (tmp_path / "catalogue.toml").write_text(CATALOGUE)
    path = tmp_path / name
    path.write_text("[span_table]\nmaterial = \"steel\"\nself_weight = false\nrestraint = \"continuous\"\n" + body)
    return path


def run(tmp_path, body: str) -> dict:
    """section -> rows of a span table run on one process (no progress bar)."""
    path = table_file(tmp_path, body)
    result = run_span_table(read_span_table(path), [tmp_path / "catalogue.toml"], jobs=1, show_progress=False)
    return {entry["section"]: entry["rows"] for entry in result.sections}


def bending_span(w: float, modulus: float, moment_factor: float = 1 / 8) -> float:
    """L with moment_factor w L^2 = Fb S."""
    return math.sqrt(FB * modulus / (moment_factor * w))


def deflection_span(w: float, inertia: float, limit: float) -> float:
    """L with 5 w L^4 / (384 E I) = L / limit."""
    return (384 * E * inertia / (5 * w * limit)) ** (1 / 3)


def assert_on_grid_below(found: float, exact: float, resolution: float, relative: float) -> None:
    """`found` is the grid value just below `exact` (the next step fails), within `relative` of exact."""
    assert found <= exact * (1 + relative) + 1e-9
    assert found + resolution >= exact * (1 - relative) - 1e-9


def test_longest_span_for_bending_is_the_closed_form(tmp_path):
    rows = run(tmp_path, 'layout = "simple"\nmode = "span"\nloads = ["-2 kN/m", "-10 kN/m"]\nresolution = "10 mm"\n')
    for row, w in zip(rows["FL 100x10"], (2e3, 10e3)):
        assert row["governing"] in ("bending", "interaction")  # fb/Fb with no axial force: the same ratio
        assert_on_grid_below(row["longest_span"], bending_span(w, S_FLAT), 0.01, 1e-4)
    for row, w in zip(rows["IPE 300"], (2e3, 10e3)):
        assert row["governing"] in ("bending", "interaction")
        assert_on_grid_below(row["longest_span"], bending_span(w, S_IPE), 0.01, 0.01)  # handbook Wel,y within about 1 %


def test_longest_span_for_deflection_is_the_closed_form(tmp_path):
    rows = run(tmp_path, 'layout = "simple"\nmode = "span"\nloads = ["-0.5 kN/m"]\nresolution = "5 mm"\n'
                         '[span_table.checks]\ndeflection_limit = 360\n')
    (flat,), (ipe,) = rows["FL 100x10"], rows["IPE 300"]
    assert flat["governing"] == ipe["governing"] == "deflection"
    assert_on_grid_below(flat["longest_span"], deflection_span(500, I_FLAT, 360), 0.005, 1e-4)
    assert_on_grid_below(ipe["longest_span"], deflection_span(500, I_IPE, 360), 0.005, 0.004)  # handbook Iy within about 1 %: L^3


def test_largest_load_is_the_closed_form_to_half_a_percent(tmp_path):
    rows = run(tmp_path, 'layout = "cantilever"\nmode = "load"\nlengths = ["0.8 m", "1.5 m"]\n')
    for row in rows["FL 100x10"]:
        exact = 2 * FB * S_FLAT / row["length"] ** 2  # cantilever: w L^2 / 2 at the root
        assert -row["largest_load"] <= exact * (1 + 1e-6)
        assert -row["largest_load"] * 1.005 >= exact * (1 - 1e-6)


def test_two_continuous_spans_are_limited_by_the_support_moment(tmp_path):
    rows = run(tmp_path, 'layout = "continuous"\nspans = 2\nmode = "span"\nloads = ["-4 kN/m"]\nresolution = "10 mm"\n')
    (flat,) = rows["FL 100x10"]
    assert_on_grid_below(flat["longest_span"], bending_span(4e3, S_FLAT, 0.125), 0.01, 1e-4)


def test_restraint_option_maps_to_member_restraints(tmp_path):
    decked = read_span_table(table_file(tmp_path, 'layout = "simple"\nloads = ["-1 kN/m"]\n', "a.toml"))
    deck = trial_member(decked, "FL 100x10", 4.0, decked.loads[0])
    (restraint,) = deck.restraints
    assert (restraint.start, restraint.end, restraint.lateral, restraint.twist, restraint.height) == (0.0, 4.0, True, True, "top")
    path = tmp_path / "b.toml"
    path.write_text('[span_table]\nmaterial = "steel"\nrestraint = "1.5 m"\nlayout = "continuous"\nspans = 2\nloads = ["-1 kN/m"]\n')
    braced = trial_member(read_span_table(path), "FL 100x10", 4.0, decked.loads[0])
    assert [(r.start, r.end) for r in braced.restraints] == [(1.5, 1.5), (3.0, 3.0), (5.5, 5.5), (7.0, 7.0)]
    assert all(r.lateral and r.twist for r in braced.restraints)
    path.write_text('[span_table]\nmaterial = "steel"\nrestraint = "supports"\nloads = ["-1 kN/m"]\n')
    assert trial_member(read_span_table(path), "FL 100x10", 4.0, decked.loads[0]).restraints == ()


@pytest.mark.parametrize("body", [
    'self_weight = false\nloads = ["-1 kN/m", "-3 kN"]\ndead_load = "-0.5 kN/m"\nrestraint = "continuous"\n',
    'layout = "continuous"\nspans = 3\nrestraint = "1.5 m"\nloads = ["-2 kN/m"]\n[span_table.checks]\ndeflection_limit = 250\n'
    'deflection_combinations = ["dead + imposed"]\n',
    'layout = "cantilever"\nmode = "load"\nlengths = ["1.2 m"]\nload = "-3 kN"\nself_weight = "own weight"\n'
    '[span_table.combinations]\n"1.35 G + 1.5 Q, \\"quoted\\" ü" = { "own weight" = 1.35, imposed = 1.5 }\n'
    '[materials.steel]\nelastic_modulus = "200 GPa"\nshear_modulus = "77 GPa"\ndensity = "7850 kg/m^3"\n'
    '[materials.steel.allowable]\ntension = "150 MPa"\ncompression = "150 MPa"\nbending = "165 MPa"\nshear = "100 MPa"\n',
])
def test_a_trial_member_is_its_tables_read_as_a_member_file(tmp_path, body):
    """A trial's member is read from its tables with no text between them; the same tables written
    as TOML by tomlkit and read as a member file give the same Member (a program invariant)."""
    import tomlkit

    from sizer.inputfile import parse_member_text
    from sizer.span_table.members import member_document

    path = tmp_path / "table.toml"
    path.write_text('title = "Invariant"\n[span_table]\nmaterial = "steel"\n' + body, encoding="utf-8")
    spec = read_span_table(path)
    load = (spec.loads or (spec.load,))[-1]
    for span in (0.75, 4.0, 1 / 3):
        text = tomlkit.dumps(member_document(spec, "IPE 300", span, load))
        assert trial_member(spec, "IPE 300", span, load) == parse_member_text(text, path)


def test_command_writes_json_csv_and_plot(tmp_path):
    path = table_file(tmp_path, 'mode = "span"\nloads = ["-2 kN/m", "-3 kN"]\nresolution = "20 mm"\n')
    result = CliRunner().invoke(app, ["span-table", str(path), "--catalogue", str(tmp_path / "catalogue.toml"), "--jobs", "1", "--json",
                                      "--csv", str(tmp_path / "t.csv"), "--plot", str(tmp_path / "t.png")])
    assert result.exit_code == 0, result.output
    document = json.loads(result.stdout)
    assert [entry["section"] for entry in document["sections"]] == ["FL 100x10", "IPE 300"]  # by mass per length
    assert set(document["sections"][0]["rows"][0]) >= {"load", "longest_span", "governing"}
    assert document["cautions"]
    point = document["sections"][0]["rows"][1]
    assert point["kind"] == "point"
    exact = 4 * FB * S_FLAT / 3e3  # P L / 4 at midspan (docs/references.md, AISC Table 3-23, from memory)
    assert_on_grid_below(point["longest_span"], exact, 0.02, 1e-4)
    assert (tmp_path / "t.csv").read_text().startswith("section,")
    assert (tmp_path / "t.png").read_bytes()[:4] == b"\x89PNG"


@pytest.mark.parametrize("body, key", [
    ('layout = "arch"\nloads = ["-1 kN/m"]\n', "span_table.layout"),
    ('loads = ["-1 kN"]\n[span_table.checks]\ndeflection_limt = 360\n', "span_table.checks.deflection_limt"),
    ('mode = "load"\nlengths = ["2 m"]\nresolution = "5 mm"\n', "span_table.resolution"),
    ('loads = ["-1 kPa"]\n', "span_table.loads[1]"),
    ('loads = ["-1 kN/m"]\n[span_table.checks]\ndeflection_limit = 1979-05-27\n', "span_table.checks.deflection_limit"),  # a date: once a traceback
])
def test_bad_input_is_one_line_naming_file_and_key(tmp_path, body, key):
    path = table_file(tmp_path, body)
    result = CliRunner().invoke(app, ["span-table", str(path), "--catalogue", str(tmp_path / "catalogue.toml"), "--jobs", "1",
                                      "--csv", str(tmp_path / "t.csv")])
    assert result.exit_code == 2
    lines = result.output.strip().splitlines()
    assert len(lines) == 1 and str(path) in lines[0] and key in lines[0] and "Traceback" not in result.output
    assert not (tmp_path / "t.csv").exists()


@settings(max_examples=200, deadline=None)
@given(threshold=st.integers(-60, 400), start=st.integers(-50, 400), power=st.floats(0.3, 4.0), noise=st.floats(-0.3, 0.3))
def test_search_finds_the_boundary_whatever_the_start_and_guesses(threshold, start, power, noise):
    """Invariant (common practice for bracketing searches): with trials passing up to a threshold and
    failing above it, the result is the threshold and the next step, whatever the guesses say."""
    lowest, highest = -50, 300

    def trial(k: int) -> Trial:
        utilization = ((k - lowest + 1) / (threshold - lowest + 1.5)) ** power
        return Trial(k <= threshold, utilization, "bending")

    def guess(points):
        return points[-1][0] * (1 + noise) + 3

    found = largest_passing(trial, start, lowest, highest, guess)
    expected = min(max(threshold, lowest - 1), highest)
    assert found.passing == (expected if expected >= lowest else None)
    assert found.failing == (expected + 1 if expected < highest else None)
    assert len(found.trials) <= 4 * math.ceil(math.log2(highest - lowest + 2)) + 4
