"""Deflection: spans between transverse supports and overhangs beyond the outer ones (see
analysis.patterns.spans), the largest deflection of each (m) against span / limit.

Every limit given is checked: each `[[checks.deflection]]` entry, and the single keys as one more
entry (`deflection_limit` on spans and, halved, on overhangs unless `deflection_limit_overhang`
gives their own; `deflection_limit_overhang` alone checks the overhangs only). An entry applies to
the combinations it names (each with all its pattern arrangements) or to every combination; its
deflection is measured from the chord between the span's supports (for an overhang, from its
support's displacement) or, with relative_to_supports = false, from the original position. The
check reports the worst span of the worst entry and names that entry.

Small-deflection theory: `large_deflection` finds a span whose deflection exceeds
SMALL_DEFLECTION_FRACTION of its length, where the results no longer hold (outputs say so).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Iterable
from weakref import WeakKeyDictionary

import numpy as np

from sizer.analysis import MemberSolution, distinct, segment_ends
from sizer.analysis.patterns import Span, arrangements_of, spans
from sizer.checks.results import CheckResult
from sizer.design import Design
from sizer.model import CheckSettings, DeflectionLimit, Member
from sizer.phrase import phrase, q

if TYPE_CHECKING:
    from sizer.checks.second_order import SecondOrderActions

SMALL_DEFLECTION_FRACTION = 1 / 50  # deflection / span beyond which small-deflection theory is not trusted
PIECE_POINTS = 13  # per piece between concentrated items: the squared deflection there has degree <= 10
PEAK_GRID = 65  # grid on each piece where its largest value is first looked for
NEWTON_STEPS = 6  # polishing steps from the grid's best point
DEFLECTION_CHUNK = 512  # combinations at a time (bounds the memory of many pattern arrangements)

__all__ = ["SMALL_DEFLECTION_FRACTION", "Span", "deflection_check", "deflection_limits", "deflection_notes", "large_deflection",
           "limit_entries", "limited_spans", "relative_to_supports", "solution_span_deflections", "span_deflections", "span_points", "spans"]


def relative_to_supports(moved: np.ndarray, span: Span) -> np.ndarray:
    """(c, n, 2) transverse displacements at n points evenly spaced over the span, relative to its
    supports: the chord between the span's ends, or, for an overhang, its base support. `moved` is
    (c, n + 1, 2): the n points, then the displacement at the base (overhang) or start (span)."""
    body = moved[:, :-1]
    if span.overhang:
        return body - moved[:, -1:]
    t = np.linspace(0.0, 1.0, body.shape[1])[None, :, None]
    return body - ((1 - t) * body[:, :1] + t * body[:, -1:])


def measured(moved: np.ndarray, span: Span, relative: bool) -> np.ndarray:
    """(c, n, 2) the deflections an entry limits: relative_to_supports, or the displacements at the
    n points themselves (from the original position)."""
    return relative_to_supports(moved, span) if relative else moved[:, :-1]


def span_points(span: Span, n: int = 201) -> np.ndarray:
    """n points evenly over the span, then its reference point: the overhang's base support, or the
    span's start (see relative_to_supports)."""
    return np.append(np.linspace(span.start, span.end, n), span.base if span.overhang and span.base is not None else span.start)


def deflection_limits(settings: CheckSettings) -> tuple[float | None, float | None]:
    """(span limit, overhang limit) of the single keys (deflection_limit, deflection_limit_overhang):
    length / limit is allowed; None where they set no limit. Overhangs default to half the span
    limit. The [[checks.deflection]] entries are in limit_entries."""
    span = settings.deflection_limit
    overhang = settings.deflection_limit_overhang or (span / 2 if span is not None else None)
    return span, overhang


def limit_entries(settings: CheckSettings) -> tuple[DeflectionLimit, ...]:
    """Every deflection limit of the member: the [[checks.deflection]] entries, then the single keys
    as one entry."""
    span, overhang = deflection_limits(settings)
    single = (DeflectionLimit(span, overhang, settings.deflection_combinations, True),) if overhang is not None else ()
    return tuple(settings.deflection) + single


def limited_spans(member: Member, entry: DeflectionLimit) -> list[tuple[Span, float]]:
    """Each span and overhang that `entry` limits, with its limit (length / limit allowed)."""
    found = []
    for span in spans(member):
        limit = entry.overhang_limit if span.overhang else entry.limit
        if limit is not None:
            found.append((span, limit))
    return found


def entry_text(entry: DeflectionLimit) -> str:
    """An entry in words: "span/360, overhang/180, relative to the supports, in every combination"."""
    parts = [f"span/{entry.limit:g}" if entry.limit is not None else "spans not limited",
             f"overhang/{entry.overhang_limit:g}" if entry.overhang_limit is not None else "overhangs not limited",
             "relative to the supports" if entry.relative_to_supports else "from the original position"]
    chosen = ", ".join(f"'{name}'" for name in entry.combinations) if entry.combinations else "every combination"
    return ", ".join(parts) + f", in {chosen}"


