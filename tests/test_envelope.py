"""Envelopes (`sizer forces --envelope`) and the displacements and twist at cuts (`--at`).

References:
- the envelope is the largest and smallest of each action over the combinations, so it equals the
  extremes of the combinations taken one by one (common practice);
- two equal spans, one loaded: support moment -wL^2/16 (docs/references.md, a handbook's
  continuous-beam table, from memory), so the far end's reaction is -wL/16 (statics of the unloaded
  span);
- simply supported beam, uniform w: midspan deflection 5wL^4/(384EI) (AISC Manual Table 3-23, from
  memory);
- a shaft held in twist at both ends with a torque T at midspan: each end takes T/2 and the middle
  twists (T/2)(L/2)/(GJ) = TL/(4GJ) (any mechanics of materials text, from memory); solid circle
  J = pi d^4/32, I = pi d^4/64 (docs/references.md); E = 200 GPa, G = 77 GPa (tests/steel.py).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest
from hypothesis import given, settings
from typer.testing import CliRunner

from sizer.analysis import action_envelope, extremes, reaction_envelope, solve_member
from sizer.cli import app
from sizer.model import Member
from sizer.sections import build_catalogue, load_catalogue
from steel import STEEL_TOML
from test_patterns import continuous_beam, patterned_members

E, G = 200e9, 77e9
D = 0.040  # m, round bar diameter


def run(*args: object):
    return CliRunner().invoke(app, [str(arg) for arg in args], env={"COLUMNS": "250"})


@settings(max_examples=25, deadline=None)
@given(member=patterned_members())
def test_envelope_is_the_extremes_of_the_combinations_one_by_one(member: Member) -> None:
    """Every action's largest and smallest over the combinations (pattern arrangements included)
    equal the largest and smallest of the combinations' own extremes, and the combination named
    gives that value; each support's reactions likewise."""
    solution = solve_member(member, None, None)
    names = list(solution.combination_names)
    found = action_envelope(solution, names)
    each = {name: extremes(solution, name) for name in names}
    for action, bounds in found.items():
        scale = 1e-9 * (1.0 + max(abs(e[action].max_value) + abs(e[action].min_value) for e in each.values()))
        assert bounds.largest.value == pytest.approx(max(e[action].max_value for e in each.values()), abs=scale)
        assert bounds.smallest.value == pytest.approx(min(e[action].min_value for e in each.values()), abs=scale)
        assert each[bounds.largest.combination][action].max_value == pytest.approx(bounds.largest.value, abs=scale)
        assert each[bounds.smallest.combination][action].min_value == pytest.approx(bounds.smallest.value, abs=scale)
    for entry in reaction_envelope(solution, names):
        values = [solution.reactions(name)[entry.support] for name in names]
        for k in range(6):
            assert entry.largest[k][0] == pytest.approx(max(v[k] for v in values), abs=1e-6)
            assert entry.smallest[k][0] == pytest.approx(min(v[k] for v in values), abs=1e-6)


