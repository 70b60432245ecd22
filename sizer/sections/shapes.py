"""The catalogue shapes: their keys, and the rules that make a set of dimensions a drawable shape.

Every dimension is a length in m (SI). Radii may be zero (a sharp corner); all other dimensions must
be greater than zero. The fit rules keep walls, flanges and radii inside the outline, strictly, so
that no two outline points coincide.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sizer import units


@dataclass(frozen=True)
class ShapeKeys:
    """The dimension keys of one shape: required, and optional (a radius, zero when absent)."""

    required: tuple[str, ...]
    optional: tuple[str, ...] = ()

    @property
    def all(self) -> tuple[str, ...]:
        return self.required + self.optional


FLANGED = ShapeKeys(("depth", "width", "flange_thickness", "web_thickness"), ("root_radius",))

SHAPES: dict[str, ShapeKeys] = {
    "rectangle": ShapeKeys(("depth", "width")),
    "round": ShapeKeys(("diameter",)),
    "rectangular_tube": ShapeKeys(("depth", "width", "thickness"), ("outer_radius",)),
    "round_tube": ShapeKeys(("diameter", "thickness")),
    "i_beam": FLANGED,
    "channel": FLANGED,
    "tee": FLANGED,
    "angle": ShapeKeys(("depth", "width", "thickness"), ("root_radius",)),
    "polygon": ShapeKeys(("points",), ("holes",)),
}
COMMON_KEYS: tuple[str, ...] = ("name", "shape", "family", "material", "cost_per_kg", "stocked", "stock_lengths")
RADIUS_KEYS = frozenset({"root_radius", "outer_radius"})
ALL_DIMENSION_KEYS: tuple[str, ...] = (
    "depth", "width", "thickness", "flange_thickness", "web_thickness", "diameter", "root_radius", "outer_radius",
)


def allowed_keys(shape: str) -> tuple[str, ...]:
    """Every key a [[sections]] entry of `shape` may hold."""
    return COMMON_KEYS + SHAPES[shape].all


@dataclass(frozen=True)
class FitProblem:
    """A dimension that does not fit: the key at fault, what is wrong, how to mend it."""

    key: str
    problem: str
    fix: str


def _mm(value: float) -> str:
    return units.fmt(value, "dimension")


def _less(key: str, value: float, limit: float, what: str, fix: str) -> list[FitProblem]:
    """A problem when value >= limit (strict: equal would make outline points coincide; values
    within 1e-9 of the limit, relative, count as equal)."""
    if value < limit * (1 - 1e-9):
        return []
    return [FitProblem(key, f"{key.replace('_', ' ')} {_mm(value)} is not less than {what} ({_mm(limit)})", fix)]


def fit_problems(shape: str, d: dict[str, float]) -> list[FitProblem]:
    """Why the dimensions `d` (m) of `shape` do not make a valid outline, or one that can be meshed
    in reasonable time; empty when they do."""
    rules = _FIT_RULES.get(shape)
    return (rules(d) if rules else []) or mesh_problems(shape, d)


# The mesh has about 1.6 A / t^2 elements (sizer.sections.geometry: elements of (t / 1.25)^2 at
# most, t the thinnest wall), and its analysis time grows faster than that: a larger ratio of area
# to wall squared is refused (docs/limits.md). Shipped catalogue shapes reach about 150.
MAX_AREA_PER_WALL_SQUARED = 1000.0


def approximate_area(shape: str, d: dict[str, float]) -> float:
    """The area (m^2) of a standard shape from its dimensions, radii left out."""
    if shape == "rectangle":
        return d["depth"] * d["width"]
    if shape == "round":
        return math.pi * d["diameter"] ** 2 / 4
    if shape == "rectangular_tube":
        return 2 * d["thickness"] * (d["depth"] + d["width"]) - 4 * d["thickness"] ** 2
    if shape == "round_tube":
        return math.pi * (d["diameter"] - d["thickness"]) * d["thickness"]
    if shape in ("i_beam", "channel"):
        return 2 * d["width"] * d["flange_thickness"] + (d["depth"] - 2 * d["flange_thickness"]) * d["web_thickness"]
    if shape == "tee":
        return d["width"] * d["flange_thickness"] + (d["depth"] - d["flange_thickness"]) * d["web_thickness"]
    return d["thickness"] * (d["depth"] + d["width"] - d["thickness"])  # angle


def mesh_problems(shape: str, d: dict[str, float]) -> list[FitProblem]:
    """A problem when the thinnest wall is so thin beside the section's area that the mesh would be
    too large (area / wall^2 above MAX_AREA_PER_WALL_SQUARED)."""
    wall = thinnest_wall(shape, d)
    ratio = approximate_area(shape, d) / wall**2
    if ratio <= MAX_AREA_PER_WALL_SQUARED:
        return []
    key = min((name for name in SHAPES[shape].required if d[name] == wall), default=SHAPES[shape].required[0])
    return [FitProblem(key, f"{key.replace('_', ' ')} {_mm(wall)} is too thin for a section of this size: area / wall² = "
                       f"{ratio:.3g}, more than {MAX_AREA_PER_WALL_SQUARED:g} (its mesh would need about {1.6 * ratio:.2g} elements)",
                       "check the units of the dimensions, or use a thicker wall (docs/limits.md)")]


def _tube(d: dict[str, float]) -> list[FitProblem]:
    half = min(d["depth"], d["width"]) / 2
    return (_less("thickness", d["thickness"], half, "half the smaller of depth and width", "use a thinner wall or a larger tube")
            or _less("outer_radius", d["outer_radius"], half, "half the smaller of depth and width", "use a smaller corner radius"))


def _round_tube(d: dict[str, float]) -> list[FitProblem]:
    return _less("thickness", d["thickness"], d["diameter"] / 2, "half the diameter", "use a thinner wall; a solid bar is shape \"round\"")


def _i_beam(d: dict[str, float]) -> list[FitProblem]:
    clear = d["depth"] - 2 * d["flange_thickness"]
    return (_less("flange_thickness", 2 * d["flange_thickness"], d["depth"], "the depth, for two flanges", "check flange thickness and depth")
            or _less("web_thickness", d["web_thickness"], d["width"], "the width", "check web thickness and width")
            or _less("root_radius", d["root_radius"], (d["width"] - d["web_thickness"]) / 2, "the flange outstand (width - web) / 2", "use a smaller root radius")
            or _less("root_radius", 2 * d["root_radius"], clear, "the clear web depth, for two radii", "use a smaller root radius"))


def _channel(d: dict[str, float]) -> list[FitProblem]:
    clear = d["depth"] - 2 * d["flange_thickness"]
    return (_less("flange_thickness", 2 * d["flange_thickness"], d["depth"], "the depth, for two flanges", "check flange thickness and depth")
            or _less("web_thickness", d["web_thickness"], d["width"], "the width", "check web thickness and width")
            or _less("root_radius", d["root_radius"], d["width"] - d["web_thickness"], "the flange outstand width - web", "use a smaller root radius")
            or _less("root_radius", 2 * d["root_radius"], clear, "the clear web depth, for two radii", "use a smaller root radius"))


def _tee(d: dict[str, float]) -> list[FitProblem]:
    return (_less("flange_thickness", d["flange_thickness"], d["depth"], "the depth", "check flange thickness and depth")
            or _less("web_thickness", d["web_thickness"], d["width"], "the width", "check web thickness and width")
            or _less("root_radius", d["root_radius"], (d["width"] - d["web_thickness"]) / 2, "the flange outstand (width - web) / 2", "use a smaller root radius")
            or _less("root_radius", d["root_radius"], d["depth"] - d["flange_thickness"], "the stem below the flange", "use a smaller root radius"))


def _angle(d: dict[str, float]) -> list[FitProblem]:
    return (_less("thickness", d["thickness"], min(d["depth"], d["width"]), "the shorter leg", "check thickness and leg lengths")
            or _less("root_radius", d["root_radius"], min(d["depth"], d["width"]) - d["thickness"], "the shorter leg less the thickness", "use a smaller root radius"))


_FIT_RULES = {
    "rectangular_tube": _tube,
    "round_tube": _round_tube,
    "i_beam": _i_beam,
    "channel": _channel,
    "tee": _tee,
    "angle": _angle,
}


def thinnest_wall(shape: str, d: dict[str, float]) -> float:
    """The thinnest wall (m) of a standard shape: the mesh is sized from it (not for polygons)."""
    if shape == "rectangle":
        return min(d["depth"], d["width"])
    if shape == "round":
        return d["diameter"]
    if shape in ("i_beam", "channel", "tee"):
        return min(d["flange_thickness"], d["web_thickness"])
    return d["thickness"]
