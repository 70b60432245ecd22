"""Local buckling of the flat walls of catalogue shapes (docs/design.md sections 7 and 10, check "local").

Each flat wall (flange outstand, web, stem, angle leg, tube wall) is a long plate with its own edge
conditions: "internal" (both long edges joined to other walls: taken as simply supported) or
"outstand" (one edge joined, one free). Its elastic buckling stress is Bryan's
    sigma_cr = k pi^2 E / (12 (1 - nu^2)) (t / b)^2      (Timoshenko & Gere, ch. 9)
with k from the published coefficients for its edges and its stress ratio psi = sigma2 / sigma1
(compression positive, sigma1 the larger edge compression at mid-thickness), EN 1993-1-5 Tables
4.1 and 4.2, and nu = E / (2 G) - 1. The rotational restraint a wall gets from its neighbours is
neglected (the simply supported edge is the lower bound) and no post-buckling reserve is counted.

The walls of each shape and their clear flat widths b: sizer.checks.local_walls.

Allowable (sizer.checks.reduction): F_red = min(F, F rho, sigma_cr / SF), F the larger of the user's
compression and bending allowables, SF the buckling safety factor, rho the Johnson curve with the
plateau of EN 1993-1-5 4.4(2): no reduction for lambda_p = sqrt(Fy / sigma_cr) up to
0.5 + sqrt(0.085 - 0.055 psi) for internal walls (0.673 under uniform compression), 0.748 for outstands. Demand: the peak
compression over the wall's four corners (its two long edges, each face). Utilization = demand /
F_red, for every wall, combination and station; a wall counts as compressed where sigma1 x the
section's area exceeds ZERO_ACTION (round-off below that is no compression).

Normal stress over the section is exactly linear in the actions (section axes, docs/design.md section 2):
    sigma(y, z) = N / A + a y + b z,   -Mz = a Iz + b Iyz,   My = a Iyz + b Iy   (tension positive),
so the stress at any point of a wall is known without the mesh. Positions (y, z) are in m from the
centroid in the section's own axes (y up along the depth as drawn in the catalogue, z = -X of
sectionproperties' drawing); names ("top", "+z side") refer to the section as drawn.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from sizer.checks.local_walls import INTERNAL, Point, Wall, no_walls_reason, section_walls
from sizer.checks.reduction import PLATEAU_OUTSTAND, governing_term, internal_plateau, reduced_allowable, slenderness
from sizer.checks.results import ZERO_ACTION, CheckResult
from sizer.design import Design
from sizer.errors import InputError
from sizer.model import Material
from sizer.phrase import phrase, q

PSI_LOWEST_INTERNAL = -3.0  # below: k grows, so the clamp is on the safe side
PSI_LOWEST_FREE_EDGE = -3.0
PSI_LOWEST_SUPPORTED_EDGE = -1.0
BLOCK_VALUES = 200_000  # (section, row, wall) values at once: about 20 float64 arrays of 1.6 MB, ~17 MB at peak
ASSUMPTIONS = ("Local buckling: each flat wall is a long plate, simply supported where it joins another wall "
               "and free at an outstand's tip, over its clear flat width; k from EN 1993-1-5 Tables 4.1 and 4.2 "
               "for the wall's stress ratio; no restraint from neighbouring walls and no post-buckling reserve. "
               "No reduction while the wall's slenderness sqrt(Fy / sigma_cr) is within the plateau of EN 1993-1-5 4.4(2): "
               "0.5 + sqrt(0.085 - 0.055·ψ) for internal walls (0.673 under uniform compression), 0.748 for outstands; "
               "above it the Johnson parabola, joined by a straight transition so that the allowable has no jump.")

def plate_coefficient(kind: Any, psi: Any, free_edge_more_compressed: Any) -> np.ndarray:
    """Plate buckling coefficient k of a long plate, elementwise (kind, psi and the flag broadcast).

    psi = sigma2 / sigma1 (compression positive, sigma1 the larger compression, so psi <= 1).
    Internal (both long edges simply supported), EN 1993-1-5 Table 4.1 (from memory):
        8.2 / (1.05 + psi) for 1 >= psi >= 0; 7.81 - 6.29 psi + 9.78 psi^2 for 0 > psi > -1;
        5.98 (1 - psi)^2 for -1 >= psi >= -3 (psi clamped at -3).
    Outstand (one edge simply supported, one free), EN 1993-1-5 Table 4.2 (from memory):
        free edge more compressed: 0.57 - 0.21 psi + 0.07 psi^2 (psi clamped at -3);
        supported edge more compressed: 0.578 / (psi + 0.34) for 1 >= psi >= 0,
        1.7 - 5 psi + 17.1 psi^2 for 0 > psi >= -1 (psi clamped at -1).
    k grows as psi falls, so each clamp is on the safe side.
    """
    psi = np.minimum(np.asarray(psi, dtype=float), 1.0)
    internal = np.asarray(kind) == INTERNAL
    free_more = np.asarray(free_edge_more_compressed, dtype=bool)
    p = np.maximum(psi, PSI_LOWEST_INTERNAL)
    k_internal = np.where(p >= 0.0, 8.2 / (1.05 + np.maximum(p, 0.0)),
                          np.where(p > -1.0, 7.81 - 6.29 * p + 9.78 * p * p, 5.98 * (1.0 - p) ** 2))
    p = np.maximum(psi, PSI_LOWEST_FREE_EDGE)
    k_free = 0.57 - 0.21 * p + 0.07 * p * p
    p = np.maximum(psi, PSI_LOWEST_SUPPORTED_EDGE)
    k_supported = np.where(p >= 0.0, 0.578 / (np.maximum(p, 0.0) + 0.34), 1.7 - 5.0 * p + 17.1 * p * p)
    return np.where(internal, k_internal, np.where(free_more, k_free, k_supported))


def wall_plateau(kind: Any, psi: Any) -> np.ndarray:
    """The plateau slenderness lambda_0 of a wall, elementwise: internal 0.5 + sqrt(0.085 - 0.055 psi),
    outstand 0.748 (EN 1993-1-5 4.4(2), from memory; sizer.checks.reduction)."""
    return np.where(np.asarray(kind) == INTERNAL, internal_plateau(psi), PLATEAU_OUTSTAND)


def elastic_plate_stress(k: Any, E: Any, nu: Any, t: Any, b: Any) -> Any:
    """Bryan's sigma_cr = k pi^2 E / (12 (1 - nu^2)) (t / b)^2 (Pa; E in Pa, t and b in m)."""
    return k * math.pi**2 * E / (12.0 * (1.0 - nu * nu)) * (t / b) ** 2


