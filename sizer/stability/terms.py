"""The matrices of the stability solver's energy, one per term, to be weighted by a section's scalars
(sizer.stability.section) and summed. SI throughout; section axes (y along the depth, z across).

Elastic strain energy (thin-walled beam theory, Vlasov), 1/2 d^T K d:
    1/2 integral [EIz v''^2 + 2 EIyz v'' w'' + EIy w''^2 + GJ phi'^2 + EIw phi''^2] dx.
Second-order work of the internal actions and loads, 1/2 d^T G d (a load factor lam scales G; the
member buckles where K + lam G is singular):
    integral [1/2 N (v'^2 + w'^2) + N z0 v' phi' - N y0 w' phi' + Mz w'' phi + My v'' phi
              + 1/2 W phi'^2] dx  +  1/2 sum q a phi^2,
with W = N r0^2 + dW/dMz Mz + dW/dMy My the Wagner coefficient (the normal stress acting through
the twist rate at each fibre's distance from the shear centre), q a transverse load along the depth
(N/m, or N at a point) and a its height above the shear centre (m): a downward load above the shear
centre lowers the buckling load. N is tension positive; Mz, My are the section-axis moments (docs/design.md
section 2 signs). The N and W terms follow from the normal stress times the second-order strain;
the moment coupling is written M w'' phi (as in the classical equations EIy w'''' + (M phi)'' = 0),
which is exact for moment that varies along the member.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from sizer.stability.elements import Quadrature, integral

if TYPE_CHECKING:
    from sizer.stability.section import StabilitySection

Coefficient = float | np.ndarray  # a section scalar: one section's, or many sections' at once

V, W, PHI = 0, 1, 2
ELASTIC_TERMS: tuple[str, ...] = ("EIz", "EIy", "EIyz", "GJ", "EIw")
AXIAL_TERMS: tuple[str, ...] = ("flexure", "z0", "y0", "r0")
MOMENT_TERMS: tuple[str, ...] = ("Mz", "My", "wagner_Mz", "wagner_My")


def elastic_terms(quad: Quadrature) -> dict[str, np.ndarray]:
    """Unit-rigidity matrices of the elastic energy, by the rigidity that weights them."""
    one = np.ones_like(quad.x)
    return {
        "EIz": integral(quad, one, (V, "curvature"), (V, "curvature")),
        "EIy": integral(quad, one, (W, "curvature"), (W, "curvature")),
        "EIyz": integral(quad, one, (V, "curvature"), (W, "curvature")),
        "GJ": integral(quad, one, (PHI, "slope"), (PHI, "slope")),
        "EIw": integral(quad, one, (PHI, "curvature"), (PHI, "curvature")),
    }


def axial_terms(quad: Quadrature, N: np.ndarray) -> dict[str, np.ndarray]:
    """Matrices of the axial-force terms for N (E, G) at the Gauss points, weighted by 1, z0, -y0 and
    r0^2 respectively (see axial_coefficients); none where N is zero everywhere."""
    if not np.any(N):
        return {}
    return {
        "flexure": integral(quad, N, (V, "slope"), (V, "slope")) + integral(quad, N, (W, "slope"), (W, "slope")),
        "z0": integral(quad, N, (V, "slope"), (PHI, "slope")),
        "y0": integral(quad, N, (W, "slope"), (PHI, "slope")),
        "r0": integral(quad, N, (PHI, "slope"), (PHI, "slope")),
    }


def moment_terms(quad: Quadrature, Mz: np.ndarray, My: np.ndarray) -> dict[str, np.ndarray]:
    """Matrices of the bending-moment terms for Mz, My (E, G) at the Gauss points, weighted by 1, 1,
    dW/dMz and dW/dMy (see moment_coefficients); none for a moment that is zero everywhere."""
    terms: dict[str, np.ndarray] = {}
    if np.any(Mz):
        terms["Mz"] = integral(quad, Mz, (W, "curvature"), (PHI, "value"))
        terms["wagner_Mz"] = integral(quad, Mz, (PHI, "slope"), (PHI, "slope"))
    if np.any(My):
        terms["My"] = integral(quad, My, (V, "curvature"), (PHI, "value"))
        terms["wagner_My"] = integral(quad, My, (PHI, "slope"), (PHI, "slope"))
    return terms


def elastic_coefficients(section: StabilitySection) -> dict[str, Coefficient]:
    return {name: getattr(section, name) for name in ELASTIC_TERMS}


def axial_coefficients(section: StabilitySection) -> dict[str, Coefficient]:
    return {"flexure": 1.0, "z0": section.z0, "y0": -section.y0, "r0": section.polar_radius_squared}


def moment_coefficients(section: StabilitySection) -> dict[str, Coefficient]:
    return {"Mz": 1.0, "My": 1.0, "wagner_Mz": section.wagner_major, "wagner_My": section.wagner_minor}


def weighted_sum(terms: dict[str, np.ndarray], coefficients: dict[str, Coefficient]) -> np.ndarray | float:
    """sum of coefficient x matrix over the terms present in both (0.0 when there are none); a term
    whose coefficient is the number 0 (z0 and y0 of a doubly symmetric section, say) adds nothing and
    is left out."""
    out: np.ndarray | float = 0.0
    for name, matrix in terms.items():
        if name in coefficients and not (np.ndim(coefficients[name]) == 0 and coefficients[name] == 0.0):
            term = float(coefficients[name]) * matrix
            if isinstance(out, np.ndarray) and isinstance(term, np.ndarray):
                out += term  # in place: the same sums, one array fewer per term
            else:
                out = out + term
    return out
