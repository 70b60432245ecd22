"""Deflection: spans between transverse supports and overhangs beyond the outer ones, the largest
deflection of each relative to its supports (m), against span / limit.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable

import numpy as np

from sizer.checks.results import CheckResult
from sizer.design import Design
from sizer.model import Member


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


def span_deflections(design: Design, span_list: list[Span], combinations: Iterable[str], n: int = 201) -> list[tuple[float, float, str]]:
    """For each span: the largest transverse deflection (m) relative to its supports (chord between
    them; for an overhang, relative to its support's displacement), with x and combination. One
    displacement evaluation for all spans."""
    names = list(combinations)
    points = [span_points(span, n) for span in span_list]
    moved = design.solution.weighted_displacements(design.solution.combination_weights(names), np.concatenate(points))[..., 1:3]  # (c, spans x (n + 1), 2): uy, uz
    found = []
    for span, xs, part in zip(span_list, points, np.split(moved, len(span_list), axis=1)):
        relative = relative_to_supports(part, span)
        size = np.hypot(relative[..., 0], relative[..., 1])
        c, k = np.unravel_index(int(np.argmax(size)), size.shape)
        found.append((float(size[c, k]), float(xs[k]), names[c]))
    return found


def deflection_check(design: Design) -> CheckResult:
    """Peak deflection of each span against span / limit (overhangs: overhang / overhang limit)."""
    settings = design.member.checks
    if settings.deflection_limit is None:
        return CheckResult("deflection", None, quantity="deflection", detail="no deflection_limit in [checks]")
    combinations = settings.deflection_combinations or design.solution.combination_names
    overhang_limit = settings.deflection_limit_overhang or settings.deflection_limit / 2
    span_list = spans(design.member)
    if not span_list:
        return CheckResult("deflection", None, quantity="deflection", detail="no support holds a transverse movement")
    results = []
    for span, (value, at, name) in zip(span_list, span_deflections(design, span_list, combinations)):
        limit = overhang_limit if span.overhang else settings.deflection_limit
        allowable = span.length / limit
        label = f"{'overhang' if span.overhang else 'span'} {span.start:g}–{span.end:g} m, limit L/{limit:g}"
        results.append(CheckResult("deflection", value / allowable, value, allowable, at, name, quantity="deflection", detail=label))
    return max(results, key=lambda r: r.utilization)
