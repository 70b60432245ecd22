"""Webs and walls: concentrated forces on webs, web shear buckling, the plateau of the buckling
reductions, and what restraints must carry. Sources beside each value:
- k_tau = 5.34 + 4 (h/a)^2 for a/h >= 1, 4 + 5.34 (h/a)^2 for a/h < 1 (Timoshenko & Gere, Theory of
  Elastic Stability, ch. 9; EN 1993-1-5 Annex A.3; from memory; docs/references.md);
- tau_cr = k_tau pi^2 E / (12 (1 - nu^2)) (t/h)^2 (same sources);
- web local yielding and web crippling: AISC 360-16 (the American steel specification) J10.2 eqs.
  J10-2 and J10-3, J10.3 eqs. J10-4, J10-5a, J10-5b, with Omega = 1.50 and 2.00 (from memory);
- plateau limits: EN 1993-1-5 4.4(2), 0.5 + sqrt(0.085 - 0.055 psi) for internal elements (0.673 in
  uniform compression) and 0.748 for outstands; EN 1993-1-1 6.3.2.2 lambda_LT,0 = 0.2 (from memory);
- brace force 2 % of the flange force M / h_o (common practice; AISC 360-16 Appendix 6 eq. A-6-7,
  from memory); stiffness 2.00 x 10 M C_d / (L_br h_o) (eq. A-6-8, from memory);
- IPE 300 dimensions EN 10365 (docs/references.md).
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sizer.api import check, member_from_text
from sizer.checks.reduction import PLATEAU_OUTSTAND, internal_plateau, johnson, reduced_allowable, reduction_factor
from sizer.checks.web import Web, shear_buckling_coefficient, web_check, web_crippling, web_yielding
from sizer.design import prepare
from sizer.errors import InputError
from tests.steel import STEEL_TOML

E, G, FY = 200e9, 77e9, 250e6  # tests/steel.py (common practice)
NU = E / (2 * G) - 1
BRYAN = math.pi**2 * E / (12 * (1 - NU**2))

SECTIONS = """
[[sections]]
name = "IPE 300"
shape = "i_beam"
depth = "300 mm"
width = "150 mm"
flange_thickness = "10.7 mm"
web_thickness = "7.1 mm"
root_radius = "15 mm"

[[sections]]
name = "PG 1200x6"
shape = "i_beam"
depth = "1200 mm"
width = "400 mm"
flange_thickness = "25 mm"
web_thickness = "6 mm"

[[sections]]
name = "PG 982x6"
shape = "i_beam"
depth = "982 mm"
width = "500 mm"
flange_thickness = "20 mm"
web_thickness = "6 mm"

[[sections]]
name = "RHS 200x100x5"
shape = "rectangular_tube"
depth = "200 mm"
width = "100 mm"
thickness = "5 mm"
outer_radius = "10 mm"

