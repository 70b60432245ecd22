"""The section tiers (issue 15): the geometric tier from the outline alone against closed forms and
against sectionproperties' own library and geometric analysis; the normal stresses at the
outline's corners and the warping tier (sizer's own six-node triangles) against sectionproperties'
analyses of the same mesh; and the sizing, which computes the warping tier only for the sections
whose verdict needs it and gives the same answer whatever the cache holds.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer.cli import app
from sizer.errors import InputError
from sizer.sections import build_catalogue, cache, load_catalogue
from sizer.sections.catalogue import SectionSpec
from sizer.sections.geometric import GEOMETRIC_NAMES, geometric_scalars, normal_stress_field
from sizer.sections.geometry import MIN_ANGLE, MM, N_CIRCLE, N_RADIUS, max_element_area, mesh, outline, outline_rings
from sizer.sections.polygon import polygon_moments
from sizer.sections.properties import AnalysisWorkers, clear_memory, has_warping, unit_stress_field
from sizer.sections.warping import WARPING_NAMES, analyse, compute
from tests.steel import STEEL_TOML

ROUND_OFF = 1e-9  # relative: two exact integrations of the same polygon differ by round-off only

SPECS = {
    "flat": SectionSpec("flat", "rectangle", {"depth": 0.060, "width": 0.012}),
    "rod": SectionSpec("rod", "round", {"diameter": 0.030}),
    "box": SectionSpec("box", "rectangular_tube", {"depth": 0.080, "width": 0.040, "thickness": 0.003, "outer_radius": 0.006}),
    "sharp box": SectionSpec("sharp box", "rectangular_tube", {"depth": 0.050, "width": 0.050, "thickness": 0.004, "outer_radius": 0.0}),
    "pipe": SectionSpec("pipe", "round_tube", {"diameter": 0.060, "thickness": 0.004}),
    "i": SectionSpec("i", "i_beam", {"depth": 0.120, "width": 0.064, "flange_thickness": 0.0063, "web_thickness": 0.0044, "root_radius": 0.007}),
    "sharp i": SectionSpec("sharp i", "i_beam", {"depth": 0.100, "width": 0.050, "flange_thickness": 0.006, "web_thickness": 0.004, "root_radius": 0.0}),
    "channel": SectionSpec("channel", "channel", {"depth": 0.100, "width": 0.050, "flange_thickness": 0.0085, "web_thickness": 0.006, "root_radius": 0.0085}),
    "tee": SectionSpec("tee", "tee", {"depth": 0.080, "width": 0.080, "flange_thickness": 0.009, "web_thickness": 0.009, "root_radius": 0.009}),
    "angle": SectionSpec("angle", "angle", {"depth": 0.075, "width": 0.050, "thickness": 0.006, "root_radius": 0.007}),
    "slotted plate": SectionSpec("slotted plate", "polygon", points=((0.0, 0.0), (0.06, 0.0), (0.06, 0.04), (0.0, 0.04)),
                                 holes=(((0.01, 0.01), (0.05, 0.01), (0.05, 0.03), (0.01, 0.03)),)),
}


def library_outline(spec: SectionSpec):
    """The shape as sectionproperties' own section library draws it (mm), as the catalogue's mesh rule asks."""
    from sectionproperties.pre.library import primitive_sections as primitive
    from sectionproperties.pre.library import steel_sections as steel

    d = {key: value * MM for key, value in spec.dims.items()}
    return {
        "rectangle": lambda: primitive.rectangular_section(d=d["depth"], b=d["width"]),
        "round": lambda: primitive.circular_section(d=d["diameter"], n=N_CIRCLE),
        "rectangular_tube": lambda: steel.rectangular_hollow_section(d=d["depth"], b=d["width"], t=d["thickness"], r_out=d["outer_radius"], n_r=N_RADIUS),
        "round_tube": lambda: steel.circular_hollow_section(d=d["diameter"], t=d["thickness"], n=N_CIRCLE),
        "i_beam": lambda: steel.i_section(d=d["depth"], b=d["width"], t_f=d["flange_thickness"], t_w=d["web_thickness"], r=d["root_radius"], n_r=N_RADIUS),
        "channel": lambda: steel.channel_section(d=d["depth"], b=d["width"], t_f=d["flange_thickness"], t_w=d["web_thickness"], r=d["root_radius"], n_r=N_RADIUS),
        "tee": lambda: steel.tee_section(d=d["depth"], b=d["width"], t_f=d["flange_thickness"], t_w=d["web_thickness"], r=d["root_radius"], n_r=N_RADIUS),
        "angle": lambda: steel.angle_section(d=d["depth"], b=d["width"], t=d["thickness"], r_r=d["root_radius"], r_t=0.0, n_r=N_RADIUS),
    }[spec.shape]().geom


def corner_set(points: np.ndarray) -> set[tuple[float, float]]:
    return {(round(x, 9), round(y, 9)) for x, y in np.asarray(points)}


# ----------------------------------------------------------------------------------------------
# outlines and polygon integrals

@pytest.mark.parametrize("name", [name for name, spec in SPECS.items() if spec.shape != "polygon"])
def test_outlines_are_the_corners_sectionproperties_library_draws(name: str) -> None:
    """Our numpy outline of each shape has exactly the corners of sectionproperties' section library
    (the reference: a general-purpose library), so the geometric tier and the mesh see one polygon."""
    spec = SPECS[name]
    exterior, holes = outline_rings(spec)
    drawn = library_outline(spec)
    assert corner_set(exterior) == corner_set(np.asarray(drawn.exterior.coords)[:-1])
    assert [corner_set(hole) for hole in holes] == [corner_set(np.asarray(ring.coords)[:-1]) for ring in drawn.interiors]


def test_polygon_integrals_of_a_rectangle_and_a_right_triangle() -> None:
    """Rectangle b x h: A = bh, I = b h^3 / 12 about its centroid (any mechanics of materials text).
    Right triangle with legs b along x and h along y: centroid (b/3, h/3), I_xx = b h^3 / 36,
    I_xy = -b^2 h^2 / 72 about the centroid (tables of plane areas, from memory), and the third
    moment integral (y - h/3)^3 dA = b h^4 / 270 (direct integration with width b (1 - y/h))."""
    b, h = 3.0, 5.0
    rectangle = polygon_moments(np.array([[0, 0], [b, 0], [b, h], [0, h]]))
    assert (rectangle.area, rectangle.centroid) == (pytest.approx(b * h), pytest.approx((b / 2, h / 2)))
    assert (rectangle.xx, rectangle.yy, rectangle.xy) == (pytest.approx(b * h**3 / 12), pytest.approx(h * b**3 / 12), pytest.approx(0, abs=1e-12))
    triangle = polygon_moments(np.array([[0, 0], [b, 0], [0, h]]))
    assert triangle.area == pytest.approx(b * h / 2, rel=1e-12)
    assert triangle.centroid == pytest.approx((b / 3, h / 3), rel=1e-12)
    assert triangle.xx == pytest.approx(b * h**3 / 36, rel=1e-12)
    assert triangle.xy == pytest.approx(-(b**2) * h**2 / 72, rel=1e-12)
    assert triangle.third[(0, 3)] == pytest.approx(b * h**4 / 270, rel=1e-12)
    assert triangle.third[(3, 0)] == pytest.approx(h * b**4 / 270, rel=1e-12)  # the same with x and y swapped


@settings(max_examples=40, deadline=None)
@given(points=st.lists(st.tuples(st.floats(-50, 50), st.floats(-50, 50)), min_size=3, max_size=8),
       start=st.integers(0, 7), shift=st.tuples(st.floats(-100, 100), st.floats(-100, 100)))
def test_polygon_integrals_do_not_depend_on_where_a_ring_starts_runs_or_sits(points, start, shift) -> None:
    """Invariants: the starting corner and the direction of a ring change nothing; moving it moves
    the centroid alone (central moments are about the centroid)."""
    from shapely.geometry import MultiPoint

    hull = MultiPoint(points).convex_hull  # a simple polygon from the points
    if hull.geom_type != "Polygon" or hull.area < 1.0:
        return
    ring = np.asarray(hull.exterior.coords)[:-1]
    base = polygon_moments(ring)
    turned = polygon_moments(np.roll(ring, start % len(ring), axis=0)[::-1])
    moved = polygon_moments(ring + np.asarray(shift))
    size = max(np.ptp(ring, axis=0)) + 100
    for other in (turned, moved):
        assert other.area == pytest.approx(base.area, rel=1e-9)
        for name in ("xx", "yy", "xy"):
            assert getattr(other, name) == pytest.approx(getattr(base, name), rel=1e-7, abs=1e-9 * base.area * size**2)
        for order, value in base.third.items():
            assert other.third[order] == pytest.approx(value, rel=1e-6, abs=1e-9 * base.area * size**3)
    assert moved.centroid == pytest.approx((base.centroid[0] + shift[0], base.centroid[1] + shift[1]), abs=1e-9 * size)


@settings(max_examples=40, deadline=None)
@given(points=st.lists(st.tuples(st.floats(-50, 50), st.floats(-50, 50)), min_size=3, max_size=8),
       hole=st.floats(0.05, 0.4), reverse=st.booleans())
def test_the_second_order_closed_forms_equal_the_general_integrals(points, hole, reverse) -> None:
    """plane_moments (the shoelace closed forms, used for the normal stresses alone) gives the area,
    centroid and second moments of polygon_moments (the general triangle formula) to round-off, with
    a hole and either direction of the rings."""
    from shapely.geometry import MultiPoint

    from sizer.sections.polygon import plane_moments

    hull = MultiPoint(points).convex_hull
    if hull.geom_type != "Polygon" or hull.area < 1.0:
        return
    ring = np.asarray(hull.exterior.coords)[:-1]
    centre = ring.mean(axis=0)
    inner = centre + hole * (ring - centre)  # a smaller copy inside (the hull is convex)
    if reverse:
        ring, inner = ring[::-1], inner[::-1]
    general = polygon_moments(ring, [inner])
    area, centroid, xx, yy, xy = plane_moments(ring, [inner])
    size = max(np.ptp(ring, axis=0))
    assert area == pytest.approx(general.area, rel=1e-12)
    assert centroid == pytest.approx(general.centroid, abs=1e-12 * size)
    for value, name in ((xx, "xx"), (yy, "yy"), (xy, "xy")):
        assert value == pytest.approx(getattr(general, name), rel=1e-10, abs=1e-12 * general.area * size**2)


@settings(max_examples=40, deadline=None)
@given(depth=st.floats(40, 600), width_ratio=st.floats(0.3, 1.0), flange=st.floats(0.02, 0.12), web=st.floats(0.02, 0.08))
def test_sharp_i_beam_against_its_closed_form(depth: float, width_ratio: float, flange: float, web: float) -> None:
    """An I-beam with sharp corners (mm): A = 2 b tf + (h - 2 tf) tw, Iz = [b h^3 - (b - tw)(h - 2 tf)^3] / 12,
    Iy = [2 tf b^3 + (h - 2 tf) tw^3] / 12, S = 2 Iz / h (any steel handbook's formulas, from
    memory); doubly symmetric, so no offsets, no product of inertia, no monosymmetry integrals."""
    b = depth * width_ratio
    tf, tw = flange * depth, min(web * depth, 0.9 * b)
    spec = SectionSpec("I", "i_beam", {"depth": depth * 1e-3, "width": b * 1e-3, "flange_thickness": tf * 1e-3,
                                       "web_thickness": tw * 1e-3, "root_radius": 0.0})
    s = geometric_scalars(spec)
    h = depth
    assert s["area"] == pytest.approx((2 * b * tf + (h - 2 * tf) * tw) * 1e-6, rel=1e-12)
    assert s["Iz"] == pytest.approx((b * h**3 - (b - tw) * (h - 2 * tf) ** 3) / 12 * 1e-12, rel=1e-10)
    assert s["Iy"] == pytest.approx((2 * tf * b**3 + (h - 2 * tf) * tw**3) / 12 * 1e-12, rel=1e-10)
    assert (s["Sz_top"], s["Sz_bottom"]) == pytest.approx((2 * s["Iz"] / (h * 1e-3),) * 2, rel=1e-12)
    assert (s["centroid_y"], s["centroid_z"], s["Iyz"], s["Py"], s["Pz"]) == (0.0, 0.0, 0.0, 0.0, 0.0)
    assert s["sigma_peak_Mz"] == pytest.approx((h * 1e-3 / 2) / s["Iz"], rel=1e-12)  # sigma = M c / I per unit M


# ----------------------------------------------------------------------------------------------
# the geometric tier against sectionproperties

@pytest.fixture(scope="module")
def analysed() -> dict[str, object]:
    """sectionproperties' geometric, warping and plastic analyses of every spec on sizer's mesh."""
    return {name: analyse(spec) for name, spec in SPECS.items()}


@pytest.mark.parametrize("name", list(SPECS))
def test_geometric_tier_is_sectionproperties_geometric_analysis(analysed, name: str) -> None:
    """Green's theorem over the outline against sectionproperties' finite-element integration of the
    same polygon (both exact for these polynomials): equal to round-off, member axes as
    sizer.sections.properties maps them (y = Y, z = -X)."""
    section, s = analysed[name], geometric_scalars(SPECS[name])
    xmin, xmax, ymin, ymax = section.geometry.calculate_extents()
    cx, cy = section.get_c()
    ixx, iyy, ixy = section.get_ic()
    i11, i22 = section.get_ip()
    zxx_plus, zxx_minus, zyy_plus, zyy_minus = section.get_z()
    props = section.section_props
    size = max(xmax - xmin, ymax - ymin)
    reference = {
        "area": section.get_area() / MM**2, "Iz": ixx / MM**4, "Iy": iyy / MM**4, "I11": i11 / MM**4, "I22": i22 / MM**4,
        "Sz_top": zxx_plus / MM**3, "Sz_bottom": zxx_minus / MM**3, "Sy_plus": zyy_minus / MM**3, "Sy_minus": zyy_plus / MM**3,
        "y_top": (ymax - cy) / MM, "y_bottom": (cy - ymin) / MM, "z_plus": (cx - xmin) / MM, "z_minus": (xmax - cx) / MM,
        "depth": (ymax - ymin) / MM, "width": (xmax - xmin) / MM, "perimeter": section.get_perimeter() / MM,
    }
    for key, value in reference.items():
        assert s[key] == pytest.approx(value, rel=ROUND_OFF), key
    assert s["centroid_y"] == pytest.approx((cy - (ymin + ymax) / 2) / MM, abs=ROUND_OFF * size / MM)
    assert s["centroid_z"] == pytest.approx(-(cx - (xmin + xmax) / 2) / MM, abs=ROUND_OFF * size / MM)
    assert s["Iyz"] == pytest.approx(-ixy / MM**4, abs=ROUND_OFF * (ixx * iyy) ** 0.5 / MM**4)
    # the monosymmetry integrals from sectionproperties' monosymmetry constants (its beta_x_minus, beta_y_minus)
    py = (props.beta_x_minus + 2 * props.y_se) * ixx / MM**5
    pz = -(props.beta_y_minus + 2 * props.x_se) * iyy / MM**5
    scale = (ixx + iyy) * size / MM**5
    assert (s["Py"], s["Pz"]) == (pytest.approx(py, abs=1e-7 * scale), pytest.approx(pz, abs=1e-7 * scale))


@pytest.mark.parametrize("name", ["angle", "channel", "tee", "slotted plate", "box"])
def test_corner_stresses_are_the_full_fields_normal_stresses(name: str) -> None:
    """The normal stresses per unit N, My, Mz at the outline's corners equal sectionproperties' unit
    stress field at those nodes (the mesh keeps every corner), and its peaks are the field's peaks."""
    spec = SPECS[name]
    corners, field = normal_stress_field(spec), unit_stress_field(spec)
    scale = np.abs(field.sigma).max(axis=1, keepdims=True)
    nearest = [int(np.argmin(np.hypot(*(field.points - point).T))) for point in corners.points]
    assert np.allclose(field.points[nearest], corners.points, atol=1e-12)
    assert np.allclose(field.sigma[:, nearest], corners.sigma, rtol=0, atol=ROUND_OFF * scale)
    assert corners.sigma_peak == pytest.approx(field.sigma_peak, rel=ROUND_OFF)
    assert not corners.shear_known and not np.any(corners.tau)


