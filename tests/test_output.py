"""What reaches people: every command in both unit systems and at 80 columns, the look of our own
(status words, one minus sign, basis lines), the record a reviewer checks by hand, `sizer init`,
`--version`, the forces JSON shape, the shipped materials beside a catalogue of one's own, and the
user documentation.

Outside references (each beside its use): unit factors of NIST SP 811 (exact: 1 ft = 0.3048 m,
1 in = 25.4 mm, 1 lbf = 4.4482216152605 N); a rectangle's first moment of area above its neutral
axis Q = b d^2 / 8 and an I-section's Q = b tf (d - tf) / 2 + tw (d / 2 - tf)^2 / 2 (any mechanics of
materials text, e.g. Gere, Mechanics of Materials, from memory); the elastic section modulus of a
rectangle S = b d^2 / 6 (same, from memory); Euler's column load P = pi^2 E I / L^2 (Timoshenko &
Gere, Theory of Elastic Stability, from memory); the lateral-torsional buckled shape of a
fork-supported beam under uniform moment, a half sine wave (Timoshenko & Gere, from memory).
"""

from __future__ import annotations

import base64
import html
import json
import math
import re
import textwrap
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer import __version__, units
from sizer.cli import app
from steel import STEEL_TOML

CATALOGUE = STEEL_TOML + """
[[sections]]
name = "Flat 120x40"
shape = "rectangle"
family = "flat"
depth = "120 mm"
width = "40 mm"

[[sections]]
name = "I 160x80"
shape = "i_beam"
family = "beam"
depth = "160 mm"
width = "80 mm"
flange_thickness = "7 mm"
web_thickness = "5 mm"
"""

# a 4 m beam: pin and roller, a point load with a height, a push along the member (so axial,
# interaction and buckling checks are made), self-weight, a brace with a height, two combinations
MEMBER = """
title = "Test beam for the output"

[member]
length = "4 m"
material = "steel"
section = "Flat 120x40"

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "4 m"
type = "roller"

[[loads]]
type = "point"
case = "imposed"
at = "2 m"
fy = "-6 kN"
height = "+30 mm"

[[loads]]
type = "point"
case = "imposed"
at = "4 m"
fx = "-8 kN"

[[restraints]]
at = "2 m"
hold = ["lateral", "twist"]
height = "+50 mm"

[combinations]
"dead + imposed" = { dead = 1.0, imposed = 1.0 }
"dead only" = { dead = 1.0 }

[checks]
deflection_limit = 250
buckling_length_minor = "2 m"
"""

SI_SYMBOLS = r"(?:mm²|mm|m/s²|m|kN·m|kN/m|kN|N·m|N|MPa|GPa|Pa|kg/m³|kg/m|kg|cm⁴|cm³|cm⁶)"
US_SYMBOLS = r"(?:in²|in⁴|in³|in⁶|in|ft/s²|ft|kip·ft|kip/ft|kip|ksi|lb/ft³|lb/ft|lb)"
SI_AFTER_NUMBER = re.compile(rf"\d\s?{SI_SYMBOLS}(?![\w/·²³⁴⁶])")
US_AFTER_NUMBER = re.compile(rf"\d\s?{US_SYMBOLS}(?![\w/·²³⁴⁶])")
UNIT_LABELS = {unit.label for system in units.DISPLAY.values() for unit in system.values()}
BORDER = "│┃•!╭╰─ "


@pytest.fixture()
def files(tmp_path: Path) -> dict[str, Path]:
    catalogue = tmp_path / "stock.toml"
    catalogue.write_text(CATALOGUE, encoding="utf-8")
    member = tmp_path / "beam.toml"
    member.write_text(MEMBER, encoding="utf-8")
    return {"catalogue": catalogue, "member": member, "folder": tmp_path}


def invoke(args: list[str], columns: str | None = "80") -> object:
    """Run sizer as a pipe would (not a terminal), with COLUMNS as given (None: unset)."""
    return CliRunner().invoke(app, args, env={"COLUMNS": columns})


def command_args(command: str, files: dict[str, Path], system: str) -> list[str]:
    member, catalogue = str(files["member"]), str(files["catalogue"])
    units_option = ["--units", system]
    return {
        "forces": ["forces", member, "--catalogue", catalogue, "--at", "1 m", "--at", "2 m", *units_option],
        "check": ["check", member, "--catalogue", catalogue, *units_option],
        "size": ["size", member, "--catalogue", catalogue, *units_option],
        "sections list": ["sections", "list", "--catalogue", catalogue, *units_option],
        "sections show": ["sections", "show", "I 160x80", "--catalogue", catalogue, *units_option],
    }[command]


