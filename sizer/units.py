"""Units at the edge: parse strings such as "2.5 kN/m" to SI floats, and format SI floats for display.

Inside sizer every number is an SI float (m, N, N*m, Pa, kg, rad). The one pint registry is built
lazily on first parse, so that `sizer --help` does not pay for importing pint.
Display uses fixed, exact conversion factors (no pint needed).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from sizer.errors import InputError

GRAVITY = 9.80665  # m/s^2, standard gravity (ISO 80000-3, common practice)

# kind -> (SI unit string for pint, words for messages, an example)
KINDS: dict[str, tuple[str, str, str]] = {
    "length": ("m", "a length", '"2.5 m" or "1500 mm"'),
    "force": ("N", "a force", '"12 kN"'),
    "moment": ("N*m", "a moment", '"8 kN*m"'),
    "force_per_length": ("N/m", "a force per length", '"2.5 kN/m"'),
    "moment_per_length": ("N*m/m", "a torque per length", '"0.4 kN*m/m"'),
    "stress": ("Pa", "a stress", '"165 MPa"'),
    "modulus": ("Pa", "a modulus", '"200 GPa"'),
    "density": ("kg/m^3", "a density", '"7850 kg/m^3"'),
    "translational_stiffness": ("N/m", "a spring stiffness", '"20 kN/mm"'),
    "rotational_stiffness": ("N*m/rad", "a rotational spring stiffness", '"500 kN*m/rad"'),
    "mass_per_length": ("kg/m", "a mass per length", '"12.2 kg/m"'),
}


@lru_cache(maxsize=1)
def registry() -> Any:
    """The one pint UnitRegistry of the program (built on first use)."""
    import pint

    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.define("kip = 1000 * lbf")
    ureg.define("ksi = kip / inch ** 2")
    return ureg


_NUMBER_AND_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)\s*$")
_UNIT_FACTORS: dict[str, float | None] | None = None  # "unit|kind" -> factor to SI, None: wrong dimension
UNIT_CACHE_NAME = "units-v1.json"


def parse(value: object, kind: str, file: str = "", key: str = "", line: int | None = None) -> float:
    """Parse `value` (a string with its unit) as `kind` (a key of KINDS); return the SI float.

    Raises InputError naming file, key and line for a bare number, an unknown unit, the wrong
    dimension, or a NaN or infinite value. Plain "number unit" strings use the factor pint gave
    for that unit before (kept in a small file in the cache folder), so a warm run needs no pint.
    """
    si_unit, words, example = KINDS[kind]
    if isinstance(value, bool) or not isinstance(value, (str, int, float)):
        raise InputError(file, key, f"expected {words} as a string with its unit", f"write e.g. {example}", line)
    if not isinstance(value, str):
        raise InputError(file, key, f"the number {value!r} has no unit", f"write it as a string with its unit, e.g. {example}", line)
    match = _NUMBER_AND_UNIT.match(value)
    if match:
        factor = unit_factor(match.group(2), kind)
        if factor is not None:
            number = float(match.group(1)) * factor
            if math.isfinite(number):
                return number
    return _parse_with_pint(value, kind, file, key, line)


def unit_factor(unit: str, kind: str) -> float | None:
    """SI units per one `unit` for `kind`, or None when `unit` is not of that kind or unknown.
    Learned from pint once and remembered on disk."""
    global _UNIT_FACTORS
    if _UNIT_FACTORS is None:
        _UNIT_FACTORS = _read_unit_cache()
    entry = f"{unit}|{kind}"
    if entry not in _UNIT_FACTORS:
        _UNIT_FACTORS[entry] = _factor_from_pint(unit, kind)
        _write_unit_cache(_UNIT_FACTORS)
    return _UNIT_FACTORS[entry]


def _factor_from_pint(unit: str, kind: str) -> float | None:
    import pint

    ureg = registry()
    try:
        quantity = ureg.Quantity(1.0, unit)
        if quantity.dimensionless and kind != "rotational_stiffness":
            return None
        factor = float(quantity.to(KINDS[kind][0]).magnitude)
    except (pint.errors.PintError, ValueError, TypeError, AttributeError, SyntaxError, AssertionError):
        return None
    return factor if math.isfinite(factor) and factor > 0 else None


def _unit_cache_path() -> Any:
    from sizer.files import cache_root

    return cache_root() / UNIT_CACHE_NAME


def _read_unit_cache() -> dict[str, float | None]:
    """The remembered unit factors; anything unreadable is ignored (pint recomputes it)."""
    import json

    try:
        data = json.loads(_unit_cache_path().read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return {}
    if not isinstance(data, dict):
        return {}
    return {k: v for k, v in data.items() if isinstance(k, str) and (v is None or (isinstance(v, float) and math.isfinite(v) and v > 0))}


def _write_unit_cache(factors: dict[str, float | None]) -> None:
    import json

    from sizer.files import write_atomic

    try:
        write_atomic(_unit_cache_path(), json.dumps(factors, sort_keys=True))
    except OSError:
        pass  # a read-only cache folder only costs speed


def _parse_with_pint(value: str, kind: str, file: str, key: str, line: int | None) -> float:
    """The general path: any expression pint understands; every error becomes an InputError."""
    si_unit, words, example = KINDS[kind]
    ureg = registry()
    import pint

    try:
        quantity = ureg.Quantity(value.strip())
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, ValueError, TypeError, AttributeError, SyntaxError) as exc:
        raise InputError(file, key, f"cannot read {value!r} as {words} ({exc.__class__.__name__})", f"write e.g. {example}", line) from None
    if not isinstance(quantity, ureg.Quantity):
        quantity = ureg.Quantity(quantity, "")
    if quantity.dimensionless and kind != "rotational_stiffness":
        raise InputError(file, key, f"{value!r} has no unit", f"give {words} with its unit, e.g. {example}", line)
    try:
        number = float(quantity.to(si_unit).magnitude)
    except pint.errors.DimensionalityError:
        raise InputError(file, key, f"{value!r} is not {words}", f"give {words}, e.g. {example}", line) from None
    if not math.isfinite(number):
        raise InputError(file, key, f"{value!r} is not a finite number", f"give a finite value, e.g. {example}", line)
    return number


# ----------------------------------------------------------------------------------------------
# display

@dataclass(frozen=True)
class DisplayUnit:
    """A unit for display: label and how many SI units make one of it."""

    label: str
    factor: float


_INCH = 0.0254
_FOOT = 0.3048
_KIP = 4448.2216152605
_KSI = _KIP / _INCH**2
_POUND_MASS = 0.45359237

DISPLAY: dict[str, dict[str, DisplayUnit]] = {
    "si": {
        "length": DisplayUnit("m", 1.0),
        "dimension": DisplayUnit("mm", 1e-3),
        "deflection": DisplayUnit("mm", 1e-3),
        "force": DisplayUnit("kN", 1e3),
        "moment": DisplayUnit("kN·m", 1e3),
        "force_per_length": DisplayUnit("kN/m", 1e3),
        "moment_per_length": DisplayUnit("kN·m/m", 1e3),
        "stress": DisplayUnit("MPa", 1e6),
        "modulus": DisplayUnit("GPa", 1e9),
        "mass_per_length": DisplayUnit("kg/m", 1.0),
        "area": DisplayUnit("mm²", 1e-6),
        "inertia": DisplayUnit("cm⁴", 1e-8),
        "modulus_section": DisplayUnit("cm³", 1e-6),
        "warping": DisplayUnit("cm⁶", 1e-12),
        "rotation": DisplayUnit("rad", 1.0),
        "density": DisplayUnit("kg/m³", 1.0),
        "translational_stiffness": DisplayUnit("kN/mm", 1e6),
        "rotational_stiffness": DisplayUnit("kN·m/rad", 1e3),
    },
    "us": {
        "length": DisplayUnit("ft", _FOOT),
        "dimension": DisplayUnit("in", _INCH),
        "deflection": DisplayUnit("in", _INCH),
        "force": DisplayUnit("kip", _KIP),
        "moment": DisplayUnit("kip·ft", _KIP * _FOOT),
        "force_per_length": DisplayUnit("kip/ft", _KIP / _FOOT),
        "moment_per_length": DisplayUnit("kip·ft/ft", _KIP),
        "stress": DisplayUnit("ksi", _KSI),
        "modulus": DisplayUnit("ksi", _KSI),
        "mass_per_length": DisplayUnit("lb/ft", _POUND_MASS / _FOOT),
        "area": DisplayUnit("in²", _INCH**2),
        "inertia": DisplayUnit("in⁴", _INCH**4),
        "modulus_section": DisplayUnit("in³", _INCH**3),
        "warping": DisplayUnit("in⁶", _INCH**6),
        "rotation": DisplayUnit("rad", 1.0),
        "density": DisplayUnit("lb/ft³", _POUND_MASS / _FOOT**3),
        "translational_stiffness": DisplayUnit("kip/in", _KIP / _INCH),
        "rotational_stiffness": DisplayUnit("kip·ft/rad", _KIP * _FOOT),
    },
}


def unit_label(kind: str, system: str = "si") -> str:
    """The display label of `kind` in `system` ("si" or "us")."""
    return DISPLAY[system][kind].label


def to_display(value_si: float, kind: str, system: str = "si") -> float:
    """`value_si` converted to the display unit of `kind` in `system`."""
    return value_si / DISPLAY[system][kind].factor


def fmt(value_si: float | None, kind: str, system: str = "si", digits: int = 4) -> str:
    """`value_si` as text with its display unit, `digits` significant figures, e.g. "12.35 kN"."""
    if value_si is None:
        return "—"
    return f"{fmt_number(to_display(value_si, kind, system), digits)} {unit_label(kind, system)}"


def fmt_number(value: float, digits: int = 4) -> str:
    """A number to `digits` significant figures, without exponent for everyday magnitudes."""
    if value == 0 or not math.isfinite(value):
        return "0" if value == 0 else str(value)
    if abs(value) >= 1e7 or abs(value) < 1e-4:
        return f"{value:.{digits - 1}e}"
    value = float(f"{value:.{digits}g}")  # round first, so that 0.9999999 shows as 1.000
    decimals = max(0, digits - 1 - math.floor(math.log10(abs(value))))
    text = f"{value:.{decimals}f}"
    return "0" if float(text) == 0 else text