@pytest.mark.parametrize("name", list(SPECS))
def test_the_mesh_is_the_one_sectionproperties_makes(name: str) -> None:
    """Triangle is given what sectionproperties gives it for a Geometry of the outline: the same nodes
    and six-node elements, so both analyse one mesh."""
    spec = SPECS[name]
    drawn = outline(spec)
    drawn.create_mesh(mesh_sizes=max_element_area(spec, drawn), min_angle=MIN_ANGLE)
    ours = mesh(spec)
    theirs = np.array(drawn.mesh["triangles"])
    theirs[:, [3, 4, 5]] = theirs[:, [5, 3, 4]]  # as sectionproperties' Section orders a Tri6
    assert np.array_equal(ours.nodes, np.array(drawn.mesh["vertices"])) and np.array_equal(ours.elements, theirs)


@pytest.mark.parametrize("name", list(SPECS))
def test_warping_tier_is_sectionproperties_analysis_of_the_same_mesh(analysed, name: str) -> None:
    """sizer's six-node triangles (every element at once) against sectionproperties' warping and
    plastic analyses and its stress analysis on the same mesh: J, the warping constant, the shear
    centre, the shear areas, the plastic moduli and the unit stress fields, to round-off (shear centre
    offsets: to 1e-5 of the section's size, below which the tier calls solver noise zero)."""
    spec, section = SPECS[name], analysed[name]
    geometric = geometric_scalars(spec)
    scalars, arrays = compute(spec, geometric)
    props = section.section_props
    a_sx, a_sy = section.get_as()
    reference = {"J": section.get_j() / MM**4, "Iw": section.get_gamma() / MM**6, "Avy": a_sy / MM**2, "Avz": a_sx / MM**2,
                 "Zz": section.get_s()[0] / MM**3, "Zy": section.get_s()[1] / MM**3}
    size = max(geometric["depth"], geometric["width"])
    for key, value in reference.items():
        scale = (geometric["Iz"] + geometric["Iy"]) * size**2 if key == "Iw" else abs(value)  # Iw of a solid bar is round-off
        assert scalars[key] == pytest.approx(value, abs=1e-9 * scale), key
    assert (scalars["ys"], scalars["zs"]) == pytest.approx((props.y_se / MM, -props.x_se / MM), abs=1e-5 * size)
    stress = section.calculate_stress(n=1, vy=1, vx=-1, mxx=-1, myy=1, mzz=1).get_stress()[0]  # unit member actions, N and N mm
    sigma = np.stack([stress["sig_zz_n"] * 1e6, stress["sig_zz_myy"] * 1e9, stress["sig_zz_mxx"] * 1e9])
    tau = np.stack([np.column_stack([stress[f"sig_zy_{action}"], -stress[f"sig_zx_{action}"]]) * scale
                    for action, scale in (("vy", 1e6), ("vx", 1e6), ("mzz", 1e9))])
    assert np.allclose(arrays["sigma"], sigma, rtol=0, atol=ROUND_OFF * np.abs(sigma).max())
    assert np.allclose(arrays["tau"], tau, rtol=0, atol=ROUND_OFF * np.abs(tau).max())
    assert scalars["mesh_nodes"] == section.num_nodes and scalars["mesh_elements"] == len(section.elements)


