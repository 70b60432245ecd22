"""Span tables: for each catalogue section, the longest span that passes every check for each load
(mode "span"), or the largest load it carries at each span (mode "load").

Each cell (one section, one load or one span) is its own job (sizer.parallel). A trial builds the
member as member-file text and reads it with `sizer.api.member_from_text`, so every value goes
through the normal reader and its errors, then runs the full check `sizer.api.check` (every
check `sizer check` makes, stability included). The boundary is found on a grid: spans are
multiples of the resolution; loads are the given load times 1.005^k (0.5 % steps). The search
brackets the boundary, then narrows the bracket with a guess from the trials so far (utilization
against span on log scales, against load on linear scales), checks the grid point next to the guess,
and falls back to halving whenever a guess does not halve the bracket: the result is the largest
grid value that passes with the next one failing, whatever path led there.

Layouts: simple (pin at 0, roller at L), cantilever (fixed at 0, free tip), continuous (n equal
spans: pin at 0, rollers at each support; the imposed load is patterned: every arrangement of
loaded and unloaded spans is a combination of its own). Loads act along -y (down) when negative.
A uniform load "kN/m" is on every span; a point load "kN" is at the middle of each span (the tip of
a cantilever). Restraint: "continuous" (a deck: lateral and twist held at the top from 0 to L),
"supports" (none between supports), or a spacing (point restraints holding lateral and twist at the
top, at that spacing from each span's start).
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from itertools import combinations as subsets
from pathlib import Path
from typing import Any, Callable, Sequence

from sizer.errors import InputError
from sizer.parallel import (Job, JobFailed, RunSummary, ShippedCatalogue, Workers, code_fingerprint, content_hash, error_result,
                            result_error, ship_catalogue)

TOP_KEYS = ("title", "span_table", "materials")
TABLE_KEYS = ("layout", "spans", "material", "orientation", "self_weight", "restraint", "mode", "loads", "lengths", "load",
              "dead_load", "resolution", "max_span", "checks", "combinations")
LAYOUTS = ("simple", "cantilever", "continuous")
MODES = ("span", "load")
RESTRAINT_WORDS = ("continuous", "supports")
LOAD_STEP = 1.005  # mode "load": loads to 0.5 %
LOAD_GRID = 2400  # load factors from 1.005^-2400 (6e-6) to 1.005^2400 (1.6e5) times the given load
MAX_CONTINUOUS_SPANS = 5
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
            raise self.error(key, f"expected a list, got {value!r}" if value is not None else f"'{key}' is missing", f"write e.g. {key} = {example}")
        return value


def read_span_table(path: str | Path) -> SpanTableSpec:
    """A span-table file (TOML) to a SpanTableSpec; InputError (file, key, line, fix) for bad input."""
    from sizer.inputfile import parse_toml

    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(str(path), "", f"cannot read the span table ({exc})", "check the path") from None
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
    return values.length(value, "restraint")


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
    if mode == "load":
        if "resolution" in table:
            raise values.error("resolution", "mode \"load\" finds loads to 0.5 %; resolution is the span step of mode \"span\"", "remove resolution")
        return values.length(DEFAULT_RESOLUTION, "resolution")
    return values.length(table.get("resolution", DEFAULT_RESOLUTION), "resolution")


# ----------------------------------------------------------------------------------------------
# the member of one trial

def member_document(spec: SpanTableSpec, section: str, span: float, imposed: AppliedLoad) -> dict:
    """The member file (as a TOML-ready dict) for `section` at span `span` (m) under `imposed`."""
    count = spec.spans
    length = span * count
    document: dict[str, Any] = {
        "title": f"{spec.title or 'Span table'}: {section}, {spec.layout} span {span:.6g} m",
        "member": {"length": _metres(length), "material": spec.material, "section": section, "orientation": spec.orientation,
                   "self_weight": spec.self_weight if spec.self_weight else False},
        "supports": _supports(spec.layout, span, count),
        "restraints": _restraints(spec, span),
        "loads": _loads(spec, span, imposed),
        "combinations": expanded_combinations(spec),
    }
    if spec.checks:
        document["checks"] = _expanded_checks(spec)
    if spec.materials:
        document["materials"] = spec.materials
    return {key: value for key, value in document.items() if value != []}


def _metres(value: float) -> str:
    return f"{value!r} m"


def _supports(layout: str, span: float, count: int) -> list[dict]:
    if layout == "cantilever":
        return [{"at": _metres(0.0), "type": "fixed"}]
    return [{"at": _metres(0.0), "type": "pin"}] + [{"at": _metres(span * i), "type": "roller"} for i in range(1, count + 1)]


def restraint_positions(spec: SpanTableSpec, span: float) -> list[float]:
    """Point restraints (m from end A) at the spacing from each span's start, inside each span (a
    cantilever's tip included)."""
    spacing = spec.restraint
    if not isinstance(spacing, float):
        return []
    positions = []
    for index in range(spec.spans):
        k = 1
        while k * spacing < span * (1 - 1e-9) or (spec.layout == "cantilever" and k * spacing <= span * (1 + 1e-9)):
            positions.append(min(index * span + k * spacing, span * spec.spans))
            k += 1
    return positions