def deflection_notes(member: Member) -> list[str]:
    """The deflection limits in words, one note for all of them (none when no limit is given)."""
    entries = limit_entries(member.checks)
    if not entries:
        return []
    if len(entries) == 1:
        return [f"Deflection limit: {entry_text(entries[0])}; each combination's pattern arrangements included."]
    listed = "; ".join(f"({k}) {entry_text(entry)}" for k, entry in enumerate(entries, start=1))
    return [f"Deflection limits, each checked: {listed}; each combination's pattern arrangements included."]


def span_deflections(design: Design, span_list: list[Span], combinations: Iterable[str], n: int = 201,
                     relative: bool = True, second_order: SecondOrderActions | None = None) -> list[tuple[float, float, str]]:
    """For each span: the largest transverse deflection (m) relative to its supports (chord between
    them; for an overhang, relative to its support's displacement; `relative` False: from the
    original position), with x and combination. One displacement evaluation for all spans.
    `second_order`: a checks.second_order.SecondOrderActions whose displacement increments are added."""
    return solution_span_deflections(design.solution, span_list, combinations, n, relative, second_order)


def solution_span_deflections(solution: MemberSolution, span_list: list[Span], combinations: Iterable[str],
                              n: int = 201, relative: bool = True, second_order: SecondOrderActions | None = None) -> list[tuple[float, float, str]]:
    """span_deflections of a solved member (with displacements): the exact largest of each span
    (see span_peak), each span's found once per solution, combinations and reference (the check
    and the small-deflection caution ask for the same); `n` is kept for callers and not used.
    With `second_order` (a checks.second_order.SecondOrderActions), see second_order_deflections."""
    names = tuple(combinations)
    if second_order is not None:
        first = solution_span_deflections(solution, span_list, names, n, relative)
        return second_order_deflections(solution, span_list, names, n, relative, second_order, first)
    known = _PEAKS.setdefault(solution, {})
    wanted = [span for span in span_list if (span, names, relative) not in known]
    found = [(-1.0, 0.0, 0)] * len(wanted)
    for start in range(0, len(names), DEFLECTION_CHUNK):
        rows = solution.combination_weights(names[start:start + DEFLECTION_CHUNK])
        for index, span in enumerate(wanted):
            value, at, row = span_peak(solution, span, rows, relative)
            if value > found[index][0]:
                found[index] = (value, at, start + row)
    for span, (value, at, row) in zip(wanted, found):
        known[(span, names, relative)] = (value, at, names[row])
    return [known[(span, names, relative)] for span in span_list]


def second_order_deflections(solution: MemberSolution, span_list: list[Span], names: tuple[str, ...], n: int, relative: bool,
                             second_order: SecondOrderActions, first: list[tuple[float, float, str]]) -> list[tuple[float, float, str]]:
    """For each span, the largest deflection (m) with the second-order increments, x and combination:
    on n points evenly over the span and at the first-order peak (`first`, from
    solution_span_deflections): the increments are piecewise cubic on the second-order mesh, not
    the polynomial that span_peak finds exactly."""
    found = []
    for span, (_, peak_at, _) in zip(span_list, first):
        xs = distinct(np.append(np.linspace(span.start, span.end, n), peak_at))
        reference = np.array([span.base] if span.overhang else [span.start, span.end])
        points = np.concatenate([xs, reference])
        moved = solution.weighted_displacements(solution.combination_weights(names), points)[..., 1:3]
        moved = moved + second_order.displacement_increments(names, points)[..., 1:3]
        body = span_body(moved, xs, span, relative)
        size = np.hypot(body[..., 0], body[..., 1])
        c, k = np.unravel_index(int(np.argmax(size)), size.shape)
        found.append((float(size[c, k]), float(xs[k]), names[c]))
    return found


_PEAKS: "WeakKeyDictionary[MemberSolution, dict]" = WeakKeyDictionary()  # solution -> (span, combinations, relative) -> peak


def span_body(moved: np.ndarray, xs: np.ndarray, span: Span, relative: bool) -> np.ndarray:
    """(C, len(xs), 2) displacements uy, uz (m) at `xs` from `moved` (C, len(xs) + references, 2):
    relative to the supports where `relative` (an overhang to its base, a span to the chord between
    its ends, the references last in `moved`), else as they are."""
    body = moved[:, :xs.size]
    if relative and span.overhang:
        return body - moved[:, -1:]
    if relative:
        along = ((xs - span.start) / span.length)[None, :, None]
        return body - ((1 - along) * moved[:, -2:-1] + along * moved[:, -1:])
    return body


