"""Cost from stock lengths, ranking by cost, the bars a schedule orders, and the reserve factor.

Every price, stock length and member here is invented for the tests (marked "invented"). Hand
values: bar counts and costs by arithmetic written out beside each check; Euler's critical load of
a pinned strut, pi^2 E I / L^2 (docs/references.md, from memory) with the Johnson parabola of
docs/design.md; the reserve factor of a member whose checks are all linear in its loads is
1 / utilization (linearity of elastic stresses: common practice).
"""

from __future__ import annotations

import itertools
import json
import math
import re
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer import api
from sizer.cli import app
from sizer.sections import build_catalogue, load_catalogue
from sizer.sizing.cost import bars_for, costing
from sizer.sections.purchase import Purchase
from steel import STEEL_TOML
from test_sizing import AGREEMENT_MEMBERS, MIXED_SHAPES, simple_beam

KN = 1e3


def run(*args: object):
    return CliRunner().invoke(app, [str(arg) for arg in args], env={"COLUMNS": "250"})


# ----------------------------------------------------------------------------------------------
# bars and cost of one member: hand arithmetic (stock lengths and prices invented)

def test_one_piece_takes_the_shortest_stock_length_that_holds_it() -> None:
    # 4.2 m from stock of 6 m and 12 m (invented): one 6 m bar, offcut 6 - 4.2 = 1.8 m
    order = bars_for(4.2, 1, (6.0, 12.0))
    assert order.bars == ((6.0, 1),)
    assert order.offcut == pytest.approx(1.8)
    # cost: 6 m x 15.8 kg/m x 1.40 per kg (invented) = 132.72
    assert costing(Purchase(1.40, None, (6.0, 12.0)), 15.8, 4.2).cost == pytest.approx(6 * 15.8 * 1.40)
    assert costing(Purchase(1.40, None, (6.0, 12.0)), 15.8, 4.2).cost == pytest.approx(132.72)


@pytest.mark.parametrize("piece, count, stock, bars, metres", [
    (4.2, 12, (6.0, 12.0), ((12.0, 6),), 72.0),  # 12 m holds 2, 6 m holds 1: 6 x 12 = 72 m = 12 x 6, fewer bars wins
    (3.6, 6, (6.0, 12.0), ((12.0, 2),), 24.0),  # 12 m holds 3: 2 bars = 24 m (6 x 6 m would be 36 m)
    (5.0, 3, (6.0, 12.0), ((12.0, 1), (6.0, 1)), 18.0),  # 12 m holds 2, 6 m holds 1: 12 + 6 = 18 m in 2 bars
    (6.0, 2, (6.0, 12.0), ((12.0, 1),), 12.0),  # exact fits: one 12 m bar holds both, no offcut
    (2.9, 5, (6.0, 9.0), ((9.0, 1), (6.0, 1)), 15.0),  # 9 m holds 3, 6 m holds 2: 9 + 6 = 15 m (vs 3 x 6 = 18 m)
])
def test_pieces_cut_from_the_fewest_metres(piece: float, count: int, stock: tuple, bars: tuple, metres: float) -> None:
    order = bars_for(piece, count, stock)
    assert order.bars == bars
    assert order.metres == pytest.approx(metres)
    assert order.offcut == pytest.approx(metres - piece * count)


def test_longer_than_every_stock_length_is_not_available_and_no_stock_lengths_is_cut_to_length() -> None:
    assert bars_for(12.5, 1, (6.0, 12.0)) is None  # no splice
    too_long = costing(Purchase(1.4, None, (6.0, 12.0)), 20.0, 12.5)
    assert too_long.cost is None and not too_long.available and "longer than every stock length" in too_long.unavailable
    # the longest stock length is a quantity of the sentence, shown in the run's units: 12 m = 39.37 ft
    # (1 ft = 0.3048 m exactly, NIST SP 811)
    from sizer.render.phrases import in_display_units

    assert "(longest 12 m; no splice)" in too_long.unavailable
    assert "(longest 39.37 ft; no splice)" in in_display_units(too_long.unavailable, "us")
    loose = costing(Purchase(1.4), 20.0, 12.5)  # no stock lengths: bought cut to length, 12.5 x 20 x 1.4 = 350
    assert loose.order.cut_to_length and loose.cost == pytest.approx(350.0)
    unstocked = costing(Purchase(1.4, False, (6.0,)), 20.0, 5.0)
    assert not unstocked.available and unstocked.cost == pytest.approx(6 * 20 * 1.4)


