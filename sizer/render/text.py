"""Terminal layout of our own: paragraphs that wrap at the width rich gives them without ever
parting a number from its unit (or a symbol from "= value"), headings that wrap instead of being
cut, and ledgers: tables whose rows may carry a dim second line (the row's basis), and that fold
columns onto that line when the width is short rather than cutting or splitting cells.

Widths are terminal cells (rich.cells.cell_len). Text may carry rich markup.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Iterator

from sizer import units

if TYPE_CHECKING:
    from rich.console import Console, ConsoleOptions, RenderResult

INDENT = 2  # cells before a row's second line
GAP = 2  # cells between ledger columns

_UNIT_LABELS = sorted({unit.label for system in units.DISPLAY.values() for unit in system.values()} | {"%"}, key=len, reverse=True)
_NUMBER_UNIT = re.compile(r" (?<=[\d.] )(?=(?:" + "|".join(map(re.escape, _UNIT_LABELS)) + r")(?![\w⁰-⁹²³¹]))")
_SYMBOL_EQUALS = re.compile(r" (?<=\S )= (?=\S)")
_RANGE = re.compile(r" (?<=\d )to (?=[-+\d])")
_OPERATOR = re.compile(r" (?<=\S )([/x×]) (?=\S)")
_AXIS_WORD = re.compile(r" (?:(?<=\w )(?=\((?:major|minor)\))|(?<=\bEN )(?=[xyz]-[xyz])|(?<=AISC )(?=[xyz]-[xyz]))")
# "Iz (major)" and "EN y-y" stay on one line. Each pattern starts with its space (then looks behind it), so
# that the regular-expression engine finds its candidates by a fast search for the space.


def glued(plain: str) -> str:
    """`plain` with the spaces that must not break replaced by no-break spaces (same length): between
    a number and its unit, around "=", around "/", "x" and "×" between terms, before a " · "
    separator, inside "a to b" ranges of numbers, and between a symbol and its axis word ("Iz (major)")."""
    text = _NUMBER_UNIT.sub("\xa0", plain)
    text = _AXIS_WORD.sub("\xa0", text)
    text = _SYMBOL_EQUALS.sub("\xa0=\xa0", text)
    text = _OPERATOR.sub(lambda match: "\xa0" + match.group(1) + "\xa0", text)
    text = text.replace(" ·", "\xa0·")
    return _RANGE.sub("\xa0to\xa0", text)


def _pieces(plain: str, glue: str, start: int, end: int, room: int) -> list[tuple[int, int]]:
    """A glued word [start, end) wider than `room` cut into pieces: at its no-break spaces where it
    must (never between a number and its unit), and only where none serves, inside a word."""
    from rich.cells import cell_len

    keep = {match.start() for match in _NUMBER_UNIT.finditer(plain, start, end)}
    spaces = [i for i in range(start, end) if glue[i] == "\xa0" and i not in keep]
    pieces = []
    while cell_len(plain[start:end]) > room:
        fitting = [i for i in spaces if start < i and cell_len(plain[start:i]) <= room]
        cut = fitting[-1] if fitting else start + room
        pieces.append((start, cut))
        start = cut + 1 if fitting else cut
    return pieces + [(start, end)]


def _cell_offsets(plain: str) -> list[int]:
    """offsets[i] = the cells of plain[:i], so that plain[a:b] takes offsets[b] - offsets[a] cells."""
    from itertools import accumulate

    from rich.cells import cell_len

    if plain.isascii():
        return list(range(len(plain) + 1))
    widths = {character: cell_len(character) for character in set(plain)}
    if all(width == 1 for width in widths.values()):
        return list(range(len(plain) + 1))
    return list(accumulate((widths[character] for character in plain), initial=0))


def _line_breaks(plain: str, width: int, first: int, rest: int) -> list[tuple[int, int]]:
    """(start, end) of each line of `plain` wrapped greedily at its ordinary spaces and newlines;
    the first line has `first` cells of room, the others `rest`."""
    offsets = _cell_offsets(plain)
    glue = glued(plain)
    lines: list[tuple[int, int]] = []
    offset = 0
    for part in glue.split("\n"):
        start = end = offset
        empty = True
        for word in re.finditer(r"[^ ]+", part):
            w_start, w_end = offset + word.start(), offset + word.end()
            room = max(1, first if not lines else rest)
            if not empty and offsets[w_end] - offsets[start] > room:
                lines.append((start, end))
                start, empty, room = w_start, True, max(1, rest)
            if offsets[w_end] - offsets[start] > room:
                *whole, (w_start, w_end) = _pieces(plain, glue, start, w_end, room)
                lines += whole
                start = w_start
            empty, end = False, w_end
        lines.append((start, end))
        offset += len(part) + 1
    return lines


def wrap(text: Any, width: int, hang: int = 0) -> list[Any]:
    """`text` (rich markup or a rich Text) as lines of rich Text no wider than `width`; lines after
    the first are indented by `hang` cells."""
    from rich.text import Text

    body = Text.from_markup(text) if isinstance(text, str) else text
    lines = []
    for index, line in enumerate(_sliced(body, _line_breaks(body.plain, width, width, width - hang))):
        if index and hang:
            line = Text(" " * hang) + line
        lines.append(line)
    return lines


def _sliced(body: Any, breaks: list[tuple[int, int]]) -> list[Any]:
    """body[start:end] for each (start, end) of `breaks`: by one division of the text at every break
    (the lines, and what lies between them) where the breaks run in order, else slice by slice."""
    offsets = [offset for line in breaks for offset in line]
    if any(later < earlier for earlier, later in zip(offsets, offsets[1:])):
        return [body[start:end] for start, end in breaks]
    pieces = body.divide(offsets)
    return [pieces[2 * index + 1] for index in range(len(breaks))]


class Paragraph:
    """Text that wraps at the width it is given (see `glued`); `hang` indents the lines after the
    first, `indent` every line."""

    def __init__(self, text: Any, style: str = "", hang: int = 0, indent: int = 0) -> None:
        self.text, self.style, self.hang, self.indent = text, style, hang, indent

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from rich.segment import Segment

        for line in wrap(self.text, max(1, options.max_width - self.indent), self.hang):
            if self.style:
                line.stylize(self.style)
            if self.indent:
                yield Segment(" " * self.indent)
            yield from line.render(console)
            yield Segment.line()


def bullets(items: list[str], mark: str = "•") -> list[Paragraph]:
    """One hanging paragraph per item."""
    from rich.markup import escape

    return [Paragraph(f"{mark} {escape(item)}", hang=len(mark) + 1) for item in items]


class Heading:
    """A title that wraps (never cut), underlined across the width with a heavy rule."""

    def __init__(self, text: str, rule: str = "━") -> None:
        self.text, self.rule = text, rule

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from rich.text import Text

        yield Paragraph(f"[bold]{self.text}[/]")
        yield Text(self.rule * options.max_width, style="dim")


@dataclass
class Column:
    """A ledger column: its header, right or left justified; `fold`: moves to the row's second line
    when the width is short (the rightmost first); `wrap`: a text column that may wrap."""

    header: str
    right: bool = False
    fold: bool = False
    wrap: bool = False


@dataclass
class Row:
    cells: list[str]
    note: str = ""
    style: str = ""
    group: str = ""  # a group heading line instead of a row when set


@dataclass
class Ledger:
    """A table of our own: a bold title, a dim header with a thin rule, rows of cells, each with an
    optional dim second line indented under it, and an optional caption. Cells are rich markup;
    cells never wrap except in `wrap` columns."""

    title: str
    columns: list[Column]
    caption: str = ""
    rows: list[Row] = field(default_factory=list)

    def add_row(self, *cells: str, note: str = "", style: str = "") -> None:
        self.rows.append(Row(list(cells), note, style))

    def add_group(self, text: str) -> None:
        self.rows.append(Row([], group=text))

    def _cells(self) -> list[list[Any]]:
        """Each row's cells as rich Text (measured, then drawn: the markup is parsed once)."""
        from rich.text import Text

        return [[Text.from_markup(cell) for cell in row.cells] for row in self.rows]

    def _widths(self, cells: list[list[Any]]) -> dict[int, int]:
        """Each column's width: its widest cell or its header."""
        from rich.cells import cell_len

        lines = [row_cells for row, row_cells in zip(self.rows, cells) if not row.group]
        return {i: max([cell_len(column.header)] + [cell_len(row_cells[i].plain) for row_cells in lines])
                for i, column in enumerate(self.columns)}

    def layout(self, width: int, cells: list[list[Any]]) -> tuple[list[int], dict[int, int]]:
        """The columns kept on the row line and their widths (`cells`: the rows' cells as Text): foldable
        columns leave from the right until the rest fits; then wrap columns narrow (to no less than
        their header and 12 cells); then, on a very narrow terminal, any column but the first leaves."""
        from rich.cells import cell_len

        shown = list(range(len(self.columns)))
        widths = self._widths(cells)

        def excess() -> int:
            return sum(widths[i] for i in shown) + GAP * (len(shown) - 1) - width

        for i in reversed(range(1, len(self.columns))):
            if excess() > 0 and self.columns[i].fold:
                shown.remove(i)
        for i in shown:
            if excess() > 0 and self.columns[i].wrap:
                widths[i] = max(cell_len(self.columns[i].header), 12, widths[i] - excess())
        for i in reversed(range(1, len(self.columns))):
            if excess() > 0 and i in shown:
                shown.remove(i)
        return shown, widths

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from rich.text import Text

        width = options.max_width
        parsed = self._cells()
        shown, widths = self.layout(width, parsed)
        folded = [i for i in range(len(self.columns)) if i not in shown]
        yield Paragraph(f"[bold]{self.title}[/]")
        header = [Text(self.columns[i].header, style="dim") for i in shown]
        yield from self._line(header, shown, widths, "")
        yield Text("─" * min(width, sum(widths[i] for i in shown) + GAP * (len(shown) - 1)), style="dim")
        for row, row_cells in zip(self.rows, parsed):
            if row.group:
                yield Paragraph(f"[italic]{row.group}[/]")
                continue
            cells = [row_cells[i] for i in shown]
            yield from self._line(cells, shown, widths, row.style)
            extra = " · ".join(f"{self.columns[i].header} {row.cells[i]}" for i in folded if row.cells[i])
            note = " · ".join(part for part in (row.note, extra) if part)
            if note:
                yield Paragraph(note, style="dim", indent=INDENT)
        if self.caption:
            yield Paragraph(self.caption, style="dim")

    def _line(self, cells: list[Any], shown: list[int], widths: dict[int, int], style: str) -> Iterator[Any]:
        """One table line (several when a wrap column wraps)."""
        from rich.text import Text

        columns = [self.columns[i] for i in shown]
        wrapped = [wrap(cell, widths[i]) if column.wrap else [cell] for cell, i, column in zip(cells, shown, columns)]
        for k in range(max(len(lines) for lines in wrapped)):
            line = Text()
            for n, (lines, i, column) in enumerate(zip(wrapped, shown, columns)):
                cell = lines[k] if k < len(lines) else Text("")
                pad = " " * max(0, widths[i] - cell.cell_len)
                if column.right:
                    line.append(pad).append(cell)
                else:
                    line.append(cell + pad)  # the cell's own style reaches over its padding
                if n < len(shown) - 1:
                    line.append(" " * GAP)
            line.rstrip()
            if style:
                line.stylize(style)
            yield line
