"""Cost, bars to order and purchase terms in SI (m) for the JSON documents (sizer.sizing.cost)."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from sizer.sections.purchase import Purchase
    from sizer.sizing.cost import BarOrder, Costing


def bars_json(order: BarOrder | None) -> dict[str, Any] | None:
    """A BarOrder in SI (m): pieces, piece length, bars by stock length, metres bought, offcut."""
    if order is None:
        return None
    return {"pieces": order.pieces, "piece_length": order.piece_length, "cut_to_length": order.cut_to_length,
            "bars": [{"length": length, "count": count} for length, count in order.bars],
            "metres": order.metres, "offcut": order.offcut}


def costing_json(costing: Costing | None) -> dict[str, Any]:
    """A candidate's cost entries (sizer.sizing.cost.Costing) for the JSON documents."""
    if costing is None:
        return {}
    terms = costing.terms
    return {"cost": costing.cost, "cost_per_kg": terms.cost_per_kg, "stocked": terms.is_stocked,
            "available": costing.available, "unavailable": costing.unavailable or None, "bars": bars_json(costing.order)}


def purchase_json(terms: Purchase, currency: str | None) -> dict[str, Any]:
    """A section's purchase terms (its own, else its family's) in SI (m)."""
    return {"cost_per_kg": terms.cost_per_kg, "currency": currency, "stocked": terms.is_stocked,
            "stock_lengths": list(terms.stock_lengths) if terms.stock_lengths else None}
