"""Reading values out of a parsed TOML file with errors that name file, key and line: the key's
line (KeyLines), quantities with their units (Reader), TOML syntax errors, and heights on the section.
"""

from __future__ import annotations

import math
import re
import tomllib
from pathlib import Path
from typing import Any, overload

from sizer import units
from sizer.errors import InputError
from sizer.model import ACROSS_NAMES, DEFAULT_ACROSS, HEIGHT_FACES
from sizer.printable import printable

LARGEST_NUMBER = 1e6  # plain numbers (factors, limits, ratios) are at most this in size (docs/limits.md)
DEFLECTION_LIMITS = (1.0, 10_000.0)  # span / limit: from span / 1 to span / 10000 (docs/limits.md)
SAFETY_FACTORS = (1.0, 100.0)  # buckling_safety_factor: at least 1 (a factor below 1 raises the allowable)


class KeyLines:
    """Finds the line of a dotted key such as "loads[2].fy" (the second [[loads]] entry; entries count
    from 1) in TOML text (best effort, for messages)."""

    _array = re.compile(r"^\s*\[\[\s*([^\]]+?)\s*\]\]")
    _table = re.compile(r"^\s*\[\s*([^\]]+?)\s*\]")
    _key = re.compile(r"""^\s*("[^"]*"|'[^']*'|[A-Za-z0-9_.-]+)\s*=""")

    def __init__(self, text: str) -> None:
        self.lines: dict[str, int] = {}
        counts: dict[str, int] = {}
        prefix = ""
        for number, line in enumerate(text.splitlines(), start=1):
            if match := self._array.match(line):
                name = _unquote_dotted(match.group(1))
                counts[name] = counts.get(name, 0) + 1  # entries count from 1, as a reader counts them
                prefix = f"{name}[{counts[name]}]"
                self.lines.setdefault(prefix, number)
            elif match := self._table.match(line):
                prefix = _unquote_dotted(match.group(1))
                self.lines.setdefault(prefix, number)
            elif match := self._key.match(line):
                key = _unquote_dotted(match.group(1))
                self.lines.setdefault(f"{prefix}.{key}" if prefix else key, number)

    def find(self, key: str) -> int | None:
        """Line of `key`, or of its nearest enclosing table or entry."""
        while key:
            if key in self.lines:
                return self.lines[key]
            key = key.rsplit(".", 1)[0] if "." in key else ""
        return None


def _unquote_dotted(text: str) -> str:
    parts = re.findall(r'"[^"]*"|\'[^\']*\'|[^.\s]+', text)
    return ".".join(part.strip("\"'") for part in parts)


class Reader:
    """Reads values out of one parsed TOML file, raising InputError with file, key and line."""

    def __init__(self, path: Path, text: str) -> None:
        self.file = str(path)
        self.key_lines = KeyLines(text)

    def error(self, key: str, problem: str, fix: str = "") -> InputError:
        return InputError(self.file, key, problem, fix, self.key_lines.find(key))

    def quantity(self, table: dict, name: str, kind: str, key_prefix: str, default: Any = None) -> Any:
        """Parse table[name] as `kind`; `default` if absent (None means optional)."""
        if name not in table:
            return default
        key = f"{key_prefix}.{name}" if key_prefix else name
        return units.parse(table[name], kind, self.file, key, self.key_lines.find(key))

    def required_quantity(self, table: dict, name: str, kind: str, key_prefix: str, fix: str) -> float:
        if name not in table:
            raise self.error(f"{key_prefix}.{name}", f"'{name}' is missing", fix)
        return self.quantity(table, name, kind, key_prefix)

    def number(self, value: Any, key: str, positive: bool = True) -> float:
        """A plain (unitless) finite number, at most LARGEST_NUMBER in size."""
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise self.error(key, f"expected a plain number, got {str(value)[:40]!r}", "write a number without quotes, e.g. 1.35")
        if isinstance(value, float) and not math.isfinite(value):
            raise self.error(key, f"{value!r} is not a finite number", "give a finite number")
        if abs(value) > LARGEST_NUMBER:
            raise self.error(key, f"{str(value)[:40]} is larger than sizer accepts", f"give a number up to {LARGEST_NUMBER:g} in size (see docs/limits.md)")
        if positive and value <= 0:
            raise self.error(key, f"{value!r} must be greater than zero", "give a positive number")
        return float(value)

    def number_in(self, value: Any, key: str, low: float, high: float, meaning: str) -> float:
        """A plain number from `low` to `high` (docs/limits.md); `meaning` says what it is, for the fix."""
        number = self.number(value, key)
        if not low <= number <= high:
            raise self.error(key, f"{number:g} is outside the range sizer accepts ({low:g} to {high:g}: {meaning})",
                             f"give a number from {low:g} to {high:g} (see docs/limits.md)")
        return number

    def table(self, value: Any, key: str) -> dict:
        if not isinstance(value, dict):
            raise self.error(key, "expected a table", f"write it as [{key}] or {{ ... }}")
        return value

    def known_keys(self, table: dict, allowed: set[str] | tuple[str, ...], key_prefix: str) -> None:
        for name in table:
            if name not in allowed:
                key = f"{key_prefix}.{name}" if key_prefix else name
                raise self.error(key, f"unknown key '{name}'", "use one of: " + ", ".join(sorted(allowed)))

    def position(self, table: dict, name: str, key_prefix: str, length: float, default: float | None = None) -> float:
        """A position along the member, 0 <= x <= L."""
        if name not in table:
            if default is None:
                raise self.error(f"{key_prefix}.{name}", f"'{name}' is missing", 'give the position, e.g. at = "2 m"')
            return default
        x = self.quantity(table, name, "length", key_prefix)
        if x < -1e-12 * length or x > length * (1 + 1e-12):
            raise self.error(f"{key_prefix}.{name}", f"{table[name]!r} is off the member (length {units.fmt(length, 'length')})",
                             "give a position from 0 m to the member length")
        return min(max(x, 0.0), length)


