"""Diagrams (sizer.render.plots) and the calculation record (sizer.render.report, sizer.commands.run_report).

Outside references: the simply supported beam with a central point load P and a uniform load w has
reactions P/2 + wL/2 and a midspan moment PL/4 + wL²/8; a cantilever with a tip force F and a tip
torque Tq has a root moment FL and a constant torque Tq (standard beam formulas, e.g. any mechanics
of materials handbook's beam tables; from memory). A rectangle's area is b·d. The PNG file layout
(8-byte signature, then the IHDR chunk with width and height as big-endian 32-bit integers) is from
the PNG specification (ISO/IEC 15948, from memory).
"""

from __future__ import annotations

import dataclasses
import html
import json
import struct
import sys
import xml.etree.ElementTree as ElementTree
from html.parser import HTMLParser
from pathlib import Path

import numpy as np
import pytest

from sizer import units
from sizer.checks import check_design
from sizer.design import prepare
from sizer.errors import InputError
from sizer.model import SUPPORT_TYPES, LineLoad, Member, PointLoad, Restraint, Support
from sizer.results.check import check_json
from sizer.results.notes import CAUTIONS, member_notes
from sizer.results.jsonable import to_jsonable
from sizer.render.plots import DPI, FIG_WIDTH, build_figure, check_plot_path, plot_member
from sizer.render.report import report_html, section_outline, segment_balance, write_report
from sizer.commands import run_report
from sizer.sections import unit_stress_field
from steel import STEEL_TOML

GRAVITY = 9.80665  # m/s², standard gravity (ISO 80000-3)
DEPTH, WIDTH = 0.120, 0.040  # m, the test flat
DENSITY = 7850.0  # kg/m³, steel (common practice)
CATALOGUE = STEEL_TOML + """
[[sections]]
name = "Flat 120x40"
shape = "rectangle"
depth = "120 mm"
width = "40 mm"
"""
VOID_ELEMENTS = {"meta", "img", "br", "hr", "link", "input", "col", "source", "wbr"}


@pytest.fixture()
def catalogue(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path))
    path = tmp_path / "stock.toml"
    path.write_text(CATALOGUE, encoding="utf-8")
    return path


def simple_beam(length: float = 4.0, force: float = -10e3) -> Member:
    """Pin and roller, a central point load (case imposed) and self-weight (case dead); held
    sideways and in twist along its top (a deck), so that strength governs."""
    supports = (Support(0.0, SUPPORT_TYPES["pin"], label="pin"), Support(length, SUPPORT_TYPES["roller"], label="roller"))
    return Member(length=length, material="steel", section="Flat 120x40", supports=supports,
                  restraints=(Restraint(0.0, length, True, True, "top"),),
                  loads=(PointLoad("imposed", length / 2, (0.0, force, 0.0)),),
                  combinations={"dead + imposed": {"dead": 1.0, "imposed": 1.0}}, title="Test beam")


def out_of_plane_cantilever(length: float = 1.5, fz: float = 2e3, torque: float = 0.4e3) -> Member:
    """Fixed at A, a tip force along +z and a tip torque; no self-weight."""
    loads = (PointLoad("wind", length, (0.0, 0.0, fz)), PointLoad("wind", length, moment=(torque, 0.0, 0.0)),
             LineLoad("wind", 0.0, length, (0.0, -1e3, 0.0, 0.0), (0.0, -1e3, 0.0, 0.0)))
    return Member(length=length, material="steel", section="Flat 120x40",
                  supports=(Support(0.0, SUPPORT_TYPES["fixed"], label="fixed"),), loads=loads,
                  combinations={"wind": {"wind": 1.0}}, self_weight_case=None, title="Bracket arm")


def checked(member: Member, catalogue: Path):
    design = prepare(member, [catalogue], need_section=True)
    report = check_design(design, unit_stress_field(design.spec))
    notes = member_notes(member) + design.notes + report.notes
    return design, report, notes


