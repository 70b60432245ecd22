"""`sizer forces` from the command line: docs/design.md section 6 JSON, both sides of a concentrated load,
cuts on request, units, and the cautions. Check values: simply supported beam with a point load P
at a: R_left = Pb/L, M under the load = Pab/L (AISC Manual Table 3-23, from memory)."""

from __future__ import annotations

import json
import textwrap

import pytest
from typer.testing import CliRunner

from sizer.cli import app

BEAM = """\
[member]
length = "5 m"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "5 m"
type = "roller"

[[loads]]
type = "point"
at = "2 m"
fy = "-10 kN"
"""


@pytest.fixture
def beam(tmp_path):
    path = tmp_path / "beam.toml"
    path.write_text(textwrap.dedent(BEAM))
    return path


def test_json_reactions_and_cuts_both_sides_of_the_load(beam):
    result = CliRunner().invoke(app, ["forces", str(beam), "--at", "2 m", "--at", "3500 mm", "--json"])
    assert result.exit_code == 0, result.output
    whole = json.loads(result.stdout)
    [document] = whole["combinations"]  # always a list (docs/design.md section 6), even of one
    P, a, b, L = 10e3, 2.0, 3.0, 5.0
    assert document["combination"] == "all"
    assert document["reactions"][0]["Fy"] == pytest.approx(P * b / L, rel=1e-12)  # Pb/L
    assert document["reactions"][1]["Fy"] == pytest.approx(P * a / L, rel=1e-12)  # Pa/L
    at_load, beyond = document["cuts"]
    assert at_load["at"] == pytest.approx(2.0)
    assert at_load["M"] == pytest.approx(P * a * b / L, rel=1e-12)  # Pab/L, sagging positive
    assert at_load["left"]["V"] == pytest.approx(P * b / L, rel=1e-12)  # beam convention: V = -Vy
    assert at_load["right"]["V"] == pytest.approx(-P * a / L, rel=1e-12)
    assert at_load["left"]["V"] - at_load["right"]["V"] == pytest.approx(P, rel=1e-12)  # the jump equals P
    assert "left" not in beyond and beyond["M"] == pytest.approx(P * a / L * (L - 3.5), rel=1e-12)
    assert set(beyond) >= {"at", "N", "Vy", "Vz", "T", "My", "Mz", "V", "M"}
    assert document["deflection"] is None  # no section: no deflections, and the output says so
    assert any("No section" in note for note in whole["assumptions"])
    assert len(whole["cautions"]) == 4


def test_terminal_summary_has_units_and_cautions(beam):
    result = CliRunner().invoke(app, ["forces", str(beam), "--at", "2 m"])
    assert result.exit_code == 0, result.output
    text = result.stdout
    assert "12.00 kN·m" in text  # Pab/L = 10 x 2 x 3 / 5
    assert "6.000 kN" in text and "Cautions" in text and "qualified engineer" in text


def test_us_units_display(beam):
    result = CliRunner().invoke(app, ["forces", str(beam), "--units", "us"])
    assert result.exit_code == 0, result.output
    assert "8.851 kip·ft" in result.stdout  # 12 kN*m / (4448.2216 N x 0.3048 m) (NIST SP 811 factors)


def test_unknown_combination_and_bad_plot_name_are_bad_input(beam, tmp_path):
    result = CliRunner().invoke(app, ["forces", str(beam), "--combination", "wind"])
    assert result.exit_code == 2 and "--combination" in result.stderr
    result = CliRunner().invoke(app, ["forces", str(beam), "--plot", str(tmp_path / "diagram.bmp")])
    assert result.exit_code == 2 and "--plot" in result.stderr
    assert not (tmp_path / "diagram.bmp").exists()


def test_several_combinations_are_listed(beam):
    text = beam.read_text() + '\n[[loads]]\ntype = "line"\ncase = "dead"\nwy = "-1 kN/m"\n[combinations]\n"a" = { load = 1.0 }\n"b" = { load = 1.0, dead = 2.0 }\n'
    beam.write_text(text)
    result = CliRunner().invoke(app, ["forces", str(beam), "--json"])
    document = json.loads(result.stdout)
    names = [entry["combination"] for entry in document["combinations"]]
    assert names == ["a", "b"]
    # combination b adds 2 x 1 kN/m x 5 m, half to each support (wL/2, AISC Table 3-23)
    assert document["combinations"][1]["reactions"][0]["Fy"] == pytest.approx(6e3 + 5e3, rel=1e-12)
