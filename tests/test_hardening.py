"""Nothing passes silently: every item of the hardening list through the command line.

Bad input gets exit 2, one line on stderr, no traceback and nothing written; the rest gets the
right verdict. Check values (from memory, standard beam tables such as AISC Manual Table 3-23):
cantilever with a tip load P: tip deflection P L^3 / (3 EI); simply supported beam with a central
load: end rotation P L^2 / (16 EI); fixed-fixed beam under w: end moments -w L^2 / 12. Rectangle
b x d: Iz = b d^3 / 12 (elementary beam theory). The stability rule, spring threshold, input ranges
and the small-deflection fraction are sizer's own stated rules (docs/design.md section 3, docs/limits.md).
"""

from __future__ import annotations

import io
import json
import pickle
import re
import stat
from pathlib import Path

import numpy as np
import pytest

from sizer import units
from sizer.analysis import solve_case
from sizer.errors import InputError
from sizer.model import Member, PointLoad, Stiffness, Support
from sizer.cache_store import read_sealed
from sizer.sections import cache
from sizer.sections.properties import clear_memory
from tests.cli_runs import bad_input, run
from tests.steel import STEEL_TOML

E = 200e9  # Pa (tests/steel.py)
B, D = 0.008, 0.030  # the test flat: 8 mm wide, 30 mm deep
EI = E * B * D**3 / 12  # N*m^2, b d^3 / 12

CATALOGUE = STEEL_TOML + """
[[sections]]
name = "F 30x8"
shape = "rectangle"
depth = "30 mm"
width = "8 mm"
"""

BEAM = """\
[member]
length = "6 m"
material = "steel"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "6 m"
type = "roller"

[[loads]]
type = "point"
at = "3 m"
fy = "-10 kN"
"""


def files_in(folder: Path) -> set[str]:
    return {str(path.relative_to(folder)) for path in folder.rglob("*")}


@pytest.fixture
def folder(tmp_path: Path) -> Path:
    """A member folder with its own section_library/ (the test flat and steel)."""
    (tmp_path / "section_library").mkdir()
    (tmp_path / "section_library" / "stock.toml").write_text(CATALOGUE, encoding="utf-8")
    return tmp_path


def member(folder: Path, text: str, name: str = "m.toml") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def with_section(text: str) -> str:
    return text.replace('material = "steel"', 'material = "steel"\nsection = "F 30x8"')


def supports(*entries: str) -> str:
    """BEAM with its supports replaced by `entries` (TOML bodies of [[supports]])."""
    head, tail = BEAM.split("[[supports]]", 1)
    loads = "[[loads]]" + tail.split("[[loads]]", 1)[1]
    return head + "".join(f"[[supports]]\n{entry}\n\n" for entry in entries) + loads


def json_of(result: object) -> dict:
    assert result.exit_code in (0, 1), (result.exit_code, result.stderr)
    return json.loads(result.stdout)


def first_combination(result: object) -> dict:
    """The `forces --json` object of the first combination (under "combinations", or the document
    itself for one combination), with the document's assumptions."""
    document = json_of(result)
    first = document["combinations"][0] if "combinations" in document else document
    return {**first, "assumptions": document["assumptions"]}


# ----------------------------------------------------------------------------------------------
# 1. stability from the supports alone

