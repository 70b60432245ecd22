"""Pattern loading (`pattern = true` on a load): every arrangement of loaded and unloaded spans is
checked, by superposition of one solve per span, without a combination per arrangement.

Spans: the stretches between the supports that hold (rigidly or by a spring) uy or uz; the part
beyond the outer such support at either end (an overhang) is a span too. They are numbered from 1
at end A.

Per-span load cases: a patterned load is split into its part on each span: a line load clipped to
the span (its intensity at the span's ends read off its linear variation); a point load or moment
belongs to the span it is on (exactly on a support: the span to its right; at end B: the last
span). The parts of one case on span k form the load case "<case> @ span k", so n spans cost n
solves, however many arrangements there are.

Switches and arrangements: in a combination that uses a case with patterned loads (a factor other
than zero), each part of that case on one span is a switch, on or off, with the case's factor; an
arrangement is any set of switches on (the patterned loads of one case on one span switch
together; a case's unpatterned loads stay in every arrangement), the empty one included (a load on
an overhang relieves the back span; without it the back span sags most). Two patterned cases in
one combination: every pair (2^n x 2^m arrangements). The arrangements are not listed: the
expanded member holds, for each such combination, a few arrangements as combinations of their own
(all switches on, none on, and those that the analysis and the checks find to govern some
quantity, analysis.superposition), each named in words: "dead + imposed (imposed on spans 1 and
3)". A combination that uses no patterned case keeps its name.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Iterable, Mapping, Sequence

from sizer.analysis.layout import position_tolerance
from sizer.errors import InputError
from sizer.model import CheckSettings, LineLoad, Load, Member, Patterning, PointLoad, Pressure
from sizer.phrase import joined, phrase, q

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


MAX_SWITCHES = 400  # per combination: patterned cases x spans (docs/member-file.md); the searches over arrangements grow with their square


def expand_patterns(member: Member) -> Member:
    """The member with its patterned loads split into per-span load cases and each combination that
    uses them given its switches and two arrangements, all on and none on (see the module
    docstring; more are added by with_arrangements); the member itself when it has no patterned
    load or is expanded already. InputError when a combination would have more than MAX_SWITCHES
    switches, or a name made here is taken."""
    if member.patterning is not None or not any(load.pattern for load in member.loads):
        return member
    span_list, tol = pattern_spans(member), position_tolerance(member)
    loads: list[Load] = []
    reached: dict[str, list[int]] = {}
    for load in member.loads:
        if not load.pattern:
            loads.append(load)
            continue
        for number, part in parts_by_span(load, span_list, tol):
            loads.append(replace(part, case=f"{load.case}{PART_MARK}{number}"))
            if number not in reached.setdefault(load.case, []):
                reached[load.case].append(number)
    _refuse_taken_case_names(member, loads)
    switches: dict[str, tuple[tuple[str, float], ...]] = {}
    for name, factors in member.combinations.items():
        found = tuple((f"{case}{PART_MARK}{number}", factors[case]) for case in reached if factors.get(case, 0.0) != 0.0
                      for number in sorted(reached[case]))
        if len(found) > MAX_SWITCHES:
            raise InputError(member.source, _combination_key(member, name),
                             f"combination {name!r} patterns {len(found)} case parts over the spans, more than the {MAX_SWITCHES} sizer handles",
                             "pattern fewer spans (pattern = true on loads over fewer spans), or fewer cases in one combination")
        if found:
            switches[name] = found
    patterning = Patterning(member.loads, member.combinations, tuple((s.start, s.end) for s in span_list), {}, switches)
    expanded = replace(member, loads=tuple(loads), combinations={}, patterning=patterning, checks=_named_deflection_combinations(member))
    first = {name: [frozenset(range(len(found))), frozenset()] for name, found in switches.items()}
    return with_arrangements(expanded, first)


def arrangement_name(member: Member, origin: str, loaded: frozenset[int]) -> str:
    """The name of the arrangement of given combination `origin` with the switches `loaded` on:
    "<origin> (imposed on spans 1 and 3; snow on no span)"."""
    assert member.patterning is not None
    switches = member.patterning.switches[origin]
    cases: dict[str, list[int]] = {}
    for index, (part, _) in enumerate(switches):
        case, number = part.rsplit(PART_MARK, 1)
        cases.setdefault(case, [])
        if index in loaded:
            cases[case].append(int(number))
    return f"{origin} ({'; '.join(f'{case} on {span_words(numbers)}' for case, numbers in cases.items())})"


def _order_key(member: Member, origin: str, loaded: frozenset[int]) -> tuple:
    """Arrangements of one combination in order: for each case in turn, more spans loaded first,
    then by the spans loaded (all on first, none on last)."""
    assert member.patterning is not None
    cases: dict[str, list[int]] = {}
    for index, (part, _) in enumerate(member.patterning.switches[origin]):
        cases.setdefault(part.rsplit(PART_MARK, 1)[0], []).append(index)
    return tuple(item for indices in cases.values() for item in (-len(loaded.intersection(indices)), tuple(sorted(loaded.intersection(indices)))))


def with_arrangements(member: Member, added: Mapping[str, Iterable[frozenset[int]]]) -> Member:
    """The expanded member with the arrangements `added` (given combination -> sets of switches
    on) among its combinations, beside those it has; each combination's arrangements in order
    (_order_key). The member itself when nothing is new."""
    patterning = member.patterning
    assert patterning is not None
    held: dict[str, set[frozenset[int]]] = {}
    for name, loaded in patterning.loaded.items():
        held.setdefault(member.origin(name), set()).add(loaded)
    new = {origin: {frozenset(s) for s in sets} - held.get(origin, set()) for origin, sets in added.items()}
    if patterning.origins and not any(new.values()):
        return member
    combinations: dict[str, dict[str, float]] = {}
    origins: dict[str, str] = {}
    loaded_by_name: dict[str, frozenset[int]] = {}
    for origin, factors in patterning.combinations.items():
        switches = patterning.switches.get(origin)
        if switches is None:
            combinations[origin], origins[origin] = dict(factors), origin
            continue
        for loaded in sorted(held.get(origin, set()) | new.get(origin, set()), key=lambda on: _order_key(member, origin, on)):
            name = arrangement_name(member, origin, loaded)
            if name in combinations or name in patterning.combinations:
                raise InputError(member.source, _combination_key(member, origin), f"two combinations would be named {name!r}",
                                 "rename the combination, so that its pattern arrangements get names of their own")
            arranged = dict(factors)
            arranged.update({switches[k][0]: switches[k][1] for k in loaded})
            combinations[name], origins[name], loaded_by_name[name] = arranged, origin, loaded
    return replace(member, combinations=combinations, patterning=replace(patterning, origins=origins, loaded=loaded_by_name))


def every_arrangement(member: Member) -> Member:
    """The expanded member with every arrangement of every combination as a combination of its own
    (2^switches each): the brute-force reference the superposition is tested against; only for a
    few switches."""
    expanded = expand_patterns(member)
    if expanded.patterning is None:
        return expanded
    return with_arrangements(expanded, {origin: [frozenset(k for k in range(len(found)) if bits >> k & 1) for bits in range(2 ** len(found))]
                                        for origin, found in expanded.patterning.switches.items()})


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
    numbered = joined("; ", (phrase(f"{k}: ", q(f"span_{k}", (a, b), "m")) for k, (a, b) in enumerate(patterning.spans, start=1)))
    counts: dict[str, int] = {}
    for name in member.combinations:
        origin = member.origin(name)
        counts[origin] = counts.get(origin, 0) + 1
    expanded = ", ".join(f"'{name}' over all {2 ** len(found)} arrangements ({counts.get(name, 0)} of them evaluated in full)"
                         for name, found in patterning.switches.items()) or "none"
    cases = sorted({load.case for load in patterning.loads if load.pattern})
    return [phrase(f"Pattern loading of case{'s' if len(cases) > 1 else ''} {', '.join(repr(c) for c in cases)}: spans (overhangs count) ",
                   numbered, ". Each patterned load is split by span and each span solved once; every arrangement of loaded and unloaded "
                   "spans (the case on no span included) is checked with the combination's factors (unpatterned loads of a case stay in "
                   "every arrangement; self-weight is never patterned): quantities linear in the loads (actions, stresses at each mesh "
                   "node, displacements) at their exact worst arrangement per station by per-span superposition; von Mises, combined shear "
                   "and deflection magnitude at each station and node over every arrangement exactly (the corners of the set of their "
                   "linear parts); lateral-torsional buckling by branch and bound. The arrangements that govern are evaluated in full and "
                   f"named. Arrangements: {expanded}.")]