def visible_text(record: str) -> str:
    """A record's words as a reader sees them: tags, the embedded SI JSON and image data removed;
    the text of the inline SVG pictures kept."""
    pictures = [base64.b64decode(data).decode("utf-8") for data in re.findall(r'src="data:image/svg\+xml;base64,([^"]+)"', record)]
    body = record.split('<script type="application/json"')[0]
    body = re.sub(r'src="data:[^"]+"', "", body)
    words = [re.sub(r"<[^>]+>", " ", body)] + [" ".join(re.findall(r"<text[^>]*>([^<]*)</text>", svg)) for svg in pictures]
    return html.unescape(re.sub(r"\s+", " ", " ".join(words)))


def assert_in_units(text: str, system: str) -> None:
    """No unit symbol of the other system follows a number (NIST SP 811 names the symbols)."""
    other = SI_AFTER_NUMBER if system == "us" else US_AFTER_NUMBER
    found = [text[max(0, m.start() - 40):m.end() + 10] for m in other.finditer(text)]
    assert not found, f"{system} output shows units of the other system: {found[:5]}"


def assert_fits(text: str, width: int = 80) -> None:
    """No line wider than `width`, no unit at the start of a line after a number at the end of the
    line before (parted from its number), no line that ends in "=" (a symbol parted from its value)."""
    from rich.cells import cell_len

    previous: list[str] = []
    for line in text.splitlines():
        assert cell_len(line) <= width, f"line of {cell_len(line)} columns: {line!r}"
        words = line.strip(BORDER).split()
        parted = words and words[0] in UNIT_LABELS and previous and re.fullmatch(r"[-+]?[\d.]+(e[-+]?\d+)?", previous[-1])
        assert not parted, f"a unit parted from its number: {previous[-1]!r} / {line!r}"
        assert not line.rstrip(" │").endswith(" ="), f"a line ends with '=': {line!r}"
        previous = words


# ----------------------------------------------------------------------------------------------
# units and layout of every command

@pytest.mark.parametrize("system", ["si", "us"])
@pytest.mark.parametrize("command", ["forces", "check", "size", "sections list", "sections show"])
def test_every_command_in_display_units_at_80_columns(command: str, system: str, files: dict[str, Path]) -> None:
    result = invoke(command_args(command, files, system))
    assert result.exit_code in (0, 1), result.output
    text = result.stdout
    assert_in_units(text, system)
    assert_fits(text)
    assert "−" not in text  # one minus sign: the hyphen-minus
    assert "support(s)" not in text and "load(s)" not in text
    verdict_panels = command in ("forces", "check", "size")
    assert ("Assumptions made" in text) == verdict_panels and ("Cautions" in text) == verdict_panels
    if verdict_panels:
        assert "qualified engineer" in text and "2 supports" in text or command == "size"


def test_stability_basis_lines_carry_display_units(files: dict[str, Path]) -> None:
    """The buckling and lateral-torsional rows say the load factor, the critical value and the
    reduced allowable, each in the run's units (the numbers of the check's own result)."""
    import sizer

    outcome = sizer.check(files["member"], catalogue=[files["catalogue"]])
    checks = {c.check: c for c in outcome.checks}
    text = " ".join(invoke(command_args("check", files, "us")).stdout.split())
    lateral, buckling = checks["lateral-torsional"], checks["buckling"]
    assert lateral.made and buckling.made
    assert f"M_cr = {units.fmt(lateral.extra['critical_moment'], 'moment', 'us')}" in text
    assert f"Fb_LT = {units.fmt(lateral.allowable, 'stress', 'us')}" in text
    assert f"load factor {lateral.extra['load_factor']:.3g}" in text
    assert f"P_cr = {units.fmt(buckling.extra['critical_load'], 'force', 'us')}" in text
    assert "default SF 2" in text  # the safety factor, stated


def test_piped_output_is_80_columns_unless_columns_says(files: dict[str, Path]) -> None:
    widths = {}
    for columns in (None, "120"):
        result = invoke(command_args("forces", files, "si"), columns=columns)
        widths[columns] = max(len(line) for line in result.stdout.splitlines())
    assert widths[None] == 80  # the heading's rule runs the full width
    assert widths["120"] == 120


