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
from typing import TYPE_CHECKING, Any, TypeVar

from sizer.errors import InputError

if TYPE_CHECKING:
    from pathlib import Path
    import numpy as np

Value = TypeVar("Value", float, "np.ndarray")  # one value, or many at once

GRAVITY = 9.80665  # m/s^2, standard gravity (ISO 80000-3, common practice)

# kind -> (SI unit string for pint, words for messages, an example)
KINDS: dict[str, tuple[str, str, str]] = {
    "length": ("m", "a length", '"2.5 m" or "1500 mm"'),
    "force": ("N", "a force", '"12 kN"'),
    "moment": ("N*m", "a moment", '"8 kN*m"'),
    "force_per_length": ("N/m", "a force per length", '"2.5 kN/m"'),
    "moment_per_length": ("N*m/m", "a torque per length", '"0.4 kN*m/m"'),
    "stress": ("Pa", "a stress", '"165 MPa"'),
    "pressure": ("Pa", "a pressure", '"-2.5 kPa"'),
    "modulus": ("Pa", "a modulus", '"200 GPa"'),
    "density": ("kg/m^3", "a density", '"7850 kg/m^3"'),
    "translational_stiffness": ("N/m", "a spring stiffness", '"20 kN/mm"'),
    "rotational_stiffness": ("N*m/rad", "a rotational spring stiffness", '"500 kN*m/rad"'),
    "mass_per_length": ("kg/m", "a mass per length", '"12.2 kg/m"'),
}


# The range sizer accepts for each kind (SI): (smallest size other than zero, largest size). Outside
# it a value is bad input, so that no computation can overflow to infinity or NaN (docs/limits.md).
LIMITS: dict[str, tuple[float, float]] = {
    "length": (1e-6, 1e3),
    "force": (0.0, 1e12),
    "moment": (0.0, 1e12),
    "force_per_length": (0.0, 1e12),
    "moment_per_length": (0.0, 1e12),
    "stress": (1.0, 1e13),
    "pressure": (0.0, 1e12),
    "modulus": (1e3, 1e13),
    "density": (0.0, 1e5),
    "translational_stiffness": (0.0, 1e20),
    "rotational_stiffness": (0.0, 1e20),
    "mass_per_length": (0.0, 1e6),
}


@lru_cache(maxsize=1)
def registry() -> Any:
    """The one pint UnitRegistry of the program (built on first use)."""
    import pint

    ureg: pint.UnitRegistry = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.define("kip = 1000 * lbf")
    ureg.define("ksi = kip / inch ** 2")
    return ureg


_NUMBER_AND_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)\s*$")
_BARE_NUMBER = re.compile(r"^\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*$")
_NOT_FINITE = re.compile(r"^\s*[-+]?(?:nan|inf|infinity)(?![A-Za-z])", re.IGNORECASE)
# a unit is names joined by *, / or a space, each name (or one level of brackets) with at most one
# small whole power: "kN*m/rad", "kg/m^3", "N/mm²", "kip/in**2"; never digits elsewhere, so never arithmetic
_UNIT_TOKEN = re.compile(r"\s*(?:(?P<name>[^\W\d_][^\W\d]*)|(?P<power>(?:\^|\*\*)[-+]?\d{1,2}(?!\d)|⁻?[¹²³⁴⁵⁶⁷⁸⁹])"
                         r"|(?P<op>[*/·])|(?P<open>\()|(?P<close>\)))")
MAX_UNIT_TEXT = 40  # characters
_UNIT_FACTORS: dict[str, float | None] | None = None  # "unit|kind" -> factor to SI, None: not a unit of that kind
UNIT_CACHE_NAME = "unit-factors"  # a sealed file of the cache store (sizer.cache_store)


def parse(value: object, kind: str, file: str = "", key: str = "", line: int | None = None) -> float:
    """Parse `value`, a string "number unit" such as "2.5 kN/m", as `kind` (a key of KINDS); return
    the SI float.

    Only a number and a unit are read, never arithmetic. Raises InputError naming file, key and line
    for a bare number, a unit without a number, an unknown unit, the wrong dimension, a value that is
    not finite or outside LIMITS. The factor of each unit comes from pint once and is remembered on
    disk (sealed: sizer.cache_store), so a warm run needs no pint.
    """
    _, words, example = KINDS[kind]
    if isinstance(value, bool) or not isinstance(value, (str, int, float)):
        raise InputError(file, key, f"expected {words} as a string with its unit", f"write e.g. {example}", line)
    if not isinstance(value, str):
        raise InputError(file, key, f"the number {value!r} has no unit", f"write it as a string with its unit, e.g. {example}", line)
    shown = _shown(value)
    if _BARE_NUMBER.match(value):
        raise InputError(file, key, f"{shown} has no unit", f"give {words} with its unit, e.g. {example}", line)
    if _NOT_FINITE.match(value):
        raise InputError(file, key, f"{shown} is not a finite number", f"give a finite value, e.g. {example}", line)
    match = _NUMBER_AND_UNIT.match(value)
    if not match:
        problem = f"{shown} has no number" if _plain_unit(value.strip()) else f"cannot read {shown} as a number and a unit"
        raise InputError(file, key, problem, f"write a number and a unit, e.g. {example}", line)
    unit = match.group(2)
    factor = unit_factor(unit, kind)
    if factor is None:
        raise InputError(file, key, _unit_problem(shown, unit, kind), f"give {words}, e.g. {example}", line)
    number = float(match.group(1)) * factor
    if not math.isfinite(number):
        raise InputError(file, key, f"{shown} is not a finite number", f"give a finite value, e.g. {example}", line)
    _check_range(number, kind, file, key, line, shown)
    return number


