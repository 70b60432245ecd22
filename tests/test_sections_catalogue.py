"""Catalogue files: reading, validation (one clear line per bad input, exit 2), look-up."""

from __future__ import annotations

import math
from pathlib import Path

import pytest
from typer.testing import CliRunner

from sizer.cli_sections import app
from sizer.errors import InputError
from sizer.sections import default_catalogue_paths, load_catalogue, shipped_library

GOOD = """# a good entry to sit beside the bad one
[[sections]]
name = "good"
shape = "rectangle"
depth = "50 mm"
width = "10 mm"

"""

# (entry text, the key the error must name, a word the message must hold)
BAD_ENTRIES = [
    ('name = "x"\nshape = "i-beam"\ndepth = "100 mm"', "sections[2].shape", "did you mean 'i_beam'"),
    ('name = "x"\nshape = "rectangle"\ndepth = "100 mm"\nwidht = "10 mm"', "sections[2].widht", "unknown key"),
    ('name = "x"\nshape = "rectangle"\ndepth = "100 mm"', "sections[2]", "'width' is missing"),
    ('shape = "rectangle"\ndepth = "100 mm"\nwidth = "10 mm"', "sections[2].name", "no name"),
    ('name = "x"\nshape = "rectangle"\ndepth = "-100 mm"\nwidth = "10 mm"', "sections[2].depth", "greater than zero"),
    ('name = "x"\nshape = "round_tube"\ndiameter = "60 mm"\nthickness = "0 mm"', "sections[2].thickness", "greater than zero"),
    ('name = "x"\nshape = "rectangle"\ndepth = 100\nwidth = "10 mm"', "sections[2].depth", "no unit"),
    ('name = "x"\nshape = "rectangle"\ndepth = "100"\nwidth = "10 mm"', "sections[2].depth", "no unit"),
    ('name = "x"\nshape = "rectangle"\ndepth = "nan mm"\nwidth = "10 mm"', "sections[2].depth", "not a finite number"),
    ('name = "x"\nshape = "rectangle"\ndepth = inf\nwidth = "10 mm"', "sections[2].depth", "no unit"),
    ('name = "x"\nshape = "rectangle"\ndepth = "100 kN"\nwidth = "10 mm"', "sections[2].depth", "not a length"),
    ('name = "x"\nshape = "rectangular_tube"\ndepth = "100 mm"\nwidth = "50 mm"\nthickness = "25 mm"', "sections[2].thickness", "half the smaller"),
    ('name = "x"\nshape = "rectangular_tube"\ndepth = "100 mm"\nwidth = "50 mm"\nthickness = "4 mm"\nouter_radius = "30 mm"', "sections[2].outer_radius", "half the smaller"),
    ('name = "x"\nshape = "round_tube"\ndiameter = "60 mm"\nthickness = "30 mm"', "sections[2].thickness", "half the diameter"),
    ('name = "x"\nshape = "i_beam"\ndepth = "100 mm"\nwidth = "50 mm"\nflange_thickness = "50 mm"\nweb_thickness = "5 mm"', "sections[2].flange_thickness", "two flanges"),
    ('name = "x"\nshape = "channel"\ndepth = "100 mm"\nwidth = "50 mm"\nflange_thickness = "8 mm"\nweb_thickness = "50 mm"', "sections[2].web_thickness", "the width"),
    ('name = "x"\nshape = "tee"\ndepth = "40 mm"\nwidth = "50 mm"\nflange_thickness = "40 mm"\nweb_thickness = "5 mm"', "sections[2].flange_thickness", "the depth"),
    ('name = "x"\nshape = "i_beam"\ndepth = "100 mm"\nwidth = "50 mm"\nflange_thickness = "8 mm"\nweb_thickness = "6 mm"\nroot_radius = "22 mm"', "sections[2].root_radius", "outstand"),
    ('name = "x"\nshape = "angle"\ndepth = "50 mm"\nwidth = "50 mm"\nthickness = "5 mm"\nroot_radius = "-1 mm"', "sections[2].root_radius", "negative"),
    ('name = "x"\nshape = "angle"\ndepth = "50 mm"\nwidth = "40 mm"\nthickness = "40 mm"', "sections[2].thickness", "shorter leg"),
    ('name = "x"\nshape = "polygon"\npoints = [["0 mm", "0 mm"], ["10 mm", "10 mm"], ["10 mm", "0 mm"], ["0 mm", "10 mm"]]', "sections[2].points", "crosses"),
    ('name = "x"\nshape = "polygon"\npoints = [["0 mm", "0 mm"], ["10 mm", "0 mm"], ["10 mm", "10 mm"]]\n'
     'holes = [[["20 mm", "20 mm"], ["30 mm", "20 mm"], ["30 mm", "30 mm"]]]', "sections[2].holes", "not a valid outline"),
    ('name = "x"\nshape = "polygon"\npoints = [["0 mm", "0 mm"], ["10 mm", "0 mm"]]', "sections[2].points", "at least three points"),
    ('name = "good"\nshape = "round"\ndiameter = "20 mm"', "sections[2].name", "used twice in this file"),
]


