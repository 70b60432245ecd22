"""Schedules: many members, each a member file with optional overrides, sized or checked in one run.

A schedule is TOML (`title`, `[[members]]`) or CSV (a header row with the same column names):
mark (unique), file (relative to the schedule), do ("size" | "check"; default size, or check where
the file or the row names a section), quantity (default 1), and the overrides length, section and
material. A length override moves every position in the file (supports, hinges, loads, restraints)
in proportion, so supports at the ends stay at the ends; the row's notes say so.

Each row is run through `sizer.api.size` or `sizer.api.check` exactly as `sizer size` / `sizer check`
run that member, in parallel (sizer.parallel). Every row is read and its section and material
looked up before any work starts, so bad input stops the run at once (or, with keep_going, is listed
at the end while the other rows run).
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any, Callable, Iterator, Literal, Sequence, overload

from sizer.errors import InputError
from sizer.files import read_text
from sizer.printable import find_control
from sizer.model import LineLoad, Member, PointLoad
from sizer.cache_store import content_hash
from sizer.parallel import Job, JobFailed, RunSummary, ShippedCatalogue, run_jobs, ship_catalogue
from sizer.workers import Workers, error_result, result_error

TOP_KEYS = ("title", "members")
MAX_QUANTITY = 1_000_000  # members of one row, at most (docs/limits.md)
MAX_ROWS = 100_000  # rows of one schedule, at most
ROW_KEYS = ("mark", "file", "do", "quantity", "length", "section", "material")
DO_CHOICES = ("size", "check")
RecordMaker = Callable[[Any, Any, list[str], str], str]  # (design, report, notes, units) -> a calculation record (HTML), e.g. render.report.report_html
TEXT_EXAMPLES = {"mark": 'give e.g. mark = "B1"', "file": 'give the member file, e.g. file = "beams/b1.toml"', "do": 'write do = "size" or "check"',
                 "section": 'give a catalogue name, e.g. section = "IPE 200"', "material": 'give e.g. material = "mild-steel"'}


@dataclass(frozen=True)
class ScheduleRow:
    """One row as written: `where` names it in messages ("members[3]" or "row 4"); lengths in m."""

    where: str
    line: int | None
    mark: str
    file: str
    do: str | None = None
    quantity: int = 1
    length: float | None = None
    section: str | None = None
    material: str | None = None


@dataclass(frozen=True)
class Schedule:
    path: Path
    title: str
    rows: tuple[ScheduleRow, ...]


@dataclass(frozen=True)
class RowTask:
    """What a worker needs for one row: the member (overrides applied), what to do, the catalogue's
    text, and what makes the member's calculation record (HTML; None: no record)."""

    do: str
    member: Member
    section: str | None
    catalogue: ShippedCatalogue
    record: RecordMaker | None = None


@dataclass
class RowError:
    """A bad row: where it is and the one-line message."""

    mark: str
    where: str
    message: str


@dataclass
class ScheduleResult:
    """Every good row (the JSON entries of docs/design.md section 11, plus the record's HTML where made), the bad
    rows, and how the run went."""

    schedule: Schedule
    rows: list[dict]
    errors: list[RowError] = field(default_factory=list)
    summary: RunSummary = field(default_factory=RunSummary)
    records: dict[str, str] = field(default_factory=dict)  # mark -> calculation record HTML


# ----------------------------------------------------------------------------------------------
# reading

def read_schedule(path: str | Path) -> Schedule:
    """A schedule file (TOML, or CSV by its .csv suffix) read into rows; InputError names file, row and key."""
    path = Path(path)
    text = read_text(path, "the schedule")
    rows = _csv_rows(path, text) if path.suffix.lower() == ".csv" else None
    title = ""
    if rows is None:
        title, rows = _toml_rows(path, text)
    if not rows:
        raise InputError(str(path), "members", "the schedule lists no members", 'add [[members]] with mark = "B1" and file = "b1.toml"')
    if len(rows) > MAX_ROWS:
        raise InputError(str(path), "members", f"the schedule lists {len(rows)} members, more than sizer runs at once ({MAX_ROWS})",
                         "split it into several schedules")
    _check_unique_marks(path, rows)
    return Schedule(path, title, tuple(rows))


