"""Command bodies: read, resolve, solve, check, render. The CLI module only parses options."""

from __future__ import annotations

import sys
from pathlib import Path
from typing import Any, Sequence

from sizer.errors import InputError


def _print_document(text: str) -> None:
    """A JSON document on stdout."""
    sys.stdout.write(text + "\n")


def run_forces(file: Path, cuts: list[float], combination: str | None, catalogue: Sequence[Path],
               json_output: bool, plot: Path | None, system: str) -> int:
    """`sizer forces`: exit 0 (nothing to fail)."""
    import numpy as np

    from sizer.design import prepare
    from sizer.inputfile import read_member_file
    from sizer.render.common import console, dumps, member_notes
    from sizer.render.forces import default_cuts, forces_json, print_forces

    if plot is not None:
        from sizer.render.plots import check_plot_path

        check_plot_path(plot)
    member = read_member_file(file)
    for x in cuts:
        if x < 0 or x > member.length * (1 + 1e-12):
            raise InputError("", "--at", f"the cut at {x:g} m is off the member (length {member.length:g} m)", "give a position from 0 to the member length")
    if combination is not None and combination not in member.combinations:
        raise InputError("", "--combination", f"no combination is named {combination!r}", "use one of: " + ", ".join(member.combinations))
    design = prepare(member, catalogue)
    combinations = [combination] if combination else list(member.combinations)
    notes = member_notes(member) + design.notes
    xs = np.asarray(cuts, dtype=float) if cuts else default_cuts(member)
    if plot is not None:
        from sizer.render.plots import plot_member

        plot_member(design, plot, combinations[0])
    if json_output:
        _print_document(dumps(forces_json(design.solution, combinations, xs, notes)))
        return 0
    section_line = design.spec.name if design.spec is not None else "none (forces only)"
    print_forces(console(), design.solution, combinations, np.asarray(cuts) if cuts else None, notes, system, section_line)
    return 0


def checked_design(file: Path, section: str | None, catalogue: Sequence[Path]) -> tuple[Any, Any, list[str]]:
    """Read, resolve, solve and check one section: (design, check report, every assumption made).
    Shared by `sizer check` and `sizer report`, so both say the same."""
    from sizer.checks import check_design
    from sizer.design import prepare
    from sizer.inputfile import read_member_file
    from sizer.render.common import member_notes
    from sizer.sections import unit_stress_field

    member = read_member_file(file)
    design = prepare(member, catalogue, section, need_section=True)
    report = check_design(design, unit_stress_field(design.spec))
    return design, report, member_notes(member) + design.notes + report.notes


def run_check(file: Path, section: str | None, catalogue: Sequence[Path], json_output: bool, plot: Path | None, system: str) -> int:
    """`sizer check`: exit 0 when the section passes every check, 1 when it fails."""
    from sizer.render.check import check_json, print_check
    from sizer.render.common import console, dumps

    if plot is not None:
        from sizer.render.plots import check_plot_path

        check_plot_path(plot)
    design, report, notes = checked_design(file, section, catalogue)
    if plot is not None:
        from sizer.render.plots import plot_member

        governing = report.governing.combination if report.governing else design.solution.combination_names[0]
        plot_member(design, plot, governing, report)
    if json_output:
        _print_document(dumps(check_json(design, report, notes)))
    else:
        print_check(console(), design, report, notes, system)
    return 0 if report.passes else 1


def run_size(file: Path, catalogue: Sequence[Path], families: list[str], max_depth: str | None, max_width: str | None,
             top: int, json_output: bool, system: str) -> int:
    """`sizer size`: exit 0 when a section passes, 1 when none does."""
    from sizer import units
    from sizer.design import catalogue_for, resolve_material
    from sizer.inputfile import read_member_file
    from sizer.render.common import console, dumps, member_notes
    from sizer.render.sections import with_build_progress
    from sizer.render.size import print_size, size_json
    from sizer.sizing import size_member

    member = read_member_file(file)
    depth = units.parse(max_depth, "length", "", "--max-depth") if max_depth else None
    width = units.parse(max_width, "length", "", "--max-width") if max_width else None
    if top < 0:
        raise InputError("", "--top", "must be zero or more", "give e.g. --top 3")
    catalogue_data = catalogue_for(member, catalogue)
    material = resolve_material(member, catalogue_data)
    result = with_build_progress("Section properties (first use of these shapes)",
                                 lambda progress: size_member(member, catalogue_data, material, families, depth, width, top, progress))
    notes = member_notes(member) + result.notes
    if result.chosen is not None:
        notes += result.chosen.report.notes
    if json_output:
        _print_document(dumps(size_json(result, notes)))
    else:
        print_size(console(), result, notes, top, system)
    return 0 if result.chosen is not None else 1


def run_report(file: Path, out: Path, section: str | None, catalogue: Sequence[Path], system: str) -> int:
    """Write the calculation record of `file` to `out` (.html, or .pdf with weasyprint beside the HTML).
    Exit code 0 when the section passes every check, 1 when it fails; InputError for bad input."""
    from sizer.render.report import check_report_path, write_report

    check_report_path(out)
    design, report, notes = checked_design(file, section, catalogue)
    written = write_report(design, report, notes, out, system)
    verdict = "passes" if report.passes else "FAILS"
    governing = report.governing
    detail = f" (governing: {governing.check}, utilization {governing.utilization:.3f})" if governing else ""
    sys.stdout.write(f"{report.section} {verdict}{detail}. Calculation record: {', '.join(map(str, written))}\n")
    if Path(out).suffix.lower() == ".pdf" and Path(out) not in written:
        sys.stderr.write("sizer: no PDF made: weasyprint is not installed; open the HTML in a browser and print it to PDF.\n")
    return 0 if report.passes else 1
