"""The API's results shown at the edge: the same dataclasses as sizer.api returns, made to show
themselves as rich text in a terminal (`rich.print(result)`) and as HTML in a notebook. sizer.forces,
sizer.check and sizer.size (the package's names, through sizer.commands.notebook) return these; sizer.api
itself stays data only."""

from __future__ import annotations

from dataclasses import fields
from typing import TYPE_CHECKING, Any

from sizer.api import CheckOutcome, ForcesOutcome, SizeOutcome

if TYPE_CHECKING:
    from rich.console import Console, ConsoleOptions, RenderResult


class ShownForces(ForcesOutcome):
    """A ForcesOutcome that shows itself."""

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from sizer.render.forces import forces_renderables

        yield from forces_renderables(self.design.solution, list(self.combinations), None, self.notes, self.units,
                                      self.section or "none (forces only)")

    def _repr_html_(self) -> str:
        from sizer.render.report import forces_summary_html

        return forces_summary_html(self.design, list(self.combinations), self.notes, self.units)


class ShownCheck(CheckOutcome):
    """A CheckOutcome that shows itself."""

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from sizer.render.check import check_renderables

        yield from check_renderables(self.design, self.report, self.notes, self.units)

    def _repr_html_(self) -> str:
        from sizer.render.report import check_summary_html

        return check_summary_html(self.design, self.report, self.notes, self.units)


class ShownSize(SizeOutcome):
    """A SizeOutcome that shows itself (and its chosen section's check)."""

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from sizer.render.size import size_renderables

        yield from size_renderables(self.result, self.notes, self.top, self.units)

    def _repr_html_(self) -> str:
        from sizer.render.report import size_summary_html

        return size_summary_html(self.result, self.notes, self.top, self.units)


SHOWN: dict[type, type] = {ForcesOutcome: ShownForces, CheckOutcome: ShownCheck, SizeOutcome: ShownSize}


def shown(outcome: Any) -> Any:
    """The outcome (sizer.api) as the same data that shows itself; any other value as it is."""
    kind = SHOWN.get(type(outcome))
    if kind is None:
        return outcome
    values = {item.name: getattr(outcome, item.name) for item in fields(outcome)}
    if isinstance(outcome, SizeOutcome):
        values["chosen"] = shown(outcome.chosen)
    return kind(**values)
