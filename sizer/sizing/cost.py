"""What a member costs in a section, and the order in which `sizer size --by` ranks the candidates.

Cost = metres of bar bought x mass per length (kg/m) x cost_per_kg (the catalogue's currency). The
bars: pieces of one length are cut from the mix of stock lengths that buys the fewest metres (then
the fewest bars), found exactly; the offcut is paid for; no saw kerf is allowed for; one piece is
never spliced from two bars, so a member longer than every stock length of its section cannot be
bought (the section is shown as not available). A section without stock lengths is bought cut to
length (no offcut).

Ranking (`--by`): "mass" (mass per length), "cost" (sections without a price after the priced
ones), "depth" (depth as installed); ties by mass, then name. Sections that are not available
(stocked = false, or longer than every stock length) rank after the available ones unless
`include_unstocked`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from sizer.phrase import joined, phrase, q
from sizer.sections.purchase import Purchase

RANKINGS = ("mass", "cost", "depth")
FIT = 1e-9  # relative: a piece this much longer than a bar still fits (round-off of lengths read from text)


@dataclass(frozen=True)
class BarOrder:
    """The bars bought for `pieces` pieces of `piece_length` (m): (stock length m, count) pairs,
    longest first; `cut_to_length` when the section has no stock lengths (bought as pieces)."""

    piece_length: float
    pieces: int
    bars: tuple[tuple[float, int], ...]
    cut_to_length: bool = False

    @property
    def metres(self) -> float:
        """Length bought (m)."""
        return sum(length * count for length, count in self.bars)

    @property
    def offcut(self) -> float:
        """Length bought and not used (m)."""
        return self.metres - self.pieces * self.piece_length

    @property
    def count(self) -> int:
        """Bars bought."""
        return sum(count for _, count in self.bars)


@lru_cache(maxsize=256)  # a catalogue's families share a few sets of stock lengths: one search each
def bars_for(piece_length: float, pieces: int, stock_lengths: tuple[float, ...] | None) -> BarOrder | None:
    """The cheapest bars for `pieces` pieces of `piece_length` (m) from `stock_lengths` (m): fewest
    metres bought, then fewest bars. None when the piece is longer than every stock length (no splice).

    Exact: a covering knapsack over the number of pieces. Some best order uses each other length
    fewer times than the best one's pieces per bar (the best: least metres per piece, then most
    pieces per bar; swapping that many bars of another length for bars of the best never buys more
    metres or more bars), so beyond those the best length is bought directly and only the rest is
    searched: any quantity is quick."""
    if not stock_lengths:
        return BarOrder(piece_length, pieces, ((piece_length, pieces),) if pieces else (), cut_to_length=True)
    per_bar = {length: math.floor(length / piece_length * (1 + FIT)) for length in stock_lengths}
    usable = [(length, count) for length, count in per_bar.items() if count > 0]
    if not usable:
        return None
    best, holds = min(usable, key=lambda item: (item[0] / item[1], -item[1]))
    others = sum((holds - 1) * count for length, count in usable if length != best)
    direct = max(0, -(-(pieces - others - holds) // holds))  # bars of the best length bought outright
    counts = _cheapest_cover(pieces - direct * holds, usable)
    if direct:
        counts[best] = counts.get(best, 0) + direct
    return BarOrder(piece_length, pieces, tuple(sorted(counts.items(), reverse=True)))


def _cheapest_cover(pieces: int, usable: list[tuple[float, int]]) -> dict[float, int]:
    """Bars (length -> count) holding at least `pieces` pieces with the fewest metres, then bars;
    `usable`: (bar length, pieces it holds)."""
    best: list[tuple[float, int]] = [(0.0, 0)] + [(math.inf, 0)] * max(pieces, 0)  # (metres, bars) for j pieces
    choice: list[tuple[float, int]] = [(0.0, 0)] * (max(pieces, 0) + 1)
    for j in range(1, pieces + 1):
        for length, count in usable:
            before = best[max(0, j - count)]
            trial = (round(before[0] + length, 9), before[1] + 1)
            if trial < best[j]:
                best[j], choice[j] = trial, (length, count)
    counts: dict[float, int] = {}
    j = pieces
    while j > 0:
        length, count = choice[j]
        counts[length] = counts.get(length, 0) + 1
        j = max(0, j - count)
    return counts


@dataclass(frozen=True)
class Costing:
    """One section for one member: its purchase terms, the bars for `pieces` pieces, their cost
    (None: no price, or not available) and why it is not available ("" when it is)."""

    terms: Purchase
    order: BarOrder | None
    cost: float | None
    unavailable: str

    @property
    def available(self) -> bool:
        return not self.unavailable


def costing(terms: Purchase, mass_per_length: float, piece_length: float, pieces: int = 1) -> Costing:
    """The cost of `pieces` pieces of `piece_length` (m) of a section of `mass_per_length` (kg/m)."""
    order = bars_for(piece_length, pieces, terms.stock_lengths)
    reasons: list[str] = []
    if not terms.is_stocked:
        reasons.append("not stocked")
    if order is None:
        longest = max(terms.stock_lengths or (0.0,))
        reasons.append(phrase("longer than every stock length (longest ", q("longest", longest, "m"), "; no splice)"))
    cost = order.metres * mass_per_length * terms.cost_per_kg if order is not None and terms.cost_per_kg is not None else None
    return Costing(terms, order, cost, joined("; ", reasons))


@dataclass(frozen=True)
class Ranking:
    """How `sizer size` orders its candidates: `by` one of RANKINGS; `include_unstocked` ranks the
    sections that are not available among the others; `currency` is the catalogue's."""

    by: str = "mass"
    include_unstocked: bool = False
    currency: str | None = None

    def key(self, name: str, mass: float, depth: float, cost: Costing) -> tuple:
        """The sort key of one candidate (ascending: the first that passes is chosen)."""
        tier = 0 if cost.available or self.include_unstocked else 1
        if self.by == "cost":
            return (tier, cost.cost is None, cost.cost if cost.cost is not None else 0.0, mass, name)
        if self.by == "depth":
            return (tier, depth, mass, name)
        return (tier, mass, name)

    def notes(self, any_unavailable: bool, any_unpriced: bool, any_stock: bool, any_priced: bool = True) -> list[str]:
        """The assumptions of the ranking, for the outputs."""
        words = {"mass": "mass per length (the lightest first)", "cost": "cost of the member (the cheapest first)",
                 "depth": "depth as installed (the shallowest first)"}
        notes = [f"Candidates ranked by {words[self.by]}; ties by mass per length, then name."] if self.by != "mass" else []
        if self.by == "cost":
            notes.append(f"Cost = metres of bar bought x mass per length x cost_per_kg ({self.currency or 'no currency stated'}); "
                         "pieces are cut from the mix of stock lengths that buys the fewest metres, offcut paid for, no saw kerf, "
                         "no splices; a section without stock lengths is bought cut to length.")
            if not any_priced:
                notes.append("No candidate has a price (cost_per_kg): they are ranked by mass per length.")
            elif any_unpriced:
                notes.append("Sections without a cost_per_kg rank after every priced section.")
        elif any_stock:
            notes.append("A member longer than every stock length of a section cannot be bought in one piece (no splice).")
        if any_unavailable:
            notes.append("Sections not stocked or longer than every stock length are shown but ranked after the available ones."
                         if not self.include_unstocked else "Sections not stocked or not available in one bar are ranked with the others (--include-unstocked).")
        return notes


def ranking_depth(column: dict[str, Any], orientation: str) -> Any:
    """Depth as installed (m) of every row of a section table (a minor orientation turns the section)."""
    return column["depth"] if orientation == "major" else column["width"]
