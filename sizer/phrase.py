"""Sentences with their numbers kept apart (beside sizer.units at the bottom of the layers, since
every layer writes sentences: notes, the details of checks): a Phrase is text whose quantities stay
values (SI) with a unit, so that each output shows them in its own display units (render.phrases) and the JSON can
give them as numbers (`values`), while the SI text stays one plain string.

A Phrase is a str: its text is the SI sentence ("M_cr = 214.3 kN·m"), so it is written to JSON, joined
and compared as any string. Its `parts` keep each number as a Quantity: the SI value, the SI unit the
sentence writes it in and the format of that number. Joining phrases with `+` (or `joined`) keeps the
quantities; f-strings, str.join and other str methods give plain text (no quantities), so sentences
with numbers are built with `phrase(...)`, `+` and `joined(...)` only.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Iterable, Union

# SI unit as a sentence writes it -> (display kind of sizer.units, SI base units per one of it)
SI_UNITS: dict[str, tuple[str, float]] = {
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
    "mm²": ("area", 1e-6),
    "cm⁴": ("inertia", 1e-8),
    "kN/mm": ("translational_stiffness", 1e6),
    "kN·m/rad": ("rotational_stiffness", 1e3),
    "m/s²": ("acceleration", 1.0),
}
# the SI base unit each kind is given in by the JSON `values`
BASE_UNITS: dict[str, str] = {
    "length": "m", "dimension": "m", "force": "N", "moment": "N*m", "force_per_length": "N/m", "stress": "Pa",
    "pressure": "Pa", "modulus": "Pa", "mass_per_length": "kg/m", "density": "kg/m^3", "area": "m^2", "inertia": "m^4",
    "translational_stiffness": "N/m", "rotational_stiffness": "N*m/rad", "acceleration": "m/s^2",
}
# units whose number is the SI value times a power of ten (the others: the SI value divided by it),
# so that each number is computed as the sentences always computed it
_TIMES = {"mm": 1e3, "mm²": 1e6, "cm⁴": 1e8}
FIGURES = "figures"  # the spec of a number written as sizer.units.fmt writes it (four significant figures)


@dataclass(frozen=True)
class Quantity:
    """A named number of a sentence: `values` in SI base units (one, or two for a range "a–b unit"),
    written in `unit` (a key of SI_UNITS) with the format `spec` (".4g", "+.1f", "g")."""

    name: str
    values: tuple[float, ...]
    unit: str
    spec: str = "g"

    @property
    def kind(self) -> str:
        """The display kind (sizer.units) of the quantity."""
        return SI_UNITS[self.unit][0]

    def numbers(self) -> list[str]:
        """Each value as the SI sentence writes it, in `unit` (spec FIGURES: as sizer.units.fmt writes it)."""
        if self.spec == FIGURES:
            from sizer import units

            return [units.fmt_number(units.to_display(value, self.kind, "si")) for value in self.values]
        return [format(in_unit(value, self.unit), self.spec) for value in self.values]

    def si_text(self) -> str:
        """"3.2 m", "0–4.5 m", "+80 mm"."""
        return "–".join(self.numbers()) + " " + self.unit

    def to_json(self) -> dict[str, Any]:
        """{"value": SI value (a pair for a range), "unit": its SI base unit}."""
        value: Any = self.values[0] if len(self.values) == 1 else list(self.values)
        return {"value": value, "unit": BASE_UNITS[self.kind]}


def in_unit(value: float, unit: str) -> float:
    """An SI value as a number of `unit`."""
    return value * _TIMES[unit] if unit in _TIMES else value / SI_UNITS[unit][1]


def q(name: str, value: float | tuple[float, float], unit: str, spec: str = "g") -> Quantity:
    """A Quantity named `name`: `value` in SI base units (a pair for a range), written in `unit` with `spec`."""
    values = tuple(float(v) for v in value) if isinstance(value, tuple) else (float(value),)
    if unit not in SI_UNITS:
        raise ValueError(f"no SI unit {unit!r} for sentences")
    return Quantity(name, values, unit, spec)


def fq(name: str, value: float, kind: str) -> Quantity:
    """A Quantity written as sizer.units.fmt writes `value` (SI) of `kind` in SI ("2.5 m", "150 mm")."""
    from sizer import units

    return q(name, value, units.unit_label(kind, "si"), FIGURES)


Part = Union[str, Quantity]


class Phrase(str):
    """A sentence (str: its SI text) that keeps its quantities in `parts`."""

    parts: tuple[Part, ...]

    def __new__(cls, parts: Iterable[Part]) -> "Phrase":
        kept = tuple(part for part in parts if part != "")
        made = super().__new__(cls, "".join(part if isinstance(part, str) else part.si_text() for part in kept))
        made.parts = kept
        return made

    def __add__(self, other: str) -> "Phrase":
        if not isinstance(other, str):
            return NotImplemented
        return Phrase(self.parts + parts_of(other))

    def __radd__(self, other: str) -> "Phrase":
        if not isinstance(other, str):
            return NotImplemented
        return Phrase(parts_of(other) + self.parts)

    def __reduce__(self) -> tuple[Any, ...]:
        return (Phrase, (self.parts,))

    def quantities(self) -> dict[str, Quantity]:
        """The quantities by name; a name met again with other values is numbered ("at_2")."""
        found: dict[str, Quantity] = {}
        for part in self.parts:
            if isinstance(part, Quantity):
                name, count = part.name, 1
                while name in found and found[name] != part:
                    count += 1
                    name = f"{part.name}_{count}"
                found[name] = part
        return found


def parts_of(text: str) -> tuple[Part, ...]:
    """The parts of a Phrase, or plain text as one part."""
    return text.parts if isinstance(text, Phrase) else (str(text),)


def phrase(*parts: Part) -> Phrase:
    """A Phrase of text and quantities, in order."""
    return Phrase(part for item in parts for part in (parts_of(item) if isinstance(item, str) else (item,)))


def joined(separator: str, items: Iterable[str]) -> Phrase:
    """str.join that keeps the quantities of phrases."""
    parts: list[Part] = []
    for index, item in enumerate(items):
        if index:
            parts.append(separator)
        parts.extend(parts_of(item))
    return Phrase(parts)


def values_json(text: str) -> dict[str, Any]:
    """The numbers of a sentence for JSON: {name: {"value": SI, "unit": SI base unit}} ({} for plain text)."""
    if not isinstance(text, Phrase):
        return {}
    return {name: quantity.to_json() for name, quantity in text.quantities().items()}


def phrase_json(text: str) -> Any:
    """A sentence in a form JSON keeps whole (a Phrase as its parts), for results kept on disk."""
    if not isinstance(text, Phrase):
        return str(text)
    return {"phrase": [part if isinstance(part, str) else [part.name, [repr(value) for value in part.values], part.unit, part.spec]
                       for part in text.parts]}  # values as text: exact, and -0.0, inf and nan survive JSON


def phrase_from_json(kept: Any) -> str:
    """The sentence phrase_json kept."""
    if isinstance(kept, str):
        return kept
    return Phrase(part if isinstance(part, str) else Quantity(part[0], tuple(float(value) for value in part[1]), part[2], part[3])
                  for part in kept["phrase"])


def finite_number(text: str) -> bool:
    """True for a number as a sentence writes it ("3.2", "+80", "1e+06"), False for "inf" or "nan"."""
    try:
        return math.isfinite(float(text))
    except ValueError:
        return False
