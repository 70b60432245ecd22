"""Pattern arrangements by per-span superposition (sizer.analysis.superposition) against brute-force
enumeration of every arrangement, the empty one included: the worst arrangement of a quantity
linear in the loads is the fixed part plus the contributions of one sign (superposition, common
practice; every choice of loaded spans is an arrangement, docs/design.md), so the per-station
extremes of the six actions and the peak bending normal stress over mesh nodes must equal the
largest and smallest over every arrangement, each arrangement evaluated on its own, and the
arrangement named must reach that value.
"""

from __future__ import annotations


import numpy as np
import pytest
from hypothesis import HealthCheck, Phase, given, settings
from hypothesis import strategies as st

from sizer.analysis import solve_member
from sizer.analysis.patterns import every_arrangement
from sizer.analysis.superposition import convex_maximum, linear_extremes, switched_combinations
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
    solution = solve_member(every_arrangement(member), None, None)
    xs, sides = stations_of(member)
    each = solution.case_actions(xs, sides)
    [combination] = switched_combinations(solution)
    names = list(solution.member.combinations)
    assert len(names) == 2 ** len(combination.switches)  # the empty arrangement included
    enumerated = solution.weighted_actions(solution.combination_weights(names), xs, sides)  # (A, n, 6)
    fixed = np.tensordot(combination.fixed, each, axes=1)
    parts = np.tensordot(combination.switches, each, axes=1)
    high, low = linear_extremes(fixed, parts)
    scale = 1e-9 * (np.abs(enumerated).max() + 1.0)
    np.testing.assert_allclose(high, enumerated.max(axis=0), rtol=0, atol=scale)
    np.testing.assert_allclose(low, enumerated.min(axis=0), rtol=0, atol=scale)
    for n, j in [(int(n), int(j)) for n, j in zip(*np.unravel_index(np.argsort(-np.abs(high).ravel())[:5], high.shape))]:
        for sense, target in ((1.0, high), (-1.0, low)):
            on = sense * parts[:, n, j] > 0.0  # the switches of that sign: the arrangement named
            reached = np.tensordot(combination.weights(on), each, axes=1)[n, j]
            assert reached == pytest.approx(target[n, j], abs=scale)


@settings(max_examples=40, deadline=None)
@given(count=st.integers(0, 9), dimension=st.integers(1, 3), rank=st.integers(1, 3), seed=st.integers(0, 2**16),
       weights=st.sampled_from([(1.0, 1.0, 1.0), (1.0, 3.0, 3.0)]))
def test_largest_convex_measure_over_arrangements_equals_enumeration(count: int, dimension: int, rank: int, seed: int,
                                                                     weights: tuple[float, float, float]) -> None:
    """The largest of a norm sqrt(sum w_i v_i^2) (the shear stress vector, von Mises with w = 1, 3, 3)
    of a fixed vector plus any subset of `count` vectors, found at the corners of their zonotope,
    against every subset evaluated (2^count), with vectors of lower rank (parallel, coplanar) too:
    a convex function's largest value over a polytope is at a corner (common practice)."""
    rng = np.random.default_rng(seed)
    basis = rng.normal(size=(min(rank, dimension), dimension))
    parts = rng.normal(size=(count, basis.shape[0])) @ basis
    if count > 2:
        parts[1] = -0.5 * parts[0]  # parallel and opposed
    fixed = rng.normal(size=dimension) * rng.choice([0.0, 1.0])
    scale = np.sqrt(np.asarray(weights[:dimension]))

    def measure(vectors: np.ndarray) -> np.ndarray:
        return np.sqrt(((vectors * scale) ** 2).sum(axis=-1))

    value, on = convex_maximum(fixed, parts, measure)
    every = np.array([[bits >> k & 1 for k in range(count)] for bits in range(2**count)], dtype=float).reshape(2**count, count)
    assert value == pytest.approx(measure(fixed + every @ parts).max(), rel=1e-12, abs=1e-12)
    assert measure(fixed + on.astype(float) @ parts) == pytest.approx(value, rel=1e-12, abs=1e-12)


# ----------------------------------------------------------------------------------------------
# every check over every arrangement: the arrangements that govern, checked in full, against every
# arrangement checked in full (brute force)