def poisson_ratio(material: Material, file: str = "") -> float:
    """nu = E / (2 G) - 1 of `material`; bad input outside 0 to 0.5 (`file`: where the material was
    named, for the message when the material has no file of its own)."""
    nu = material.elastic_modulus / (2.0 * material.shear_modulus) - 1.0
    if not 0.0 <= nu < 0.5:
        raise InputError(material.source or file, f"materials.{material.name}.shear_modulus",
                         f"E / (2 G) - 1 gives Poisson's ratio {nu:.3g}, outside 0 to 0.5; the local check needs it",
                         "check elastic_modulus and shear_modulus (steel: 200 GPa and 77 GPa), or give poisson_ratio")
    return nu


def wall_allowable(material: Material, file: str = "") -> float:
    """F: the larger of the compression and bending allowables given (Pa); bad input when neither is
    (`file` as for poisson_ratio)."""
    given = [value for value in (material.allowable.compression, material.allowable.bending) if value is not None]
    if not given:
        raise InputError(material.source or file, f"materials.{material.name}.allowable.compression",
                         "the local check needs the 'compression' or 'bending' allowable stress, and neither is given",
                         f'add compression = "... MPa" and bending = "... MPa" from your governing code under [materials.{material.name}.allowable]')
    return max(given)


# ----------------------------------------------------------------------------------------------
# stresses in the walls

