"""`sizer sections` list / show / add / build / import through the typer app."""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest
from typer.testing import CliRunner

from sizer import units
from sizer.cli_sections import app
from sizer.sections import load_catalogue, shipped_library
from sizer.sections.properties import clear_memory

STOCK = """# Test stock: small solid bars so that the properties compute quickly.
# (comment kept by `sections add`)

[[sections]]
name = "FL 40x10"   # on edge
shape = "rectangle"
family = "flat"
depth = "40 mm"
width = "10 mm"

[[sections]]
name = "RD 24"
shape = "round"
family = "round"
diameter = "24 mm"
material = "aluminium-6061-t6"

# trailing comment
"""


@pytest.fixture(scope="module")
def library(tmp_path_factory: pytest.TempPathFactory):
    """A catalogue folder (stock + the shipped materials) and a private cache for the module."""
    folder = tmp_path_factory.mktemp("library")
    (folder / "materials.toml").write_text((shipped_library() / "materials.toml").read_text(encoding="utf-8"), encoding="utf-8")
    (folder / "stock.toml").write_text(STOCK, encoding="utf-8")
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("SIZER_CACHE_DIR", str(tmp_path_factory.mktemp("cache")))
        clear_memory()
        yield folder
        clear_memory()


def run(*args: str):
    return CliRunner().invoke(app, [str(arg) for arg in args])


def assert_bad_input(result, *words: str) -> None:
    """Exit 2, one line on stderr holding `words`, nothing on stdout, no traceback."""
    assert result.exit_code == 2, result.stdout + result.stderr
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1, result.stderr
    for word in words:
        assert word in lines[0]
    assert result.stdout == "" and "Traceback" not in result.stderr


def test_list_json_gives_si_values(library: Path) -> None:
    result = run("list", "--catalogue", library, "--json")
    assert result.exit_code == 0, result.stderr
    document = json.loads(result.stdout)
    rows = {row["name"]: row for row in document["sections"]}
    assert any("qualified engineer" in caution for caution in document["cautions"])
    assert rows["FL 40x10"]["area"] == pytest.approx(0.040 * 0.010)  # A = bh
    assert rows["FL 40x10"]["Iz"] == pytest.approx(0.010 * 0.040**3 / 12, rel=1e-6)  # bh^3/12
    assert rows["FL 40x10"]["mass_per_length"] == pytest.approx(0.040 * 0.010 * 7850)  # mild-steel by default
    assert rows["RD 24"]["mass_per_length"] == pytest.approx(math.pi * 0.024**2 / 4 * 2700, rel=1e-3)  # its own material
    assert rows["RD 24"]["mass_material"] == "aluminium-6061-t6"


def test_list_table_has_units_and_filters(library: Path) -> None:
    result = run("list", "--catalogue", library, "--family", "round", "--units", "us")
    assert result.exit_code == 0, result.stderr
    assert "RD 24" in result.stdout and "FL 40x10" not in result.stdout
    assert units.unit_label("area", "us") in result.stdout and units.unit_label("mass_per_length", "us") in result.stdout
    assert_bad_input(run("list", "--catalogue", library, "--family", "tube"), "--family", "flat, round")
    assert_bad_input(run("list", "--catalogue", library, "--units", "imperial"), "--units")


def test_show_json_has_every_key(library: Path) -> None:
    result = run("show", "FL 40x10", "--catalogue", library, "--json")
    assert result.exit_code == 0, result.stderr
    data = json.loads(result.stdout)
    for key in ("name", "shape", "area", "Iz", "Iy", "J", "Iw", "mass_per_length", "Sz_top", "Zz", "rz", "shear_centre",
                "Avy", "centroid", "unit_stress_peaks", "mass_material"):
        assert key in data
    b, h = 0.010, 0.040
    assert data["Zz"] == pytest.approx(b * h**2 / 4, rel=1e-3)  # plastic modulus bh^2/4
    assert data["J"] == pytest.approx(0.281 * h * b**3, rel=0.03)  # Roark Table 10.1, beta = 0.281 for h/b = 4 (from memory)
    assert data["unit_stress_peaks"]["tau_per_Vy"] == pytest.approx(1.5 / (b * h), rel=0.02)  # 1.5 V/A
    assert data["mass_material"] == "mild-steel" and "default" in data["mass_note"]


