"""`sizer check` against closed forms. Sources beside each value:
- bending M/S, S = b h^2/6; shear 1.5 V/A (rectangle), torsion 16 T/(pi d^3) (round bar); combined
  N/A + M/S: any mechanics of materials text, e.g. Gere & Timoshenko, Mechanics of Materials (from memory);
- M = wL^2/8 and deflection 5wL^4/(384EI), simply supported uniform load: AISC Manual Table 3-23 (from memory);
- Euler load pi^2 EI/(KL)^2 and the Johnson parabola Fy (1 - (KL/r)^2/(2 Cc^2)), Cc = pi sqrt(2E/Fy):
  any steel design text, e.g. Salmon & Johnson, Steel Structures (from memory);
- unsymmetric bending on principal axes: sigma = M_u v / I_u - M_v u / I_v (Gere & Timoshenko, from memory),
  with I_u, I_v from polygon integrals computed independently here (Green's theorem).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from typer.testing import CliRunner

from sizer.cli import app

E = 200e9
CATALOGUE = """\
[materials.steel]
elastic_modulus = "200 GPa"
shear_modulus = "77 GPa"
density = "7850 kg/m^3"
{yield_line}
[materials.steel.allowable]
tension = "150 MPa"
compression = "150 MPa"
{bending_line}
shear = "100 MPa"
equivalent = "170 MPa"

[[sections]]
name = "R 50x100"
shape = "rectangle"
depth = "100 mm"
width = "50 mm"

[[sections]]
name = "RD 40"
shape = "round"
diameter = "40 mm"

[[sections]]
name = "RD 30"
shape = "round"
diameter = "30 mm"