@pytest.mark.parametrize("text, words", [
    # one roller with equal loads either side: balanced, yet free to turn
    (supports('at = "3 m"\ntype = "roller"') + '[[loads]]\ntype = "point"\nat = "1 m"\nfy = "-5 kN"\n'
     '[[loads]]\ntype = "point"\nat = "5 m"\nfy = "-5 kN"\n', ("mechanism", "rz")),
    # a pin at mid-length under a full-length load
    (supports('at = "3 m"\ntype = "pin"').replace('type = "point"\nat = "3 m"\nfy = "-10 kN"', 'type = "line"\nwy = "-2 kN/m"'),
     ("mechanism", "rz", "about x = 3 m")),
    # two rollers with equal and opposite axial loads
    (supports('at = "0 m"\ntype = "roller"', 'at = "6 m"\ntype = "roller"') + '[[loads]]\ntype = "point"\nat = "1 m"\nfx = "5 kN"\n'
     '[[loads]]\ntype = "point"\nat = "5 m"\nfx = "-5 kN"\n', ("mechanism", "ux", "loads[2]")),
    # pin - hinge - roller with the load on a support (it does no work on the mechanism)
    (BEAM.replace('at = "3 m"\nfy', 'at = "0 m"\nfy') + '[[hinges]]\nat = "3 m"\n', ("mechanism", "from 0 m to 3 m")),
    # a hinge next to a free end
    (supports('at = "0 m"\ntype = "pin"', 'at = "5 m"\ntype = "roller"') + '[[hinges]]\nat = "5.9 m"\n',
     ("mechanism", "the part from 5.9 m to 6 m turns about x = 5.9 m")),
    # balanced torques with twist free
    (supports('at = "0 m"\nrestrain = ["ux", "uy", "uz"]', 'at = "6 m"\nrestrain = ["uy", "uz"]')
     + '[[loads]]\ntype = "moment"\nat = "1 m"\nmx = "1 kN*m"\n[[loads]]\ntype = "moment"\nat = "5 m"\nmx = "-1 kN*m"\n', ("mechanism", "rx")),
])
def test_a_mechanism_is_bad_input_whatever_the_loads(folder: Path, text: str, words: tuple[str, ...]) -> None:
    path = member(folder, text)
    bad_input(run("forces", path), "supports", *words)


@pytest.mark.parametrize("k", ["1e-6 N/m", "1e-300 N/m"])  # k L^3 / EI = 6e-8 and 6e-302 for the flat
def test_supports_of_soft_springs_only_are_a_mechanism(folder: Path, k: str) -> None:
    text = with_section(supports(f'at = "0 m"\nrestrain = ["ux", "uz", "rx"]\nsprings = {{ uy = "{k}" }}',
                                 f'at = "6 m"\nrestrain = ["uz"]\nsprings = {{ uy = "{k}" }}'))
    bad_input(run("forces", member(folder, text)), "mechanism", "uy", "counts as free")


def test_spring_threshold_is_k_L3_over_EI(folder: Path) -> None:
    # k L^3 / EI >= 1e-6 holds (docs/limits.md); L = 2 m, EI of the flat: threshold k = 1e-6 EI / 8.
    threshold = 1e-6 * EI / 2.0**3
    for factor, holds in ((2.0, True), (0.5, False)):
        text = with_section(BEAM.replace('length = "6 m"', 'length = "2 m"').replace('at = "6 m"', 'at = "2 m"')
                            .replace('at = "3 m"', 'at = "2 m"').replace('type = "roller"', f'restrain = ["uz"]\nsprings = {{ uy = "{threshold * factor} N/m" }}')
                            .replace('fy = "-10 kN"', 'fy = "-1 N"'))
        result = run("forces", member(folder, text), "--json")
        if holds:
            document = first_combination(result)
            assert document["reactions"][1]["Fy"] == pytest.approx(1.0, rel=1e-9)  # the spring takes the tip load (statics)
            assert document["reactions"][1]["type"] == "restrain uz + springs"
        else:
            bad_input(result, "mechanism", "below 1e-06")


def test_free_sliding_and_twist_are_allowed_unloaded_and_said(folder: Path) -> None:
    text = supports('at = "0 m"\nrestrain = ["uy", "uz"]', 'at = "6 m"\nrestrain = ["uy", "uz"]')
    document = first_combination(run("forces", member(folder, text), "--json"))
    assert document["reactions"][0]["Fy"] == pytest.approx(5e3, rel=1e-12)  # P / 2
    notes = " ".join(document["assumptions"])
    assert "(ux)" in notes and "(rx)" in notes and "no load of the file acts that way" in notes


