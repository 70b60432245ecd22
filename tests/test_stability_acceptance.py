"""When a buckling load factor is taken (sizer.stability.problem): after a halving of every element
that changed it by more than 1e-4, the extrapolated value is taken only where the error left is
within 1e-4, and it lies at or below the converged value.

The model of the errors: Galerkin finite elements give eigenvalues from above that converge as
h^(2(p + 1 - m)) for degree-p shape functions and energy derivatives of order m (Strang & Fix, An
Analysis of the Finite Element Method, ch. 6; from memory): cubic Hermite beam elements (p = 3,
m = 2) converge as h^4, the error falling 16 times per halving; the rule assumes only 4 times
(or the ratio measured on the last two halvings, where lower)."""

from __future__ import annotations

import math

from hypothesis import given, settings
from hypothesis import strategies as st

from sizer.stability.problem import CONVERGED, _extrapolated


@settings(max_examples=300, deadline=None)
@given(st.floats(0.1, 1e4), st.floats(1e-6, 1e-2), st.floats(4.0, 64.0), st.integers(0, 3))
def test_taken_value_is_at_or_below_the_limit_and_within_tolerance(limit: float, error: float, ratio: float, level: int) -> None:
    """Load factors limit (1 + error / ratio^k), k = 0, 1, 2, ... (the error cut `ratio` >= 4 times per
    halving): a value taken from levels k - 1, k (and k - 2) is at or below the limit, within 1e-4."""
    values = [limit * (1 + error / ratio**k) for k in range(level, level + 3)]
    for before, coarse, fine in ((math.inf, values[0], values[1]), (values[0], values[1], values[2])):
        taken = _extrapolated(before, coarse, fine)
        if taken is not None:
            assert taken <= limit * (1 + 1e-12)
            assert taken >= limit * (1 - CONVERGED) * (1 - 1e-12)


def test_slow_measured_convergence_is_not_extrapolated_as_fast() -> None:
    """Changes 2.6e-4 then 1.3e-4 (ratio 2, pre-asymptotic: measured on three meshes): the error left
    is taken as 1.3e-4 / (2 - 1), above 1e-4, so nothing is taken yet, where a ratio of 4 would have
    taken it (common practice: never assume a faster rate than the data show)."""
    limit = 100.0
    before, coarse, fine = limit * (1 + 5.2e-4), limit * (1 + 2.6e-4), limit * (1 + 1.3e-4)
    assert _extrapolated(math.inf, coarse, fine) is not None
    assert _extrapolated(before, coarse, fine) is None


def test_one_halving_change_of_three_tolerances_is_taken_lowered() -> None:
    """One halving changed it by 2.7e-4 (below 3e-4 = (4 - 1) x 1e-4): taken as the finer value less
    a third of the change (the value extrapolated with ratio 4), below the h^4 extrapolation (ratio 16)."""
    coarse, fine = 100.027, 100.0
    taken = _extrapolated(math.inf, coarse, fine)
    assert taken is not None
    assert math.isclose(taken, fine - 0.027 / 3, rel_tol=1e-12)
    assert taken < fine - 0.027 / 15
    assert _extrapolated(math.inf, 100.031, 100.0) is None  # 3.1e-4: refined further
