"""Command bodies: each calls the Python API (sizer.api) and renders its result; the CLI module only
parses options. Every function returns the exit code (0 done and passing, 1 done and failing).
`notebook` gives the package's API functions whose results show themselves (sizer/__init__.py)."""

from __future__ import annotations

import sys
from pathlib import Path
from typing import TYPE_CHECKING, Any, Callable, Sequence

from sizer.errors import InputError

if TYPE_CHECKING:
    from sizer.api import SizeOutcome


def _print_document(document: dict) -> None:
    """A JSON document on stdout."""
    from sizer.render.common import dumps

    sys.stdout.write(dumps(document) + "\n")


def _check_plot(plot: Path | None, inputs: Sequence[Path]) -> None:
    """InputError (before any work) unless `plot` is None or an image file sizer may write."""
    if plot is not None:
        from sizer.files import check_output
        from sizer.render.plots import check_plot_path

        check_plot_path(plot)
        check_output(plot, "--plot", inputs)


def run_forces(file: Path, cuts: list[float], combination: str | None, catalogue: Sequence[Path],
               json_output: bool, plot: Path | None, system: str, envelope: bool = False, second_order: bool = False) -> int:
    """`sizer forces`: exit 0 (nothing to fail). `envelope`: the largest and smallest over the
    combinations (terminal, JSON and plot); `second_order`: second-order actions and displacements."""
    import numpy as np

    from sizer import api
    from sizer.render.common import console
    from sizer.render.forces import print_forces

    _check_plot(plot, [file, *catalogue])
    member = api.read_member(file)
    for x in cuts:
        if x < 0 or x > member.length * (1 + 1e-12):
            raise InputError("", "--at", f"the cut at {x:g} m is off the member (length {member.length:g} m)", "give a position from 0 to the member length")
    outcome = api.forces(member, None, catalogue, combination, system, second_order)
    if plot is not None:
        from sizer.render.plots import plot_envelope, plot_member

        if envelope:
            plot_envelope(outcome.design, plot, list(outcome.combinations), system)
        else:
            plot_member(outcome.design, plot, outcome.combinations[0], system=system)
    if json_output:
        _print_document(outcome.to_json(cuts or None, envelope))
        return 0
    print_forces(console(), outcome.design.solution, list(outcome.combinations), np.asarray(cuts) if cuts else None, outcome.notes,
                 system, outcome.section or "none (forces only)", envelope)
    return 0


def run_check(file: Path, section: str | None, catalogue: Sequence[Path], json_output: bool, plot: Path | None, system: str) -> int:
    """`sizer check`: exit 0 when the section passes every check, 1 when it fails."""
    from sizer import api

    _check_plot(plot, [file, *catalogue])
    outcome = api.check(file, section, catalogue, system)
    if plot is not None:
        from sizer.render.plots import plot_member

        governing = outcome.report.governing
        combination = governing.combination if governing and governing.combination else outcome.design.solution.combination_names[0]
        plot_member(outcome.design, plot, combination, outcome.report, system)
    if json_output:
        _print_document(outcome.to_json())
    else:
        from sizer.render.check import print_check
        from sizer.render.common import console

        print_check(console(), outcome.design, outcome.report, outcome.notes, system)
    return 0 if outcome.passes else 1


def run_size(file: Path, catalogue: Sequence[Path], families: list[str], max_depth: str | None, max_width: str | None,
             top: int, json_output: bool, system: str, report_out: Path | None = None, by: str = "mass",
             include_unstocked: bool = False, check_runners_up: bool = False) -> int:
    """`sizer size`: exit 0 when a section passes, 1 when none does. `report_out`: also write the
    calculation record of the chosen section there (a line on stderr says where, or why not)."""
    from sizer import api
    from sizer.render.sections import with_build_progress

    if report_out is not None:
        from sizer.render.report import check_report_path

        check_report_path(report_out, [file, *catalogue])
    from sizer.sizing.cost import RANKINGS

    if by not in RANKINGS:
        raise InputError("", "--by", f"unknown ranking {by!r}", "use one of: " + ", ".join(RANKINGS))
    member = api.read_member(file)
    outcome = with_build_progress("Section properties (first use of these shapes)",
                                  lambda progress: api.size(member, catalogue, families, max_depth, max_width, top, system, progress,
                                                                     by, include_unstocked, check_runners_up=check_runners_up))
    if json_output:
        _print_document(outcome.to_json())
    else:
        from sizer.render.common import console
        from sizer.render.size import print_size  # the terminal's renderers only where drawn

        print_size(console(), outcome.result, outcome.notes, top, system)
    if report_out is not None:
        _write_chosen_record(outcome, report_out, system)
    return 0 if outcome.passes else 1


def _write_chosen_record(outcome: SizeOutcome, out: Path, system: str) -> None:
    """The calculation record of the section `size` chose (sizer.api.SizeOutcome), or a line saying
    that nothing passed, so there is no record."""
    from sizer.render.report import write_report

    chosen = outcome.chosen
    if chosen is None:
        sys.stderr.write(f"sizer: no section passes, so no calculation record was written to {out}.\n")
        return
    written = write_report(chosen.design, chosen.report, chosen.notes, out, system)
    sys.stderr.write(f"Calculation record of {chosen.section}: {', '.join(map(str, written))}\n")


def run_report(file: Path, out: Path, section: str | None, catalogue: Sequence[Path], system: str) -> int:
    """Write the calculation record of `file` to `out` (.html, or .pdf with weasyprint beside the HTML).
    Exit code 0 when the section passes every check, 1 when it fails; InputError for bad input."""
    from sizer import api
    from sizer.render.report import check_report_path, write_report

    check_report_path(out, [file, *catalogue])
    outcome = api.check(file, section, catalogue, system)
    written = write_report(outcome.design, outcome.report, outcome.notes, out, system)
    from sizer.render.check import status_word

    verdict = status_word(outcome.passes)
    governing = outcome.report.governing
    detail = f" (governing: {governing.check}, utilization {governing.utilization:.3f})" if governing else ""
    sys.stdout.write(f"{outcome.section} {verdict}{detail}. Calculation record: {', '.join(map(str, written))}\n")
    return 0 if outcome.passes else 1


def notebook(name: str) -> Callable[..., Any]:
    """The API function `name` of sizer.api ("forces", "check" or "size") returning its result made to
    show itself in a terminal and a notebook (render.outcomes)."""
    from functools import wraps

    from sizer import api
    from sizer.render.outcomes import shown

    function = getattr(api, name)

    @wraps(function)
    def call(*args: Any, **options: Any) -> Any:
        return shown(function(*args, **options))

    return call
