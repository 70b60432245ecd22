"""The allowable stress that a buckling mode leaves, from its elastic critical stress (Pa).

Johnson parabola: sigma_J = sigma_cr where sigma_cr <= Fy / 2, else Fy (1 - Fy / (4 sigma_cr))
(docs/references.md: Johnson's parabola, common practice); without a yield strength sigma_J = sigma_cr.

Reduced allowable (lateral-torsional and local buckling):
    F_red = min(F, F sigma_J / Fy, sigma_cr / SF)      (with a yield strength)
    F_red = min(F, sigma_cr / SF)                       (without)
with F the user's allowable for that stress and SF the buckling safety factor. The middle term
scales the user's allowable down the Johnson curve, so a member that cannot buckle keeps its full
allowable (sigma_cr -> infinity gives F), and the last term keeps the stated safety factor against
elastic buckling. (min(F, sigma_J / SF) alone would cut every allowable to at most Fy / SF, even for a
member held along its whole length.)
"""

from __future__ import annotations

from typing import Any

import numpy as np


def johnson(sigma_cr: Any, yield_strength: float | None) -> Any:
    """sigma_J (Pa) from the elastic critical stress sigma_cr (Pa), elementwise; inf stays inf."""
    sigma = np.asarray(sigma_cr, dtype=float)
    if not yield_strength:
        return sigma
    fy = float(yield_strength)
    with np.errstate(divide="ignore", invalid="ignore"):
        inelastic = fy * (1.0 - fy / (4.0 * sigma))
    return np.where(sigma <= fy / 2.0, sigma, np.where(np.isinf(sigma), fy, inelastic))


def reduced_allowable(allowable: Any, sigma_cr: Any, yield_strength: float | None, safety_factor: float) -> Any:
    """F_red (Pa) of the module docstring, elementwise."""
    allowable = np.asarray(allowable, dtype=float)
    sigma = np.asarray(sigma_cr, dtype=float)
    reduced = np.minimum(allowable, sigma / safety_factor)
    if yield_strength:
        reduced = np.minimum(reduced, allowable * johnson(sigma, yield_strength) / float(yield_strength))
    return reduced
