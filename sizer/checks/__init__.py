"""The checks of docs/design.md section 7 for one member and one section: stresses from the internal actions
on the full cross-section stress field, against the user's allowables.

Modules: results (CheckResult, CheckReport), stations (where to look, the actions there), field
(peak stresses on the full field), buckling (column buckling stresses), strength (the stress checks),
deflection (spans and their deflections), design_check (every check of one section).

Stress field: the section's unit fields (sections.UnitStressField) give, at every mesh node, the
normal stress per unit N, My, Mz and the shear stress vector per unit Vy, Vz, T (section axes).
Stress is linear in the actions, so the stress at a node for any station is the weighted sum.
Orientation "minor" turns the section a quarter turn on the member: section axes (y_s, z_s) =
(member z, -member y), so Vy_s = Vz, Vz_s = -Vy, My_s = Mz, Mz_s = -My.

Units: stresses in Pa, forces in N, lengths in m. Utilization = demand / allowable (1.0 = at limit).
"""

from sizer.analysis.section_axes import to_section_axes
from sizer.checks.buckling import BucklingAxis, ColumnBuckling, column_buckling, given_euler_loads, given_length_axes
from sizer.checks.deflection import Span, deflection_check, relative_to_supports, span_deflections, span_points, spans
from sizer.checks.design_check import check_design, check_notes, stress_checks
from sizer.checks.field import FieldPeaks, StationStresses, full_field_stresses
from sizer.checks.results import CHECK_NAMES, ZERO_ACTION, CheckReport, CheckResult
from sizer.checks.stations import check_stations, member_actions
from sizer.checks.lateral import LateralBuckling, lateral_buckling
from sizer.checks.stability import StabilityReport, stability_report
from sizer.checks.strength import compression_allowables

__all__ = [
    "CHECK_NAMES", "ZERO_ACTION", "BucklingAxis", "CheckReport", "CheckResult", "ColumnBuckling", "FieldPeaks", "LateralBuckling", "Span",
    "StabilityReport", "StationStresses", "check_design", "check_notes", "stress_checks", "check_stations", "column_buckling",
    "compression_allowables", "deflection_check", "given_length_axes", "lateral_buckling", "stability_report",
    "full_field_stresses", "member_actions", "relative_to_supports", "span_deflections", "span_points", "spans",
    "to_section_axes", "given_euler_loads",
]
