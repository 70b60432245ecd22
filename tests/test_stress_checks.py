"""The full check's stress-field checks made apart (sizer.checks.stress_checks, what `sizer size` rules
a section out on before its stability solves) against the full check itself (check_design): each
value must be the full check's own, so that the largest is a proven lower bound of its utilization.
The reference is the full check, which the rest of the suite holds to published values."""

from __future__ import annotations

from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sizer.checks import CheckReport, CheckResult, check_design, stress_checks
from sizer.design import prepare
from sizer.inputfile import read_member_file
from sizer.sections import unit_stress_field

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = sorted(p for p in ROOT.glob("examples/**/*.toml") if "[member]" in p.read_text())  # member files (not schedules)
TWISTING = ["L 50x50x5", "L 75x50x6", "C 100x50x5", "C 150x75x6", "C 200x80x7"]  # shear centre off the centroid


def assert_equal_to_full(made: dict[str, CheckResult], report: CheckReport) -> None:
    """Each check made apart equals the full check's of that name: utilization (to 1e-12), demand,
    station and combination."""
    full = {result.check: result for result in report.checks}
    assert set(made) == {"axial", "bending", "shear", "equivalent", "deflection", "local", "web"}
    for name, result in made.items():
        reference = full[name]
        assert result.made == reference.made, name
        if result.made:
            assert result.made_utilization == pytest.approx(reference.made_utilization, rel=1e-12, abs=1e-12), name
            assert (result.at, result.combination) == (reference.at, reference.combination), name
    largest = max((result.made_utilization for result in made.values() if result.made), default=0.0)
    assert largest <= report.utilization * (1 + 1e-12)  # a lower bound of the full check's utilization


def checked_apart_and_in_full(member_path: Path, section: str | None) -> tuple[dict[str, CheckResult], CheckReport] | None:
    """stress_checks and check_design of the member in this section (None where the member has
    pattern arrangements: the full check adds those that govern first, and sizing keeps its path)."""
    member = read_member_file(member_path)
    design = prepare(member, section=section, need_section=True)
    field = unit_stress_field(design.spec)
    made = stress_checks(design, field)
    if made is None:
        return None
    return made[1], check_design(design, field)


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: str(p.relative_to(ROOT)))
def test_examples_in_their_sections(path: Path) -> None:
    """Each example with a drawn section, in it."""
    member = read_member_file(path)
    if member.section is None:
        pytest.skip("no section drawn")
    found = checked_apart_and_in_full(path, None)
    if found is None:
        assert member.patterning is not None
        return
    assert_equal_to_full(*found)


@pytest.mark.parametrize("section", ["L 50x50x5", "C 200x80x7"])
def test_readme_demo_in_twisting_sections(section: str) -> None:
    """The README demo (second order on) in the angle and the channel `sizer size` walks past: their
    loads at the centroid twist them, and the second-order twist joins the stresses and deflection."""
    found = checked_apart_and_in_full(ROOT / "examples" / "platform_joist.toml", section)
    assert found is not None
    assert_equal_to_full(*found)
    assert found[1].second_order is not None and found[1].utilization > 1.0


MEMBER = """
[member]
length = "{length} m"
material = "mild-steel"
self_weight = "dead"

[[supports]]
at = "0 m"
type = "{left}"

[[supports]]
at = "{length} m"
type = "roller"

[[loads]]
type = "line"
case = "dead"
wy = "{wy} kN/m"

[[loads]]
type = "point"
case = "imposed"
at = "{at} m"
fy = "{fy} kN"
fx = "{fx} kN"
{across}

[combinations]
"dead + imposed" = {{ dead = 1.2, imposed = 1.5 }}
"dead" = {{ dead = 1.0 }}

[checks]
second_order = true
{bow}
"""


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(length=st.sampled_from([1.2, 2.0, 3.1]), left=st.sampled_from(["pin", "fixed"]), wy=st.floats(-4.0, -0.2),
       where=st.floats(0.1, 0.9), fy=st.floats(-6.0, 0.0), fx=st.floats(-20.0, 20.0), across=st.sampled_from(["", 'across = "0 mm"']),
       bow=st.sampled_from(["", 'imperfection = "L/500"']), section=st.sampled_from(TWISTING))
def test_random_members_in_channels_and_angles(tmp_path: Path, length: float, left: str, wy: float, where: float, fy: float,
                                               fx: float, across: str, bow: str, section: str) -> None:
    """Random beams and beam-columns with second order on, in channels and angles: axial force either
    way, a point load at the centroid (off the shear centre: it twists them) or on the shear centre, with
    and without a bow."""
    path = tmp_path / "member.toml"
    path.write_text(MEMBER.format(length=length, left=left, wy=f"{wy:.4f}", at=f"{where * length:.4f}", fy=f"{fy:.4f}",
                                  fx=f"{fx:.4f}", across=across, bow=bow))
    found = checked_apart_and_in_full(path, section)
    assert found is not None
    assert_equal_to_full(*found)