[[sections]]
name = "L 80x80x8"
shape = "angle"
depth = "80 mm"
width = "80 mm"
thickness = "8 mm"
"""


def make_catalogue(folder: Path, yield_strength: bool = False, bending: bool = True) -> Path:
    path = folder / "section_library" / "stock.toml"
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(CATALOGUE.format(yield_line='yield_strength = "250 MPa"' if yield_strength else "",
                                     bending_line='bending = "165 MPa"' if bending else ""))
    return path


def member_file(folder: Path, section: str, length: float, loads: str, *, cantilever: bool = False,
                orientation: str = "major", extra: str = "") -> Path:
    """A member of `section` in steel, without self-weight: pin at 0 and roller at L, or a fixed end
    at 0 (cantilever); `loads` and `extra` are TOML text added as given."""
    supports = ('[[supports]]\nat = "0 m"\ntype = "fixed"\n' if cantilever else
                f'[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{length} m"\ntype = "roller"\n')
    path = folder / "member.toml"
    path.write_text(f'[member]\nlength = "{length} m"\nmaterial = "steel"\nsection = "{section}"\n'
                    f'orientation = "{orientation}"\nself_weight = false\n' + supports
                    + loads + extra)
    return path


def simple_beam(folder: Path, section: str = "R 50x100", w: str = "-5 kN/m", length: float = 2.0, extra: str = "",
                orientation: str = "major", deflection_limit: int = 360) -> Path:
    loads = f'[[loads]]\ntype = "line"\nwy = "{w}"\n'
    return member_file(folder, section, length, loads + extra + "\n", orientation=orientation,
                       extra=f"[checks]\ndeflection_limit = {deflection_limit}\n")


def run_check(path: Path, *extra: str) -> tuple[int, dict]:
    result = CliRunner().invoke(app, ["check", str(path), "--json", *extra])
    assert result.exit_code in (0, 1), result.output
    return result.exit_code, json.loads(result.stdout)


def by_name(document: dict, name: str) -> dict:
    return next(c for c in document["checks"] if c["check"] == name)


def test_bending_shear_and_deflection_of_a_rectangle(tmp_path):
    make_catalogue(tmp_path)
    code, document = run_check(simple_beam(tmp_path))
    w, L, b, h = 5e3, 2.0, 0.05, 0.1
    moment = w * L**2 / 8  # AISC Table 3-23
    assert by_name(document, "bending")["demand"] == pytest.approx(moment / (b * h**2 / 6), rel=0.01)  # M/S
    assert by_name(document, "bending")["at"] == pytest.approx(L / 2, abs=0.02)
    assert by_name(document, "shear")["demand"] == pytest.approx(1.5 * (w * L / 2) / (b * h), rel=0.02)  # 1.5 V/A
    deflection = 5 * w * L**4 / (384 * E * b * h**3 / 12)  # 5wL^4/(384EI)
    assert by_name(document, "deflection")["demand"] == pytest.approx(deflection, rel=1e-3)
    assert by_name(document, "deflection")["allowable"] == pytest.approx(L / 360, rel=1e-12)
    assert code == 0 and document["passes"] is True
    assert document["cautions"] and document["reactions"]["all"][0]["Fy"] == pytest.approx(w * L / 2, rel=1e-9)


def test_minor_orientation_bends_the_weak_axis(tmp_path):
    make_catalogue(tmp_path)
    _, document = run_check(simple_beam(tmp_path, orientation="minor"))
    w, L, b, h = 5e3, 2.0, 0.05, 0.1
    assert by_name(document, "bending")["demand"] == pytest.approx(w * L**2 / 8 / (h * b**2 / 6), rel=0.01)  # M / (h b^2 / 6)


@pytest.mark.parametrize("ratio, expected_exit", [(0.97, 0), (1.03, 1)])
def test_verdict_on_each_side_of_the_limit(tmp_path, ratio, expected_exit):
    make_catalogue(tmp_path)
    b, h, L = 0.05, 0.1, 2.0
    w = ratio * 165e6 * (b * h**2 / 6) * 8 / L**2  # the load that makes M/S = ratio x allowable
    code, document = run_check(simple_beam(tmp_path, w=f"{-w / 1e3:.6f} kN/m", deflection_limit=100))
    assert by_name(document, "bending")["utilization"] == pytest.approx(ratio, rel=0.01)
    assert code == expected_exit and document["passes"] is (expected_exit == 0)


def test_torsion_of_a_round_bar(tmp_path):
    make_catalogue(tmp_path)
    path = member_file(tmp_path, "RD 40", 1.0, '[[loads]]\ntype = "moment"\nat = "1 m"\nmx = "0.5 kN*m"\n', cantilever=True)
    _, document = run_check(path)
    d, torque = 0.04, 500.0
    assert by_name(document, "shear")["demand"] == pytest.approx(16 * torque / (math.pi * d**3), rel=0.02)  # 16T/(pi d^3)
    assert by_name(document, "bending")["made"] is False


def test_axial_and_bending_together(tmp_path):
    make_catalogue(tmp_path)
    path = simple_beam(tmp_path, extra='[[loads]]\ntype = "point"\nat = "2 m"\nfx = "100 kN"')
    _, document = run_check(path)
    b, h, L, w, P = 0.05, 0.1, 2.0, 5e3, 100e3
    k = math.sqrt(P / (200e9 * b * h**3 / 12))
    # tension lowers the moment: M_max = (w / k^2) (1 - sech(kL/2)), k^2 = P / EI (Timoshenko & Gere,
    # Theory of Elastic Stability, ch. 1, the beam-column in tension; from memory)
    fa, fb = P / (b * h), w / k**2 * (1 - 1 / math.cosh(k * L / 2)) / (b * h**2 / 6)
    assert by_name(document, "axial")["demand"] == pytest.approx(fa, rel=1e-9)  # N/A (common practice)
    assert by_name(document, "axial")["utilization"] == pytest.approx(fa / 150e6, rel=1e-9)
    assert by_name(document, "interaction")["utilization"] == pytest.approx(fa / 150e6 + fb / 165e6, rel=0.01)  # fa/Fa + fb/Fb
    assert by_name(document, "equivalent")["demand"] == pytest.approx(fa + fb, rel=0.01)  # no shear at midspan
    assert by_name(document, "buckling")["made"] is False  # tension only


def strut(folder: Path, section: str, length: float, force_kn: float) -> Path:
    return member_file(folder, section, length, f'[[loads]]\ntype = "point"\nat = "{length} m"\nfx = "{-force_kn} kN"\n')


def test_euler_buckling_of_a_slender_strut(tmp_path):
    make_catalogue(tmp_path)
    _, document = run_check(strut(tmp_path, "RD 30", 2.0, 10.0))
    d, L = 0.03, 2.0
    critical = math.pi**2 * E * (math.pi * d**4 / 64) / L**2  # Euler, K = 1
    buckling = by_name(document, "buckling")
    assert buckling["allowable"] == pytest.approx(critical / 2.0, rel=0.01)  # default safety factor 2
    assert buckling["utilization"] == pytest.approx(10e3 / (critical / 2.0), rel=0.01)
    assert "Euler" in buckling["detail"]


def test_johnson_parabola_for_a_stocky_strut(tmp_path):
    make_catalogue(tmp_path, yield_strength=True)
    _, document = run_check(strut(tmp_path, "RD 30", 0.5, 10.0))
    d, L, fy = 0.03, 0.5, 250e6
    slenderness = L / (d / 4)  # r = d/4 for a solid circle
    transition = math.pi * math.sqrt(2 * E / fy)
    assert slenderness < transition
    stress = fy * (1 - slenderness**2 / (2 * transition**2))  # Johnson parabola
    buckling = by_name(document, "buckling")
    assert buckling["allowable"] == pytest.approx(stress * math.pi * d**2 / 4 / 2.0, rel=0.01)
    assert "Johnson" in buckling["detail"]


def polygon_principal(points: np.ndarray) -> tuple[float, float, float, np.ndarray]:
    """Area, I_u, I_v and the rotation (rad) of a simple polygon (y, z) by Green's theorem, with the
    vertices relative to the centroid. Independent of sectionproperties."""
    y, z = points[:, 0], points[:, 1]
    y1, z1 = np.roll(y, -1), np.roll(z, -1)
    cross = y * z1 - y1 * z
    area = cross.sum() / 2
    cy = ((y + y1) * cross).sum() / (6 * area)
    cz = ((z + z1) * cross).sum() / (6 * area)
    iyy_raw = ((y**2 + y * y1 + y1**2) * cross).sum() / 12  # integral y^2
    izz_raw = ((z**2 + z * z1 + z1**2) * cross).sum() / 12  # integral z^2
    iyz_raw = ((y * z1 + 2 * y * z + 2 * y1 * z1 + y1 * z) * cross).sum() / 24
    i_z = iyy_raw - area * cy**2  # about the z axis: integral y^2
    i_y = izz_raw - area * cz**2
    i_yz = iyz_raw - area * cy * cz
    return area, i_z, i_y, i_yz, np.column_stack([y - cy, z - cz])


def test_angle_bends_about_its_principal_axes(tmp_path):
    make_catalogue(tmp_path)
    # through the shear centre: bending alone (a load at the centroid would also twist the angle)
    path = member_file(tmp_path, "L 80x80x8", 1.0, '[[loads]]\ntype = "point"\nat = "1 m"\nfy = "-2 kN"\nacross = "shear-centre"\n',
                       cantilever=True)
    _, document = run_check(path)
    # angle outline in (y up, z): legs along y and z, sharp corners
    t, a = 0.008, 0.08
    outline = np.array([[0, 0], [a, 0], [a, t], [t, t], [t, a], [0, a]], dtype=float)[:, [1, 0]]
    area, i_z, i_y, i_yz, corners = polygon_principal(outline)
    mz = 2e3 * 1.0  # cantilever root moment |PL| (AISC Table 3-23)
    # unsymmetric bending (Gere & Timoshenko): sigma = -(Mz (Iy y - Iyz z)) / (Iz Iy - Iyz^2), sign irrelevant for the peak
    stress = mz * (i_y * corners[:, 0] - i_yz * corners[:, 1]) / (i_z * i_y - i_yz**2)
    expected = np.abs(stress).max()
    assert by_name(document, "bending")["demand"] == pytest.approx(expected, rel=0.01)
    naive = mz / (i_z / np.abs(corners[:, 0]).max())  # M / S about the geometric axis: not enough
    assert expected > 1.2 * naive


def test_missing_allowable_for_a_needed_check_is_bad_input(tmp_path):
    make_catalogue(tmp_path, bending=False)
    result = CliRunner().invoke(app, ["check", str(simple_beam(tmp_path))])
    assert result.exit_code == 2
    assert "allowable.bending" in result.stderr and "\n" not in result.stderr.strip()


def test_unknown_section_is_bad_input(tmp_path):
    make_catalogue(tmp_path)
    result = CliRunner().invoke(app, ["check", str(simple_beam(tmp_path, section="R 50x101"))])
    assert result.exit_code == 2 and "R 50x101" in result.stderr and "Traceback" not in result.output


def test_member_without_section_is_bad_input(tmp_path):
    make_catalogue(tmp_path)
    path = simple_beam(tmp_path)
    path.write_text(path.read_text().replace('section = "R 50x100"', ""))
    result = CliRunner().invoke(app, ["check", str(path)])
    assert result.exit_code == 2 and "member.section" in result.stderr


def test_full_field_equals_sectionproperties_stress_analysis(tmp_path):
    """The combined unit fields equal sectionproperties' own stress analysis for the same actions."""
    from sectionproperties.analysis import Section
    from sectionproperties.pre.library import rectangular_section

    from sizer.sections import load_catalogue, unit_stress_field

    catalogue = load_catalogue([make_catalogue(tmp_path)])
    field = unit_stress_field(catalogue.get("R 50x100"))
    geometry = rectangular_section(d=100, b=50)
    geometry.create_mesh(mesh_sizes=[20.0])
    section = Section(geometry)
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    # member actions N = 10 kN, Mz = 2 kN*m, My = 0.5 kN*m  ->  sectionproperties n, mxx = -Mz, myy = My (N, N*mm)
    post = section.calculate_stress(n=10e3, mxx=-2e6, myy=0.5e6)
    peak_reference = max(abs(s["sig_zz"]).max() for s in post.get_stress()) * 1e6  # MPa -> Pa
    sigma, _ = field.stresses(N=10e3, Mz=2e3, My=0.5e3)
    assert np.abs(sigma).max() == pytest.approx(peak_reference, rel=1e-6)
