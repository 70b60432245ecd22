"""The span-table file (docs/design.md section 11) read into a SpanTableSpec: layout, spans, material,
restraint, mode with its loads or lengths, resolution and checks, with errors naming file, key and
line; and the records of a search: a Trial, a cell's task, the result of the whole table.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Sequence

from sizer.errors import InputError
from sizer.files import read_text
from sizer.parallel import RunSummary, ShippedCatalogue

TOP_KEYS = ("title", "span_table", "materials")
TABLE_KEYS = ("layout", "spans", "material", "orientation", "self_weight", "restraint", "mode", "loads", "lengths", "load",
              "dead_load", "resolution", "max_span", "checks", "combinations")
LAYOUTS = ("simple", "cantilever", "continuous")
MODES = ("span", "load")
RESTRAINT_WORDS = ("continuous", "supports")
LOAD_STEP = 1.005  # mode "load": loads to 0.5 %
LOAD_GRID = 2400  # load factors from 1.005^-2400 (6e-6) to 1.005^2400 (1.6e5) times the given load
MAX_CONTINUOUS_SPANS = 5
CLOSEST_RESTRAINTS = 0.1  # m: the closest spacing of point restraints (closer is a deck: "continuous")
FINEST_RESOLUTION = 0.001  # m: the finest span step
MAX_COLUMNS = 1000  # loads (mode "span") or lengths (mode "load") of one table, at most (docs/limits.md)
FIRST_SPAN = 3.0  # m: the first trial in mode "span"
DEFAULT_RESOLUTION = "10 mm"
DEFAULT_MAX_SPAN = "30 m"
DEFAULT_LOAD = "-1 kN/m"
IMPOSED = "imposed"
DEAD = "dead"


@dataclass(frozen=True)
class AppliedLoad:
    """A load on every span along y: uniform (`kind` "line", N/m) or a point load at each span's
    middle, or a cantilever's tip (`kind` "point", N). Negative acts downward (-y)."""

    kind: str
    value: float

    def scaled(self, factor: float) -> "AppliedLoad":
        return AppliedLoad(self.kind, self.value * factor)


@dataclass(frozen=True)
class SpanTableSpec:
    """A span-table file as read (SI: m, N/m, N)."""

    path: str
    text: str
    title: str
    layout: str
    spans: int
    material: str
    orientation: str
    self_weight: str | None
    restraint: str | float  # "continuous", "supports", or a spacing in m
    mode: str
    loads: tuple[AppliedLoad, ...]  # mode "span": one column each
    lengths: tuple[float, ...]  # mode "load": one column each
    load: AppliedLoad  # mode "load": the load that is scaled
    dead_load: float | None  # N/m on every span, case "dead"
    resolution: float  # m
    max_span: float  # m
    checks: dict = field(default_factory=dict)
    combinations: dict | None = None
    materials: dict = field(default_factory=dict)

    @property
    def columns(self) -> int:
        return len(self.loads) if self.mode == "span" else len(self.lengths)


@dataclass(frozen=True)
class Trial:
    """One full check: the verdict, the governing utilization and check."""

    passes: bool
    utilization: float
    governing: str | None


@dataclass(frozen=True)
class CellTask:
    """One cell's work: the table, the section, the column (load or span), the catalogue's text."""

    spec: SpanTableSpec
    section: str
    column: int
    catalogue: ShippedCatalogue


@dataclass
class SpanTableResult:
    """Every section's row of cells, in catalogue order by mass per length."""

    spec: SpanTableSpec
    sections: list[dict]
    summary: RunSummary
    notes: list[str]


# ----------------------------------------------------------------------------------------------
# reading