[[sections]]
name = "FB 20x80"
shape = "rectangle"
depth = "80 mm"
width = "20 mm"
"""


def stock(folder: Path, material: str = STEEL_TOML) -> Path:
    path = folder / "stock.toml"
    path.write_text(material + SECTIONS)
    return path


def beam(section: str, length: float, loads: str, extra: str = "", supports: str = "") -> str:
    """A simply supported beam without self-weight, held sideways and in twist all along."""
    supports = supports or (f'[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{length} m"\ntype = "roller"\n')
    return (f'[member]\nlength = "{length} m"\nmaterial = "steel"\nsection = "{section}"\nself_weight = false\n' + supports
            + f'[[restraints]]\nfrom = "0 m"\nto = "{length} m"\nhold = ["lateral", "twist"]\nheight = "top"\n' + loads + extra)


def run(folder: Path, text: str, material: str = STEEL_TOML):
    return check(member_from_text(text, str(folder / "member.toml")), catalogue=[stock(folder, material)])


def checks_of(outcome) -> dict:
    return {c.check: c for c in outcome.checks}


# ----------------------------------------------------------------------------------------------
# web shear buckling coefficients

@pytest.mark.parametrize("a_over_h, expected", [
    (1.0, 9.34),  # square panel: 5.34 + 4 = 4 + 5.34 (both forms agree)
    (2.0, 6.34),  # 5.34 + 4 / 4
    (0.5, 25.36),  # 4 + 5.34 x 4
    (1e6, 5.34),  # very long (unstiffened) web: 5.34 (EN 1993-1-5 Annex A.3)
])
def test_shear_buckling_coefficient_at_aspect_ratios(a_over_h: float, expected: float) -> None:
    assert float(shear_buckling_coefficient(1.0, a_over_h)) == pytest.approx(expected, rel=1e-6)


def test_shear_buckling_coefficient_is_continuous_at_a_square_panel() -> None:
    below, above = (float(shear_buckling_coefficient(1.0, r)) for r in (1 - 1e-9, 1 + 1e-9))
    assert below == pytest.approx(above, rel=1e-7)


# ----------------------------------------------------------------------------------------------
# web yielding and crippling: a worked example

def test_web_yielding_and_crippling_worked_example(tmp_path: Path) -> None:
    """IPE 300 (d 300, tw 7.1, tf 10.7, r 15 mm: k = tf + r = 25.7 mm), Fy 250 MPa, E 200 GPa,
    point load at mid-span of a 6 m beam on lb = 100 mm, ends on knife edges (lb = 0).

    Interior, lb = 100 mm (AISC 360-16, from memory):
      yielding  J10-2: Rn = Fy tw (5k + lb) = 250 x 7.1 x (128.5 + 100) = 405 587.5 N; / 1.50 = 270.39 kN
      crippling J10-4: Rn = 0.80 tw^2 [1 + 3 (lb/d)(tw/tf)^1.5] sqrt(E Fy tf / tw)
                       = 0.80 x 50.41 x [1 + 1.0 x 0.54052] x sqrt(200000 x 250 x 1.50000 / ...)
        tw/tf = 0.66355, ^1.5 = 0.54052; sqrt(200000 x 250 x 10.7 / 7.1) = 8680.7 MPa
        Rn = 40.328 x 1.54052 x 8680.7 = 539.3 kN; / 2.00 = 269.6 kN   (crippling governs, just)
    At the supports, lb = 0, within d of the end:
      yielding  J10-3: Rn = Fy tw 2.5 k = 250 x 7.1 x 64.25 = 114 043.75 N; / 1.50 = 76.03 kN
      crippling J10-5a: Rn = 0.40 tw^2 sqrt(E Fy tf / tw) = 0.40 x 50.41 x 8680.7 = 175.04 kN; / 2.00 = 87.52 kN
    """
    mid = 250.0 * 7.1 * (5 * 25.7 + 100) / 1.50
    root = math.sqrt(200000 * 250 * 10.7 / 7.1)
    crippling_mid = 0.80 * 7.1**2 * (1 + 3 * (100 / 300) * (7.1 / 10.7) ** 1.5) * root / 2.00
    end_yield = 250.0 * 7.1 * 2.5 * 25.7 / 1.50
    end_crippling = 0.40 * 7.1**2 * root / 2.00
    assert mid == pytest.approx(270_392, rel=1e-5) and crippling_mid == pytest.approx(269_600, rel=2e-3)
    assert end_yield == pytest.approx(76_029, rel=1e-4) and end_crippling == pytest.approx(87_520, rel=2e-3)
    load = 100.0  # kN: reactions 50 kN
    text = beam("IPE 300", 6.0, f'[[loads]]\ntype = "point"\nat = "3 m"\nfy = "-{load} kN"\nbearing = "100 mm"\n')
    web = checks_of(run(tmp_path, text))["web"]
    assert web.extra["web_local_yielding"] == pytest.approx(end_yield, rel=1e-9)  # the supports govern: 50 / 76.03
    assert web.extra["web_crippling"] == pytest.approx(end_crippling, rel=1e-9)
    assert web.demand == pytest.approx(50e3, rel=1e-9) and web.utilization == pytest.approx(50e3 / end_yield, rel=1e-9)
    assert "AISC 360-16 J10.2" in web.extra["method"] and "J10.3" in web.extra["method"]
    # with both supports stiffened only the load is checked: interior values, crippling governs
    stiff = ('[[supports]]\nat = "0 m"\ntype = "pin"\nstiffened = true\n'
             '[[supports]]\nat = "6 m"\ntype = "roller"\nstiffened = true\n')
    outcome = run(tmp_path, beam("IPE 300", 6.0, f'[[loads]]\ntype = "point"\nat = "3 m"\nfy = "-{load} kN"\nbearing = "100 mm"\n',
                                 supports=stiff))
    web = checks_of(outcome)["web"]
    assert web.extra["web_local_yielding"] == pytest.approx(mid, rel=1e-9)
    assert web.extra["web_crippling"] == pytest.approx(crippling_mid, rel=1e-9)
    assert web.allowable == pytest.approx(min(mid, crippling_mid), rel=1e-9) and web.extra["governing_limit"] == "web crippling"
    assert any("support S1 (pin): stiffened, not checked" in note for note in outcome.notes)


def test_crippling_near_the_end_with_a_long_bearing(tmp_path: Path) -> None:
    """A support at the end with lb = 100 mm > 0.2 d = 60 mm: J10-5b,
    Rn = 0.40 tw^2 [1 + (4 lb/d - 0.2)(tw/tf)^1.5] sqrt(E Fy tf / tw); yielding J10-3 with lb."""
    supports = ('[[supports]]\nat = "0 m"\ntype = "pin"\nbearing = "100 mm"\n'
                '[[supports]]\nat = "6 m"\ntype = "roller"\nbearing = "100 mm"\n')
    web = checks_of(run(tmp_path, beam("IPE 300", 6.0, '[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n', supports=supports)))["web"]
    root = math.sqrt(E * FY * 0.0107 / 0.0071)
    crippling = 0.40 * 0.0071**2 * (1 + (4 * 100 / 300 - 0.2) * (0.0071 / 0.0107) ** 1.5) * root / 2.00
    assert web.extra["web_crippling"] == pytest.approx(crippling, rel=1e-9)
    assert web.extra["web_local_yielding"] == pytest.approx(FY * 0.0071 * (2.5 * 0.0257 + 0.1) / 1.50, rel=1e-9)


def test_plate_girder_with_a_thin_web_fails_under_a_large_point_load(tmp_path: Path) -> None:
    """A 6 mm web under 1000 kN at mid-span: J10-2 gives Rn / 1.5 = 250 x 6 x 5 x 25 / 1.5 = 125 kN
    (k = tf = 25 mm, no fillet): a utilization of 8 at the load, and the check must say it fails."""
    outcome = run(tmp_path, beam("PG 1200x6", 12.0, '[[loads]]\ntype = "point"\nat = "6 m"\nfy = "-1000 kN"\n'))
    web = checks_of(outcome)["web"]
    assert not web.passes and not outcome.passes
    assert web.utilization >= 1000e3 / (FY * 0.006 * 5 * 0.025 / 1.5) - 1e-9


def test_load_over_an_interior_support_checks_web_compression_buckling(tmp_path: Path) -> None:
    """Two 3 m spans of PG 982x6 (d 982, tw 6, tf 20 mm, no fillet: k = 20 mm, h = d - 2k = 942 mm),
    a 300 kN column load directly over the middle support, which is stiffened-free: AISC 360-16
    J10.5 (eq. J10-8, from memory): Rn = 24 tw^3 sqrt(E Fy) / h = 24 x 216 x sqrt(200000 x 250) / 942 N
    = 38.9 kN; / 1.67 = 23.3 kN, against the smaller of the load (300 kN) and the reaction (> 300 kN)."""
    supports = ('[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "3 m"\ntype = "roller"\n'
                '[[supports]]\nat = "6 m"\ntype = "roller"\n')
    outcome = run(tmp_path, beam("PG 982x6", 6.0, '[[loads]]\ntype = "point"\nat = "3 m"\nfy = "-300 kN"\n'
                                 '[[loads]]\ntype = "line"\nwy = "-5 kN/m"\n', supports=supports))
    web = checks_of(outcome)["web"]
    expected = 24 * 0.006**3 * math.sqrt(E * FY) / 0.942 / 1.67
    assert expected == pytest.approx(23.3e3, rel=2e-3)
    assert web.extra["governing_limit"] == "web compression buckling"
    assert web.allowable == pytest.approx(expected, rel=1e-9) and web.demand == pytest.approx(300e3, rel=1e-9)
    assert not web.passes


def test_tube_has_two_webs_and_other_shapes_are_not_made(tmp_path: Path) -> None:
    """RHS 200x100x5, outer radius 10 mm: k = 10 mm, two side walls: end yielding 2 x Fy t 2.5 k / 1.5."""
    web = checks_of(run(tmp_path, beam("RHS 200x100x5", 3.0, '[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n')))["web"]
    assert web.extra["web_local_yielding"] == pytest.approx(2 * FY * 0.005 * 2.5 * 0.010 / 1.5, rel=1e-9)
    flat = checks_of(run(tmp_path, beam("FB 20x80", 3.0, '[[loads]]\ntype = "line"\nwy = "-1 kN/m"\n')))["web"]
    assert not flat.made and "not made" in flat.detail


def test_web_check_without_yield_strength_uses_the_largest_allowable(tmp_path: Path) -> None:
    """No yield strength: Fy taken as the largest allowable (170 MPa here), stated; the safe side."""
    material = STEEL_TOML.replace('yield_strength = "250 MPa"\n', "")
    web = checks_of(run(tmp_path, beam("IPE 300", 6.0, '[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n'), material))["web"]
    assert web.extra["yield_strength"] == pytest.approx(170e6) and "largest allowable" in web.detail
    bare = "[materials.steel]\nelastic_modulus = \"200 GPa\"\nshear_modulus = \"77 GPa\"\ndensity = \"7850 kg/m^3\"\n"
    design = prepare(member_from_text(beam("IPE 300", 6.0, '[[loads]]\ntype = "point"\nat = "3 m"\nfy = "-1 kN"\n'),
                                      str(tmp_path / "member.toml")), [stock(tmp_path, bare)])
    with pytest.raises(InputError, match="yield_strength"):
        web_check(design)


@settings(max_examples=100, deadline=None)
@given(st.floats(0.0, 0.5), st.floats(0.0, 0.3), st.floats(0.002, 0.02), st.floats(0.004, 0.04))
def test_web_capacity_grows_with_bearing_and_away_from_the_ends(bearing: float, more: float, tw: float, tf: float) -> None:
    """Common practice, and so the published formulas: a longer stiff bearing never lowers the
    allowable force; a force near a member's end never gets more than one in the interior."""
    web = Web(1, 0.4, tw, tf, tf + 0.01, 1, 0.4 - 2 * tf)
    for near_end in (False, True):
        assert web_yielding(web, FY, bearing + more, near_end) >= web_yielding(web, FY, bearing, near_end)
        assert web_crippling(web, E, FY, bearing + more, near_end) >= web_crippling(web, E, FY, bearing, near_end) * (1 - 1e-12)
    assert web_yielding(web, FY, bearing, True) <= web_yielding(web, FY, bearing, False)
    assert web_crippling(web, E, FY, bearing, True) <= web_crippling(web, E, FY, bearing, False)


