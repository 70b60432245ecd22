"""Catalogue files (docs/design.md section 4): TOML files holding [materials.NAME] tables and [[sections]]
entries, read into SectionSpec and Material objects with errors that name file, key and line.

Every dimension is a string with its unit, read to metres. Section names are unique across all the
files of a catalogue. A catalogue is any mix of files and folders; a folder contributes its *.toml
files (not recursing), except files that are plainly something else (a member file's [member] table,
pyproject.toml's [project] or [tool]), so a catalogue may share a folder with them.

An unchanged file is not parsed again: its sections and materials are remembered on disk
(sizer.sections.catalogue_cache), keyed by its path, its text and the code that parses it.
"""

from __future__ import annotations

import difflib
import math
import re
import sys
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any, Sequence

from sizer import units
from sizer.errors import InputError
from sizer.files import read_text
from sizer.model import Material
from sizer.sections import catalogue_cache
from sizer.sections.catalogue_cache import ParsedFile
from sizer.sections.purchase import Purchase, parse_currency, parse_families, parse_purchase
from sizer.sections.shapes import MAX_AREA_PER_WALL_SQUARED, RADIUS_KEYS, SHAPES, allowed_keys, fit_problems
from sizer.sections.spec import Point, SectionSpec

SHIPPED_PACKAGE = "sizer.section_library"
TOP_KEYS = ("title", "currency", "families", "materials", "sections")
DEFAULT_MATERIAL = "mild-steel"
FOREIGN_TABLES = frozenset({"member", "project", "build-system", "tool"})  # member files, pyproject.toml

@dataclass
class Catalogue:
    """Sections by name and materials by name, read from `files`."""

    sections: dict[str, SectionSpec]
    materials: dict[str, Material]
    files: tuple[Path, ...] = ()
    currency: str | None = None  # stated once per catalogue (any file; files that state it agree)
    family_purchase: dict[str, Purchase] = field(default_factory=dict)  # [families.NAME] purchase terms

    def purchase(self, spec: SectionSpec) -> Purchase:
        """The section's purchase terms: its own keys, else its family's (sizer.sections.purchase)."""
        own = spec.purchase or Purchase()
        return own.over(self.family_purchase.get(spec.family)) if spec.family else own

    @property
    def has_purchase_terms(self) -> bool:
        """True when the catalogue gives any purchase terms (a family's or a section's own)."""
        return bool(self.family_purchase) or any(spec.purchase is not None for spec in self.sections.values())

    def get(self, name: str, file_for_error: str = "", key_for_error: str = "section", line: int | None = None) -> SectionSpec:
        """The section called `name`; InputError (suggesting close names) when there is none."""
        if name in self.sections:
            return self.sections[name]
        raise InputError(file_for_error, key_for_error, f"unknown section {name!r}", _suggestion(name, list(self.sections)), line)

    def families(self) -> list[str]:
        """The families present, sorted."""
        return sorted({spec.family for spec in self.sections.values() if spec.family})

    def select(self, families: Sequence[str] = ()) -> list[SectionSpec]:
        """Sections in any of `families` (all when empty), in catalogue order. Unknown family: InputError."""
        for family in families:
            if family not in self.families():
                raise InputError("", "--family", f"no section is in family {family!r}",
                                 "use one of: " + (", ".join(self.families()) or "(the catalogue has no families)"))
        return [spec for spec in self.sections.values() if not families or spec.family in families]

    def mass_material(self, spec: SectionSpec) -> tuple[Material | None, str]:
        """The material whose density gives the section's mass per length, and a note saying which:
        the section's own material, else "mild-steel" when the catalogue defines it."""
        if spec.material:
            if spec.material in self.materials:
                return self.materials[spec.material], f"{spec.material} (the section's material)"
            return None, f"no density: material {spec.material!r} is not defined in the catalogue files"
        if DEFAULT_MATERIAL in self.materials:
            return self.materials[DEFAULT_MATERIAL], f"{DEFAULT_MATERIAL} (default; the section names no material)"
        return None, f"no density: the section names no material and {DEFAULT_MATERIAL!r} is not defined"


