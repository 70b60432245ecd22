"""The one error type for bad input: it carries file, key, line and the fix, and prints as one line."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass
class InputError(Exception):
    """Bad input from the user. `str()` gives the single line the CLI prints (exit code 2).

    file: the file at fault ("" when the fault is on the command line);
    key: dotted key inside it, e.g. "loads[2].fy" or "--at";
    problem: what is wrong; fix: how to mend it; line: 1-based line where known.
    """

    file: str
    key: str
    problem: str
    fix: str = ""
    line: int | None = None

    def __str__(self) -> str:
        where = self.file or "command line"
        if self.line is not None:
            where += f":{self.line}"
        text = f"{where}: {self.key}: {self.problem}" if self.key else f"{where}: {self.problem}"
        if self.fix:
            text += f" (fix: {self.fix})"
        return text
