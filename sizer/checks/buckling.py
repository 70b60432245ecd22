"""Flexural buckling of the member as a column: Euler's load on the buckling length about each
principal axis, with the Johnson parabola below the transition slenderness Cc = pi sqrt(2 E / Fy).
Lengths in m, stresses in Pa.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from sizer.model import Member


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


def buckling_lengths(member: Member) -> tuple[float, float]:
    """Buckling lengths (m) about the major (I11) and minor (I22) principal axes; default: the member length."""
    settings = member.checks
    return tuple(length if length is not None else member.length
                 for length in (settings.buckling_length_major, settings.buckling_length_minor))  # type: ignore[return-value]


def weakest_buckling_stresses(member: Member, area: np.ndarray, i11: np.ndarray, i22: np.ndarray, material: Any) -> np.ndarray:
    """Smaller flexural buckling stress (Pa) of the two principal axes, for arrays of sections."""
    major, minor = buckling_lengths(member)
    return np.minimum(critical_stresses(major / np.sqrt(i11 / area), material.elastic_modulus, material.yield_strength),
                      critical_stresses(minor / np.sqrt(i22 / area), material.elastic_modulus, material.yield_strength))


def buckling_axes(member: Member, props: Any, material: Any) -> list[BucklingAxis]:
    """Buckling about the section's principal axes: major (I11) with buckling_length_major, minor (I22)
    with buckling_length_minor; defaults: the member length."""
    axes = []
    for axis, inertia, length in zip(("major", "minor"), (props.I11, props.I22), buckling_lengths(member)):
        radius = math.sqrt(inertia / props.area)
        slenderness = length / radius
        stress, formula = critical_stress(slenderness, material.elastic_modulus, material.yield_strength)
        axes.append(BucklingAxis(axis, length, radius, slenderness, stress, formula))
    return axes