def _suggestion(name: str, names: list[str]) -> str:
    """A fix text naming the closest catalogue names (ignoring case and spaces first)."""
    squeeze = {re.sub(r"[\s_-]", "", known).lower(): known for known in names}
    wanted = re.sub(r"[\s_-]", "", name).lower()
    close = [squeeze[wanted]] if wanted in squeeze else [squeeze[key] for key in difflib.get_close_matches(wanted, list(squeeze), n=3, cutoff=0.6)]
    if close:
        return "did you mean " + " or ".join(repr(known) for known in close) + "? (`sizer sections list` shows the catalogue)"
    return "use a name from `sizer sections list`, or add the section with `sizer sections add`"


# ----------------------------------------------------------------------------------------------
# where catalogues are

def shipped_library() -> Path:
    """The section_library/ folder installed with sizer (package data): the package's own folder on
    its import path (an editable install may also list entries that are no folder), else where
    importlib.resources finds it (some 4 ms more, so only then)."""
    import importlib

    package = importlib.import_module(SHIPPED_PACKAGE)
    folder = next((Path(entry) for entry in getattr(package, "__path__", ()) if Path(entry).is_dir()), None)
    if folder is not None:
        return folder
    from importlib.resources import files

    return Path(str(files(SHIPPED_PACKAGE)))


def default_catalogue_paths(member_file: Path | None) -> list[Path]:
    """The member file's folder's section_library/ if it exists (the current folder's when there is
    no member file), else the shipped one."""
    folder = Path(member_file).parent if member_file is not None else Path.cwd()
    local = folder / "section_library"
    return [local] if local.is_dir() else [shipped_library()]


def catalogue_files(paths: Sequence[Path]) -> list[tuple[Path, bool]]:
    """(file, came_from_a_folder) for every catalogue file the paths name, without repeats."""
    found: list[tuple[Path, bool]] = []
    seen: set[Path] = set()
    for path in map(Path, paths):
        if path.is_dir():
            listed = [(file, True) for file in sorted(path.glob("*.toml")) if file.is_file()]
            if not listed:
                raise InputError(str(path), "--catalogue", "the folder holds no catalogue (*.toml) files", "give a folder with catalogue files, or a file")
        elif path.is_file():
            listed = [(path, False)]
        else:
            raise InputError(str(path), "--catalogue", "no such file or folder", "check the path")
        for file, from_folder in listed:
            resolved = file.resolve()
            if resolved not in seen:
                seen.add(resolved)
                found.append((file, from_folder))
    return found


# ----------------------------------------------------------------------------------------------
# reading

@dataclass
class CatalogueFile:
    """What one catalogue file holds."""

    path: Path
    sections: list[SectionSpec]
    materials: dict[str, Material]
    currency: str | None = None
    families: dict[str, Purchase] = field(default_factory=dict)


def load_catalogue(paths: Sequence[Path]) -> Catalogue:
    """Read every catalogue file the paths name. Section (and material) names must be unique across
    all of them; the error names both files."""
    sections: dict[str, SectionSpec] = {}
    materials: dict[str, Material] = {}
    files: list[Path] = []
    terms = _PurchaseTerms()
    for path, from_folder in catalogue_files(paths):
        content = _catalogue_file(path, from_folder)
        if content.foreign:
            continue  # a member file or project file kept beside the catalogue files
        files.append(path)
        terms.add(path, content)
        for index, spec in enumerate(content.sections, start=1):
            if spec.name in sections:
                first = sections[spec.name]
                raise InputError(str(path), f"sections[{index}].name", f"section name {spec.name!r} is also used in {_place(first.source, first.line)}",
                                 "section names must be unique across the catalogue: rename one", spec.line)
            sections[spec.name] = spec
        for name, material in content.materials.items():
            if name in materials:
                raise InputError(str(path), f"materials.{name}", f"material {name!r} is also defined in {materials[name].source}",
                                 "material names must be unique across the catalogue: rename or remove one")
            materials[name] = material
    terms.check(sections)
    return Catalogue(sections, materials, tuple(files), terms.currency, terms.families)