def span_peak(solution: MemberSolution, span: Span, weights: np.ndarray, relative: bool) -> tuple[float, float, int]:
    """(largest deflection (m), x (m), row of `weights`) over one span, found exactly: between
    neighbouring concentrated items (supports, hinges, point loads, line-load ends) the squared
    deflection is one polynomial of degree at most 10 in x (Euler-Bernoulli, linearly varying loads:
    each displacement of degree 5, less a straight chord), so its values at PIECE_POINTS Chebyshev
    points give it exactly; its maximum on each piece is searched on a fine grid and polished by
    Newton steps on the polynomial, and the ends of each piece (a hinge's kink) are candidates."""
    from numpy.polynomial import chebyshev

    ends = segment_ends(solution.member)
    inside = ends[(ends > span.start) & (ends < span.end)]
    edges = np.concatenate([[span.start], inside, [span.end]])
    lo, hi = edges[:-1], edges[1:]
    t = -np.cos(np.pi * np.arange(PIECE_POINTS) / (PIECE_POINTS - 1))  # Chebyshev points on [-1, 1], ends included
    xs = (lo[:, None] + (t[None, :] + 1) / 2 * (hi - lo)[:, None]).ravel()
    reference = [span.base] if span.overhang else [span.start, span.end]
    moved = solution.weighted_displacements(weights, np.concatenate([xs, reference]))[..., 1:3]  # (C, points + refs, 2)
    body = span_body(moved, xs, span, relative)
    squared = (body**2).sum(axis=2).reshape(len(weights), lo.size, PIECE_POINTS)  # (C, pieces, points)
    coef = chebyshev.chebfit(t, squared.reshape(-1, PIECE_POINTS).T, PIECE_POINTS - 1)  # (points, C x pieces)
    value, where = _polynomial_peaks(coef)
    best = int(np.argmax(value))
    row, piece = divmod(best, lo.size)
    at = lo[piece] + (where[best] + 1) / 2 * (hi[piece] - lo[piece])
    return float(np.sqrt(max(value[best], 0.0))), float(at), row


def _polynomial_peaks(coef: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(largest value, t) on [-1, 1] of each Chebyshev series coef[:, k]: every local maximum of a
    fine grid (the ends included) polished by Newton steps on the derivative, each step kept only
    where it improves the value, then the best of them."""
    from numpy.polynomial import chebyshev

    grid = np.linspace(-1.0, 1.0, PEAK_GRID)
    values = chebyshev.chebval(grid, coef)  # (K, grid)
    padded = np.pad(values, ((0, 0), (1, 1)), constant_values=-np.inf)
    series, at = np.nonzero((values >= padded[:, :-2]) & (values >= padded[:, 2:]))  # each grid maximum
    best, where = values[series, at], grid[at]
    first, second = chebyshev.chebder(coef), chebyshev.chebder(coef, 2)
    step = 2.0 / (PEAK_GRID - 1)
    low, high = np.maximum(where - step, -1.0), np.minimum(where + step, 1.0)
    t = where.copy()
    for _ in range(NEWTON_STEPS):
        slope = chebyshev.chebval(t, first[:, series], tensor=False)
        curvature = chebyshev.chebval(t, second[:, series], tensor=False)
        t = np.clip(np.where(curvature < 0, t - slope / np.where(curvature < 0, curvature, -1.0), t), low, high)
        value = chebyshev.chebval(t, coef[:, series], tensor=False)
        better = value > best
        best, where = np.where(better, value, best), np.where(better, t, where)
    peak, place = np.full(coef.shape[1], -np.inf), np.zeros(coef.shape[1])
    order = np.lexsort((best, series))  # by series, its best candidate last
    last = np.r_[series[order][1:] != series[order][:-1], True]
    peak[series[order][last]], place[series[order][last]] = best[order][last], where[order][last]
    return peak, place


def entry_results(design: Design, entry: DeflectionLimit, label: str, second_order: SecondOrderActions | None = None) -> list[CheckResult]:
    """One result per span that `entry` limits (its combinations and their arrangements)."""
    pairs = limited_spans(design.member, entry)
    combinations = arrangements_of(design.solution.member, entry.combinations)
    if not pairs or not combinations:
        return []
    found = span_deflections(design, [span for span, _ in pairs], combinations, relative=entry.relative_to_supports, second_order=second_order)
    results = []
    for (span, limit), (value, at, name) in zip(pairs, found):
        allowable = span.length / limit
        where = "" if entry.relative_to_supports else ", from the original position"
        detail = phrase(f"{'overhang' if span.overhang else 'span'} ", q("span", (span.start, span.end), "m"), f", limit L/{limit:g}{where}", label)
        results.append(CheckResult("deflection", value / allowable, value, allowable, at, name, quantity="deflection", detail=detail,
                                   extra={"limit": limit}))
    return results


def deflection_check(design: Design, second_order: SecondOrderActions | None = None) -> CheckResult:
    """Peak deflection of each span with a limit against span / limit (overhangs: overhang /
    overhang limit), for every limit given; the worst, naming its limit. `second_order`: see
    span_deflections."""
    entries = limit_entries(design.member.checks)
    if not entries:
        return CheckResult("deflection", None, quantity="deflection", detail="no deflection limit in [checks]")
    results = []
    for index, entry in enumerate(entries, start=1):
        label = f" (limit {index} of {len(entries)}: {entry_text(entry)})" if len(entries) > 1 else ""
        results += entry_results(design, entry, label, second_order)
    if not results:
        return CheckResult("deflection", None, quantity="deflection", detail="the limits given are for overhangs only, and the member has none")
    return max(results, key=lambda r: r.made_utilization)


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
