"""Local (plate) buckling of the flat walls of catalogue shapes. Sources beside each value:
- sigma_cr = k pi^2 E / (12 (1 - nu^2)) (t/b)^2 (Bryan; Timoshenko & Gere, Theory of Elastic
  Stability, ch. 9, from memory; docs/references.md), nu = E / (2 G) - 1 (isotropic elasticity, any text);
- k = 4.0 for a long plate simply supported on both long edges in uniform compression, 23.9 in pure
  in-plane bending, 0.425 with one long edge free (Timoshenko & Gere ch. 9, from memory; docs/references.md);
- EN 1993-1-5 Tables 4.1 and 4.2 (from memory): internal k = 8.2/(1.05 + psi), 7.81 - 6.29 psi +
  9.78 psi^2, 5.98 (1 - psi)^2; outstand k = 0.43 (uniform), 0.57 - 0.21 psi + 0.07 psi^2 (free
  edge more compressed), 0.578/(psi + 0.34) and 1.7 - 5 psi + 17.1 psi^2 (supported edge more
  compressed), with the tabulated points k = 7.81 (psi = 0), 23.9 (psi = -1), 1.70 (psi = 0, outstand);
- sigma = N/A - Mz y/Iz for a doubly symmetric section, I = (b d^3 - (b - tw)(d - 2 tf)^3)/12 for a
  sharp-cornered I-section, A = D^2 - (D - 2t)^2 for a sharp-cornered square tube (any mechanics of
  materials text, e.g. Gere & Timoshenko, Mechanics of Materials, from memory);
- Johnson parabola sigma_J = Fy (1 - Fy/(4 sigma_cr)) above Fy/2 (docs/references.md), and the reduced
  allowable min(F, F sigma_J/Fy, sigma_cr/SF) with F the larger of the compression and bending
  allowables (sizer's stated rule, docs/design.md section 10);
- the section outlines themselves come from sectionproperties (its steel_sections library).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sizer.analysis.section_axes import to_section_axes
from sizer.api import member_from_text
from sizer.checks.local import (
    local_check,
    local_utilizations,
    plate_coefficient,
    table_of_walls,
    wall_stresses,
    wall_table,
)
from sizer.checks.local_walls import INTERNAL, OUTSTAND, Wall, no_walls_reason, section_walls
from sizer.checks.stations import check_stations, member_actions
from sizer.design import prepare
from sizer.errors import InputError
from sizer.sections import section_properties, unit_stress_field
from sizer.sections.geometry import outline
from sizer.sections.spec import SectionSpec
from tests.steel import STEEL_TOML

E, G, FY = 200e9, 77e9, 250e6  # tests/steel.py (common practice)
NU = E / (2 * G) - 1
F = 165e6  # the larger of compression 150 MPa and bending 165 MPa (tests/steel.py)
SF = 2.0  # sizer's stated default buckling safety factor
BRYAN = math.pi**2 * E / (12 * (1 - NU**2))  # sigma_cr / (k (t/b)^2)

SECTIONS = """
[[sections]]
name = "SHS 150x3"
shape = "rectangular_tube"
depth = "150 mm"
width = "150 mm"
thickness = "3 mm"

[[sections]]
name = "WIDE 200x200"
shape = "i_beam"
depth = "200 mm"
width = "200 mm"
flange_thickness = "6 mm"
web_thickness = "8 mm"

[[sections]]
name = "DEEP 400x100"
shape = "i_beam"
depth = "400 mm"
width = "100 mm"
flange_thickness = "16 mm"
web_thickness = "3 mm"

[[sections]]
name = "I 160x82"
shape = "i_beam"
depth = "160 mm"
width = "82 mm"
flange_thickness = "7.4 mm"
web_thickness = "5 mm"
root_radius = "9 mm"

[[sections]]
name = "C 120x55"
shape = "channel"
depth = "120 mm"
width = "55 mm"
flange_thickness = "9 mm"
web_thickness = "7 mm"
root_radius = "9 mm"

[[sections]]
name = "T 100x100"
shape = "tee"
depth = "100 mm"
width = "100 mm"
flange_thickness = "11 mm"
web_thickness = "6 mm"
root_radius = "8 mm"

[[sections]]
name = "L 90x60x6"
shape = "angle"
depth = "90 mm"
width = "60 mm"
thickness = "6 mm"
root_radius = "7 mm"

