"""Area integrals of a polygon with holes, exact (to round-off) by Green's theorem.

Each edge (a, b) of a ring closes a triangle with the origin; over that triangle

    integral of x^p y^q dA = c p! q! / (p+q+2)! * sum_{k<=p, l<=q} C(k+l, k) C(p-k+q-l, p-k) a_x^k b_x^(p-k) a_y^l b_y^(q-l)

with c = a_x b_y - b_x a_y (twice the triangle's signed area), and the triangles of a ring add up
to the ring's integral (the standard triangle formula, e.g. Steger, "On the calculation of
arbitrary moments of polygons", 1996, from memory). The outline counts positive and each hole
negative whatever the direction its points run. A mesh of straight-sided triangles over the same
polygon integrates these polynomials exactly too, so sectionproperties' geometric analysis of the
outline gives the same numbers to round-off (tests/test_tiers.py holds them to that).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
import math
from math import comb, factorial
from typing import Sequence

import numpy as np

THIRD_ORDER = ((3, 0), (2, 1), (1, 2), (0, 3))


@dataclass(frozen=True)
class PolygonMoments:
    """Integrals over the polygon in its own coordinates (x, y) and units (L): area (L^2); centroid
    (L); second moments about the centroid xx = integral of y^2, yy = of x^2, xy = of x y (L^4);
    third moments about the centroid, third[(p, q)] = integral of x^p y^q (L^5); bounds (x_min,
    x_max, y_min, y_max) (L) and the outline's length (L, holes not counted)."""

    area: float
    centroid: tuple[float, float]
    xx: float
    yy: float
    xy: float
    third: dict[tuple[int, int], float]
    bounds: tuple[float, float, float, float]
    perimeter: float


def ring_integral(ring: np.ndarray, p: int, q: int) -> float:
    """Integral of x^p y^q over the area a ring (n, 2) encloses, signed: positive when its points
    run anticlockwise."""
    return _Edges([ring]).integral(p, q)


class _Edges:
    """Every edge (a, b) of some rings at once, with the powers of their ends' coordinates."""

    def __init__(self, rings: Sequence[np.ndarray]) -> None:
        a = np.vstack(rings) if rings else np.zeros((0, 2))
        b = np.vstack([following(ring) for ring in rings]) if rings else a
        self.cross = a[:, 0] * b[:, 1] - b[:, 0] * a[:, 1]
        exponents = np.arange(4)[:, None]
        self.powers = [a[:, d] ** exponents for d in (0, 1)]  # (4, n): a_x^k, a_y^k for k = 0..3
        self.powers_b = [b[:, d] ** exponents for d in (0, 1)]

    def integral(self, p: int, q: int) -> float:
        """The sum over the edges' triangles of x^p y^q (p, q <= 3)."""
        (ax, ay), (bx, by) = self.powers, self.powers_b
        xs = ax[:p + 1] * bx[p::-1]  # row k: a_x^k b_x^(p-k)
        ys = ay[:q + 1] * by[q::-1]  # row l: a_y^l b_y^(q-l)
        total = np.einsum("kl,kn,ln->n", _coefficients(p, q), xs, ys)
        return float(self.cross @ total) * factorial(p) * factorial(q) / factorial(p + q + 2)


@lru_cache(maxsize=None)
def _coefficients(p: int, q: int) -> np.ndarray:
    """C(k+l, k) C(p-k+q-l, p-k) for k <= p, l <= q (the triangle formula's weights)."""
    return np.array([[comb(k + l, k) * comb(p - k + q - l, p - k) for l in range(q + 1)] for k in range(p + 1)], dtype=float)


def oriented(exterior: np.ndarray, holes: Sequence[np.ndarray] = ()) -> list[np.ndarray]:
    """The outline anticlockwise and the holes clockwise (float arrays), so that the rings' signed
    integrals add up to the polygon's."""
    rings = [np.asarray(exterior, dtype=float)] + [np.asarray(hole, dtype=float) for hole in holes]
    wanted = [1.0] + [-1.0] * len(holes)
    return [ring if ring_integral(ring, 0, 0) * sign > 0 else ring[::-1] for ring, sign in zip(rings, wanted)]


def polygon_integral(rings: Sequence[np.ndarray], p: int, q: int) -> float:
    """Integral of x^p y^q over oriented rings (see `oriented`)."""
    return _Edges(rings).integral(p, q)


