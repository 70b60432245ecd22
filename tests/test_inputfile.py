"""Member files: what is read, and every bad input of docs/design.md section 8 that concerns member files:
one line naming file, key (and line) and the fix, exit code 2, no traceback, nothing written."""

from __future__ import annotations

import textwrap
from pathlib import Path

import pytest
from typer.testing import CliRunner

from sizer.cli import app
from sizer.errors import InputError
from sizer.inputfile import read_member_file

GOOD = """\
title = "Test beam"

[member]
length = "6 m"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "6 m"
type = "roller"

[[loads]]
type = "point"
case = "imposed"
at = "2 m"
fy = "-12 kN"

[[loads]]
type = "line"
case = "dead"
wy = "-2.5 kN/m"
wy_end = "-4 kN/m"
"""


def write(tmp_path: Path, text: str) -> Path:
    path = tmp_path / "member.toml"
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return path


def test_reads_units_to_si(tmp_path):
    member = read_member_file(write(tmp_path, GOOD))
    assert member.length == pytest.approx(6.0)
    assert member.loads[0].force == pytest.approx((0.0, -12000.0, 0.0))
    assert member.loads[1].q_start[1] == pytest.approx(-2500.0)
    assert member.loads[1].q_end[1] == pytest.approx(-4000.0)
    assert member.loads[1].start == 0.0 and member.loads[1].end == pytest.approx(6.0)
    assert member.supports[0].restrain == frozenset({"ux", "uy", "uz", "rx"})  # docs/design.md section 3
    assert member.supports[1].restrain == frozenset({"uy", "uz", "rx"})
    # default combination: every case x 1.0 (docs/design.md section 3)
    assert member.combinations == {"all": {"imposed": 1.0, "dead": 1.0}}


def test_us_units_convert_exactly(tmp_path):
    text = GOOD.replace('"6 m"', '"20 ft"').replace('"-12 kN"', '"-3 kip"').replace('at = "2 m"', 'at = "60 in"')
    member = read_member_file(write(tmp_path, text))
    assert member.length == pytest.approx(6.096)  # 1 ft = 0.3048 m exactly (international foot)
    assert member.loads[0].force[1] == pytest.approx(-3 * 4448.2216152605)  # 1 kip = 4448.2216 N (NIST SP 811)
    assert member.loads[0].at == pytest.approx(1.524)


def test_spring_replaces_rigid_freedom(tmp_path):
    text = GOOD.replace('type = "roller"\n', 'type = "roller"\nsprings = { uy = "20 kN/mm" }\n', 1)
    member = read_member_file(write(tmp_path, text))
    assert member.supports[1].springs == {"uy": pytest.approx(2e7)}
    assert "uy" not in member.supports[1].restrain


BAD_CASES = [
    # (replace this, with this, key expected in the message)
    ('fy = "-12 kN"', 'fy = "-12"', "loads[1].fy"),  # a value without a unit
    ('fy = "-12 kN"', "fy = -12", "loads[1].fy"),  # a bare number
    ('fy = "-12 kN"', 'fy = "-12 kN/m"', "loads[1].fy"),  # the wrong dimension
    ('at = "2 m"', 'at = "7 m"', "loads[1].at"),  # a load off the member
    ('at = "6 m"', 'at = "6.5 m"', "supports[2].at"),  # a support off the member
    ('length = "6 m"', 'length = "-6 m"', "member.length"),  # a negative dimension
    ('length = "6 m"', 'length = "0 m"', "member.length"),  # a zero dimension
    ('fy = "-12 kN"', 'fy = "nan kN"', "loads[1].fy"),  # NaN
    ('fy = "-12 kN"', 'fy = "inf kN"', "loads[1].fy"),  # infinity
    ('type = "pin"', 'type = "hinge"', "supports[1].type"),  # an unknown support type
    ('type = "point"', 'type = "pressure"', "loads[1].type"),  # an unknown load type
    ('fy = "-12 kN"', 'fy = "-12 kN"\nfq = "1 kN"', "loads[1].fq"),  # an unknown key
    ('self_weight = false', 'self_weight = "dead"\n[combinations]\n"imposed only" = { imposed = 1.0 }', "member.self_weight"),
    ('self_weight = false', 'self_weight = false\n[combinations]\nc1 = { wind = 1.0 }', "combinations.c1.wind"),
    ('wy_end = "-4 kN/m"', 'wy_end = "-4 kN/m"\nfrom = "5 m"\nto = "2 m"', "loads[2].to"),
]


@pytest.mark.parametrize("old, new, key", BAD_CASES)
def test_bad_member_file_is_one_clear_line_exit_2(tmp_path, old, new, key):
    path = write(tmp_path, GOOD.replace(old, new, 1))
    before = sorted(p.name for p in tmp_path.iterdir())
    result = CliRunner().invoke(app, ["forces", str(path)])
    assert result.exit_code == 2, result.output
    message = result.stderr.strip()
    assert "\n" not in message and "Traceback" not in result.output
    assert str(path) in message and key in message and "fix:" in message
    assert sorted(p.name for p in tmp_path.iterdir()) == before  # nothing written


def test_error_names_the_line(tmp_path):
    path = write(tmp_path, GOOD.replace('at = "2 m"', 'at = "9 m"'))
    with pytest.raises(InputError) as caught:
        read_member_file(path)
    lines = path.read_text().splitlines()
    assert caught.value.line is not None and "9 m" in lines[caught.value.line - 1]


def test_mechanism_is_bad_input(tmp_path):
    # two rollers and an axial load: nothing holds ux (common practice: a roller gives one reaction)
    text = GOOD.replace('type = "pin"', 'type = "roller"').replace('fy = "-12 kN"', 'fx = "5 kN"')
    result = CliRunner().invoke(app, ["forces", str(write(tmp_path, text))])
    assert result.exit_code == 2
    assert "ux" in result.stderr and "supports" in result.stderr


def test_unloaded_free_freedom_is_not_a_mechanism(tmp_path):
    text = GOOD.replace('type = "pin"', 'type = "roller"')
    result = CliRunner().invoke(app, ["forces", str(write(tmp_path, text)), "--json"])
    assert result.exit_code == 0, result.output


def test_cut_off_the_member_is_bad_input(tmp_path):
    result = CliRunner().invoke(app, ["forces", str(write(tmp_path, GOOD)), "--at", "7 m"])
    assert result.exit_code == 2 and "--at" in result.stderr


def test_invalid_toml_names_the_line(tmp_path):
    result = CliRunner().invoke(app, ["forces", str(write(tmp_path, GOOD + "\n[member\n"))])
    assert result.exit_code == 2 and ":" in result.stderr and "TOML" in result.stderr
