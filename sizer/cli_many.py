"""`sizer schedule` and `sizer span-table`: many members or many cells in one run, on the local cores
(--jobs) or on a Dask cluster (--cluster). Thin typer layer; the work is in sizer.schedule,
sizer.span_table and sizer.parallel, the output in sizer.render.schedule."""

from __future__ import annotations

import sys
from pathlib import Path
from typing import Any, Callable, List, Optional

import typer

from sizer.cli_common import CATALOGUE_OPTION, FAMILY_OPTION, JSON_OPTION, guarded, unit_system, units_option
from sizer.errors import InputError

JOBS_OPTION = typer.Option(None, "--jobs", help="Local processes to use (default and at most: every core).", show_default=False)
CLUSTER_OPTION = typer.Option(None, "--cluster", help="Run on the Dask scheduler at this address, e.g. tcp://10.0.0.5:8786 "
                              "(pip install 'sizer\\[cluster]'; the workers need sizer installed).")
CSV_OPTION = typer.Option(None, "--csv", help="Also write the rows as CSV (SI base units) to this file.")
UNITS_OPTION = units_option("m, kN, kg", "ft, kip, lb", "; JSON and CSV stay in SI")


def register(app: typer.Typer) -> None:
    """Add the commands to the main app."""
    app.command(name="schedule")(schedule)
    app.command(name="span-table")(span_table)


def jobs_option(text: str | None) -> int | None:
    """--jobs as a whole number of 1 or more (more than the cores run on the cores); InputError otherwise."""
    if text is None:
        return None
    digits = text.strip()
    if not digits.isascii() or not digits.isdigit() or int(digits[:12]) < 1:
        raise InputError("", "--jobs", f"{text[:40]!r} is not a number of processes", "give --jobs 1 or more (default: every core)")
    return int(digits[:12]) if len(digits) <= 12 else 10**12


def _check_output(path: Optional[Path], suffixes: tuple[str, ...], option: str, inputs: list[Path]) -> None:
    """Before any work: `path` ends in one of `suffixes` and sizer may write it (files.check_output:
    not an input, an existing folder it can write, not read-only)."""
    from sizer.files import check_output

    if path is None:
        return
    if path.suffix.lower() not in suffixes:
        raise InputError("", option, f"cannot write {str(path)!r}: the file name must end in {' or '.join(suffixes)}",
                         f"give a name such as out{suffixes[0]}")
    check_output(path, option, inputs)


def _records_folder(out: Path) -> Path:
    """Where a schedule's HTML record puts each member's calculation record: OUT_records/ beside it."""
    return out.with_name(out.stem + "_records")


@guarded
def schedule(
    file: Path = typer.Argument(..., help="Schedule file (TOML, or CSV with a header row).", show_default=False),
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    jobs: Optional[str] = JOBS_OPTION,
    cluster: Optional[str] = CLUSTER_OPTION,
    keep_going: bool = typer.Option(False, "--keep-going", help="Run the good rows when some are bad; list the bad ones at the end (exit 2)."),
    json_output: bool = JSON_OPTION,
    csv_out: Optional[Path] = CSV_OPTION,
    out: Optional[Path] = typer.Option(None, "-o", "--out", help="Write an HTML record of the schedule, linking each member's calculation record."),
    units_system: str = UNITS_OPTION,
) -> int:
    """Size or check every member of a schedule: one table, totals by section, the cautions.
    Exit 0 all pass, 1 a member fails, 2 bad input."""
    from sizer.cache_store import require_writable_cache
    from sizer.files import check_record_folder
    from sizer.render.schedule import schedule_csv, schedule_renderables
    from sizer.schedule import read_schedule, run_schedule, schedule_json

    processes, system, catalogues = jobs_option(jobs), unit_system(units_system), catalogue or []
    inputs = [file, *catalogues]
    written = [(csv_out, (".csv",), "--csv"), (out, (".html", ".htm"), "-o")]
    _check_outputs(written, inputs)
    if out is not None:
        check_record_folder(_records_folder(out), "-o")
    require_writable_cache()
    plan = read_schedule(file)
    _check_outputs(written, inputs + [plan.path.parent / row.file for row in plan.rows])
    from sizer.render.report import report_html

    result = run_schedule(plan, catalogues, processes, cluster, keep_going, record=report_html if out is not None else None)
    document = schedule_json(result)
    outputs: list[tuple[Path, str | bytes]] = [(csv_out, schedule_csv(document))] if csv_out is not None else []
    if out is not None:
        outputs += _schedule_record(out, document, result.records, system)
    _write_and_show(outputs, document, json_output, lambda width: schedule_renderables(document, system))
    if result.errors:
        return 2
    return 0 if document["totals"]["passes"] else 1