def _write(folder: Path, name: str, text: str) -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


@pytest.mark.parametrize("entry, key, words", BAD_ENTRIES)
def test_bad_entry_names_file_key_and_line(tmp_path: Path, entry: str, key: str, words: str) -> None:
    path = _write(tmp_path, "stock.toml", GOOD + "[[sections]]\n" + entry + "\n")
    with pytest.raises(InputError) as caught:
        load_catalogue([path])
    error = caught.value
    assert error.file == str(path)
    assert error.key == key
    assert words in str(error)
    assert error.line is not None and error.line >= 8  # inside the second entry (it starts on line 8)
    key_name = key.rsplit(".", 1)[-1]
    if "." in key and key_name != "name" and key_name in entry:
        lines = path.read_text().splitlines()
        assert lines[error.line - 1].lstrip().startswith(key_name)  # the line of the key itself


@pytest.mark.parametrize("entry, key, words", BAD_ENTRIES)
def test_bad_entry_gives_one_line_and_exit_2(tmp_path: Path, entry: str, key: str, words: str) -> None:
    path = _write(tmp_path, "stock.toml", GOOD + "[[sections]]\n" + entry + "\n")
    result = CliRunner().invoke(app, ["list", "--catalogue", str(path)])
    assert result.exit_code == 2
    assert result.stdout == ""
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and key in lines[0] and str(path) in lines[0]
    assert "Traceback" not in result.stderr


def test_names_unique_across_files(tmp_path: Path) -> None:
    first = _write(tmp_path, "a.toml", GOOD)
    second = _write(tmp_path, "b.toml", "# another file\n" + GOOD)
    result = CliRunner().invoke(app, ["list", "--catalogue", str(tmp_path)])
    assert result.exit_code == 2
    line = result.stderr.strip()
    assert str(first) in line and str(second) in line and "'good'" in line


def test_toml_syntax_error_gives_its_line(tmp_path: Path) -> None:
    path = _write(tmp_path, "broken.toml", GOOD + '[[sections]]\nname = "x\n')
    with pytest.raises(InputError) as caught:
        load_catalogue([path])
    assert caught.value.line == 9 and "TOML" in caught.value.problem


def test_unknown_top_level_key_and_missing_path(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="unknown key 'section'"):
        load_catalogue([_write(tmp_path, "typo.toml", '[[section]]\nname = "x"\n')])
    with pytest.raises(InputError, match="no such file or folder"):
        load_catalogue([tmp_path / "missing"])


def test_unknown_section_suggests_close_names() -> None:
    catalogue = load_catalogue([shipped_library()])
    with pytest.raises(InputError) as caught:
        catalogue.get("ipe300", "beam.toml", "member.section", 4)
    assert "'IPE 300'" in caught.value.fix and caught.value.line == 4 and caught.value.file == "beam.toml"
    result = CliRunner().invoke(app, ["show", "HEA 200"])
    assert result.exit_code == 2 and "HE 200 A" in result.stderr and len(result.stderr.strip().splitlines()) == 1