[[sections]]
name = "RHS 120x60x4"
shape = "rectangular_tube"
depth = "120 mm"
width = "60 mm"
thickness = "4 mm"
outer_radius = "8 mm"

[[sections]]
name = "FB 20x80"
shape = "rectangle"
depth = "80 mm"
width = "20 mm"
"""
MIXED = ("I 160x82", "C 120x55", "T 100x100", "L 90x60x6", "RHS 120x60x4", "FB 20x80")


def catalogue(folder: Path, material: str = STEEL_TOML) -> Path:
    path = folder / "stock.toml"
    path.write_text(material + SECTIONS)
    return path


def member_text(section: str, axial_kN: float = -1.0, length: float = 2.0) -> str:
    """A pin-roller strut without self-weight, loaded along x at end B."""
    return (f'[member]\nlength = "{length} m"\nmaterial = "steel"\nsection = "{section}"\nself_weight = false\n'
            f'[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{length} m"\ntype = "roller"\n'
            f'[[loads]]\ntype = "point"\nat = "{length} m"\nfx = "{axial_kN:.9f} kN"\n')


def design_of(folder: Path, section: str, material: str = STEEL_TOML, axial_kN: float = -1.0):
    path = catalogue(folder, material)
    return prepare(member_from_text(member_text(section, axial_kN), str(folder / "member.toml")), [path])


def one_station(design, N: float = 0.0, My: float = 0.0, Mz: float = 0.0):
    """local_check on one set of actions (section axes) at x = 0."""
    actions = np.array([[[N, 0.0, 0.0, 0.0, My, Mz]]])
    return local_check(design, actions, np.array([0.0]), ("test",))


def reduced(critical: float, plateau: float) -> float:
    """min(F, F rho, sigma_cr / SF): rho = 1 for lambda = sqrt(Fy / sigma_cr) <= plateau (EN 1993-1-5
    4.4(2), from memory: 0.673 internal in uniform compression, 0.748 outstand, 0.5 + sqrt(0.085 - 0.055
    psi) generally), the Johnson parabola sigma_J / Fy from lambda_e = max(1, plateau + 0.2) on, and
    between them the larger of Johnson and the straight line from 1 to Johnson's value at lambda_e
    (sizer's stated transition, docs/output.md)."""
    def johnson(s: float) -> float:
        return (s if s <= FY / 2 else FY * (1 - FY / (4 * s))) / FY

    lam, end = math.sqrt(FY / critical), max(1.0, plateau + 0.2)
    if lam <= plateau:
        rho = 1.0
    elif lam < end:
        rho = max(johnson(critical), 1 - (1 - johnson(FY / end**2)) * (lam - plateau) / (end - plateau))
    else:
        rho = johnson(critical)
    return min(F, F * rho, critical / SF)


# ----------------------------------------------------------------------------------------------
# the plate coefficients

def test_plate_coefficients_give_the_published_values() -> None:
    k = lambda kind, psi, free=True: float(plate_coefficient(kind, psi, free))
    assert k(INTERNAL, 1.0) == pytest.approx(4.0, rel=1e-12)  # Timoshenko & Gere; EN 1993-1-5 Table 4.1
    assert k(INTERNAL, -1.0) == pytest.approx(23.9, rel=2e-3)  # Timoshenko & Gere 23.9; EN gives 23.9
    assert k(INTERNAL, 0.0) == pytest.approx(7.81, rel=1e-3)  # EN 1993-1-5 Table 4.1
    assert k(OUTSTAND, 1.0) == pytest.approx(0.43, rel=1e-12)  # EN 1993-1-5 Table 4.2
    assert k(OUTSTAND, 1.0) == pytest.approx(0.425, rel=0.012)  # Timoshenko & Gere, one edge free
    assert k(OUTSTAND, 1.0, False) == pytest.approx(0.425, rel=0.015)  # both forms meet at psi = 1
    assert k(OUTSTAND, 0.0, False) == pytest.approx(1.70, rel=2e-3)  # EN 1993-1-5 Table 4.2
    assert k(OUTSTAND, -1.0, False) == pytest.approx(23.8, rel=1e-3)  # EN 1993-1-5 Table 4.2
    assert k(OUTSTAND, -1.0, True) == pytest.approx(0.85, rel=1e-3)  # EN 1993-1-5 Table 4.2
    # clamps: below the tables' range k is held at the range's end (lower: the safe side)
    assert k(INTERNAL, -10.0) == pytest.approx(5.98 * 16, rel=1e-12)
    assert k(OUTSTAND, -5.0, False) == pytest.approx(23.8, rel=1e-3)


def test_plate_coefficient_pieces_meet_where_the_tables_switch() -> None:
    """The published pieces agree at their joins within the tables' rounding (EN 1993-1-5, from memory)."""
    for kind, free, joins in ((INTERNAL, True, (0.0, -1.0)), (OUTSTAND, False, (0.0,))):
        for psi in joins:
            above, below = plate_coefficient(kind, [psi + 1e-9, psi - 1e-9], free)
            assert above == pytest.approx(below, rel=3e-3)


@settings(max_examples=60, deadline=None)
@given(st.floats(-4.0, 1.0), st.floats(-4.0, 1.0), st.sampled_from([(INTERNAL, True), (OUTSTAND, True), (OUTSTAND, False)]))
def test_plate_coefficient_never_rises_with_psi(psi_a: float, psi_b: float, case: tuple[str, bool]) -> None:
    """A stress gradient never makes a plate buckle sooner than uniform compression: k is non-increasing
    in psi and at least its uniform value (common practice; each published piece is monotonic)."""
    kind, free = case
    low, high = sorted((psi_a, psi_b))
    k_low, k_high, k_uniform = plate_coefficient(kind, [low, high, 1.0], free)
    assert k_low >= k_high * (1 - 3e-3) and k_high >= k_uniform * (1 - 1e-12)


# ----------------------------------------------------------------------------------------------
# the walls against sectionproperties' own outlines

SHAPES = [
    SectionSpec("i", "i_beam", {"depth": 0.3, "width": 0.15, "flange_thickness": 0.0107, "web_thickness": 0.0071, "root_radius": 0.015}),
    SectionSpec("c", "channel", {"depth": 0.2, "width": 0.08, "flange_thickness": 0.011, "web_thickness": 0.006, "root_radius": 0.008}),
    SectionSpec("t", "tee", {"depth": 0.1, "width": 0.12, "flange_thickness": 0.01, "web_thickness": 0.008, "root_radius": 0.006}),
    SectionSpec("l", "angle", {"depth": 0.1, "width": 0.06, "thickness": 0.008, "root_radius": 0.007}),
    SectionSpec("r", "rectangular_tube", {"depth": 0.1, "width": 0.05, "thickness": 0.004, "outer_radius": 0.006}),
    SectionSpec("s", "rectangular_tube", {"depth": 0.1, "width": 0.05, "thickness": 0.004, "outer_radius": 0.002}),
]


@pytest.mark.parametrize("spec", SHAPES, ids=lambda s: f"{s.shape}-{s.name}")
def test_wall_corners_lie_on_the_outline(spec: SectionSpec) -> None:
    """Every corner of every flat wall (edge +/- t/2 through the thickness) is a point of the outline
    sectionproperties draws (member z = -X, y = Y from the bounding-box centre), each edge has a corner
    at a vertex of the outline (the flat ends there), each free edge is on the outline, every supported
    edge inside, and the edges are b apart."""
    from shapely.geometry import Point

    shape = outline(spec).geom
    x0, y0, x1, y1 = shape.bounds
    drawn = lambda y, z: Point((x0 + x1) / 2 - z * 1e3, (y0 + y1) / 2 + y * 1e3)
    vertices = np.array([xy for ring in [shape.exterior, *shape.interiors] for xy in ring.coords])
    walls = section_walls(spec, (0.0, 0.0))
    assert walls
    for wall in walls:
        for edge in (wall.supported, wall.far):
            corners = [drawn(edge[0] + side * wall.thickness * wall.across[0], edge[1] + side * wall.thickness * wall.across[1])
                       for side in (-0.5, 0.5)]
            assert all(shape.boundary.distance(corner) < 1e-6 for corner in corners), (wall.name, edge)
            # the flat ends where the outline turns (a tip, a fillet's end, a corner): a vertex there
            assert min(np.hypot(*(vertices - corner.coords[0]).T).min() for corner in corners) < 1e-6, (wall.name, edge)
        assert shape.buffer(1e-6).contains(drawn(*wall.supported))
        assert shape.boundary.distance(drawn(*wall.far)) < 1e-6 if wall.kind == OUTSTAND else shape.buffer(1e-6).contains(drawn(*wall.far))
        assert math.dist(wall.supported, wall.far) == pytest.approx(wall.width, rel=1e-12)


def test_no_walls_reasons() -> None:
    for shape in ("round", "round_tube", "polygon", "rectangle"):
        assert "not made" in no_walls_reason(shape)
    assert "solid" in no_walls_reason("rectangle")
    for shape in ("i_beam", "channel", "tee", "angle", "rectangular_tube"):
        assert no_walls_reason(shape) is None


# ----------------------------------------------------------------------------------------------
# the stresses in the walls against the full field

@pytest.mark.parametrize("spec", [SHAPES[0], SHAPES[1], SHAPES[3]], ids=lambda s: s.shape)
def test_wall_stresses_equal_the_full_field(spec: SectionSpec) -> None:
    """sectionproperties' stress field is exactly linear (residual of a plane fit below 1e-9); the
    wall stresses equal that plane at every wall corner within 1e-6 of the peak, and each edge of every
    wall has a corner at a mesh node (points from the centroid) where the field has that value."""
    props, field = section_properties(spec), unit_stress_field(spec)
    design = np.column_stack([np.ones(len(field.points)), field.points])
    fitted, *_ = np.linalg.lstsq(design, field.sigma.T, rcond=None)  # (3 coefficients, 3 unit actions)
    residual = design @ fitted - field.sigma.T
    assert np.abs(residual).max() <= 1e-9 * np.abs(field.sigma).max()
    rng = np.random.default_rng(5)
    actions = rng.normal(size=(4, 6)) * [1e5, 1e4, 1e4, 1e3, 5e3, 2e4]
    walls = section_walls(spec, props.centroid)
    found = wall_stresses(walls, actions, props.area, props.Iz, props.Iy, props.Iyz)
    units = actions[:, [0, 4, 5]]  # N, My, Mz per the unit fields
    scale = np.abs(units @ np.abs(field.sigma)).max()

    def field_compression(y: float, z: float) -> np.ndarray:
        return -(units @ (fitted.T @ [1.0, y, z]))

    for w, wall in enumerate(walls):
        corners = [(e[0] + s * wall.thickness * wall.across[0], e[1] + s * wall.thickness * wall.across[1])
                   for e in (wall.supported, wall.far) for s in (-0.5, 0.5)]
        np.testing.assert_allclose(found.supported[:, w], field_compression(*wall.supported), atol=1e-6 * scale)
        np.testing.assert_allclose(found.far[:, w], field_compression(*wall.far), atol=1e-6 * scale)
        peak = np.max([field_compression(*corner) for corner in corners], axis=0)
        np.testing.assert_allclose(found.peak[:, w], peak, atol=1e-6 * scale)
        nodes = [np.argmin(np.hypot(*(field.points - corner).T)) for corner in corners]
        on_nodes = [(i, corner, node) for i, (corner, node) in enumerate(zip(corners, nodes)) if math.dist(field.points[node], corner) < 1e-9]
        assert {i // 2 for i, _, _ in on_nodes} == {0, 1}, wall.name  # each edge: a tip or fillet end, so a mesh node
        for _, corner, node in on_nodes:
            np.testing.assert_allclose(-(units @ field.sigma[:, node]), field_compression(*corner), atol=1e-6 * scale)


# ----------------------------------------------------------------------------------------------
# the check against the plate formula

def test_square_tube_wall_in_uniform_compression(tmp_path: Path) -> None:
    """An axially loaded SHS 150x3 strut: each wall is an internal plate, k = 4.0, b = 150 - 2 x 3 mm
    (Timoshenko & Gere); demand P / A, A = D^2 - (D - 2t)^2; allowable from the Johnson rule."""
    area = 0.150**2 - 0.144**2
    critical = 4.0 * BRYAN * (0.003 / 0.144) ** 2
    allowable = reduced(critical, 0.5 + math.sqrt(0.085 - 0.055))  # internal wall, uniform compression: 0.673
    assert FY / 2 < critical and allowable < min(F, critical / SF)  # this case is on the Johnson curve
    for factor, passes in ((0.98, True), (1.02, False)):
        load = factor * allowable * area
        design = design_of(tmp_path, "SHS 150x3", axial_kN=-load / 1e3)
        xs, sides = check_stations(design)
        actions = to_section_axes(member_actions(design, xs, sides), design.member.orientation)
        result = local_check(design, actions, xs, design.solution.combination_names)
        assert result.extra["critical_stress"] == pytest.approx(critical, rel=1e-9)
        assert result.demand == pytest.approx(load / area, rel=1e-6)
        assert result.allowable == pytest.approx(allowable, rel=1e-9)
        assert result.utilization == pytest.approx(factor, rel=1e-6)
        assert result.passes is passes
        assert "wall" in result.extra["element"] and "k = 4 " in result.detail and "Johnson" in result.detail


def test_flange_outstand_in_uniform_compression(tmp_path: Path) -> None:
    """A wide thin-flanged I-section under axial load: the flange outstands govern, k = 0.43
    (EN 1993-1-5) within 1.2 % of 0.425 (Timoshenko & Gere), b = (200 - 8) / 2 mm."""
    design = design_of(tmp_path, "WIDE 200x200")
    result = one_station(design, N=-200e3)
    critical = 0.43 * BRYAN * (0.006 / 0.096) ** 2
    assert result.extra["critical_stress"] == pytest.approx(critical, rel=1e-9)
    assert result.extra["critical_stress"] == pytest.approx(0.425 * BRYAN * (0.006 / 0.096) ** 2, rel=0.012)
    assert result.extra["element"].startswith("top flange outstand")
    area = 2 * 0.2 * 0.006 + 0.188 * 0.008
    assert result.demand == pytest.approx(200e3 / area, rel=1e-6)
    assert result.allowable == pytest.approx(reduced(critical, 0.748), rel=1e-9)  # outstand


def test_signs_put_the_governing_outstand_on_the_compressed_side(tmp_path: Path) -> None:
    """A positive Mz compresses the top (docs/design.md section 2), a positive My the -z side (sigma = My z / Iy);
    the demand is the peak over the wall's faces (M c / I, c to the top face)."""
    design = design_of(tmp_path, "WIDE 200x200")
    sagging = one_station(design, Mz=10e3)
    assert sagging.extra["element"].startswith("top flange outstand")
    inertia = (0.2 * 0.2**3 - 0.192 * 0.188**3) / 12  # sharp-cornered I-section, closed form
    assert sagging.demand == pytest.approx(10e3 * 0.1 / inertia, rel=1e-6)  # at the top face, not mid-thickness
    assert "psi = 1.00" in sagging.detail
    assert one_station(design, Mz=-10e3).extra["element"].startswith("bottom flange outstand")
    assert one_station(design, My=2e3).extra["element"].endswith("(-z side)")
    assert one_station(design, My=-2e3).extra["element"].endswith("(+z side)")


def test_web_in_pure_bending(tmp_path: Path) -> None:
    """A deep thin web under a pure major-axis moment: psi = -1, k = 23.9 (Timoshenko & Gere; EN
    1993-1-5), b = 400 - 2 x 16 mm; demand M y / I at the web's top edge with the closed-form I."""
    design = design_of(tmp_path, "DEEP 400x100")
    moment = 100e3
    result = one_station(design, Mz=moment)
    inertia = (0.1 * 0.4**3 - (0.1 - 0.003) * 0.368**3) / 12
    critical = 23.9 * BRYAN * (0.003 / 0.368) ** 2
    assert math.sqrt(FY / critical) > 0.5 + math.sqrt(0.085 + 0.055)  # beyond the plateau: the web is reduced
    assert result.extra["element"] == "web"
    assert "psi = -1.00" in result.detail
    assert result.extra["critical_stress"] == pytest.approx(critical, rel=2e-3)
    assert result.demand == pytest.approx(moment * 0.184 / inertia, rel=1e-6)
    assert result.allowable == pytest.approx(reduced(critical, 0.5 + math.sqrt(0.085 + 0.055)), rel=2e-3)  # psi = -1


def test_not_made_where_nothing_buckles_locally(tmp_path: Path) -> None:
    bar = design_of(tmp_path, "FB 20x80")
    assert not one_station(bar, N=-1e5).made and "solid" in one_station(bar, N=-1e5).detail
    beam = design_of(tmp_path, "I 160x82", axial_kN=1.0)
    tension = one_station(beam, N=1e5)
    assert not tension.made and tension.detail == "no compression in any wall"


def test_missing_allowables_are_bad_input_only_with_compression(tmp_path: Path) -> None:
    material = STEEL_TOML.replace('compression = "150 MPa"\n', "").replace('bending = "165 MPa"\n', "")
    design = design_of(tmp_path, "I 160x82", material=material, axial_kN=1.0)
    assert not one_station(design, N=1e5).made
    with pytest.raises(InputError) as error:
        one_station(design, N=-1e5)
    assert error.value.key == "materials.steel.allowable.compression" and "local" in error.value.problem


# ----------------------------------------------------------------------------------------------
# many sections at once

def test_vectorized_form_equals_the_check_of_each_section(tmp_path: Path) -> None:
    """local_utilizations (blocks of sections and rows, per-section and shared actions) gives each
    section's local_check utilization and place (the first of tied rows), on a small mixed catalogue."""
    designs = [design_of(tmp_path, name) for name in MIXED]
    rng = np.random.default_rng(11)
    xs, names = np.linspace(0.0, 2.0, 5), ("one", "two")
    actions = rng.normal(size=(len(MIXED), 2, 5, 6)) * [2e4, 1e3, 1e3, 1e2, 1e3, 5e3]
    props = [d.props for d in designs]
    table = wall_table([d.spec for d in designs], [p.centroid for p in props])
    scalars = [np.array([getattr(p, key) for p in props]) for key in ("area", "Iz", "Iy", "Iyz")]
    common = {"E": E, "nu": NU, "yield_strength": FY, "allowable": F, "safety_factor": SF}
    tied = 0.1 * actions
    tied[:, 1, 4] = tied[:, 1, 2] = actions[:, 0, 0]  # the same, largest actions at two stations: the first governs
    for table_actions in (actions, tied):
        for rows in (table_actions.reshape(len(MIXED), -1, 6), table_actions[0].reshape(-1, 6)):
            shared = rows.ndim == 2
            found, at = local_utilizations(table, rows, *scalars, **common, block_values=7)
            whole, whole_at = local_utilizations(table, rows, *scalars, **common)
            np.testing.assert_array_equal(at, whole_at)
            np.testing.assert_allclose(found, whole, rtol=1e-15)
            for s, design in enumerate(designs):
                result = local_check(design, table_actions[0 if shared else s], xs, names)
                if not result.made:
                    assert found[s] == 0.0 and at[s] == -1
                    continue
                assert found[s] == pytest.approx(result.utilization, rel=1e-12)
                assert (names[at[s] // len(xs)], xs[at[s] % len(xs)]) == (result.combination, result.at)
                if table_actions is tied:
                    assert (result.combination, result.at) == ("two", xs[2])


def _synthetic_table() -> tuple:
    """An I-like section of four outstands and a web (invented dimensions, m) and its scalars."""
    walls = [Wall("o1", OUTSTAND, (0.095, 0.005), (0.095, 0.1), (1.0, 0.0), 0.01, 0.095),
             Wall("o2", OUTSTAND, (0.095, -0.005), (0.095, -0.1), (1.0, 0.0), 0.01, 0.095),
             Wall("o3", OUTSTAND, (-0.095, 0.005), (-0.095, 0.1), (1.0, 0.0), 0.01, 0.095),
             Wall("o4", OUTSTAND, (-0.095, -0.005), (-0.095, -0.1), (1.0, 0.0), 0.01, 0.095),
             Wall("web", INTERNAL, (0.09, 0.0), (-0.09, 0.0), (0.0, 1.0), 0.006, 0.18)]
    return table_of_walls([walls]), np.array([5e-3]), np.array([3.5e-5]), np.array([1.3e-5]), np.array([0.0])


ACTION = st.floats(-1e5, 1e5, allow_nan=False)


@settings(max_examples=50, deadline=None)
@given(st.lists(ACTION, min_size=6, max_size=6), st.floats(0.1, 10.0))
def test_utilization_without_a_yield_strength_scales_with_the_actions(values: list[float], factor: float) -> None:
    """Scaling every action by a positive factor keeps each wall's stress ratio psi, so sigma_cr and
    (without a yield strength) the allowable are unchanged and the utilization scales by the factor
    (linear elasticity)."""
    table, *scalars = _synthetic_table()
    rows = np.array([values])
    common = {"E": E, "nu": NU, "yield_strength": None, "allowable": F, "safety_factor": SF}
    base, _ = local_utilizations(table, rows, *scalars, **common)
    scaled, _ = local_utilizations(table, factor * rows, *scalars, **common)
    assert scaled[0] == pytest.approx(factor * base[0], rel=1e-9, abs=1e-300)