def test_springs_only_support_is_labelled_once(folder: Path) -> None:
    text = with_section(supports('at = "0 m"\ntype = "pin"', 'at = "6 m"\nsprings = { uy = "20 kN/mm", uz = "20 kN/mm", rx = "1 kN*m/rad" }'))
    document = first_combination(run("forces", member(folder, text), "--json"))
    assert [entry["type"] for entry in document["reactions"]] == ["pin", "springs"]


# ----------------------------------------------------------------------------------------------
# 2. every deflection limit given is checked

CANTILEVER = with_section(supports('at = "0 m"\ntype = "fixed"').replace('length = "6 m"', 'length = "1 m"')
                          .replace('at = "3 m"', 'at = "1 m"').replace('fy = "-10 kN"', 'fy = "-200 N"'))


@pytest.mark.parametrize("checks, limit", [
    ("deflection_limit = 300", 150.0),                                  # overhangs: half the span limit
    ("deflection_limit_overhang = 540", 540.0),                         # the overhang key alone
    ("deflection_limit = 300\ndeflection_limit_overhang = 100", 100.0),  # its own limit wins
])
def test_each_deflection_key_is_checked(folder: Path, checks: str, limit: float) -> None:
    result = run("check", member(folder, CANTILEVER + f"\n[checks]\n{checks}\n"), "--json")
    document = json_of(result)
    [entry] = [c for c in document["checks"] if c["check"] == "deflection"]
    tip = 200.0 * 1.0**3 / (3 * EI)  # P L^3 / (3 EI) = 18.5 mm
    assert entry["demand"] == pytest.approx(tip, rel=1e-3)
    assert entry["allowable"] == pytest.approx(1.0 / limit, rel=1e-12)
    assert entry["utilization"] > 1 and document["passes"] is False and result.exit_code == 1


def test_an_overhang_limit_without_an_overhang_is_said(folder: Path) -> None:
    document = json_of(run("check", member(folder, with_section(BEAM).replace('fy = "-10 kN"', 'fy = "-10 N"')
                                            + "\n[checks]\ndeflection_limit_overhang = 540\n"), "--json"))
    [entry] = [c for c in document["checks"] if c["check"] == "deflection"]
    assert entry["utilization"] is None
    assert any("spans not checked" in note for note in document["assumptions"])


# ----------------------------------------------------------------------------------------------
# 3. caches carry a digest of their whole content

def _reaction(folder: Path, path: Path) -> float:
    return first_combination(run("forces", path, "--json"))["reactions"][0]["Fy"]