def _check_range(number: float, kind: str, file: str, key: str, line: int | None, shown: str) -> None:
    """InputError unless `number` (SI) is zero or within LIMITS[kind] in size."""
    smallest, largest = LIMITS[kind]
    size = abs(number)
    if size > largest or 0 < size < smallest:
        si_unit, words, _ = KINDS[kind]
        span = f"from {smallest:g} to {largest:g} {si_unit}" if smallest else f"up to {largest:g} {si_unit}"
        raise InputError(file, key, f"{shown} is outside the range sizer works in for {words} ({span} in size)",
                         f"give {words} {span} (see docs/limits.md)", line)


def _shown(value: str) -> str:
    """The value as quoted in a message, cut short when long."""
    return repr(value if len(value) <= 60 else value[:57] + "...")


@lru_cache(maxsize=1024)
def _plain_unit(text: str) -> bool:
    """True when `text` is a unit and nothing else: names joined by *, / or a space, one level of
    brackets, and at most one small whole power after a name or a bracket."""
    text = text.strip()
    if not text or len(text) > MAX_UNIT_TEXT:
        return False
    position, depth, previous = 0, 0, "op"
    while position < len(text):
        match = _UNIT_TOKEN.match(text, position)
        if not match:
            return False
        token = match.lastgroup or ""
        if token == "power" and previous not in ("name", "close"):
            return False
        if token in ("op", "close") and previous in ("op", "open"):
            return False
        depth += {"open": 1, "close": -1}.get(token, 0)
        if depth not in (0, 1):
            return False
        position, previous = match.end(), token
    return previous not in ("op", "open") and depth == 0


_PRESSURES = {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "GPa": 1e9, "N/mm^2": 1e6}
COMMON_FACTORS: dict[str, float] = {  # "unit|kind" -> SI per unit, for the common SI units (no pint registry needed; tests hold them to pint)
    **{f"{unit}|length": factor for unit, factor in {"m": 1.0, "mm": 1e-3, "cm": 1e-2}.items()},
    **{f"{unit}|force": factor for unit, factor in {"N": 1.0, "kN": 1e3, "MN": 1e6}.items()},
    **{f"{unit}|moment": factor for unit, factor in {"N*m": 1.0, "kN*m": 1e3}.items()},
    **{f"{unit}|force_per_length": factor for unit, factor in {"N/m": 1.0, "kN/m": 1e3, "N/mm": 1e3}.items()},
    **{f"{unit}|moment_per_length": factor for unit, factor in {"N*m/m": 1.0, "kN*m/m": 1e3}.items()},
    **{f"{unit}|{kind}": factor for kind in ("stress", "pressure", "modulus") for unit, factor in _PRESSURES.items()},
    "kg/m^3|density": 1.0,
    **{f"{unit}|translational_stiffness": factor for unit, factor in {"N/m": 1.0, "kN/m": 1e3, "N/mm": 1e3, "kN/mm": 1e6}.items()},
    **{f"{unit}|rotational_stiffness": factor for unit, factor in {"N*m/rad": 1.0, "kN*m/rad": 1e3}.items()},
    "kg/m|mass_per_length": 1.0,
}


def unit_factor(unit: str, kind: str) -> float | None:
    """SI units per one `unit` for `kind`, or None when `unit` is not a plain unit of that kind.
    The common SI units from COMMON_FACTORS; others learned from pint once and remembered on disk."""
    global _UNIT_FACTORS
    common = COMMON_FACTORS.get(f"{unit}|{kind}")
    if common is not None:
        return common
    if not _plain_unit(unit):
        return None
    if _UNIT_FACTORS is None:
        _UNIT_FACTORS = _read_unit_cache()
    entry = f"{unit}|{kind}"
    if entry not in _UNIT_FACTORS:
        _UNIT_FACTORS[entry] = _factor_from_pint(unit, kind)
        _write_unit_cache(_UNIT_FACTORS)
    return _UNIT_FACTORS[entry]


def _pint_quantity(unit: str) -> Any:
    """One `unit` as a pint Quantity (a plain unit only: see _plain_unit)."""
    return registry().Quantity(1.0, unit.replace("·", "*"))


