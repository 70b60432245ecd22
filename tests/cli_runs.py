"""Running the command line in-process and judging bad input, shared by the hardening tests."""

from __future__ import annotations

from pathlib import Path

from typer.testing import CliRunner

from sizer.cli import app


def run(*args: str | Path) -> object:
    return CliRunner().invoke(app, [str(arg) for arg in args])


def bad_input(result: object, *words: str) -> str:
    """Exit 2, one line on stderr holding `words`, nothing on stdout, no traceback."""
    assert result.exit_code == 2, (result.exit_code, result.stdout, result.stderr)
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("sizer: "), result.stderr
    assert "Traceback" not in result.stderr and result.stdout == ""
    for word in words:
        assert word in lines[0], (word, lines[0])
    return lines[0]