class _PurchaseTerms:
    """The catalogue's currency and family purchase terms, gathered file by file: a currency stated
    twice must agree, a family's terms are given in one file only, and each names a family that
    some section is in."""

    def __init__(self) -> None:
        self.currency: str | None = None
        self.currency_file = ""
        self.families: dict[str, Purchase] = {}
        self.family_files: dict[str, Path] = {}
        self.priced_file: Path | None = None

    def add(self, path: Path, content: ParsedFile) -> None:
        if content.currency is not None:
            if self.currency is not None and content.currency != self.currency:
                raise InputError(str(path), "currency", f"currency {content.currency!r} differs from {self.currency!r} in {self.currency_file}",
                                 "state one currency for the whole catalogue (or remove it from all but one file)")
            self.currency, self.currency_file = content.currency, str(path)
        for name, terms in content.families.items():
            if name in self.families:
                raise InputError(str(path), f"families.{name}", f"family {name!r} has purchase terms in {self.family_files[name]} too",
                                 "give each family's terms in one file only")
            self.families[name], self.family_files[name] = terms, path
            if terms.cost_per_kg is not None:
                self.priced_file = self.priced_file or path
        if self.priced_file is None and any(spec.purchase is not None and spec.purchase.cost_per_kg is not None for spec in content.sections):
            self.priced_file = path

    def check(self, sections: dict[str, SectionSpec]) -> None:
        families = {spec.family for spec in sections.values() if spec.family}
        for name, path in self.family_files.items():
            if name not in families:
                raise InputError(str(path), f"families.{name}", f"no section is in family {name!r}",
                                 "use the family name the sections give (family = \"...\"), or remove the table")
        if self.priced_file is not None and self.currency is None:
            raise InputError(str(self.priced_file), "currency", "the catalogue gives prices (cost_per_kg) but no currency",
                             'add currency = "EUR" (or your currency) once, at the top of a catalogue file')


def _catalogue_file(path: Path, from_folder: bool) -> ParsedFile:
    """The sections and materials of one file: remembered when its text (and path, and the code)
    are unchanged, else parsed now and remembered: in this process (a schedule reads the same
    catalogue for every row) and in the cache folder. `foreign` only for a file `from_folder`."""
    text = read_text(path, fix="check the path and that it is a UTF-8 text file")
    return _remembered_file(path, text, catalogue_cache.content_digest(path, text), from_folder)


@lru_cache(maxsize=64)
def _remembered_file(path: Path, text: str, digest: str, from_folder: bool) -> ParsedFile:
    """The parse of `text` (read from `path`, with the digest of both) from the cache
    folder, else parsed now and written there; kept in memory for this process's later reads."""
    remembered = catalogue_cache.read_parsed(path, digest)
    if remembered is not None and (from_folder or not remembered.foreign):
        return remembered
    parsed = _parse_file(path, text, from_folder)
    catalogue_cache.write_parsed(path, digest, parsed)
    return parsed


def _parse_file(path: Path, text: str, from_folder: bool) -> ParsedFile:
    """Parse one file; a folder's file with a table of FOREIGN_TABLES is marked foreign, unread."""
    data = _parse_toml(text, path)
    if from_folder and FOREIGN_TABLES & data.keys():
        return ParsedFile(True, [], {})
    content = parse_catalogue_text(text, path, data)
    return ParsedFile(False, content.sections, content.materials, content.currency, content.families)


def _place(file: str, line: int | None) -> str:
    return f"{file}:{line}" if line is not None else file


def _parse_toml(text: str, path: Path) -> dict:
    from sizer.inputfile import parse_toml

    return parse_toml(text, path)


def parse_catalogue_text(text: str, path: Path, data: dict | None = None) -> CatalogueFile:
    """Catalogue-file text (read from `path`, for messages; `data`: its parsed TOML when already
    parsed) to its sections and materials."""
    from sizer.inputfile import Reader

    data = _parse_toml(text, path) if data is None else data
    reader = Reader(path, text)
    reader.known_keys(data, TOP_KEYS, "")
    materials = {
        name: parse_material(name, reader.table(table, f"materials.{name}"), str(path), f"materials.{name}", text)
        for name, table in reader.table(data.get("materials", {}), "materials").items()
    }
    entries = data.get("sections", [])
    if not isinstance(entries, list) or not all(isinstance(entry, dict) for entry in entries):
        raise reader.error("sections", "expected [[sections]] entries", 'write each section as [[sections]] with name = "..." and shape = "..."')
    sections: list[SectionSpec] = []
    lines: dict[str, int | None] = {}
    for index, entry in enumerate(entries, start=1):
        spec = parse_section(entry, reader, f"sections[{index}]")
        if spec.name in lines:
            raise reader.error(f"sections[{index}].name", f"section name {spec.name!r} is used twice in this file (first at line {lines[spec.name]})",
                               "section names must be unique across the catalogue: rename one")
        lines[spec.name] = spec.line
        sections.append(spec)
    return CatalogueFile(path, sections, materials, parse_currency(data, reader), parse_families(data, reader))


