"""The name of a column buckling mode, read from the buckled shape itself: the share of its strain
energy in twisting (and warping) against bending in the depth plane and sideways
(MemberStability.energy_shares). A shape that hardly twists is flexural whatever the section's
shear centre; one that is nearly all twist is torsional; in between, flexural-torsional.
"""

from __future__ import annotations

TWIST_ONLY = 0.9  # twist share at or above which the mode is called torsional
NO_TWIST = 0.1  # twist share at or below which the mode is called flexural (common practice: a 10 % share)
ONE_PLANE = 0.9  # bending share in one plane at or above which that axis is named


def mode_label(shares: dict[str, float], equal_axes: bool = False) -> str:
    """"torsional", "flexural-torsional", "flexural major" (bending in the depth plane), "flexural
    minor" (sideways), or for a flexural shape bent in both planes: "flexural (Iz = Iy: any axis)"
    when the section is equally stiff about every axis (`equal_axes`: equal principal second
    moments), else "flexural minor principal (inclined axis)": a section whose principal axes are
    not y and z (an angle) bends in both planes when it buckles about its weaker principal axis.
    `shares`: "v", "w", "phi" energy shares summing to 1."""
    twist = shares["phi"]
    if twist >= TWIST_ONLY:
        return "torsional"
    if twist > NO_TWIST:
        return "flexural-torsional"
    bending = shares["v"] + shares["w"] or 1.0
    if shares["v"] / bending >= ONE_PLANE:
        return "flexural major"
    if shares["w"] / bending >= ONE_PLANE:
        return "flexural minor"
    return "flexural (Iz = Iy: any axis)" if equal_axes else "flexural minor principal (inclined axis)"
