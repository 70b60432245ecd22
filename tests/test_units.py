"""units: parsing at the edge and display. Conversion factors: NIST Special Publication 811, Guide
for the Use of the International System of Units, appendix B (1 in = 0.0254 m and 1 ft = 0.3048 m
exactly; 1 lbf = 4.448222 N; 1 psi = 6894.757 Pa; from memory). SI prefixes (k = 1e3, M = 1e6,
G = 1e9, m = 1e-3): the SI Brochure, common practice."""

from __future__ import annotations

import pytest

from sizer import units
from sizer.errors import InputError


@pytest.fixture
def fresh_unit_memory(monkeypatch, tmp_path):
    """A clean cache folder and no remembered unit factors."""
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path))
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    return tmp_path


@pytest.mark.parametrize("text, kind, expected", [
    ("1500 mm", "length", 1.5),
    ("3 ft", "length", 0.9144),
    ("12 kN", "force", 12e3),
    ("2 kip", "force", 2 * 4448.2216152605),
    ("2.5 kN/m", "force_per_length", 2500.0),
    ("8 kN*m", "moment", 8000.0),
    ("165 MPa", "stress", 165e6),
    ("36 ksi", "stress", 36 * 6894757.293168361),
    ("7850 kg/m^3", "density", 7850.0),
    ("20 kN/mm", "translational_stiffness", 2e7),
])
def test_parse_to_si(fresh_unit_memory, text, kind, expected):
    assert units.parse(text, kind) == pytest.approx(expected, rel=1e-12)
    units._UNIT_FACTORS = None  # the second time from the remembered factor on disk
    assert units.parse(text, kind) == pytest.approx(expected, rel=1e-12)


def test_a_damaged_unit_memory_is_ignored(fresh_unit_memory):
    (fresh_unit_memory / units.UNIT_CACHE_NAME).write_text('{"kN|force": "garbage", "m|length": -5.0')
    assert units.parse("12 kN", "force") == pytest.approx(12e3)
    assert units.parse("2 m", "length") == pytest.approx(2.0)


def test_a_wrong_remembered_factor_cannot_enter(fresh_unit_memory):
    (fresh_unit_memory / units.UNIT_CACHE_NAME).write_text('{"kN|force": -1000.0, "m|length": NaN}')
    assert units.parse("12 kN", "force") == pytest.approx(12e3)  # negative factors are not trusted
    assert units.parse("2 m", "length") == pytest.approx(2.0)


@pytest.mark.parametrize("text, kind", [("12", "force"), ("12 m", "force"), ("nan kN", "force"), ("1e999 kN", "force"),
                                        ("12 blah", "force"), ("3 m", "stress")])
def test_bad_values_name_file_and_key(fresh_unit_memory, text, kind):
    with pytest.raises(InputError) as caught:
        units.parse(text, kind, "member.toml", "loads[1].fy", 7)
    assert str(caught.value).startswith("member.toml:7: loads[1].fy:") and "fix:" in str(caught.value)


def test_display_in_si_and_us():
    assert units.fmt(12345.0, "force") == "12.35 kN"
    assert units.fmt(12e3, "moment", "us") == "8.851 kip·ft"  # 12 kN*m / (4448.2216 N x 0.3048 m)
    assert units.fmt(0.99999999, "length") == "1.000 m"  # rounding carries into the next digit


@pytest.mark.parametrize("entry", sorted(units.COMMON_FACTORS))
def test_the_common_units_agree_with_pint(entry: str) -> None:
    """The built-in factors of the common SI units (used without building pint's registry) are
    pint's own (pint, a general-purpose units library, as the reference)."""
    unit, kind = entry.split("|")
    assert units.COMMON_FACTORS[entry] == pytest.approx(units._factor_from_pint(unit, kind), rel=1e-12)


def test_common_units_need_no_registry(monkeypatch: pytest.MonkeyPatch) -> None:
    """Reading "2.5 kPa" or "12 kN" builds no pint registry (the first run stays fast)."""
    monkeypatch.setattr(units, "registry", lambda: pytest.fail("the pint registry was built"))
    assert units.unit_factor("kPa", "pressure") == 1e3 and units.unit_factor("kN", "force") == 1e3
