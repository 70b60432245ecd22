"""What every command shares: one line and exit code 2 for bad input, the unit-system option."""

from __future__ import annotations

from enum import Enum
from typing import Callable

import typer

from sizer.errors import InputError


class UnitSystem(str, Enum):
    si = "si"
    us = "us"


def run_guarded(work: Callable[[], int]) -> None:
    """Run a command body; bad input -> one line on stderr, exit 2; otherwise exit with its code."""
    try:
        code = work()
    except InputError as error:
        typer.echo(f"sizer: {error}", err=True)
        raise typer.Exit(2) from None
    raise typer.Exit(code)
