"""Every check of SPEC section 7 for one member and one section, and the assumptions behind them.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from sizer.analysis.section_axes import to_section_axes
from sizer.checks.buckling import BucklingAxis, buckling_axes
from sizer.checks.deflection import deflection_check
from sizer.checks.field import FieldPeaks
from sizer.checks.results import CheckReport
from sizer.checks.stations import check_stations, member_actions
from sizer.checks.strength import axial_check, bending_check, buckling_check, equivalent_check, interaction_check, shear_check
from sizer.design import Design


def check_design(design: Design, unit_field: Any, n_even: int = 200) -> CheckReport:
    """Every check of SPEC section 7 for the design's section, on the full stress field."""
    xs, sides = check_stations(design, n_even)
    names = design.solution.combination_names
    actions = to_section_axes(member_actions(design, xs, sides), design.member.orientation)
    stress = FieldPeaks(actions, unit_field, design.props.area)
    axes = buckling_axes(design.member, design.props, design.material)
    checks = [
        axial_check(stress, xs, names, design),
        bending_check(stress, xs, names, design),
        interaction_check(stress, xs, names, design, axes),
        shear_check(stress, xs, names, design),
        equivalent_check(stress, xs, names, design),
        deflection_check(design),
        buckling_check(stress, xs, names, design, axes),
    ]
    nodes = np.asarray(unit_field.sigma).shape[1]
    notes = check_notes(design, axes, len(xs), len(names), nodes)
    return CheckReport(design.spec.name, checks, notes, len(xs), nodes)


def check_notes(design: Design, axes: list[BucklingAxis], n_stations: int, n_combinations: int, nodes: int) -> list[str]:
    """The assumptions behind the checks, stated so that none is hidden."""
    settings = design.member.checks
    factor_text = "default" if not settings.buckling_safety_factor_given else "given"
    notes = [
        f"Verdict from the full cross-section stress field: {n_stations} stations x {n_combinations} combinations, "
        f"each on all {nodes} mesh nodes (sectionproperties unit stress fields, combined linearly).",
        "Buckling lengths: " + ", ".join(f"{a.axis} {a.length:g} m (KL/r {a.slenderness:.0f}, {a.formula})" for a in axes)
        + f"; safety factor {settings.buckling_safety_factor:g} ({factor_text}).",
        "Interaction: fa/Fa + fb/Fb with fb the peak bending stress from My and Mz together; Fa in compression is "
        "the compression allowable reduced to σcr / safety factor where lower.",
    ]
    if design.material.yield_strength is None:
        notes.append("No yield strength given: Euler buckling only (no Johnson parabola); unsafe for stocky members.")
    if settings.deflection_limit is not None:
        overhang = settings.deflection_limit_overhang or settings.deflection_limit / 2
        chosen = ", ".join(settings.deflection_combinations or design.solution.combination_names)
        notes.append(f"Deflection limits: span/{settings.deflection_limit:g}, overhang/{overhang:g}, "
                     f"relative to the supports, combinations: {chosen}.")
    return notes
