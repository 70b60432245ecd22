"""The search of a span table: each cell (a section with a load or a span) is a job; a trial runs
the full check on its member; the boundary is bracketed on a grid (spans at the resolution, loads in
0.5 % steps) and narrowed with guesses, falling back to halving; the whole table on the local cores
or a cluster (sizer.parallel).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Callable, Sequence

from sizer.errors import InputError
from sizer.cache_store import content_hash
from sizer.parallel import Job, JobFailed, RunSummary, run_jobs, ship_catalogue
from sizer.workers import Workers, error_result, result_error
from sizer.span_table.members import span_table_error, trial_member, user_combinations
from sizer.span_table.spec import DEAD, FIRST_SPAN, LOAD_GRID, LOAD_STEP, AppliedLoad, CellTask, SpanTableResult, SpanTableSpec, Trial

BuildProgress = Callable[[str, Callable[[Any], Any]], Any]  # (description, work) -> work(progress), progress shown
BUILD_DESCRIPTION = "Section properties (first use of these shapes)"


def run_trial(spec: SpanTableSpec, section: str, span: float, imposed: AppliedLoad, catalogue: Sequence[Path]) -> Trial:
    """The full check (`sizer check`) of one trial member."""
    from sizer import api

    outcome = api.check(trial_member(spec, section, span, imposed), None, catalogue, reserve=False)
    return Trial(outcome.passes, outcome.utilization, outcome.governing)


# ----------------------------------------------------------------------------------------------
# the search

@dataclass
class Boundary:
    """The largest passing grid index (`passing`, None when even the lowest fails) with its trial,
    the first failing index above it (`failing`, None when even the highest passes) with its trial,
    and the number of full checks made."""

    passing: int | None
    failing: int | None
    trials: dict[int, Trial]

    def trial(self, index: int | None) -> Trial | None:
        return self.trials.get(index) if index is not None else None

    def governing_of(self, index: int | None) -> str | None:
        """The governing check of the trial at `index` (None without one)."""
        trial = self.trial(index)
        return trial.governing if trial is not None else None


Guess = Callable[[list[tuple[int, Trial]]], float | None]


def largest_passing(trial: Callable[[int], Trial], start: int, lowest: int, highest: int, guess: Guess) -> Boundary:
    """The largest integer k in [lowest, highest] whose trial passes, the next one failing (the trials
    are assumed to pass below some k and fail above it). `guess(points)` estimates the boundary (a real
    k) from the trials so far, or None (then the bracket is halved)."""
    trials: dict[int, Trial] = {}

    def at(k: int) -> Trial:
        if k not in trials:
            trials[k] = trial(k)
        return trials[k]

    passing, failing = _bracket(at, min(max(start, lowest), highest), lowest, highest, guess, trials)
    if passing is None or failing is None:
        return Boundary(passing, failing, trials)
    while failing - passing > 1:
        width = failing - passing
        estimate = guess([(passing, trials[passing]), (failing, trials[failing])])
        k = (passing + failing) // 2 if estimate is None else min(max(round(estimate), passing + 1), failing - 1)
        passing, failing = _narrowed(at, k, passing, failing)
        if failing - passing > 1 and estimate is not None:
            neighbour = k + 1 if at(k).passes else k - 1
            if passing < neighbour < failing:
                passing, failing = _narrowed(at, neighbour, passing, failing)
        if failing - passing > width // 2 and failing - passing > 1:
            passing, failing = _narrowed(at, (passing + failing) // 2, passing, failing)
    return Boundary(passing, failing, trials)


def _narrowed(at: Callable[[int], Trial], k: int, passing: int, failing: int) -> tuple[int, int]:
    return (k, failing) if at(k).passes else (passing, k)


def _bracket(at: Callable[[int], Trial], k: int, lowest: int, highest: int, guess: Guess,
             trials: dict[int, Trial]) -> tuple[int | None, int | None]:
    """A passing index below a failing one, stepping from k by the guess (doubling its step after the
    second try); (None, lowest) when the lowest fails, (highest, None) when the highest passes."""
    passing: int | None = None
    failing: int | None = None
    for attempt in range(64):
        if at(k).passes:
            passing = k if passing is None else max(passing, k)
        else:
            failing = k if failing is None else min(failing, k)
        if passing is not None and failing is not None:
            return passing, failing
        if passing == highest or failing == lowest:
            break
        estimate = guess([(k, at(k))])
        step = 2 ** max(0, attempt - 1)
        if passing is not None:
            k = min(highest, max(k + step, math.ceil(estimate) if estimate is not None else 2 * k - lowest + 1))
        else:
            k = max(lowest, min(k - step, math.floor(estimate) if estimate is not None else (k + lowest) // 2))
    return passing, failing


def _finite_positive(value: float) -> bool:
    return math.isfinite(value) and value > 0


def span_guess(resolution: float) -> Guess:
    """Mode "span": utilization taken as a power of the span (from two trials; from one, the square,
    as bending under a uniform load), the boundary where it reaches 1, in grid steps."""

    def guess(points: list[tuple[int, Trial]]) -> float | None:
        usable = [(k * resolution, t.utilization) for k, t in points if k > 0 and _finite_positive(t.utilization)]
        if len(usable) == 1:
            span, utilization = usable[0]
            return span * utilization ** -0.5 / resolution
        if len(usable) == 2 and usable[0][1] != usable[1][1]:
            (s1, u1), (s2, u2) = usable
            power = math.log(u2 / u1) / math.log(s2 / s1)
            return s1 * u1 ** (-1 / power) / resolution if power > 0 else None
        return None

    return guess


def load_guess(base: Trial) -> Guess:
    """Mode "load": utilization taken as linear in the load factor (from the unloaded trial `base`
    and one more, or from two), the factor where it reaches 1, in grid steps of 0.5 %."""

    def factor(k: int) -> float:
        return LOAD_STEP ** k

    def guess(points: list[tuple[int, Trial]]) -> float | None:
        usable = [(factor(k), t.utilization) for k, t in points if math.isfinite(t.utilization)]
        if len(usable) == 1 and math.isfinite(base.utilization):
            usable = [(0.0, base.utilization)] + usable
        if len(usable) != 2 or usable[0][1] == usable[1][1]:
            return None
        (f1, u1), (f2, u2) = usable
        root = f1 + (1 - u1) * (f2 - f1) / (u2 - u1)
        return math.log(root) / math.log(LOAD_STEP) if root > 0 else None

    return guess


# ----------------------------------------------------------------------------------------------
# one cell (runs in a worker)

def work_cell(task: CellTask) -> dict:
    """One cell: mode "span", the longest span for the column's load; mode "load", the largest load at
    the column's span. A JSON-ready dict (SI)."""
    from sizer.parallel import catalogue_folders

    try:
        paths = catalogue_folders(task.catalogue)
        if task.spec.mode == "span":
            return longest_span(task.spec, task.section, task.spec.loads[task.column], paths)
        return largest_load(task.spec, task.section, task.spec.lengths[task.column], paths)
    except InputError as error:
        return error_result(error)