def test_shipped_catalogue_reads_and_matches_the_standard_dimensions() -> None:
    catalogue = load_catalogue([shipped_library()])
    assert {"IPE 80", "IPE 600", "HE 100 A", "HE 500 A", "RHS 100x50x4"} <= set(catalogue.sections)
    assert len(catalogue.select(["ipe"])) == 18 and len(catalogue.select(["hea"])) == 17
    ipe = catalogue.get("IPE 300").dims  # EN 10365 dimensions as given in docs/references.md
    assert ipe == pytest.approx({"depth": 0.300, "width": 0.150, "web_thickness": 0.0071, "flange_thickness": 0.0107, "root_radius": 0.015})
    steel = catalogue.materials["mild-steel"]  # 0.60 / 0.66 / 0.40 Fy practice, docs/references.md
    assert steel.density == 7850 and steel.elastic_modulus == 200e9 and steel.yield_strength == 250e6
    assert steel.allowable.tension == pytest.approx(0.60 * 250e6) and steel.allowable.bending == pytest.approx(0.66 * 250e6)
    assert steel.allowable.shear == pytest.approx(0.40 * 250e6)
    aluminium = catalogue.materials["aluminium-6061-t6"]  # docs/references.md: E about 69 GPa, 2700 kg/m^3
    assert aluminium.elastic_modulus == 69e9 and aluminium.density == 2700
    assert aluminium.allowable.tension < aluminium.yield_strength


def test_polygon_section_reads_points_and_holes(tmp_path: Path) -> None:
    path = _write(tmp_path, "plate.toml", '[[sections]]\nname = "box"\nshape = "polygon"\n'
                  'points = [["0 mm", "0 mm"], ["60 mm", "0 mm"], ["60 mm", "40 mm"], ["0 mm", "40 mm"], ["0 mm", "0 mm"]]\n'
                  'holes = [[["10 mm", "10 mm"], ["50 mm", "10 mm"], ["50 mm", "30 mm"], ["10 mm", "30 mm"]]]\n')
    spec = load_catalogue([path]).get("box")
    assert [c for point in spec.points for c in point] == pytest.approx([0, 0, 0.06, 0, 0.06, 0.04, 0, 0.04])  # closing point dropped
    assert len(spec.holes) == 1 and spec.dims == {}


def test_geometry_key_follows_geometry_only(tmp_path: Path) -> None:
    path = _write(tmp_path, "two.toml", GOOD + GOOD.replace('"good"', '"twin"').replace("# a good", "# twin of the good")
                  + '[[sections]]\nname = "deeper"\nshape = "rectangle"\ndepth = "50.1 mm"\nwidth = "10 mm"\n')
    catalogue = load_catalogue([path])
    assert catalogue.get("good").geometry_key() == catalogue.get("twin").geometry_key()
    assert catalogue.get("good").geometry_key() != catalogue.get("deeper").geometry_key()


def test_default_paths_and_member_files_in_a_folder(tmp_path: Path) -> None:
    member = _write(tmp_path, "beam.toml", '[member]\nlength = "2 m"\n')
    assert default_catalogue_paths(member) == [shipped_library()]
    library = tmp_path / "section_library"
    library.mkdir()
    _write(library, "stock.toml", GOOD)
    assert default_catalogue_paths(member) == [library]
    _write(tmp_path, "pyproject.toml", '[project]\nname = "shop-tools"\n')
    catalogue = load_catalogue([tmp_path])  # a member file and a project file: skipped in a folder
    assert catalogue.sections == {} and catalogue.files == ()
    with pytest.raises(InputError, match="unknown key 'member'"):
        load_catalogue([member])  # named on its own, a file must be a catalogue
    assert math.isclose(load_catalogue([library]).get("good").dims["depth"], 0.05)


def test_mass_material_says_which(tmp_path: Path) -> None:
    materials = (shipped_library() / "materials.toml").read_text(encoding="utf-8")
    path = _write(tmp_path, "stock.toml", materials + "\n" + GOOD + '[[sections]]\nname = "alu"\nshape = "round"\ndiameter = "20 mm"\n'
                  'material = "aluminium-6061-t6"\n\n[[sections]]\nname = "odd"\nshape = "round"\ndiameter = "20 mm"\nmaterial = "brass"\n')
    catalogue = load_catalogue([path])
    material, note = catalogue.mass_material(catalogue.get("good"))
    assert material.name == "mild-steel" and "default" in note
    material, note = catalogue.mass_material(catalogue.get("alu"))
    assert material.density == 2700 and "section's material" in note
    material, note = catalogue.mass_material(catalogue.get("odd"))
    assert material is None and "'brass'" in note