# ----------------------------------------------------------------------------------------------
# web shear buckling in the shear check

def test_slender_web_fails_shear_through_buckling(tmp_path: Path) -> None:
    """PG 982x6: h = 982 - 2 x 20 = 942 mm, h / tw = 157. 1040 kN at mid-span of a 6 m span: V = 520 kN,
    mean web shear 520e3 / (942 x 6) = 92 MPa. tau_cr = k_tau pi^2 E / (12 (1 - nu^2)) (6/942)^2 with
    k_tau = 5.34 + 4 (0.942 / 6)^2 = 5.439: about 40 MPa. The shear allowable here (145 MPa) passes the
    peak stress unreduced, but reduced to tau_cr / SF = 20 MPa the check fails."""
    material = STEEL_TOML.replace('shear = "100 MPa"', 'shear = "145 MPa"')
    outcome = run(tmp_path, beam("PG 982x6", 6.0, '[[loads]]\ntype = "point"\nat = "3 m"\nfy = "-1040 kN"\n'), material)
    shear = checks_of(outcome)["shear"]
    k_tau = 5.34 + 4 * (0.942 / 6.0) ** 2
    tau_cr = k_tau * BRYAN * (0.006 / 0.942) ** 2
    assert tau_cr == pytest.approx(40e6, rel=0.03)
    assert shear.extra["k_tau"] == pytest.approx(k_tau, rel=1e-9)
    assert shear.extra["critical_shear_stress"] == pytest.approx(tau_cr, rel=1e-9)
    assert shear.demand == pytest.approx(92e6, rel=0.1) and shear.demand < 145e6  # unreduced it would pass
    assert shear.allowable == pytest.approx(tau_cr / 2.0, rel=1e-9)
    assert not shear.passes