@guarded
def span_table(
    file: Path = typer.Argument(..., help="Span-table file (TOML).", show_default=False),
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    family: Optional[List[str]] = FAMILY_OPTION,
    jobs: Optional[str] = JOBS_OPTION,
    cluster: Optional[str] = CLUSTER_OPTION,
    json_output: bool = JSON_OPTION,
    csv_out: Optional[Path] = CSV_OPTION,
    plot: Optional[Path] = typer.Option(None, "--plot", help="Draw load against span, one curve per section, to a PNG or SVG file."),
    units_system: str = UNITS_OPTION,
) -> int:
    """For each catalogue section, the longest span for each load, or the largest load at each span,
    found on the full check. Exit 0 done, 2 bad input."""
    from sizer.cache_store import require_writable_cache
    from sizer.render.schedule import span_plot_bytes, span_table_csv, span_table_renderables
    from sizer.results.schedule import span_table_document
    from sizer.span_table import read_span_table, run_span_table

    processes, system, catalogues = jobs_option(jobs), unit_system(units_system), catalogue or []
    inputs = [file, *catalogues]
    _check_output(csv_out, (".csv",), "--csv", inputs)
    if plot is not None:
        from sizer.files import check_output
        from sizer.render.plots import check_plot_path

        check_plot_path(plot)
        check_output(plot, "--plot", inputs)
    require_writable_cache()
    spec = read_span_table(file)
    from sizer.render.sections import with_build_progress

    result = run_span_table(spec, catalogues, family or [], processes, cluster, build_progress=with_build_progress)
    document = span_table_document(spec.title, spec.mode, result.sections, result.notes, spec.resolution)
    outputs: list[tuple[Path, str | bytes]] = [(csv_out, span_table_csv(document))] if csv_out is not None else []
    if plot is not None:
        outputs.append((plot, span_plot_bytes(document, check_plot_path(plot), system)))
    _write_and_show(outputs, document, json_output, lambda width: span_table_renderables(document, width, system))
    return 0


def _check_outputs(outputs: list[tuple[Path | None, tuple[str, ...], str]], inputs: list[Path]) -> None:
    """_check_output on each (path, suffixes, option)."""
    for path, suffixes, option in outputs:
        _check_output(path, suffixes, option, inputs)


def _schedule_record(out: Path, document: dict, records: dict[str, str], system: str) -> list[tuple[Path, str | bytes]]:
    """(path, text) of each member's calculation record in OUT_records/, then of OUT.html itself."""
    from sizer.render.schedule import record_names, schedule_html

    folder = _records_folder(out)
    names = record_names([row["mark"] for row in document["members"] if row["mark"] in records])
    written: list[tuple[Path, str | bytes]] = [(folder / name, records[mark]) for mark, name in names.items()]
    return written + [(out, schedule_html(document, {mark: f"{folder.name}/{name}" for mark, name in names.items()}, system))]


def _write_and_show(outputs: list[tuple[Path, str | bytes]], document: dict, json_output: bool, parts: Callable[[int], list[Any]]) -> None:
    """Write every output file (none left behind if one fails), then show the document: JSON on
    stdout, or on the terminal the `parts` for its width."""
    from sizer.files import write_all
    from sizer.render.common import console, dumps

    write_all(outputs)
    if json_output:
        sys.stdout.write(dumps(document) + "\n")
        return
    terminal = console()
    for part in parts(terminal.width):
        terminal.print(part)
