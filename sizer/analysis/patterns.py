"""Pattern loading (`pattern = true` on a load): every arrangement of loaded and unloaded spans is a
combination of its own, made by superposition of one solve per span.

Spans: the stretches between the supports that hold (rigidly or by a spring) uy or uz; the part
beyond the outer such support at either end (an overhang) is a span too. They are numbered from 1
at end A.

Per-span load cases: a patterned load is split into its part on each span: a line load clipped to
the span (its intensity at the span's ends read off its linear variation); a point load or moment
belongs to the span it is on (exactly on a support: the span to its right; at end B: the last
span). The parts of one case on span k form the load case "<case> @ span k", so n spans cost n
solves, however many arrangements there are.

Arrangements: a combination that uses a case with patterned loads (a factor other than zero)
becomes one combination per arrangement of that case: each subset of the spans its patterned loads
reach, all loaded first, then fewer and fewer, and last the empty one: the case absent everywhere
is an arrangement too (a load on an overhang relieves the back span; without it the back span sags
most). The patterned loads of one case switch together; a case's unpatterned loads stay in every
arrangement. Two patterned cases in one combination: every pair of arrangements (2^n x 2^m), and
so on. Each arrangement keeps the combination's factors and is named by it in words:
"dead + imposed (imposed on spans 1 and 3)". A combination that uses no patterned case keeps its
name. At most MAX_ARRANGEMENTS arrangements per combination; beyond that the input is refused.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from itertools import combinations as subsets_of_size
from itertools import product
from typing import Sequence

from sizer.analysis.layout import position_tolerance
from sizer.errors import InputError
from sizer.model import CheckSettings, LineLoad, Load, Member, Patterning, PointLoad, Pressure

MAX_ARRANGEMENTS = 4096  # per combination (docs/member-file.md)
PART_MARK = " @ span "  # "<case> @ span <k>": the part of a patterned case on span k


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
    """Spans between supports that hold (or spring) uy or uz, and overhangs beyond the outer ones,
    from end A; none when no support holds uy or uz."""
    held = sorted({s.at for s in member.supports if {"uy", "uz"} & (set(s.restrain) | set(s.springs))})
    if not held:
        return []
    found = [Span(a, b, False) for a, b in zip(held, held[1:]) if b > a]
    if held[0] > 0:
        found.insert(0, Span(0.0, held[0], True, held[0]))
    if held[-1] < member.length:
        found.append(Span(held[-1], member.length, True, held[-1]))
    return found


def pattern_spans(member: Member) -> list[Span]:
    """The spans loads are patterned over: `spans`, merged across supports closer than the position
    tolerance; the whole member when no support holds uy or uz."""
    tol = position_tolerance(member)
    found = [span for span in spans(member) if span.length > tol]
    return found or [Span(0.0, member.length, False)]


def span_of(at: float, span_list: Sequence[Span], tol: float) -> int:
    """Index (from 0) of the span a point at `at` (m) belongs to: the one it is inside, the one to its
    right when it is on a support, the last one at end B."""
    for index, span in enumerate(span_list):
        if at < span.end - tol:
            return index
    return len(span_list) - 1


def clipped(load: LineLoad, start: float, end: float) -> LineLoad:
    """The part of a line load from `start` to `end` (m, inside the load), its intensities (and
    pressures) at the new ends read off its linear variation."""

    def at(values_start: tuple, values_end: tuple, x: float) -> tuple:
        t = (x - load.start) / (load.end - load.start)
        return tuple(a + (b - a) * t for a, b in zip(values_start, values_end))

    area = load.area
    if area is not None:
        area = Pressure(at(area.p_start, area.p_end, start), at(area.p_start, area.p_end, end), area.width)
    return replace(load, start=start, end=end, q_start=at(load.q_start, load.q_end, start), q_end=at(load.q_start, load.q_end, end), area=area)


def parts_by_span(load: Load, span_list: Sequence[Span], tol: float) -> list[tuple[int, Load]]:
    """(span number from 1, the load's part on that span) for each span the load reaches."""
    if isinstance(load, PointLoad):
        return [(span_of(load.at, span_list, tol) + 1, load)]
    found: list[tuple[int, Load]] = []
    for number, span in enumerate(span_list, start=1):
        start, end = max(load.start, span.start), min(load.end, span.end)
        if end - start > tol:
            found.append((number, clipped(load, start, end)))
    return found


def span_words(numbers: Sequence[int]) -> str:
    """"span 2", "spans 1 and 3", "spans 1, 2 and 4", "no span"."""
    if not numbers:
        return "no span"
    if len(numbers) == 1:
        return f"span {numbers[0]}"
    return "spans " + ", ".join(map(str, numbers[:-1])) + f" and {numbers[-1]}"


def case_arrangements(reached: Sequence[int]) -> list[tuple[int, ...]]:
    """The loaded spans of each arrangement of a case whose patterned loads reach `reached` spans:
    all of them first, then every smaller subset (in order), the empty one last."""
    sizes = range(len(reached), -1, -1)
    return [subset for size in sizes for subset in subsets_of_size(reached, size)]


def expand_patterns(member: Member) -> Member:
    """The member with its patterned loads split into per-span load cases and every combination
    that uses them made into one combination per arrangement (see the module docstring); the
    member itself when it has no patterned load or is expanded already. InputError when a
    combination would have more than MAX_ARRANGEMENTS arrangements, or a name made here is taken."""
    if member.patterning is not None or not any(load.pattern for load in member.loads):
        return member
    span_list, tol = pattern_spans(member), position_tolerance(member)
    loads: list[Load] = []
    reached: dict[str, set[int]] = {}
    for load in member.loads:
        if not load.pattern:
            loads.append(load)
            continue
        for number, part in parts_by_span(load, span_list, tol):
            loads.append(replace(part, case=f"{load.case}{PART_MARK}{number}"))
            reached.setdefault(load.case, set()).add(number)
    _refuse_taken_case_names(member, loads)
    choices = {case: case_arrangements(sorted(numbers)) for case, numbers in reached.items()}
    combinations: dict[str, dict[str, float]] = {}
    origins: dict[str, str] = {}
    for name, factors in member.combinations.items():
        for arranged, arranged_factors in _arrangements(member, name, factors, choices):
            if arranged in combinations:
                raise InputError(member.source, _combination_key(member, name), f"two combinations would be named {arranged!r}",
                                 "rename the combination, so that its pattern arrangements get names of their own")
            combinations[arranged], origins[arranged] = arranged_factors, name
    patterning = Patterning(member.loads, member.combinations, tuple((s.start, s.end) for s in span_list), origins)
    return replace(member, loads=tuple(loads), combinations=combinations, patterning=patterning, checks=_named_deflection_combinations(member))


def _arrangements(member: Member, name: str, factors: dict[str, float], choices: dict[str, list[tuple[int, ...]]]) -> list[tuple[str, dict[str, float]]]:
    """(name, factors) of each arrangement of one combination: its patterned cases' arrangements
    taken together."""
    used = [case for case in choices if factors.get(case, 0.0) != 0.0]
    count = 1
    for case in used:
        count *= len(choices[case])
    if count > MAX_ARRANGEMENTS:
        sizes = " x ".join(str(len(choices[case])) for case in used)
        raise InputError(member.source, _combination_key(member, name),
                         f"combination {name!r} would be checked in {count} pattern arrangements ({sizes}), more than the {MAX_ARRANGEMENTS} sizer allows",
                         "pattern fewer spans (pattern = true on loads over fewer spans), or split a patterned case into cases of a few spans each")
    found = []
    for picked in product(*(choices[case] for case in used)):
        arranged = dict(factors)
        words = []
        for case, loaded in zip(used, picked):
            arranged.update({f"{case}{PART_MARK}{number}": factors[case] for number in loaded})
            if len(choices[case]) > 1:
                words.append(f"{case} on {span_words(loaded)}")
        found.append((f"{name} ({'; '.join(words)})" if words else name, arranged))
    return found


def _combination_key(member: Member, name: str) -> str:
    return f'combinations."{name}"' if member.combinations_given else "loads"


def _refuse_taken_case_names(member: Member, loads: list[Load]) -> None:
    """InputError when a per-span case name made here is already the name of a case of the file."""
    given = set(member.cases) | {case for factors in member.combinations.values() for case in factors}
    for load in loads:
        if load.pattern and load.case in given:
            raise InputError(member.source, "loads", f"the case name {load.case!r} is needed for a part of a patterned load",
                             f"rename that case (names with '{PART_MARK.strip()}' are kept for pattern loading)")


def _named_deflection_combinations(member: Member) -> CheckSettings:
    """The member's check settings with the single keys' deflection combinations written out as the
    given combinations (each applies to all its arrangements) when the file left them to default."""
    settings = member.checks
    if settings.deflection_combinations is None and (settings.deflection_limit is not None or settings.deflection_limit_overhang is not None):
        return replace(settings, deflection_combinations=tuple(member.combinations))
    return settings


def arrangements_of(member: Member, given: Sequence[str] | None) -> tuple[str, ...]:
    """The combinations of `member` (expanded or not) that come from the given combinations named
    in `given` (None: every combination), in the member's order."""
    if given is None:
        return tuple(member.combinations)
    wanted = set(given)
    return tuple(name for name in member.combinations if member.origin(name) in wanted)


def pattern_notes(member: Member) -> list[str]:
    """The assumptions of pattern loading, for the outputs (none without patterned loads)."""
    patterning = member.patterning
    if patterning is None:
        return []
    numbered = "; ".join(f"{k}: {a:g}–{b:g} m" for k, (a, b) in enumerate(patterning.spans, start=1))
    counts: dict[str, int] = {}
    for name in member.combinations:
        origin = member.origin(name)
        counts[origin] = counts.get(origin, 0) + 1
    expanded = ", ".join(f"'{name}' in {count} arrangements" for name, count in counts.items() if count > 1) or "none"
    cases = sorted({load.case for load in patterning.loads if load.pattern})
    return [f"Pattern loading of case{'s' if len(cases) > 1 else ''} {', '.join(repr(c) for c in cases)}: spans (overhangs count) {numbered}. "
            "Each patterned load is split by span and each span solved once; every arrangement of loaded and unloaded spans "
            "is a combination of its own, with the same factors (unpatterned loads of a case stay in every arrangement; "
            f"self-weight is never patterned). Arrangements checked: {expanded}."]