class _FileReader:
    """Values of a span-table file with errors naming the file, key and line."""

    def __init__(self, path: Path, text: str) -> None:
        from sizer.inputfile import Reader

        self.reader = Reader(path, text)
        self.file = str(path)

    def error(self, key: str, problem: str, fix: str) -> InputError:
        return self.reader.error(f"span_table.{key}", problem, fix)

    def choice(self, table: dict, key: str, choices: Sequence[str], default: str) -> str:
        value = table.get(key, default)
        if value not in choices:
            raise self.error(key, f"unknown {key} {value!r}", "use one of: " + ", ".join(choices))
        return value

    def length(self, value: Any, key: str) -> float:
        from sizer import units

        found = units.parse(value, "length", self.file, f"span_table.{key}", self.reader.key_lines.find(f"span_table.{key}"))
        if found <= 0:
            raise self.error(key, f"{value!r} must be greater than zero", 'give e.g. "1.5 m"')
        return found

    def applied_load(self, value: Any, key: str) -> AppliedLoad:
        """A load string: force per length (uniform on every span) or force (a point load)."""
        from sizer import units

        line = self.reader.key_lines.find(f"span_table.{key}")
        if isinstance(value, str):
            for kind, quantity in (("line", "force_per_length"), ("point", "force")):
                try:
                    found = units.parse(value, quantity, self.file, f"span_table.{key}", line)
                except InputError:
                    continue
                if found == 0:
                    raise self.error(key, "a load of zero tells nothing", 'give e.g. "-4 kN/m" (downward) or "-5 kN" (a point load)')
                return AppliedLoad(kind, found)
        raise self.error(key, f"expected a load per length or a point load with its unit, got {value!r}",
                         'write e.g. "-4 kN/m" (uniform, downward) or "-5 kN" (a point load at each span\'s middle)')

    def string_list(self, table: dict, key: str, example: str) -> list[Any]:
        value = table.get(key)
        if not isinstance(value, list) or not value:
            raise self.error(key, f"expected a list, got {str(value)[:40]!r}" if value is not None else f"'{key}' is missing", f"write e.g. {key} = {example}")
        if len(value) > MAX_COLUMNS:
            raise self.error(key, f"{len(value)} entries, more than a table holds ({MAX_COLUMNS})", "split it into several span tables")
        return value


def read_span_table(path: str | Path) -> SpanTableSpec:
    """A span-table file (TOML) to a SpanTableSpec; InputError (file, key, line, fix) for bad input."""
    from sizer.inputfile import parse_toml

    path = Path(path)
    text = read_text(path, "the span table")
    data = parse_toml(text, path)
    values = _FileReader(path, text)
    values.reader.known_keys(data, TOP_KEYS, "")
    if "span_table" not in data:
        raise values.reader.error("span_table", "the [span_table] table is missing", 'add [span_table] with layout = "simple"')
    table = values.reader.table(data["span_table"], "span_table")
    values.reader.known_keys(table, TABLE_KEYS, "span_table")
    layout = values.choice(table, "layout", LAYOUTS, "simple")
    mode = values.choice(table, "mode", MODES, "span")
    return SpanTableSpec(
        path=str(path), text=text, title=data.get("title", "") if isinstance(data.get("title", ""), str) else "",
        layout=layout, spans=_spans(values, table, layout), material=_material(values, table),
        orientation=values.choice(table, "orientation", ("major", "minor"), "major"),
        self_weight=_self_weight(values, table), restraint=_restraint(values, table), mode=mode,
        loads=_column_loads(values, table, mode), lengths=_column_lengths(values, table, mode),
        load=values.applied_load(table.get("load", DEFAULT_LOAD), "load") if mode == "load" else AppliedLoad("line", -1000.0),
        dead_load=_dead_load(values, table), resolution=_resolution(values, table, mode),
        max_span=values.length(table.get("max_span", DEFAULT_MAX_SPAN), "max_span"),
        checks=values.reader.table(table.get("checks", {}), "span_table.checks"),
        combinations=values.reader.table(table["combinations"], "span_table.combinations") if "combinations" in table else None,
        materials=values.reader.table(data.get("materials", {}), "materials"),
    )


def _spans(values: _FileReader, table: dict, layout: str) -> int:
    if layout != "continuous":
        if "spans" in table:
            raise values.error("spans", f"spans is for the continuous layout, not {layout!r}", "remove spans, or write layout = \"continuous\"")
        return 1
    spans = table.get("spans")
    if isinstance(spans, bool) or not isinstance(spans, int) or not 2 <= spans <= MAX_CONTINUOUS_SPANS:
        raise values.error("spans", f"expected a whole number of equal spans from 2 to {MAX_CONTINUOUS_SPANS}, got {spans!r}", "write e.g. spans = 3")
    return spans


