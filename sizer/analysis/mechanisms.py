"""Mechanisms: a load case that does work on a free rigid-body motion of the supported member
cannot be in equilibrium; the motion is named (freedoms and the parts between hinges that move)
with a fix, as one InputError.
"""

from __future__ import annotations

import numpy as np

from sizer.analysis.layout import Layout
from sizer.analysis.problems import Problem
from sizer.errors import InputError
from sizer.model import Member

ENGAGED_TOLERANCE = 1e-9  # relative work of a load on a free rigid-body motion that counts as a mechanism


def engaged_modes(problem: Problem, load: np.ndarray, length: float) -> np.ndarray | None:
    """The rigid-body motion (a, b per part) that the load drives, or None when it does no work on
    any free motion. `load`: (size,) nodal loads."""
    if problem.modes.shape[1] == 0:
        return None
    is_rotation = np.ones(problem.size, bool)
    is_rotation[problem.translation] = False
    scale = np.sum(np.abs(load[~is_rotation])) + np.sum(np.abs(load[is_rotation])) / length
    work = problem.modes.T @ load
    if scale == 0 or np.max(np.abs(work)) <= ENGAGED_TOLERANCE * scale:
        return None
    return problem.mode_params @ work


def _describe_motion(problem: Problem, params: np.ndarray, length: float, tol: float) -> tuple[list[str], list[tuple[float, float]]]:
    """Freedom names and part extents of a driven rigid-body motion."""
    main = problem.moving[0]
    if not problem.bending:
        return [main], []
    rotation = problem.moving[1]
    size = np.max(np.abs(params))
    names: list[str] = []
    moving_parts: list[tuple[float, float]] = []
    for part, (lo, hi) in enumerate(problem.mode_parts):
        a, b = params[2 * part], params[2 * part + 1]
        if max(abs(a), abs(b)) <= 1e-6 * size:
            continue
        moving_parts.append((lo, hi))
        if abs(b) <= 1e-6 * size:
            found = [main]
        else:
            centre = (lo + hi) / 2
            pivot = centre - a * length / b
            found = [rotation] if lo - tol <= pivot <= hi + tol else [main, rotation]
        names += [name for name in found if name not in names]
    return names, moving_parts


_FIXES = {
    "axial": "hold ux at one support (a pin or fixed), or remove the axial loads (fx, wx)",
    "torsion": "hold rx at one support (fixed, pin and roller all hold it), or remove the torques (mx)",
    "xy": "hold uy at two supports or add a fixed support (holds rz) on each part between hinges, or remove the fy, wy and mz loads",
    "xz": "hold uz at two supports or add a fixed support (holds ry) on each part between hinges, or remove the fz, wz and my loads",
}


def mechanism_error(member: Member, case: str, findings: list[tuple[Problem, np.ndarray]], layout: Layout) -> InputError:
    """The InputError for the driven rigid-body motions found in one load case."""
    names: list[str] = []
    parts: list[tuple[float, float]] = []
    for problem, params in findings:
        found_names, found_parts = _describe_motion(problem, params, layout.length, layout.tol)
        names += [name for name in found_names if name not in names]
        parts += [part for part in found_parts if part not in parts and len(problem.mode_parts) > 1]
    where = ""
    if parts:
        where = " (" + ", ".join(f"the part from {lo:g} m to {hi:g} m" for lo, hi in parts) + ")"
    label = case if case else "(unnamed)"
    fixes = "; ".join(_FIXES[problem.name] for problem, _ in findings)
    return InputError(member.source, "supports", f"mechanism: the member is free to move in {', '.join(names)}{where} under load case '{label}'", fixes)
