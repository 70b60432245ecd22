"""`sizer report` command body: check one section and write the calculation record (HTML)."""

from __future__ import annotations

import sys
from pathlib import Path
from typing import Sequence


def run_report(file: Path, out: Path, section: str | None, catalogue: Sequence[Path], system: str) -> int:
    """Write the calculation record of `file` to `out` (.html, or .pdf with weasyprint beside the HTML).
    Exit code 0 when the section passes every check, 1 when it fails; InputError for bad input."""
    from sizer.commands import checked_design
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