def parse_material(name: str, table: dict, file: str, key_prefix: str, text: str = "") -> Material:
    """A [materials.NAME] table (docs/design.md section 3 form) to a Material; `text` (the file's text, when
    known) gives line numbers. The one reader shared with member files (sizer.inputfile)."""
    from sizer.inputfile import Reader
    from sizer.inputfile import parse_material as read_material

    return read_material(name, table, Reader(Path(file), text), key_prefix)


def parse_section(table: dict, reader: Any, prefix: str) -> SectionSpec:
    """One [[sections]] entry to a SectionSpec. `reader` (sizer.inputfile.Reader) names file and
    lines; `prefix` is the entry's key, e.g. "sections[3]" (counting from 0)."""
    name = table.get("name")
    if not isinstance(name, str) or not name.strip():
        raise reader.error(f"{prefix}.name", "the section has no name", 'give e.g. name = "RHS 100x50x4"')
    label = f"section {name!r}"
    shape = table.get("shape")
    if not isinstance(shape, str) or shape not in SHAPES:
        close = difflib.get_close_matches(str(shape), list(SHAPES), n=1)
        hint = f"did you mean {close[0]!r}? " if close else ""
        raise reader.error(f"{prefix}.shape", f"{label}: unknown shape {shape!r}" if shape is not None else f"{label}: shape is missing",
                           hint + "use one of: " + ", ".join(SHAPES))
    shape = sys.intern(shape)  # one object per text: remembered catalogues (catalogue_cache) are smaller
    allowed = allowed_keys(shape)
    for key in table:
        if key not in allowed:
            raise reader.error(f"{prefix}.{key}", f"{label}: unknown key {key!r} for shape {shape}", "use one of: " + ", ".join(allowed))
    for key in SHAPES[shape].required:
        if key not in table:
            raise reader.error(prefix, f"{label}: {key!r} is missing (shape {shape})", f"give {key} with its unit, e.g. {key} = \"10 mm\"")
    family = _optional_text(table, "family", reader, prefix, label)
    material = _optional_text(table, "material", reader, prefix, label)
    line = reader.key_lines.find(f"{prefix}.name")
    purchase = parse_purchase(table, reader, prefix, label)
    if shape == "polygon":
        points, holes = _polygon(table, reader, prefix, label)
        return SectionSpec(name, shape, {}, points, holes, family, material, reader.file, line, purchase)
    dims = {key: _dimension(table, key, reader, prefix, label) for key in SHAPES[shape].all}
    for problem in fit_problems(shape, dims)[:1]:
        raise reader.error(f"{prefix}.{problem.key}", f"{label}: {problem.problem}", problem.fix)
    return SectionSpec(name, shape, dims, (), (), family, material, reader.file, line, purchase)


def _optional_text(table: dict, key: str, reader: Any, prefix: str, label: str) -> str | None:
    value = table.get(key)
    if value is None:
        return None
    if not isinstance(value, str) or not value.strip():
        raise reader.error(f"{prefix}.{key}", f"{label}: {key} must be a non-empty string, got {value!r}", f'write e.g. {key} = "tube"')
    return sys.intern(value)  # a family or material repeats: one object per text, as for shapes


def _length(value: Any, reader: Any, key: str, label: str) -> float:
    """A length string to metres, with the section named in any error."""
    try:
        return units.parse(value, "length", reader.file, key, reader.key_lines.find(key))
    except InputError as error:
        error.problem = f"{label}: {error.problem}"
        raise


def _dimension(table: dict, key: str, reader: Any, prefix: str, label: str) -> float:
    """A dimension in m: radii may be zero (and default to it); everything else must be positive."""
    if key not in table:
        return 0.0  # an optional radius: a sharp corner
    value = _length(table[key], reader, f"{prefix}.{key}", label)
    if key in RADIUS_KEYS and value < 0:
        raise reader.error(f"{prefix}.{key}", f"{label}: {key} {table[key]!r} is negative", "give zero or a positive radius")
    if key not in RADIUS_KEYS and value <= 0:
        raise reader.error(f"{prefix}.{key}", f"{label}: {key} {table[key]!r} must be greater than zero", "give a positive dimension")
    return value


HOLE_GAP = 1e-3  # the least clearance of a polygon's hole from the outline and other holes, per section size


