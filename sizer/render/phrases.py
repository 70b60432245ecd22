"""Sentences of the other layers (assumption notes, the details of checks, buckling modes) in the
display units of the run: each Quantity of a sizer.results.Phrase is written in the display unit of
its kind; the words are never touched. SI runs, and plain text, get the sentence as written."""

from __future__ import annotations

from sizer import units
from sizer.phrase import SI_UNITS, Phrase, Quantity, finite_number



def in_display_units(text: object, system: str) -> str:
    """`text` with every quantity in the display units of `system` ("si": as written; not text: str(text))."""
    if system == "si" or not isinstance(text, Phrase):
        return text if isinstance(text, str) else str(text)
    return "".join(part if isinstance(part, str) else shown_quantity(part, system) for part in text.parts)


def shown_quantity(quantity: Quantity, system: str) -> str:
    """A quantity in the display unit of its kind: the number the SI sentence writes, converted
    (so that SI and US outputs state the same rounded value); a sign the sentence writes is kept."""
    numbers = quantity.numbers()
    if not all(finite_number(number) for number in numbers):
        return quantity.si_text()
    factor = SI_UNITS[quantity.unit][1]
    values = [float(number) * factor for number in numbers]
    shown = [units.fmt_number(units.to_display(value, quantity.kind, system)) for value in values]
    label = units.unit_label(quantity.kind, system)
    if numbers[0].startswith("+") and not shown[0].startswith("-"):
        shown[0] = "+" + shown[0]
    return "–".join(shown) + " " + label