def tube_member(bays: list[float], overhang: float, loads: list[str], axial: float) -> str:
    """A square tube (no weaker axis: no lateral-torsional buckling, so brute force over thousands of
    arrangements stays fast) pinned then on rollers over the bays, perhaps overhanging; dead load and
    an axial force varying along it (unpatterned), and the patterned loads given; one combination uses both
    patterned cases."""
    ends = [float(x) for x in np.concatenate([[0.0], np.cumsum(bays)])]
    length = ends[-1] + overhang
    supports = "".join(f'[[supports]]\nat = "{x!r} m"\ntype = "{"pin" if i == 0 else "roller"}"\n' for i, x in enumerate(ends))
    return (f'[member]\nlength = "{length!r} m"\nmaterial = "mild-steel"\nsection = "SHS 80x80x5"\n{supports}'
            '[[loads]]\ntype = "line"\ncase = "dead"\nwy = "-0.6 kN/m"\n'
            f'[[loads]]\ntype = "point"\ncase = "dead"\nat = "{length!r} m"\nfx = "{axial!r} N"\n'
            f'[[loads]]\ntype = "line"\ncase = "dead"\nwx = "{-axial / length / 2!r} N/m"\n' + "".join(loads)
            + '[combinations]\n"dead + imposed + snow" = { dead = 1.2, imposed = 1.5, snow = 0.75 }\n'
            '[checks]\ndeflection_limit = 200\nsecond_order = false\n')


@st.composite
def tube_members(draw: st.DrawFn) -> str:
    """Up to 6 bays (or 5 and an overhang), two patterned cases of line loads (in and out of plane,
    over part of the member) and point forces; up to 4^6 arrangements."""
    bays = draw(st.lists(st.integers(10, 30).map(lambda tenths: tenths / 10), min_size=1, max_size=6))
    overhang = draw(st.sampled_from([0.0, 0.8])) if len(bays) < 6 else 0.0
    length = float(np.concatenate([[0.0], np.cumsum(bays)])[-1]) + overhang
    position = st.floats(0.0, 1.0).map(lambda t: min(round(t * length, 3), length))
    force = st.floats(-4000.0, 4000.0).map(lambda v: round(v, 1))
    loads = []
    for case in ("imposed", "snow"):
        a, b = sorted((draw(position), draw(position)))
        if b - a < 0.05:
            a, b = 0.0, length
        loads.append(f'[[loads]]\ntype = "line"\ncase = "{case}"\nfrom = "{a!r} m"\nto = "{b!r} m"\n'
                     f'wy = "{draw(force)!r} N/m"\nwz = "{draw(force) / 3!r} N/m"\npattern = true\n')
        loads.append(f'[[loads]]\ntype = "point"\ncase = "{case}"\nat = "{draw(position)!r} m"\n'
                     f'fy = "{draw(force)!r} N"\nfz = "{draw(force) / 2!r} N"\npattern = true\n')
    return tube_member(bays, overhang, loads, draw(st.sampled_from([0.0, 20e3, -20e3])))


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
          phases=[Phase.explicit, Phase.reuse, Phase.generate, Phase.target])  # no shrinking: each example checks thousands of arrangements
@given(text=tube_members())
def test_every_check_over_the_arrangements_equals_checking_every_arrangement(text: str, monkeypatch: pytest.MonkeyPatch) -> None:
    """Each check's utilization and demand, from the arrangements found to govern (per-span
    superposition, the corners of the convex measures, analysis.superposition), equal those of
    checking every arrangement in full (the empty one included), and the arrangement named reaches
    the value."""
    import sizer.analysis.superposition as superposition
    from sizer import api

    member = api.member_from_text(text, "tube.toml")
    found = api.check(member, reserve=False)
    with monkeypatch.context() as patch:
        patch.setattr(superposition, "superposable", lambda solution: False)  # every arrangement a row of its own
        every = api.check(every_arrangement(member), reserve=False)
    assert len(found.design.member.combinations) <= len(every.design.member.combinations)
    for a, b in zip(found.checks, every.checks, strict=True):
        assert a.check == b.check and a.made == b.made, a.check
        if a.made:
            assert a.utilization == pytest.approx(b.utilization, rel=1e-9, abs=1e-12), a.check
            # abs: round-off of a demand that is zero (a compression of 6e-9 N left by a 20 kN end force and the
            # line load that balances it, found 1e-12 N apart by the two paths: 1e-16 of the forces)
            assert a.demand == pytest.approx(b.demand, rel=1e-9, abs=1e-9), a.check
            assert a.combination in every.design.member.combinations
