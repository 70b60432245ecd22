"""Second-order actions for the checks ([checks] second_order, default true): each combination's
exact first-order actions (sizer.analysis) plus the increments of a second-order elastic solve of
the member with its own geometric stiffness (sizer.stability.second_order), and each combination's
amplification = second-order peak moment / first-order peak moment (the peak of the resultant
sqrt(My^2 + Mz^2) over the check stations). A combination at or beyond its elastic buckling load
keeps its first-order actions and fails the "second-order" check.

The stability checks (buckling, lateral-torsional) keep the first-order actions: their elastic
critical values are load factors on the combination as it is.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property
from typing import Any, Sequence

import numpy as np

from sizer.analysis import MemberSolution
from sizer.checks.results import ZERO_ACTION, CheckResult
from sizer.design import Design
from sizer.phrase import phrase, q

MY, MZ = 4, 5


@dataclass
class SecondOrderActions:
    """The second-order actions of every combination at the check stations, member axes."""

    stations: np.ndarray  # (S,) m
    first: np.ndarray  # (C, S, 6) first-order actions
    actions: np.ndarray  # (C, S, 6) second-order actions (first order where beyond buckling)
    warping: np.ndarray  # (C, S, 2) increments of the bimoment B (N*m^2) and the warping torque Tw (N*m)
    names: tuple[str, ...]
    responses: list  # sizer.stability.second_order.LoadSetResponse per combination
    elements: int  # elements per member length of the converged mesh
    bow: float  # m, initial bow (0: none)

    @cached_property
    def amplification(self) -> list[float | None]:
        """Each combination's second-order peak moment / first-order peak moment (None: no
        first-order moment, or beyond buckling)."""
        out: list[float | None] = []
        for c, response in enumerate(self.responses):
            first, second = peak_moment(self.first[c]), peak_moment(self.actions[c])
            out.append(None if response.beyond or first <= ZERO_ACTION else second / first)
        return out

    @property
    def beyond(self) -> list[tuple[str, float | None]]:
        """(combination, lowest load factor) of each combination at or beyond its elastic buckling load."""
        return [(name, response.load_factor) for name, response in zip(self.names, self.responses) if response.beyond]

    def displacement_increments(self, names: Sequence[str], xs: np.ndarray) -> np.ndarray:
        """(len(names), n, 6) second-order increments of the displacements at xs (m) of the named combinations."""
        index = {name: c for c, name in enumerate(self.names)}
        return np.stack([self.responses[index[name]].displacements(np.asarray(xs, float)) for name in names]) if names else np.zeros((0, len(xs), 6))

    def at(self, combination: str, x: float) -> tuple[float, float, float | None]:
        """(first-order resultant moment, second-order resultant moment, the combination's
        amplification) at the station nearest x (m) in `combination`."""
        c = self.names.index(combination)
        return (float(np.hypot(*self.first[c, self._station(x), MY:MZ + 1])), float(np.hypot(*self.actions[c, self._station(x), MY:MZ + 1])),
                self.amplification[c])

    def _station(self, x: float) -> int:
        return int(np.argmin(np.abs(self.stations - x)))


def peak_moment(actions: np.ndarray) -> float:
    """Largest resultant bending moment sqrt(My^2 + Mz^2) over stations of (S, 6) actions (N*m)."""
    return float(np.hypot(actions[:, MY], actions[:, MZ]).max(initial=0.0))


def second_order_actions(design: Design, xs: np.ndarray, sides: np.ndarray, first: np.ndarray) -> SecondOrderActions | None:
    """The second-order actions of the design's combinations at the check stations (None when the
    member file turns second order off); `first` (C, S, 6) the first-order actions there, member axes."""
    settings = design.member.checks
    if not settings.second_order:
        return None
    from sizer.checks.torsion import member_axes_offset, warping_rigidity
    from sizer.stability import stability_section
    from sizer.stability.second_order import SecondOrder

    section = stability_section(design.props, design.known_material.elastic_modulus, design.known_material.shear_modulus)
    bow = settings.bow(design.member.length)
    mass = (design.mass_per_length or 0.0) if design.member.self_weight_case else 0.0
    solver = SecondOrder(design.member, design.solution, section, bow, mass, member_axes_offset(design))
    right = np.asarray(sides) == "right"
    responses = solver.responses(xs, right, first)
    actions = first.copy()
    warping = np.zeros(first.shape[:2] + (2,))
    for c, response in enumerate(responses):
        actions[c, :, :6] += response.actions(xs, right)
        if warping_rigidity(design):  # else uniform torsion, as the first-order twist solve takes it
            warping[c] += response.warping(xs, right)
    return SecondOrderActions(np.asarray(xs, float), first, actions, warping, design.solution.combination_names, responses,
                              solver.elements, bow)


def second_order_check(found: SecondOrderActions | None) -> CheckResult:
    """Fails where a combination is at or beyond its elastic buckling load (no second-order
    equilibrium): utilization 1 / load factor (reported as failing even at exactly 1)."""
    if found is None:
        return CheckResult("second-order", None, quantity="ratio", detail="second_order = false in [checks]: first-order actions")
    beyond = found.beyond
    if not beyond:
        amplification = [(a, name) for a, name in zip(found.amplification, found.names) if a is not None]
        if not amplification:
            return CheckResult("second-order", None, quantity="ratio", detail="every combination below its elastic buckling load; no bending moment to amplify")
        largest, name = max(amplification)
        return CheckResult("second-order", None, quantity="ratio", detail=f"every combination below its elastic buckling load; "
                           f"largest amplification {largest:.3f}, combination {name}", extra={"amplification": largest})
    name, factor = min(beyond, key=lambda item: item[1] if item[1] is not None and math.isfinite(item[1]) else math.inf)
    utilization = max(1.0 / factor, math.nextafter(1.0, 2.0)) if factor is not None and 0.0 < factor < math.inf else math.nextafter(1.0, 2.0)
    detail = (f"combination {name} is at or beyond its elastic buckling load (load factor {factor:.3g} on its axial force and "
              "moments together): no second-order equilibrium") if factor is not None else f"combination {name} is at or beyond its elastic buckling load"
    return CheckResult("second-order", utilization, utilization, 1.0, None, name, quantity="ratio", detail=detail,
                       extra={"load_factor": factor})


AMPLIFIED = ("bending", "interaction", "shear", "equivalent", "local")


def with_amplification(checks: list[CheckResult], found: SecondOrderActions, design: Design) -> list[CheckResult]:
    """The checks with, on each stress check made on second-order actions, the first-order and
    second-order resultant moment at its governing station and its combination's amplification
    (extra "first_order_moment", "moment", "amplification"); on the deflection check, where it
    governs, the first-order value of its worst span ("first_order")."""
    from dataclasses import replace

    from sizer.checks.deflection import deflection_check

    made = [result for result in checks if result.made]
    governing = max(made, key=lambda r: r.made_utilization) if made else None
    first_deflection = deflection_check(design) if governing is not None and governing.check == "deflection" else None
    out = []
    for result in checks:
        if result.made and result.check in AMPLIFIED and result.combination is not None and result.at is not None:
            first, second, amplification = found.at(result.combination, result.at)
            result = replace(result, extra={**result.extra, "first_order_moment": first, "moment": second, "amplification": amplification})
        elif result is governing and first_deflection is not None and first_deflection.made:
            result = replace(result, extra={**result.extra, "first_order": first_deflection.demand})
        out.append(result)
    return out


def second_order_notes(design: Design, found: SecondOrderActions | None) -> list[str]:
    """The assumptions of the second-order solve, in words."""
    if found is None:
        return ["Second order: off (second_order = false in [checks]): moments, shears and deflections are first order; "
                "the interaction and the stability checks alone cover the axial force's effect."]
    if found.elements == 0:
        return ["Second order: no combination has an axial force, a sideways load, a torque or a bow, so the first-order "
                "actions are the second-order ones (the major-axis moment's geometric terms act on sideways bending and twist "
                "only, which nothing drives)."]
    bow = phrase("an initial bow of ", q("bow", found.bow, "mm", ".3g"), f" ({_bow_text(design)}) in each combination's lowest buckling mode, "
                 "on the side the loads push") if found.bow > 0 else "no initial bow (imperfection not given)"
    return [phrase("Second order: each combination solved with the member's geometric stiffness (its axial force in both bending "
                   f"planes, its moments coupling sideways bending and twist, the loads' heights) on {found.elements} thin-walled beam "
                   "elements per member length, ", bow, "; the increment over first order is added to the exact first-order actions; "
                   "tension lowers the moments. Bending, interaction, shear, equivalent, local and deflection checks use these actions; "
                   "the buckling and lateral-torsional checks use the first-order actions (their load factors scale the combination as "
                   "it is). Twist: the increments of the torque, the warping torque and the bimoment join the first-order ones in the "
                   "stress field; loads across the section add their torques to the solve.")]


def _bow_text(design: Design) -> str:
    settings = design.member.checks
    if settings.imperfection_ratio is not None:
        return f"L/{1.0 / settings.imperfection_ratio:g}"
    return "as given"


class SecondOrderSolution(MemberSolution):
    """A MemberSolution whose combinations' actions and displacements are second order: for
    diagrams, cuts, extremes and the record. Load sets that are not one of its combinations (single
    cases, unit loads) stay first order; so do the reactions."""

    def __init__(self, solution: MemberSolution, found: SecondOrderActions) -> None:
        self.__dict__.update(solution.__dict__)
        self.first_order, self.found = solution, found

    def _combinations_of(self, weights: np.ndarray) -> list[int | None]:
        table = self.first_order.weights()
        return [next((c for c in range(len(table)) if np.array_equal(row, table[c])), None) for row in np.atleast_2d(weights)]

    def weighted_actions(self, weights: np.ndarray, x: Any, side: Any = "right") -> np.ndarray:
        return self._with_increments(self.first_order.weighted_actions(weights, x, side), weights, x, side, "actions")

    def weighted_displacements(self, weights: np.ndarray, x: Any, side: Any = "right") -> np.ndarray:
        return self._with_increments(self.first_order.weighted_displacements(weights, x, side), weights, x, side, "displacements")

    def _with_increments(self, out: np.ndarray, weights: np.ndarray, x: Any, side: Any, kind: str) -> np.ndarray:
        """First-order `out` (rows of `weights`) plus each combination row's second-order increment
        of `kind` ("actions" or "displacements"); rows that are no combination stay first order."""
        xs, right = self._stations(x, side)
        for k, c in enumerate(self._combinations_of(weights)):
            if c is not None:
                out[k, :, :6] += getattr(self.found.responses[c], kind)(xs, right)
        return out


def displayed_design(design: Design, found: SecondOrderActions | None) -> Design:
    """The design as the outputs show it: with second-order actions and displacements where the
    checks used them (diagrams, cuts and the record agree with the checks)."""
    if found is None:
        return design
    from dataclasses import replace

    return replace(design, solution=SecondOrderSolution(design.solution, found))
