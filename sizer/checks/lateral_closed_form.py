"""Lateral-torsional buckling by the closed form, for the record's hand check beside the eigen-solve.

Each segment between points held against both sideways movement and twist (supports that hold
both, point restraints that hold both) is taken on its own with fork ends:

    M_cr0 = (pi / L_e) sqrt(E Iy G J) sqrt(1 + pi^2 E Iw / (G J L_e^2))

(elastic critical moment of a doubly symmetric I-beam under uniform moment, Timoshenko & Gere,
Theory of Elastic Stability, 2nd ed., section 6.2), times the moment factor

    Cb = 12.5 M_max / (2.5 M_max + 3 M_A + 4 M_B + 3 M_C) <= 3.0

(AISC 360-16 eq. F1-1; M_A, M_B, M_C the |moments| at the segment's quarter points), with the
effective length L_e = k L for the load height and the ends' hold on plan (BS 5950-1:2000 Table 13:
k = 1.0 for ends free to rotate on plan, 0.85 with one end and 0.7 with both ends held, each
raised to 1.2, 1.0 and 0.85 where a load acts above the shear centre, the destabilising case).
The segment with the lowest M_cr / M_max governs. SI units (m, N*m).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sizer.analysis.section_axes import to_section_axes
from sizer.design import Design
from sizer.model import LineLoad, PointLoad
from sizer.stability.boundary import warping_held
from sizer.stability.heights import depth_axis

CB_CAP = 3.0  # AISC 360-16 section F1 (from memory): Cb taken no larger than 3.0
LENGTH_FACTORS = {(0, False): 1.0, (0, True): 1.2, (1, False): 0.85, (1, True): 1.0, (2, False): 0.7, (2, True): 0.85}


@dataclass(frozen=True)
class Segment:
    """A stretch of the member between holds (m), whether each end is held against rotation on plan,
    and, when the closed form cannot be used on it, why ("" when it can)."""

    start: float
    end: float
    ends_on_plan: int
    why_not: str = ""


@dataclass(frozen=True)
class ClosedForm:
    """The closed form on one segment: its length (m), Cb, k, uniform-moment M_cr0 (N*m, on k L),
    M_cr = Cb M_cr0, the segment's peak |M| (N*m), its load factor M_cr / M_max, and whether a
    load above the shear centre made k the destabilising value."""

    segment: Segment
    moments: tuple[float, float, float, float]  # M_max, M_A, M_B, M_C (N*m, absolute)
    cb: float
    k: float
    destabilising: bool
    uniform: float
    critical: float

    @property
    def load_factor(self) -> float:
        return self.critical / self.moments[0] if self.moments[0] > 0 else math.inf


def held_points(design: Design) -> list[tuple[float, bool]]:
    """(x, held on plan) of every point held against both sideways movement and twist."""
    sideways = "uy" if design.member.orientation == "minor" else "uz"
    on_plan = "rz" if design.member.orientation == "minor" else "ry"
    points = [(s.at, on_plan in s.restrain and warping_held(s)) for s in design.member.supports
              if sideways in s.restrain and "rx" in s.restrain]
    points += [(r.start, False) for r in design.member.restraints if not r.continuous and r.lateral and r.twist]
    return sorted(set(points))


def segments(design: Design) -> list[Segment]:
    """The member cut at its held points; a stretch with a free end, or with a continuous lateral
    restraint along it, is kept with the reason the closed form does not apply."""
    length = design.member.length
    points = held_points(design)
    xs = sorted({x for x, _ in points})
    plan = {x: held for x, held in points}
    edges = ([0.0] if not xs or xs[0] > 0 else []) + xs + ([length] if not xs or xs[-1] < length else [])
    found = []
    for a, b in zip(edges[:-1], edges[1:]):
        if b - a <= 1e-9:
            continue
        why = ""
        if a not in plan or b not in plan:
            why = "one end is free to move sideways or twist (the uniform-moment closed form needs both ends held)"
        elif any(r.continuous and r.lateral and r.start < b and r.end > a for r in design.member.restraints):
            why = "a continuous lateral restraint holds it along its length"
        found.append(Segment(a, b, int(plan.get(a, False)) + int(plan.get(b, False)), why))
    return found


def destabilising(design: Design, combination: str) -> bool:
    """True when a transverse load of the combination acts above the shear centre, pushing towards
    it (a downward load on the top face; by default every load acts on the face it pushes on)."""
    solution = design.solution
    weights = solution.weights()[list(solution.combination_names).index(combination)]
    factor = dict(zip(solution.cases, weights[:-1]))
    axis = depth_axis(design.member.orientation)
    for load in design.member.loads:
        f = float(factor.get(load.case, 0.0))
        if isinstance(load, PointLoad):
            forces = [f * load.force[axis]]
        elif isinstance(load, LineLoad):
            forces = [f * load.q_start[axis], f * load.q_end[axis]]
        else:
            continue
        for force in forces:
            if force == 0.0 or load.height == "centre":
                continue
            if load.height is None:
                return True
            up = {"top": 1.0, "bottom": -1.0}.get(load.height, load.height) if isinstance(load.height, str) else load.height
            if force * float(up) < 0:
                return True
    return False


def segment_moments(design: Design, combination: str, segment: Segment) -> tuple[float, float, float, float]:
    """(|M|max, |M| at the quarter, middle and three-quarter points) of the major-axis moment (N*m)."""
    xs = np.linspace(segment.start, segment.end, 201)
    values = np.abs(to_section_axes(design.solution.actions(combination, xs, "right"), design.member.orientation)[:, 5])
    quarter = values[[50, 100, 150]]
    return float(values.max()), float(quarter[0]), float(quarter[1]), float(quarter[2])


def moment_factor(moments: tuple[float, float, float, float]) -> float:
    """Cb = 12.5 M_max / (2.5 M_max + 3 M_A + 4 M_B + 3 M_C), at most CB_CAP (AISC 360-16 eq. F1-1)."""
    peak, a, b, c = moments
    return min(12.5 * peak / (2.5 * peak + 3 * a + 4 * b + 3 * c), CB_CAP) if peak > 0 else 1.0


def uniform_moment_critical(design: Design, length: float) -> float:
    """M_cr0 (N*m) of Timoshenko & Gere for uniform moment on a fork-ended length (m)."""
    E, G, props = design.known_material.elastic_modulus, design.known_material.shear_modulus, design.props
    return (math.pi / length) * math.sqrt(E * props.Iy * G * props.J) * math.sqrt(1 + math.pi**2 * E * props.Iw / (G * props.J * length**2))


def closed_forms(design: Design, combination: str) -> list[ClosedForm | Segment]:
    """The closed form of every segment where it applies, else the Segment with its reason."""
    destab = destabilising(design, combination)
    out: list[ClosedForm | Segment] = []
    for segment in segments(design):
        if segment.why_not:
            out.append(segment)
            continue
        moments = segment_moments(design, combination, segment)
        if moments[0] <= 0:
            continue
        k = LENGTH_FACTORS[(segment.ends_on_plan, destab)]
        uniform = uniform_moment_critical(design, k * (segment.end - segment.start))
        cb = moment_factor(moments)
        out.append(ClosedForm(segment, moments, cb, k, destab, uniform, cb * uniform))
    return out
