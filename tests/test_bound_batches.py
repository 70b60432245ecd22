"""The sizing's bounds made for many candidates at once against the same bound of one candidate.

The web check of many sections at once (sizer.checks.web.web_utilizations, the sizing's web bound)
against the check of one section (web_check on a Design of that section), on the examples' members and
catalogues and on random members (hypothesis). The formulas are AISC 360-16 J10 eqs. J10-2, J10-3,
J10-4, J10-5a, J10-5b and J10-8 (from memory; docs/references.md); both sides use them, so the test is
that the sections' arrays reproduce the one-section check to 1e-12 (relative), every branch included
(end and interior formulas, lb/d on either side of 0.2, a load over a support, stiffeners, tubes,
minor orientation, self-weight); tests/test_webs.py holds the one-section check to worked values.

The local-buckling bound of many candidates at once (sizer.sizing.screen.local_lower_bounds) against
each candidate's alone (local_lower_bound), before and after some candidates' warping tiers are
revealed (which moves their worst rows): the rows of each padded with copies of its first, which may
not change any value (exact equality).

The lazy screen (the stress estimates of a block of sections made when the search first asks for one
of them) against the screen made all at once: the same estimates and worst rows, also where some
candidates were revealed (their estimates made again) before their block was made.
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sizer.analysis import solve_member
from sizer.api import member_from_text, read_member
from sizer.checks.web import web_check, web_utilizations
from sizer.design import Design, catalogue_for, resolve_material
from sizer.model import Material, Member, Stiffness
from sizer.sections.geometric import geometric_scalars
from sizer.sections.properties import AnalysisWorkers
from sizer.sections.spec import SectionSpec
from sizer.sizing.candidates import candidate_sections
from sizer.sizing.screen import local_lower_bound, local_lower_bounds, rescreen, screen
from sizer.sizing.search import Search, prepare_screen
from tests.steel import STEEL_TOML

EXAMPLES = sorted(path for path in (Path(__file__).parent.parent / "examples").rglob("*.toml") if "\n[member]" in path.read_text())


def one_by_one(member: Member, material: Material, specs: list[SectionSpec], masses: np.ndarray | None) -> np.ndarray:
    """Each section's web check on its own Design (the unit-rigidity solution with its self-weight)."""
    base = solve_member(member, Stiffness.unit(), None)
    found = []
    for k, spec in enumerate(specs):
        mass = None if masses is None else float(masses[k])
        design = Design(member, base.with_mass(mass), material, spec, mass_per_length=mass)
        found.append(web_check(design).utilization or 0.0)
    return np.array(found)


def at_once(member: Member, material: Material, specs: list[SectionSpec], masses: np.ndarray | None) -> np.ndarray:
    return web_utilizations(solve_member(member, Stiffness.unit(), None), material, specs, masses)


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda path: path.stem)  # the members the examples size or check
def test_web_bounds_of_the_examples_catalogues_equal_the_check(path: Path) -> None:
    member = read_member(path)
    if member.has_springs:
        pytest.skip("springs: each section is solved (no web bound)")
    catalogue = catalogue_for(member, [])
    material = resolve_material(member, catalogue)
    specs = list(catalogue.select(()))
    masses = np.array([geometric_scalars(spec)["area"] * material.density for spec in specs]) if member.self_weight_case else None
    expected = one_by_one(member, material, specs, masses)
    assert np.count_nonzero(expected) >= 3 or path.stem == "post"  # a post carries no force across its webs
    np.testing.assert_allclose(at_once(member, material, specs, masses), expected, rtol=1e-12, atol=0.0)


def i_section(name: str, shape: str, depth: float, width: float, tf: float, tw: float, radius: float) -> SectionSpec:
    return SectionSpec(name, shape, {"depth": depth, "width": width, "flange_thickness": tf, "web_thickness": tw, "root_radius": radius})


