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
    out of memory -> one line on stderr, exit 2; otherwise exit with its code."""
    try:
        code = work()
    except InputError as error:
        typer.echo(f"sizer: {error}", err=True)
        raise typer.Exit(2) from None
    except MemoryError:
        typer.echo("sizer: the request needs more memory than this machine has (fix: check fewer combinations or pattern "
                   "arrangements at once, e.g. pattern fewer spans, or use --combination)", err=True)
        raise typer.Exit(2) from None
    except OSError as error:
        where = f"{error.filename}: " if error.filename else ""
        typer.echo(f"sizer: {where}{error.strerror or error} (fix: check the path and its permissions)", err=True)
        raise typer.Exit(2) from None
    raise typer.Exit(code)
