"""The `sizer` command: a thin typer layer. Each command is a plain typed function, its options in and
its exit code out, run by `cli_common.guarded`: every InputError becomes one line on stderr and exit
code 2. Heavy modules are imported inside the commands so that `sizer --help` starts at once."""

from __future__ import annotations

import gc
from pathlib import Path
from typing import Any, List, Optional

import typer

from sizer.cli_common import CATALOGUE_OPTION, FAMILY_OPTION, JSON_OPTION, guarded, unit_system, units_option

app = typer.Typer(
    name="sizer",
    help="Internal forces, stress checks and sizing of one straight member, from a small TOML file.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)


FILE_ARGUMENT = typer.Argument(..., help="Member file (TOML).", show_default=False)
UNITS_OPTION = units_option("kN, m, MPa", "kip, ft, ksi")
PLOT_OPTION = typer.Option(None, "--plot", help="Draw the diagrams to a PNG or SVG file.")


def _show_version(value: bool) -> None:
    """--version: print the version and stop."""
    if value:
        from sizer import __version__

        typer.echo(f"sizer {__version__}")
        raise typer.Exit(0)


@app.callback()
def main_options(
    version: bool = typer.Option(False, "--version", help="Show the version and exit.", callback=_show_version, is_eager=True),
) -> None:
    """Internal forces, stress checks and sizing of one straight member, from a small TOML file."""


def parse_cuts(values: list[str] | None) -> list[float]:
    """--at values ("2.5m", "1500 mm") to metres."""
    from sizer import units

    return [units.parse(text, "length", "", "--at") for text in values or []]


@app.command()
@guarded
def forces(
    file: Path = FILE_ARGUMENT,
    at: Optional[List[str]] = typer.Option(None, "--at", help='A cut position with its unit ("2.5m", "1500 mm"); may repeat. '
                                           "Gives the actions there, and with a section the displacements and twist."),
    combination: Optional[str] = typer.Option(None, "--combination", help="Only this combination (with all its pattern arrangements)."),
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    json_output: bool = JSON_OPTION,
    plot: Optional[Path] = PLOT_OPTION,
    envelope: bool = typer.Option(False, "--envelope", help="The largest and smallest of each action, reaction and deflection "
                                  "over every combination and pattern arrangement, with the combination that gives each."),
    second_order: bool = typer.Option(False, "--second-order", help="Actions and displacements of a second-order elastic solve "
                                      "(as `check` uses; needs a section); default first order (linear, superposable)."),
    units_system: str = UNITS_OPTION,
) -> int:
    """Reactions, internal actions and displacements at cuts, extremes and deflections for every
    combination (pattern arrangements included); --envelope for their largest and smallest."""
    from sizer.commands import run_forces

    return run_forces(file, parse_cuts(at), combination, catalogue or [], json_output, plot, unit_system(units_system), envelope,
                      second_order)


@app.command()
@guarded
def check(
    file: Path = FILE_ARGUMENT,
    section: Optional[str] = typer.Option(None, "--section", help="Check this catalogue section instead of the member file's."),
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    json_output: bool = JSON_OPTION,
    plot: Optional[Path] = PLOT_OPTION,
    units_system: str = UNITS_OPTION,
) -> int:
    """Every check for one section: demand, allowable, utilization, the governing case and the verdict.
    Exit 0 passes, 1 fails, 2 bad input."""
    from sizer.commands import run_check

    return run_check(file, section, catalogue or [], json_output, plot, unit_system(units_system))


@app.command()
@guarded
def size(
    file: Path = FILE_ARGUMENT,
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    family: Optional[List[str]] = FAMILY_OPTION,
    max_depth: Optional[str] = typer.Option(None, "--max-depth", help='Largest depth as installed, e.g. "300 mm".'),
    max_width: Optional[str] = typer.Option(None, "--max-width", help='Largest width as installed, e.g. "150 mm".'),
    top: int = typer.Option(3, "--top", help="How many runners-up to show on each side of the choice."),
    check_runners_up: bool = typer.Option(False, "--check-runners-up", help="Check the runners-up after the choice in full "
                                          "(default: shown from proven lower bounds, not checked)."),
    by: str = typer.Option("mass", "--by", help="Rank by mass (per length), cost (of the bars the member takes) or depth."),
    include_unstocked: bool = typer.Option(False, "--include-unstocked", help="Rank sections not stocked, or longer than every "
                                           "stock length, with the others (default: after them)."),
    json_output: bool = JSON_OPTION,
    report_out: Optional[Path] = typer.Option(None, "--report", help="Also write the calculation record of the chosen section (.html)."),
    units_system: str = UNITS_OPTION,
) -> int:
    """The lightest (or cheapest, or shallowest) catalogue section that passes every check, and why
    each one ranked before it fails. Exit 0 found, 1 nothing passes, 2 bad input."""
    from sizer.commands import run_size

    return run_size(file, catalogue or [], family or [], max_depth, max_width, top, json_output, unit_system(units_system),
                    report_out, by, include_unstocked, check_runners_up)


@app.command()
@guarded
def report(
    file: Path = FILE_ARGUMENT,
    out: Path = typer.Option(..., "-o", "--out", help="The calculation record to write (.html)."),
    section: Optional[str] = typer.Option(None, "--section", help="Report this catalogue section instead of the member file's."),
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    units_system: str = UNITS_OPTION,
) -> int:
    """A self-contained HTML calculation record for a reviewer. Exit 0 passes, 1 fails, 2 bad input."""
    from sizer.commands import run_report

    return run_report(file, out, section, catalogue or [], unit_system(units_system))


@app.command()
@guarded
def init(
    out: Path = typer.Option(Path("member.toml"), "-o", "--out", help="The member file to write (never overwritten)."),
    layout: str = typer.Option("simple", "--layout", help="The layout: simple, cantilever, continuous or post."),
    units_system: str = typer.Option("si", "--units", help="Units of the values written: si (m, kN, MPa) or us (ft, kip, ksi)."),
) -> int:
    """Write a commented starter member file for a common layout, to edit and run."""
    from sizer.starter import write_starter

    written = write_starter(out, layout, unit_system(units_system))
    typer.echo(f"Wrote {written} ({layout} layout). Edit it, then run: sizer check {written}")
    return 0


def _mount_optional_commands() -> None:
    """Commands that live in their own modules."""
    from sizer.cli_sections import app as sections_app

    app.add_typer(sections_app, name="sections", help="Keep the catalogue: list, show, add, build, import.")
    from sizer.cli_many import register
    register(app)


def flow_help(typer_app: typer.Typer) -> None:
    """Each command's help is its docstring as one paragraph, so the help screens wrap it at whole
    words instead of keeping the source's line breaks (which parted sentences)."""
    import inspect

    for info in typer_app.registered_commands:
        if info.help is None and info.callback is not None and info.callback.__doc__:
            info.help = " ".join((inspect.getdoc(info.callback) or "").split())
    for group in typer_app.registered_groups:
        if group.typer_instance is not None:
            flow_help(group.typer_instance)


_mount_optional_commands()
flow_help(app)


def main() -> None:
    """Console entry point. The linear algebra here is many small matrices, where a multi-threaded
    BLAS only spins: one thread each unless the user's environment says otherwise. The methods of
    the dataclasses it imports are compiled once and kept (sizer.method_cache)."""
    from sizer import method_cache

    single_threaded_blas()
    fewer_collections()
    methods = method_cache.install()
    try:
        code = run_app()
    finally:
        gc.freeze()  # the command is done: its objects end with the process, without a last full collection
        method_cache.save(methods)
    raise SystemExit(code)


def run_app(args: list[str] | None = None) -> int:
    """Run the command line (`args`, else sys.argv) and return the exit code. A mistake on the command
    line itself (a missing option, an unknown one, a value of the wrong type) is one line on stderr
    naming the fix, exit code 2, like any other bad input."""
    click = _click_module()
    try:
        code = app(args=args, prog_name="sizer", standalone_mode=False)
    except click.exceptions.ClickException as error:
        if type(error).__name__ == "NoArgsIsHelpError":  # the help is shown already
            return error.exit_code
        from sizer.printable import printable

        where = f"{error.ctx.command_path} --help" if getattr(error, "ctx", None) is not None else "sizer --help"
        typer.echo(f"sizer: command line: {printable(error.format_message())} (fix: see {where})", err=True)
        return error.exit_code
    except typer.Abort:
        typer.echo("sizer: stopped", err=True)
        return 1
    return code if isinstance(code, int) else 0


def _click_module() -> Any:
    """The click that typer runs on: its own copy (typer >= 0.26) or the click package."""
    try:
        from typer import _click

        return _click
    except ImportError:  # pragma: no cover - older typer
        import click

        return click


def fewer_collections() -> None:
    """Collect cyclic garbage every 20,000 new objects instead of every 700. A command builds its
    long-lived working set at once (imported modules, the catalogue, the candidates), which the
    default thresholds have the collector walk over and over: 60 to 100 ms of a 0.6 s `sizer size`
    (benchmarks/bench_size.py). Garbage stays bounded in long runs (schedules, span tables)."""
    gc.set_threshold(20_000, 10, 10)


def single_threaded_blas() -> None:
    """Ask OpenBLAS, MKL and OpenMP for one thread (before numpy is imported), unless already set."""
    import os

    for name in ("OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS", "OMP_NUM_THREADS"):
        os.environ.setdefault(name, "1")


if __name__ == "__main__":  # pragma: no cover
    main()