def tube(name: str, depth: float, width: float, t: float, radius: float) -> SectionSpec:
    return SectionSpec(name, "rectangular_tube", {"depth": depth, "width": width, "thickness": t, "outer_radius": radius})


SECTION = st.one_of(
    st.builds(lambda shape, d, b, tf, tw, r: (shape, d, b, tf, tw, r), st.sampled_from(["i_beam", "channel"]), st.floats(0.08, 1.2),
              st.floats(0.04, 0.4), st.floats(0.004, 0.04), st.floats(0.003, 0.02), st.floats(0.0, 0.03)),
    st.builds(lambda d, b, t, r: ("rectangular_tube", d, b, t, r), st.floats(0.04, 0.4), st.floats(0.04, 0.4), st.floats(0.002, 0.016),
              st.floats(0.0, 0.03)),
    st.just(("rectangle",)),
)


def member_text(length: float, inner: list[float], bearings: list[float], stiffened: list[bool], loads: list[tuple[float, float, float, float]],
                minor: bool, weight: bool) -> str:
    """A beam on a pin and rollers at 0, `inner` fractions and the end, with point loads (fraction of
    the length or a support, fy, fz, bearing) in two cases and two combinations."""
    places = [0.0, *sorted(set(inner)), 1.0]
    self_weight = '"dead"' if weight else "false"
    text = (f'[member]\nlength = "{length} m"\nmaterial = "steel"\nself_weight = {self_weight}\n'
            f'orientation = "{"minor" if minor else "major"}"\n')
    for k, at in enumerate(places):
        text += (f'[[supports]]\nat = "{at * length} m"\ntype = "{"pin" if k == 0 else "roller"}"\n'
                 f'bearing = "{bearings[k % len(bearings)]} mm"\nstiffened = {str(stiffened[k % len(stiffened)]).lower()}\n')
    text += '[[loads]]\ntype = "line"\ncase = "dead"\nwy = "-2 kN/m"\n[[loads]]\ntype = "line"\ncase = "imposed"\nwz = "1 kN/m"\n'
    for k, (at, fy, fz, bearing) in enumerate(loads):
        where = places[int(at * 20) % len(places)] if k % 2 else at  # every other load over a support
        text += (f'[[loads]]\ntype = "point"\ncase = "{"imposed" if k % 3 else "dead"}"\nat = "{where * length} m"\n'
                 f'fy = "{fy} kN"\nfz = "{fz} kN"\nbearing = "{bearing} mm"\n')
    return text + '[combinations]\n"dead" = { dead = 1.0 }\n"both" = { dead = 1.2, imposed = 1.5 }\n'


@settings(max_examples=40, deadline=None)
@given(st.lists(SECTION, min_size=1, max_size=6), st.floats(0.5, 12.0), st.lists(st.integers(2, 18).map(lambda k: k / 20), max_size=2),
       st.lists(st.sampled_from([0.0, 10.0, 60.0, 250.0]), min_size=1, max_size=3), st.lists(st.booleans(), min_size=1, max_size=3),
       st.lists(st.tuples(st.integers(0, 20).map(lambda k: k / 20), st.floats(-300.0, 300.0), st.floats(-50.0, 50.0), st.sampled_from([0.0, 30.0, 400.0])),
                max_size=4), st.booleans(), st.booleans())
def test_web_bounds_equal_the_check_on_random_members(sections: list[tuple], length: float, inner: list[float], bearings: list[float],
                                                      stiffened: list[bool], loads: list[tuple[float, float, float, float]],
                                                      minor: bool, weight: bool) -> None:
    member = member_from_text(member_text(length, inner, bearings, stiffened, loads, minor, weight) + STEEL_TOML)
    material = member.materials["steel"]
    specs = [i_section(f"S{k}", *found) if found[0] != "rectangular_tube" and len(found) > 1 else
             tube(f"S{k}", *found[1:]) if len(found) > 1 else SectionSpec(f"S{k}", "rectangle", {"depth": 0.1, "width": 0.02})
             for k, found in enumerate(sections)]
    masses = np.linspace(5.0, 300.0, len(specs)) if weight else None
    np.testing.assert_allclose(at_once(member, material, specs, masses), one_by_one(member, material, specs, masses), rtol=1e-12, atol=0.0)


