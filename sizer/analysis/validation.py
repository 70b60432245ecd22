"""Checks of a member and its loads before solving: everything on the member, finite, no two
supports at one position, springs positive, no bending moment on a hinge. Errors are InputError
naming the file and the key (entries counted from 1).
"""

from __future__ import annotations

from typing import Sequence

import numpy as np

from sizer.analysis.layout import position_tolerance
from sizer.errors import InputError
from sizer.model import FREEDOMS, Load, Member, PointLoad, Stiffness


def _load_key(member: Member, load: Load) -> str:
    """'loads[i]' (1-based, as counted in the file) for a load of the member, else 'loads'."""
    for index, candidate in enumerate(member.loads):
        if candidate is load:
            return f"loads[{index + 1}]"
    return "loads"


def _off_member(member: Member, value: float) -> bool:
    tol = position_tolerance(member)
    return not np.isfinite(value) or value < -tol or value > member.length + tol


def check_geometry(member: Member) -> None:
    """Length, supports, springs and hinges on the member; no two supports at one position."""
    file, length = member.source, member.length
    if not (np.isfinite(length) and length > 0):
        raise InputError(file, "member.length", f"the length must be a positive finite value, got {length!r}", 'give e.g. "6 m"')
    for index, support in enumerate(member.supports):
        if _off_member(member, support.at):
            raise InputError(file, f"supports[{index + 1}].at", f"the support at {support.at:g} m is off the member (0 to {length:g} m)",
                             "place it between the member's ends")
        for freedom, k in support.springs.items():
            if freedom not in FREEDOMS or not (np.isfinite(k) and k > 0):
                raise InputError(file, f"supports[{index + 1}].springs.{freedom}", f"a spring must be a positive finite stiffness on one of "
                                 f"{', '.join(FREEDOMS)}, got {k!r}", 'give e.g. uy = "20 kN/mm"')
    ats = sorted((s.at, i) for i, s in enumerate(member.supports))
    for (a, _), (b, j) in zip(ats, ats[1:]):
        if b - a <= position_tolerance(member):
            raise InputError(file, f"supports[{j + 1}].at", f"two supports at {b:g} m", "merge them into one support with the union of their freedoms")
    for index, hinge in enumerate(member.hinges):
        if _off_member(member, hinge.at):
            raise InputError(file, f"hinges[{index + 1}].at", f"the hinge at {hinge.at:g} m is off the member (0 to {length:g} m)",
                             "place it between the member's ends")


def check_loads(member: Member, loads: Sequence[Load]) -> None:
    """Every load on the member and finite; no bending moment exactly at a hinge."""
    file, length, tol = member.source, member.length, position_tolerance(member)
    hinges = np.array([h.at for h in member.hinges], dtype=float)
    for load in loads:
        key = _load_key(member, load)
        if isinstance(load, PointLoad):
            if not np.all(np.isfinite(np.r_[load.force, load.moment])):
                raise InputError(file, key, "a load value is not finite", "give finite values")
            if _off_member(member, load.at):
                raise InputError(file, f"{key}.at", f"the load at {load.at:g} m is off the member (0 to {length:g} m)",
                                 "place it between the member's ends")
            if (load.moment[1] or load.moment[2]) and np.any(np.abs(hinges - load.at) <= tol):
                raise InputError(file, f"{key}.at", f"a bending moment at {load.at:g} m acts on a hinge, which cannot take it",
                                 "move it slightly to the side of the hinge where it acts")
        else:
            if not np.all(np.isfinite(np.r_[load.q_start, load.q_end])):
                raise InputError(file, key, "a load value is not finite", "give finite values")
            for name, value in (("from", load.start), ("to", load.end)):
                if _off_member(member, value):
                    raise InputError(file, f"{key}.{name}", f"the line load reaches {value:g} m, off the member (0 to {length:g} m)",
                                     "keep `from` and `to` between the member's ends")
            if load.end < load.start - tol:
                raise InputError(file, f"{key}.to", f"the line load ends ({load.end:g} m) before it starts ({load.start:g} m)",
                                 "give `to` greater than `from`")


def check_springs_need_stiffness(member: Member, stiffness: Stiffness | None) -> None:
    if stiffness is None and member.has_springs:
        raise InputError(member.source, "member.section", "the support springs make the forces depend on the member's stiffness, "
                         "and no section is given", "give a section")
