"""The cost of a schedule and the bars to order, from each row's section, length, quantity and the
catalogue's purchase terms (sizer.sizing.cost).

A row's pieces (its quantity, all one length) are cut together from the stock lengths; for the
order, the pieces of one section and one length are pooled over every row. Pieces of different
lengths are not nested in one bar (a nesting plan may need fewer bars: the order is never short).
"""

from __future__ import annotations

from typing import Any

from sizer.sections.purchase import Purchase
from sizer.phrase import joined, phrase, q
from sizer.sizing.cost import BarOrder, bars_for

ORDER_NOTE = ("Bars to order: the pieces of one section and one length (over every row) are cut from the mix of stock lengths that "
              "buys the fewest metres, offcut paid for, no saw kerf, no splices; pieces of different lengths are not nested in one "
              "bar (a nesting plan may need fewer); a section without stock lengths is bought cut to length.")


def terms_of(purchase: dict | None) -> Purchase:
    """The purchase terms a row's result carries (render.cost.purchase_json), as Purchase."""
    if not purchase:
        return Purchase()
    lengths = purchase.get("stock_lengths")
    return Purchase(purchase.get("cost_per_kg"), purchase.get("stocked"), tuple(lengths) if lengths else None)


def order_cost(order: BarOrder | None, mass_per_length: float | None, terms: Purchase) -> float | None:
    """metres bought x kg/m x cost_per_kg; None without a price, a mass or bars."""
    if order is None or mass_per_length is None or terms.cost_per_kg is None:
        return None
    return order.metres * mass_per_length * terms.cost_per_kg


def row_cost(result: dict, length: float, quantity: int) -> dict[str, Any]:
    """A row's cost entries: "cost" (its pieces cut together), "currency", "bars" (render.cost.bars_json)."""
    from sizer.results.cost import bars_json

    if result.get("section") is None:
        return {"cost": None, "currency": None, "bars": None}
    terms = terms_of(result.get("purchase"))
    order = bars_for(length, quantity, terms.stock_lengths)
    return {"cost": order_cost(order, result["mass_per_length"], terms), "currency": (result.get("purchase") or {}).get("currency"),
            "bars": bars_json(order)}


def section_orders(rows: list[dict]) -> dict[str, dict[str, Any]]:
    """section -> {"cost", "bars": [{"length", "count"}], "metres", "offcut", "not_available": [lengths]} over
    every row with a section, pieces of one length pooled."""
    pieces: dict[tuple[str, float, float], list[dict]] = {}  # (section, length, kg/m: a row's material may differ)
    for row in rows:
        if row["section"] is not None:
            pieces.setdefault((row["section"], row["length"], row["mass_per_length"]), []).append(row)
    found: dict[str, dict[str, Any]] = {}
    for (section, length, mass), group in pieces.items():
        terms = terms_of(group[0].get("purchase"))
        order = bars_for(length, sum(row["quantity"] for row in group), terms.stock_lengths)
        entry = found.setdefault(section, {"cost": 0.0, "bars": {}, "metres": 0.0, "offcut": 0.0, "not_available": []})
        if order is None:
            entry["not_available"].append(length)
        else:
            for bar, count in order.bars:
                entry["bars"][(bar, order.cut_to_length)] = entry["bars"].get((bar, order.cut_to_length), 0) + count
            entry["metres"] += order.metres
            entry["offcut"] += order.offcut
        cost = order_cost(order, mass, terms)
        entry["cost"] = entry["cost"] + cost if entry["cost"] is not None and cost is not None else None
    for entry in found.values():
        entry["bars"] = [{"length": bar, "count": count, "cut_to_length": cut}
                         for (bar, cut), count in sorted(entry["bars"].items(), key=lambda item: -item[0][0])]
    return found


def add_costs(totals: dict, rows: list[dict]) -> None:
    """The totals' cost (None when a section has no price or no bar long enough), currency, whether
    the catalogue gives prices or stock lengths for any of them (`ordering`: else every piece is
    simply bought cut to length) and, per section, its cost and bars to order."""
    orders = section_orders(rows)
    for entry in totals["by_section"]:
        entry.update(orders.get(entry["section"], {}))
    costs = [entry.get("cost") for entry in totals["by_section"]]
    currencies = {row["currency"] for row in rows if row.get("currency")}
    totals["cost"] = sum(costs) if costs and all(cost is not None for cost in costs) else None
    totals["priced_cost"] = sum(cost for cost in costs if cost is not None)
    totals["currency"] = next(iter(currencies)) if len(currencies) == 1 else None
    totals["ordering"] = any(entry.get("cost") is not None or entry.get("not_available")
                             or not all(bar["cut_to_length"] for bar in entry.get("bars", [])) for entry in totals["by_section"])


def cost_notes(totals: dict) -> list[str]:
    """How the bars to order were found and what the totals' cost leaves out (sections without a
    price, pieces no stock length holds), where the catalogue gives prices or stock lengths."""
    if not totals.get("ordering"):
        return []
    notes = [ORDER_NOTE]
    unpriced = [entry["section"] for entry in totals["by_section"] if entry.get("cost") is None and not entry.get("not_available")]
    if unpriced and totals.get("priced_cost"):
        notes.append("The total cost leaves out the sections without a price (cost_per_kg): " + ", ".join(unpriced) + ".")
    for entry in totals["by_section"]:
        if entry.get("not_available"):
            lengths = joined(", ", (phrase(q("length", length, "m")) for length in entry["not_available"]))
            notes.append(phrase(f"{entry['section']}: pieces of ", lengths, " are longer than every stock length (no splice): not in the bars to order."))
    return notes
