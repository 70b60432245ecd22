"""Where things go in a member view: x along the page in metres to scale, the transverse direction
schematic in inches of paper from the member axis. Which freedoms and load components a view shows
(elevation: the x-y plane, +y up the page; plan: the x-z plane seen from +y, +z down the page), and
the line-load bands stacked above the axis, each scaled in inches per N/m (or per N*m/m).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.model import Member
from sizer.render.plots.combination_loads import DrawnLine, DrawnPoint
from sizer.render.plots.style import (
    ARROW_MAX,
    BAND_GAP,
    BAND_HEIGHT,
    BAND_MIN_HEIGHT,
    BEAM_HALF,
    BELOW_AXIS,
    END_PAD,
    LABEL_HEIGHT,
    axes_width,
)


@dataclass(frozen=True)
class PlaneSpec:
    """Which freedoms and load components a view shows."""

    name: str
    transverse: int  # 1: y (elevation), 2: z (plan)
    page_sign: float  # page-up direction per + transverse: +1 for y, -1 for z
    translation: str  # "uy" / "uz"
    rotation: str  # "rz" / "ry"
    axis_label: str


PLANES = {
    "elevation": PlaneSpec("elevation", 1, 1.0, "uy", "rz", "y"),
    "plan": PlaneSpec("plan", 2, -1.0, "uz", "ry", "z"),
}


@dataclass
class Band:
    """A line load drawn as a filled outline stacked above the member axis (inches)."""

    load: DrawnLine
    component: int  # 0 wx, 1 wy, 2 wz, 3 mx
    base: float = 0.0
    scale: float = 0.0  # inches per N/m (or N*m/m)

    def intensity(self, x: np.ndarray) -> np.ndarray:
        load = self.load
        t = (x - load.start) / (load.end - load.start)
        return load.q_start[self.component] * (1 - t) + load.q_end[self.component] * t

    @property
    def peak(self) -> float:
        return max(abs(self.load.q_start[self.component]), abs(self.load.q_end[self.component]))

    @property
    def top(self) -> float:
        return self.base + self.peak * self.scale + LABEL_HEIGHT


@dataclass
class MemberView:
    """Layout of one member view: x in m along the page, y in inches from the member axis."""

    plane: PlaneSpec
    m_per_inch: float
    bands: list[Band]
    above: float  # inches needed above the axis
    below: float = BELOW_AXIS
    system: str = "si"  # display units of the labels

    @property
    def height(self) -> float:
        return self.above + self.below

    def dx(self, inches: float) -> float:
        """A horizontal distance in inches of paper, in metres along the member."""
        return inches * self.m_per_inch


def layout_member_view(member: Member, points: list[DrawnPoint], lines: list[DrawnLine], plane: str, system: str = "si") -> MemberView:
    """Lay out a member view: stack its line-load bands and find the height its point loads need."""
    spec = PLANES[plane]
    m_per_inch = member.length / (axes_width() - 2 * END_PAD)
    bands = stack_bands(bands_for(lines, spec), BEAM_HALF + BAND_GAP)
    above = max([band.top for band in bands] + [BEAM_HALF + 0.5])
    for point in points:
        if transverse_force(point, spec):
            above = max(above, stack_top(bands, point.at) + ARROW_MAX + LABEL_HEIGHT)
    return MemberView(spec, m_per_inch, bands, above + 0.15, system=system)


def bands_for(lines: list[DrawnLine], spec: PlaneSpec) -> list[Band]:
    """Bands of a view: transverse components; in elevation also wx and the torque per length."""
    components = (spec.transverse,) if spec.name == "plan" else (1, 0, 3)
    bands = [Band(line, c) for line in lines for c in components
             if line.q_start[c] or line.q_end[c]]
    for group in ({0, 1, 2}, {3}):
        members = [b for b in bands if b.component in group]
        largest = max([b.peak for b in members], default=0.0)
        for band in members:
            band.scale = BAND_HEIGHT / largest if largest else 0.0
            if band.peak * band.scale < BAND_MIN_HEIGHT:
                band.scale = BAND_MIN_HEIGHT / band.peak
    return bands


def stack_bands(bands: list[Band], base: float) -> list[Band]:
    """Place each band on the lowest level free over its x range (first come, lowest)."""
    placed: list[Band] = []
    for band in bands:
        under = [other.top for other in placed if other.load.start < band.load.end and band.load.start < other.load.end]
        band.base = max(under + [base - BAND_GAP]) + BAND_GAP
        placed.append(band)
    return placed


def stack_top(bands: list[Band], x: float) -> float:
    """Top of the band stack at x (inches above the axis)."""
    return max([b.top for b in bands if b.load.start <= x <= b.load.end] + [BEAM_HALF])


def transverse_force(point: DrawnPoint, spec: PlaneSpec) -> float:
    return point.force[spec.transverse]