def test_a_section_without_area_is_bad_input() -> None:
    flat = SectionSpec("no depth", "rectangle", {"depth": 0.0, "width": 0.008}, source="stock.toml", line=7)
    with pytest.raises(InputError) as caught:
        geometric_scalars(flat)
    assert (caught.value.file, caught.value.line) == ("stock.toml", 7) and "'no depth'" in caught.value.problem
    assert set(geometric_scalars(SPECS["flat"])) == set(GEOMETRIC_NAMES)


# ----------------------------------------------------------------------------------------------
# computing the warping tier

@pytest.fixture()
def fresh_cache(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """An empty section cache of this test's own, nothing in memory."""
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    clear_memory()
    yield tmp_path / "cache"
    clear_memory()


def test_workers_compute_what_this_process_computes(fresh_cache: Path) -> None:
    """Two worker processes and this process give bit-identical warping tiers and fields
    (common practice: a result does not depend on where it is computed), and report each section
    to the progress bar once."""
    specs = [SPECS["channel"], SPECS["box"], SPECS["angle"]]
    seen: list[tuple[int, int, str]] = []
    with AnalysisWorkers(2, progress=lambda done, total, name: seen.append((done, total, name))) as workers:
        workers.wait(specs)
        assert workers.started
    clear_memory()
    assert all(has_warping(spec) for spec in specs)
    for spec in specs:
        from_worker = (cache.read_entry(cache.entry_key(spec), WARPING_NAMES)["scalars"], unit_stress_field(spec))
        here = compute(spec, geometric_scalars(spec))
        assert from_worker[0] == here[0] and np.array_equal(from_worker[1].tau, here[1]["tau"])
    assert seen[0] == (0, 3, "") and sorted(name for _, _, name in seen[1:]) == sorted(spec.name for spec in specs) and seen[-1][:2] == (3, 3)


def test_a_dask_cluster_computes_what_this_process_computes(fresh_cache: Path) -> None:
    """Sections built on a Dask cluster (the worker pool's other kind) are bit-identical to those
    computed here, and kept in this machine's cache by this process (common practice: a result does
    not depend on where it is computed)."""
    distributed = pytest.importorskip("distributed")
    specs = [SPECS["channel"], SPECS["angle"]]
    with distributed.LocalCluster(n_workers=1, processes=False, threads_per_worker=1, dashboard_address=None, protocol="tcp://") as cluster:
        summary = build_catalogue(specs, cluster=cluster.scheduler_address)
    assert (summary.geometries, summary.computed) == (2, 2)
    clear_memory()
    for spec in specs:
        kept = (cache.read_entry(cache.entry_key(spec), WARPING_NAMES)["scalars"], unit_stress_field(spec))
        here = compute(spec, geometric_scalars(spec))
        assert kept[0] == here[0] and np.array_equal(kept[1].tau, here[1]["tau"])


# ----------------------------------------------------------------------------------------------
# the sizing: the warping tier only where a verdict needs it

BARS = {f"B {b}x{d}": (b, d) for b, d in ((10, 40), (10, 45), (10, 50), (12, 50), (10, 60), (12, 60), (10, 70), (12, 70))}
SPAN, W = 2.0, 2.0e3  # m, N/m


def bar_catalogue(folder: Path) -> Path:
    entries = [STEEL_TOML] + [f'[[sections]]\nname = "{name}"\nshape = "rectangle"\ndepth = "{d} mm"\nwidth = "{b} mm"\n'
                              for name, (b, d) in BARS.items()]
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "bars.toml").write_text("\n".join(entries), encoding="utf-8")
    return folder


