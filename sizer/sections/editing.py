"""Changing catalogue files: add one section, or import a spreadsheet stock list (CSV).

Files are edited with tomlkit, so the user's comments, order and other entries stay as they were.
Every new entry is checked (dimensions, shape rules, names unique within the file's catalogue
folder) before anything is written, the whole new file is read back as a catalogue before it
replaces the old one, and the write is atomic.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from sizer.errors import InputError
from sizer.files import read_text, write_atomic
from sizer.model import Material
from sizer.sections.catalogue import SectionSpec, load_catalogue, parse_catalogue_text, parse_section
from sizer.sections.shapes import SHAPES

_HEADER = re.compile(r"^\s*([A-Za-z][A-Za-z0-9 _-]*?)\s*(?:[\[(]\s*([^\])]+?)\s*[\])])?\s*$")
_BARE_NUMBER = re.compile(r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$")


class _FixedPlace:
    """Stands in for sizer.inputfile.Reader where the place of every value is already known
    (a command-line option, a CSV row): errors name that file and line, keys pass through."""

    def __init__(self, file: str, line: int | None) -> None:
        self.file = file
        self.key_lines = self
        self._line = line

    def find(self, key: str) -> int | None:
        return self._line

    def error(self, key: str, problem: str, fix: str = "") -> InputError:
        return InputError(self.file, key, problem, fix, self._line)


def _last_key(key: str) -> str:
    """"sections[0].depth" -> "depth"; "" when the key names the whole entry."""
    return key.rsplit(".", 1)[1] if "." in key else ""


def check_entry(table: dict[str, Any], file: str, line: int | None) -> SectionSpec:
    """A new entry's SectionSpec; InputError keyed by the entry's own key (e.g. "depth"). A name or
    value holding a control character is refused (as when the catalogue is read)."""
    from sizer.inputfile.reader import refuse_control_characters

    try:
        refuse_control_characters(table, Path(file), "", "new")
        return parse_section(table, _FixedPlace(file, line), "new")
    except InputError as error:
        error.key = _last_key(error.key)
        error.line = error.line if error.line is not None else line
        raise


def folder_catalogue(file: Path) -> tuple[dict[str, SectionSpec], dict[str, Material]]:
    """Sections and materials of the catalogue folder that holds `file` (empty if it has none)."""
    folder = file.parent
    if not folder.is_dir() or not any(folder.glob("*.toml")):
        return {}, {}
    catalogue = load_catalogue([folder])
    return catalogue.sections, catalogue.materials


def _document(file: Path) -> Any:
    import tomlkit

    if not file.exists():
        return tomlkit.document()
    text = read_text(file)
    try:
        return tomlkit.parse(text)
    except Exception as exc:  # tomlkit's parse errors
        raise InputError(str(file), "", f"not valid TOML: {exc}", "correct the TOML syntax first") from None


def _append(document: Any, tables: list[dict[str, Any]], file: Path | None = None) -> None:
    import tomlkit

    if "sections" not in document:
        document.append("sections", tomlkit.aot())
    entries = document["sections"]
    if not isinstance(entries, tomlkit.items.AoT):
        raise InputError(str(file or ""), "sections", "the file's sections are not written as [[sections]] entries", "edit the file by hand")
    for table in tables:
        item = tomlkit.table()
        for key, value in table.items():
            item.add(key, value)
        item.add(tomlkit.nl())  # a blank line after the entry, before whatever follows
        entries.append(item)


def write_catalogue(file: Path, document: Any) -> None:
    """Read the new text back as a catalogue, then replace the file atomically (keeping its mode)."""
    import tomlkit

    text = tomlkit.dumps(document)
    parse_catalogue_text(text, file)
    write_atomic(file, text)


def ordered_table(name: str, shape: str, values: dict[str, str], family: str | None, material: str | None) -> dict[str, Any]:
    """An entry in the usual key order: name, shape, family, material, then the dimensions."""
    table: dict[str, Any] = {"name": name, "shape": shape}
    if family:
        table["family"] = family
    if material:
        table["material"] = material
    for key in SHAPES[shape].all if shape in SHAPES else values:
        if key in values:
            table[key] = values[key]
    for key, value in values.items():
        table.setdefault(key, value)  # keys the shape does not know: check_entry names them
    return table


def add_section(file: Path, table: dict[str, Any]) -> SectionSpec:
    """Append one section, given on the command line, to `file` (created if absent). InputError
    naming the option (nothing written) when the entry is bad, its name is already in the file's
    catalogue folder, or its material is unknown there."""
    try:
        spec = check_entry(table, "", None)
    except InputError as error:
        error.key = "--" + error.key.replace("_", "-") if error.key else ""
        raise
    sections, materials = folder_catalogue(file)
    if spec.name in sections:
        other = sections[spec.name]
        raise InputError("", "--name", f"section {spec.name!r} is already in {other.source}" + (f":{other.line}" if other.line else ""),
                         "choose another name")
    if spec.material and spec.material not in materials:
        raise InputError("", "--material", f"material {spec.material!r} is not defined in the catalogue folder {file.parent}",
                         "use one of: " + (", ".join(sorted(materials)) or "(none defined: add a [materials.NAME] table first)"))
    document = _document(file)
    _append(document, [table], file)
    write_catalogue(file, document)
    return spec


# ----------------------------------------------------------------------------------------------
# CSV import

@dataclass
class ImportResult:
    """Rows of a stock list: accepted entries (as tables and specs) and refused rows with why."""

    tables: list[dict[str, Any]] = field(default_factory=list)
    specs: list[SectionSpec] = field(default_factory=list)
    refused: list[InputError] = field(default_factory=list)


def _columns(header: list[str], shape: str, file: str) -> list[tuple[str, str | None]]:
    """(key, unit or None) per column; InputError for an unknown or missing column."""
    allowed = ("name", "family", "material") + SHAPES[shape].all
    columns = []
    for text in header:
        match = _HEADER.match(text)
        key = re.sub(r"[\s-]+", "_", match.group(1).strip().lower()) if match else text
        if key not in allowed:
            raise InputError(file, f"column {text!r}", f"unknown column for shape {shape}", "use columns: " + ", ".join(allowed) + ' (a unit may follow in brackets: "depth [mm]")', 1)
        columns.append((key, match.group(2) if match else None))
    keys = [key for key, _ in columns]
    for key in ("name",) + SHAPES[shape].required:
        if key not in keys:
            raise InputError(file, f"column {key!r}", f"the header has no {key!r} column (shape {shape})", "add the column", 1)
    duplicated = {key for key in keys if keys.count(key) > 1}
    if duplicated:
        raise InputError(file, f"column {sorted(duplicated)[0]!r}", "the column appears twice", "keep one", 1)
    return columns


def _row_table(row: list[str], columns: list[tuple[str, str | None]], shape: str) -> dict[str, Any]:
    values: dict[str, str] = {}
    name = family = material = None
    for (key, unit), cell in zip(columns, row):
        cell = cell.strip()
        if not cell:
            continue
        if key == "name":
            name = cell
        elif key == "family":
            family = cell
        elif key == "material":
            material = cell
        else:
            values[key] = f"{cell} {unit}" if unit and _BARE_NUMBER.match(cell) else cell
    return ordered_table(name or "", shape, values, family, material)


def import_stock_list(csv_path: Path, shape: str, into: Path | None) -> ImportResult:
    """Read a CSV stock list of one shape, row by row. A refused row (bad value, shape rule, name
    repeated in the list or already in the target's catalogue folder) is kept with its reason."""
    if shape not in SHAPES or shape == "polygon":
        raise InputError("", "--shape", f"cannot import shape {shape!r}", "use one of: " + ", ".join(s for s in SHAPES if s != "polygon"))
    file = str(csv_path)
    text = read_text(csv_path, "the CSV file", "check the path; save the sheet as CSV (UTF-8)")
    try:
        rows = list(csv.reader(io.StringIO(text.removeprefix("\ufeff"), newline="")))
    except csv.Error as exc:
        raise InputError(file, "", f"cannot read the CSV file ({exc})", "check the path; save the sheet as CSV (UTF-8)") from None
    if not rows:
        raise InputError(file, "", "the file is empty", "give a header row and one row per section", 1)
    columns = _columns(rows[0], shape, file)
    existing = folder_catalogue(into)[0] if into is not None else {}
    result = ImportResult()
    seen: dict[str, int] = {}
    for line, row in enumerate(rows[1:], start=2):
        if not any(cell.strip() for cell in row):
            continue
        table = _row_table(row, columns, shape)
        try:
            spec = check_entry(table, file, line)
            _check_new_name(spec.name, existing, seen, file, line)
        except InputError as error:
            result.refused.append(error)
            continue
        seen[spec.name] = line
        result.tables.append(table)
        result.specs.append(spec)
    return result


def _check_new_name(name: str, existing: dict[str, SectionSpec], seen: dict[str, int], file: str, line: int) -> None:
    if name in seen:
        raise InputError(file, "name", f"section {name!r} is already in row {seen[name]} of this list", "give each row its own name", line)
    if name in existing:
        raise InputError(file, "name", f"section {name!r} is already in {existing[name].source}", "rename it or leave the row out", line)


def catalogue_text(tables: list[dict[str, Any]], comment: str) -> str:
    """A catalogue file's text holding `tables` as [[sections]], under a comment line."""
    import tomlkit

    document = tomlkit.document()
    document.add(tomlkit.comment(comment))
    _append(document, tables)
    return tomlkit.dumps(document)


def append_tables(file: Path, tables: list[dict[str, Any]]) -> None:
    """Append accepted entries to `file` (created if absent), keeping everything already there."""
    document = _document(file)
    _append(document, tables, file)
    write_catalogue(file, document)