def _toml_rows(path: Path, text: str) -> tuple[str, list[ScheduleRow]]:
    from sizer.inputfile import Reader, parse_toml

    data = parse_toml(text, path)
    reader = Reader(path, text)
    reader.known_keys(data, TOP_KEYS, "")
    title = data.get("title", "")
    if not isinstance(title, str):
        raise reader.error("title", f"expected text, got {title!r}", 'write e.g. title = "Mezzanine M1 beams"')
    entries = data.get("members", [])
    if not isinstance(entries, list) or not all(isinstance(entry, dict) for entry in entries):
        raise reader.error("members", "expected [[members]] entries", 'write each member as [[members]] with mark and file')
    rows = []
    for index, entry in enumerate(entries, start=1):
        where = f"members[{index}]"
        reader.known_keys(entry, ROW_KEYS, where)
        rows.append(_row(path, where, reader.key_lines.find(where), entry))
    return title, rows


def _csv_rows(path: Path, text: str) -> list[ScheduleRow]:
    """The rows of a CSV schedule (a leading byte-order mark, as spreadsheets write, is skipped)."""
    try:
        return _csv_table_rows(path, csv.reader(io.StringIO(text.removeprefix("\ufeff"))))
    except csv.Error as exc:
        raise InputError(str(path), "", f"not a readable CSV table ({exc})",
                         f"give one row per member, each cell under {csv.field_size_limit()} characters") from None


def _csv_table_rows(path: Path, table: Any) -> list[ScheduleRow]:
    header = next(table, None)
    if header is None:
        raise InputError(str(path), "", "the CSV is empty", "write a header row: " + ",".join(ROW_KEYS))
    names = [name.strip() for name in header]
    for name in names:
        if name not in ROW_KEYS:
            raise InputError(str(path), f"column {name!r}", "unknown column", "use the columns " + ", ".join(ROW_KEYS), 1)
    rows = []
    for cells in table:
        line = table.line_num
        if not any(cell.strip() for cell in cells):
            continue
        if len(cells) > len(names):
            raise InputError(str(path), f"row {line}", f"{len(cells)} cells but {len(names)} columns", "give one cell per column", line)
        entry = {name: cell.strip() for name, cell in zip(names, cells) if cell.strip()}
        if "quantity" in entry:
            entry["quantity"] = _csv_integer(entry["quantity"])
        rows.append(_row(path, f"row {line}", line, entry))
    return rows


def _csv_integer(text: str) -> int | str:
    """A CSV cell as a whole number where it is one (anything else is reported by _row)."""
    try:
        return int(text)
    except ValueError:
        return text


def _row(path: Path, where: str, line: int | None, entry: dict) -> ScheduleRow:
    """One row's values checked: mark, file, do, quantity, length, section, material."""
    from sizer import units

    def error(key: str, problem: str, fix: str) -> InputError:
        return InputError(str(path), f"{where}.{key}", problem, fix, line)

    @overload
    def text(key: str, required: Literal[True]) -> str: ...
    @overload
    def text(key: str, required: bool = False) -> str | None: ...
    def text(key: str, required: bool = False) -> str | None:
        value = entry.get(key)
        if value is None and not required:
            return None
        if not isinstance(value, str) or not value.strip():
            raise error(key, f"expected text, got {value!r}" if value is not None else f"'{key}' is missing", TEXT_EXAMPLES[key])
        if (control := find_control(value)) is not None:
            raise error(key, f"holds the control character {control}", "remove it: marks and names are plain text")
        return value.strip()

    do = text("do")
    if do is not None and do not in DO_CHOICES:
        raise error("do", f"unknown action {do!r}", 'use "size" or "check"')
    if do == "size" and entry.get("section") is not None:
        raise error("section", "the row is to be sized, so a section given here would not be used", 'remove section, or write do = "check"')
    quantity = entry.get("quantity", 1)
    if isinstance(quantity, bool) or not isinstance(quantity, int) or not 1 <= quantity <= MAX_QUANTITY:
        raise error("quantity", f"expected a whole number from 1 to {MAX_QUANTITY}, got {str(quantity)[:40]!r}", "write e.g. quantity = 4")
    length = entry.get("length")
    if length is not None:
        length = units.parse(length, "length", str(path), f"{where}.length", line)
        if length <= 0:
            raise error("length", "the length must be greater than zero", 'give e.g. length = "5.4 m"')
    return ScheduleRow(where, line, text("mark", True), text("file", True), do, quantity, length, text("section"), text("material"))


