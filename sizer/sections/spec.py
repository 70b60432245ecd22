"""One catalogue section as the user wrote it (SectionSpec), in SI: its shape, dimensions (m) or
polygon points, family, material, purchase terms and where it was read. The data every other part of sizer.sections
works from; it imports nothing of theirs.
"""

from __future__ import annotations

import hashlib
import json
from dataclasses import dataclass, field
from functools import cached_property

from sizer.sections.purchase import Purchase

Point = tuple[float, float]


@dataclass(frozen=True)
class SectionSpec:
    """One catalogue section as the user wrote it, in SI (m).

    dims: every dimension key of the shape (absent radii are 0.0). Polygons carry `points` (the
    outline) and `holes` instead, each point (across, up) as drawn: up is the depth direction
    (member y); across points to member -z (see sizer.sections for the axes).
    """

    name: str
    shape: str
    dims: dict[str, float] = field(default_factory=dict)
    points: tuple[Point, ...] = ()
    holes: tuple[tuple[Point, ...], ...] = ()
    family: str | None = None
    material: str | None = None
    source: str = ""
    line: int | None = None
    purchase: Purchase | None = None  # the section's own purchase terms (sizer.sections.purchase), family ones not applied

    def geometry_key(self) -> str:
        """A stable hash of the shape and its dimensions (not the name, family or material)."""
        return self._geometry_key

    @cached_property
    def _geometry_key(self) -> str:
        text = json.dumps({"shape": self.shape, "dims": sorted(self.dims.items()),
                           "points": self.points, "holes": self.holes}, separators=(",", ":"))
        return hashlib.sha256(text.encode()).hexdigest()[:24]

    def __hash__(self) -> int:
        return hash((self.name, self.geometry_key()))
