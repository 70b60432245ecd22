"""What every command shares: one line and exit code 2 for bad input, the unit-system option."""

from __future__ import annotations

from typing import Callable

import typer

from sizer.errors import InputError

UNIT_SYSTEMS = ("si", "us")


def unit_system(value: str) -> str:
    """The --units value ("si" or "us"); InputError (one line) for anything else."""
    if value not in UNIT_SYSTEMS:
        raise InputError("", "--units", f"unknown unit system {value[:40]!r}", "use --units si or --units us")
    return value


def run_guarded(work: Callable[[], int]) -> None:
    """Run a command body; bad input, a file that cannot be read or written, or a request that runs
    out of memory -> one line on stderr (control characters shown as escapes), exit 2; otherwise
    exit with its code."""
    try:
        code = work()
    except InputError as error:
        _one_line(str(error))
    except MemoryError:
        _one_line("the request needs more memory than this machine has (fix: check fewer combinations or pattern "
                  "arrangements at once, e.g. pattern fewer spans, or use --combination; see docs/limits.md)")
    except OSError as error:
        where = f"{error.filename}: " if error.filename else ""
        _one_line(f"{where}{error.strerror or error} (fix: check the path and its permissions)")
    except RecursionError:
        _one_line("the input is nested too deeply to read (fix: see docs/limits.md)")
    except Exception as error:
        if type(error).__name__ != "BrokenProcessPool":
            raise
        _one_line("a worker process stopped before its job was done (out of memory?) "
                  "(fix: run with --jobs 1 to see which input it was, or make the input smaller)")
    raise typer.Exit(code)


def _one_line(message: str) -> None:
    """`sizer: message` on stderr as one line of plain text, then exit code 2."""
    from sizer.printable import printable

    typer.echo(f"sizer: {printable(message)}", err=True)
    raise typer.Exit(2)