def parse_toml(text: str, path: Path) -> dict:
    """tomllib with the error turned into InputError; a leading byte-order mark is skipped. A key or
    text value holding a control character (an escape sequence, a newline inside a name) is refused."""
    try:
        data = tomllib.loads(text.removeprefix("\ufeff"))
    except tomllib.TOMLDecodeError as exc:
        match = re.search(r"line (\d+)", str(exc))
        line = int(match.group(1)) if match else None
        raise InputError(str(path), "", f"not valid TOML: {exc}", "correct the TOML syntax", line) from None
    refuse_control_characters(data, path, text)
    return data


def refuse_control_characters(data: Any, path: Path, text: str, key: str = "") -> None:
    """InputError naming the first key whose name or text value holds a control character (names and
    marks are shown as text only: sizer.printable)."""
    from sizer.printable import find_control

    items = data.items() if isinstance(data, dict) else enumerate(data) if isinstance(data, list) else ()
    for name, value in items:
        inner = f"{key}[{name + 1}]" if isinstance(name, int) else (f"{key}.{name}" if key else str(name))
        found = find_control(name) if isinstance(name, str) else None
        found = found or (find_control(value) if isinstance(value, str) else None)
        if found:
            raise InputError(str(path), printable(inner), f"holds the control character {found}",
                             "remove it: names, marks and titles are plain text", KeyLines(text).find(inner))
        if isinstance(value, (dict, list)):
            refuse_control_characters(value, path, text, inner)


@overload
def read_height(reader: Reader, table: dict, prefix: str, default: str) -> str | float: ...
@overload
def read_height(reader: Reader, table: dict, prefix: str, default: None) -> str | float | None: ...
def read_height(reader: Reader, table: dict, prefix: str, default: str | None) -> str | float | None:
    """`height`: "top", "centre", "bottom", or a length from the shear centre along the depth (m,
    positive towards the top); `default` when absent."""
    return _name_or_length(reader, table, prefix, "height", HEIGHT_FACES, default, "a height",
                           'use "top", "centre", "bottom" or a distance from the shear centre such as "+80 mm" or "-40 mm"')


def read_across(reader: Reader, table: dict, prefix: str) -> str | float:
    """`across`: "shear-centre", "centroid" (default) or a distance along z from the shear centre (m)."""
    return _name_or_length(reader, table, prefix, "across", ACROSS_NAMES, DEFAULT_ACROSS, "a place across the section",
                           'use "shear-centre", "centroid" or a distance along z from the shear centre such as "+40 mm"')


def _name_or_length(reader: Reader, table: dict, prefix: str, key: str, names: Any, default: Any, what: str, fix: str) -> Any:
    """A key that is one of `names` or a length (m); `default` when absent; errors name the key and `fix`."""
    if key not in table:
        return default
    value = table[key]
    if isinstance(value, str) and value.strip() in names:
        return value.strip()
    if not isinstance(value, str):
        raise reader.error(f"{prefix}.{key}", f"{value!r} is not {what}", fix)
    try:
        return reader.quantity(table, key, "length", prefix)
    except InputError as error:
        error.fix = fix
        raise


def array_of_tables(reader: Reader, value: Any, name: str) -> list[dict]:
    if not isinstance(value, list) or not all(isinstance(item, dict) for item in value):
        raise reader.error(name, "expected an array of tables", f"write each entry as [[{name}]]")
    return value


def read_bearing(reader: Reader, table: dict, prefix: str) -> tuple[float, bool]:
    """`bearing` (the stiff bearing length along the member, m; default 0: a knife edge) and
    `stiffened` (true: a web stiffener there; default false) of a point load or support."""
    bearing = reader.quantity(table, "bearing", "length", prefix, 0.0)
    if bearing < 0:
        raise reader.error(f"{prefix}.bearing", "a bearing length cannot be negative", 'give e.g. bearing = "100 mm", or leave it out for a knife edge')
    stiffened = table.get("stiffened", False)
    if not isinstance(stiffened, bool):
        raise reader.error(f"{prefix}.stiffened", f"expected true or false, got {stiffened!r}", "write stiffened = true (no quotes)")
    return bearing, stiffened
