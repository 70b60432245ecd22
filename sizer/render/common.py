"""What every output shares: the console, the progress bar, the cautions and notes panels and JSON text
(the cautions and notes themselves are sizer.results data)."""

from __future__ import annotations

from typing import TYPE_CHECKING

from sizer.model import Member
from sizer.printable import safe_console
from sizer.results.jsonable import to_jsonable
from sizer.results.notes import CAUTIONS

if TYPE_CHECKING:
    from rich.console import Console
    from rich.panel import Panel

PIPED_WIDTH = 80  # columns of output written to a file or pipe, unless COLUMNS says otherwise


def console(stderr: bool = False) -> Console:
    """A rich Console: the terminal's width as rich finds it (colour when the terminal supports it);
    PIPED_WIDTH columns when writing to a file or pipe, unless the COLUMNS variable gives a width."""
    import os
    import sys

    stream = sys.stderr if stderr else sys.stdout
    piped = not (hasattr(stream, "isatty") and stream.isatty())
    width = PIPED_WIDTH if piped and not os.environ.get("COLUMNS", "").isdigit() else None
    return safe_console(stderr=stderr, highlight=False, soft_wrap=False, width=width)


def cautions_panel() -> Panel:
    """The cautions in a visible panel (each a paragraph that wraps at the panel's width)."""
    from rich.console import Group
    from rich.panel import Panel

    from sizer.render.text import bullets

    return Panel(Group(*bullets(list(CAUTIONS), "!")), title="[bold]Cautions[/]", title_align="left", border_style="yellow", expand=True)


def notes_panel(notes: list[str], title: str = "Assumptions made", system: str = "si") -> Panel:
    """The assumptions the tool made, one per paragraph, so that none is hidden; SI numbers in the
    notes are shown in the display units of `system` (render.phrases)."""
    from rich.console import Group
    from rich.panel import Panel

    from sizer.render.phrases import in_display_units
    from sizer.render.text import bullets

    return Panel(Group(*bullets([in_display_units(note, system) for note in notes])), title=f"[bold]{title}[/]",
                 title_align="left", border_style="cyan", expand=True)


def patterned(member: Member) -> bool:
    """Whether the member's combinations are pattern arrangements (some of them, the ones that govern)."""
    return member.patterning is not None and bool(member.patterning.switches)


def combinations_words(member: Member, count: int) -> str:
    """"7 combinations", or for pattern arrangements "every pattern arrangement (7 evaluated in full)"."""
    if patterned(member):
        return f"every pattern arrangement ({count} evaluated in full)"
    return f"{count} combination{'' if count == 1 else 's'}"


def dumps(document: dict) -> str:
    """The JSON text of an output document (cautions always included by the caller)."""
    import json

    return json.dumps(to_jsonable(document), indent=2, ensure_ascii=False)
