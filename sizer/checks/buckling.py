"""Buckling of the member as a column (docs/design.md sections 7 and 10): the lowest elastic buckling load of
each combination from the eigen-solve on the member (flexural about either axis, torsional,
flexural-torsional, with its supports and restraints), beside Euler's load on any buckling length the
user gives (the lower governs and the output says which), reduced by the Johnson parabola below the
transition slenderness Cc = pi sqrt(2 E / Fy) (sigma = Fy (1 - Fy / (4 sigma_e)) above Fy / 2) and
divided by the safety factor. Lengths in m, stresses in Pa, loads in N.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from sizer.checks.mode_label import mode_label
from sizer.stability.section import has_weaker_axis
from sizer.checks.reduction import johnson
from sizer.checks.results import CheckResult
from sizer.checks.stability import StabilityReport
from sizer.design import Design
from sizer.model import Material, Member
from sizer.phrase import phrase, q

if TYPE_CHECKING:
    from sizer.sections.properties import SectionProperties


@dataclass(frozen=True)
class BucklingAxis:
    """Flexural buckling about one principal axis. Lengths m, stresses Pa, loads N."""

    axis: str  # "major" or "minor"
    length: float
    radius: float
    slenderness: float
    critical_stress: float
    formula: str  # "Euler" or "Johnson"


def _transition_slenderness(modulus: float, yield_strength: float | None) -> float:
    """Cc = pi sqrt(2 E / Fy), where the Johnson parabola meets Euler's curve (0 without a yield
    strength: Euler's curve throughout)."""
    return math.pi * math.sqrt(2.0 * modulus / yield_strength) if yield_strength else 0.0


def critical_stresses(slenderness: np.ndarray, modulus: float, yield_strength: float | None) -> np.ndarray:
    """Flexural buckling stress (Pa) for each slenderness: Euler pi^2 E / lambda^2, or the Johnson
    parabola Fy (1 - lambda^2 / (2 Cc^2)) below the transition slenderness Cc (see
    _transition_slenderness); lambda <= 0 (no length): Fy, or infinite without a yield strength."""
    slenderness = np.asarray(slenderness, dtype=float)
    transition = _transition_slenderness(modulus, yield_strength)
    with np.errstate(divide="ignore"):
        stress = math.pi**2 * modulus / slenderness**2
    if yield_strength:
        johnson = yield_strength * (1.0 - slenderness**2 / (2.0 * transition**2))
        stress = np.where(slenderness >= transition, stress, johnson)
    return np.where(slenderness <= 0, yield_strength or math.inf, stress)


def critical_stress(slenderness: float, modulus: float, yield_strength: float | None) -> tuple[float, str]:
    """Flexural buckling stress (Pa, see critical_stresses) and the formula that gives it."""
    stress = float(critical_stresses(np.array([slenderness]), modulus, yield_strength)[0])
    if slenderness <= 0:
        return stress, "short"
    return stress, "Euler" if slenderness >= _transition_slenderness(modulus, yield_strength) else "Johnson"


def _axis(axis: str, inertia: float, length: float, props: SectionProperties, material: Material) -> BucklingAxis:
    radius = math.sqrt(inertia / props.area)
    stress, formula = critical_stress(length / radius, material.elastic_modulus, material.yield_strength)
    return BucklingAxis(axis, length, radius, length / radius, stress, formula)


def given_length_axes(member: Member, props: SectionProperties, material: Material) -> list[BucklingAxis]:
    """Flexural buckling on the lengths the user gave (buckling_length_major about I11,
    buckling_length_minor about I22); empty when none is given."""
    settings = member.checks
    given = (("major", props.I11, settings.buckling_length_major), ("minor", props.I22, settings.buckling_length_minor))
    return [_axis(axis, inertia, length, props, material) for axis, inertia, length in given if length is not None]


def given_euler_loads(member: Member, i11: Any, i22: Any, modulus: float) -> np.ndarray:
    """The smaller Euler load pi^2 E I / L^2 (N) on the buckling lengths the user gives, about I11 and
    I22 (arrays of sections); infinite where none is given. The check's buckling load is at most it."""
    settings = member.checks
    load = np.full(np.shape(i11), np.inf)
    for length, inertia in ((settings.buckling_length_major, i11), (settings.buckling_length_minor, i22)):
        if length is not None:
            load = np.minimum(load, math.pi**2 * modulus * np.asarray(inertia) / length**2)
    return load


@dataclass(frozen=True)
class ColumnBuckling:
    """One combination's column buckling: peak compression (N) and where (m), the elastic critical
    load (N) and its mode, the buckling stress after the Johnson parabola (Pa) and the allowable
    load (N) = that stress x area / safety factor."""

    combination: str
    compression: float
    at: float
    critical_load: float
    mode: str
    stress: float
    formula: str
    allowable: float

    @property
    def utilization(self) -> float:
        return self.compression / self.allowable if self.allowable > 0 else math.inf


def column_buckling(design: Design, report: StabilityReport, given: list[BucklingAxis]) -> list[ColumnBuckling | None]:
    """Per combination (None where it has no compression): the lower of the eigen-solve's load and
    Euler's on each given length."""
    area, material = design.props.area, design.known_material
    factor = design.member.checks.buckling_safety_factor
    found: list[ColumnBuckling | None] = []
    for entry in report.combinations:
        if entry.axial is None:
            found.append(None)
            continue
        load, mode = entry.axial.load_factor * entry.compression, "none"
        if entry.axial.mode is not None:
            shares = report.model.energy_shares(report.section, entry.axial.mode)
            mode = mode_label(shares, not bool(has_weaker_axis(report.section)))
        for axis in given:
            euler = math.pi**2 * material.elastic_modulus * axis.radius**2 * area / axis.length**2
            if euler < load:
                load, mode = euler, phrase(f"flexural {axis.axis} (given length ", q("L", axis.length, "m"), ")")
        elastic = load / area
        stress = float(johnson(elastic, material.yield_strength))
        formula = "Euler" if stress == elastic else "Johnson"
        found.append(ColumnBuckling(entry.combination, entry.compression, entry.compression_at, load, mode, stress, formula,
                                    stress * area / factor))
    return found


def buckling_check(columns: list[ColumnBuckling | None], design: Design) -> CheckResult:
    """Peak axial compression of each combination against its allowable buckling load."""
    made = [column for column in columns if column is not None]
    if not made:
        return CheckResult("buckling", None, detail="no axial compression")
    worst = max(made, key=lambda column: column.utilization)
    factor = design.member.checks.buckling_safety_factor
    detail = phrase(worst.mode, ", P_cr = ", q("P_cr", worst.critical_load, "kN", ".4g"), f" ({worst.formula}: ",
                    q("stress", worst.stress, "MPa", ".4g"), f"), safety factor {factor:g}")
    return CheckResult("buckling", worst.utilization, worst.compression, worst.allowable, worst.at, worst.combination, quantity="force",
                       detail=detail, extra={"critical_load": worst.critical_load, "mode": worst.mode})
