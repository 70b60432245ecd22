"""Effective lengths that follow the member: for each principal axis, the flexural buckling load
of the member as it is (its supports, restraints and its own axial-force diagram), found by the
same eigen-solve as the buckling check with the other freedoms made stiff, and the length that
gives that load in Euler's formula, KL = pi sqrt(E I / P_cr). A cantilever post comes out with
KL close to 2 L, a column between two pins close to L. SI units (m, N).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from sizer.checks.stability import StabilityReport
from sizer.design import Design

STIFF = 1e4  # rigidity multiplier that takes a freedom out of the lowest mode


@dataclass(frozen=True)
class AxisLength:
    """Flexural buckling about one principal axis ("major": bending in the depth plane, "minor":
    sideways): its second moment (m^4), the eigen-solve's critical load (N, peak compression at
    buckling; inf: no such mode) and the effective length (m) that Euler's formula needs for it."""

    axis: str
    inertia: float
    critical_load: float
    length: float


def axis_lengths(design: Design, report: StabilityReport, combination: str) -> list[AxisLength]:
    """Major- and minor-axis flexural buckling of `combination` (one with compression)."""
    names = list(design.solution.combination_names)
    index = names.index(combination)
    entry = report.combinations[index]
    section = report.section
    mass = (design.mass_per_length or 0.0) if design.member.self_weight_case else 0.0
    E = design.known_material.elastic_modulus
    found = []
    for axis, inertia in (("major", design.props.I11), ("minor", design.props.I22)):
        stiff = section.EIy * STIFF if axis == "major" else section.EIz * STIFF
        only = replace(section, EIz=E * inertia if axis == "major" else stiff, EIy=E * inertia if axis == "minor" else stiff,
                       EIyz=0.0, GJ=section.GJ * STIFF + stiff, EIw=section.EIw * STIFF, y0=0.0, z0=0.0)
        factor = report.model.for_section(only).combination("axial", index, mass).load_factor
        load = factor * entry.compression if np.isfinite(factor) and factor > 0 else math.inf
        length = math.pi * math.sqrt(E * inertia / load) if math.isfinite(load) else math.inf
        found.append(AxisLength(axis, float(inertia), float(load), float(length)))
    return found
