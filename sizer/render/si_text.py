"""Sentences that other layers write (assumption notes, the reasons and details of checks) carry
their numbers in SI with the unit after each ("at 3 m", "+80 mm", "Fa = 150 MPa", "0–4.572 m").
Before any such sentence reaches a screen, a plot or a record, `in_display_units` rewrites each
number-and-unit (and each range "a–b unit") in the display units of the run, so that a US run never
shows an SI unit. SI runs get the sentence as written.
"""

from __future__ import annotations

import re

from sizer import units

# unit as written in SI sentences -> (display kind, SI units per one of it)
SI_SYMBOLS: dict[str, tuple[str, float]] = {
    "m": ("length", 1.0),
    "mm": ("dimension", 1e-3),
    "N": ("force", 1.0),
    "kN": ("force", 1e3),
    "N*m": ("moment", 1.0),
    "N·m": ("moment", 1.0),
    "kN*m": ("moment", 1e3),
    "kN·m": ("moment", 1e3),
    "N/m": ("force_per_length", 1.0),
    "kN/m": ("force_per_length", 1e3),
    "Pa": ("stress", 1.0),
    "kPa": ("pressure", 1e3),
    "MPa": ("stress", 1e6),
    "GPa": ("modulus", 1e9),
    "kg/m": ("mass_per_length", 1.0),
    "kg/m³": ("density", 1.0),
    "kg/m^3": ("density", 1.0),
    "mm²": ("area", 1e-6),
    "cm⁴": ("inertia", 1e-8),
    "kN/mm": ("translational_stiffness", 1e6),
    "kN·m/rad": ("rotational_stiffness", 1e3),
    "m/s²": ("acceleration", 1.0),
}
FOOT_PER_SECOND_SQUARED = 0.3048  # m/s² per ft/s² (exact, NIST SP 811)

_NUMBER = r"[-+−]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?"
_UNIT = "|".join(re.escape(symbol) for symbol in sorted(SI_SYMBOLS, key=len, reverse=True))
_QUANTITY = re.compile(rf"(?<![\w.])(?P<first>{_NUMBER})(?:\s?(?P<dash>[–-])\s?(?P<second>{_NUMBER}))?\s(?P<unit>{_UNIT})(?![\w/·*^²³⁴⁶⁻])")


def in_display_units(text: str, system: str) -> str:
    """`text` with every SI number-and-unit in the display units of `system` ("si": unchanged)."""
    if system == "si":
        return text
    return _QUANTITY.sub(lambda match: _converted(match, system), text)


def _converted(match: re.Match[str], system: str) -> str:
    kind, factor = SI_SYMBOLS[match.group("unit")]
    values = [_number(match.group("first"))] + ([_number(match.group("second"))] if match.group("second") else [])
    signed = match.group("first")[0] in "+"
    if kind == "acceleration":
        shown = [units.fmt_number(value * factor / FOOT_PER_SECOND_SQUARED) for value in values]
        label = "ft/s²"
    else:
        shown = [units.fmt_number(units.to_display(value * factor, kind, system)) for value in values]
        label = units.unit_label(kind, system)
    if signed and not shown[0].startswith("-"):
        shown[0] = "+" + shown[0]
    return ("–".join(shown) if len(shown) == 2 else shown[0]) + " " + label


def _number(text: str) -> float:
    return float(text.replace("−", "-"))
