"""Member files (TOML, SPEC section 3) to `model.Member`, with errors that name file, key and line.

Every dimensioned value is a string with its unit, parsed by `units.parse` to SI. Unknown keys are
errors (a misspelt key would otherwise be silently ignored).
"""

from __future__ import annotations

import math
import re
import tomllib
from dataclasses import replace
from pathlib import Path
from typing import Any

from sizer import units
from sizer.errors import InputError
from sizer.model import (
    DEFAULT_CASE,
    DEFAULT_COMBINATION,
    FREEDOMS,
    HEIGHT_FACES,
    RESTRAINT_HOLDS,
    SUPPORT_TYPES,
    WARPING_CHOICES,
    Allowables,
    CheckSettings,
    DeflectionLimit,
    Hinge,
    LineLoad,
    Load,
    Material,
    Member,
    PointLoad,
    Pressure,
    Restraint,
    Support,
)

GRAVITY_DIRECTIONS = {"-x": (0, -1), "+x": (0, 1), "-y": (1, -1), "+y": (1, 1), "-z": (2, -1), "+z": (2, 1)}
TOP_KEYS = {"title", "member", "supports", "hinges", "restraints", "loads", "combinations", "checks", "materials"}
MEMBER_KEYS = {"length", "material", "section", "orientation", "self_weight", "gravity"}
SUPPORT_KEYS = {"at", "type", "restrain", "springs", "warping"}
RESTRAINT_KEYS = {"at", "from", "to", "hold", "height"}
LOAD_KEYS = {
    "point": {"type", "case", "at", "fx", "fy", "fz", "height", "pattern"},
    "moment": {"type", "case", "at", "mx", "my", "mz", "pattern"},
    "line": {"type", "case", "from", "to", "wx", "wy", "wz", "mx", "wx_end", "wy_end", "wz_end", "mx_end", "height", "pattern"},
    "area": {"type", "case", "from", "to", "px", "py", "pz", "px_end", "py_end", "pz_end", "width", "height", "pattern"},
}
LINE_COMPONENTS = (("wx", "force_per_length"), ("wy", "force_per_length"), ("wz", "force_per_length"), ("mx", "moment_per_length"))
AREA_COMPONENTS = ("px", "py", "pz")  # pressures along x, y, z; times the width they make wx, wy, wz
SINGLE_DEFLECTION_KEYS = ("deflection_limit", "deflection_limit_overhang", "deflection_combinations")
CHECK_KEYS = {
    *SINGLE_DEFLECTION_KEYS, "deflection",
    "buckling_length_major", "buckling_length_minor", "buckling_safety_factor",
}
DEFLECTION_KEYS = {"limit", "overhang_limit", "combinations", "relative_to_supports"}
MATERIAL_KEYS = {"elastic_modulus", "shear_modulus", "poisson_ratio", "density", "yield_strength", "allowable"}
ALLOWABLE_KEYS = ("tension", "compression", "bending", "shear", "equivalent")
LARGEST_NUMBER = 1e6  # plain numbers (factors, limits, ratios) are at most this in size (docs/limits.md)


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