def test_envelope_in_the_terminal_json_and_plot(tmp_path: Path) -> None:
    """Two equal spans, patterned: the far end's reaction is at its smallest, -wL/16 (lifting), with
    the other span alone loaded; the terminal names the combination, the plot has its panels."""
    L, w = 4.0, 5000.0
    path = tmp_path / "two.toml"
    path.write_text(continuous_beam([L, L], w), encoding="utf-8")
    result = run("forces", path, "--envelope", "--json")
    assert result.exit_code == 0, result.stderr
    document = json.loads(result.stdout)
    assert len(document["combinations"]) == 4 and document["envelope"]["combinations"] == 4
    end = document["envelope"]["reactions"][2]["Fy"]
    assert end["min"] == pytest.approx(-w * L / 16, rel=1e-9) and end["min_combination"] == "all (imposed on span 1)"
    assert document["envelope"]["deflection"] is None  # no section: no deflections
    text = run("forces", path, "--envelope", "--at", "2 m", "--plot", tmp_path / "envelope.png")
    assert text.exit_code == 0, text.stderr
    assert "Envelope of 4 combinations" in text.stdout and "largest in all (imposed on span 1)" in text.stdout
    assert "Internal actions at cuts: largest and smallest" in text.stdout and "Cautions" in text.stdout
    assert (tmp_path / "envelope.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_envelope_figure_panels() -> None:
    from sizer import api
    from sizer.render.plots import build_envelope_figure

    outcome = api.forces(api.member_from_text(continuous_beam([3.0, 3.0], 2000.0), "two.toml"))
    figure = build_envelope_figure(outcome.design, list(outcome.combinations))
    assert figure.sizer_panels == ["N", "V", "M"]


@pytest.fixture(scope="module")
def round_bar(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("round")
    (folder / "round.toml").write_text(STEEL_TOML + f'\n[[sections]]\nname = "RD 40"\nshape = "round"\ndiameter = "{D * 1e3:g} mm"\n',
                                       encoding="utf-8")
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("SIZER_CACHE_DIR", str(tmp_path_factory.getbasetemp() / "section-cache"))
        build_catalogue(list(load_catalogue([folder]).sections.values()))
    return folder


def test_displacements_and_twist_at_cuts_with_their_directions(tmp_path: Path, round_bar: Path) -> None:
    """A 2 m round bar on pins held in twist at both ends: 1 kN/m down and a torque of 200 N*m at
    midspan. At x = 1 m: uy = -5wL^4/(384EI) "down", rx = TL/(4GJ) "counter-clockwise seen from end
    B" (positive about +x, right-hand rule)."""
    L, w, T = 2.0, 1000.0, 200.0
    text = (f'[member]\nlength = "{L} m"\nmaterial = "steel"\nsection = "RD 40"\nself_weight = false\n'
            '[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "2 m"\ntype = "roller"\n'
            f'[[loads]]\ntype = "line"\nwy = "{-w} N/m"\n[[loads]]\ntype = "moment"\nat = "1 m"\nmx = "{T} N*m"\n' + STEEL_TOML)
    path = tmp_path / "bar.toml"
    path.write_text(text, encoding="utf-8")
    result = run("forces", path, "--catalogue", round_bar, "--at", "1 m", "--json")
    assert result.exit_code == 0, result.stderr
    [cut] = json.loads(result.stdout)["combinations"][0]["cuts"]
    moved = cut["displacements"]
    inertia, polar = math.pi * D**4 / 64, math.pi * D**4 / 32
    assert moved["uy"] == pytest.approx(-5 * w * L**4 / (384 * E * inertia), rel=2e-3)  # the mesh's I within 0.2 %
    assert moved["rx"] == pytest.approx(T * L / (4 * G * polar), rel=2e-3)
    assert moved["ux"] == 0.0 and moved["uz"] == 0.0
    assert moved["directions"] == {"uy": "down (along -y)", "rx": "counter-clockwise seen from end B"}
    terminal = run("forces", path, "--catalogue", round_bar, "--at", "1 m")
    assert "Displacements and twist at cuts" in terminal.stdout
    assert "uy down (along -y); rx counter-clockwise seen from end B" in terminal.stdout


def test_many_arrangements_in_check_and_the_record(tmp_path: Path, round_bar: Path) -> None:
    """Two patterned cases over three spans: 2^3 x 2^3 = 64 arrangements of one combination. The
    check's terminal gives each support's reactions at their largest and smallest over every
    arrangement rather than a block per arrangement, and the record draws their envelope; the
    verdict names the governing arrangement."""
    extra = ('[[loads]]\ntype = "line"\ncase = "snow"\nwy = "-300 N/m"\npattern = true\n'
             '[combinations]\n"imposed + snow" = { imposed = 1.0, snow = 1.0 }\n')
    path = tmp_path / "many.toml"
    path.write_text(continuous_beam([1.0, 1.0, 1.0], 400.0, extra=extra, section="RD 40"), encoding="utf-8")
    result = run("check", path, "--catalogue", round_bar)
    assert result.exit_code in (0, 1), result.stderr
    assert "Reactions: largest and smallest over every pattern arrangement (" in result.stdout
    assert "imposed + snow (imposed on spans" in result.stdout and "; snow on span" in result.stdout
    record = tmp_path / "many.html"
    result = run("report", path, "--catalogue", round_bar, "-o", record)
    assert result.exit_code in (0, 1), result.stderr
    html = record.read_text(encoding="utf-8")
    assert "The envelope over every pattern arrangement (" in html and "Every combination: the internal actions" not in html
    assert "at their largest and smallest over every pattern arrangement (" in html and "arrangements checked" in html
