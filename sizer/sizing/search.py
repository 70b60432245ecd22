"""The search: walk up the candidates by mass, skipping every section that a proven lower bound
rules out, and check the rest in full (exactly as `sizer check` does) until one passes; then the
runners-up; or, when nothing passes, the least utilized section.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Callable, Sequence

import numpy as np

from sizer.analysis import MemberSolution, solve_member
from sizer.checks import CheckReport, check_design
from sizer.model import Material, Member, Stiffness
from sizer.sizing.candidates import Candidate, CandidateTable, candidate_sections, design_for
from sizer.sizing.screen import Screen, local_lower_bound, prove_lower_bounds, screen
from sizer.sizing.stability_bounds import StabilityBounds
from sizer.stability import MemberStability

BATCH = 64  # candidates given stability bounds at once (one small batched eigen-solve per combination)


@dataclass
class SizingResult:
    member: Member
    material: Material
    candidates: list[Candidate]  # every candidate after filters, by mass per length
    chosen: Candidate | None
    strongest: Candidate | None = None  # when nothing passes: the least utilized on the full check
    notes: list[str] = field(default_factory=list)

    @property
    def full_checks(self) -> int:
        return sum(1 for c in self.candidates if c.report is not None)


@dataclass
class Search:
    """What the walk needs: the member, its material, the unit-rigidity solution (None with springs,
    where each section is solved), the screen and the stability bounds (None with springs)."""

    member: Member
    material: Material
    candidates: list[Candidate]
    base: MemberSolution | None = None
    found: Screen | None = None
    stability: StabilityBounds | None = None
    model: MemberStability | None = None
    bounded: dict[int, int] = field(default_factory=dict)  # candidate index -> stability epoch of its bounds

    def full_check(self, candidate: Candidate) -> CheckReport:
        """The full stress-field check of one candidate (the same as `sizer check`); its buckled
        shapes sharpen the stability bounds of the others."""
        from sizer.sections import unit_stress_field

        if candidate.report is None:
            design = design_for(self.member, self.material, candidate, self.base)
            candidate.report = check_design(design, unit_stress_field(candidate.spec), stability=self.model)
            if self.stability is not None and candidate.report.stability is not None:
                self.stability.add(candidate.report.stability)
        return candidate.report

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
        """The candidate and the BATCH after it: the ones the walk will judge next."""
        position = self.candidates.index(candidate)
        return self.candidates[position:position + BATCH]

    def passes_in_full(self, candidate: Candidate) -> bool:
        """False at once when a proven lower bound rules the candidate out (the exact parts of the
        screen, the stability bounds, then the full field at the screen's worst stations, then local
        buckling at the screen's stations); else the verdict of the full check."""
        if self.found is not None and candidate.report is None:
            if candidate.certainly_fails:
                return False
            self.stability_bounds(self.ahead(candidate))
            if candidate.certainly_fails:
                return False
            prove_lower_bounds(candidate, self.found, self.material)
            if candidate.certainly_fails:
                return False
            local = local_lower_bound(self.found, candidate.index, self.member, self.material)
            if local is not None:
                candidate.raise_bound("local", local)
                if candidate.certainly_fails:
                    return False
        return self.full_check(candidate).passes

    def first_passing(self) -> Candidate | None:
        """Walk up by mass: skip sections a lower bound rules out, check the rest until one passes."""
        return next((candidate for candidate in self.candidates if self.passes_in_full(candidate)), None)

    def least_utilized(self) -> Candidate:
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
        """Full checks for the `top` lighter sections just below the choice and the `top` heavier ones
        that pass (heavier ones a lower bound rules out are skipped)."""
        if chosen is None:
            return
        position = self.candidates.index(chosen)
        for candidate in self.candidates[max(0, position - top):position]:
            self.full_check(candidate)
        heavier = 0
        for candidate in self.candidates[position + 1:]:
            if heavier >= top:
                break
            heavier += self.passes_in_full(candidate)


def size_member(member: Member, catalogue: Any, material: Material, families: Sequence[str] = (),
                max_depth: float | None = None, max_width: float | None = None, top: int = 3,
                progress: Callable[[int, int, str], None] | None = None) -> SizingResult:
    """The lightest candidate that passes every check on the full stress field, with runners-up
    (`progress` hears of any section properties computed first)."""
    candidates, table = candidate_sections(catalogue, member, material, families, max_depth, max_width, progress)
    count = f"{len(candidates)} candidate section" + ("" if len(candidates) == 1 else "s")
    notes = [f"{count} after filters, each with its own self-weight, in material {material.name} (the member's)."]
    search = Search(member, material, candidates)
    if member.has_springs:
        for candidate in candidates:
            search.full_check(candidate)
        notes.append("Spring supports: forces depend on stiffness, so every candidate was solved and checked in full.")
    else:
        prepare_screen(search, table)
        notes.append("Screened all candidates at once (one solve per load case and one unit self-weight solve, "
                     "superposed); a lighter section is ruled out only by a proven lower bound of its full check "
                     "(stability: Rayleigh-Ritz bounds of its buckling load factors from the buckled shapes found "
                     "so far); every verdict of a section shown in full rests on the full stress-field check.")
    chosen = search.first_passing()
    search.confirm_runners_up(chosen, top)
    strongest = None
    if chosen is None:
        search.stability_bounds(candidates)
        strongest = search.least_utilized()
    return SizingResult(member, material, candidates, chosen, strongest, notes)


def prepare_screen(search: Search, table: CandidateTable) -> None:
    """The unit-rigidity solution, the screen and the stability bounds of every candidate."""
    member, material = search.member, search.material
    search.base = solve_member(member, Stiffness.unit(), None)
    search.found = screen(table, member, material, search.base)
    for candidate in search.candidates:
        for check, values in search.found.exact.items():
            candidate.raise_bound(check, values[candidate.index])
    search.model = MemberStability(member, search.base)
    search.stability = StabilityBounds(search.model, search.base, table, search.found, member, material)