def _restraints(spec: SpanTableSpec, span: float) -> list[dict]:
    hold = ["lateral", "twist"]
    if spec.restraint == "continuous":
        return [{"from": _metres(0.0), "to": _metres(span * spec.spans), "hold": hold, "height": "top"}]
    return [{"at": _metres(x), "hold": hold, "height": "top"} for x in restraint_positions(spec, span)]


def _imposed_case(spec: SpanTableSpec, index: int) -> str:
    return f"{IMPOSED} span {index + 1}" if spec.spans > 1 else IMPOSED


def _loads(spec: SpanTableSpec, span: float, imposed: AppliedLoad) -> list[dict]:
    loads = []
    if spec.dead_load is not None:
        loads.append({"type": "line", "case": DEAD, "wy": f"{spec.dead_load!r} N/m"})
    for index in range(spec.spans):
        start = index * span
        if imposed.kind == "line":
            loads.append({"type": "line", "case": _imposed_case(spec, index), "from": _metres(start), "to": _metres(start + span),
                          "wy": f"{imposed.value!r} N/m"})
        else:
            at = span if spec.layout == "cantilever" else start + span / 2
            loads.append({"type": "point", "case": _imposed_case(spec, index), "at": _metres(at), "fy": f"{imposed.value!r} N"})
    return loads


def _cases(spec: SpanTableSpec) -> list[str]:
    cases = [spec.self_weight] if spec.self_weight else []
    if spec.dead_load is not None and DEAD not in cases:
        cases.append(DEAD)
    return cases + [IMPOSED]


def user_combinations(spec: SpanTableSpec) -> dict[str, dict]:
    """The combinations as written, or one: every case x 1.0."""
    if spec.combinations is not None:
        return spec.combinations
    cases = _cases(spec)
    return {" + ".join(cases): {case: 1.0 for case in cases}}


def _arrangements(spans: int) -> list[tuple[int, ...]]:
    """Every non-empty set of loaded spans (0-based), all spans first."""
    return [tuple(chosen) for size in range(spans, 0, -1) for chosen in subsets(range(spans), size)]


def _arrangement_name(name: str, loaded: tuple[int, ...], spans: int) -> str:
    if len(loaded) == spans:
        return f"{name} (imposed on all spans)"
    return f"{name} (imposed on span{'s' if len(loaded) > 1 else ''} {', '.join(str(i + 1) for i in loaded)})"


def expanded_combinations(spec: SpanTableSpec) -> dict[str, dict]:
    """The combinations of the member file: for a continuous layout, each one that has the imposed case
    once for every arrangement of loaded spans (pattern loading)."""
    combinations = user_combinations(spec)
    if spec.spans == 1:
        return combinations
    expanded: dict[str, dict] = {}
    for name, factors in combinations.items():
        if not isinstance(factors, dict) or IMPOSED not in factors:
            expanded[name] = factors
            continue
        others = {case: factor for case, factor in factors.items() if case != IMPOSED}
        for loaded in _arrangements(spec.spans):
            expanded[_arrangement_name(name, loaded, spec.spans)] = {**others, **{_imposed_case(spec, i): factors[IMPOSED] for i in loaded}}
    return expanded