def longest_span(spec: SpanTableSpec, section: str, load: AppliedLoad, catalogue: Sequence[Path]) -> dict:
    """The longest span (a multiple of the resolution, up to max_span) that passes every check under `load`."""
    highest = math.floor(spec.max_span / spec.resolution + 1e-9)
    found = largest_passing(lambda k: run_trial(spec, section, k * spec.resolution, load, catalogue),
                            round(min(FIRST_SPAN, spec.max_span) / spec.resolution), 1, highest, span_guess(spec.resolution))
    return {"load": load.value, "kind": load.kind, "longest_span": found.passing * spec.resolution if found.passing is not None else None,
            "governing": found.governing_of(found.failing),
            "beyond_limit": found.failing is None, "checks_made": len(found.trials)}


def largest_load(spec: SpanTableSpec, section: str, span: float, catalogue: Sequence[Path]) -> dict:
    """The largest multiple of the given load (0.5 % steps) that passes every check at span `span`."""
    base = run_trial(spec, section, span, spec.load.scaled(0.0), catalogue)
    row = {"length": span, "kind": spec.load.kind, "largest_load": None, "governing": base.governing, "beyond_limit": False, "checks_made": 1}
    if not base.passes:
        return row
    found = largest_passing(lambda k: run_trial(spec, section, span, spec.load.scaled(LOAD_STEP ** k), catalogue),
                            0, -LOAD_GRID, LOAD_GRID, load_guess(base))
    if found.passing is None:
        return {**row, "governing": found.governing_of(found.failing), "checks_made": 1 + len(found.trials)}
    return {**row, "largest_load": spec.load.value * LOAD_STEP ** found.passing,
            "governing": found.governing_of(found.failing),
            "beyond_limit": found.failing is None, "checks_made": 1 + len(found.trials)}


# ----------------------------------------------------------------------------------------------
# the whole table

def table_sections(spec: SpanTableSpec, catalogue: Sequence[Path], families: Sequence[str],
                   build_progress: BuildProgress | None = None) -> tuple[list[tuple[str, float]], Any]:
    """(name, mass per length in kg/m) of every catalogue section after the family filter, lightest
    first, and the catalogue; the material is looked up now (bad input before any work)."""
    from sizer.design import catalogue_for, resolve_material
    from sizer.sections.properties import SCALAR_NAMES, section_table

    probe = trial_member(spec, "probe", 1.0, spec.loads[0] if spec.loads else spec.load)
    loaded = catalogue_for(probe, [Path(path) for path in catalogue])
    try:
        material = resolve_material(probe, loaded)
    except InputError as error:
        raise span_table_error(spec, InputError(spec.path, "member.material", error.problem, error.fix)) from None
    specs = loaded.select(families)
    if not specs:
        raise InputError(", ".join(map(str, loaded.files)) or "the catalogue", "sections", "the catalogue holds no sections",
                         "add [[sections]] entries, or pass --catalogue with a stock list")
    def build(progress: Any) -> Any:
        return section_table(specs, progress=progress)

    table = build_progress(BUILD_DESCRIPTION, build) if build_progress is not None else build(None)
    areas = table[:, SCALAR_NAMES.index("area")]
    masses = [(spec_.name, float(area) * material.density) for spec_, area in zip(specs, areas)]
    return sorted(masses, key=lambda item: (item[1], item[0])), loaded