def restrained_beam(folder: Path) -> Path:
    """Pin and roller, a uniform load, held sideways and in twist along its length: bending governs."""
    path = folder / "beam.toml"
    path.write_text(f"""
[member]
length = "{SPAN} m"
material = "steel"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "{SPAN} m"
type = "roller"

[[restraints]]
from = "0 m"
to = "{SPAN} m"
hold = ["lateral", "twist"]

[[loads]]
type = "line"
case = "imposed"
wy = "{-W} N/m"
""", encoding="utf-8")
    return path


def size_document(member: Path, catalogue: Path, *options: str) -> dict:
    result = CliRunner().invoke(app, ["size", str(member), "--catalogue", str(catalogue), "--json", *options], env={"COLUMNS": "250"})
    assert result.exit_code in (0, 1), result.stdout + result.stderr
    return json.loads(result.stdout)


def test_a_section_ruled_out_by_bending_alone_never_gets_its_warping_tier(fresh_cache: Path, tmp_path: Path) -> None:
    """Simply supported, uniform load: M = w L^2 / 8, the lightest bar with S = b d^2 / 6 >= M / Fb
    passes (AISC Table 3-23 and elementary beam theory, from memory; Fb = 165 MPa, tests/steel.py).
    The lighter bars the screen rules out by bending (from the outline alone) never have their
    warping tier or stress fields computed."""
    catalogue = bar_catalogue(tmp_path / "stock")
    document = size_document(restrained_beam(tmp_path), catalogue, "--top", "1")
    moment = W * SPAN**2 / 8
    passing = [name for name, (b, d) in sorted(BARS.items(), key=lambda item: item[1][0] * item[1][1])
               if b * d**2 / 6 * 1e-9 * 165e6 >= moment]
    assert document["section"] == passing[0]
    by_screen = [entry for entry in document["candidates"] if entry["basis"] == "screen"]
    assert len(by_screen) >= 2 and all(entry["governing"] == "bending" and entry["utilization"] > 1.0 for entry in by_screen)
    specs = load_catalogue([catalogue]).sections
    for entry in document["candidates"]:
        on_disk = (cache.cache_folder() / f"{cache.entry_key(specs[entry['section']])}.entry").is_file()
        assert on_disk is (entry["basis"] == "full stress field"), entry["section"]
        if not on_disk:  # a proven lower bound: the closed form's M / S / Fb at the screen's station nearest midspan
            b, d = BARS[entry["section"]]
            closed_form = moment / (b * d**2 / 6 * 1e-9) / 165e6
            assert entry["utilization"] <= closed_form * (1 + 1e-9)
            if entry["basis"] == "screen":  # ruled out by it (a runner-up not checked in full may show a weaker bound)
                assert closed_form * (1 - 1e-4) <= entry["utilization"]