def _check_unique_marks(path: Path, rows: Sequence[ScheduleRow]) -> None:
    seen: dict[str, ScheduleRow] = {}
    for row in rows:
        if row.mark in seen:
            raise InputError(str(path), f"{row.where}.mark", f"mark {row.mark!r} is also used by {seen[row.mark].where}",
                             "marks must be unique in a schedule: rename one", row.line)
        seen[row.mark] = row


# ----------------------------------------------------------------------------------------------
# members

def scaled_member(member: Member, length: float) -> Member:
    """The member at a new length (m): every position (supports, hinges, loads, restraints) moved in
    proportion; loads, sections, materials and checks unchanged."""
    k = length / member.length

    def load(item: Any) -> Any:
        if isinstance(item, PointLoad):
            return replace(item, at=item.at * k)
        if isinstance(item, LineLoad):
            return replace(item, start=item.start * k, end=item.end * k)
        raise TypeError(f"no rule to move a {type(item).__name__}")

    return replace(member, length=length,
                   supports=tuple(replace(s, at=s.at * k) for s in member.supports),
                   hinges=tuple(replace(h, at=h.at * k) for h in member.hinges),
                   loads=tuple(load(item) for item in member.loads),
                   restraints=tuple(replace(r, start=r.start * k, end=r.end * k) for r in member.restraints))


def row_member(schedule: Schedule, row: ScheduleRow) -> tuple[Member, list[str]]:
    """The row's member with its overrides, and a note for each override."""
    from sizer import api
    from sizer.phrase import fq, phrase

    member = api.read_member(schedule.path.parent / row.file)
    notes: list[str] = []
    if row.length is not None and abs(row.length - member.length) > 1e-12 * member.length:
        notes.append(phrase(f"{row.mark}: length ", fq("length", row.length, "length"), " from the schedule instead of ",
                            fq("file_length", member.length, "length"), f" in {row.file}: supports, hinges, loads and restraints moved in "
                            f"proportion (x {row.length / member.length:.4g}); buckling lengths in [checks] kept as written."))
        member = scaled_member(member, row.length)
    if row.material is not None and row.material != member.material:
        notes.append(f"{row.mark}: material {row.material!r} from the schedule instead of {member.material!r}.")
        member = replace(member, material=row.material)
    if row.section is not None and row.section != member.section:
        notes.append(f"{row.mark}: section {row.section!r} from the schedule" + (f" instead of {member.section!r}." if member.section else "."))
    return member, notes


def row_action(row: ScheduleRow, member: Member) -> str:
    """size or check: as the row says; else check where the row or the file names a section."""
    return row.do or ("check" if (row.section or member.section) else "size")


def row_task(schedule: Schedule, row: ScheduleRow, catalogue: Sequence[Path], record: RecordMaker | None,
             catalogues: dict[tuple, tuple[Any, ShippedCatalogue]]) -> tuple[RowTask, list[str]]:
    """The row's task, with its section and material looked up now (so bad input shows before any work)."""
    from sizer.design import catalogue_for, resolve_material

    member, notes = row_member(schedule, row)
    do = row_action(row, member)
    paths = [Path(path) for path in catalogue]
    place = tuple(str(path.resolve()) for path in paths) or ("default", str(Path(member.source).resolve().parent))
    if place not in catalogues:
        loaded = catalogue_for(member, paths)
        catalogues[place] = (loaded, ship_catalogue(loaded.files))
    loaded, shipped = catalogues[place]
    resolve_material(member, loaded)
    section = row.section or (member.section if do == "check" else None)
    if do == "check":
        if section is None:
            raise InputError(member.source, "member.section", "the row is to be checked but names no section",
                             'add section = "NAME" to the member file or the schedule row, or write do = "size"')
        if row.section is None:
            loaded.get(section, member.source, "member.section")
        else:
            loaded.get(section, str(schedule.path), f"{row.where}.section", row.line)
    return RowTask(do, member, section if row.section else None, shipped, record), notes


