"""The allowable stress that a buckling mode leaves, from its elastic critical stress (Pa).

Slenderness lambda = sqrt(Fy / sigma_cr) (Fy the yield stress of the stress concerned: Fy for normal
stress, Fy / sqrt(3) for shear).

Johnson parabola: sigma_J = sigma_cr where sigma_cr <= Fy / 2, else Fy (1 - Fy / (4 sigma_cr))
(docs/references.md: Johnson's parabola, common practice); without a yield strength sigma_J = sigma_cr.

Reduction factor rho(lambda) with a plateau lambda_0 (the published limit of the element, see
PLATEAU_* below):
    rho = 1                                       for lambda <= lambda_0 (nothing buckles first: no reduction)
    rho = max(J(lambda), 1 - (1 - J(lambda_e)) (lambda - lambda_0) / (lambda_e - lambda_0))
                                                  for lambda_0 < lambda < lambda_e (the transition)
    rho = J(lambda) = sigma_J / Fy                for lambda >= lambda_e (the Johnson curve, as before)
with lambda_e = max(1, lambda_0 + 0.2) (sigma_cr = Fy for every limit up to 0.8) and J(lambda) =
sigma_J / Fy. The transition is a straight line in lambda from 1 at the plateau limit to the Johnson
value at lambda_e (or the Johnson curve where that is higher, so that rho is never below its value
without a plateau), so rho is continuous (no jump at lambda_0 nor at lambda_e) and never rises with
lambda. For an internal wall
in uniform compression (lambda_0 = 0.673) the line falls at 0.76 per unit lambda, the initial slope
of EN 1993-1-5's own curve (lambda - 0.22) / lambda^2, and stays below that curve up to lambda = 1.

Reduced allowable (lateral-torsional, local and web shear buckling):
    F_red = min(F, F rho, sigma_cr / SF)      (with a yield strength)
    F_red = min(F, sigma_cr / SF)             (without: no slenderness, no plateau)
with F the user's allowable for that stress and SF the buckling safety factor. The middle term
scales the user's allowable down the curve, so a member that cannot buckle keeps its full allowable
(sigma_cr -> infinity gives F), and the last term keeps the stated safety factor against elastic
buckling (it applies on the plateau too: the safe side).
"""

from __future__ import annotations

from typing import Any

import numpy as np

PLATEAU_OUTSTAND = 0.748  # EN 1993-1-5 4.4(2), outstand compression elements (from memory)
PLATEAU_INTERNAL_UNIFORM = 0.673  # EN 1993-1-5 4.4(2), internal elements, psi = 1 (from memory)
PLATEAU_LATERAL = 0.2  # EN 1993-1-1 6.3.2.2, lambda_LT,0 of the general case (from memory; 0.4 for rolled shapes in 6.3.2.3)
PLATEAU_SHEAR = 0.83  # EN 1993-1-5 5.3 Table 5.1, chi_w = 1 for lambda_w < 0.83 / eta, taken with eta = 1 (from memory)
TRANSITION_END = 1.0  # lambda_e at least this: the Johnson curve unchanged wherever sigma_cr <= Fy
TRANSITION_LEAST = 0.2  # lambda_e at least lambda_0 + this
PLATEAU_WORDS = {
    "local": "λ_p = √(Fy / σ_cr) up to 0.5 + √(0.085 - 0.055·ψ) for internal walls (0.673 under uniform compression) and 0.748 for outstands (EN 1993-1-5 4.4(2))",
    "lateral-torsional": f"λ_LT = √(Fy / σ_cr) up to {PLATEAU_LATERAL:g} (EN 1993-1-1 6.3.2.2, the general case)",
    "shear": f"λ_w = √(Fy / (√3 τ_cr)) up to {PLATEAU_SHEAR:g} (EN 1993-1-5 5.3, Table 5.1 with η = 1)",
}
TRANSITION_WORDS = ("above a limit λ_0 the allowable follows a straight line in λ from no reduction down to the Johnson parabola's value "
                    "at λ_e = max(1, λ_0 + 0.2) (or the parabola where higher), and the parabola beyond, so that it has no jump")


def internal_plateau(psi: Any) -> Any:
    """lambda_0 of an internal wall, 0.5 + sqrt(0.085 - 0.055 psi) (EN 1993-1-5 4.4(2), from memory);
    psi = sigma2 / sigma1 (compression positive), clamped to -3 <= psi <= 1 where the formula holds
    (0.673 at psi = 1, 1.0 at psi = -3; the clamp at -3 keeps the lower limit, the safe side)."""
    psi = np.clip(np.asarray(psi, dtype=float), -3.0, 1.0)
    return 0.5 + np.sqrt(0.085 - 0.055 * psi)


def johnson(sigma_cr: Any, yield_strength: float | None) -> Any:
    """sigma_J (Pa) from the elastic critical stress sigma_cr (Pa), elementwise; inf stays inf."""
    sigma = np.asarray(sigma_cr, dtype=float)
    if not yield_strength:
        return sigma
    fy = float(yield_strength)
    with np.errstate(divide="ignore", invalid="ignore"):
        inelastic = fy * (1.0 - fy / (4.0 * sigma))
    return np.where(sigma <= fy / 2.0, sigma, np.where(np.isinf(sigma), fy, inelastic))


def slenderness(sigma_cr: Any, yield_strength: float) -> Any:
    """lambda = sqrt(Fy / sigma_cr), elementwise (0 where sigma_cr is infinite)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.sqrt(float(yield_strength) / np.asarray(sigma_cr, dtype=float))


def reduction_factor(sigma_cr: Any, yield_strength: float, plateau: Any) -> Any:
    """rho of the module docstring, elementwise (sigma_cr and Fy in Pa; plateau lambda_0 broadcasts)."""
    lam = slenderness(sigma_cr, yield_strength)
    lam0 = np.asarray(plateau, dtype=float)
    end = np.maximum(TRANSITION_END, lam0 + TRANSITION_LEAST)
    curve = johnson(sigma_cr, yield_strength) / float(yield_strength)
    at_end = np.where(end * end <= 2.0, 1.0 - end * end / 4.0, 1.0 / (end * end))  # J(lambda_e)
    line = 1.0 - (1.0 - at_end) * (lam - lam0) / (end - lam0)
    return np.where(lam <= lam0, 1.0, np.where(lam < end, np.maximum(line, curve), curve))


def reduced_allowable(allowable: Any, sigma_cr: Any, yield_strength: float | None, safety_factor: float, plateau: Any) -> Any:
    """F_red (Pa) of the module docstring, elementwise."""
    allowable = np.asarray(allowable, dtype=float)
    sigma = np.asarray(sigma_cr, dtype=float)
    reduced = np.minimum(allowable, sigma / safety_factor)
    if yield_strength:
        reduced = np.minimum(reduced, allowable * reduction_factor(sigma, yield_strength, plateau))
    return reduced


def governing_term(allowable: float, critical: float, yield_strength: float | None, safety_factor: float, plateau: float) -> str:
    """Which term of F_red = min(F, F rho, sigma_cr / SF) governs, in words ("not reduced" also on the
    plateau, where F rho = F)."""
    terms = {"not reduced": allowable, "sigma_cr / SF": critical / safety_factor}
    if yield_strength and float(slenderness(critical, yield_strength)) > plateau:
        terms["Johnson with plateau"] = allowable * float(reduction_factor(critical, yield_strength, plateau))
    return min(terms, key=terms.__getitem__)