def read_member_file(path: str | Path) -> Member:
    """Read a member file into a Member. Raises InputError (one line: file, key, line, fix)."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except OSError as exc:
        raise InputError(str(path), "", f"cannot read the file ({exc.strerror})", "check the path") from None
    except UnicodeDecodeError as exc:
        raise InputError(str(path), "", f"the file is not UTF-8 text (byte {exc.start + 1})", "save it as UTF-8 text") from None
    return parse_member_text(text, path)


def parse_toml(text: str, path: Path) -> dict:
    """tomllib with the error turned into InputError; a leading byte-order mark is skipped."""
    try:
        return tomllib.loads(text.removeprefix("\ufeff"))
    except tomllib.TOMLDecodeError as exc:
        match = re.search(r"line (\d+)", str(exc))
        line = int(match.group(1)) if match else None
        raise InputError(str(path), "", f"not valid TOML: {exc}", "correct the TOML syntax", line) from None


def parse_member_text(text: str, path: Path) -> Member:
    """Parse member-file text (SPEC section 3) read from `path`."""
    text = text.removeprefix("\ufeff")
    data = parse_toml(text, path)
    reader = Reader(path, text)
    reader.known_keys(data, TOP_KEYS, "")
    if "member" not in data:
        raise reader.error("member", "the [member] table is missing", 'add [member] with length = "6 m"')
    member_table = reader.table(data["member"], "member")
    reader.known_keys(member_table, MEMBER_KEYS, "member")
    length = reader.required_quantity(member_table, "length", "length", "member", 'give e.g. length = "6 m"')
    if length <= 0:
        raise reader.error("member.length", "the length must be greater than zero", 'give e.g. length = "6 m"')
    supports = tuple(_read_supports(reader, data.get("supports", []), length))
    hinges = tuple(_read_hinges(reader, data.get("hinges", []), length))
    restraints = tuple(_read_restraints(reader, data.get("restraints", []), length))
    loads = tuple(_read_loads(reader, data.get("loads", []), length))
    self_weight_case = _read_self_weight(reader, member_table)
    combinations, given = _read_combinations(reader, data.get("combinations"), loads, self_weight_case)
    materials = {
        name: parse_material(name, reader.table(table, f"materials.{name}"), reader, f"materials.{name}")
        for name, table in reader.table(data.get("materials", {}), "materials").items()
    }
    return Member(
        length=length,
        material=_optional_string(reader, member_table, "material", "member") or "",
        supports=supports,
        loads=loads,
        combinations=combinations,
        section=_optional_string(reader, member_table, "section", "member"),
        orientation=_read_choice(reader, member_table, "orientation", ("major", "minor"), "major"),
        self_weight_case=self_weight_case,
        gravity=GRAVITY_DIRECTIONS[_read_choice(reader, member_table, "gravity", tuple(GRAVITY_DIRECTIONS), "-y")],
        hinges=hinges,
        restraints=restraints,
        checks=_read_checks(reader, data.get("checks", {}), length, combinations),
        materials=materials,
        title=_optional_string(reader, data, "title", "") or "",
        source=str(path),
        combinations_given=given,
    )


def _optional_string(reader: Reader, table: dict, name: str, key_prefix: str) -> str | None:
    if name not in table:
        return None
    value = table[name]
    key = f"{key_prefix}.{name}" if key_prefix else name
    if not isinstance(value, str) or not value.strip():
        raise reader.error(key, f"expected a non-empty string, got {value!r}", f'write {name} = "..."')
    return value.strip()


def _read_choice(reader: Reader, table: dict, name: str, choices: tuple[str, ...], default: str) -> str:
    value = table.get(name, default)
    if value not in choices:
        raise reader.error(f"member.{name}", f"{value!r} is not allowed", "use one of: " + ", ".join(f'"{c}"' for c in choices))
    return value


def _array_of_tables(reader: Reader, value: Any, name: str) -> list[dict]:
    if not isinstance(value, list) or not all(isinstance(item, dict) for item in value):
        raise reader.error(name, "expected an array of tables", f"write each entry as [[{name}]]")
    return value


def _read_supports(reader: Reader, value: Any, length: float) -> list[Support]:
    supports: list[Support] = []
    for index, table in enumerate(_array_of_tables(reader, value, "supports"), start=1):
        prefix = f"supports[{index}]"
        reader.known_keys(table, SUPPORT_KEYS, prefix)
        at = reader.position(table, "at", prefix, length)
        restrain, label = _support_freedoms(reader, table, prefix)
        springs = _read_springs(reader, table.get("springs", {}), f"{prefix}.springs")
        restrain = restrain - set(springs)
        if not restrain and not springs:
            raise reader.error(prefix, "this support holds nothing", 'give type = "pin" or a restrain list or springs')
        for other in supports:
            if abs(other.at - at) <= 1e-9 * length:
                raise reader.error(f"{prefix}.at", f"two supports at {units.fmt(at, 'length')}",
                                   "merge them into one support with the freedoms of both")
        warping = _read_warping(reader, table, prefix)
        supports.append(Support(at=at, restrain=frozenset(restrain), springs=springs, label=label if not springs or label == "springs" else f"{label} + springs",
                                warping=warping))
    return supports


def _support_freedoms(reader: Reader, table: dict, prefix: str) -> tuple[set[str], str]:
    if "type" in table and "restrain" in table:
        raise reader.error(f"{prefix}.restrain", "give either type or restrain, not both", "remove one of them")
    if "type" in table:
        kind = table["type"]
        if not isinstance(kind, str) or kind not in SUPPORT_TYPES:
            raise reader.error(f"{prefix}.type", f"unknown support type {kind!r}", 'use "fixed", "pin" or "roller", or a restrain list')
        return set(SUPPORT_TYPES[kind]), kind
    if "restrain" in table:
        freedoms = table["restrain"]
        if not isinstance(freedoms, list) or not all(isinstance(item, str) for item in freedoms):
            raise reader.error(f"{prefix}.restrain", "expected a list of freedoms", 'write e.g. restrain = ["uy", "rz"]')
        for item in freedoms:
            if item not in FREEDOMS:
                raise reader.error(f"{prefix}.restrain", f"unknown freedom {item!r}", "use: " + ", ".join(FREEDOMS))
        return set(freedoms), "restrain " + " ".join(freedoms)
    if "springs" in table:
        return set(), "springs"
    raise reader.error(f"{prefix}.type", "the support has no type", 'give type = "fixed", "pin" or "roller", or restrain = [...]')


def _read_springs(reader: Reader, value: Any, prefix: str) -> dict[str, float]:
    springs: dict[str, float] = {}
    for freedom, text in reader.table(value, prefix).items():
        if freedom not in FREEDOMS:
            raise reader.error(f"{prefix}.{freedom}", f"unknown freedom {freedom!r}", "use: " + ", ".join(FREEDOMS))
        kind = "translational_stiffness" if freedom.startswith("u") else "rotational_stiffness"
        stiffness = units.parse(text, kind, reader.file, f"{prefix}.{freedom}", reader.key_lines.find(f"{prefix}.{freedom}"))
        if stiffness <= 0:
            raise reader.error(f"{prefix}.{freedom}", "a spring stiffness must be greater than zero",
                               "give a positive stiffness, or hold the freedom rigidly with restrain")
        springs[freedom] = stiffness
    return springs


def _read_hinges(reader: Reader, value: Any, length: float) -> list[Hinge]:
    hinges = []
    for index, table in enumerate(_array_of_tables(reader, value, "hinges"), start=1):
        prefix = f"hinges[{index}]"
        reader.known_keys(table, {"at"}, prefix)
        at = reader.position(table, "at", prefix, length)
        if at <= 0 or at >= length:
            raise reader.error(f"{prefix}.at", "a hinge must be inside the member, not at an end",
                               "move it inside, or use a pin support at the end")
        hinges.append(Hinge(at))
    return hinges


def _read_warping(reader: Reader, table: dict, prefix: str) -> str | None:
    """A support's `warping` ("free" or "held"), None when not given."""
    value = table.get("warping")
    if value is not None and value not in WARPING_CHOICES:
        raise reader.error(f"{prefix}.warping", f"{value!r} is not a warping condition", 'use warping = "free" or "held"')
    return value