def test_a_plot_in_us_units_is_labelled_in_us_units(files: dict[str, Path]) -> None:
    """Every text on the figure of a US run is in US units, and the buckled shape is drawn with
    the restraint."""
    from matplotlib.text import Text

    import sizer
    from sizer.render.plots import build_figure

    outcome = sizer.check(files["member"], catalogue=[files["catalogue"]])
    words = {}
    for system in ("us", "si"):
        figure = build_figure(outcome.design, outcome.report.governing.combination, outcome.report, system)
        words[system] = " ".join(t.get_text() for t in figure.findobj(Text))
        assert_in_units(words[system], system)
        assert "−" not in words[system]
        assert {"sideways", "twist"} <= set(figure.sizer_panels)
        assert "lateral at +" in words[system]  # the brace, with its height
    assert "[ft]" in words["us"] and "kip" in words["us"] and "+1.969 in" in words["us"]  # 50 mm = 1.969 in (NIST SP 811)
    assert "[m]" in words["si"] and "kN" in words["si"]


def test_check_plot_is_drawn_in_the_run_units(files: dict[str, Path]) -> None:
    plot = files["folder"] / "diagrams.svg"
    result = invoke(command_args("check", files, "us") + ["--plot", str(plot)])
    assert result.exit_code in (0, 1), result.output
    svg = plot.read_text(encoding="utf-8")
    words = " ".join(re.findall(r"<text[^>]*>([^<]*)</text>", svg))
    assert "kip" in words and "ft" in words
    assert_in_units(html.unescape(words), "us")


# ----------------------------------------------------------------------------------------------
# the look: one pair of status words, basis lines, no numbered notes

def test_check_rows_carry_their_basis_and_one_pair_of_status_words(files: dict[str, Path]) -> None:
    text = invoke(command_args("check", files, "si")).stdout
    assert "(1)" not in text and "▶" not in text
    assert "PASSES" not in text and "FAILS" not in text and " ok " not in text
    words = set(re.findall(r"\b(passes|fails)\b", text))
    assert words and words <= {"passes", "fails"}
    assert "governs" in text and "combination dead + imposed" in " ".join(text.split())


def test_status_words_are_the_same_in_size_and_report(files: dict[str, Path]) -> None:
    size_text = invoke(command_args("size", files, "si")).stdout
    assert "PASSES" not in size_text and "lightest ▶" not in size_text and "passes" in size_text
    record = files["folder"] / "record.html"
    result = invoke(["report", str(files["member"]), "--catalogue", str(files["catalogue"]), "-o", str(record)])
    assert result.exit_code in (0, 1), result.output
    words = visible_text(record.read_text(encoding="utf-8"))
    assert "PASSES" not in words and "FAILS" not in words and re.search(r"\b(passes|fails)\b", words)


# ----------------------------------------------------------------------------------------------
# the record a reviewer checks by hand

def test_record_in_us_units_shows_no_si_unit_and_has_every_part(files: dict[str, Path]) -> None:
    record = files["folder"] / "record.html"
    result = invoke(["report", str(files["member"]), "--catalogue", str(files["catalogue"]), "-o", str(record), "--units", "us"])
    assert result.exit_code in (0, 1), result.output
    text = record.read_text(encoding="utf-8")
    words = visible_text(text)
    assert_in_units(words, "us")
    assert "−" not in words
    for part in ('id="by-hand"', 'id="stability"', "Every combination", "load factor", "σ_cr / SF"):
        assert part in text, part
    assert "down" in words  # the deflected shape says which way it goes


