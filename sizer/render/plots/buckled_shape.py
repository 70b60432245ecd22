"""The buckled shape of the governing stability check: the sideways displacement w (across the
section's depth) and the twist phi along the member, each scaled so that its largest value is 1,
with what holds the member drawn on the axis: supports (forks) and restraints, point restraints as
marks and continuous ones as hatched strips, each with what it holds and at which height.

The shape comes from the eigen-solve (sizer.checks.stability.StabilityReport: the model's
`shape(mode, xs)`); the pick is the stability check (buckling or lateral-torsional) with the
largest utilization that has a buckled shape.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from sizer import units
from sizer.checks import CheckReport
from sizer.design import Design
from sizer.model import Restraint
from sizer.render.plots.style import GOVERNING_INK, GUIDE, INK, LOAD_INK

if TYPE_CHECKING:
    from sizer.stability import MemberStability
    from matplotlib.axes import Axes

STABILITY_CHECKS = {"lateral-torsional": "lateral", "buckling": "axial"}


@dataclass(frozen=True)
class BucklingPick:
    """The stability check whose buckled shape is drawn: check name, combination, load factor and
    the mode on every freedom of the model's mesh."""

    check: str
    combination: str
    load_factor: float
    mode: np.ndarray
    model: MemberStability


def buckling_pick(report: CheckReport | None) -> BucklingPick | None:
    """The made stability check with the largest utilization that has a buckled shape, or None."""
    if report is None or report.stability is None:
        return None
    made = sorted((c for c in report.checks if c.made and c.check in STABILITY_CHECKS), key=lambda c: -c.made_utilization)
    for result in made:
        for entry in report.stability.combinations:
            found = getattr(entry, STABILITY_CHECKS[result.check])
            if entry.combination == result.combination and found is not None and found.mode is not None and np.isfinite(found.load_factor):
                return BucklingPick(result.check, entry.combination, float(found.load_factor), found.mode, report.stability.model)
    return None


def shape_samples(pick: BucklingPick, length: float, n: int = 401) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(x, w / max|w|, phi / max|phi|) along the member; a field that is zero stays zero."""
    xs = np.unique(np.concatenate([np.linspace(0.0, length, n), pick.model.mesh.nodes]))
    shape = pick.model.shape(pick.mode, xs)
    return xs, _unit_peak(shape["w"]), _unit_peak(shape["phi"])


def _unit_peak(values: np.ndarray) -> np.ndarray:
    peak = float(np.abs(values).max(initial=0.0))
    return values / peak if peak > 1e-12 else np.zeros_like(values)


def twist_ratio(pick: BucklingPick, depth: float, length: float) -> float:
    """Largest |phi| x depth / 2 over largest |w|: how far the twist moves a flange tip, against the
    sideways movement (0 without sideways movement)."""
    xs = np.linspace(0.0, length, 401)
    shape = pick.model.shape(pick.mode, xs)
    w = float(np.abs(shape["w"]).max(initial=0.0))
    return float(np.abs(shape["phi"]).max(initial=0.0)) * depth / 2 / w if w > 1e-12 else 0.0


def height_text(height: str | float, system: str) -> str:
    """"top", "centre", "bottom", or a signed distance from the shear centre in display units."""
    if isinstance(height, str):
        return height
    text = units.fmt(height, "dimension", system)
    return text if text.startswith("-") else "+" + text


def holds_at_supports(design: Design) -> list[tuple[float, bool, bool]]:
    """(x, sideways held, twist held) of each support, in the section's axes: sideways is member z
    in major orientation and member y in minor."""
    sideways = "uy" if design.member.orientation == "minor" else "uz"
    return [(s.at, sideways in s.restrain or sideways in s.springs, "rx" in s.restrain or "rx" in s.springs) for s in design.member.supports]


def draw_buckled_shape(ax_w: Axes, ax_phi: Axes, design: Design, pick: BucklingPick, system: str) -> None:
    """The two panels: sideways w and twist phi, scaled to a largest value of 1, with the holds."""
    length = design.member.length
    xs, w, phi = shape_samples(pick, length)
    what = "lateral-torsional" if pick.check == "lateral-torsional" else "column"
    titles = (f"Buckled shape ({what}, combination '{pick.combination}', load factor {pick.load_factor:.3g}): sideways w, largest = 1",
              "Buckled shape: twist φ about the member axis, largest = 1")
    for ax, values, title in ((ax_w, w, titles[0]), (ax_phi, phi, titles[1])):
        ax.axhline(0.0, color=GUIDE, lw=2.0, zorder=1, solid_capstyle="butt")
        ax.plot(xs, values, color=GOVERNING_INK, lw=1.4, zorder=4)
        ax.set_ylim(-1.45, 1.45)
        ax.set_yticks([-1.0, 0.0, 1.0])
        ax.set_ylabel("scaled")
        if not np.any(values):
            ax.text(0.5, 0.62, "none in this buckled shape", transform=ax.transAxes, ha="center", fontsize=7.5, color="#555555")
        ax.set_title(title, loc="left", pad=3)
    _draw_holds(ax_w, ax_phi, design, system)
    ratio = twist_ratio(pick, design.props.depth, length)
    if ratio:
        ax_phi.text(0.995, 0.04, f"largest φ × depth / 2 = {ratio:.2f} × largest w", transform=ax_phi.transAxes, ha="right",
                    va="bottom", fontsize=7, color="#444444")


def _draw_holds(ax_w: Axes, ax_phi: Axes, design: Design, system: str) -> None:
    """Supports (triangles: holds there) and restraints (squares at a point, hatched strips when
    continuous) on the panel of what they hold."""
    for x, sideways, twist in holds_at_supports(design):
        for ax, held in ((ax_w, sideways), (ax_phi, twist)):
            if held:
                ax.plot([x], [0.0], marker="^", markersize=7, markerfacecolor="white", markeredgecolor=INK, zorder=6, ls="none")
    for restraint in design.member.restraints:
        if restraint.lateral:
            _draw_restraint(ax_w, restraint, f"lateral at {height_text(restraint.height, system)}")
        if restraint.twist:
            _draw_restraint(ax_phi, restraint, "twist")


def _draw_restraint(ax: Axes, restraint: Restraint, label: str) -> None:
    if restraint.continuous:
        ax.axvspan(restraint.start, restraint.end, ymin=0.0, ymax=0.09, facecolor="none", edgecolor=LOAD_INK, hatch="////", lw=0.6,
                   zorder=2)
        ax.text((restraint.start + restraint.end) / 2, -1.38, f"{label}, continuous", ha="center", va="bottom", fontsize=6.5,
                color=LOAD_INK, zorder=8, bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.4, "alpha": 0.9})
        return
    ax.plot([restraint.start], [0.0], marker="s", markersize=5.5, markerfacecolor=LOAD_INK, markeredgecolor=LOAD_INK, zorder=6)
    ax.annotate(label, (restraint.start, 0.0), xytext=(0, -11), textcoords="offset points", ha="center", va="top", fontsize=6.5,
                color=LOAD_INK, zorder=8, bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.4, "alpha": 0.9})