def read_height(reader: Reader, table: dict, prefix: str, default: str | None) -> str | float | None:
    """`height`: "top", "centre", "bottom", or a length from the shear centre along the depth (m,
    positive towards the top); `default` when absent."""
    if "height" not in table:
        return default
    value = table["height"]
    if isinstance(value, str) and value.strip() in HEIGHT_FACES:
        return value.strip()
    fix = 'use "top", "centre", "bottom" or a distance from the shear centre such as "+80 mm" or "-40 mm"'
    if not isinstance(value, str):
        raise reader.error(f"{prefix}.height", f"{value!r} is not a height", fix)
    try:
        return reader.quantity(table, "height", "length", prefix)
    except InputError as error:
        error.fix = fix
        raise


def _read_restraints(reader: Reader, value: Any, length: float) -> list[Restraint]:
    """[[restraints]]: at a point (`at`) or continuous (`from`, `to`), holding lateral and/or twist."""
    restraints = []
    for index, table in enumerate(_array_of_tables(reader, value, "restraints"), start=1):
        prefix = f"restraints[{index}]"
        reader.known_keys(table, RESTRAINT_KEYS, prefix)
        if "at" in table and ("from" in table or "to" in table):
            raise reader.error(f"{prefix}.at", "give either at (a point restraint) or from and to (a continuous one), not both", "remove one")
        if "at" in table:
            start = end = reader.position(table, "at", prefix, length)
        elif "from" in table or "to" in table:
            start = reader.position(table, "from", prefix, length, default=0.0)
            end = reader.position(table, "to", prefix, length, default=length)
            if end <= start:
                raise reader.error(f"{prefix}.to", "'to' must be beyond 'from'", "give from < to along the member, or use at for a point")
        else:
            raise reader.error(prefix, "the restraint has no position", 'give at = "3 m", or from = "0 m" and to = "6 m" for a deck')
        holds = table.get("hold")
        if (not isinstance(holds, list) or not holds or not all(isinstance(item, str) for item in holds)
                or not set(holds) <= set(RESTRAINT_HOLDS)):
            raise reader.error(f"{prefix}.hold", f"expected a list of {' and/or '.join(RESTRAINT_HOLDS)}, got {holds!r}",
                               'write e.g. hold = ["lateral", "twist"]')
        if "height" in table and "lateral" not in holds:
            raise reader.error(f"{prefix}.height", "a height is where a lateral hold acts, and this restraint holds only twist",
                               'remove height, or add "lateral" to hold')
        height = read_height(reader, table, prefix, "centre")
        restraints.append(Restraint(start, end, "lateral" in holds, "twist" in holds, height))
    return restraints


