"""An equal-leg angle strut buckles about its weaker principal axis, and its mode is named so.

Check values: Euler's load of a pinned column P = pi^2 E I / L^2 (common practice) with the minor
principal second moment I_v of an L 50x50x5; handbook value I_v = 4.59 cm^4 (EN 10056-1 angle
tables, from memory; the shipped section's fillet radius differs a little, so 3 % is allowed).
"""

from __future__ import annotations

import math

import pytest

import sizer

STRUT = """
[member]
length = "2 m"
material = "mild-steel"
section = "L 50x50x5"
self_weight = false
[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "2 m"
type = "roller"
[[loads]]
type = "point"
at = "2 m"
fx = "-20 kN"
"""


def test_equal_angle_strut_buckles_about_its_minor_principal_axis() -> None:
    result = sizer.check(sizer.member_from_text(STRUT, "strut.toml"))
    buckling = next(c for c in result.report.checks if c.check == "buckling")
    assert buckling.extra["mode"].startswith("flexural minor principal")
    E, L, I_v = 200e9, 2.0, 4.59e-8  # Pa, m, m^4 (handbook I_v, from memory)
    assert buckling.extra["critical_load"] == pytest.approx(math.pi**2 * E * I_v / L**2, rel=0.03)
