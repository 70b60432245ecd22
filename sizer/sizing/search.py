"""The search: walk up the candidates by mass, skipping every section that a proven lower bound
rules out, and check the rest in full (exactly as `sizer check` does) until one passes; then the
runners-up; or, when nothing passes, the least utilized section.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Callable, Sequence

import numpy as np

from sizer.analysis import MemberSolution, solve_member
from sizer.checks import CheckReport, CheckResult, check_design, stress_checks
from sizer.checks.design_check import StressState
from sizer.design import Design, given_heights
from sizer.model import Material, Member, Stiffness
from sizer.phrase import phrase
from sizer.sections.properties import AnalysisWorkers
from sizer.sizing.candidates import Candidate, CandidateTable, candidate_sections, design_for
from sizer.sizing.cost import Ranking
from sizer.sizing.screen import Screen, local_lower_bounds, local_rows, prove_lower_bounds, rescreen, screen
from sizer.sizing.stability_bounds import StabilityBounds
from sizer.stability import MemberStability
from sizer.stability.second_order import share_first_level

if TYPE_CHECKING:
    from sizer.sections.catalogue import Catalogue

BATCH = 64  # candidates given stability bounds at once (one small batched eigen-solve per combination)
REVEAL_MOST = 16  # candidates whose warping tiers are revealed together, at most (see Search.passes_in_full)


@dataclass
class SizingResult:
    member: Member
    material: Material
    candidates: list[Candidate]  # every candidate after filters, by mass per length
    chosen: Candidate | None
    strongest: Candidate | None = None  # when nothing passes: the least utilized on the full check
    notes: list[str] = field(default_factory=list)
    ranking: Ranking = field(default_factory=Ranking)  # the order of `candidates` (sizer.sizing.cost)
    unavailable: list[Candidate] = field(default_factory=list)  # not available, ranked after the choice for that alone

    @property
    def full_checks(self) -> int:
        return sum(1 for c in self.candidates if c.report is not None)


@dataclass
class Search:
    """What the walk needs: the member, its material, the candidates' table, where their warping
    tiers are computed (`workers`), the unit-rigidity solution (None with springs, where each section
    is solved), the screen and the stability bounds (None with springs)."""

    member: Member
    material: Material
    candidates: list[Candidate]
    table: CandidateTable
    workers: AnalysisWorkers
    base: MemberSolution | None = None
    found: Screen | None = None
    stability: StabilityBounds | None = None
    model: MemberStability | None = None
    bounded: dict[int, int] = field(default_factory=dict)  # candidate index -> stability epoch of its bounds
    reveal_count: int = 1  # candidates revealed together next: doubles while revealed ones keep failing
    seeded_rows: set[int] = field(default_factory=set)  # candidates whose own shapes the stability bounds took (seeded)
    webs: np.ndarray | None = None  # each candidate's web check (sizer.checks.web), -1 until made (see web_utilization)
    local_values: dict[int, tuple[tuple[int, ...], float | None]] = field(default_factory=dict)  # candidate -> (its rows, local bound) made

    def compute(self, candidates: Sequence[Candidate]) -> None:
        """Make sure the warping tiers and stress fields of `candidates` are cached (on the workers
        when there are many); the search learns of them only through `reveal`."""
        self.workers.wait([c.spec for c in candidates])

    def reveal(self, candidates: Sequence[Candidate]) -> None:
        """Make the candidates' warping tiers known to the search (computed first when not cached):
        their shear and equivalent estimates follow, and their stability bounds when next asked for."""
        hidden = [candidate for candidate in candidates if not self.table.known[candidate.index]]
        if not hidden:
            return
        self.compute(hidden)
        rows = [candidate.index for candidate in hidden]
        self.table.reveal(rows)
        if self.found is not None:
            rescreen(self.found, rows, self.material)
            for row in rows:
                self.bounded.pop(row, None)  # its stability bounds are made again when next asked for

    def full_check(self, candidate: Candidate, learn: bool = True,
                   made: tuple[StressState, dict[str, CheckResult]] | None = None) -> CheckReport:
        """The full stress-field check of one candidate (the same as `sizer check`); with `learn`, its
        buckled shapes sharpen the stability bounds of the others. `made`: its stress_checks, if made."""
        from sizer.sections import unit_stress_field

        if candidate.report is None:
            self.reveal([candidate])
            candidate.report = check_design(self.design(candidate), unit_stress_field(candidate.spec), stability=self.model,
                                            validate_across=False, made=made)
            candidate.design = candidate.report.design
            if learn and self.stability is not None and candidate.report.stability is not None:
                self.stability.add(candidate.report.stability)
        return candidate.report

    def design(self, candidate: Candidate) -> Design:
        """The candidate's solved design (made once)."""
        if candidate.design is None:
            candidate.design = design_for(self.member, self.material, candidate, self.base)
        return candidate.design

    def stress_field_bounds(self, candidate: Candidate) -> tuple[StressState, dict[str, CheckResult]] | None:
        """The full check's own stress-field checks of the candidate (sizer.checks.stress_checks: axial,
        bending, shear, equivalent, deflection, local, web, on its own first- or second-order actions,
        without its stability solves), each raised onto it as a proven lower bound of its utilization
        (each is the full check's value); returned for its full check. None where they cannot be made
        apart (pattern arrangements)."""
        from sizer.sections import unit_stress_field

        made = stress_checks(self.design(candidate), unit_stress_field(candidate.spec), validate_across=False)
        for result in made[1].values() if made is not None else ():
            if result.made:
                candidate.raise_bound(result.check, result.made_utilization)
        return made

    def stability_bounds(self, candidates: list[Candidate]) -> None:
        """The stability lower bounds, with the trial shapes so far, onto those unchecked candidates
        that have not had them since the last shapes came (one batch for all of them)."""
        if self.stability is None:
            return
        epoch = self.stability.epoch
        open_ = [c for c in candidates if c.report is None and self.bounded.get(c.index, -1) < epoch]
        if not open_:
            return
        found = self.stability.lower_bounds(np.array([candidate.index for candidate in open_]))
        for check, values in found.items():
            for candidate, value in zip(open_, values):
                candidate.raise_bound(check, value)
        for candidate in open_:
            self.bounded[candidate.index] = epoch

    def ahead(self, candidate: Candidate) -> list[Candidate]:
        """The candidate and those of the BATCH after it that no bound rules out yet: the ones the
        walk will judge next, whose stability bounds are made in one batch."""
        return [c for c in self.candidates[candidate.index:candidate.index + BATCH] if not c.certainly_fails]

    def ruled_out(self, candidate: Candidate) -> bool:
        """Whether a proven lower bound rules the candidate out, tried in turn while none does: the
        exact parts of the screen, the stability bounds, the stress field at the screen's worst
        stations, local buckling at the screen's stations."""
        found = self.found
        assert found is not None  # called only where the screen is made (no springs)
        if candidate.certainly_fails:
            return True
        if self.stability is not None and self.bounded.get(candidate.index, -1) < self.stability.epoch:
            self.stability_bounds(self.ahead(candidate))
            if candidate.certainly_fails:
                return True
        prove_lower_bounds(candidate, found, self.material, self.member)
        if candidate.certainly_fails:
            return True
        if "web" not in candidate.bounds:
            candidate.raise_bound("web", self.web_utilization(candidate))
            if candidate.certainly_fails:
                return True
        if "local" not in candidate.bounds:
            local = self.local_bound(candidate)
            if local is not None:
                candidate.raise_bound("local", local)
        return candidate.certainly_fails

    def local_bound(self, candidate: Candidate) -> float | None:
        """local_lower_bound of the candidate (sizer.sizing.screen), made together for it and the open
        candidates of the BATCH after it, each kept with the rows it looked at (a reveal may move a
        candidate's worst rows: its value is then made again)."""
        found = self.found
        assert found is not None
        made = self.local_values.get(candidate.index)
        if made is None or made[0] != tuple(local_rows(found, candidate.index)):
            open_ = [c.index for c in self.candidates[candidate.index:candidate.index + BATCH]
                     if c is candidate or (c.report is None and "local" not in c.bounds and not c.certainly_fails)]
            for index, value in zip(open_, local_lower_bounds(found, open_, self.member, self.material)):
                self.local_values[index] = (tuple(local_rows(found, index)), value)
        return self.local_values[candidate.index][1]

    def web_utilization(self, candidate: Candidate) -> float:
        """The full check's own web check under concentrated forces (sizer.checks.web): it needs the
        section's dimensions and the reactions alone, which do not depend on its rigidities (the
        unit-rigidity solution with its self-weight), so it is exact here (0 where not made). Made for
        the BATCH of candidates from this one at once, when first asked for."""
        from sizer.checks.web import yield_strength_for_webs, web_utilizations

        if self.base is None:
            return 0.0
        if self.webs is None:
            self.webs = np.full(len(self.candidates), -1.0)
        if self.webs[candidate.index] < 0.0:
            rows = slice(candidate.index, candidate.index + BATCH)
            masses = self.table.mass[rows] if self.member.self_weight_case else None
            self.webs[rows] = web_utilizations(self.base, self.material, self.table.specs[rows], masses)
        value = float(self.webs[candidate.index])
        if np.isnan(value):  # the check needs a yield strength that is not given: its own error
            yield_strength_for_webs(self.material, self.member.source)
        return value

    def passes_in_full(self, candidate: Candidate, learn: bool = True) -> bool:
        """False at once when a proven lower bound rules the candidate out, first from the geometric
        tier alone, then with its warping tier (J, Iw, shear centre, peak shear stresses: computed
        only now, for a section the geometric tier cannot rule out); else the verdict of the full
        check. While revealed sections keep failing, the next ones the geometric tier cannot rule out
        either are revealed with it, a growing batch at a time (each would be revealed when the walk
        reaches it; together, their bounds come in one batch). Last before the full check, its own
        stress-field checks (stress_field_bounds): a failure there rules it out without its stability
        solves; else they are the full check's."""
        made = None
        if self.found is not None and candidate.report is None:
            if self.ruled_out(candidate):
                return False
            if not self.table.known[candidate.index]:
                self.reveal([candidate, *self.open_after(candidate, self.reveal_count - 1)])
                if self.ruled_out(candidate):
                    self.reveal_count = min(2 * self.reveal_count, REVEAL_MOST)
                    return False
            if self.seeded(candidate) and self.ruled_out(candidate):
                self.reveal_count = min(2 * self.reveal_count, REVEAL_MOST)  # a failure, as a failed full check is
                return False
            made = self.stress_field_bounds(candidate)
            if candidate.certainly_fails:
                self.reveal_count = min(2 * self.reveal_count, REVEAL_MOST)  # a failure, as a failed full check is
                return False
        passes = self.full_check(candidate, learn, made).passes
        self.reveal_count = 1 if passes else min(2 * self.reveal_count, REVEAL_MOST)
        return passes

    def seeded(self, candidate: Candidate) -> bool:
        """Whether the stability bounds took the candidate's own base-mesh buckled shapes now
        (sizer.sizing.stability_bounds.StabilityBounds.seed: before every full check, measured to pay
        for members with and without pattern arrangements), once per candidate."""
        from sizer.stability import stability_section

        stability = self.stability
        if stability is None or candidate.index in self.seeded_rows:
            return False
        self.seeded_rows.add(candidate.index)
        section = stability_section(candidate.props, self.material.elastic_modulus, self.material.shear_modulus)
        stability.seed(candidate.index, section, candidate.mass_per_length if self.member.self_weight_case else 0.0)
        return True

    def open_after(self, candidate: Candidate, count: int) -> list[Candidate]:
        """Up to `count` unchecked candidates after this one, within its BATCH, whose warping tier is
        not known and that no bound from the geometric tier rules out."""
        found: list[Candidate] = []
        for other in self.candidates[candidate.index + 1:candidate.index + BATCH]:
            if len(found) >= count:
                break
            if other.report is None and not self.table.known[other.index] and not self.ruled_out(other):
                found.append(other)
        return found

    def first_passing(self) -> Candidate | None:
        """Walk up by mass: skip sections a lower bound rules out, check the rest until one passes."""
        return next((candidate for candidate in self.candidates if self.passes_in_full(candidate)), None)

    def least_utilized(self) -> Candidate | None:
        """When nothing passes: the candidate with the smallest full-check utilization. Sections are
        checked in order of their lower bound until no lower bound can beat the best found."""
        best: Candidate | None = None
        for candidate in sorted(self.candidates, key=lambda c: c.utilization):
            if best is not None and candidate.utilization >= best.utilization:
                break
            self.full_check(candidate)
            if best is None or candidate.utilization < best.utilization:
                best = candidate
        return best

    def confirm_runners_up(self, chosen: Candidate | None, top: int) -> None:
        """The `top` heavier sections that pass, found by full checks (heavier ones a lower bound rules
        out are skipped); their buckled shapes are not added to the trial shapes (each new shape would
        have the bounds of the sections ahead made again, for a walk that is nearly over). The lighter
        ones shown need nothing more: the walk either checked each in full or proved it fails."""
        self._walk_heavier(chosen, top, lambda candidate: self.passes_in_full(candidate, learn=False))

    def runners_up_from_bounds(self, chosen: Candidate | None, top: int) -> None:
        """Mark the `top` heavier sections that no proven lower bound rules out (from what the walk
        knows: their geometric tier, the stability bounds of the shapes found) as runners-up shown
        without a full check (`unchecked`): whether they pass is not known, and is not claimed."""
        self._walk_heavier(chosen, top, self._shown_from_bounds)

    def _shown_from_bounds(self, candidate: Candidate) -> bool:
        """True when `candidate` is shown as a runner-up: it passed its full check, or no proven lower
        bound rules it out (then marked `unchecked`, with its stress checks' bounds proven too)."""
        if candidate.report is not None:
            return candidate.report.passes
        if self.found is not None and self.ruled_out(candidate):
            return False
        if self.found is not None:  # its stress checks' bounds too, not only those estimated to fail
            prove_lower_bounds(candidate, self.found, self.material, self.member, above=0.0)
        candidate.unchecked = True
        return True

    def _walk_heavier(self, chosen: Candidate | None, top: int, shown: Callable[[Candidate], bool]) -> None:
        """Take the sections heavier than `chosen` in turn through `shown` until `top` of them are shown."""
        if chosen is None:
            return
        count = 0
        for candidate in self.candidates[self.candidates.index(chosen) + 1:]:
            if count >= top:
                break
            count += shown(candidate)

    def unavailable_ahead(self, chosen: Candidate | None, top: int) -> list[Candidate]:
        """Up to `top` sections not available (not stocked, or longer than every stock length) that rank
        after the choice only for that reason, each judged as the others are (a proven lower bound or the
        full check): what stocking them would offer."""
        if chosen is None:
            return []
        found = [c for c in self.candidates[self.candidates.index(chosen) + 1:] if not c.costing.available and c.rank[1:] < chosen.rank[1:]]
        for candidate in found[:top]:
            self.passes_in_full(candidate, learn=False)
        return found[:top]