UNBRACED = """
[member]
length = "3 m"
material = "steel"
self_weight = "dead"

[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "3 m"
type = "roller"

[[loads]]
type = "line"
case = "imposed"
wy = "-2.5 kN/m"
[[loads]]
type = "point"
case = "imposed"
at = "1 m"
fy = "-1 kN"
fx = "-4 kN"

[combinations]
"dead + imposed" = { dead = 1.0, imposed = 1.0 }
"dead" = { dead = 1.0 }

[checks]
deflection_limit = 250
"""

MIXED = """
[[sections]]
name = "I 80x46"
shape = "i_beam"
depth = "80 mm"
width = "46 mm"
flange_thickness = "5.2 mm"
web_thickness = "3.8 mm"
root_radius = "5 mm"

[[sections]]
name = "I 100x55"
shape = "i_beam"
depth = "100 mm"
width = "55 mm"
flange_thickness = "5.7 mm"
web_thickness = "4.1 mm"
root_radius = "7 mm"

[[sections]]
name = "I 120x64"
shape = "i_beam"
depth = "120 mm"
width = "64 mm"
flange_thickness = "6.3 mm"
web_thickness = "4.4 mm"
root_radius = "7 mm"

[[sections]]
name = "C 100x50"
shape = "channel"
depth = "100 mm"
width = "50 mm"
flange_thickness = "8.5 mm"
web_thickness = "6 mm"
root_radius = "8.5 mm"

[[sections]]
name = "BOX 80x40x3"
shape = "rectangular_tube"
depth = "80 mm"
width = "40 mm"
thickness = "3 mm"
outer_radius = "6 mm"

[[sections]]
name = "BOX 100x50x4"
shape = "rectangular_tube"
depth = "100 mm"
width = "50 mm"
thickness = "4 mm"
outer_radius = "8 mm"

[[sections]]
name = "FL 100x10"
shape = "rectangle"
depth = "100 mm"
width = "10 mm"
"""