def stress_plane(actions: np.ndarray, area: Any, Iz: Any, Iy: Any, Iyz: Any) -> np.ndarray:
    """(..., 3): (N / A, a, b) of sigma = N / A + a y + b z (Pa, Pa/m; tension positive) for actions
    (..., 6) N, Vy, Vz, T, My, Mz in section axes; section scalars broadcast against actions[..., 0]."""
    actions = np.asarray(actions, dtype=float)
    n, my, mz = actions[..., 0], actions[..., 4], actions[..., 5]
    det = Iz * Iy - Iyz * Iyz
    a = (-mz * Iy - Iyz * my) / det
    b = (Iz * my + Iyz * mz) / det
    return np.stack([n / area, a, b], axis=-1)


@dataclass(frozen=True)
class WallStresses:
    """Compression (Pa, positive) in each wall (last axis): at the supported and far edges at
    mid-thickness, and the peak over the wall's four corners."""

    supported: np.ndarray
    far: np.ndarray
    peak: np.ndarray


def wall_stresses(walls: Sequence[Wall], actions: np.ndarray, area: float, Iz: float, Iy: float, Iyz: float) -> WallStresses:
    """Compressions in `walls` (..., n_walls) for actions (..., 6) in section axes (the arithmetic
    local_check and local_utilizations use)."""
    actions = np.asarray(actions, dtype=float)
    terms = _wall_terms(table_of_walls([list(walls)]), slice(0, 1), stress_plane(actions.reshape(1, -1, 6), area, Iz, Iy, Iyz))
    shape = actions.shape[:-1] + (len(walls),)
    edges = (terms.middle + terms.spread, terms.middle - terms.spread, terms.peak)
    return WallStresses(*(values.reshape(shape) for values in edges))


@dataclass(frozen=True)
class WallTerms:
    """Compression (Pa) in the walls of a block of sections (sections, rows, walls), at mid-thickness:
    `middle` at the middle of the wall's width, the supported edge middle + spread and the far edge
    middle - spread; sigma1 = middle + |spread| the larger edge; peak = sigma1 + |through-thickness
    gradient| t / 2, the largest over the four corners (the stress is linear, so it peaks at a corner)."""

    middle: np.ndarray
    spread: np.ndarray
    sigma1: np.ndarray
    peak: np.ndarray


def _wall_terms(table: WallTable, sections: slice, plane: np.ndarray) -> WallTerms:
    """WallTerms of table rows `sections` under plane (Sb, K, 3)."""
    part = (sections, None)
    centre = (table.supported[part] + table.far[part]) / 2.0
    back = (table.far[part] - table.supported[part]) / 2.0  # minus half the width vector: compression, not tension
    c0, a, b = plane[..., 0:1], plane[..., 1:2], plane[..., 2:3]
    middle = -c0 - a * centre[..., 0] - b * centre[..., 1]
    spread = a * back[..., 0] + b * back[..., 1]
    gradient = np.abs(a * table.across[part][..., 0] + b * table.across[part][..., 1])
    sigma1 = middle + np.abs(spread)
    return WallTerms(middle, spread, sigma1, sigma1 + gradient * (table.thickness[part] / 2.0))


# ----------------------------------------------------------------------------------------------
# many sections at once

@dataclass(frozen=True)
class WallTable:
    """The walls of many sections, padded to the most walls of any (S sections, W walls): kind (S, W),
    supported/far/across (S, W, 2) in m from each centroid, thickness and width (S, W) in m, mask (S, W)
    True for a real wall, names per section."""

    kind: np.ndarray
    supported: np.ndarray
    far: np.ndarray
    across: np.ndarray
    thickness: np.ndarray
    width: np.ndarray
    mask: np.ndarray
    names: tuple[tuple[str, ...], ...]


def wall_table(specs: Sequence[Any], centroids: Sequence[Point] | np.ndarray) -> WallTable:
    """The WallTable of `specs` with their centroids (y, z) from the bounding-box centre (m)."""
    return table_of_walls([section_walls(spec, (float(c[0]), float(c[1]))) for spec, c in zip(specs, centroids)])


