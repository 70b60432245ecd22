"""The flat walls of each catalogue shape for the local buckling check (sizer.checks.local).

Widths b are the clear flat widths (common practice): the part of the wall between the fillets or
corners, at mid-thickness: i_beam and tee flange outstands (width - web_thickness) / 2 - root_radius;
channel flanges width - web_thickness - root_radius; webs between flanges depth - 2 flange_thickness
- 2 root_radius; a tee's stem depth - flange_thickness - root_radius (an outstand); angle legs
leg - thickness - root_radius (outstands); rectangular_tube walls outer dimension - 2 max(outer_radius,
thickness) (internal). Positions (y, z) are in m from the centroid in the section's own axes.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from sizer.sections.spec import SectionSpec

INTERNAL, OUTSTAND = "internal", "outstand"
Point = tuple[float, float]


@dataclass(frozen=True)
class Wall:
    """One flat wall as a plate. Positions (y, z) in m from the centroid, section axes.

    supported, far: the mid-thickness points of the two long edges (for an outstand `far` is the
    free edge); across: unit (y, z) vector through the thickness; thickness t and clear flat width b (m).
    """

    name: str
    kind: str  # INTERNAL or OUTSTAND
    supported: Point
    far: Point
    across: Point
    thickness: float
    width: float


def no_walls_reason(shape: str) -> str | None:
    """Why the local check is not made for `shape` (None: it is made)."""
    reasons = {
        "round": "a round bar has no flat walls: not made",
        "round_tube": "a round tube's walls are curved (shell buckling, not plate buckling): not made",
        "polygon": "a polygon's walls and their edge conditions are not known to sizer: not made; check its local buckling by hand",
        "rectangle": "a solid rectangular bar has no thin walls to buckle locally: not made",
    }
    return reasons.get(shape)


def section_walls(spec: SectionSpec, centroid: Point) -> list[Wall]:
    """The flat walls of a catalogue section (sections.SectionSpec, dims in m); `centroid` = (y, z) of
    the centroid from the bounding-box centre (SectionProperties.centroid). Empty for the shapes of
    no_walls_reason."""
    builder = _BUILDERS.get(spec.shape)
    if builder is None:
        return []
    cy, cz = centroid
    return [Wall(w.name, w.kind, (w.supported[0] - cy, w.supported[1] - cz), (w.far[0] - cy, w.far[1] - cz),
                 w.across, w.thickness, w.width) for w in builder(spec.dims)]


def _flange_outstands(prefix: str, y: float, root: float, tip: float, t: float) -> list[Wall]:
    """Two outstands at height y, each from +/-root (supported) to +/-tip (free), bbox-centre axes."""
    return [Wall(f"{prefix} (+z side)", OUTSTAND, (y, root), (y, tip), (1.0, 0.0), t, tip - root),
            Wall(f"{prefix} (-z side)", OUTSTAND, (y, -root), (y, -tip), (1.0, 0.0), t, tip - root)]


def _i_beam_walls(d: dict[str, float]) -> list[Wall]:
    depth, width, tf, tw, r = d["depth"], d["width"], d["flange_thickness"], d["web_thickness"], d["root_radius"]
    root, tip, web_end = tw / 2 + r, width / 2, depth / 2 - tf - r
    return (_flange_outstands("top flange outstand", depth / 2 - tf / 2, root, tip, tf)
            + _flange_outstands("bottom flange outstand", -(depth / 2 - tf / 2), root, tip, tf)
            + [Wall("web", INTERNAL, (web_end, 0.0), (-web_end, 0.0), (0.0, 1.0), tw, 2 * web_end)])


def _channel_walls(d: dict[str, float]) -> list[Wall]:
    """The web is on the +z side (sectionproperties draws it at X = 0), the flanges point to -z."""
    depth, width, tf, tw, r = d["depth"], d["width"], d["flange_thickness"], d["web_thickness"], d["root_radius"]
    root, tip, web_z, web_end, y = width / 2 - tw - r, -width / 2, width / 2 - tw / 2, depth / 2 - tf - r, depth / 2 - tf / 2
    flat = width - tw - r
    return [Wall("top flange", OUTSTAND, (y, root), (y, tip), (1.0, 0.0), tf, flat),
            Wall("bottom flange", OUTSTAND, (-y, root), (-y, tip), (1.0, 0.0), tf, flat),
            Wall("web", INTERNAL, (web_end, web_z), (-web_end, web_z), (0.0, 1.0), tw, 2 * web_end)]


def _tee_walls(d: dict[str, float]) -> list[Wall]:
    """Flange at the top, stem down to the bottom (sectionproperties' tee_section)."""
    depth, width, tf, tw, r = d["depth"], d["width"], d["flange_thickness"], d["web_thickness"], d["root_radius"]
    stem_root = depth / 2 - tf - r
    return (_flange_outstands("flange outstand", depth / 2 - tf / 2, tw / 2 + r, width / 2, tf)
            + [Wall("stem", OUTSTAND, (stem_root, 0.0), (-depth / 2, 0.0), (0.0, 1.0), tw, depth - tf - r)])


def _angle_walls(d: dict[str, float]) -> list[Wall]:
    """The heel at the bottom, +z side: one leg up along the depth, one across to -z (sectionproperties'
    angle_section draws the legs along X = 0 and Y = 0)."""
    depth, width, t, r = d["depth"], d["width"], d["thickness"], d["root_radius"]
    up, across = ("long ", "short ") if depth > width else ("short ", "long ") if depth < width else ("", "")
    leg_z, leg_y = width / 2 - t / 2, -depth / 2 + t / 2
    return [Wall(f"{up}leg (along the depth)", OUTSTAND, (-depth / 2 + t + r, leg_z), (depth / 2, leg_z), (0.0, 1.0), t, depth - t - r),
            Wall(f"{across}leg (across)", OUTSTAND, (leg_y, width / 2 - t - r), (leg_y, -width / 2), (1.0, 0.0), t, width - t - r)]


def _tube_walls(d: dict[str, float]) -> list[Wall]:
    depth, width, t = d["depth"], d["width"], d["thickness"]
    corner = max(d["outer_radius"], t)
    y, z, y_end, z_end = depth / 2 - t / 2, width / 2 - t / 2, depth / 2 - corner, width / 2 - corner
    return [Wall("top wall", INTERNAL, (y, z_end), (y, -z_end), (1.0, 0.0), t, width - 2 * corner),
            Wall("bottom wall", INTERNAL, (-y, z_end), (-y, -z_end), (1.0, 0.0), t, width - 2 * corner),
            Wall("side wall (+z side)", INTERNAL, (y_end, z), (-y_end, z), (0.0, 1.0), t, depth - 2 * corner),
            Wall("side wall (-z side)", INTERNAL, (y_end, -z), (-y_end, -z), (0.0, 1.0), t, depth - 2 * corner)]


_BUILDERS = {"i_beam": _i_beam_walls, "channel": _channel_walls, "tee": _tee_walls, "angle": _angle_walls,
             "rectangular_tube": _tube_walls}


# ----------------------------------------------------------------------------------------------
# the plate