def test_show_table_and_plots(library: Path, tmp_path: Path) -> None:
    result = run("show", "RD 24", "--catalogue", library, "--plot", tmp_path / "rd.png")
    assert result.exit_code == 0, result.stderr
    assert units.unit_label("inertia") in result.stdout and "aluminium-6061-t6" in result.stdout
    assert (tmp_path / "rd.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert run("show", "FL 40x10", "--catalogue", library, "--plot", tmp_path / "fl.svg").exit_code == 0
    assert "<svg" in (tmp_path / "fl.svg").read_text(encoding="utf-8")
    assert_bad_input(run("show", "FL 40x10", "--catalogue", library, "--plot", tmp_path / "fl.jpg"), "--plot")
    assert not (tmp_path / "fl.jpg").exists()
    assert_bad_input(run("show", "FL 40x12", "--catalogue", library), "unknown section", "FL 40x10")


def test_add_keeps_comments_and_entries(library: Path, tmp_path: Path) -> None:
    folder = tmp_path / "shop"
    folder.mkdir()
    stock = folder / "stock.toml"
    stock.write_text(STOCK.replace("aluminium-6061-t6", "mild-steel"), encoding="utf-8")
    (folder / "materials.toml").write_text((library / "materials.toml").read_text(encoding="utf-8"), encoding="utf-8")
    before = stock.read_text(encoding="utf-8")
    result = run("add", stock, "--name", "RHS 80x40x3", "--shape", "rectangular_tube", "--depth", "80 mm", "--width", "40 mm",
                 "--thickness", "3 mm", "--outer-radius", "6 mm", "--family", "tube", "--material", "mild-steel")
    assert result.exit_code == 0, result.stderr
    after = stock.read_text(encoding="utf-8")
    assert after.startswith(before)  # every comment and entry as it was, the new entry after them
    spec = load_catalogue([stock]).get("RHS 80x40x3")
    assert spec.dims == pytest.approx({"depth": 0.08, "width": 0.04, "thickness": 0.003, "outer_radius": 0.006})
    assert spec.family == "tube" and spec.material == "mild-steel"


@pytest.mark.parametrize("options, words", [
    (["--name", "W", "--shape", "i_beam", "--depth", "100 mm", "--width", "50 mm", "--flange-thickness", "8 mm", "--web-thickness", "60 mm"], ("--web-thickness",)),
    (["--name", "W", "--shape", "i_beam", "--depth", "100 mm", "--width", "50 mm", "--flange-thickness", "8 mm", "--web-thickness", "6 mm", "--diameter", "9 mm"], ("--diameter", "unknown key")),
    (["--name", "W", "--shape", "round", "--diameter", "30"], ("--diameter", "no unit")),
    (["--name", "W", "--shape", "hexagon", "--diameter", "30 mm"], ("--shape", "unknown shape")),
    (["--name", "RD 24", "--shape", "round", "--diameter", "30 mm"], ("--name", "already in")),
    (["--name", "W", "--shape", "round", "--diameter", "30 mm", "--material", "brass"], ("--material", "mild-steel")),
])
def test_add_refuses_bad_entries_and_writes_nothing(library: Path, options: list[str], words: tuple[str, ...]) -> None:
    stock = library / "stock.toml"
    before = stock.read_bytes()
    assert_bad_input(run("add", stock, *options), *words)
    assert stock.read_bytes() == before


CSV = """name,depth [mm],width [mm],thickness,outer_radius (mm),family
RHS 50x30x2,50,30,2 mm,4,tube
RHS 60x40x9,60,40,25 mm,4,tube
RHS 70x50x3,70,50,3,4,tube
RHS 80x40x3,80,40,3 mm,6,tube
RHS 50x30x2,55,30,2 mm,4,tube
"""


def test_import_lists_refused_rows_and_writes_the_rest(library: Path, tmp_path: Path) -> None:
    table = tmp_path / "stock.csv"
    table.write_text(CSV, encoding="utf-8")
    target = tmp_path / "tubes.toml"
    result = run("import", table, "--shape", "rectangular_tube", "--into", target)
    assert result.exit_code == 1, result.stderr  # done, with rows refused
    refused = result.stderr.strip().splitlines()
    assert len(refused) == 3
    assert f"{table}:3" in refused[0] and "thickness" in refused[0]  # wall too thick
    assert f"{table}:4" in refused[1] and "no unit" in refused[1]  # bare number, no unit in the header
    assert f"{table}:6" in refused[2] and "row 2" in refused[2]  # name repeated
    sections = load_catalogue([target]).sections
    assert list(sections) == ["RHS 50x30x2", "RHS 80x40x3"]
    assert sections["RHS 50x30x2"].dims["outer_radius"] == pytest.approx(0.004)


def test_import_prints_toml_without_into(tmp_path: Path) -> None:
    table = tmp_path / "bars.csv"
    table.write_text("name,diameter [mm]\nRD 10,10\nRD 12,12\n", encoding="utf-8")
    result = run("import", table, "--shape", "round")
    assert result.exit_code == 0, result.stderr
    printed = tmp_path / "printed.toml"
    printed.write_text(result.stdout, encoding="utf-8")
    assert load_catalogue([printed]).get("RD 12").dims == {"diameter": pytest.approx(0.012)}
    table.write_text("name,depth [mm]\nX,10\n", encoding="utf-8")
    assert_bad_input(run("import", table, "--shape", "round"), "depth", "unknown column")


def test_build_reports_what_it_did(library: Path) -> None:
    result = run("build", "--catalogue", library)
    assert result.exit_code == 0, result.stderr
    assert "2 sections" in result.stdout and "already cached" in result.stdout
