"""The member's stability for one section: the elastic buckling load factors of every combination
(sizer.stability) beside the demands they are compared with, for the buckling, lateral-torsional and
interaction checks.

For each combination: the peak axial compression (N) and the peak major-axis moment |Mz| (N*m, the
section's own axes) at the check stations, and the lowest load factors of the eigen-solves on the
member as it is: `axial` under the combination's axial force alone, `lateral` under its major-axis
bending with the loads' heights. A load factor scales the whole combination (self-weight included).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from sizer.checks.results import ZERO_ACTION
from sizer.design import Design
from sizer.errors import InputError
from sizer.stability import Buckling, MemberStability, StabilitySection, minor_axis_is_weaker, stability_section
from sizer.stability.section import has_weaker_axis

N, MZ = 0, 5
FIELD_WORDS = {0: "movement along the section's depth", 1: "sideways movement", 2: "twisting about the member axis"}
FIELD_FIXES = {0: "hold uy (or uz for a member turned to its minor axis) at a support",
               1: 'hold the sideways movement at a support, or add a [[restraints]] entry with hold = ["lateral"]',
               2: 'hold rx at a support (pin, roller and fixed all hold it), or add a [[restraints]] entry with hold = ["twist"]'}


@dataclass(frozen=True)
class CombinationStability:
    """One combination's demands and buckling load factors (see the module docstring)."""

    combination: str
    compression: float  # N, >= 0
    compression_at: float  # m
    moment: float  # N*m, >= 0: largest |Mz| in the section's axes
    moment_at: float  # m
    moment_sign: float  # sign of Mz there (+1 sagging: top fibre in compression)
    axial: Buckling | None  # None: no compression
    lateral: Buckling | None  # None: no major-axis bending, or the member cannot buckle sideways


@dataclass
class StabilityReport:
    """Every combination's stability for one section, and why lateral-torsional buckling does not
    apply where it does not ("" where it does)."""

    model: MemberStability
    section: StabilitySection
    lateral_reason: str
    combinations: list[CombinationStability] = field(default_factory=list)
    elements: int = 0  # the most elements a converged load factor needed
    converged: bool = True  # False: some load factor was taken less its last change (see SectionStability)
    warping_elements: float = 0.0  # m: the elements next to the warping holds, where the mesh was graded towards them (else 0)


def lateral_not_applicable(design: Design, section: StabilitySection, moments: np.ndarray) -> str:
    """Why the member cannot buckle sideways under these moments ("" when it can)."""
    if not np.any(np.abs(moments) > ZERO_ACTION):
        if design.member.orientation == "minor":
            return "no bending about the section's major axis: it is bent about its weaker axis only"
        return "no bending about the section's major axis"
    if not minor_axis_is_weaker(section):
        if not has_weaker_axis(section):
            return "the section has no weaker axis (I11 = I22, principal second moments): it does not buckle sideways"
        return "the section is bent about its weaker principal axis: it does not buckle sideways"
    return ""


def stability_report(design: Design, actions: np.ndarray, xs: np.ndarray, model: MemberStability | None = None) -> StabilityReport:
    """The stability of the design's section under every combination; `actions` (C, S, 6) in the
    section's axes at the check stations `xs` (m). `model`: a MemberStability of this member to
    reuse (its section-independent parts), else one is built."""
    model = model or MemberStability(design.member, design.solution)
    section = stability_section(design.props, design.material.elastic_modulus, design.material.shear_modulus)
    reason = lateral_not_applicable(design, section, actions[..., MZ])
    report = StabilityReport(model, section, reason)
    mass = (design.mass_per_length or 0.0) if design.member.self_weight_case else 0.0
    solver = model.for_section(section)
    for c, name in enumerate(design.solution.combination_names):
        compression = np.maximum(-actions[c, :, N], 0.0)
        moments = np.abs(actions[c, :, MZ])
        at_n, at_m = int(np.argmax(compression)), int(np.argmax(moments))
        axial = lateral = None
        if compression[at_n] > ZERO_ACTION:
            axial = _checked(solver.combination("axial", c, mass), model, design, name)
        if not reason and moments[at_m] > ZERO_ACTION:
            lateral = _checked(solver.combination("lateral", c, mass), model, design, name)
        report.combinations.append(CombinationStability(
            name, float(compression[at_n]), float(xs[at_n]), float(moments[at_m]), float(xs[at_m]),
            float(np.sign(actions[c, at_m, MZ]) or 1.0), axial, lateral))
    report.elements, report.converged = solver.elements, solver.converged
    if solver.model is not model:
        report.warping_elements = solver.warping_elements()
    return report


def _checked(buckling: Buckling, model: MemberStability, design: Design, combination: str) -> Buckling:
    """The buckling result, or bad input when the member is free to move in a way the loading drives
    (docs/design.md section 3: every movement a load engages must be held)."""
    if not buckling.free_movement:
        return buckling
    fields = model.mesh.field_of()
    sizes = [float(np.abs(buckling.mode[fields == k]).max(initial=0.0)) for k in range(3)]
    moving = int(np.argmax(sizes))
    raise InputError(design.member.source, "supports", f"mechanism: nothing holds the member against {FIELD_WORDS[moving]}, "
                     f"and the loads of combination '{combination}' would drive it", FIELD_FIXES[moving])
