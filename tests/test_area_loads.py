"""Area loads (`type = "area"`): a pressure on a tributary width is the line load pressure x width.

References: w = p x b for a uniform pressure p on a strip of width b (statics, common practice);
simply supported beam under uniform w: R = wL/2, M max = wL^2/8 at midspan (AISC Manual Table 3-23,
from memory); 1 lbf/ft^2 = 4.4482216152605 N / 0.3048^2 m^2 = 47.880 Pa (NIST SP 811 factors).
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer import api
from sizer.analysis import solve_member
from sizer.cli import app
from sizer.model import LineLoad, Stiffness

MEMBER = """[member]
length = "6 m"
self_weight = false
[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "{support} m"
type = "roller"
"""


def run(*args: object):
    return CliRunner().invoke(app, [str(arg) for arg in args], env={"COLUMNS": "250"})


def area_text(pressures: dict[str, float], width: float, start: float, end: float, support: float = 6.0) -> str:
    values = "\n".join(f'{key} = "{value!r} Pa"' for key, value in pressures.items())
    return MEMBER.format(support=support) + f'[[loads]]\ntype = "area"\ncase = "imposed"\nfrom = "{start!r} m"\nto = "{end!r} m"\nwidth = "{width!r} m"\n{values}\n'


def line_text(intensities: dict[str, float], start: float, end: float, support: float = 6.0) -> str:
    values = "\n".join(f'{key} = "{value!r} N/m"' for key, value in intensities.items())
    return MEMBER.format(support=support) + f'[[loads]]\ntype = "line"\ncase = "imposed"\nfrom = "{start!r} m"\nto = "{end!r} m"\n{values}\n'


pressure = st.floats(-20_000.0, 20_000.0).filter(lambda p: abs(p) > 1.0)


@settings(max_examples=30, deadline=None)
@given(py=pressure, pz=pressure, py_end=pressure, width=st.floats(0.05, 5.0),
       ends=st.tuples(st.integers(0, 600), st.integers(0, 600)).map(lambda pair: (pair[0] / 100, pair[1] / 100)).filter(
           lambda pair: abs(pair[0] - pair[1]) > 0.1))
def test_area_load_times_width_is_the_line_load(py: float, pz: float, py_end: float, width: float, ends: tuple[float, float]) -> None:
    """The member with an area load and the member with the line load p x width have the same
    reactions and internal actions everywhere (w = p b, common practice)."""
    start, end = sorted(ends)
    area = api.member_from_text(area_text({"py": py, "pz": pz, "py_end": py_end}, width, start, end), "area.toml")
    line = api.member_from_text(line_text({"wy": py * width, "wz": pz * width, "wy_end": py_end * width}, start, end), "line.toml")
    [load] = area.loads
    assert isinstance(load, LineLoad) and load.area is not None and load.area.width == pytest.approx(width, rel=1e-15)
    assert load.q_start[:3] == pytest.approx((0.0, py * width, pz * width), rel=1e-12)
    assert load.q_end[:3] == pytest.approx((0.0, py_end * width, pz * width), rel=1e-12)
    first, second = (solve_member(member, Stiffness.unit(), None) for member in (area, line))
    xs = np.linspace(0.0, 6.0, 25)
    scale = 1e-9 * (abs(py) + abs(pz) + abs(py_end)) * width * 36
    assert first.reactions("all") == pytest.approx(second.reactions("all"), abs=scale)
    assert first.actions("all", xs) == pytest.approx(second.actions("all", xs), abs=scale)


def test_simply_supported_under_an_area_load(tmp_path: Path) -> None:
    """2.5 kPa on a 1.2 m width over a 6 m span: w = 3 kN/m, R = wL/2 = 9 kN, M = wL^2/8 = 13.5 kN*m."""
    path = tmp_path / "floor.toml"
    path.write_text(MEMBER.format(support=6.0) + '[[loads]]\ntype = "area"\ncase = "imposed"\npy = "-2.5 kPa"\nwidth = "1.2 m"\n',
                    encoding="utf-8")
    result = run("forces", path, "--json", "--at", "3 m")
    assert result.exit_code == 0, result.stdout + result.stderr
    document = json.loads(result.stdout)
    [combination] = document["combinations"]
    assert combination["reactions"][0]["Fy"] == pytest.approx(9000.0, rel=1e-12)
    assert combination["cuts"][0]["M"] == pytest.approx(13500.0, rel=1e-12)
    assert any("-2.5 kPa x 1.2 m = -3 kN/m" in note for note in document["assumptions"])  # the pressure beside the line load it makes


def test_us_run_shows_the_pressure_in_us_units(tmp_path: Path) -> None:
    """-50 lbf/ft^2 x 4 ft = -200 lbf/ft = -0.2 kip/ft; shown in US units, no SI unit in the note."""
    path = tmp_path / "roof.toml"
    path.write_text(MEMBER.format(support=6.0) + '[[loads]]\ntype = "area"\ncase = "imposed"\npy = "-50 lbf/ft^2"\nwidth = "4 ft"\n',
                    encoding="utf-8")
    result = run("forces", path, "--units", "us")
    assert result.exit_code == 0, result.stdout + result.stderr
    text = " ".join(result.stdout.replace("│", " ").split())
    assert "py -50.00 lbf/ft² x 4.000 ft = -0.2000 kip/ft" in text
    assert "kPa" not in result.stdout


def test_record_shows_pressure_width_and_line_load(tmp_path: Path) -> None:
    """The record's load table gives the area load as pressure x width = line load."""
    from sizer.render.report.inputs import _loads_table

    member = api.as_member(api.member_from_text(
        MEMBER.format(support=6.0) + '[[loads]]\ntype = "area"\ncase = "imposed"\npy = "-2.5 kPa"\npy_end = "-4 kPa"\nwidth = "1.2 m"\n'
        'pattern = true\n[[supports]]\nat = "3 m"\ntype = "roller"\n', str(tmp_path / "m.toml")))

    class Shown:  # the two attributes the table reads
        mass_per_length = None

    shown = Shown()
    shown.member = member
    html = _loads_table(shown, "si")
    assert "py = -2.500 kPa → -4.000 kPa x 1.200 m = -3.000 kN/m → -4.800 kN/m" in html
    assert html.count("<td>L") == 1 and "patterned" in html  # the load as given, not its parts by span


@pytest.mark.parametrize(("table", "key", "words"), [
    ('py = "-2 kPa"', "loads[1].width", "width"),                                   # no width
    ('py = "-2 kPa"\nwidth = "0 m"', "loads[1].width", "greater than zero"),
    ('width = "1 m"', "loads[1]", "no pressure"),
    ('py_end = "-2 kPa"\nwidth = "1 m"', "loads[1].py_end", "without"),
    ('py = "-2 kN/m"\nwidth = "1 m"', "loads[1].py", "pressure"),                   # a line load's unit
    ('py = "-2 kPa"\nwidth = "1 m"\nwy = "-1 kN/m"', "loads[1].wy", "unknown key"),
    ('py = "-9e8 kPa"\nwidth = "5 m"', "loads[1].py", "beyond"),                   # p x width beyond the line-load range
])
def test_bad_area_loads_are_one_line_and_exit_2(tmp_path: Path, table: str, key: str, words: str) -> None:
    path = tmp_path / "bad.toml"
    path.write_text(MEMBER.format(support=6.0) + f'[[loads]]\ntype = "area"\n{table}\n', encoding="utf-8")
    result = run("forces", path)
    assert result.exit_code == 2, result.stdout
    [line] = result.stderr.strip().splitlines()
    assert key in line and words in line and "Traceback" not in result.output