def row_key(task: RowTask) -> str:
    """The content hash of a row's work: the member as read (not its file's path), the action, the
    section, the catalogue's text and whether a record is made (sizer's code is in the kept file's
    seal: sizer.cache_store)."""
    return content_hash("schedule-row", replace(task.member, source=""), task.do, task.section, task.catalogue.digest, task.record is not None)


# ----------------------------------------------------------------------------------------------
# the work of one row (runs in a worker)

def work_row(task: RowTask) -> dict:
    """Size or check one member exactly as `sizer size` / `sizer check` do; a JSON-ready dict."""
    from sizer import api
    from sizer.parallel import catalogue_folders

    try:
        paths = catalogue_folders(task.catalogue)
        if task.do == "size":
            outcome = api.size(task.member, paths, top=0)  # the row shows the choice only: no runners-up checked in full
            checked = outcome.chosen
            found: dict[str, Any] = {"section": outcome.section, "passes": outcome.passes, "utilization": outcome.utilization,
                     "governing": outcome.governing, "mass_per_length": outcome.mass_per_length, "reserve_factor": outcome.reserve_factor}
            notes = outcome.notes
        else:
            checked = api.check(task.member, task.section, paths)
            found = {"section": checked.section, "passes": checked.passes, "utilization": checked.utilization,
                     "governing": checked.governing, "mass_per_length": checked.design.mass_per_length,
                     "reserve_factor": checked.reserve_factor}
            notes = checked.notes
        found["purchase"] = _purchase(task.member, paths, found["section"])
        record = task.record(checked.design, checked.report, checked.notes, checked.units) if task.record and checked is not None else None
    except InputError as error:
        return error_result(error)
    from sizer.results.jsonable import to_jsonable
    from sizer.phrase import phrase_json

    return to_jsonable({**found, "assumptions": [phrase_json(note) for note in notes], "record": record})


def _purchase(member: Member, paths: Sequence[Path], section: str | None) -> dict | None:
    """The purchase terms of the row's section (its own, else its family's) and the catalogue's currency."""
    if section is None:
        return None
    from sizer.design import catalogue_for
    from sizer.results.cost import purchase_json

    catalogue = catalogue_for(member, paths)
    return purchase_json(catalogue.purchase(catalogue.get(section)), catalogue.currency)


# ----------------------------------------------------------------------------------------------
# the whole schedule

def prepare_tasks(schedule: Schedule, catalogue: Sequence[Path], record: RecordMaker | None, keep_going: bool,
                  errors: list[RowError]) -> Iterator[tuple[ScheduleRow, RowTask, list[str]]]:
    """Every row's task, rows in order, each as soon as it is read (so that the work on the first rows
    starts while the later ones are read); a bad row raises, or with keep_going is added to `errors`."""
    catalogues: dict[tuple, tuple[Any, ShippedCatalogue]] = {}
    for row in schedule.rows:
        try:
            task, notes = row_task(schedule, row, catalogue, record, catalogues)
        except InputError as error:
            wrapped = row_error(schedule, row, error)
            if not keep_going:
                raise wrapped from None
            errors.append(RowError(row.mark, row.where, str(wrapped)))
            continue
        yield row, task, notes


def row_error(schedule: Schedule, row: ScheduleRow, error: InputError) -> InputError:
    """An error met in a row, as one line naming the schedule, the row (and mark) and the original message."""
    if error.file == str(schedule.path):
        return error
    return InputError(str(schedule.path), f"{row.where} (mark {row.mark})", str(error), "", row.line)