def size_member(member: Member, catalogue: Catalogue, material: Material, families: Sequence[str] = (),
                max_depth: float | None = None, max_width: float | None = None, top: int = 3,
                progress: Callable[[int, int, str], None] | None = None, ranking: Ranking | None = None,
                check_runners_up: bool = False) -> SizingResult:
    """The first candidate in the order of `ranking` (default: the lightest) that passes every check
    on the full stress field, with runners-up: the next heavier sections that pass their full checks
    with `check_runners_up`, else those no proven lower bound rules out, not checked in full
    (`progress` hears of the warping tiers computed: only for the sections whose verdict needs them)."""
    with AnalysisWorkers(progress=progress) as workers:
        return _size(member, catalogue, material, families, max_depth, max_width, top, workers, ranking or Ranking(), check_runners_up)


def _size(member: Member, catalogue: Catalogue, material: Material, families: Sequence[str], max_depth: float | None,
          max_width: float | None, top: int, workers: AnalysisWorkers, ranking: Ranking, check_runners_up: bool = False) -> SizingResult:
    candidates, table = candidate_sections(catalogue, member, material, families, max_depth, max_width, workers.progress, lazy=True,
                                           ranking=ranking)
    count = f"{len(candidates)} candidate section" + ("" if len(candidates) == 1 else "s")
    weight = ", each with its own self-weight" if member.self_weight_case else " (self-weight not included: self_weight = false)"
    notes = [f"{count} after filters{weight}, in material {material.name} (the member's)."]
    notes += ranking.notes(any(not c.costing.available for c in candidates), any(c.costing.cost is None for c in candidates),
                           any(c.costing.terms.stock_lengths for c in candidates), any(c.costing.cost is not None for c in candidates))
    if given_heights(member):
        notes.append("Sections that do not hold every load and restraint height given (between their bottom and top faces) are left out.")
    search = Search(member, material, candidates, table, workers)
    if member.has_springs:
        search.compute(candidates)
        for candidate in candidates:
            search.full_check(candidate)
        notes.append("Spring supports: forces depend on stiffness, so every candidate was solved and checked in full.")
    else:
        prepare_screen(search, table)
        solves = "one solve per load case and one unit self-weight solve" if member.self_weight_case else "one solve per load case"
        seeded = (", and each section's own buckled shapes on the unrefined mesh, whose load factors lie at or above the "
                  "converged ones") if search.stability is not None else ""
        notes.append(f"Screened all candidates at once ({solves}, "
                     "superposed); a lighter section is ruled out only by a proven lower bound of its full check "
                     "(stability: Rayleigh-Ritz bounds of its buckling load factors from the buckled shapes found "
                     f"so far{seeded}); every verdict of a section shown in full rests on the full stress-field check.")
    chosen = search.first_passing()
    if check_runners_up:
        search.confirm_runners_up(chosen, top)
    else:
        search.runners_up_from_bounds(chosen, top)
        if any(c.unchecked for c in candidates):
            notes.append("Runners-up after the choice are shown from proven lower bounds of their utilization alone, not checked in "
                         "full: none of these bounds rules them out, but each may still fail (`sizer check` one, or "
                         "`sizer size --check-runners-up`, to know).")
    unavailable = search.unavailable_ahead(chosen, top)
    if chosen is not None and not chosen.costing.available:
        notes.append(phrase(f"No available section passes: the choice {chosen.name} is ", chosen.costing.unavailable, "."))
    strongest = None
    if chosen is None:
        search.stability_bounds(candidates)
        strongest = search.least_utilized()
    return SizingResult(member, material, candidates, chosen, strongest, notes, ranking, unavailable)


def prepare_screen(search: Search, table: CandidateTable) -> None:
    """The unit-rigidity solution, the screen and the stability bounds of every candidate."""
    member, material = search.member, search.material
    search.base = solve_member(member, Stiffness.unit(), None)
    search.found = screen(table, member, material, search.base, lazy=True)
    for check, values in search.found.exact.items():  # each candidate's in the same order: axial, then deflection
        for candidate, value in zip(search.candidates, values.tolist()):  # candidates in row order
            candidate.raise_bound(check, value)
    search.model = MemberStability(member, search.base)
    if search.base.member is member:  # no pattern expanded: the second-order solves start from this model's mesh
        share_first_level(member, search.model)
    search.stability = StabilityBounds(search.model, search.base, table, search.found, member, material)
