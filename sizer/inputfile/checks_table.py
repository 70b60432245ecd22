"""The [checks] table of a member file: deflection limits (the single keys or [[checks.deflection]]
entries), buckling lengths, the buckling safety factor and the spacing of web stiffeners.
"""

from __future__ import annotations

import math
import re
from typing import Any

from sizer.inputfile.reader import DEFLECTION_LIMITS, SAFETY_FACTORS, Reader, array_of_tables
from sizer.model import CheckSettings, DeflectionLimit

SINGLE_DEFLECTION_KEYS = ("deflection_limit", "deflection_limit_overhang", "deflection_combinations")


CHECK_KEYS = {
    *SINGLE_DEFLECTION_KEYS, "deflection",
    "buckling_length_major", "buckling_length_minor", "buckling_safety_factor", "web_stiffener_spacing",
    "second_order", "imperfection",
}
BOW_RATIO = re.compile(r"^\s*L\s*/\s*([0-9]+(?:\.[0-9]*)?(?:[eE][+-]?[0-9]+)?)\s*$")
SMALLEST_BOW_DIVISOR = 10.0  # "L/n" with n below this is no imperfection but a bent member


DEFLECTION_KEYS = {"limit", "overhang_limit", "combinations", "relative_to_supports"}


def read_checks(reader: Reader, value: Any, length: float, combinations: dict[str, dict[str, float]]) -> CheckSettings:
    table = reader.table(value, "checks")
    reader.known_keys(table, CHECK_KEYS, "checks")
    limit = _deflection_limit(reader, table["deflection_limit"], "checks.deflection_limit") if "deflection_limit" in table else None
    overhang = _deflection_limit(reader, table["deflection_limit_overhang"], "checks.deflection_limit_overhang") if "deflection_limit_overhang" in table else None
    chosen = _combination_names(reader, table, "deflection_combinations", "checks", combinations)
    entries = _read_deflection_limits(reader, table.get("deflection", []), combinations)
    single = [name for name in SINGLE_DEFLECTION_KEYS if name in table]
    if entries and single:
        raise reader.error(f"checks.{single[0]}", "deflection limits are given both as single keys and as [[checks.deflection]] entries",
                           f"move {single[0]} into a [[checks.deflection]] entry (limit, overhang_limit, combinations), or remove the entries")
    lengths = {}
    for name in ("buckling_length_major", "buckling_length_minor", "web_stiffener_spacing"):
        lengths[name] = reader.quantity(table, name, "length", "checks")
        if lengths[name] is not None and lengths[name] <= 0:
            what = "a buckling length" if name.startswith("buckling") else "the spacing of web stiffeners"
            raise reader.error(f"checks.{name}", f"{what} must be greater than zero", 'give e.g. "3 m"')
    factor_given = "buckling_safety_factor" in table
    factor = (reader.number_in(table["buckling_safety_factor"], "checks.buckling_safety_factor", *SAFETY_FACTORS,
                               "the elastic critical value is divided by it; below 1 would raise the allowable")
              if factor_given else 2.0)
    second_order = table.get("second_order", True)
    if not isinstance(second_order, bool):
        raise reader.error("checks.second_order", f"expected true or false, got {str(second_order)[:40]!r}",
                           "write second_order = true (moments from a second-order solve, the default) or false (first order)")
    ratio, bow = _read_imperfection(reader, table, length)
    return CheckSettings(
        second_order=second_order,
        imperfection_ratio=ratio,
        imperfection_length=bow,
        deflection_limit=limit,
        deflection_limit_overhang=overhang,
        deflection_combinations=chosen,
        deflection=entries,
        buckling_length_major=lengths["buckling_length_major"],
        buckling_length_minor=lengths["buckling_length_minor"],
        buckling_safety_factor=factor,
        buckling_safety_factor_given=factor_given,
        web_stiffener_spacing=lengths["web_stiffener_spacing"],
    )


def _read_imperfection(reader: Reader, table: dict, length: float) -> tuple[float | None, float | None]:
    """`imperfection`: "L/n" (a bow of the member's length / n, n at least SMALLEST_BOW_DIVISOR) or a
    length ("5 mm", at most length / SMALLEST_BOW_DIVISOR); (ratio, None), (None, length) or (None, None)."""
    if "imperfection" not in table:
        return None, None
    value = table["imperfection"]
    fix = 'write e.g. imperfection = "L/1000" (a bow of the member length / 1000) or "5 mm"'
    if not isinstance(value, str):
        raise reader.error("checks.imperfection", f"expected a string such as \"L/1000\", got {str(value)[:40]!r}", fix)
    found = BOW_RATIO.match(value)
    if found:
        divisor = float(found.group(1))
        if not math.isfinite(divisor) or divisor < SMALLEST_BOW_DIVISOR:
            raise reader.error("checks.imperfection", f"{value!r} is a bow larger than L/{SMALLEST_BOW_DIVISOR:g}", fix)
        return 1.0 / divisor, None
    if "/" in value or value.strip().upper().startswith("L"):
        raise reader.error("checks.imperfection", f"cannot read {value!r}", fix)
    bow = reader.quantity(table, "imperfection", "length", "checks")
    if not bow > 0 or bow > length / SMALLEST_BOW_DIVISOR:
        raise reader.error("checks.imperfection", f"{value!r} is not a bow between 0 and the member length / {SMALLEST_BOW_DIVISOR:g}", fix)
    return None, bow


def _deflection_limit(reader: Reader, value: Any, key: str) -> float:
    """A deflection limit n (the deflection allowed is span / n), within DEFLECTION_LIMITS."""
    return reader.number_in(value, key, *DEFLECTION_LIMITS, "the deflection allowed is span / limit")


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
    for index, table in enumerate(array_of_tables(reader, value, "checks.deflection"), start=1):
        prefix = f"checks.deflection[{index}]"
        reader.known_keys(table, DEFLECTION_KEYS, prefix)
        if "limit" not in table and "overhang_limit" not in table:
            raise reader.error(prefix, "the deflection limit has no limit", "give limit = 360 (span / 360) and/or overhang_limit = 180")
        limit = _deflection_limit(reader, table["limit"], f"{prefix}.limit") if "limit" in table else None
        overhang = _deflection_limit(reader, table["overhang_limit"], f"{prefix}.overhang_limit") if "overhang_limit" in table else None
        relative = table.get("relative_to_supports", True)
        if not isinstance(relative, bool):
            raise reader.error(f"{prefix}.relative_to_supports", f"expected true or false, got {relative!r}",
                               "write relative_to_supports = true (from the chord between the supports) or false (from the original position)")
        chosen = _combination_names(reader, table, "combinations", prefix, combinations)
        entries.append(DeflectionLimit(limit, overhang if overhang is not None else (limit / 2 if limit is not None else None), chosen, relative))
    return tuple(entries)