def _case_name(reader: Reader, table: dict, prefix: str) -> str:
    case = table.get("case", DEFAULT_CASE)
    if not isinstance(case, str) or not case.strip():
        raise reader.error(f"{prefix}.case", f"expected a case name, got {case!r}", 'write e.g. case = "imposed"')
    return case.strip()


def _read_loads(reader: Reader, value: Any, length: float) -> list[Load]:
    loads: list[Load] = []
    for index, table in enumerate(_array_of_tables(reader, value, "loads"), start=1):
        prefix = f"loads[{index}]"
        kind = table.get("type")
        if not isinstance(kind, str) or kind not in LOAD_KEYS:
            raise reader.error(f"{prefix}.type", f"unknown load type {kind!r}", 'use "point", "moment", "line" or "area"')
        reader.known_keys(table, LOAD_KEYS[kind], prefix)
        case = _case_name(reader, table, prefix)
        if kind == "line":
            load: Load = _read_line_load(reader, table, prefix, case, length)
        elif kind == "area":
            load = _read_area_load(reader, table, prefix, case, length)
        else:
            load = _read_point_load(reader, table, prefix, case, kind, length)
        loads.append(replace(load, pattern=_read_pattern(reader, table, prefix)))
    return loads


def _read_pattern(reader: Reader, table: dict, prefix: str) -> bool:
    """`pattern`: true makes the load patterned (each span loaded or not, every arrangement checked)."""
    value = table.get("pattern", False)
    if not isinstance(value, bool):
        raise reader.error(f"{prefix}.pattern", f"expected true or false, got {value!r}", "write pattern = true (no quotes)")
    return value


def _read_point_load(reader: Reader, table: dict, prefix: str, case: str, kind: str, length: float) -> PointLoad:
    at = reader.position(table, "at", prefix, length)
    if kind == "point":
        names, quantity = ("fx", "fy", "fz"), "force"
    else:
        names, quantity = ("mx", "my", "mz"), "moment"
    values = tuple(reader.quantity(table, name, quantity, prefix, 0.0) for name in names)
    if not any(name in table for name in names):
        raise reader.error(prefix, f"the {kind} load has no components", f"give at least one of {', '.join(names)}")
    if kind == "point":
        return PointLoad(case=case, at=at, force=values, height=read_height(reader, table, prefix, None))
    return PointLoad(case=case, at=at, moment=values)