def test_a_changed_unit_factor_is_not_believed(folder: Path, monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    path = member(folder, BEAM.replace('"-10 kN"', '"-1000 daN"'))  # a unit pint is asked for (not one of the common ones built in)
    assert _reaction(folder, path) == pytest.approx(5e3, rel=1e-12)  # P / 2
    memory = tmp_path / "cache" / units.UNIT_CACHE_NAME
    seal, _, body = memory.read_bytes().partition(b"\n")
    data = json.loads(body)
    data["daN|force"] = 18.0  # daN as 18 N; the seal is left as it was
    memory.write_bytes(seal + b"\n" + json.dumps(data, sort_keys=True).encode())
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    assert _reaction(folder, path) == pytest.approx(5e3, rel=1e-12)
    assert json.loads(read_sealed(memory))["daN|force"] == 10.0  # rewritten


def _iz(folder: Path, key: str = "Iz") -> float:
    result = run("sections", "show", "F 30x8", "--catalogue", folder / "section_library", "--json")
    assert result.exit_code == 0, result.stderr
    return json.loads(result.stdout)[key]


def test_a_changed_section_scalar_is_not_believed(folder: Path, monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    clear_memory()
    good = _iz(folder)
    assert good == pytest.approx(B * D**3 / 12, rel=1e-6)
    torsion = _iz(folder, "J")  # an entry holds the warping tier (the geometric tier comes from the outline)
    [entry] = (tmp_path / "cache" / "sections").glob("*.entry")
    seal, _, body = entry.read_bytes().partition(b"\n")
    data = json.loads(body)
    data["scalars"]["J"] *= 10.0  # the seal is left as it was
    entry.write_bytes(seal + b"\n" + json.dumps(data).encode())
    clear_memory()
    assert _iz(folder, "J") == torsion and _iz(folder) == good


def test_a_changed_section_table_value_is_not_believed(folder: Path, monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    clear_memory()
    listing = ["sections", "list", "--catalogue", folder / "section_library", "--json"]
    good = json.loads(run(*listing).stdout)
    [table] = (tmp_path / "cache" / "section-tables").glob("*")
    header, payload = table.read_bytes().split(b"\n", 1)
    values = np.load(io.BytesIO(payload))
    values[0, 0] *= 2.0  # the area
    buffer = io.BytesIO()
    np.save(buffer, values)
    table.write_bytes(header + b"\n" + buffer.getvalue())
    clear_memory()
    assert json.loads(run(*listing).stdout) == good
    assert cache.read_table(table.stem, values.shape) is not None  # rebuilt whole


def test_a_changed_parsed_catalogue_is_not_believed(folder: Path, monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    clear_memory()
    path = member(folder, with_section(BEAM))
    good = first_combination(run("forces", path, "--json"))["deflection"]["max"]
    assert good == pytest.approx(10e3 * 6.0**3 / (48 * EI), rel=1e-3)  # P L^3 / (48 EI)
    [slot] = (tmp_path / "cache" / "catalogues").glob("*.pickle")
    seal, digest, payload = slot.read_bytes().split(b"\n", 2)
    parsed = pickle.loads(payload)
    spec = parsed.sections[0]
    object.__setattr__(spec, "dims", {**spec.dims, "depth": 0.3})  # ten times deeper; the seal and digest are left as they were
    slot.write_bytes(seal + b"\n" + digest + b"\n" + pickle.dumps(parsed))
    clear_memory()
    assert first_combination(run("forces", path, "--json"))["deflection"]["max"] == good


# ----------------------------------------------------------------------------------------------
# 4 - 6. limits: no arithmetic, sane ranges, bounded meshes, finite numbers, one line

@pytest.mark.parametrize("old, new, words", [
    ('length = "6 m"', 'length = "10**10**10 m"', ("member.length", "number and a unit")),
    ('fy = "-10 kN"', 'fy = "5 kN / 0"', ("loads[1].fy", "number and a unit")),
    ('fy = "-10 kN"', 'fy = "-1e308 N"', ("loads[1].fy", "range")),
    ('length = "6 m"', 'length = "1e-300 m"', ("member.length", "range")),
    ('fy = "-10 kN"', 'fy = "' + "9" * 400 + ' N"', ("loads[1].fy", "not a finite number")),
    ('fy = "-10 kN"', 'fy = "kN"', ("loads[1].fy", "has no number")),
    ('self_weight = false', 'self_weight = false\n[combinations]\n"" = { load = 1.0 }', ('combinations.""', "empty name")),
])
def test_bad_values_in_the_member_file(folder: Path, old: str, new: str, words: tuple[str, ...]) -> None:
    path = member(folder, with_section(BEAM).replace(old, new))
    bad_input(run("check", path), *words)


@pytest.mark.parametrize("text, kind, expected", [
    # SI prefixes and derived units (SI Brochure, common practice); 1 ksi = 6.894757 MPa (NIST SP 811, from memory)
    ("5 N/mm²", "stress", 5e6), ("8 kN·m", "moment", 8e3), ("7850 kg/(m^3)", "density", 7850.0),
    ("36 ksi", "stress", 36 * 6.894757293e6), ("2.5m", "length", 2.5), ("500 kN*m/rad", "rotational_stiffness", 5e5),
])
def test_numbers_with_units_still_read(text: str, kind: str, expected: float) -> None:
    assert units.parse(text, kind) == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("old, new, words", [
    ('"200 GPa"', '"1e-300 Pa"', ("elastic_modulus", "range")),
    ('"7850 kg/m^3"', '"1e308 kg/m^3"', ("density", "range")),
    ('"165 MPa"', '"165 MPa / 0"', ("allowable.bending", "number and a unit")),
])
def test_bad_values_in_the_material(folder: Path, old: str, new: str, words: tuple[str, ...]) -> None:
    path = member(folder, with_section(BEAM) + STEEL_TOML.replace("materials.steel", "materials.own").replace(old, new))
    bad_input(run("check", path), *words)


@pytest.mark.parametrize("factor", ["1e308", "1" * 400])
def test_huge_plain_numbers(folder: Path, factor: str) -> None:
    path = member(folder, BEAM + f'\n[combinations]\nall = {{ load = {factor} }}\n')
    bad_input(run("forces", path), "combinations.all.load", "larger than sizer accepts")


@pytest.mark.parametrize("entry, words", [
    ('depth = "1e300 m"\nwidth = "8 mm"', ("depth", "range")),
    ('depth = "100 mm"\nwidth = "0.001 mm"', ("width", "too thin")),
    ('depth = "30 mm / 0"\nwidth = "8 mm"', ("depth", "number and a unit")),
])
def test_bad_catalogue_sections_are_refused_when_read(folder: Path, entry: str, words: tuple[str, ...]) -> None:
    (folder / "section_library" / "more.toml").write_text(f'[[sections]]\nname = "X"\nshape = "rectangle"\n{entry}\n', encoding="utf-8")
    bad_input(run("check", member(folder, with_section(BEAM))), "more.toml", *words)


def test_a_thin_polygon_is_refused_when_read(folder: Path) -> None:
    points = '[["0 mm", "0 mm"], ["500 mm", "0 mm"], ["500 mm", "0.1 mm"], ["0 mm", "0.1 mm"]]'
    (folder / "section_library" / "more.toml").write_text(f'[[sections]]\nname = "X"\nshape = "polygon"\npoints = {points}\n', encoding="utf-8")
    bad_input(run("check", member(folder, with_section(BEAM))), "more.toml", "too thin")


def test_csv_rows_are_refused_one_by_one(folder: Path) -> None:
    rows = folder / "rows.csv"
    rows.write_text("name,depth,width\nA,30 mm,8 mm\nB,5 mm / 0,8 mm\nC,100 mm,0.001 mm\nD,1e300 m,8 mm\n", encoding="utf-8")
    into = folder / "section_library" / "imported.toml"
    result = run("sections", "import", rows, "--shape", "rectangle", "--into", into)
    assert result.exit_code == 1 and "Traceback" not in result.stderr
    refused = result.stderr.strip().splitlines()
    assert [re.search(r"rows\.csv:(\d+):", line).group(1) for line in refused] == ["3", "4", "5"]  # rows B, C and D
    assert into.read_text(encoding="utf-8").count("[[sections]]") == 1  # row A only


def test_bad_values_on_the_command_line(folder: Path) -> None:
    path = member(folder, BEAM)
    bad_input(run("forces", path, "--at", "1 m / 0"), "--at")
    bad_input(run("forces", path, "--units", "xyz"), "--units", "xyz")
    target = folder / "section_library" / "stock.toml"
    before = target.read_bytes()
    bad_input(run("sections", "add", target, "--name", "Y", "--shape", "rectangle", "--depth", "5 mm / 0", "--width", "8 mm"), "--depth")
    assert target.read_bytes() == before


def test_files_that_are_not_utf8(folder: Path) -> None:
    path = folder / "m.toml"
    path.write_bytes(BEAM.replace("self_weight = false", "# caf\xe9\nself_weight = false").encode("latin-1"))
    bad_input(run("forces", path), "not UTF-8")
    (folder / "section_library" / "more.toml").write_bytes(b'# \xff\xfe\n[[sections]]\nname = "X"\n')
    bad_input(run("check", member(folder, with_section(BEAM))), "more.toml", "UTF-8")


def test_a_byte_order_mark_is_read(folder: Path) -> None:
    path = folder / "m.toml"
    path.write_text("\ufeff" + BEAM, encoding="utf-8")
    assert first_combination(run("forces", path, "--json"))["reactions"][0]["Fy"] == pytest.approx(5e3, rel=1e-12)  # P / 2


def test_a_solution_that_is_not_finite_is_bad_input() -> None:
    beam = Member(6.0, "steel", (Support(0.0, frozenset({"ux", "uy", "uz", "rx"})), Support(6.0, frozenset({"uy", "uz", "rx"}))),
                  (PointLoad("load", 3.0, (0.0, -1e12, 0.0)),), {"all": {"load": 1.0}}, source="m.toml")
    with pytest.raises(InputError, match="not a finite number"), np.errstate(over="ignore", invalid="ignore"):
        solve_case(beam, beam.loads, Stiffness(1e-300, 1e-300, 1e-300, 1e-300), "load")


# ----------------------------------------------------------------------------------------------
# 7. one guarded path for every output file

def test_outputs_never_replace_the_input(folder: Path) -> None:
    path = member(folder, with_section(BEAM), "m.html")
    before = files_in(folder)
    bad_input(run("report", path, "-o", path), "-o", "input file")
    assert path.read_text(encoding="utf-8") == with_section(BEAM)
    png = member(folder, BEAM, "m.png")
    bad_input(run("forces", png, "--plot", png), "--plot", "input file")
    bad_input(run("report", path, "-o", folder / "m.toml"), "-o", ".html")
    assert files_in(folder) == before | {"m.png"}


@pytest.mark.parametrize("target, words", [
    ("a folder.html", ("is a folder",)),
    ("missing/record.html", ("does not exist",)),
    ("locked/record.html", ("read-only",)),
    ("locked.html", ("read-only",)),
])
def test_report_places_that_cannot_be_written(folder: Path, target: str, words: tuple[str, ...]) -> None:
    (folder / "a folder.html").mkdir()
    (folder / "locked").mkdir()
    (folder / "locked.html").write_text("kept", encoding="utf-8")
    (folder / "locked.html").chmod(0o444)
    (folder / "locked").chmod(0o555)
    try:
        before = files_in(folder)
        bad_input(run("report", member(folder, with_section(BEAM)), "-o", folder / target), "-o", *words)
        assert files_in(folder) == before | {"m.toml"} and (folder / "locked.html").read_text(encoding="utf-8") == "kept"
    finally:
        (folder / "locked").chmod(0o755)


def test_plot_into_a_folder_or_a_read_only_place(folder: Path) -> None:
    (folder / "drawings.png").mkdir()
    (folder / "locked").mkdir()
    (folder / "locked").chmod(0o555)
    try:
        path = member(folder, BEAM)
        bad_input(run("forces", path, "--plot", folder / "drawings.png"), "--plot", "is a folder")
        bad_input(run("forces", path, "--plot", folder / "locked" / "d.png"), "--plot", "read-only")
        bad_input(run("sections", "show", "F 30x8", "--catalogue", folder / "section_library", "--plot", folder / "drawings.png"), "--plot")
    finally:
        (folder / "locked").chmod(0o755)


def test_pdf_without_weasyprint_writes_nothing(folder: Path) -> None:
    import importlib.util

    if importlib.util.find_spec("weasyprint") is not None:
        pytest.skip("weasyprint is installed: the PDF is made")
    path = member(folder, with_section(BEAM))
    bad_input(run("report", path, "-o", folder / "record.pdf"), "weasyprint")
    assert not (folder / "record.html").exists() and not (folder / "record.pdf").exists()


def test_a_read_only_catalogue_file_is_not_replaced(folder: Path) -> None:
    target = folder / "section_library" / "stock.toml"
    target.chmod(0o444)
    bad_input(run("sections", "add", target, "--name", "Y", "--shape", "rectangle", "--depth", "40 mm", "--width", "8 mm"), "read-only")
    assert target.read_text(encoding="utf-8") == CATALOGUE and stat.S_IMODE(target.stat().st_mode) == 0o444


def test_a_replaced_report_keeps_its_mode(folder: Path) -> None:
    out = folder / "record.html"
    out.write_text("old", encoding="utf-8")
    out.chmod(0o640)
    result = run("report", member(folder, with_section(BEAM).replace('fy = "-10 kN"', 'fy = "-10 N"')), "-o", out)
    assert result.exit_code in (0, 1), result.stderr
    assert out.read_text(encoding="utf-8").startswith("<!") and stat.S_IMODE(out.stat().st_mode) == 0o640


# ----------------------------------------------------------------------------------------------
# 8 - 9. smaller: round-off per unit, large deflections, the cut at a member's end

def test_a_small_spring_moment_is_not_round_off(folder: Path) -> None:
    # A soft rotational spring at the pin of a simply supported beam under a large central load:
    # it barely restrains, so its moment is k x (end rotation P L^2 / (16 EI)), about 0.0045 N*m.
    P, L, k = 5e6, 6.0, 1.44e-6
    text = with_section(BEAM.replace('fy = "-10 kN"', f'fy = "-{P} N"').replace('type = "pin"', f'type = "pin"\nsprings = {{ rz = "{k} N*m/rad" }}'))
    document = first_combination(run("forces", member(folder, text), "--json"))
    moment = abs(document["reactions"][0]["Mz"])
    assert moment == pytest.approx(k * P * L**2 / (16 * EI), rel=1e-3)
    assert 0.004 < moment < 0.005


def test_a_very_large_deflection_is_cautioned(folder: Path) -> None:
    text = with_section(BEAM.replace('"6 m"', '"1000 m"').replace('at = "3 m"', 'at = "500 m"').replace('fy = "-10 kN"', 'fy = "-1 N"'))
    result = run("forces", member(folder, text))
    assert result.exit_code == 0, result.stderr
    assert "CAUTION" in result.stdout
    notes = first_combination(run("forces", member(folder, text), "--json"))["assumptions"]
    assert any("small-deflection theory no longer holds" in note for note in notes)
    small = first_combination(run("forces", member(folder, with_section(BEAM).replace('fy = "-10 kN"', 'fy = "-10 N"')), "--json"))
    assert not any("small-deflection theory" in note for note in small["assumptions"])  # 0.1 mm on 6 m


def test_a_cut_at_the_end_gives_the_value_on_the_member(folder: Path) -> None:
    w, L = 5e3, 6.0
    text = supports('at = "0 m"\ntype = "fixed"', 'at = "6 m"\ntype = "fixed"').replace(
        'type = "point"\nat = "3 m"\nfy = "-10 kN"', f'type = "line"\nwy = "-{w} N/m"')
    document = first_combination(run("forces", member(folder, text), "--json", "--at", "0 m", "--at", "6 m"))
    start, end = document["cuts"]
    assert start["M"] == pytest.approx(-w * L**2 / 12, rel=1e-12)  # fixed end moments -w L^2 / 12
    assert end["M"] == pytest.approx(-w * L**2 / 12, rel=1e-12) and end["left"]["M"] == end["M"]
    assert end["right"]["M"] == 0.0  # beyond the member