def _expanded_checks(spec: SpanTableSpec) -> dict:
    """[span_table.checks] with deflection_combinations expanded like the combinations."""
    checks = dict(spec.checks)
    chosen = checks.get("deflection_combinations")
    if spec.spans > 1 and isinstance(chosen, list):
        combinations = expanded_combinations(spec)
        checks["deflection_combinations"] = [name for wanted in chosen for name in combinations
                                             if name == wanted or (isinstance(wanted, str) and name.startswith(wanted + " (imposed on "))] or chosen
    return checks


def toml_text(document: dict) -> str:
    """A small TOML writer for member documents: top-level tables, arrays of tables, inline values."""
    lines: list[str] = []
    for key, value in document.items():
        if not isinstance(value, (dict, list)) or (isinstance(value, list) and not all(isinstance(item, dict) for item in value)):
            lines.append(f"{_toml_key(key)} = {_toml_value(value)}")
    for key, value in document.items():
        if isinstance(value, dict):
            lines.append(f"\n[{_toml_key(key)}]")
            lines.extend(f"{_toml_key(name)} = {_toml_value(item)}" for name, item in value.items())
        elif isinstance(value, list) and value and all(isinstance(item, dict) for item in value):
            for item in value:
                lines.append(f"\n[[{_toml_key(key)}]]")
                lines.extend(f"{_toml_key(name)} = {_toml_value(entry)}" for name, entry in item.items())
    return "\n".join(lines) + "\n"


def _toml_key(key: str) -> str:
    return key if key.replace("_", "").replace("-", "").isalnum() and key.isascii() else json.dumps(key)