def png_size(data: bytes) -> tuple[int, int]:
    """(width, height) from the IHDR chunk of a PNG file."""
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    assert data[12:16] == b"IHDR"
    return struct.unpack(">II", data[16:24])


# ----------------------------------------------------------------------------------------------
# plots

def test_plot_path_must_be_png_or_svg_and_is_checked_before_any_work(tmp_path: Path) -> None:
    assert check_plot_path("a/B.PNG") == "png"
    assert check_plot_path("d.svg") == "svg"
    with pytest.raises(InputError) as caught:
        plot_member(None, tmp_path / "diagrams.pdf", "all")  # no design: fails only if work started
    assert caught.value.key == "--plot" and caught.value.file == ""
    assert not list(tmp_path.iterdir())


def test_png_is_a_real_image_of_the_figure_size(tmp_path: Path, catalogue: Path) -> None:
    design, report, _ = checked(simple_beam(), catalogue)
    path = tmp_path / "out" / "diagrams.png"
    plot_member(design, path, "dead + imposed", report)
    data = path.read_bytes()
    width, height = png_size(data)
    expected_height = build_figure(design, "dead + imposed", report).get_figheight() * DPI
    assert width == round(FIG_WIDTH * DPI)
    assert abs(height - expected_height) <= 1
    import matplotlib.image

    pixels = matplotlib.image.imread(path)
    assert pixels.shape[:2] == (height, width)
    assert 0.5 < pixels[..., :3].mean() < 0.99  # mostly white paper with drawing on it
    assert [p.name for p in path.parent.iterdir()] == ["diagrams.png"]  # no temporary file left


def test_svg_parses_and_has_the_figure_width(tmp_path: Path, catalogue: Path) -> None:
    design, report, _ = checked(simple_beam(), catalogue)
    path = tmp_path / "diagrams.svg"
    plot_member(design, path, "dead + imposed", report)
    root = ElementTree.parse(path).getroot()
    assert root.tag.endswith("svg")
    assert float(root.get("width").removesuffix("pt")) == pytest.approx(FIG_WIDTH * 72)
    text = " ".join(t.text or "" for t in root.iter() if t.tag.endswith("text"))
    assert "Bending moment M = Mz" in text and "governing station: bending" in text


def test_planar_figure_has_n_v_m_and_the_peak_moment_of_the_beam_formula(catalogue: Path) -> None:
    length, force = 4.0, -10e3
    design, report, _ = checked(simple_beam(length, force), catalogue)
    figure = build_figure(design, "dead + imposed", report)
    assert figure.sizer_panels == ["elevation", "N", "V", "M", "deflection"]
    w = DEPTH * WIDTH * DENSITY * GRAVITY  # N/m, self-weight of the flat
    midspan = abs(force) * length / 4 + w * length**2 / 8  # PL/4 + wL²/8 (beam tables)
    moment_axes = next(ax for ax in figure.axes if ax.get_label() == "M")
    labels = [t.get_text() for t in moment_axes.texts]
    assert f"max {units.fmt(midspan, 'moment')} at {units.fmt(length / 2, 'length')}" in labels


def test_out_of_plane_member_gets_vz_my_t_and_a_plan_view(catalogue: Path) -> None:
    length, fz, torque = 1.5, 2e3, 0.4e3
    design, report, _ = checked(out_of_plane_cantilever(length, fz, torque), catalogue)
    figure = build_figure(design, "wind", report)
    # with a check report, the buckled shape of its governing stability check follows (sideways and twist)
    assert figure.sizer_panels == ["elevation", "plan", "N", "V", "M", "Vz", "My", "T", "deflection", "sideways", "twist"]
    titles = {ax.get_label(): ax.get_title(loc="left") for ax in figure.axes}
    assert titles["T"].startswith("Torque T") and titles["My"].startswith("Bending moment My")
    texts = {ax.get_label(): [t.get_text() for t in ax.texts] for ax in figure.axes}
    # root moment FL about -y for a tip force along +z (cantilever formula); torque constant
    assert any(t.startswith(f"min {units.fmt(-fz * length, 'moment')} at 0 m") for t in texts["My"])
    assert any(t.startswith(f"max {units.fmt(torque, 'moment')}") for t in texts["T"])