def test_stiffeners_raise_the_shear_buckling_stress(tmp_path: Path) -> None:
    """web_stiffener_spacing = h: a square panel, k_tau = 9.34 (both forms)."""
    text = beam("PG 982x6", 6.0, '[[loads]]\ntype = "point"\nat = "3 m"\nfy = "-200 kN"\n', '[checks]\nweb_stiffener_spacing = "942 mm"\n')
    shear = checks_of(run(tmp_path, text))["shear"]
    assert shear.extra["k_tau"] == pytest.approx(9.34, rel=1e-6) and shear.extra["panel_length"] == pytest.approx(0.942)


def test_stocky_web_keeps_the_full_shear_allowable(tmp_path: Path) -> None:
    """IPE 300: h / tw = 278.6 / 7.1 = 39: tau_cr far above the shear yield, lambda_w < 0.83: Fv unreduced."""
    shear = checks_of(run(tmp_path, beam("IPE 300", 6.0, '[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n')))["shear"]
    assert shear.allowable == pytest.approx(100e6, rel=1e-12) and "critical_shear_stress" not in shear.extra


# ----------------------------------------------------------------------------------------------
# the plateau

@pytest.mark.parametrize("plateau, name", [(float(internal_plateau(1.0)), "internal wall, uniform compression"),
                                            (PLATEAU_OUTSTAND, "outstand")])