def _read_line_load(reader: Reader, table: dict, prefix: str, case: str, length: float) -> LineLoad:
    start = reader.position(table, "from", prefix, length, default=0.0)
    end = reader.position(table, "to", prefix, length, default=length)
    if end <= start:
        raise reader.error(f"{prefix}.to", "'to' must be beyond 'from'", "give from < to along the member")
    if not any(name in table for name, _ in LINE_COMPONENTS):
        raise reader.error(prefix, "the line load has no components", "give at least one of wx, wy, wz, mx")
    q_start = tuple(reader.quantity(table, name, kind, prefix, 0.0) for name, kind in LINE_COMPONENTS)
    q_end = []
    for (name, kind), first in zip(LINE_COMPONENTS, q_start):
        if f"{name}_end" in table and name not in table:
            raise reader.error(f"{prefix}.{name}_end", f"'{name}_end' given without '{name}'", f"give {name} (the value at 'from') too")
        q_end.append(reader.quantity(table, f"{name}_end", kind, prefix, first))
    return LineLoad(case=case, start=start, end=end, q_start=q_start, q_end=tuple(q_end), height=read_height(reader, table, prefix, None))


def _read_area_load(reader: Reader, table: dict, prefix: str, case: str, length: float) -> LineLoad:
    """`type = "area"`: pressures px, py, pz (and _end values) on a tributary width, read as the line
    load pressure x width that keeps the pressure and width for display."""
    start = reader.position(table, "from", prefix, length, default=0.0)
    end = reader.position(table, "to", prefix, length, default=length)
    if end <= start:
        raise reader.error(f"{prefix}.to", "'to' must be beyond 'from'", "give from < to along the member")
    for name in AREA_COMPONENTS:
        if f"{name}_end" in table and name not in table:
            raise reader.error(f"{prefix}.{name}_end", f"'{name}_end' given without '{name}'", f"give {name} (the pressure at 'from') too")
    if not any(name in table for name in AREA_COMPONENTS):
        raise reader.error(prefix, "the area load has no pressure", 'give at least one of px, py, pz, e.g. py = "-2.5 kPa"')
    width = reader.required_quantity(table, "width", "length", prefix, 'give the tributary width, e.g. width = "1.2 m"')
    if width <= 0:
        raise reader.error(f"{prefix}.width", "the tributary width must be greater than zero", 'give e.g. width = "1.2 m"')
    p_start = tuple(reader.quantity(table, name, "pressure", prefix, 0.0) for name in AREA_COMPONENTS)
    p_end = [reader.quantity(table, f"{name}_end", "pressure", prefix, first) for name, first in zip(AREA_COMPONENTS, p_start)]
    for suffix, pressures in (("", p_start), ("_end", p_end)):
        for name, pressure in zip(AREA_COMPONENTS, pressures):
            _line_load_in_range(reader, f"{prefix}.{name}{suffix}", pressure * width)
    return LineLoad(case=case, start=start, end=end, q_start=(*(p * width for p in p_start), 0.0), q_end=(*(p * width for p in p_end), 0.0),
                    height=read_height(reader, table, prefix, None), area=Pressure(p_start, tuple(p_end), width))


def _line_load_in_range(reader: Reader, key: str, intensity: float) -> None:
    """InputError when pressure x width is beyond the line loads sizer accepts (units.LIMITS)."""
    largest = units.LIMITS["force_per_length"][1]
    if abs(intensity) > largest:
        raise reader.error(key, f"pressure x width is {intensity:.3g} N/m, beyond the line loads sizer accepts ({largest:g} N/m)",
                           "give a smaller pressure or width (see docs/limits.md)")


def _read_self_weight(reader: Reader, member_table: dict) -> str | None:
    value = member_table.get("self_weight", "dead")
    if value is False:
        return None
    if value is True:
        return "dead"
    if not isinstance(value, str) or not value.strip():
        raise reader.error("member.self_weight", f"expected a case name or false, got {value!r}", 'write self_weight = "dead" or false')
    return value.strip()


