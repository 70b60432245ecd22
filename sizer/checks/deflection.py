"""Deflection: spans between transverse supports and overhangs beyond the outer ones, the largest
deflection of each relative to its supports (m), against span / limit. Every limit given is
checked: `deflection_limit` on spans (and, halved, on overhangs unless they have their own),
`deflection_limit_overhang` on overhangs, also when it is the only one.

Small-deflection theory: `large_deflection` finds a span whose deflection exceeds
SMALL_DEFLECTION_FRACTION of its length, where the results no longer hold (outputs say so).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable

import numpy as np

from sizer.analysis import MemberSolution
from sizer.checks.results import CheckResult
from sizer.design import Design
from sizer.model import CheckSettings, Member

SMALL_DEFLECTION_FRACTION = 1 / 50  # deflection / span beyond which small-deflection theory is not trusted


@dataclass(frozen=True)
class Span:
    """A span between two transverse supports, or an overhang beyond the outer one (m)."""

    start: float
    end: float
    overhang: bool
    base: float | None = None  # for an overhang: the support it hangs from

    @property
    def length(self) -> float:
        return self.end - self.start


def spans(member: Member) -> list[Span]:
    """Spans between supports that hold (or spring) uy or uz, and overhangs beyond the outer ones."""
    held = sorted({s.at for s in member.supports if {"uy", "uz"} & (set(s.restrain) | set(s.springs))})
    if not held:
        return []
    found = [Span(a, b, False) for a, b in zip(held, held[1:]) if b > a]
    if held[0] > 0:
        found.insert(0, Span(0.0, held[0], True, held[0]))
    if held[-1] < member.length:
        found.append(Span(held[-1], member.length, True, held[-1]))
    return found


def relative_to_supports(moved: np.ndarray, span: Span) -> np.ndarray:
    """(c, n, 2) transverse displacements at n points evenly spaced over the span, relative to its
    supports: the chord between the span's ends, or, for an overhang, its base support. `moved` is
    (c, n + 1, 2): the n points, then the displacement at the base (overhang) or start (span)."""
    body = moved[:, :-1]
    if span.overhang:
        return body - moved[:, -1:]
    t = np.linspace(0.0, 1.0, body.shape[1])[None, :, None]
    return body - ((1 - t) * body[:, :1] + t * body[:, -1:])


def span_points(span: Span, n: int = 201) -> np.ndarray:
    """n points evenly over the span, then its reference point: the overhang's base support, or the
    span's start (see relative_to_supports)."""
    return np.append(np.linspace(span.start, span.end, n), span.base if span.overhang else span.start)


def deflection_limits(settings: CheckSettings) -> tuple[float | None, float | None]:
    """(span limit, overhang limit): the deflection allowed is length / limit; None where no limit
    applies. Overhangs default to half the span limit."""
    span = settings.deflection_limit
    overhang = settings.deflection_limit_overhang or (span / 2 if span is not None else None)
    return span, overhang


def limited_spans(member: Member) -> list[tuple[Span, float]]:
    """Each span and overhang that has a deflection limit, with that limit (length / limit)."""
    span_limit, overhang_limit = deflection_limits(member.checks)
    found = []
    for span in spans(member):
        limit = overhang_limit if span.overhang else span_limit
        if limit is not None:
            found.append((span, limit))
    return found


def span_deflections(design: Design, span_list: list[Span], combinations: Iterable[str], n: int = 201) -> list[tuple[float, float, str]]:
    """For each span: the largest transverse deflection (m) relative to its supports (chord between
    them; for an overhang, relative to its support's displacement), with x and combination. One
    displacement evaluation for all spans."""
    return solution_span_deflections(design.solution, span_list, combinations, n)


def solution_span_deflections(solution: MemberSolution, span_list: list[Span], combinations: Iterable[str],
                              n: int = 201) -> list[tuple[float, float, str]]:
    """span_deflections of a solved member (with displacements)."""
    names = list(combinations)
    points = [span_points(span, n) for span in span_list]
    moved = solution.weighted_displacements(solution.combination_weights(names), np.concatenate(points))[..., 1:3]  # (c, spans x (n + 1), 2): uy, uz
    found = []
    for span, xs, part in zip(span_list, points, np.split(moved, len(span_list), axis=1)):
        relative = relative_to_supports(part, span)
        size = np.hypot(relative[..., 0], relative[..., 1])
        c, k = np.unravel_index(int(np.argmax(size)), size.shape)
        found.append((float(size[c, k]), float(xs[k]), names[c]))
    return found


def deflection_check(design: Design) -> CheckResult:
    """Peak deflection of each span with a limit against span / limit (overhangs: overhang /
    overhang limit)."""
    settings = design.member.checks
    if settings.deflection_limit is None and settings.deflection_limit_overhang is None:
        return CheckResult("deflection", None, quantity="deflection", detail="no deflection_limit in [checks]")
    combinations = settings.deflection_combinations or design.solution.combination_names
    pairs = limited_spans(design.member)
    if not pairs:
        return CheckResult("deflection", None, quantity="deflection", detail="no overhang for deflection_limit_overhang, "
                           "and no deflection_limit for the spans")
    span_list = [span for span, _ in pairs]
    results = []
    for (span, limit), (value, at, name) in zip(pairs, span_deflections(design, span_list, combinations)):
        allowable = span.length / limit
        label = f"{'overhang' if span.overhang else 'span'} {span.start:g}–{span.end:g} m, limit L/{limit:g}"
        results.append(CheckResult("deflection", value / allowable, value, allowable, at, name, quantity="deflection", detail=label))
    return max(results, key=lambda r: r.utilization)


def large_deflection(solution: MemberSolution) -> tuple[Span, float, float, str] | None:
    """The span (or overhang) whose largest deflection relative to its supports is the largest
    fraction of its length, with that deflection (m), x and combination, when the fraction exceeds
    SMALL_DEFLECTION_FRACTION; None otherwise or without displacements (no section)."""
    span_list = spans(solution.member)
    if not solution.has_displacements or not span_list:
        return None
    found = solution_span_deflections(solution, span_list, solution.combination_names)
    ratio, index = max((value / span.length, i) for i, (span, (value, _, _)) in enumerate(zip(span_list, found)))
    if ratio <= SMALL_DEFLECTION_FRACTION:
        return None
    return (span_list[index], *found[index])