# ----------------------------------------------------------------------------------------------
# the record

class TagBalance(HTMLParser):
    """Checks that every opened element is closed in order; collects check-table cells."""

    def __init__(self) -> None:
        super().__init__()
        self.stack: list[str] = []
        self.errors: list[str] = []
        self.cells: dict[tuple[str, str], tuple[float, str]] = {}
        self._row_check: str | None = None
        self._field: tuple[str, float] | None = None

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        values = dict(attrs)
        if tag == "tr":
            self._row_check = values.get("data-check")
        if tag == "td" and self._row_check and values.get("data-field"):
            self._field = (values["data-field"], float(values["data-value"]))
        if tag not in VOID_ELEMENTS:
            self.stack.append(tag)

    def handle_endtag(self, tag: str) -> None:
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes {self.stack[-1:]}")
            return
        self.stack.pop()
        if tag == "td":
            self._field = None

    def handle_data(self, data: str) -> None:
        if self._field is not None:
            name, value = self._field
            self.cells[(self._row_check, name)] = (value, data.strip())


def parsed(text: str) -> TagBalance:
    parser = TagBalance()
    parser.feed(text)
    parser.close()
    return parser


def embedded_json(text: str) -> dict:
    opening = '<script type="application/json" id="sizer-data">'
    start = text.index(opening) + len(opening)
    return json.loads(text[start:text.index("</script>", start)])


def test_report_is_balanced_html_with_the_check_json_and_cautions(catalogue: Path) -> None:
    design, report, notes = checked(simple_beam(), catalogue)
    text = report_html(design, report, notes)
    parser = parsed(text)
    assert parser.errors == [] and parser.stack == []
    expected = json.loads(json.dumps(to_jsonable(check_json(design, report, notes))))
    assert embedded_json(text) == expected
    for caution in CAUTIONS:
        assert text.count(html.escape(caution)) >= 2  # at the top and at the end
    made = [entry for entry in expected["checks"] if entry["made"]]
    assert made
    for entry in made:
        value, shown = parser.cells[(entry["check"], "utilization")]
        assert value == entry["utilization"] and shown == f"{entry['utilization']:.3f}"
        value, shown = parser.cells[(entry["check"], "demand")]
        assert value == entry["demand"]
        kind = {"stress": "stress", "deflection": "deflection", "force": "force"}.get(entry["quantity"])
        assert shown == (units.fmt(entry["demand"], kind) if kind else f"{entry['demand']:.3f}")
    assert text.count('src="data:image/svg+xml;base64,') == 3  # section, diagrams, free body


def test_method_of_sections_gives_the_beam_formula_at_midspan(catalogue: Path) -> None:
    length, force = 4.0, -10e3
    design, report, _ = checked(simple_beam(length, force), catalogue)
    assert report.governing.check == "bending" and report.governing.at == pytest.approx(length / 2)
    w = DEPTH * WIDTH * DENSITY * GRAVITY
    balance = segment_balance(design, "dead + imposed", length / 2, "left")
    labels = [item.label for item in balance.items]
    assert labels == ["self-weight, 0 to 2.000 m (resultant)", "reaction of S1 (pin)"]
    reaction = next(item for item in balance.items if item.label.startswith("reaction"))
    assert reaction.vector[1] == pytest.approx(abs(force) / 2 + w * length / 2, rel=1e-9)  # P/2 + wL/2
    assert balance.found[5] == pytest.approx(abs(force) * length / 4 + w * length**2 / 8, rel=1e-9)  # PL/4 + wL²/8
    assert balance.found[1] == pytest.approx(-(abs(force) / 2), rel=1e-9)  # Vy just left of the load: -P/2
    np.testing.assert_allclose(balance.found, balance.analysis, rtol=1e-9, atol=1e-6)


