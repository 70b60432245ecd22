"""Text from input files shown as text only: control characters (escape sequences, bell, carriage
return, newline, the C1 controls, bidirectional overrides) written as visible escapes such as
"\\x1b", so that a name or mark can neither move the cursor, erase a verdict, recolour the screen nor
start a new line of output. Used on every terminal, CSV and HTML output (member files refuse such
characters outright: sizer.inputfile.reader.refuse_control_characters)."""

from __future__ import annotations

import re
from functools import lru_cache
from typing import Any

# C0 controls, DEL, C1 controls, and the Unicode controls that reorder or hide text
_CONTROLS = re.compile("[\x00-\x1f\x7f-\x9f\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2069\ufeff]")
_CONTROLS_BUT_LINES = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2069\ufeff]")


def _visible(match: re.Match[str]) -> str:
    code = ord(match.group())
    return f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}"


def printable(text: str) -> str:
    """`text` with every control character written as a visible escape (newlines too: one line)."""
    return _CONTROLS.sub(_visible, text)


def printable_lines(text: str) -> str:
    """`text` with every control character but newline and tab written as a visible escape (for
    whole blocks of output that sizer lays out in lines itself)."""
    return _CONTROLS_BUT_LINES.sub(_visible, text)


def find_control(text: str) -> str | None:
    """The first control character of `text` as a visible escape, or None."""
    match = _CONTROLS.search(text)
    return _visible(match) if match else None


def safe_console(**options: Any) -> Any:
    """A rich Console that writes every control character of the text it is given as a visible
    escape (newlines and tabs kept), so that no name, mark or title from an input file can send the
    terminal an escape sequence: only rich's own styles and cursor moves pass."""
    return _safe_console_class()(**options)


@lru_cache(maxsize=1)
def _safe_console_class() -> type:
    from rich.console import Console
    from rich.segment import Segment

    class SafeConsole(Console):
        def _render_buffer(self, buffer: Any) -> str:
            return super()._render_buffer(segment if segment.control else Segment(printable_lines(segment.text), segment.style)
                                          for segment in buffer)

    return SafeConsole