def _read_combinations(reader: Reader, value: Any, loads: tuple[Load, ...], self_weight_case: str | None) -> tuple[dict[str, dict[str, float]], bool]:
    cases = list(dict.fromkeys(load.case for load in loads))
    if self_weight_case and self_weight_case not in cases:
        cases.append(self_weight_case)
    if value is None:
        return {DEFAULT_COMBINATION: {case: 1.0 for case in cases}}, False
    table = reader.table(value, "combinations")
    if not table:
        raise reader.error("combinations", "no combinations are given", "add one, or remove [combinations] to combine every case x 1.0")
    combinations: dict[str, dict[str, float]] = {}
    for name, factors in table.items():
        prefix = f"combinations.{name}"
        if not name.strip():
            raise reader.error(f'combinations."{name}"', "a combination has an empty name", 'give it a name, e.g. "dead + imposed" = { dead = 1.0, imposed = 1.0 }')
        factors = reader.table(factors, prefix)
        for case, factor in factors.items():
            if case not in cases:
                raise reader.error(f"{prefix}.{case}", f"no load case is named {case!r}",
                                   "use one of: " + ", ".join(cases) if cases else "add loads with that case")
            reader.number(factor, f"{prefix}.{case}", positive=False)
        combinations[name] = {case: float(factor) for case, factor in factors.items()}
    if self_weight_case and not any(self_weight_case in factors for factors in combinations.values()):
        raise reader.error("member.self_weight", f"the self-weight case {self_weight_case!r} is in no combination ({', '.join(combinations)}), so the weight would be left out",
                           f"add {self_weight_case} = 1.0 (or your factor) to the combinations, or set self_weight = false")
    return combinations, True


def _read_checks(reader: Reader, value: Any, length: float, combinations: dict[str, dict[str, float]]) -> CheckSettings:
    table = reader.table(value, "checks")
    reader.known_keys(table, CHECK_KEYS, "checks")
    limit = reader.number(table["deflection_limit"], "checks.deflection_limit") if "deflection_limit" in table else None
    overhang = reader.number(table["deflection_limit_overhang"], "checks.deflection_limit_overhang") if "deflection_limit_overhang" in table else None
    chosen = _combination_names(reader, table, "deflection_combinations", "checks", combinations)
    entries = _read_deflection_limits(reader, table.get("deflection", []), combinations)
    single = [name for name in SINGLE_DEFLECTION_KEYS if name in table]
    if entries and single:
        raise reader.error(f"checks.{single[0]}", "deflection limits are given both as single keys and as [[checks.deflection]] entries",
                           f"move {single[0]} into a [[checks.deflection]] entry (limit, overhang_limit, combinations), or remove the entries")
    lengths = {}
    for name in ("buckling_length_major", "buckling_length_minor"):
        lengths[name] = reader.quantity(table, name, "length", "checks")
        if lengths[name] is not None and lengths[name] <= 0:
            raise reader.error(f"checks.{name}", "a buckling length must be greater than zero", 'give e.g. "3 m"')
    factor_given = "buckling_safety_factor" in table
    factor = reader.number(table["buckling_safety_factor"], "checks.buckling_safety_factor") if factor_given else 2.0
    return CheckSettings(
        deflection_limit=limit,
        deflection_limit_overhang=overhang,
        deflection_combinations=chosen,
        deflection=entries,
        buckling_length_major=lengths["buckling_length_major"],
        buckling_length_minor=lengths["buckling_length_minor"],
        buckling_safety_factor=factor,
        buckling_safety_factor_given=factor_given,
    )


def _combination_names(reader: Reader, table: dict, name: str, prefix: str, combinations: dict[str, dict[str, float]]) -> tuple[str, ...] | None:
    """A list of combination names (table[name]) that must all be given combinations; None when absent."""
    chosen = table.get(name)
    if chosen is None:
        return None
    key = f"{prefix}.{name}"
    if not isinstance(chosen, list) or not chosen or not all(isinstance(item, str) for item in chosen):
        raise reader.error(key, "expected a list of combination names", 'write e.g. ["dead + imposed"]')
    for item in chosen:
        if item not in combinations:
            raise reader.error(key, f"no combination is named {item!r}", "use one of: " + ", ".join(combinations))
    return tuple(chosen)


