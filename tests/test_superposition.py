"""Pattern arrangements by per-span superposition (sizer.analysis.superposition) against brute-force
enumeration of every arrangement, the empty one included: the worst arrangement of a quantity
linear in the loads is the fixed part plus the contributions of one sign (superposition, common
practice; every choice of loaded spans is an arrangement, docs/design.md), so the per-station
extremes of the six actions and the peak bending normal stress over mesh nodes must equal the
largest and smallest over every arrangement, each arrangement evaluated on its own, and the
arrangement named must reach that value.
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sizer.analysis import solve_member
from sizer.analysis.superposition import linear_extremes, switched_combinations, worst_switches
from sizer.checks.field import superposed_axial, superposed_bending
from sizer.model import Member
from test_patterns import two_case_members


def stations_of(member: Member) -> tuple[np.ndarray, np.ndarray]:
    """41 even stations (right side) and end B (left side)."""
    xs = np.linspace(0.0, member.length, 42)
    return xs, np.array(["right"] * 41 + ["left"])


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(member=two_case_members())
def test_per_span_extremes_of_the_actions_equal_enumeration(member: Member) -> None:
    """Largest and smallest N, Vy, Vz, T, My, Mz at every station: fixed part plus the switches of
    one sign against the max and min over every arrangement; the named arrangement reaches them."""
    solution = solve_member(member, None, None)
    xs, sides = stations_of(member)
    each = solution.case_actions(xs, sides)
    [combination] = switched_combinations(solution)
    names = list(solution.member.combinations)
    assert len(combination.names) == len(names) == 2 ** len(combination.switches)  # the empty arrangement included
    enumerated = solution.weighted_actions(solution.combination_weights(names), xs, sides)  # (A, n, 6)
    fixed = np.tensordot(combination.fixed, each, axes=1)
    parts = np.tensordot(combination.switches, each, axes=1)
    high, low = linear_extremes(fixed, parts)
    scale = 1e-9 * (np.abs(enumerated).max() + 1.0)
    np.testing.assert_allclose(high, enumerated.max(axis=0), rtol=0, atol=scale)
    np.testing.assert_allclose(low, enumerated.min(axis=0), rtol=0, atol=scale)
    row = {name: k for k, name in enumerate(names)}
    for n, j in [(int(n), int(j)) for n, j in zip(*np.unravel_index(np.argsort(-np.abs(high).ravel())[:5], high.shape))]:
        for largest, target in ((True, high), (False, low)):
            name = combination.arrangement(worst_switches(parts, (n, j), largest))
            assert enumerated[row[name], n, j] == pytest.approx(target[n, j], abs=scale)


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(member=two_case_members(), seed=st.integers(0, 2**16), orientation=st.sampled_from(["major", "minor"]))
def test_per_span_bending_peak_equals_enumeration(member: Member, seed: int, orientation: str) -> None:
    """Peak |sigma| over random mesh nodes (unit normal stresses of My and Mz), stations and every
    arrangement: superposed against every arrangement evaluated; the named arrangement reaches it."""
    from sizer.analysis.section_axes import to_section_axes

    solution = solve_member(member, None, None)
    xs, sides = stations_of(member)
    field = SimpleNamespace(sigma=np.random.default_rng(seed).normal(size=(3, 9)))
    each = to_section_axes(solution.case_actions(xs, sides), orientation)
    found = superposed_bending(each, switched_combinations(solution), field)
    names = list(solution.member.combinations)
    enumerated = to_section_axes(solution.weighted_actions(solution.combination_weights(names), xs, sides), orientation)
    stress = np.abs(enumerated[..., 4:6] @ field.sigma[1:3])  # (A, n, p)
    peak = stress.max()
    if peak == 0.0:
        assert found is None
        return
    assert found.value == pytest.approx(peak, rel=1e-9)
    reached = stress[names.index(found.combination), found.station].max()
    assert reached == pytest.approx(peak, rel=1e-9)


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(member=two_case_members())
def test_per_span_axial_peaks_equal_enumeration(member: Member) -> None:
    """Largest tension and compression N / A over stations and every arrangement: superposed against
    every arrangement evaluated; the named arrangement reaches each at the station given."""
    solution = solve_member(member, None, None)
    xs, sides = stations_of(member)
    area = 2.0e-3
    found = superposed_axial(solution.case_actions(xs, sides), switched_combinations(solution), area)
    names = list(solution.member.combinations)
    stress = solution.weighted_actions(solution.combination_weights(names), xs, sides)[..., 0] / area  # (A, n)
    scale = 1e-9 * (np.abs(stress).max() + 1.0)
    for which, values in (("tension", stress), ("compression", -stress)):
        peak = found[which]
        if values.max() <= scale:
            assert peak is None or peak.value <= scale
            continue
        assert peak.value == pytest.approx(values.max(), abs=scale)
        assert values[names.index(peak.combination), peak.station] == pytest.approx(peak.value, abs=scale)


@pytest.mark.parametrize("uplift", [0.0, 6000.0])
def test_the_axial_and_bending_checks_by_superposition_equal_every_arrangements_row(uplift: float, monkeypatch: pytest.MonkeyPatch) -> None:
    """`sizer check` on a three-bay purlin with two patterned cases (64 arrangements), a patterned
    axial pull and push among them: the axial and bending checks found by per-span superposition
    equal the ones taking every arrangement's row (value and position; bending's arrangement too,
    axial's arrangement reaches the value: there spans that add nothing make ties)."""
    import sizer.checks.design_check as design_check
    from sizer import api
    from test_patterns import purlin

    text = purlin([4.0, 3.0, 5.0], 900.0, 1400.0, uplift) + (
        '[[loads]]\ntype = "point"\ncase = "snow"\nat = "12 m"\nfx = "30 kN"\npattern = true\n'
        '[[loads]]\ntype = "point"\ncase = "imposed"\nat = "5.5 m"\nfx = "-45 kN"\npattern = true\n')
    member = api.member_from_text(text, "purlin.toml")
    outcome = api.check(member, reserve=False)
    superposed = {c.check: c for c in outcome.checks}
    with monkeypatch.context() as patch:
        patch.setattr(design_check, "_superposed", lambda *args: None)
        rows = {c.check: c for c in api.check(member, reserve=False).checks}
    for check in ("axial", "bending"):
        assert superposed[check].made and superposed[check].demand == pytest.approx(rows[check].demand, rel=1e-9), check
        assert superposed[check].at == pytest.approx(rows[check].at, abs=1e-9), check
    assert superposed["bending"].combination == rows["bending"].combination  # no tie in bending on these loads
    axial = superposed["axial"]  # ties (a span's part adds exactly nothing at that station): the arrangement named reaches it
    n = [outcome.design.solution.actions(axial.combination, [axial.at], side)[0, 0] for side in ("left", "right")]
    assert max(abs(value) for value in n) / outcome.design.props.area == pytest.approx(axial.demand, rel=1e-9)