def test_the_answer_does_not_depend_on_what_the_cache_holds(fresh_cache: Path, tmp_path: Path) -> None:
    """An unbraced beam with an axial load over I-beams, a channel, tubes and a flat (stability bounds
    at work): `sizer size` on an empty cache, again on what that run left, and after `sections build`
    computed every tier, gives the same document (common practice: a tool's answer depends on its
    input alone), and the first run left some sections without their warping tier."""
    folder = tmp_path / "stock"
    folder.mkdir()
    (folder / "stock.toml").write_text(STEEL_TOML + MIXED, encoding="utf-8")
    member = tmp_path / "beam.toml"
    member.write_text(UNBRACED, encoding="utf-8")
    first = size_document(member, folder, "--top", "1")
    specs = list(load_catalogue([folder]).sections.values())
    assert not all(has_warping(spec) for spec in specs), "every section was computed: nothing was saved"
    clear_memory()
    again = size_document(member, folder, "--top", "1")
    build_catalogue(specs)
    clear_memory()
    built = size_document(member, folder, "--top", "1")
    assert first == again == built
    assert first["section"] is not None


def test_stability_bounds_wait_for_a_rows_warping_tier(fresh_cache: Path, tmp_path: Path) -> None:
    """StabilityBounds over a table whose warping tier is known for some rows only: those rows get the
    bounds a whole table gives them, the others no lateral-torsional bound and no NaN anywhere."""
    from sizer.analysis import solve_member
    from sizer.checks import check_design
    from sizer.design import catalogue_for, resolve_material
    from sizer.inputfile import read_member_file
    from sizer.model import Stiffness
    from sizer.sizing import candidate_sections, design_for, screen
    from sizer.sizing.stability_bounds import StabilityBounds
    from sizer.stability import MemberStability

    folder = tmp_path / "stock"
    folder.mkdir()
    (folder / "stock.toml").write_text(STEEL_TOML + MIXED, encoding="utf-8")
    path = tmp_path / "beam.toml"
    path.write_text(UNBRACED, encoding="utf-8")
    member = read_member_file(path)
    catalogue = catalogue_for(member, [folder])
    material = resolve_material(member, catalogue)
    base = solve_member(member, Stiffness.unit(), None)
    model = MemberStability(member, base)
    candidates, whole = candidate_sections(catalogue, member, material, (), None, None)
    _, lazy = candidate_sections(catalogue, member, material, (), None, None, lazy=True)
    lazy.reveal([1, 3])
    bounds = {}
    for name, table in (("whole", whole), ("lazy", lazy)):
        found = screen(table, member, material, base)
        bounds[name] = StabilityBounds(model, base, table, found, member, material)
        bounds[name].add(check_design(design_for(member, material, candidates[0], base), unit_stress_field(candidates[0].spec), stability=model).stability)
    rows = np.arange(len(candidates))
    whole_bounds, lazy_bounds = bounds["whole"].lower_bounds(rows), bounds["lazy"].lower_bounds(rows)
    assert whole_bounds["lateral-torsional"][[1, 3]].max() > 0  # the test can tell
    for check in whole_bounds:
        assert np.all(np.isfinite(lazy_bounds[check]))
        assert lazy_bounds[check][[1, 3]] == pytest.approx(whole_bounds[check][[1, 3]], rel=1e-12)
        assert np.all(lazy_bounds[check] <= whole_bounds[check] * (1 + 1e-12))  # never more than the whole table proves
    unknown = [row for row in rows if row not in (1, 3)]
    assert not np.any(lazy_bounds["lateral-torsional"][unknown])