def settings_digest(spec: SpanTableSpec) -> str:
    """The content hash of the table's settings (not its file's path or comments), made once per table."""
    return content_hash({name: getattr(spec, name) for name in SpanTableSpec.__dataclass_fields__ if name not in ("path", "text")})


def cell_key(task: CellTask, settings: str) -> str:
    """The content hash of a cell's work: the table's settings (their digest `settings`), the
    section, the column and the catalogue's text (each cell's key costs the same however many columns
    the table has; sizer's code is in the kept file's seal: sizer.cache_store)."""
    return content_hash("span-table-cell", settings, task.section, task.column, task.catalogue.digest)


def run_span_table(spec: SpanTableSpec, catalogue: Sequence[Path] = (), families: Sequence[str] = (), jobs: int | None = None,
                   cluster: str | None = None, show_progress: bool = True, build_progress: BuildProgress | None = None) -> SpanTableResult:
    """Every section's cells (in parallel), sections by mass per length; `build_progress(description,
    work)` runs work(progress) showing the section properties computed first (render.sections)."""
    with Workers(jobs, cluster) as workers:
        sections, loaded = table_sections(spec, catalogue, families, build_progress)
        shipped = ship_catalogue(loaded.files)
        settings = settings_digest(spec)
        tasks = (CellTask(spec, name, column, shipped) for name, _ in sections for column in range(spec.columns))
        work = (Job(cell_key(task, settings), task, task.section) for task in tasks)  # the first cell starts at once
        try:
            results, summary = run_jobs(workers, work_cell, work, "Cells", show_progress=show_progress, total=len(sections) * spec.columns)
        except JobFailed as failed:
            raise failed.error from None
    for result in results:
        if (error := result_error(result)) is not None:
            raise error
    rows = [{"section": name, "mass_per_length": mass, "rows": results[k * spec.columns:(k + 1) * spec.columns]}
            for k, (name, mass) in enumerate(sections)]
    return SpanTableResult(spec, rows, summary, span_table_notes(spec, summary))


def span_table_notes(spec: SpanTableSpec, summary: RunSummary) -> list[str]:
    """Every assumption the table rests on, in words."""
    from sizer.phrase import fq, phrase

    layout = {"simple": "simply supported (pin at end A, roller at end B)", "cantilever": "cantilever (fixed at end A, tip free)",
              "continuous": f"continuous over {spec.spans} equal spans (pin at end A, rollers at the other supports)"}[spec.layout]
    restraint = {"continuous": "held sideways and against twist at the top all along (a deck)",
                 "supports": "held sideways and against twist only at the supports"}[spec.restraint] if isinstance(spec.restraint, str) else \
        phrase("held sideways and against twist at the top by point restraints every ", fq("spacing", spec.restraint, "length"),
               " from each span's start")
    notes = [f"Layout: {layout}; the section in {spec.orientation} orientation, material {spec.material}.",
             phrase("Restraint: ", restraint, "."),
             "Loads act along y (negative: downward); a uniform load is on every span, a point load at the middle of each span"
             + (" (at the tip)" if spec.layout == "cantilever" else "") + ".",
             "Self-weight " + (f"in case '{spec.self_weight}'." if spec.self_weight else "left out (self_weight = false).")]
    if spec.dead_load is not None:
        notes.append(phrase("Dead load ", fq("dead_load", spec.dead_load, "force_per_length"), f" on every span in case '{DEAD}'."))
    combos = user_combinations(spec)
    notes.append("Combinations: " + "; ".join(f"{name} = " + " + ".join(f"{factor:g} x {case}" for case, factor in factors.items())
                                               for name, factors in combos.items() if isinstance(factors, dict)) + ".")
    if spec.spans > 1:
        notes.append(f"Pattern loading: each combination with the imposed load is checked for every arrangement of loaded spans "
                     f"({2 ** spec.spans - 1} arrangements).")
    if spec.mode == "span":
        notes.append(phrase("Longest span found on a ", fq("resolution", spec.resolution, "dimension"), " grid up to ",
                            fq("max_span", spec.max_span, "length"), ": it passes every check and the next step fails. Spans are each span's length."))
    else:
        notes.append("Largest load found in 0.5 % steps: it passes every check and 0.5 % more fails.")
    notes.append("Every trial is the full check of `sizer check`; the search assumes the utilization rises with span (or load) and "
                 "finds one boundary where it does not.")
    notes.append(summary.note("cells"))
    return notes