def _read_deflection_limits(reader: Reader, value: Any, combinations: dict[str, dict[str, float]]) -> tuple[DeflectionLimit, ...]:
    """[[checks.deflection]]: each entry a limit on spans (`limit`) and/or overhangs (`overhang_limit`,
    default limit / 2), in some combinations, relative to the supports or absolute."""
    entries = []
    for index, table in enumerate(_array_of_tables(reader, value, "checks.deflection"), start=1):
        prefix = f"checks.deflection[{index}]"
        reader.known_keys(table, DEFLECTION_KEYS, prefix)
        if "limit" not in table and "overhang_limit" not in table:
            raise reader.error(prefix, "the deflection limit has no limit", "give limit = 360 (span / 360) and/or overhang_limit = 180")
        limit = reader.number(table["limit"], f"{prefix}.limit") if "limit" in table else None
        overhang = reader.number(table["overhang_limit"], f"{prefix}.overhang_limit") if "overhang_limit" in table else None
        relative = table.get("relative_to_supports", True)
        if not isinstance(relative, bool):
            raise reader.error(f"{prefix}.relative_to_supports", f"expected true or false, got {relative!r}",
                               "write relative_to_supports = true (from the chord between the supports) or false (from the original position)")
        chosen = _combination_names(reader, table, "combinations", prefix, combinations)
        entries.append(DeflectionLimit(limit, overhang if overhang is not None else (limit / 2 if limit is not None else None), chosen, relative))
    return tuple(entries)


def parse_material(name: str, table: dict, reader: Reader, prefix: str) -> Material:
    """A [materials.NAME] table (member or catalogue file) to a Material. Needs E, density and G or
    Poisson's ratio; allowables optional (a check whose allowable is missing is reported as not made)."""
    reader.known_keys(table, MATERIAL_KEYS, prefix)
    modulus = reader.required_quantity(table, "elastic_modulus", "modulus", prefix, 'give e.g. elastic_modulus = "200 GPa"')
    density = reader.required_quantity(table, "density", "density", prefix, 'give e.g. density = "7850 kg/m^3"')
    if "shear_modulus" in table and "poisson_ratio" in table:
        raise reader.error(f"{prefix}.poisson_ratio", "give shear_modulus or poisson_ratio, not both", "remove one")
    if "shear_modulus" in table:
        shear = reader.quantity(table, "shear_modulus", "modulus", prefix)
    elif "poisson_ratio" in table:
        nu = reader.number(table["poisson_ratio"], f"{prefix}.poisson_ratio", positive=False)
        if not 0 <= nu < 0.5:
            raise reader.error(f"{prefix}.poisson_ratio", f"{nu} is outside 0 to 0.5", "give e.g. poisson_ratio = 0.3")
        shear = modulus / (2 * (1 + nu))
    else:
        raise reader.error(f"{prefix}.shear_modulus", "shear_modulus is missing", 'give e.g. shear_modulus = "77 GPa" or poisson_ratio = 0.3')
    yield_strength = reader.quantity(table, "yield_strength", "stress", prefix)
    for key, number in (("elastic_modulus", modulus), ("shear_modulus", shear), ("density", density), ("yield_strength", yield_strength)):
        if number is not None and number <= 0:
            raise reader.error(f"{prefix}.{key}", "must be greater than zero", "give a positive value")
    allowable_table = reader.table(table.get("allowable", {}), f"{prefix}.allowable")
    reader.known_keys(allowable_table, ALLOWABLE_KEYS, f"{prefix}.allowable")
    allowables = {}
    for key in ALLOWABLE_KEYS:
        allowables[key] = reader.quantity(allowable_table, key, "stress", f"{prefix}.allowable")
        if allowables[key] is not None and allowables[key] <= 0:
            raise reader.error(f"{prefix}.allowable.{key}", "an allowable stress must be greater than zero", 'give e.g. "165 MPa"')
    return Material(name=name, elastic_modulus=modulus, shear_modulus=shear, density=density,
                    yield_strength=yield_strength, allowable=Allowables(**allowables), source=reader.file)