def test_web_bounds_without_a_yield_strength_are_nan_where_the_check_refuses() -> None:
    """No yield strength and no allowable stress: web_check is bad input for a section with a force on
    its web (tests/test_webs.py); the sections' arrays say so with NaN there, 0 for a section without webs."""
    bare = '[materials.steel]\nelastic_modulus = "200 GPa"\nshear_modulus = "77 GPa"\ndensity = "7850 kg/m^3"\n'
    member = member_from_text(member_text(4.0, [], [0.0], [False], [(0.5, -20.0, 0.0, 0.0)], False, False) + bare)
    specs = [i_section("I", "i_beam", 0.3, 0.15, 0.0107, 0.0071, 0.015), SectionSpec("R", "rectangle", {"depth": 0.1, "width": 0.02})]
    found = at_once(member, member.materials["steel"], specs, None)
    assert np.isnan(found[0]) and found[1] == 0.0


@pytest.mark.parametrize("path", [path for path in EXAMPLES if path.stem in ("platform_joist", "main_beam", "edge_beam")], ids=lambda path: path.stem)
def test_local_bounds_of_many_candidates_equal_each_alone(path: Path) -> None:
    member = read_member(path)
    catalogue = catalogue_for(member, [])
    material = resolve_material(member, catalogue)
    with AnalysisWorkers() as workers:
        candidates, table = candidate_sections(catalogue, member, material, (), None, None, lazy=True)
        search = Search(member, material, candidates, table, workers)
        prepare_screen(search, table)
        found = search.found
        assert found is not None
        every = list(range(len(candidates)))
        for step in range(2):
            alone = [local_lower_bound(found, index, member, material) for index in every]
            assert local_lower_bounds(found, every, member, material) == alone
            assert local_lower_bounds(found, every[::-1], member, material) == alone[::-1]
            assert sum(value is not None and value > 0 for value in alone) >= 10  # sections with walls in compression
            if step == 0:
                search.reveal(candidates[3:9])  # their shear estimates: other worst rows


@pytest.mark.parametrize("path", [path for path in EXAMPLES if path.stem in ("platform_joist", "main_beam", "sign_post")], ids=lambda path: path.stem)
def test_a_lazy_screen_makes_the_same_estimates_as_one_made_at_once(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(sys.modules["sizer.sizing.screen"], "SCREEN_BLOCK", 2048)  # blocks of a few sections: several blocks in a shipped catalogue
    member = read_member(path)
    catalogue = catalogue_for(member, [])
    material = resolve_material(member, catalogue)
    candidates, table = candidate_sections(catalogue, member, material, (), None, None, lazy=True)
    base = solve_member(member, Stiffness.unit(), None)
    eager, lazy = screen(table, member, material, base), screen(table, member, material, base, lazy=True)
    assert lazy.rows is not None and 1 < lazy.rows.step < len(candidates) // 2
    revealed = [1, len(candidates) - 2]
    table.reveal(revealed)  # as Search.reveal: the warping tier, then the estimates of those rows again
    rescreen(eager, revealed, material)
    rescreen(lazy, revealed, material)
    for index in range(len(candidates)):
        lazy.estimate_rows(index)
    assert set(lazy.estimate) == set(eager.estimate) and lazy.estimate
    for name in eager.estimate:
        np.testing.assert_array_equal(lazy.estimate[name], eager.estimate[name])
        np.testing.assert_array_equal(lazy.worst[name], eager.worst[name])
    for name in eager.exact:
        np.testing.assert_array_equal(lazy.exact[name], eager.exact[name])