def run_schedule(schedule: Schedule, catalogue: Sequence[Path] = (), jobs: int | None = None, cluster: str | None = None,
                 keep_going: bool = False, record: RecordMaker | None = None, show_progress: bool = True) -> ScheduleResult:
    """Size or check every row (in parallel); rows in the schedule's order. InputError for the first bad
    row, unless keep_going (then the bad rows are in `errors` and the rest still run)."""
    tasks: list[tuple[ScheduleRow, RowTask, list[str]]] = []
    errors: list[RowError] = []

    def jobs_as_read() -> Iterator[Job]:
        for row, task, notes in prepare_tasks(schedule, catalogue, record, keep_going, errors):
            tasks.append((row, task, notes))
            yield Job(row_key(task), task, row.mark)

    with Workers(jobs, cluster) as workers:
        try:
            results, summary = run_jobs(workers, work_row, jobs_as_read(), "Members", stop_on_error=not keep_going,
                                           show_progress=show_progress, total=len(schedule.rows))
        except JobFailed as failed:
            raise row_error(schedule, tasks[failed.index][0], failed.error) from None
    rows, records = [], {}
    for (row, task, notes), result in zip(tasks, results):
        error = result_error(result)
        if error is not None:
            errors.append(RowError(row.mark, row.where, str(row_error(schedule, row, error))))
            continue
        if result.get("record"):
            records[row.mark] = result["record"]
        rows.append(schedule_entry(row, task, result, notes))
    return ScheduleResult(schedule, rows, errors, summary, records)


def schedule_entry(row: ScheduleRow, task: RowTask, result: dict, notes: list[str]) -> dict:
    """A row of the JSON document (docs/design.md section 11): the member's result with the schedule's mark,
    quantity and length; total mass = mass per length x length x quantity (kg); the reserve factor;
    the cost of its pieces and their bars (sizer.schedule_cost)."""
    from sizer.phrase import phrase_from_json
    from sizer.schedule_cost import row_cost

    mass = result["mass_per_length"]
    length = task.member.length
    return {
        "mark": row.mark, "file": row.file, "do": task.do,
        "section": result["section"], "passes": result["passes"], "utilization": result["utilization"],
        "governing": result["governing"], "mass_per_length": mass, "quantity": row.quantity, "length": length,
        "total_mass": mass * length * row.quantity if mass is not None else None,
        "reserve_factor": result.get("reserve_factor"), "purchase": result.get("purchase"),
        **row_cost(result, length, row.quantity),
        "assumptions": notes + [phrase_from_json(note) for note in result["assumptions"]],
    }


def schedule_totals(rows: list[dict]) -> dict:
    """Totals (docs/design.md section 11): whether all pass, the failing marks, the total mass (kg), and per
    section (in order of first use) the count, total length (m) and mass (kg), for ordering."""
    by_section: dict[str, dict] = {}
    for row in rows:
        if row["section"] is None:
            continue
        entry = by_section.setdefault(row["section"], {"section": row["section"], "quantity": 0, "length": 0.0, "mass": 0.0})
        entry["quantity"] += row["quantity"]
        entry["length"] += row["length"] * row["quantity"]
        entry["mass"] += row["total_mass"]
    failing = [row["mark"] for row in rows if not row["passes"]]
    totals = {"passes": not failing, "failing": failing, "mass": sum(entry["mass"] for entry in by_section.values()),
              "by_section": list(by_section.values())}
    from sizer.schedule_cost import add_costs

    add_costs(totals, rows)
    return totals


def schedule_notes(result: ScheduleResult) -> list[str]:
    """The run's own assumptions: how and where the rows ran; sizing rows with no passing section."""
    notes = [result.summary.note("members")]
    unsized = [row["mark"] for row in result.rows if row["section"] is None]
    if unsized:
        notes.append("No catalogue section passes for " + ", ".join(unsized) + ": those rows are left out of the totals.")
    return notes


def schedule_json(result: ScheduleResult) -> dict:
    """The `sizer schedule --json` document (docs/design.md section 11)."""
    from sizer.results.schedule import schedule_document

    order = {row.mark: index for index, row in enumerate(result.schedule.rows)}
    errors = [{"mark": error.mark, "where": error.where, "message": error.message} for error in sorted(result.errors, key=lambda e: order[e.mark])]
    from sizer.schedule_cost import cost_notes

    totals = schedule_totals(result.rows)
    return schedule_document(result.schedule.title, result.rows, totals, errors, schedule_notes(result) + cost_notes(totals))
