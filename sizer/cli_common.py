"""What every command shares: the options several commands take (defined here once), the unit-system
check, and the guard that gives one line and exit code 2 for bad input.

The convention: a command is one plain typed function, its options as parameters, that reads them,
calls the API (or the command bodies of sizer.commands) and returns the exit code; `guarded` runs it
and turns its errors into one line.
"""

from __future__ import annotations

import functools
from typing import Any, Callable, ParamSpec

import typer

from sizer.errors import InputError

UNIT_SYSTEMS = ("si", "us")

Options = ParamSpec("Options")


def catalogue_option(more: str = "") -> Any:
    """--catalogue (may repeat); `more` ends the help (a default, say)."""
    return typer.Option(None, "--catalogue", help="Catalogue file or folder; may repeat." + more)


def units_option(si: str, us: str, more: str = "") -> Any:
    """--units, the display units: `si` and `us` name the units shown; `more` ends the help."""
    return typer.Option("si", "--units", help=f"Display units: si ({si}) or us ({us}){more}.")


CATALOGUE_OPTION = catalogue_option()
JSON_OPTION = typer.Option(False, "--json", help="JSON in SI base units on stdout.")
FAMILY_OPTION = typer.Option(None, "--family", help="Only sections of this family; may repeat.")


def unit_system(value: str) -> str:
    """The --units value ("si" or "us"); InputError (one line) for anything else."""
    if value not in UNIT_SYSTEMS:
        raise InputError("", "--units", f"unknown unit system {value[:40]!r}", "use --units si or --units us")
    return value


def guarded(command: Callable[Options, int]) -> Callable[Options, None]:
    """The command as typer runs it: `command` (options in, exit code out) under run_guarded."""

    @functools.wraps(command)
    def run(*args: Options.args, **kwargs: Options.kwargs) -> None:
        run_guarded(functools.partial(command, *args, **kwargs))

    return run


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