def table_of_walls(sections: list[list[Wall]]) -> WallTable:
    """The WallTable of each section's walls (an empty list for a section without walls)."""
    count, most = len(sections), max([1] + [len(walls) for walls in sections])
    kind = np.full((count, most), INTERNAL, dtype=object)
    supported, far, across = (np.zeros((count, most, 2)) for _ in range(3))
    thickness, width = np.ones((count, most)), np.ones((count, most))
    mask = np.zeros((count, most), dtype=bool)
    for s, walls in enumerate(sections):
        for w, wall in enumerate(walls):
            kind[s, w], supported[s, w], far[s, w], across[s, w] = wall.kind, wall.supported, wall.far, wall.across
            thickness[s, w], width[s, w], mask[s, w] = wall.thickness, wall.width, True
    return WallTable(kind.astype(str), supported, far, across, thickness, width, mask,
                     tuple(tuple(wall.name for wall in walls) for walls in sections))


@dataclass(frozen=True)
class PlateNumbers:
    """Every wall's numbers at every row (sections, rows, walls); Pa except psi and k."""

    compressed: np.ndarray  # bool: a real wall with sigma1 x area > ZERO_ACTION
    psi: np.ndarray
    k: np.ndarray
    critical: np.ndarray  # sigma_cr
    allowable: np.ndarray  # F_red
    demand: np.ndarray  # peak corner compression
    utilization: np.ndarray  # demand / F_red where compressed, else -inf


def _compressed(table: WallTable, sections: slice, terms: WallTerms, area: np.ndarray) -> np.ndarray:
    """(Sb, K, W) True for a real wall whose larger edge compression x the area exceeds ZERO_ACTION."""
    return table.mask[sections, None] & (terms.sigma1 > (ZERO_ACTION / area)[:, None, None])


def _plate_values(kind: np.ndarray, middle: np.ndarray, spread: np.ndarray, demand: np.ndarray, thickness: np.ndarray,
                  width: np.ndarray, E: Any, nu: Any, allowable: Any, yield_strength: float | None,
                  safety_factor: float) -> tuple[np.ndarray, ...]:
    """(psi, k, sigma_cr, F_red, utilization) elementwise for compressed walls: the one formula the
    check and the screen both use. psi = (middle - |spread|) / (middle + |spread|); the free edge is the
    more compressed (or equal) where spread <= 0."""
    larger = middle + np.abs(spread)
    with np.errstate(divide="ignore", invalid="ignore"):
        psi = (middle - np.abs(spread)) / larger
    k = plate_coefficient(kind, psi, spread <= 0.0)
    critical = elastic_plate_stress(k, E, nu, thickness, width)
    reduced = reduced_allowable(allowable, critical, yield_strength, safety_factor, wall_plateau(kind, psi))
    return psi, k, critical, reduced, demand / reduced


def _plate_numbers(table: WallTable, sections: slice, terms: WallTerms, compressed: np.ndarray, E: np.ndarray, nu: np.ndarray,
                   yield_strength: float | None, allowable: np.ndarray, safety_factor: float) -> PlateNumbers:
    """PlateNumbers of table rows `sections` from their WallTerms and compressed walls; per-section arrays (Sb,)."""
    part, per = (sections, None), (slice(None), None, None)
    psi, k, critical, reduced, utilization = _plate_values(
        table.kind[part], terms.middle, terms.spread, terms.peak, table.thickness[part], table.width[part],
        E[per], nu[per], allowable[per], yield_strength, safety_factor)
    return PlateNumbers(compressed, psi, k, critical, reduced, terms.peak, np.where(compressed, utilization, -np.inf))


def _lowest_allowables(table: WallTable, sections: slice, E: np.ndarray, nu: np.ndarray, yield_strength: float | None,
                       allowable: np.ndarray, safety_factor: float) -> np.ndarray:
    """(Sb, 1, W): each wall's F_red at its smallest k and plateau (uniform compression, psi = 1; neither
    k nor the plateau limit falls as psi falls), so demand / this bounds the utilization from above at
    every row."""
    kind = table.kind[sections]
    k = np.minimum(plate_coefficient(kind, 1.0, True), plate_coefficient(kind, 1.0, False))
    per = (slice(None), None)
    critical = elastic_plate_stress(k, E[per], nu[per], table.thickness[sections], table.width[sections])
    return reduced_allowable(allowable[per], critical, yield_strength, safety_factor, wall_plateau(kind, 1.0))[:, None, :]


@dataclass(frozen=True)
class _Block:
    """One block of sections of local_utilizations: where it starts in the table and its per-section
    values (Sb,), the wall terms of a block of rows and which walls are compressed."""

    start: int
    E: np.ndarray
    nu: np.ndarray
    allowable: np.ndarray
    terms: WallTerms
    compressed: np.ndarray