def test_plateau_limits_and_continuity(plateau: float, name: str) -> None:
    assert plateau == pytest.approx(0.673 if name.startswith("internal") else 0.748, abs=5e-4)  # EN 1993-1-5 4.4(2)
    def sigma_at(lam: float) -> float:
        return FY / lam**2

    below, at, above = (float(reduction_factor(sigma_at(lam), FY, plateau)) for lam in (plateau - 1e-3, plateau, plateau + 1e-7))
    assert below == 1.0 and at == 1.0  # no reduction up to the limit
    assert above == pytest.approx(1.0, abs=1e-6)  # and no jump beyond it
    assert float(johnson(sigma_at(plateau), FY)) / FY < 0.9  # the parabola alone would jump by more than 10 %
    # from lambda = 1 (sigma_cr = Fy) on, the Johnson parabola as before
    for lam in (1.0, 1.2, 1.5, 2.0):
        assert float(reduction_factor(sigma_at(lam), FY, plateau)) == pytest.approx(float(johnson(sigma_at(lam), FY)) / FY, rel=1e-12)
    # allowables continuous across the limit through the whole rule min(F, F rho, sigma_cr / SF)
    values = [float(reduced_allowable(165e6, sigma_at(lam), FY, 2.0, plateau)) for lam in (plateau - 1e-7, plateau + 1e-7)]
    assert values[0] == pytest.approx(values[1], rel=1e-6)


def test_internal_plateau_under_a_stress_gradient() -> None:
    """0.5 + sqrt(0.085 - 0.055 psi): 0.874 in pure bending (psi = -1), 1.0 at psi = -3."""
    assert float(internal_plateau(-1.0)) == pytest.approx(0.874, abs=5e-4)
    assert float(internal_plateau(-3.0)) == pytest.approx(1.0, abs=1e-12)