def _polygon(table: dict, reader: Any, prefix: str, label: str) -> tuple[tuple[Point, ...], tuple[tuple[Point, ...], ...]]:
    """The outline and holes of a polygon (m), checked to be simple closed rings that do not cross."""
    outline = _ring(table["points"], reader, f"{prefix}.points", label)
    holes_value = table.get("holes", [])
    if not isinstance(holes_value, list):
        raise reader.error(f"{prefix}.holes", f"{label}: holes must be a list of point lists", 'write holes = [[["10 mm", "10 mm"], ...]]')
    holes = tuple(_ring(hole, reader, f"{prefix}.holes[{index}]", label) for index, hole in enumerate(holes_value))
    _check_polygon(outline, holes, reader, prefix, label)
    return outline, holes


def _ring(value: Any, reader: Any, key: str, label: str) -> tuple[Point, ...]:
    fix = 'write points = [["0 mm", "0 mm"], ["100 mm", "0 mm"], ["0 mm", "80 mm"]] (across, up)'
    if not isinstance(value, list) or len(value) < 3:
        raise reader.error(key, f"{label}: a ring needs a list of at least three points", fix)
    ring = []
    for index, pair in enumerate(value):
        if not isinstance(pair, list) or len(pair) != 2:
            raise reader.error(key, f"{label}: point {index} is {pair!r}, not a pair of lengths", fix)
        ring.append((_length(pair[0], reader, key, label), _length(pair[1], reader, key, label)))
    if ring[0] == ring[-1]:
        ring.pop()  # a closing point repeated: drop it
    return tuple(ring)


def _check_hole_gaps(polygon: Any, reader: Any, prefix: str, label: str) -> None:
    """InputError unless every hole keeps HOLE_GAP x the section's size (mm, as `polygon` is drawn)
    clear of the outline and of every other hole: a hole touching the outline or another hole, even
    at a single point, leaves a wall of no thickness that the mesher cannot triangulate."""
    x0, y0, x1, y1 = polygon.bounds
    gap = HOLE_GAP * max(x1 - x0, y1 - y0)
    holes = list(polygon.interiors)
    for index, hole in enumerate(holes):
        others = [("the outline", polygon.exterior)] + [(f"holes[{other}]", holes[other]) for other in range(index)]
        for name, ring in others:
            distance = hole.distance(ring)
            if distance < gap:
                raise reader.error(f"{prefix}.holes[{index}]", f"{label}: the hole comes within {distance:.3g} mm of {name} "
                                   f"(at least {gap:.3g} mm, 1/{1 / HOLE_GAP:g} of the section's size, is needed)",
                                   "keep every hole strictly inside the outline and apart from the other holes (see docs/limits.md)")


def _check_polygon(outline: tuple[Point, ...], holes: tuple[tuple[Point, ...], ...], reader: Any, prefix: str, label: str) -> None:
    """InputError when the outline crosses itself, a hole is not inside, or the area is zero."""
    from shapely.geometry import LinearRing, Polygon
    from shapely.validation import explain_validity

    def mm(ring: tuple[Point, ...]) -> list[Point]:
        return [(x * 1e3, y * 1e3) for x, y in ring]

    for key, ring in [("points", outline)] + [(f"holes[{i}]", hole) for i, hole in enumerate(holes)]:
        if len(ring) < 3 or not LinearRing(mm(ring)).is_simple:
            raise reader.error(f"{prefix}.{key}", f"{label}: the ring crosses or touches itself (or has repeated points)",
                               "list the points in order around the outline, without crossings (coordinates in mm)")
    polygon = Polygon(mm(outline), [mm(hole) for hole in holes])
    if not polygon.is_valid:
        raise reader.error(f"{prefix}.holes" if holes else f"{prefix}.points", f"{label}: not a valid outline ({explain_validity(polygon)}, mm)",
                           "keep every hole strictly inside the outline and apart from the other holes")
    if not polygon.area > 0 or not math.isfinite(polygon.area):
        raise reader.error(f"{prefix}.points", f"{label}: the outline encloses no area", "give the outline's corner points")
    _check_hole_gaps(polygon, reader, prefix, label)
    ratio = polygon.length**2 / (4 * polygon.area)  # area / wall^2 with the mesh rule's wall 2 A / perimeter
    if ratio > MAX_AREA_PER_WALL_SQUARED:
        raise reader.error(f"{prefix}.points", f"{label}: the outline is too thin for its size (area / wall² = {ratio:.3g}, "
                           f"more than {MAX_AREA_PER_WALL_SQUARED:g}, with the wall 2 x area / perimeter)",
                           "check the units of the points, or draw a thicker outline (docs/limits.md)")