def _material(values: _FileReader, table: dict) -> str:
    material = table.get("material")
    if not isinstance(material, str) or not material.strip():
        raise values.error("material", "no material is given" if material is None else f"expected a material name, got {material!r}",
                           'write e.g. material = "mild-steel" (from the catalogue files or [materials.NAME] here)')
    return material.strip()


def _self_weight(values: _FileReader, table: dict) -> str | None:
    value = table.get("self_weight", DEAD)
    if value is False:
        return None
    if value is True:
        return DEAD
    if not isinstance(value, str) or not value.strip() or value.strip() == IMPOSED:
        raise values.error("self_weight", f"expected a case name other than {IMPOSED!r}, or false; got {value!r}", 'write self_weight = "dead" or false')
    return value.strip()


def _restraint(values: _FileReader, table: dict) -> str | float:
    value = table.get("restraint", "supports")
    if value in RESTRAINT_WORDS:
        return value
    if not isinstance(value, str):
        raise values.error("restraint", f"expected \"continuous\", \"supports\" or a spacing, got {value!r}", 'write e.g. restraint = "1.5 m"')
    spacing = values.length(value, "restraint")
    if spacing < CLOSEST_RESTRAINTS * (1 - 1e-9):
        raise values.error("restraint", f"restraints every {value[:40]} are closer than {CLOSEST_RESTRAINTS * 1e3:g} mm",
                           'write restraint = "continuous" for a deck or bracing that close, or give a spacing of 100 mm or more')
    return spacing


def _column_loads(values: _FileReader, table: dict, mode: str) -> tuple[AppliedLoad, ...]:
    if mode != "span":
        if "loads" in table:
            raise values.error("loads", "loads are the columns of mode \"span\"; mode \"load\" finds the load", "remove loads, or write mode = \"span\"")
        return ()
    items = values.string_list(table, "loads", '["-2 kN/m", "-4 kN/m"]')
    return tuple(values.applied_load(item, f"loads[{index}]") for index, item in enumerate(items, start=1))


def _column_lengths(values: _FileReader, table: dict, mode: str) -> tuple[float, ...]:
    if mode != "load":
        if "lengths" in table or "load" in table:
            key = "lengths" if "lengths" in table else "load"
            raise values.error(key, f"{key} is for mode \"load\"", f"remove {key}, or write mode = \"load\"")
        return ()
    items = values.string_list(table, "lengths", '["2 m", "3 m", "4 m"]')
    return tuple(values.length(item, f"lengths[{index}]") for index, item in enumerate(items, start=1))


def _dead_load(values: _FileReader, table: dict) -> float | None:
    if "dead_load" not in table:
        return None
    load = values.applied_load(table["dead_load"], "dead_load")
    if load.kind != "line":
        raise values.error("dead_load", "the dead load is uniform on every span", 'give a load per length, e.g. dead_load = "-0.5 kN/m"')
    return load.value


def _resolution(values: _FileReader, table: dict, mode: str) -> float:
    from sizer import units

    if mode == "load":
        if "resolution" in table:
            raise values.error("resolution", "mode \"load\" finds loads to 0.5 %; resolution is the span step of mode \"span\"", "remove resolution")
        return values.length(DEFAULT_RESOLUTION, "resolution")
    resolution = values.length(table.get("resolution", DEFAULT_RESOLUTION), "resolution")
    if resolution < FINEST_RESOLUTION * (1 - 1e-9):
        raise values.error("resolution", f"a span step of {str(table.get('resolution'))[:40]} is finer than {FINEST_RESOLUTION * 1e3:g} mm",
                           'give e.g. resolution = "10 mm"')
    longest = values.length(table.get("max_span", DEFAULT_MAX_SPAN), "max_span")
    if resolution > longest / 2:
        raise values.error("resolution", f"the span step {table.get('resolution')!s:.40} leaves fewer than two spans up to max_span "
                           f"({units.fmt(longest, 'length')})", 'give a finer step, e.g. resolution = "10 mm", or a longer max_span')
    return resolution


# ----------------------------------------------------------------------------------------------
# the member of one trial