def test_hand_formulas_use_the_closed_form_section_values(files: dict[str, Path]) -> None:
    """Q and t at the neutral axis from the outline against the closed forms; M/S with the
    rectangle's S = b d^2 / 6; the field's peak bending stress equals M/S for one axis."""
    import sizer
    from sizer.render.report.by_hand import by_hand_lines, hand_station, neutral_axis_cut
    from sizer.sections import unit_stress_field

    b, d = 0.040, 0.120
    outcome = sizer.check(files["member"], catalogue=[files["catalogue"]])
    Q, t = neutral_axis_cut(outcome.design, "y")
    assert Q == pytest.approx(b * d**2 / 8, rel=1e-9)  # rectangle: Q = b d^2 / 8
    assert t == pytest.approx(b, rel=1e-9)
    station = hand_station(outcome.design, outcome.report)
    rows = dict((what, (formula, field)) for what, formula, field in
                by_hand_lines(outcome.design, station, unit_stress_field(outcome.design.spec), "si"))
    moment = abs(station.actions[5])
    assert f"= {units.fmt(moment / (b * d**2 / 6), 'stress')}" in rows["bending"][0]  # S = b d^2 / 6
    assert "agree within 2 %" in rows["bending"][1]
    i_beam = sizer.check(files["member"], section="I 160x80", catalogue=[files["catalogue"]])
    bf, tf, tw, depth = 0.080, 0.007, 0.005, 0.160
    Q, t = neutral_axis_cut(i_beam.design, "y")
    assert Q == pytest.approx(bf * tf * (depth - tf) / 2 + tw * (depth / 2 - tf) ** 2 / 2, rel=1e-6)  # I-section Q
    assert t == pytest.approx(tw, rel=1e-9)


def test_record_writes_euler_with_kl_over_r(files: dict[str, Path]) -> None:
    """P_e = pi^2 E A / (KL/r)^2 = pi^2 E I / L^2 about the minor axis on the given 2 m."""
    import sizer
    from sizer.render.report.hand_stability import column_items

    outcome = sizer.check(files["member"], catalogue=[files["catalogue"]])
    lines = {line.split(" axis:")[0]: line for line in column_items(outcome.design, outcome.report, "si")}
    E, I_minor, length = 200e9, 0.120 * 0.040**3 / 12, 2.0
    euler = math.pi**2 * E * I_minor / length**2  # Timoshenko & Gere
    shown = float(re.search(r"P_e = [^;]* = ([\d.]+) kN;", lines["minor"]).group(1)) * 1e3
    assert shown == pytest.approx(euler, rel=5e-3)  # 4 significant figures, mesh area within 0.1 %
    assert "KL/r = 2000 mm / 11.5" in lines["minor"]  # r = 40 / sqrt(12) = 11.55 mm