def _factor_from_pint(unit: str, kind: str) -> float | None:
    try:
        quantity = _pint_quantity(unit)
        if quantity.dimensionless and kind != "rotational_stiffness":
            return None
        factor = float(quantity.to(KINDS[kind][0]).magnitude)
    except Exception:  # pint's parse and dimension errors, overflow of a power: not a unit of this kind
        return None
    return factor if math.isfinite(factor) and factor > 0 else None


def _unit_problem(shown: str, unit: str, kind: str) -> str:
    """Why `unit` is not a unit of `kind`, for the message (pint is asked again: errors are rare)."""
    words = KINDS[kind][1]
    if not _plain_unit(unit):
        return f"cannot read {shown} as a number and a unit"
    try:
        quantity = _pint_quantity(unit)
    except Exception:
        return f"{shown}: unknown unit {unit!r}"
    if quantity.dimensionless:
        return f"{shown} has no unit"
    return f"{shown} is not {words}"


def _unit_cache_path() -> Path:
    from sizer.cache_store import cache_root

    return cache_root() / UNIT_CACHE_NAME


def _read_unit_cache() -> dict[str, float | None]:
    """The remembered unit factors when the file's seal matches and every factor is a positive finite
    number or null; else none (pint computes them again)."""
    import json

    from sizer.cache_store import read_sealed

    body = read_sealed(_unit_cache_path())
    try:
        factors = json.loads(body) if body is not None else None
    except ValueError:
        return {}
    if not isinstance(factors, dict):
        return {}
    if not all(isinstance(k, str) and (v is None or (type(v) is float and math.isfinite(v) and v > 0)) for k, v in factors.items()):
        return {}
    return factors


def _write_unit_cache(factors: dict[str, float | None]) -> None:
    import json

    from sizer.cache_store import write_sealed

    try:
        write_sealed(_unit_cache_path(), json.dumps(factors, sort_keys=True).encode())
    except OSError:
        pass  # a read-only cache folder only costs speed


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
        "bimoment": DisplayUnit("kN·m²", 1e3),
        "force_per_length": DisplayUnit("kN/m", 1e3),
        "moment_per_length": DisplayUnit("kN·m/m", 1e3),
        "stress": DisplayUnit("MPa", 1e6),
        "pressure": DisplayUnit("kPa", 1e3),
        "modulus": DisplayUnit("GPa", 1e9),
        "mass_per_length": DisplayUnit("kg/m", 1.0),
        "mass": DisplayUnit("kg", 1.0),
        "area": DisplayUnit("mm²", 1e-6),
        "inertia": DisplayUnit("cm⁴", 1e-8),
        "modulus_section": DisplayUnit("cm³", 1e-6),
        "warping": DisplayUnit("cm⁶", 1e-12),
        "rotation": DisplayUnit("rad", 1.0),
        "density": DisplayUnit("kg/m³", 1.0),
        "translational_stiffness": DisplayUnit("kN/mm", 1e6),
        "rotational_stiffness": DisplayUnit("kN·m/rad", 1e3),
        "acceleration": DisplayUnit("m/s²", 1.0),
    },
    "us": {
        "length": DisplayUnit("ft", _FOOT),
        "dimension": DisplayUnit("in", _INCH),
        "deflection": DisplayUnit("in", _INCH),
        "force": DisplayUnit("kip", _KIP),
        "moment": DisplayUnit("kip·ft", _KIP * _FOOT),
        "bimoment": DisplayUnit("kip·ft²", _KIP * _FOOT**2),
        "force_per_length": DisplayUnit("kip/ft", _KIP / _FOOT),
        "moment_per_length": DisplayUnit("kip·ft/ft", _KIP),
        "stress": DisplayUnit("ksi", _KSI),
        "pressure": DisplayUnit("lbf/ft²", _KIP / 1000 / _FOOT**2),
        "modulus": DisplayUnit("ksi", _KSI),
        "mass_per_length": DisplayUnit("lb/ft", _POUND_MASS / _FOOT),
        "mass": DisplayUnit("lb", _POUND_MASS),
        "area": DisplayUnit("in²", _INCH**2),
        "inertia": DisplayUnit("in⁴", _INCH**4),
        "modulus_section": DisplayUnit("in³", _INCH**3),
        "warping": DisplayUnit("in⁶", _INCH**6),
        "rotation": DisplayUnit("rad", 1.0),
        "density": DisplayUnit("lb/ft³", _POUND_MASS / _FOOT**3),
        "translational_stiffness": DisplayUnit("kip/in", _KIP / _INCH),
        "rotational_stiffness": DisplayUnit("kip·ft/rad", _KIP * _FOOT),
        "acceleration": DisplayUnit("ft/s²", _FOOT),
    },
}


def unit_label(kind: str, system: str = "si") -> str:
    """The display label of `kind` in `system` ("si" or "us")."""
    return DISPLAY[system][kind].label


def to_display(value_si: Value, kind: str, system: str = "si") -> Value:
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
