"""[[loads]] of a member file: point loads and moments, line loads and area loads (a pressure on a
tributary width, read as the line load it makes), their cases, heights and pattern flag. SI inside.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from sizer import units
from sizer.inputfile.reader import Reader, array_of_tables, read_across, read_bearing, read_height
from sizer.model import DEFAULT_CASE, LineLoad, Load, PointLoad, Pressure

LOAD_KEYS = {
    "point": {"type", "case", "at", "fx", "fy", "fz", "height", "across", "pattern", "bearing", "stiffened"},
    "moment": {"type", "case", "at", "mx", "my", "mz", "pattern"},
    "line": {"type", "case", "from", "to", "wx", "wy", "wz", "mx", "wx_end", "wy_end", "wz_end", "mx_end", "height", "across", "pattern"},
    "area": {"type", "case", "from", "to", "px", "py", "pz", "px_end", "py_end", "pz_end", "width", "height", "across", "pattern"},
}


LINE_COMPONENTS = (("wx", "force_per_length"), ("wy", "force_per_length"), ("wz", "force_per_length"), ("mx", "moment_per_length"))


AREA_COMPONENTS = ("px", "py", "pz")  # pressures along x, y, z; times the width they make wx, wy, wz


def _case_name(reader: Reader, table: dict, prefix: str) -> str:
    case = table.get("case", DEFAULT_CASE)
    if not isinstance(case, str) or not case.strip():
        raise reader.error(f"{prefix}.case", f"expected a case name, got {case!r}", 'write e.g. case = "imposed"')
    return case.strip()


def read_loads(reader: Reader, value: Any, length: float) -> list[Load]:
    loads: list[Load] = []
    for index, table in enumerate(array_of_tables(reader, value, "loads"), start=1):
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
        load = replace(load, pattern=_read_pattern(reader, table, prefix))
        if kind != "moment":
            load = replace(load, across=read_across(reader, table, prefix))
        loads.append(load)
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
        bearing, stiffened = read_bearing(reader, table, prefix)
        return PointLoad(case=case, at=at, force=values, height=read_height(reader, table, prefix, None), bearing=bearing, stiffened=stiffened)
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
