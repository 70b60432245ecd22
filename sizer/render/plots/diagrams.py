"""The diagrams under the member views, along x in metres: N, V, M (and Vz, My, T when loaded out of
plane) in display force and moment units, positive up, hatched //// where positive and \\\\ where
negative so that they read in greyscale print, with the extremes labelled; the deflected shape (uy,
and uz out of plane) in display deflection units with the largest marked; faint guides at supports
and hinges, and the governing station as a dash-dot line through every panel.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from sizer import units
from sizer.analysis import extremes
from sizer.checks import check_stations
from sizer.design import Design
from sizer.model import Member
from sizer.results.forces import direction_words
from sizer.render.plots.style import (
    FILL_NEGATIVE,
    FILL_POSITIVE,
    GOVERNING_INK,
    GUIDE,
    INK,
    draw_text,
)

if TYPE_CHECKING:
    from sizer.checks import CheckResult
    from matplotlib.axes import Axes

TITLES = {
    "N": ("Axial force N", "force", "+ tension"),
    "V": ("Shear force V = -Vy", "force", "+ turns its segment clockwise"),
    "M": ("Bending moment M = Mz", "moment", "+ sagging (concave up)"),
    "Vz": ("Shear force Vz", "force", "+ along +z on the +x face"),
    "My": ("Bending moment My", "moment", "+ about +y on the +x face"),
    "T": ("Torque T", "moment", "+ about +x on the +x face"),
}


def draw_diagrams(axes: dict[str, Any], design: Design, combination: str, names: list[str], system: str, planar: bool) -> None:
    """The action diagrams, the deflected shape and the guide lines at supports and hinges."""
    samples = diagram_samples(design, combination)
    for name in names:
        draw_action_diagram(axes[name], name, samples, design, combination, system)
    if "deflection" in axes:
        draw_deflection(axes["deflection"], design, combination, samples.x, samples.sides, system, planar)
    _mark_guides(axes, design.member)


@dataclass(frozen=True)
class Samples:
    """Stations along the member (both sides at discontinuities) and the actions there (N, N*m)."""

    x: np.ndarray
    sides: np.ndarray
    actions: dict[str, np.ndarray]  # N, Vy, Vz, T, My, Mz, V, M
    tiny: float  # values smaller than this are round-off


def diagram_samples(design: Design, combination: str, n_even: int = 400) -> Samples:
    """Actions of `combination` at the check stations plus a fine even spacing."""
    xs, sides = check_stations(design, n_even)
    values = design.solution.actions(combination, xs, sides)
    actions = {name: values[:, i] for i, name in enumerate(("N", "Vy", "Vz", "T", "My", "Mz"))}
    actions["V"] = -actions["Vy"]
    actions["M"] = actions["Mz"]
    tiny = 1e-9 * (1.0 + float(np.abs(values).max(initial=0.0)))
    return Samples(xs, sides, actions, tiny)


def draw_action_diagram(ax: Axes, name: str, samples: Samples, design: Design, combination: str, system: str) -> None:
    """One diagram: the curve, hatched fill by sign, zero line, and the extremes labelled."""
    title, kind, sense = TITLES[name]
    values = np.where(np.abs(samples.actions[name]) < samples.tiny, 0.0, samples.actions[name])
    shown = units.to_display(values, kind, system)
    _signed_fill(ax, samples.x, shown)
    ax.plot(samples.x, shown, color=INK, lw=1.2, zorder=4)
    ax.axhline(0.0, color=INK, lw=0.7, zorder=3)
    ax.set_title(f"{title} [{units.unit_label(kind, system)}]   {sense}", loc="left", pad=3)
    ax.set_ylabel(units.unit_label(kind, system))
    if not np.any(values):
        ax.set_ylim(-1.0, 1.0)
        ax.text(0.5, 0.55, "zero along the member", transform=ax.transAxes, ha="center", fontsize=7.5, color="#555555",
                zorder=8, bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.4, "alpha": 0.9})
        return
    extreme = extremes(design.solution, combination)[name]
    marks = [(extreme.max_value, extreme.max_at, 1.0), (extreme.min_value, extreme.min_at, -1.0)]
    _set_limits(ax, shown)
    for value, at, sign in marks:
        if value * sign > samples.tiny:
            _label_extreme(ax, at, value, kind, system, sign, design.member.length)


def _signed_fill(ax: Axes, x: np.ndarray, y: np.ndarray) -> None:
    ax.fill_between(x, 0.0, y, where=y >= 0, interpolate=True, facecolor=FILL_POSITIVE, edgecolor="#6e6e6e",
                    hatch="////", lw=0.0, zorder=2)
    ax.fill_between(x, 0.0, y, where=y <= 0, interpolate=True, facecolor=FILL_NEGATIVE, edgecolor="#6e6e6e",
                    hatch="\\\\\\\\", lw=0.0, zorder=2)


def _set_limits(ax: Axes, shown: np.ndarray) -> None:
    low, high = min(0.0, float(shown.min())), max(0.0, float(shown.max()))
    span = high - low
    ax.set_ylim(low - 0.32 * span, high + 0.32 * span)


def _label_extreme(ax: Axes, at: float, value: float, kind: str, system: str, sign: float, length: float) -> None:
    """A dot at an extreme, with its value and position."""
    shown = units.to_display(value, kind, system)
    ax.plot([at], [shown], marker="o", markersize=3.6, color=INK, zorder=6)
    text = f"{'max' if sign > 0 else 'min'} {units.fmt(value, kind, system)} at {units.fmt(at, 'length', system)}"
    left = at < 0.62 * length
    ax.annotate(text, (at, shown), xytext=(4 if left else -4, 5 * sign), textcoords="offset points",
                ha="left" if left else "right", va="bottom" if sign > 0 else "top", fontsize=7.5, zorder=7,
                bbox={"boxstyle": "square,pad=0.12", "facecolor": "white", "edgecolor": "none", "alpha": 0.85})


def draw_deflection(ax: Axes, design: Design, combination: str, xs: np.ndarray, sides: np.ndarray, system: str, planar: bool) -> None:
    """The deflected shape: uy (and uz when loaded out of plane) in display units, with the largest
    marked and its direction (down or up where gravity is along that axis)."""
    moved = design.solution.displacements(combination, xs, sides)
    ax.axhline(0.0, color=GUIDE, lw=2.2, zorder=1, solid_capstyle="butt")
    held = np.array([s.at for s in design.member.supports if {"uy", "uz"} & (set(s.restrain) | set(s.springs))])
    if held.size:
        at_supports = units.to_display(design.solution.displacements(combination, held)[:, 1], "deflection", system)
        ax.plot(held, at_supports, ls="none", marker="^", markersize=6, markerfacecolor="white", markeredgecolor=INK, zorder=5)
    curves = [("uy", 1, "-")] + ([] if planar else [("uz", 2, "--")])
    peaks = []
    for label, column, line_style in curves:
        values = moved[:, column]
        ax.plot(xs, units.to_display(values, "deflection", system), color=INK, lw=1.4, ls=line_style, label=label, zorder=4)
        index = int(np.argmax(np.abs(values)))
        peaks.append(float(np.abs(values[index])))
        if abs(values[index]) > 1e-15:
            _label_extreme_deflection(ax, label, float(xs[index]), float(values[index]), system, design.member)
    shown = units.to_display(moved[:, [c for _, c, _ in curves]], "deflection", system)
    if max(peaks) > 1e-15:
        _set_limits(ax, shown)
    unit = units.unit_label("deflection", system)
    sense = "uy + along +y" + ("" if planar else ", uz + along +z (dashed)")
    ax.set_title(f"Deflected shape [{unit}]   {sense}", loc="left", pad=3)
    ax.set_ylabel(unit)


def _label_extreme_deflection(ax: Axes, label: str, at: float, value: float, system: str, member: Member) -> None:
    """A mark at the largest displacement, with its value, direction and position."""
    length = member.length
    shown = units.to_display(value, "deflection", system)
    sign = 1.0 if value > 0 else -1.0
    ax.plot([at], [shown], marker="s", markersize=3.6, color=INK, zorder=6)
    left = at < 0.62 * length
    ax.annotate(f"largest {label} {units.fmt(value, 'deflection', system)}, {direction_words(member, label, value, short=True)}, at "
                f"{units.fmt(at, 'length', system)}",
                (at, shown), xytext=(4 if left else -4, 5 * sign), textcoords="offset points", ha="left" if left else "right",
                va="bottom" if sign > 0 else "top", fontsize=7.5, zorder=7,
                bbox={"boxstyle": "square,pad=0.12", "facecolor": "white", "edgecolor": "none", "alpha": 0.85})


def _mark_guides(axes: dict[str, Any], member: Member) -> None:
    """Faint vertical lines at supports and hinges through every diagram."""
    positions = sorted({s.at for s in member.supports} | {h.at for h in member.hinges})
    for name, ax in axes.items():
        if name in ("elevation", "plan"):
            continue
        for x in positions:
            ax.axvline(x, color=GUIDE, lw=0.5, ls=":", zorder=1)


def mark_governing(axes: dict[str, Axes], governing: CheckResult) -> None:
    """A dash-dot line at the governing station through every panel, tagged in the member view."""
    at = governing.at
    assert at is not None  # marked only for a check with its place
    for ax in axes.values():
        low, high = ax.get_ylim()
        ax.plot([at, at], [low, high], color=GOVERNING_INK, lw=1.0, ls="-.", zorder=7)
        ax.set_ylim(low, high)
    view = axes["elevation"]
    low, high = view.get_xlim()
    right_half = at > (low + high) / 2
    offset = 0.012 * (high - low) * (-1 if right_half else 1)
    draw_text(view, at + offset, view.get_ylim()[0] + 0.04,
              f"governing station: {governing.check}, utilization {governing.utilization:.3f}", color=GOVERNING_INK,
              va="bottom", ha="right" if right_half else "left", fontsize=7.5, fontweight="bold")
