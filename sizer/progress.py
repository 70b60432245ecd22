"""The one progress bar: on stderr (stdout stays clean for JSON, CSV and TOML), made with rich:
what is worked on, the bar, the count done, the time taken, an estimate of the time left and the
name of the last item done. It appears only once `begin()` is called (so that rich's imports, some
20 ms, delay no work, and a run with nothing to do shows none) and goes when the work is done,
unless asked to stay (`transient=False`); a bar that goes is not made at all where nobody sees it
(stderr a file or a pipe).
"""

from __future__ import annotations

from typing import Any


class ProgressBar:
    """A context giving the progress bar, when `shown`: `begin()` shows it, `advance(label)` counts one
    item done; `report(done, total, label)` sets the count and shows the bar while work is left (a
    progress callback of sizer.api)."""

    def __init__(self, description: str, total: int | None = None, shown: bool = True, transient: bool = True) -> None:
        self.description, self.total, self.shown, self.transient = description, total, shown, transient
        self.done = 0
        self.bar: Any = None
        self.task: Any = None

    def __enter__(self) -> "ProgressBar":
        return self

    def __exit__(self, *exc: Any) -> None:
        if self.bar is not None:
            self.bar.stop()

    def begin(self) -> None:
        """Show the bar (once). A bar that goes when done draws nothing where stderr is neither a
        terminal nor a notebook (rich writes a live display only there): then none is made."""
        if self.shown and self.bar is None:
            from sizer.printable import safe_console

            console = safe_console(stderr=True)
            if self.transient and not (console.is_terminal or console.is_jupyter):
                self.shown = False
                return
            from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn, TimeRemainingColumn

            self.bar = Progress(TextColumn(self.description), BarColumn(), MofNCompleteColumn(), TimeElapsedColumn(),
                                TextColumn("left"), TimeRemainingColumn(), TextColumn("{task.fields[label]}", markup=False),
                                console=console, transient=self.transient)
            self.bar.start()
            self.task = self.bar.add_task(self.description, total=self.total, completed=self.done, label="")

    def advance(self, label: str = "") -> None:
        """One more item done (`label` names it); shown only once begun."""
        self.done += 1
        if self.bar is not None:
            self.bar.update(self.task, completed=self.done, label=label)

    def report(self, done: int, total: int | None, label: str = "") -> None:
        """`done` of `total` items done, the last named `label`; the bar is shown at the first report
        that leaves work to do."""
        self.done, self.total = done, total
        if self.bar is None and total is not None and done < total:
            self.begin()
        if self.bar is not None:
            self.bar.update(self.task, completed=done, total=total, label=label)
