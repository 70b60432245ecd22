"""Cost, bars to order and the reserve factor in words and in JSON, shared by `size`, `check` and
schedules (sizer.sizing.cost, sizer.checks.reserve)."""

from __future__ import annotations

from typing import TYPE_CHECKING

from sizer import units

if TYPE_CHECKING:
    from sizer.sections.purchase import Purchase
    from sizer.sizing.cost import BarOrder
    from sizer.checks.reserve import Reserve


def money(value: float | None, currency: str | None) -> str:
    """A cost with its currency ("412.50 EUR"); "no price" for None."""
    if value is None:
        return "no price"
    return f"{value:,.2f} {currency or '(no currency)'}"


def bars_text(order: BarOrder | None, system: str = "si") -> str:
    """The bars of a sizer.sizing.cost.BarOrder in words: "bars 1 x 12.00 m + 1 x 6.000 m, offcut 0.600 m"."""
    if order is None:
        return "not available in one bar"
    if order.cut_to_length:
        return f"{order.pieces} x {units.fmt(order.piece_length, 'length', system)} cut to length"
    bars = " + ".join(f"{count} x {units.fmt(length, 'length', system)}" for length, count in order.bars)
    return f"bars {bars}, offcut {units.fmt(order.offcut, 'length', system)}"


def reserve_sentence(reserve: Reserve | None) -> str:
    """The reserve factor for a verdict line ("" when not found)."""
    if reserve is None or reserve.combination is None:
        return ""
    from rich.markup import escape

    combination = escape(reserve.combination)
    if reserve.factor is None:
        return f" Reserve factor: unbounded in combination {combination}."
    if reserve.factor < 1:
        return (f" Reserve factor [bold]{reserve.factor:.3f}[/]: every check would pass only with every load of combination "
                f"{combination}, {reserve.scaled_words}, times {reserve.factor:.3f} or less.")
    return (f" Reserve factor [bold]{reserve.factor:.3f}[/]: every check still passes with every load of combination "
            f"{combination}, {reserve.scaled_words}, times {reserve.factor:.3f}.")


def price_text(terms: Purchase, currency: str | None) -> str:
    """A section's price per kg ("1.45 EUR/kg"; "—" when not given)."""
    return f"{terms.cost_per_kg:g} {currency or '(no currency)'}/kg" if terms.cost_per_kg is not None else "—"


def stock_text(terms: Purchase, system: str = "si") -> str:
    """Whether a section is stocked, and in which bar lengths."""
    lengths = ("bars of " + ", ".join(units.fmt(length, "length", system) for length in terms.stock_lengths)
               if terms.stock_lengths else "cut to length")
    return f"stocked, {lengths}" if terms.is_stocked else f"not stocked ({lengths})"