def test_out_of_plane_record_writes_the_z_equations(catalogue: Path, tmp_path: Path) -> None:
    design, report, notes = checked(out_of_plane_cantilever(), catalogue)
    out = tmp_path / "records" / "arm.html"
    assert write_report(design, report, notes, out) == [out]
    text = out.read_text(encoding="utf-8")
    assert parsed(text).errors == []
    for equation in ("ΣFz = 0:", "ΣMx = 0:", "ΣMy about the cut = 0:", "ΣMy about A"):
        assert equation in text


def test_section_outline_is_the_rectangle_turned_for_minor_orientation(catalogue: Path) -> None:
    def outline_area_and_size(member: Member) -> tuple[float, float, float]:
        design = prepare(member, [catalogue], need_section=True)
        [(ring, holes)] = section_outline(design)
        x, y = ring[:, 0], ring[:, 1]
        area = 0.5 * abs(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))  # shoelace formula
        return area, float(np.ptp(x)), float(np.ptp(y))

    area, across, up = outline_area_and_size(simple_beam())
    assert area == pytest.approx(DEPTH * WIDTH, rel=1e-9)
    assert (across, up) == pytest.approx((WIDTH, DEPTH))
    turned = dataclasses.replace(simple_beam(), orientation="minor")
    _, across, up = outline_area_and_size(turned)
    assert (across, up) == pytest.approx((DEPTH, WIDTH))


def test_pdf_request_without_weasyprint_writes_the_html_beside(catalogue: Path, tmp_path: Path,
                                                              monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setitem(sys.modules, "weasyprint", None)  # import fails as if not installed
    design, report, notes = checked(simple_beam(), catalogue)
    written = write_report(design, report, notes, tmp_path / "record.pdf")
    assert written == [tmp_path / "record.html"]
    assert not (tmp_path / "record.pdf").exists()


MEMBER_FILE = """
title = "Store lintel"
[member]
length = "3 m"
material = "steel"
section = "Flat 120x40"
[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "3 m"
type = "roller"
[[loads]]
type = "line"
case = "imposed"
wy = "{load}"
"""


def test_run_report_writes_the_record_and_returns_the_verdict(catalogue: Path, tmp_path: Path,
                                                              capsys: pytest.CaptureFixture[str]) -> None:
    light, heavy = tmp_path / "light.toml", tmp_path / "heavy.toml"
    light.write_text(MEMBER_FILE.format(load="-2 kN/m"), encoding="utf-8")
    heavy.write_text(MEMBER_FILE.format(load="-60 kN/m"), encoding="utf-8")
    # M = wL²/8 = 2.25 kN·m; S = b d²/6 = 96 cm³, so 23.4 MPa: passes. 60 kN/m gives 703 MPa: fails.
    assert run_report(light, tmp_path / "light.html", None, [catalogue], "si") == 0
    assert run_report(heavy, tmp_path / "heavy.html", None, [catalogue], "si") == 1
    assert "fails" in capsys.readouterr().out  # the status words of every output: passes, fails
    assert embedded_json((tmp_path / "heavy.html").read_text(encoding="utf-8"))["passes"] is False
    bending = next(c for c in embedded_json((tmp_path / "light.html").read_text(encoding="utf-8"))["checks"]
                   if c["check"] == "bending")
    w = 2e3 + DEPTH * WIDTH * DENSITY * GRAVITY  # imposed plus self-weight, N/m
    assert bending["demand"] == pytest.approx(w * 3.0**2 / 8 / (WIDTH * DEPTH**2 / 6), rel=2e-3)  # M / (b d²/6)


def test_run_report_refuses_a_bad_output_name_before_reading_anything(tmp_path: Path) -> None:
    with pytest.raises(InputError) as caught:
        run_report(tmp_path / "missing.toml", tmp_path / "record.txt", None, [], "si")
    assert caught.value.key == "-o"
    assert not list(tmp_path.iterdir())