@settings(max_examples=60, deadline=None)
@given(piece=st.floats(0.5, 7.0), count=st.integers(1, 7),
       stock=st.lists(st.sampled_from([3.0, 4.5, 6.0, 7.5, 9.0, 12.0]), min_size=1, max_size=3, unique=True))
def test_the_order_is_the_cheapest_mix_of_bars(piece: float, count: int, stock: list[float]) -> None:
    """Against every mix of up to `count` bars of each stock length (brute force)."""
    order = bars_for(piece, count, tuple(stock))
    holds = {length: math.floor(length / piece * (1 + 1e-9)) for length in stock}
    mixes = [mix for mix in itertools.product(range(count + 1), repeat=len(stock))
             if sum(n * holds[length] for n, length in zip(mix, stock)) >= count]
    if not mixes:
        assert order is None
        return
    best = min(sum(n * length for n, length in zip(mix, stock)) for mix in mixes)
    assert order.metres == pytest.approx(best)
    assert sum(n * holds[length] for length, n in order.bars) >= count


# ----------------------------------------------------------------------------------------------
# catalogue keys

PRICED_HEAD = '''currency = "EUR"

[families.bar]          # invented prices and stock lengths
cost_per_kg = 2.1
stock_lengths = ["3 m", "6 m"]

[families.box]
cost_per_kg = 1.6
stock_lengths = ["6 m", "12 m"]

[families.pipe]
cost_per_kg = 1.3
stock_lengths = ["6 m"]

[families.i]
cost_per_kg = 1.1
stock_lengths = ["12 m"]

[families.rod]
cost_per_kg = 1.2
stocked = false
'''
OWN_TERMS = {"B 40x60": 'cost_per_kg = 0.9', "BOX 100x60x4": 'stocked = false', "PIPE 89x5": 'stock_lengths = ["12 m"]'}  # invented


def priced_catalogue(sections: dict) -> str:
    entries = [PRICED_HEAD, STEEL_TOML]
    for name, (shape, dims, family) in sections.items():
        lines = [f'name = "{name}"', f'shape = "{shape}"', f'family = "{family}"'] + [f'{key} = "{value}"' for key, value in dims.items()]
        if name in OWN_TERMS:
            lines.append(OWN_TERMS[name])
        entries.append("[[sections]]\n" + "\n".join(lines) + "\n")
    return "\n".join(entries)