@settings(max_examples=200, deadline=None)
@given(st.floats(0.05, 3.0), st.floats(0.0, 0.2), st.sampled_from([0.2, 0.673, 0.748, 0.83, 0.95, 1.0]))
def test_reduction_never_rises_with_slenderness_and_has_no_jump(lam: float, step: float, plateau: float) -> None:
    """rho is non-increasing in lambda, never below the Johnson parabola, and Lipschitz (no jump):
    |rho(l + d) - rho(l)| <= 2 d (common practice: a reduction curve is continuous; the steepest part,
    the transition after the limit 1.0, falls 0.36 over 0.2)."""
    def rho(slender: float) -> float:
        return float(reduction_factor(FY / slender**2, FY, plateau))

    assert rho(lam + step) <= rho(lam) + 1e-12
    assert rho(lam) >= float(johnson(FY / lam**2, FY)) / FY - 1e-12
    assert abs(rho(lam + step) - rho(lam)) <= 2.0 * step + 1e-12


def test_readme_braced_ipe_300_is_governed_by_bending(tmp_path: Path) -> None:
    """The README's example: IPE 300, 6 m, 10 kN/m, a deck holding it sideways all along. Its flange
    outstand has sigma_cr about 11 Fy (lambda_p = 0.3 < 0.748): no local reduction, so bending governs."""
    outcome = check(member_from_text('[member]\nlength = "6 m"\nmaterial = "mild-steel"\nself_weight = false\n'
                                     '[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "6 m"\ntype = "roller"\n'
                                     '[[restraints]]\nfrom = "0 m"\nto = "6 m"\nhold = ["lateral", "twist"]\nheight = "top"\n'
                                     '[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n'), section="IPE 300")
    checks = checks_of(outcome)
    assert outcome.governing == "bending"
    assert checks["local"].allowable == pytest.approx(165e6, rel=1e-12)  # not reduced
    assert checks["local"].extra["slenderness"] < checks["local"].extra["plateau_slenderness"]


# ----------------------------------------------------------------------------------------------
# restraints

def test_point_brace_force_and_stiffness(tmp_path: Path) -> None:
    """IPE 300, 6 m, 10 kN/m, one lateral brace at mid-span: M_r = wL^2/8 = 45 kN m (Table 3-23),
    h_o = 300 - 10.7 mm; force 0.02 M / h_o = 3.11 kN; stiffness 2 x 10 M / (L_br h_o) with L_br = 3 m."""
    text = ('[member]\nlength = "6 m"\nmaterial = "steel"\nsection = "IPE 300"\nself_weight = false\n'
            '[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "6 m"\ntype = "roller"\n'
            '[[restraints]]\nat = "3 m"\nhold = ["lateral"]\nheight = "top"\n[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n')
    outcome = run(tmp_path, text)
    (brace,) = outcome.report.restraints
    h_o = 0.300 - 0.0107
    assert brace.moment == pytest.approx(45e3, rel=1e-6)
    assert brace.force == pytest.approx(0.02 * 45e3 / h_o, rel=1e-6)
    assert brace.stiffness == pytest.approx(2.0 * 10 * 45e3 / (3.0 * h_o), rel=1e-6)
    document = outcome.to_json()
    assert document["restraints"][0]["required_force"] == pytest.approx(brace.force)
    assert any(note.startswith("Restraints must carry") and "AISC 360-16 Appendix 6" in note for note in outcome.notes)
    assert any(note.startswith("restraint 1 at 3 m, sideways: force 3.11 kN") for note in outcome.notes)


def test_cautions_say_what_is_checked_and_what_is_not(tmp_path: Path) -> None:
    """Every output carries the cautions (common practice for a design aid): now that webs are
    checked they say so, and they still name what is not checked."""
    document = run(tmp_path, beam("IPE 300", 6.0, '[[loads]]\ntype = "line"\nwy = "-10 kN/m"\n')).to_json()
    text = " ".join(document["cautions"])
    for checked in ("web crippling", "web compression buckling", "web shear buckling", "J10.2"):
        assert checked in text.split("Not checked by sizer")[0]
    for left_out in ("connections", "fatigue", "fire", "dynamic effects"):
        assert left_out in text.split("Not checked by sizer")[1]