def local_utilizations(table: WallTable, actions: np.ndarray, area: Any, Iz: Any, Iy: Any, Iyz: Any, E: Any, nu: Any,
                       yield_strength: float | None, allowable: Any, safety_factor: float,
                       block_values: int = BLOCK_VALUES, largest: bool = True) -> tuple[np.ndarray, np.ndarray]:
    """Largest local utilization of each section (S,) over rows and walls, and the row where it is
    (S,) int (the first such row); 0.0 and row -1 where no wall is ever in compression (or the section
    has no walls).

    actions: (K, 6) rows shared by every section, or (S, K, 6), section axes (N, N*m); area, Iz, Iy,
    Iyz (S,) (m^2, m^4); E, nu and the allowable F (Pa) scalars or (S,); yield_strength Fy (Pa) or
    None; safety_factor SF. Same numbers as local_check at the same rows (the same elementwise
    formulas). Each wall's demand over its allowable at psi = 1 bounds its utilization from above; the
    exact value is computed only where that bound reaches the exact value at the section's largest
    bound. Blocks of sections and rows keep at most `block_values` (section, row, wall) values at once.
    With `largest` False, only the exact value at the largest bound of each block is made: a lower
    bound of the largest, for a screen that only has to prove failures."""
    count, walls = table.mask.shape
    actions = np.asarray(actions, dtype=float)
    rows = actions.shape[-2]
    if actions.ndim == 2:
        actions = np.broadcast_to(actions, (count, rows, 6))
    scalars = [np.broadcast_to(np.asarray(v, dtype=float), (count,)) for v in (area, Iz, Iy, Iyz, E, nu, allowable)]
    best, where = np.full(count, -np.inf), np.full(count, -1, dtype=np.int64)
    row_block = max(1, min(rows, block_values // walls))
    section_block = max(1, block_values // (row_block * walls))
    for start in range(0, count, section_block):
        sections = slice(start, min(start + section_block, count))
        a, iz, iy, iyz, e, n, f = (v[sections] for v in scalars)
        lowest = _lowest_allowables(table, sections, e, n, yield_strength, f, safety_factor)
        for first in range(0, rows, row_block):
            plane = stress_plane(actions[sections, first:first + row_block], a[:, None], iz[:, None], iy[:, None], iyz[:, None])
            terms = _wall_terms(table, sections, plane)
            block = _Block(start, e, n, f, terms, _compressed(table, sections, terms, a))
            bound = np.where(block.compressed, terms.peak / lowest, -np.inf)
            top = np.unravel_index(bound.reshape(len(a), -1).argmax(axis=1), bound.shape[1:])
            at_top = _exact_at(table, block, top, yield_strength, safety_factor)
            if largest:
                value, row = _largest_exact(table, block, bound >= at_top[:, None, None], yield_strength, safety_factor)
            else:
                value, row = np.where(np.isfinite(at_top), at_top, -np.inf), top[0]
            better = value > best[sections]
            best[sections] = np.where(better, value, best[sections])
            where[sections] = np.where(better, first + row, where[sections])
    return np.where(np.isfinite(best), best, 0.0), np.where(np.isfinite(best), where, -1)


def _exact_at(table: WallTable, block: _Block, place: tuple[np.ndarray, np.ndarray], yield_strength: float | None,
              safety_factor: float) -> np.ndarray:
    """(Sb,) exact utilization at one (row, wall) of each section of a block; +inf where that wall is
    not compressed (then no wall of the section is, in these rows: nothing to find)."""
    entries = (np.arange(len(block.E)), *place)
    return np.where(block.compressed[entries], _values_at(table, block, entries, yield_strength, safety_factor), np.inf)


def _largest_exact(table: WallTable, block: _Block, candidates: np.ndarray, yield_strength: float | None,
                   safety_factor: float) -> tuple[np.ndarray, np.ndarray]:
    """(Sb,) largest exact utilization among the candidate (section, row, wall) entries of a block and
    its row (the first on ties); -inf and -1 where a section has no candidate."""
    entries = np.nonzero(candidates & block.compressed)
    values = _values_at(table, block, entries, yield_strength, safety_factor)
    value, row = np.full(len(block.E), -np.inf), np.full(len(block.E), -1, dtype=np.int64)
    order = np.lexsort((entries[1], -values, entries[0]))  # by section, then largest value, then first row
    sections = entries[0][order]
    head = order[np.r_[True, sections[1:] != sections[:-1]]] if len(order) else order
    value[entries[0][head]], row[entries[0][head]] = values[head], entries[1][head]
    return value, row


def _values_at(table: WallTable, block: _Block, entries: tuple[np.ndarray, ...], yield_strength: float | None,
               safety_factor: float) -> np.ndarray:
    """Exact utilizations at (section in block, row, wall) entries, elementwise as _plate_numbers."""
    s, _, w = entries
    wall = (block.start + s, w)
    terms = block.terms
    return _plate_values(table.kind[wall], terms.middle[entries], terms.spread[entries], terms.peak[entries],
                         table.thickness[wall], table.width[wall], block.E[s], block.nu[s], block.allowable[s],
                         yield_strength, safety_factor)[4]


# ----------------------------------------------------------------------------------------------
# the check of one section

def local_check(design: Design, actions: np.ndarray, xs: np.ndarray, names: Sequence[str]) -> CheckResult:
    """The local check of the design's section: actions (C, S, 6) in section axes at stations xs (S,)
    (m) of combinations `names`. The governing wall's demand, allowable and place; extra holds
    critical_stress (Pa) and element (the wall's name)."""
    reason = no_walls_reason(design.spec.shape)
    if reason:
        return CheckResult("local", None, detail=reason)
    props = design.props
    table = table_of_walls([section_walls(design.spec, props.centroid)])
    rows = np.asarray(actions, dtype=float).reshape(1, -1, 6)
    area = np.array([props.area])
    material, file = design.known_material, design.member.source
    E, nu = material.elastic_modulus, poisson_ratio(material, file)
    given = [value for value in (material.allowable.compression, material.allowable.bending) if value is not None]
    F = max(given) if given else np.inf  # none given: bad input below, once a wall is found in compression
    safety_factor, yield_strength = design.member.checks.buckling_safety_factor, material.yield_strength
    _, found = local_utilizations(table, rows[0], area, props.Iz, props.Iy, props.Iyz, E, nu, yield_strength, F, safety_factor)
    row = int(found[0])  # the governing row, found with the uniform-compression bound; its plate numbers follow
    if row < 0:
        return CheckResult("local", None, detail="no compression in any wall")
    F = wall_allowable(material, file)
    one = slice(0, 1)
    at_row = _wall_terms(table, one, stress_plane(rows[:, row:row + 1], area[:, None], props.Iz, props.Iy, props.Iyz))
    numbers = _plate_numbers(table, one, at_row, _compressed(table, one, at_row, area), np.array([E]), np.array([nu]), yield_strength,
                             np.array([F]), safety_factor)
    w = int(np.argmax(numbers.utilization[0, 0]))
    c, s = divmod(row, len(xs))
    pick = (0, 0, w)
    critical, reduced = float(numbers.critical[pick]), float(numbers.allowable[pick])
    wall = table.names[0][w]
    plateau = float(wall_plateau(table.kind[0, w], numbers.psi[pick]))
    extra = {"critical_stress": critical, "element": wall, "plateau_slenderness": plateau}
    if yield_strength:
        extra["slenderness"] = float(slenderness(critical, yield_strength))
    detail = phrase(f"{wall}, k = {numbers.k[pick]:.3g} (psi = {numbers.psi[pick]:.2f}), sigma_cr = ", q("sigma_cr", critical, "MPa", ".4g"), ", ",
                    f"lambda_p = {extra['slenderness']:.3g} (plateau {plateau:.3g}), " if yield_strength else "", "allowable ",
                    q("allowable", reduced, "MPa", ".4g"), f" ({governing_term(F, critical, yield_strength, safety_factor, plateau)}, SF {safety_factor:g})")
    return CheckResult("local", float(numbers.utilization[pick]), float(numbers.demand[pick]), reduced, float(xs[s]), names[c],
                       detail=detail, extra=extra)

