"""Mechanisms driven by loads: a load case that does work on a free rigid-body motion of the
supported member cannot be in equilibrium; the motion is named with a fix, as one InputError.

The supports alone have been checked before (`support_stability`): no sideways or rotational motion
is free, and sliding along x and twist are free only while no load of the member file acts that way.
What remains for this check is a load the member file does not hold: the self-weight along x of a
member whose supports leave it free to slide (raised only when the weight is counted), or loads
passed to the solver directly.
"""

from __future__ import annotations

import numpy as np

from sizer.analysis.problems import Problem
from sizer.errors import InputError
from sizer.model import Member

ENGAGED_TOLERANCE = 1e-9  # relative work of a load on a free rigid-body motion that counts as a mechanism

_FIXES = {
    "axial": "hold ux at one support (a pin or fixed), or remove the loads along x (fx, wx, or self-weight along x)",
    "torsion": "hold rx at one support (fixed, pin and roller all hold it), or remove the torques (mx)",
}


def engaged_modes(problem: Problem, load: np.ndarray, length: float) -> np.ndarray | None:
    """The rigid-body motion (a, b per part) that the load drives, or None when it does no work on
    any free motion. `load`: (size,) nodal loads (N, or N*m for rotations)."""
    if problem.modes.shape[1] == 0:
        return None
    is_rotation = np.ones(problem.size, bool)
    is_rotation[problem.translation] = False
    scale = np.sum(np.abs(load[~is_rotation])) + np.sum(np.abs(load[is_rotation])) / length
    work = problem.modes.T @ load
    if scale == 0 or np.max(np.abs(work)) <= ENGAGED_TOLERANCE * scale:
        return None
    return problem.mode_params @ work


def mechanism_error(member: Member, case: str, findings: list[tuple[Problem, np.ndarray]]) -> InputError:
    """The InputError for the driven rigid-body motions found in one load case (after
    support_stability, motions of the whole member along or about x)."""
    names = [problem.moving[0] for problem, _ in findings]
    label = case if case else "(unnamed)"
    fixes = "; ".join(_FIXES.get(problem.name, "hold the member against this movement") for problem, _ in findings)
    return InputError(member.source, "supports", f"mechanism: the member is free to move in {', '.join(names)} under load case '{label}'", fixes)
