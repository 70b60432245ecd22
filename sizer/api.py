"""The Python face of sizer (`from sizer import ...`) for notebooks and scripts, and the one path the
command line takes too: read or build a member, find its forces, check one section, size from a
catalogue.

Inputs: a Member (sizer.model), a member file's path, or member-file text through member_from_text;
lengths as SI floats (m) or strings with their unit ("300 mm"). Results are plain dataclasses in SI
(m, N, N*m, Pa, kg/m); `to_json()` gives the same document as the command's `--json` (sizer.results).
This module never shows anything: `sizer.forces`, `sizer.check` and `sizer.size` (the package's
names, sizer/__init__.py) return the same results made to show themselves as rich text in a
terminal (`rich.print(result)`) and as HTML in a notebook (render.outcomes, at the edge).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any, Callable, Sequence, overload

from sizer.model import Member
from sizer.results.notes import CAUTIONS

if TYPE_CHECKING:
    from sizer.sizing import SizingResult
    from sizer.checks import CheckReport
    from sizer.design import Design

MemberLike = Member | str | Path
Progress = Callable[[int, int, str], None]


def read_member(path: str | Path) -> Member:
    """A member file (TOML) read into a Member; InputError (one line: file, key, fix) for bad input."""
    from sizer.inputfile import read_member_file

    return read_member_file(path)


def member_from_text(text: str, name: str = "member.toml") -> Member:
    """Member-file text (the TOML of a member file) to a Member; `name` stands for the file in
    messages and its folder is where a local section_library/ is looked for."""
    from sizer.inputfile import parse_member_text

    return parse_member_text(text, Path(name))


def as_member(member: MemberLike) -> Member:
    """A Member as given, or read from the path given, with its patterned loads expanded into per-span
    cases and arrangements (sizer.analysis.patterns; a member without them is unchanged)."""
    from sizer.analysis.patterns import expand_patterns

    return expand_patterns(member if isinstance(member, Member) else read_member(member))


@overload
def _length_limit(value: float | str, key: str) -> float: ...
@overload
def _length_limit(value: float | str | None, key: str) -> float | None: ...
def _length_limit(value: float | str | None, key: str) -> float | None:
    """A length limit in m: a float as is, a string with its unit parsed, None for no limit."""
    if value is None or isinstance(value, (int, float)):
        return value
    from sizer import units

    return units.parse(value, "length", "", key)


# ----------------------------------------------------------------------------------------------
# forces

@dataclass
class ForcesOutcome:
    """Reactions, internal actions and deflections of every combination (SI)."""

    member: Member
    combinations: tuple[str, ...]
    notes: list[str]
    design: Design = field(repr=False)
    cautions: tuple[str, ...] = CAUTIONS
    units: str = "si"

    @property
    def section(self) -> str | None:
        return self.design.spec.name if self.design.spec is not None else None

    def actions(self, x: float | str, combination: str | None = None) -> dict[str, float]:
        """N, Vy, Vz, T, My, Mz (and V = -Vy, M = Mz) at x (m or a length string), just right of x
        (just left at the member's end B), in N and N*m."""
        from sizer.model import ACTIONS

        at = _length_limit(x, "x")
        side = "left" if at >= self.member.length else "right"
        values = self.design.solution.actions(combination or self.combinations[0], [at], side)[0]
        found = {name: float(value) for name, value in zip(ACTIONS, values)}
        return {**found, "V": -found["Vy"], "M": found["Mz"]}

    def reactions(self, combination: str | None = None) -> list[dict[str, float]]:
        """Each support's reactions on the member: at (m), Fx, Fy, Fz (N), Mx, My, Mz (N*m)."""
        from sizer.results.forces import REACTION_NAMES

        values = self.design.solution.reactions(combination or self.combinations[0])
        return [{"at": support.at, **{name: float(v) for name, v in zip(REACTION_NAMES, row)}}
                for support, row in zip(self.member.supports, values)]

    def to_json(self, cuts: Sequence[float] | None = None, envelope: bool = False) -> dict[str, Any]:
        """The `sizer forces --json` document (cuts in m; default: ends, supports, loads); with
        `envelope` also the envelope over the combinations (`--envelope`)."""
        import numpy as np

        from sizer.results.forces import default_cuts, forces_json

        xs = np.asarray(cuts, dtype=float) if cuts is not None else default_cuts(self.member)
        return forces_json(self.design.solution, list(self.combinations), xs, self.notes, envelope)

    def envelope(self) -> dict[str, Any]:
        """The largest and smallest of each action along the member (N, Vy, Vz, T, My, Mz, V, M),
        with where and which combination (sizer.analysis.ActionEnvelope), over these combinations."""
        from sizer.analysis import action_envelope

        return action_envelope(self.design.solution, list(self.combinations))


def forces(member: MemberLike, section: str | None = None, catalogue: Sequence[str | Path] = (),
           combination: str | None = None, units: str = "si", second_order: bool = False) -> ForcesOutcome:
    """Solve the member: reactions, actions anywhere, deflections (with a section) for every
    combination, or only `combination`. A first-order (linear, superposable) analysis unless
    `second_order`: then each combination's actions and displacements include the second-order
    increments of `check` (a section is needed; the reactions stay first order)."""
    from sizer.design import prepare
    from sizer.results.notes import member_notes, small_deflection_cautions

    member = as_member(member)
    chosen_combinations(member, combination)  # bad input before solving
    design = prepare(member, [Path(path) for path in catalogue], section)
    member = design.member  # with the pattern arrangements that govern among its combinations
    names = chosen_combinations(member, combination)
    notes = member_notes(member) + design.notes + small_deflection_cautions(design.solution)
    if second_order:
        design, more = _second_order_forces(design)
        notes += more
    return ForcesOutcome(member, names, notes, design, units=units)


def _second_order_forces(design: Design) -> tuple[Design, list[str]]:
    """The design with second-order actions and displacements for `sizer forces --second-order`, and its notes."""
    from dataclasses import replace

    from sizer.checks.second_order import displayed_design, second_order_actions, second_order_notes
    from sizer.checks.stations import check_stations, member_actions
    from sizer.errors import InputError

    if design.spec is None:
        raise InputError("", "--second-order", "a second-order analysis needs the member's stiffness, and no section is given",
                         'add section = "NAME" under [member] or leave out --second-order')
    member = design.member
    solved = replace(design, member=replace(member, checks=replace(member.checks, second_order=True)))
    xs, sides = check_stations(solved)
    found = second_order_actions(solved, xs, sides, member_actions(solved, xs, sides))
    assert found is not None  # second order is turned on above
    notes = second_order_notes(solved, found) + ["Second order: the reactions shown are first order."]
    beyond = [name for name, _ in found.beyond]
    if beyond:
        notes.append("At or beyond the elastic buckling load (no second-order equilibrium; first-order actions shown): "
                     + ", ".join(beyond) + ".")
    return displayed_design(design, found), notes


def chosen_combinations(member: Member, combination: str | None) -> tuple[str, ...]:
    """The combinations `--combination` names: one combination, or a given one with all its pattern
    arrangements; every combination when None. InputError for an unknown name."""
    from sizer.analysis.patterns import arrangements_of
    from sizer.errors import InputError

    if combination is None:
        return tuple(member.combinations)
    if combination in member.combinations:
        return (combination,)
    if combination in member.given_combinations:
        return arrangements_of(member, [combination])
    raise InputError("", "--combination", f"no combination is named {combination!r}", "use one of: " + ", ".join(member.given_combinations))


# ----------------------------------------------------------------------------------------------
# check

@dataclass
class CheckOutcome:
    """Every check of one section: the verdict, the governing check and each check's numbers (SI)."""

    section: str
    passes: bool
    utilization: float
    governing: str | None
    checks: list[Any]  # sizer.checks.CheckResult
    notes: list[str]
    design: Design = field(repr=False)
    report: CheckReport = field(repr=False)
    cautions: tuple[str, ...] = CAUTIONS
    units: str = "si"
    reserve_factor: float | None = None  # the largest factor on the governing combination's loads that still passes

    def to_json(self) -> dict[str, Any]:
        """The `sizer check --json` document."""
        from sizer.results.check import check_json

        return check_json(self.design, self.report, self.notes)


def check_outcome(design: Design, report: CheckReport, notes: list[str], units: str = "si") -> CheckOutcome:
    """A CheckOutcome of a checked design (sizer.design.Design and sizer.checks.CheckReport); its
    design shows the actions the checks used (second order where they were)."""
    from sizer.checks.second_order import displayed_design

    design = displayed_design(design, report.second_order)
    governing = report.governing
    reserve = report.reserve.factor if report.reserve is not None else None
    return CheckOutcome(report.section, report.passes, report.utilization, governing.check if governing else None,
                        list(report.checks), notes, design, report, units=units, reserve_factor=reserve)


def check(member: MemberLike, section: str | None = None, catalogue: Sequence[str | Path] = (), units: str = "si",
          reserve: bool = True) -> CheckOutcome:
    """Every check of one section (the member's own, or `section` from the catalogue), on its full
    cross-section stress field; with `reserve`, its reserve factor too (a few more full checks)."""
    from sizer.checks import check_design
    from sizer.design import prepare
    from sizer.results.notes import member_notes, small_deflection_cautions
    from sizer.sections import unit_stress_field

    member = as_member(member)
    design = prepare(member, [Path(path) for path in catalogue], section, need_section=True)
    report = check_design(design, unit_stress_field(design.spec))
    design = report.design or design
    if reserve:
        add_reserve(design, report)
    notes = member_notes(member) + design.notes + report.notes + small_deflection_cautions(design.solution)
    return check_outcome(design, report, notes, units)


def add_reserve(design: Design, report: CheckReport) -> None:
    """Find the reserve factor of a checked design (sizer.checks.reserve) and keep it, and its note,
    in the report."""
    from sizer.checks.reserve import reserve_factor
    from sizer.sections import unit_stress_field

    report.reserve = reserve_factor(design, report, unit_stress_field(design.spec))
    report.notes.append(report.reserve.note)


# ----------------------------------------------------------------------------------------------
# size

@dataclass(frozen=True)
class CandidateSummary:
    """One catalogue section in a sizing: mass per length (kg/m), utilization (a proven lower bound
    where `basis` is "screen"), verdict and governing check."""

    section: str
    mass_per_length: float
    utilization: float
    passes: bool | None  # None: a runner-up not checked in full (basis "not checked in full")
    governing: str
    basis: str  # "full stress field", "screen" or "not checked in full"
    cost: float | None = None  # of the member in this section (the catalogue's currency); None: no price or not available


@dataclass
class SizeOutcome:
    """The lightest passing section, its full check, and the candidates around it: `candidates` are
    the ones `sizer size --top N` lists (the `top` lighter failing sections, the choice and the `top`
    next heavier ones that pass); to_json() has every lighter section, as `sizer size --json`."""

    section: str | None
    passes: bool
    mass_per_length: float | None
    utilization: float | None
    governing: str | None
    candidates: list[CandidateSummary]
    chosen: CheckOutcome | None
    notes: list[str]
    result: SizingResult = field(repr=False)
    top: int = 3
    cautions: tuple[str, ...] = CAUTIONS
    units: str = "si"
    cost: float | None = None  # of the member in the chosen section (currency), None: no price or not available
    currency: str | None = None
    reserve_factor: float | None = None  # of the chosen section (sizer.checks.reserve)

    def to_json(self) -> dict[str, Any]:
        """The `sizer size --json` document."""
        from sizer.results.size import size_json

        return size_json(self.result, self.notes)


def size(member: MemberLike, catalogue: Sequence[str | Path] = (), families: Sequence[str] = (),
         max_depth: float | str | None = None, max_width: float | str | None = None, top: int = 3, units: str = "si",
         progress: Progress | None = None, by: str = "mass", include_unstocked: bool = False, reserve: bool = True,
         check_runners_up: bool = False) -> SizeOutcome:
    """The lightest catalogue section that passes every check (or the cheapest, or the shallowest:
    `by` "mass", "cost" or "depth"), the ones ranked before it that fail (why) and the next ones
    that pass (`top` each side); sections not stocked or not available in one bar rank after the
    others unless `include_unstocked`. `progress(done, total, name)` hears of section properties
    computed first. With `reserve`, the chosen section's reserve factor too (a few more full checks).
    The runners-up after the choice are checked in full with `check_runners_up`; else they are the
    next sections no proven lower bound rules out, not checked in full (`passes` None, basis "not
    checked in full")."""
    from sizer.design import catalogue_for, resolve_material
    from sizer.errors import InputError
    from sizer.results.notes import member_notes, small_deflection_cautions
    from sizer.results.size import candidate_entry, shown_candidates
    from sizer.sizing import size_member
    from sizer.sizing.cost import RANKINGS, Ranking

    member = as_member(member)
    depth, width = _length_limit(max_depth, "--max-depth"), _length_limit(max_width, "--max-width")
    if top < 0:
        raise InputError("", "--top", "must be zero or more", "give e.g. --top 3")
    if by not in RANKINGS:
        raise InputError("", "--by", f"unknown ranking {by!r}", "use one of: " + ", ".join(RANKINGS))
    catalogue_data = catalogue_for(member, [Path(path) for path in catalogue])
    material = resolve_material(member, catalogue_data)
    ranking = Ranking(by, include_unstocked, catalogue_data.currency)
    result = size_member(member, catalogue_data, material, families, depth, width, top, progress, ranking, check_runners_up)
    notes = member_notes(member) + result.notes
    chosen = result.chosen
    if chosen is not None and reserve:
        assert chosen.design is not None  # the choice is checked in full
        add_reserve(chosen.design, chosen.full_report)
        notes += chosen.full_report.notes
    summaries = [CandidateSummary(**{key: entry[key] for key in ("section", "mass_per_length", "utilization", "passes", "governing", "basis", "cost")})
                 for entry in map(candidate_entry, shown_candidates(result, top))]
    chosen_check = None
    if chosen is not None:
        chosen_design = chosen.design  # solved for its full check
        assert chosen_design is not None
        notes += small_deflection_cautions(chosen_design.solution)
        chosen_check = check_outcome(chosen_design, chosen.full_report, notes, units)
    return SizeOutcome(chosen.name if chosen else None, chosen is not None, chosen.mass_per_length if chosen else None,
                       chosen.utilization if chosen else None, chosen.governing if chosen else None, summaries, chosen_check,
                       notes, result, top, units=units, cost=chosen.costing.cost if chosen else None, currency=ranking.currency,
                       reserve_factor=chosen_check.reserve_factor if chosen_check else None)
