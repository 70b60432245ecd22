"""The Python API used the way the README shows it, against published values.

Sources: simply supported beam under a uniform load, M max = w L^2 / 8 at midspan and
R = w L / 2 (AISC Steel Construction Manual Table 3-23, from memory); IPE 300 elastic section
modulus Wel,y = 557 cm^3 (EN 10365 handbook value, from memory, docs/references.md).
"""

from __future__ import annotations

import pytest

import sizer

README_MEMBER = """
[member]
length = "6 m"
material = "mild-steel"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "6 m"
type = "roller"

[[restraints]]
from = "0 m"
to = "6 m"
hold = ["lateral", "twist"]
height = "top"

[[loads]]
type = "line"
wy = "-10 kN/m"
"""

W, L = 10e3, 6.0  # N/m, m
IPE300_WEL = 557e-6  # m^3, handbook value (from memory)


def test_forces_through_the_api_match_the_closed_form() -> None:
    member = sizer.member_from_text(README_MEMBER)
    forces = sizer.forces(member)
    assert forces.actions("3 m")["M"] == pytest.approx(W * L**2 / 8, rel=1e-12)  # AISC Table 3-23
    reactions = forces.reactions()
    assert [r["Fy"] for r in reactions] == pytest.approx([W * L / 2, W * L / 2], rel=1e-12)


def test_check_through_the_api_gives_the_handbook_bending_stress() -> None:
    result = sizer.check(sizer.member_from_text(README_MEMBER), section="IPE 300")
    bending = next(c for c in result.checks if c.check == "bending")
    # sigma = M / Wel within 1 % (the handbook modulus includes the root radii, as the mesh does)
    assert bending.demand == pytest.approx(W * L**2 / 8 / IPE300_WEL, rel=0.01)
    assert bending.at == pytest.approx(L / 2, abs=1e-9)
    assert result.to_json()["section"] == "IPE 300"
    assert result.cautions and "qualified engineer" in " ".join(result.cautions)


def test_size_through_the_api_agrees_with_check_of_its_choice() -> None:
    member = sizer.member_from_text(README_MEMBER)
    best = sizer.size(member)
    assert best.passes and best.section is not None
    again = sizer.check(member, section=best.section)
    assert again.passes
    assert best.utilization == pytest.approx(again.utilization, rel=1e-9)
    lighter = [c for c in best.candidates if c.mass_per_length < best.mass_per_length]
    assert lighter and not any(c.passes for c in lighter)


def test_results_render_as_rich_text_and_html() -> None:
    from rich.console import Console

    result = sizer.check(sizer.member_from_text(README_MEMBER), section="IPE 300")
    console = Console(width=100, record=True, color_system=None)
    console.print(result)
    text = console.export_text()
    assert "IPE 300" in text and "bending" in text and "Cautions" in text
    html = result._repr_html_()
    assert "IPE 300" in html and "bending" in html and "qualified engineer" in html