@pytest.fixture(scope="module")
def priced(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("priced")
    (folder / "stock.toml").write_text(priced_catalogue(MIXED_SHAPES), encoding="utf-8")
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("SIZER_CACHE_DIR", str(tmp_path_factory.getbasetemp() / "section-cache"))
        build_catalogue(list(load_catalogue([folder]).sections.values()))
    return folder


def test_family_terms_and_a_sections_own_keys(priced: Path) -> None:
    catalogue = load_catalogue([priced])
    assert catalogue.currency == "EUR"
    own = catalogue.purchase(catalogue.get("B 40x60"))
    assert (own.cost_per_kg, own.stock_lengths, own.is_stocked) == (0.9, (3.0, 6.0), True)  # own price, family's lengths
    assert catalogue.purchase(catalogue.get("B 30x60")).cost_per_kg == 2.1
    assert not catalogue.purchase(catalogue.get("RD 40")).is_stocked
    assert not catalogue.purchase(catalogue.get("BOX 100x60x4")).is_stocked
    assert catalogue.purchase(catalogue.get("C 100x50")) == Purchase()  # no family terms: no price, stocked, cut to length
    listed = json.loads(run("sections", "list", "--catalogue", priced, "--json").stdout)["sections"]
    row = next(entry for entry in listed if entry["name"] == "PIPE 89x5")
    assert (row["cost_per_kg"], row["currency"], row["stocked"], row["stock_lengths"]) == (1.3, "EUR", True, [12.0])
    shown = run("sections", "show", "RD 40", "--catalogue", priced)
    assert "1.2 EUR/kg" in shown.stdout and "not stocked" in shown.stdout


@pytest.mark.parametrize("change, key", [
    (('cost_per_kg = 2.1', 'cost_per_kg = "2.1"'), "families.bar.cost_per_kg"),
    (('cost_per_kg = 2.1', 'cost_per_kg = -1'), "families.bar.cost_per_kg"),
    (('stock_lengths = ["3 m", "6 m"]', 'stock_lengths = ["3", "6 m"]'), "families.bar.stock_lengths"),
    (('stock_lengths = ["3 m", "6 m"]', 'stock_lengths = []'), "families.bar.stock_lengths"),
    (('stock_lengths = ["3 m", "6 m"]', 'stock_lengths = ["0 m"]'), "families.bar.stock_lengths"),
    (('stocked = false', 'stocked = "no"'), "families.rod.stocked"),
    (('currency = "EUR"', ''), "currency"),
    (('[families.pipe]', '[families.pipes]'), "families.pipes"),
    (('[families.pipe]\ncost_per_kg = 1.3', '[families.pipe]\nprice = 1.3'), "families.pipe.price"),
    (('stocked = false', 'stocked = false\ncost_per_kg = 1'), ""),  # a key twice: not valid TOML
])
def test_bad_purchase_keys_are_one_line_naming_file_and_key(priced: Path, tmp_path: Path, change: tuple[str, str], key: str) -> None:
    text = priced_catalogue({name: MIXED_SHAPES[name] for name in ("B 20x50", "RD 40", "PIPE 60x4", "BOX 60x40x3", "I 100x50")})
    assert change[0] in text
    path = tmp_path / "stock.toml"
    path.write_text(text.replace(change[0], change[1], 1), encoding="utf-8")
    result = run("sections", "list", "--catalogue", path)
    assert result.exit_code == 2
    message = result.stderr.strip()
    assert len(message.splitlines()) == 1 and "Traceback" not in message
    assert str(path) in message and key in message and "fix:" in message


def test_two_files_with_different_currencies_are_bad_input(priced: Path, tmp_path: Path) -> None:
    (tmp_path / "a.toml").write_text((priced / "stock.toml").read_text(encoding="utf-8"), encoding="utf-8")
    (tmp_path / "b.toml").write_text('currency = "GBP"\n', encoding="utf-8")
    result = run("sections", "list", "--catalogue", tmp_path)
    assert result.exit_code == 2 and "currency" in result.stderr and "GBP" in result.stderr


# ----------------------------------------------------------------------------------------------
# size --by cost against the brute force: every section checked, ranked by the same cost by hand

PRICED_MEMBERS = {
    "unbraced beam": AGREEMENT_MEMBERS["unbraced beam"],
    "beam-column": AGREEMENT_MEMBERS["beam-column"],
    "post with torque": AGREEMENT_MEMBERS["post with torque"],
    "6.5 m beam": simple_beam(6.5, 100.0, self_weight_case="imposed", deflection_limit=200),  # longer than the 6 m pipes and bars
}


def hand_cost(length: float, mass: float, terms: Purchase) -> tuple[float | None, bool]:
    """(cost, available) of one piece: the shortest stock length that holds it x kg/m x price."""
    if terms.stock_lengths:
        fitting = [bar for bar in terms.stock_lengths if bar >= length]
        bought = min(fitting) if fitting else None
    else:
        bought = length
    cost = bought * mass * terms.cost_per_kg if bought is not None and terms.cost_per_kg is not None else None
    return cost, terms.is_stocked and bought is not None


@pytest.mark.parametrize("variant", list(PRICED_MEMBERS))
@pytest.mark.parametrize("by, include_unstocked", [("cost", False), ("cost", True), ("depth", False)])
def test_size_by_cost_agrees_with_the_brute_force(priced: Path, tmp_path: Path, variant: str, by: str, include_unstocked: bool) -> None:
    path = tmp_path / "member.toml"
    path.write_text(PRICED_MEMBERS[variant], encoding="utf-8")
    member = api.read_member(path)
    catalogue = load_catalogue([priced])
    rows = {}
    for name, spec in catalogue.sections.items():
        checked = api.check(member, name, [priced], reserve=False)
        cost, available = hand_cost(member.length, checked.design.mass_per_length, catalogue.purchase(spec))
        depth = checked.design.props.depth if member.orientation == "major" else checked.design.props.width
        tier = 0 if available or include_unstocked else 1
        key = (tier, cost is None, cost or 0.0, checked.design.mass_per_length, name) if by == "cost" else (tier, depth, checked.design.mass_per_length, name)
        rows[name] = (key, checked.passes, cost)
    ranked = sorted(rows, key=lambda name: rows[name][0])
    expected = next((name for name in ranked if rows[name][1]), None)
    sized = api.size(member, [priced], top=1, by=by, include_unstocked=include_unstocked, reserve=False)
    assert sized.section == expected
    document = sized.to_json()
    assert document["ranked_by"] == by
    listed = [entry["section"] for entry in document["candidates"]]
    if expected is not None:
        assert listed[:listed.index(expected) + 1] == ranked[:ranked.index(expected) + 1]  # every one ranked before, with why it fails
        assert all(not rows[name][1] for name in ranked[:ranked.index(expected)])
        assert document["cost"] == (pytest.approx(rows[expected][2]) if rows[expected][2] is not None else None)
    for entry in document["candidates"]:
        assert entry["cost"] == (pytest.approx(rows[entry["section"]][2]) if rows[entry["section"]][2] is not None else None)


def test_size_by_cost_reads_well(priced: Path, tmp_path: Path) -> None:
    path = tmp_path / "member.toml"
    path.write_text(PRICED_MEMBERS["6.5 m beam"], encoding="utf-8")
    result = run("size", path, "--catalogue", priced, "--by", "cost", "--top", "2")
    text = re.sub(r"\s+", " ", result.stdout)
    assert result.exit_code == 0, result.stdout + result.stderr
    assert "Candidates by cost" in text and "the cheapest passing section" in text
    assert "EUR" in text and "offcut" in text
    assert "Reserve factor" in text and "self-weight included" in text
    assert "not stocked: ranked after the available sections" in text  # RD 40: cheaper, shown, ranked after
    assert run("size", path, "--catalogue", priced, "--by", "price").exit_code == 2


# ----------------------------------------------------------------------------------------------
# schedules: the bars to order against hand counts

SCHEDULE = """
title = "Bars to order (invented)"
[[members]]
mark = "A"
file = "beam.toml"
do = "check"
section = "BOX 80x40x4"
quantity = 3
length = "4.2 m"
[[members]]
mark = "B"
file = "beam.toml"
do = "check"
section = "BOX 80x40x4"
quantity = 2
length = "4.2 m"
[[members]]
mark = "C"
file = "beam.toml"
do = "check"
section = "BOX 80x40x4"
length = "5 m"
[[members]]
mark = "D"
file = "beam.toml"
do = "check"
section = "C 100x50"
quantity = 2
length = "3 m"
"""


def test_schedule_bars_to_order_against_hand_counts(priced: Path, tmp_path: Path) -> None:
    from sizer.schedule import read_schedule, run_schedule, schedule_json
    from sizer.render.schedule import schedule_csv

    (tmp_path / "beam.toml").write_text(simple_beam(4.0, 300.0), encoding="utf-8")
    (tmp_path / "schedule.toml").write_text(SCHEDULE, encoding="utf-8")
    document = schedule_json(run_schedule(read_schedule(tmp_path / "schedule.toml"), [priced], jobs=1, show_progress=False))
    box = next(entry for entry in document["totals"]["by_section"] if entry["section"] == "BOX 80x40x4")
    # BOX 80x40x4, stock 6 m and 12 m (invented): five 4.2 m pieces (A and B pooled): a 12 m bar holds 2, a 6 m bar 1:
    # 2 x 12 m + 1 x 6 m = 30 m (3 bars; 5 x 6 m is 30 m in 5 bars). One 5 m piece (C): 1 x 6 m.
    assert [(bar["length"], bar["count"]) for bar in box["bars"]] == [(12.0, 2), (6.0, 2)]
    assert box["metres"] == pytest.approx(36.0)
    assert box["offcut"] == pytest.approx(36.0 - 5 * 4.2 - 5.0)
    mass = next(row["mass_per_length"] for row in document["members"] if row["mark"] == "A")
    assert box["cost"] == pytest.approx(36.0 * mass * 1.6)
    # row A alone: three 4.2 m pieces: 1 x 12 m + 1 x 6 m = 18 m
    row_a = next(row for row in document["members"] if row["mark"] == "A")
    assert [(bar["length"], bar["count"]) for bar in row_a["bars"]["bars"]] == [(12.0, 1), (6.0, 1)]
    assert row_a["cost"] == pytest.approx(18.0 * mass * 1.6)
    assert row_a["reserve_factor"] == pytest.approx(1 / row_a["utilization"], rel=0.005)
    channel = next(entry for entry in document["totals"]["by_section"] if entry["section"] == "C 100x50")
    assert channel["cost"] is None and channel["bars"] == [{"length": 3.0, "count": 2, "cut_to_length": True}]  # no terms: cut to length
    assert document["totals"]["cost"] is None and document["totals"]["priced_cost"] == pytest.approx(box["cost"])
    csv_text = schedule_csv(document)
    assert "order_section" in csv_text and "2 x 12.00 m + 2 x 6.000 m" in csv_text


# ----------------------------------------------------------------------------------------------
# reserve factor

def test_reserve_is_one_over_utilization_where_every_check_is_linear(priced: Path, tmp_path: Path) -> None:
    """A simply supported beam held sideways along its length (no stability check applies): bending,
    shear and deflection are linear in the loads, self-weight included (common practice)."""
    path = tmp_path / "member.toml"
    path.write_text(simple_beam(3.0, 2500.0, self_weight_case="imposed", deflection_limit=250), encoding="utf-8")
    outcome = api.check(path, "BOX 100x60x4", [priced])
    expected = 1 / outcome.utilization
    assert outcome.reserve_factor == pytest.approx(expected, rel=0.005)
    assert outcome.reserve_factor <= expected * (1 + 1e-6)  # never above the true factor
    document = outcome.to_json()
    assert document["reserve_factor"] == outcome.reserve_factor
    assert any("self-weight included" in note for note in document["assumptions"])


def strut(length: float, load: float) -> str:
    """A pinned strut (invented) under axial compression alone, no self-weight."""
    return f"""
[member]
length = "{length} m"
material = "steel"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "{length} m"
type = "roller"

[[loads]]
type = "point"
case = "imposed"
at = "{length} m"
fx = "{-load} N"
"""


SHS = """
[[sections]]
name = "SHS 60x60x3 sharp"
shape = "rectangular_tube"
depth = "60 mm"
width = "60 mm"
thickness = "3 mm"
"""


@pytest.mark.parametrize("length", [2.0, 3.0])
def test_reserve_of_a_buckling_governed_strut_by_hand(tmp_path: Path, length: float) -> None:
    """Euler (pi^2 E I / L^2, from memory) with the Johnson parabola above Fy/2, SF 2 (docs/design.md);
    sharp corners: I = (60^4 - 54^4) / 12 mm^4, A = 60^2 - 54^2 mm^2."""
    (tmp_path / "stock.toml").write_text(STEEL_TOML + SHS, encoding="utf-8")
    path = tmp_path / "member.toml"
    load = 20 * KN
    path.write_text(strut(length, load), encoding="utf-8")
    area, inertia = (60**2 - 54**2) * 1e-6, (60**4 - 54**4) / 12 * 1e-12
    critical = math.pi**2 * 200e9 * inertia / length**2
    sigma = critical / area
    fy = 250e6
    buckling_stress = sigma if sigma <= fy / 2 else fy * (1 - fy / (4 * sigma))
    hand = buckling_stress * area / 2.0 / load
    outcome = api.check(path, "SHS 60x60x3 sharp", [tmp_path / "stock.toml"])
    assert outcome.governing == "buckling"
    assert outcome.reserve_factor == pytest.approx(hand, rel=0.01)
    # a bisection by hand on the full check, through the public path: the member with its load scaled
    low, high = 0.5 * hand, 2.0 * hand
    while high / low > 1.002:
        middle = math.sqrt(low * high)
        path.write_text(strut(length, load * middle), encoding="utf-8")
        passes = api.check(path, "SHS 60x60x3 sharp", [tmp_path / "stock.toml"], reserve=False).passes
        low, high = (middle, high) if passes else (low, middle)
    assert outcome.reserve_factor == pytest.approx(low, rel=0.005)
    assert outcome.reserve_factor <= high


def test_reserve_in_size_and_the_terminal(priced: Path, tmp_path: Path) -> None:
    path = tmp_path / "member.toml"
    path.write_text(AGREEMENT_MEMBERS["unbraced beam"], encoding="utf-8")
    sized = api.size(path, [priced])
    assert sized.reserve_factor is not None
    checked = api.check(path, sized.section, [priced])
    assert sized.reserve_factor == pytest.approx(checked.reserve_factor, rel=1e-9)
    assert sized.to_json()["reserve_factor"] == sized.reserve_factor
    result = run("check", path, "--section", sized.section, "--catalogue", priced)
    assert f"Reserve factor {checked.reserve_factor:.3f}" in re.sub(r"\s+", " ", result.stdout)


def test_reserve_on_a_pattern_arrangement_is_one_over_utilization(priced: Path, tmp_path: Path) -> None:
    """A patterned continuous beam: the governing combination is one arrangement; its checks are
    linear in its loads (common practice), so the reserve is 1 / utilization; deflection limits that
    name the given combination still apply to the arrangement alone."""
    from test_patterns import continuous_beam

    path = tmp_path / "member.toml"
    path.write_text(continuous_beam([4.0, 3.0, 4.0], 1500.0, extra='[checks]\ndeflection_limit = 300\ndeflection_combinations = ["all"]\n',
                                    section="BOX 100x60x4"), encoding="utf-8")
    outcome = api.check(path, None, [priced])
    assert outcome.report.reserve.combination != "all"  # an arrangement of it
    assert outcome.reserve_factor == pytest.approx(1 / outcome.utilization, rel=0.005)
    assert outcome.reserve_factor <= (1 / outcome.utilization) * (1 + 1e-6)


@settings(max_examples=40, deadline=None)
@given(piece=st.floats(0.4, 6.0), count=st.integers(1, 60),
       stock=st.lists(st.sampled_from([3.0, 4.5, 6.0, 7.5, 9.0, 12.0]), min_size=1, max_size=3, unique=True))
def test_large_orders_match_the_plain_search(piece: float, count: int, stock: list[float]) -> None:
    """The best length bought outright beyond the searched rest gives the plain covering search's metres and bars."""
    from sizer.sizing.cost import _cheapest_cover

    order = bars_for(piece, count, tuple(stock))
    usable = [(length, math.floor(length / piece * (1 + 1e-9))) for length in stock]
    usable = [(length, holds) for length, holds in usable if holds > 0]
    if not usable:
        assert order is None
        return
    plain = _cheapest_cover(count, usable)
    assert order.metres == pytest.approx(sum(length * n for length, n in plain.items()))
    assert order.count == sum(plain.values())


def test_a_very_large_quantity() -> None:
    """Ten million pieces of 0.7 m: 12 m holds 17, 6 m holds 8 (hand count); 588,235 bars of 12 m hold
    9,999,995 pieces and the last 5 fit one 6 m bar, cheaper than a 588,236th 12 m bar."""
    order = bars_for(0.7, 10**7, (6.0, 12.0))
    assert order.bars == ((12.0, 588_235), (6.0, 1))
    assert order.metres == pytest.approx(588_235 * 12.0 + 6.0)
