"""What buying a section takes, as the catalogue says it: `cost_per_kg` (a number in the catalogue's
currency), `stocked` (default true) and `stock_lengths` (the bar lengths it is bought in), each per
section or per family ([families.NAME] tables), and `currency` once per catalogue.

A section's own key wins over its family's; a key given in neither is absent (stocked then defaults
to true; no stock lengths means the section is bought cut to length).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

PURCHASE_KEYS: tuple[str, ...] = ("cost_per_kg", "stocked", "stock_lengths")
LARGEST_PRICE = 1e6  # per kg, in any currency (as plain numbers elsewhere: docs/limits.md)


@dataclass(frozen=True)
class Purchase:
    """Purchase terms of a section or a family; None: not given here. cost_per_kg in the
    catalogue's currency per kg; stock_lengths in m, ascending, without repeats."""

    cost_per_kg: float | None = None
    stocked: bool | None = None
    stock_lengths: tuple[float, ...] | None = None

    def over(self, default: "Purchase | None") -> "Purchase":
        """These terms, each absent one taken from `default` (a family's)."""
        if default is None:
            return self
        return Purchase(self.cost_per_kg if self.cost_per_kg is not None else default.cost_per_kg,
                        self.stocked if self.stocked is not None else default.stocked,
                        self.stock_lengths if self.stock_lengths is not None else default.stock_lengths)

    @property
    def is_stocked(self) -> bool:
        """Stocked unless the catalogue says stocked = false."""
        return self.stocked is not False


def parse_purchase(table: dict, reader: Any, prefix: str, label: str) -> Purchase | None:
    """The purchase keys of a [[sections]] entry or a [families.NAME] table (`prefix` names it in
    messages, `label` says what it is); None when it gives none of them."""
    if not any(key in table for key in PURCHASE_KEYS):
        return None
    return Purchase(_cost(table, reader, prefix, label), _stocked(table, reader, prefix, label), _stock_lengths(table, reader, prefix, label))


def _cost(table: dict, reader: Any, prefix: str, label: str) -> float | None:
    value = table.get("cost_per_kg")
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or not 0 <= value <= LARGEST_PRICE:
        raise reader.error(f"{prefix}.cost_per_kg", f"{label}: cost_per_kg must be a number from 0 to {LARGEST_PRICE:g}, got {str(value)[:40]}",
                           'write the price per kg as a plain number, e.g. cost_per_kg = 1.4 (the currency once, at the top: currency = "EUR")')
    return float(value)


def _stocked(table: dict, reader: Any, prefix: str, label: str) -> bool | None:
    value = table.get("stocked")
    if value is None:
        return None
    if not isinstance(value, bool):
        raise reader.error(f"{prefix}.stocked", f"{label}: stocked must be true or false, got {value!r}", "write stocked = true or stocked = false")
    return value


def _stock_lengths(table: dict, reader: Any, prefix: str, label: str) -> tuple[float, ...] | None:
    from sizer import units
    from sizer.errors import InputError

    value = table.get("stock_lengths")
    if value is None:
        return None
    key = f"{prefix}.stock_lengths"
    fix = 'give a list of lengths with their units, e.g. stock_lengths = ["6 m", "12 m"]'
    if not isinstance(value, list) or not value:
        raise reader.error(key, f"{label}: stock_lengths must be a non-empty list of lengths", fix)
    lengths = []
    for item in value:
        try:
            length = units.parse(item, "length", reader.file, key, reader.key_lines.find(key))
        except InputError as error:
            error.problem = f"{label}: stock length {error.problem}"
            error.fix = fix
            raise
        if not length > 0:
            raise reader.error(key, f"{label}: stock length {item!r} must be greater than zero", fix)
        lengths.append(length)
    return tuple(sorted(set(lengths)))


def parse_currency(data: dict, reader: Any) -> str | None:
    """The top-level `currency` of a catalogue file (None when not given)."""
    value = data.get("currency")
    if value is None:
        return None
    if not isinstance(value, str) or not value.strip() or len(value.strip()) > 12:
        raise reader.error("currency", f"currency must be a short text, got {value!r}", 'write e.g. currency = "EUR" (once, at the top of the file)')
    return value.strip()


def parse_families(data: dict, reader: Any) -> dict[str, Purchase]:
    """The [families.NAME] tables of a catalogue file: each family's default purchase terms."""
    tables = reader.table(data.get("families", {}), "families")
    found: dict[str, Purchase] = {}
    for name, table in tables.items():
        prefix = f"families.{name}"
        table = reader.table(table, prefix)
        reader.known_keys(table, PURCHASE_KEYS, prefix)
        found[name] = parse_purchase(table, reader, prefix, f"family {name!r}") or Purchase()
    return found