def _toml_value(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return repr(value) if math.isfinite(value) else ("nan" if math.isnan(value) else ("inf" if value > 0 else "-inf"))
    if isinstance(value, str):
        return json.dumps(value, ensure_ascii=False)
    if isinstance(value, list):
        return "[" + ", ".join(_toml_value(item) for item in value) + "]"
    if isinstance(value, dict):
        return "{ " + ", ".join(f"{_toml_key(name)} = {_toml_value(item)}" for name, item in value.items()) + " }"
    raise TypeError(f"no TOML form for {type(value).__name__}")


def trial_member(spec: SpanTableSpec, section: str, span: float, imposed: AppliedLoad) -> Any:
    """The trial's Member, read from its member-file text by the normal reader; an error in a value
    that came from the span-table file names that file, its key and line."""
    from sizer import api

    try:
        return api.member_from_text(toml_text(member_document(spec, section, span, imposed)), spec.path)
    except InputError as error:
        raise span_table_error(spec, error) from None


def span_table_error(spec: SpanTableSpec, error: InputError) -> InputError:
    """An error the member reader raised about the generated member, named as the span-table key it came from."""
    if error.file != spec.path:
        return error
    key = error.key
    if key.startswith(("checks", "combinations")):
        key = "span_table." + key
    elif key.startswith("member."):
        key = "span_table." + key.removeprefix("member.")
    elif not key.startswith("materials"):
        key = "span_table"
    from sizer.inputfile import KeyLines

    return InputError(error.file, key, error.problem, error.fix, KeyLines(spec.text).find(key))


def run_trial(spec: SpanTableSpec, section: str, span: float, imposed: AppliedLoad, catalogue: Sequence[Path]) -> Trial:
    """The full check (`sizer check`) of one trial member."""
    from sizer import api

    outcome = api.check(trial_member(spec, section, span, imposed), None, catalogue)
    return Trial(outcome.passes, outcome.utilization, outcome.governing)


# ----------------------------------------------------------------------------------------------
# the search

@dataclass
class Boundary:
    """The largest passing grid index (`passing`, None when even the lowest fails) with its trial,
    the first failing index above it (`failing`, None when even the highest passes) with its trial,
    and the number of full checks made."""

    passing: int | None
    failing: int | None
    trials: dict[int, Trial]

    def trial(self, index: int | None) -> Trial | None:
        return self.trials.get(index) if index is not None else None


Guess = Callable[[list[tuple[int, Trial]]], float | None]


def largest_passing(trial: Callable[[int], Trial], start: int, lowest: int, highest: int, guess: Guess) -> Boundary:
    """The largest integer k in [lowest, highest] whose trial passes, the next one failing (the trials
    are assumed to pass below some k and fail above it). `guess(points)` estimates the boundary (a real
    k) from the trials so far, or None (then the bracket is halved)."""
    trials: dict[int, Trial] = {}

    def at(k: int) -> Trial:
        if k not in trials:
            trials[k] = trial(k)
        return trials[k]

    passing, failing = _bracket(at, min(max(start, lowest), highest), lowest, highest, guess, trials)
    if passing is None or failing is None:
        return Boundary(passing, failing, trials)
    while failing - passing > 1:
        width = failing - passing
        estimate = guess([(passing, trials[passing]), (failing, trials[failing])])
        k = (passing + failing) // 2 if estimate is None else min(max(round(estimate), passing + 1), failing - 1)
        passing, failing = _narrowed(at, k, passing, failing)
        if failing - passing > 1 and estimate is not None:
            neighbour = k + 1 if at(k).passes else k - 1
            if passing < neighbour < failing:
                passing, failing = _narrowed(at, neighbour, passing, failing)
        if failing - passing > width // 2 and failing - passing > 1:
            passing, failing = _narrowed(at, (passing + failing) // 2, passing, failing)
    return Boundary(passing, failing, trials)


def _narrowed(at: Callable[[int], Trial], k: int, passing: int, failing: int) -> tuple[int, int]:
    return (k, failing) if at(k).passes else (passing, k)


def _bracket(at: Callable[[int], Trial], k: int, lowest: int, highest: int, guess: Guess,
             trials: dict[int, Trial]) -> tuple[int | None, int | None]:
    """A passing index below a failing one, stepping from k by the guess (doubling its step after the
    second try); (None, lowest) when the lowest fails, (highest, None) when the highest passes."""
    passing: int | None = None
    failing: int | None = None
    for attempt in range(64):
        if at(k).passes:
            passing = k if passing is None else max(passing, k)
        else:
            failing = k if failing is None else min(failing, k)
        if passing is not None and failing is not None:
            return passing, failing
        if passing == highest or failing == lowest:
            break
        estimate = guess([(k, at(k))])
        step = 2 ** max(0, attempt - 1)
        if passing is not None:
            k = min(highest, max(k + step, math.ceil(estimate) if estimate is not None else 2 * k - lowest + 1))
        else:
            k = max(lowest, min(k - step, math.floor(estimate) if estimate is not None else (k + lowest) // 2))
    return passing, failing


def _finite_positive(value: float) -> bool:
    return math.isfinite(value) and value > 0


def span_guess(resolution: float) -> Guess:
    """Mode "span": utilization taken as a power of the span (from two trials; from one, the square,
    as bending under a uniform load), the boundary where it reaches 1, in grid steps."""

    def guess(points: list[tuple[int, Trial]]) -> float | None:
        usable = [(k * resolution, t.utilization) for k, t in points if k > 0 and _finite_positive(t.utilization)]
        if len(usable) == 1:
            span, utilization = usable[0]
            return span * utilization ** -0.5 / resolution
        if len(usable) == 2 and usable[0][1] != usable[1][1]:
            (s1, u1), (s2, u2) = usable
            power = math.log(u2 / u1) / math.log(s2 / s1)
            return s1 * u1 ** (-1 / power) / resolution if power > 0 else None
        return None

    return guess


def load_guess(base: Trial) -> Guess:
    """Mode "load": utilization taken as linear in the load factor (from the unloaded trial `base`
    and one more, or from two), the factor where it reaches 1, in grid steps of 0.5 %."""

    def factor(k: int) -> float:
        return LOAD_STEP ** k

    def guess(points: list[tuple[int, Trial]]) -> float | None:
        usable = [(factor(k), t.utilization) for k, t in points if math.isfinite(t.utilization)]
        if len(usable) == 1 and math.isfinite(base.utilization):
            usable = [(0.0, base.utilization)] + usable
        if len(usable) != 2 or usable[0][1] == usable[1][1]:
            return None
        (f1, u1), (f2, u2) = usable
        root = f1 + (1 - u1) * (f2 - f1) / (u2 - u1)
        return math.log(root) / math.log(LOAD_STEP) if root > 0 else None

    return guess


# ----------------------------------------------------------------------------------------------
# one cell (runs in a worker)

def work_cell(task: CellTask) -> dict:
    """One cell: mode "span", the longest span for the column's load; mode "load", the largest load at
    the column's span. A JSON-ready dict (SI)."""
    from sizer.parallel import catalogue_folders

    try:
        paths = catalogue_folders(task.catalogue)
        if task.spec.mode == "span":
            return longest_span(task.spec, task.section, task.spec.loads[task.column], paths)
        return largest_load(task.spec, task.section, task.spec.lengths[task.column], paths)
    except InputError as error:
        return error_result(error)


def longest_span(spec: SpanTableSpec, section: str, load: AppliedLoad, catalogue: Sequence[Path]) -> dict:
    """The longest span (a multiple of the resolution, up to max_span) that passes every check under `load`."""
    highest = math.floor(spec.max_span / spec.resolution + 1e-9)
    found = largest_passing(lambda k: run_trial(spec, section, k * spec.resolution, load, catalogue),
                            round(min(FIRST_SPAN, spec.max_span) / spec.resolution), 1, highest, span_guess(spec.resolution))
    limit = found.trial(found.failing) or found.trial(found.passing)
    return {"load": load.value, "kind": load.kind, "longest_span": found.passing * spec.resolution if found.passing is not None else None,
            "governing": limit.governing if found.failing is not None else None,
            "beyond_limit": found.failing is None, "checks_made": len(found.trials)}


def largest_load(spec: SpanTableSpec, section: str, span: float, catalogue: Sequence[Path]) -> dict:
    """The largest multiple of the given load (0.5 % steps) that passes every check at span `span`."""
    base = run_trial(spec, section, span, spec.load.scaled(0.0), catalogue)
    row = {"length": span, "kind": spec.load.kind, "largest_load": None, "governing": base.governing, "beyond_limit": False, "checks_made": 1}
    if not base.passes:
        return row
    found = largest_passing(lambda k: run_trial(spec, section, span, spec.load.scaled(LOAD_STEP ** k), catalogue),
                            0, -LOAD_GRID, LOAD_GRID, load_guess(base))
    if found.passing is None:
        return {**row, "governing": found.trial(found.failing).governing, "checks_made": 1 + len(found.trials)}
    return {**row, "largest_load": spec.load.value * LOAD_STEP ** found.passing,
            "governing": found.trial(found.failing).governing if found.failing is not None else None,
            "beyond_limit": found.failing is None, "checks_made": 1 + len(found.trials)}


# ----------------------------------------------------------------------------------------------
# the whole table

def table_sections(spec: SpanTableSpec, catalogue: Sequence[Path], families: Sequence[str]) -> tuple[list[tuple[str, float]], Any]:
    """(name, mass per length in kg/m) of every catalogue section after the family filter, lightest
    first, and the catalogue; the material is looked up now (bad input before any work)."""
    from sizer.design import catalogue_for, resolve_material
    from sizer.sections.properties import SCALAR_NAMES, section_table

    probe = trial_member(spec, "probe", 1.0, spec.loads[0] if spec.loads else spec.load)
    loaded = catalogue_for(probe, [Path(path) for path in catalogue])
    try:
        material = resolve_material(probe, loaded)
    except InputError as error:
        raise span_table_error(spec, InputError(spec.path, "member.material", error.problem, error.fix)) from None
    specs = loaded.select(families)
    if not specs:
        raise InputError(", ".join(map(str, loaded.files)) or "the catalogue", "sections", "the catalogue holds no sections",
                         "add [[sections]] entries, or pass --catalogue with a stock list")
    from sizer.render.sections import with_build_progress

    table = with_build_progress("Section properties (first use of these shapes)", lambda progress: section_table(specs, progress=progress))
    areas = table[:, SCALAR_NAMES.index("area")]
    masses = [(spec_.name, float(area) * material.density) for spec_, area in zip(specs, areas)]
    return sorted(masses, key=lambda item: (item[1], item[0])), loaded


def cell_key(task: CellTask) -> str:
    """The content hash of a cell's work: the table's settings (not its file's path or comments), the
    section, the column, the catalogue's text and sizer's code."""
    settings = {name: getattr(task.spec, name) for name in SpanTableSpec.__dataclass_fields__ if name not in ("path", "text")}
    return content_hash("span-table-cell", settings, task.section, task.column, task.catalogue.digest, code_fingerprint())


def run_span_table(spec: SpanTableSpec, catalogue: Sequence[Path] = (), families: Sequence[str] = (), jobs: int | None = None,
                   cluster: str | None = None, show_progress: bool = True) -> SpanTableResult:
    """Every section's cells (in parallel), sections by mass per length."""
    with Workers(jobs, cluster) as workers:
        sections, loaded = table_sections(spec, catalogue, families)
        shipped = ship_catalogue(loaded.files)
        tasks = [CellTask(spec, name, column, shipped) for name, _ in sections for column in range(spec.columns)]
        work = [Job(cell_key(task), task, task.section) for task in tasks]
        try:
            results, summary = workers.run(work_cell, work, "Cells", show_progress=show_progress)
        except JobFailed as failed:
            raise failed.error from None
    for result in results:
        if (error := result_error(result)) is not None:
            raise error
    rows = [{"section": name, "mass_per_length": mass, "rows": results[k * spec.columns:(k + 1) * spec.columns]}
            for k, (name, mass) in enumerate(sections)]
    return SpanTableResult(spec, rows, summary, span_table_notes(spec, summary))


def span_table_notes(spec: SpanTableSpec, summary: RunSummary) -> list[str]:
    """Every assumption the table rests on, in words."""
    from sizer import units

    layout = {"simple": "simply supported (pin at end A, roller at end B)", "cantilever": "cantilever (fixed at end A, tip free)",
              "continuous": f"continuous over {spec.spans} equal spans (pin at end A, rollers at the other supports)"}[spec.layout]
    restraint = {"continuous": "held sideways and against twist at the top all along (a deck)",
                 "supports": "held sideways and against twist only at the supports"}.get(spec.restraint) if isinstance(spec.restraint, str) else \
        f"held sideways and against twist at the top by point restraints every {units.fmt(spec.restraint, 'length')} from each span's start"
    notes = [f"Layout: {layout}; the section in {spec.orientation} orientation, material {spec.material}.",
             f"Restraint: {restraint}.",
             "Loads act along y (negative: downward); a uniform load is on every span, a point load at the middle of each span"
             + (" (at the tip)" if spec.layout == "cantilever" else "") + ".",
             "Self-weight " + (f"in case '{spec.self_weight}'." if spec.self_weight else "left out (self_weight = false).")]
    if spec.dead_load is not None:
        notes.append(f"Dead load {units.fmt(spec.dead_load, 'force_per_length')} on every span in case '{DEAD}'.")
    combos = user_combinations(spec)
    notes.append("Combinations: " + "; ".join(f"{name} = " + " + ".join(f"{factor:g} x {case}" for case, factor in factors.items())
                                               for name, factors in combos.items() if isinstance(factors, dict)) + ".")
    if spec.spans > 1:
        notes.append(f"Pattern loading: each combination with the imposed load is checked for every arrangement of loaded spans "
                     f"({2 ** spec.spans - 1} arrangements).")
    if spec.mode == "span":
        notes.append(f"Longest span found on a {units.fmt(spec.resolution, 'dimension')} grid up to {units.fmt(spec.max_span, 'length')}: "
                     "it passes every check and the next step fails. Spans are each span's length.")
    else:
        notes.append("Largest load found in 0.5 % steps: it passes every check and 0.5 % more fails.")
    notes.append("Every trial is the full check of `sizer check`; the search assumes the utilization rises with span (or load) and "
                 "finds one boundary where it does not.")
    notes.append(summary.note("cells"))
    return notes