def test_buckled_shape_of_a_beam_under_uniform_moment_is_a_half_sine(tmp_path: Path, files: dict[str, Path]) -> None:
    """Equal and opposite end moments on a fork-supported beam: the sideways shape w is sin(pi x / L)."""
    import sizer
    from sizer.render.plots.buckled_shape import buckling_pick, shape_samples

    member = tmp_path / "uniform.toml"
    member.write_text(textwrap.dedent("""
        [member]
        length = "3 m"
        material = "steel"
        section = "Flat 120x40"
        self_weight = false
        [[supports]]
        at = "0 m"
        type = "pin"
        [[supports]]
        at = "3 m"
        type = "roller"
        [[loads]]
        type = "moment"
        at = "0 m"
        mz = "4 kN*m"
        [[loads]]
        type = "moment"
        at = "3 m"
        mz = "-4 kN*m"
        """), encoding="utf-8")
    outcome = sizer.check(member, catalogue=[files["catalogue"]])
    pick = buckling_pick(outcome.report)
    assert pick is not None and pick.check == "lateral-torsional"
    xs, w, phi = shape_samples(pick, 3.0)
    expected = np.sin(np.pi * xs / 3.0) * np.sign(w[len(w) // 2])
    assert np.abs(w - expected).max() < 0.02
    assert np.abs(np.abs(phi) - np.abs(expected)).max() < 0.02  # twist has the same half sine


# ----------------------------------------------------------------------------------------------
# forces JSON

def test_forces_json_is_always_a_list_of_combinations_without_negative_zero(files: dict[str, Path]) -> None:
    """Reactions of the 6 kN central load: 3 kN each (P/2, AISC Table 3-23, from memory), plus
    half the self-weight; every combination carries reactions, cuts, extremes and deflection."""
    result = invoke(["forces", str(files["member"]), "--catalogue", str(files["catalogue"]), "--json"])
    assert result.exit_code == 0, result.output
    assert "-0.0," not in result.stdout and "-0.0\n" not in result.stdout
    document = json.loads(result.stdout)
    assert [c["combination"] for c in document["combinations"]] == ["dead + imposed", "dead only"]
    for entry in document["combinations"]:
        assert set(entry) >= {"combination", "reactions", "cuts", "extremes", "deflection"}
        assert {"max", "at"} <= set(entry["deflection"])
    weight = 0.120 * 0.040 * 7850 * units.GRAVITY * 4.0
    first = document["combinations"][0]
    assert first["reactions"][0]["Fy"] == pytest.approx(3e3 + weight / 2, rel=1e-9)
    moment = next(e for e in first["extremes"] if e["action"] == "M")
    assert moment["max"] == pytest.approx(6e3 * 4 / 4 + weight * 4 / 8, rel=1e-6)  # PL/4 + wL^2/8
    single = invoke(["forces", str(files["member"]), "--catalogue", str(files["catalogue"]), "--combination", "dead only", "--json"])
    assert [c["combination"] for c in json.loads(single.stdout)["combinations"]] == ["dead only"]


def test_json_never_writes_negative_zero() -> None:
    from sizer.render.common import dumps

    assert dumps({"a": -0.0, "b": [np.float64(-0.0)]}) == dumps({"a": 0.0, "b": [0.0]})


# ----------------------------------------------------------------------------------------------
# size --report, init, --version, shipped materials

def test_size_writes_the_record_of_its_choice(files: dict[str, Path]) -> None:
    record = files["folder"] / "chosen.html"
    result = invoke(["size", str(files["member"]), "--catalogue", str(files["catalogue"]), "--json", "--report", str(record)])
    assert result.exit_code == 0, result.output
    chosen = json.loads(result.stdout)["section"]
    text = record.read_text(encoding="utf-8")
    assert f"section {chosen}" in html.unescape(text)
    assert json.loads(re.search(r'id="sizer-data">(.*?)</script>', text, re.S).group(1).replace("<\\/", "</"))["section"] == chosen


@pytest.mark.parametrize("layout", ["simple", "cantilever", "continuous", "post"])
def test_init_writes_a_member_file_that_reads(layout: str, tmp_path: Path) -> None:
    from sizer.inputfile import read_member_file

    path = tmp_path / f"{layout}.toml"
    result = invoke(["init", "-o", str(path), "--layout", layout])
    assert result.exit_code == 0, result.output
    member = read_member_file(path)
    assert member.length > 0 and member.supports and member.loads
    assert path.read_text(encoding="utf-8").count("#") > 10  # commented


def test_init_never_overwrites_and_names_the_fix(tmp_path: Path) -> None:
    path = tmp_path / "member.toml"
    path.write_text("mine", encoding="utf-8")
    result = invoke(["init", "-o", str(path)])
    assert result.exit_code == 2 and "already exists" in result.stderr and "Traceback" not in result.output
    assert path.read_text(encoding="utf-8") == "mine"
    result = invoke(["init", "-o", str(tmp_path / "other.toml"), "--layout", "arch"])
    assert result.exit_code == 2 and "--layout" in result.stderr and not (tmp_path / "other.toml").exists()


def test_version() -> None:
    import tomllib

    result = invoke(["--version"])
    assert result.exit_code == 0 and result.stdout.strip() == f"sizer {__version__}"
    project = tomllib.loads((Path(__file__).parents[1] / "pyproject.toml").read_text(encoding="utf-8"))
    assert project["project"]["version"] == __version__


def test_a_catalogue_of_ones_own_keeps_the_shipped_materials(tmp_path: Path) -> None:
    """No materials in the user's folder: "mild-steel" still comes from the shipped catalogue; a
    definition of the user's own wins."""
    import sizer

    folder = tmp_path / "section_library"
    folder.mkdir()
    folder.joinpath("stock.toml").write_text(CATALOGUE.split("[[sections]]", 1)[1].join(["[[sections]]", ""]), encoding="utf-8")
    member = tmp_path / "beam.toml"
    member.write_text(MEMBER.replace('material = "steel"', 'material = "mild-steel"'), encoding="utf-8")
    shipped = sizer.check(member)
    assert shipped.design.material.allowable.bending == pytest.approx(165e6)  # section_library/materials.toml
    own = member.read_text(encoding="utf-8") + STEEL_TOML.replace("steel", "mild-steel").replace('bending = "165 MPa"', 'bending = "120 MPa"')
    member.write_text(own, encoding="utf-8")
    assert sizer.check(member).design.material.allowable.bending == pytest.approx(120e6)


# ----------------------------------------------------------------------------------------------
# documentation

def test_the_member_file_document_names_every_key() -> None:
    from sizer import inputfile

    text = (Path(__file__).parents[1] / "docs" / "member-file.md").read_text(encoding="utf-8")
    keys = set(inputfile.TOP_KEYS | inputfile.MEMBER_KEYS | inputfile.SUPPORT_KEYS | inputfile.RESTRAINT_KEYS | inputfile.CHECK_KEYS
               | inputfile.MATERIAL_KEYS) | set(inputfile.ALLOWABLE_KEYS)
    keys |= {key for names in inputfile.LOAD_KEYS.values() for key in names} | set(inputfile.LOAD_KEYS)
    missing = sorted(key for key in keys if not re.search(r"[`\[.\"]" + re.escape(key) + r"[`\].\"]", text))
    assert not missing, f"docs/member-file.md does not describe: {missing}"


def test_the_catalogue_document_names_every_shape_and_dimension() -> None:
    from sizer.sections.shapes import COMMON_KEYS, SHAPES

    text = (Path(__file__).parents[1] / "docs" / "catalogue-file.md").read_text(encoding="utf-8")
    names = set(SHAPES) | set(COMMON_KEYS) | {key for shape in SHAPES.values() for key in shape.all}
    missing = sorted(name for name in names if f"`{name}`" not in text)
    assert not missing, f"docs/catalogue-file.md does not describe: {missing}"


def test_readme_links_the_user_documents_and_nothing_points_outside() -> None:
    root = Path(__file__).parents[1]
    readme = (root / "README.md").read_text(encoding="utf-8")
    for name in ("docs/member-file.md", "docs/catalogue-file.md", "docs/output.md"):
        assert name in readme and (root / name).is_file()
    for path in [root / "README.md", *sorted((root / "docs").glob("*.md"))]:
        assert "../shared" not in path.read_text(encoding="utf-8"), path


# ----------------------------------------------------------------------------------------------
# properties of the text layout and the unit rewriting

QUANTITIES = st.builds(lambda value, unit: f"{value:g} {unit}", st.floats(-1e4, 1e4, allow_nan=False).map(lambda v: round(v, 3)),
                       st.sampled_from(sorted(UNIT_LABELS - {"rad"})))
WORDS = st.sampled_from(["the", "load", "at", "x =", "span", "combination", "dead", "+", "imposed;", "peak", "Fb_LT", "=", "/"])


@settings(max_examples=80, deadline=None)
@given(st.lists(st.tuples(st.one_of(QUANTITIES, WORDS), st.sampled_from([" ", "  ", "    "])), min_size=1, max_size=30),
       st.integers(20, 90))
def test_wrapping_never_parts_a_number_from_its_unit_nor_runs_over(parts: list[tuple[str, str]], width: int) -> None:
    from sizer.render.text import glued, wrap

    text = "".join(word + gap for word, gap in parts).strip()
    assert len(glued(text)) == len(text)
    lines = [line.plain for line in wrap(text, width)]
    assert all(len(line) <= width for line in lines)
    assert " ".join(" ".join(lines).split()) == " ".join(text.split())  # nothing lost or added
    for line in lines[1:]:
        assert not line.split() or line.split()[0] not in UNIT_LABELS or len(line.split()[0]) > width


@settings(max_examples=60, deadline=None)
@given(st.floats(1e-3, 1e5), st.sampled_from(["m", "mm", "kN", "kN·m", "MPa", "kg/m"]))
def test_sentence_quantities_show_in_us_units_exactly(value: float, symbol: str) -> None:
    """A sentence's quantity shown in US units, read back, is the SI value to the 4 figures shown
    (NIST SP 811 factors); the SI text and the JSON value stay SI; the words are untouched."""
    from sizer.phrase import BASE_UNITS, SI_UNITS, in_unit, phrase, q, values_json
    from sizer.render.phrases import in_display_units

    kind, factor = SI_UNITS[symbol]
    sentence = phrase("at ", q("x", value * factor, symbol, ".6g"), ";")
    assert in_display_units(sentence, "si") == sentence == f"at {in_unit(value * factor, symbol):.6g} {symbol};"
    shown = in_display_units(sentence, "us")
    assert not SI_AFTER_NUMBER.search(shown)
    number, label = re.match(r"at (\S+) (\S+);", shown).groups()
    assert label == units.unit_label(kind, "us")
    assert float(number) * units.DISPLAY["us"][kind].factor == pytest.approx(value * factor, rel=6e-4)
    assert values_json(sentence) == {"x": {"value": value * factor, "unit": BASE_UNITS[kind]}}
    assert in_display_units("at 3 m;", "us") == "at 3 m;"  # plain text is never rewritten