def polygon_moments(exterior: np.ndarray, holes: Sequence[np.ndarray] = ()) -> PolygonMoments:
    """The PolygonMoments of an outline and its holes (points (n, 2), either direction); NaN moments
    when the polygon encloses no area."""
    rings = oriented(exterior, holes)
    edges = _Edges(rings)
    area = edges.integral(0, 0)
    if area == 0:
        return PolygonMoments(0.0, (math.nan, math.nan), math.nan, math.nan, math.nan, {order: math.nan for order in THIRD_ORDER},
                              (math.nan,) * 4, math.nan)
    centroid = (edges.integral(1, 0) / area, edges.integral(0, 1) / area)
    central = _Edges([ring - np.asarray(centroid) for ring in rings])  # moments about the centroid: no cancellation
    outline = rings[0]
    return PolygonMoments(
        area=area, centroid=centroid, xx=central.integral(0, 2), yy=central.integral(2, 0), xy=central.integral(1, 1),
        third={order: central.integral(*order) for order in THIRD_ORDER},
        bounds=(float(outline[:, 0].min()), float(outline[:, 0].max()), float(outline[:, 1].min()), float(outline[:, 1].max())),
        perimeter=float(np.hypot(*(following(outline) - outline).T).sum()),
    )


def plane_moments(exterior: np.ndarray, holes: Sequence[np.ndarray] = ()) -> tuple[float, tuple[float, float], float, float, float]:
    """(area, centroid, xx, yy, xy) of an outline and its holes as in PolygonMoments, by the closed
    forms of the triangle formula for orders up to two (the shoelace sums; about seven times faster
    than polygon_moments, for the normal stresses alone)."""
    rings = [np.asarray(ring, dtype=float) for ring in (exterior, *holes)]
    edges = [_ring_edges(ring) for ring in rings]
    # the outline counts positive and each hole negative, whichever way its points run
    signs = [np.sign(cross.sum()) * (1.0 if k == 0 else -1.0) for k, (*_, cross) in enumerate(edges)]
    area = sum(sign * cross.sum() for sign, (*_, cross) in zip(signs, edges)) / 2.0
    if area == 0:
        return 0.0, (math.nan, math.nan), math.nan, math.nan, math.nan
    cx = sum(sign * np.dot(x + xn, cross) for sign, (x, _, xn, _, cross) in zip(signs, edges)) / (6.0 * area)
    cy = sum(sign * np.dot(y + yn, cross) for sign, (_, y, _, yn, cross) in zip(signs, edges)) / (6.0 * area)
    xx = yy = xy = 0.0  # about the centroid: the rings moved there first, so that nothing cancels
    for sign, ring in zip(signs, rings):
        x, y, xn, yn, cross = _ring_edges(ring - (cx, cy))
        xx += sign * np.dot(y * y + y * yn + yn * yn, cross) / 12.0
        yy += sign * np.dot(x * x + x * xn + xn * xn, cross) / 12.0
        xy += sign * np.dot(x * yn + 2 * x * y + 2 * xn * yn + xn * y, cross) / 24.0
    return float(area), (float(cx), float(cy)), float(xx), float(yy), float(xy)


def _ring_edges(ring: np.ndarray) -> tuple[np.ndarray, ...]:
    """x, y of each corner, x, y of the next one, and the cross product x y_next - x_next y."""
    (x, y), (xn, yn) = ring.T, following(ring).T
    return x, y, xn, yn, x * yn - xn * y


def following(ring: np.ndarray) -> np.ndarray:
    """Each corner's next corner around the ring (the last one's is the first)."""
    return np.concatenate((ring[1:], ring[:1]))


def clipped(ring: np.ndarray, axis: int, level: float) -> np.ndarray:
    """The part of a ring where coordinate `axis` >= level, its points in the ring's order (clipping
    by one line, Sutherland and Hodgman 1974): every corner on that side, and the crossing of every
    edge that crosses the line."""
    side = ring[:, axis] - level
    side_next = following(side)
    inside = side >= 0
    crosses = inside != (side_next >= 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(crosses, side / (side - side_next), 0.0)
    crossing = ring + t[:, None] * (following(ring) - ring)
    return np.stack([ring, crossing], axis=1).reshape(-1, 2)[np.stack([inside, crosses], axis=1).ravel()]


def plastic_modulus(rings: Sequence[np.ndarray], axis: int) -> float:
    """Integral of |u - c| dA over oriented rings, u the coordinate `axis` and c the line that halves
    the area (the plastic neutral axis, found by bisection to round-off): the plastic section
    modulus for bending that turns about that line."""
    values = np.concatenate([ring[:, axis] for ring in rings])
    low, high = float(values.min()), float(values.max())
    half = _area(rings) / 2
    order = (1, 0) if axis == 0 else (0, 1)
    while True:
        level = (low + high) / 2
        if not low < level < high:
            break
        if _area([clipped(ring, axis, level) for ring in rings]) > half:
            low = level
        else:
            high = level
    above = [clipped(ring, axis, level) for ring in rings]
    area_above, first_above = polygon_integral(above, 0, 0), polygon_integral(above, *order)
    area, first = polygon_integral(rings, 0, 0), polygon_integral(rings, *order)
    return float((first_above - level * area_above) + (level * (area - area_above) - (first - first_above)))


def _area(rings: Sequence[np.ndarray]) -> float:
    """The signed area of rings (the shoelace sum)."""
    return float(sum(_ring_edges(ring)[4].sum() for ring in rings) / 2)
