"""Upper bounds on the lowest buckling load factor of many sections at once (Rayleigh-Ritz).

For any shape d that the supports and restraints allow, with d^T B d > 0, the Rayleigh quotient
d^T K d / d^T B d is at least the lowest positive load factor (K positive definite, B = -G
indefinite: the lowest positive lam is the minimum of the quotient over the allowed shapes).
The minimum over a few trial shapes D (n x k) is the largest eigenvalue problem of the k x k
matrices D^T K D and D^T B D: a closer bound, still an upper bound.

K and B depend on a section only through a few scalars (rigidities, shear-centre offsets, Wagner
coefficients, face heights, mass per length), so D^T K D and D^T B D are weighted sums of fixed
k x k matrices, and the bound of every section is one small batched eigen-solve. The trial shapes
must be allowed for every section: buckled shapes of some sections, projected onto the shapes that
the strictest form of the constraints allows (warping held wherever a support holds it; a lateral
restraint at a face holding both the sideways movement and the twist there: strict_rows).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sizer.stability.boundary import restraint_rows, warping_rows
from sizer.stability.problem import MemberStability
from sizer.stability.section import StabilitySection
from sizer.stability.terms import Coefficient, elastic_coefficients

def strict_rows(model: MemberStability) -> list[dict[int, float]]:
    """Constraint rows allowed for every section: the supports, every warping hold, and for a
    lateral restraint at a face both its sideways movement and its twist held."""
    from dataclasses import replace

    member = model.member
    faced = tuple(replace(r, twist=True, height="centre") if r.lateral and isinstance(r.height, str) and r.height != "centre" else r
                  for r in member.restraints)
    strict = replace(member, restraints=faced)
    return model.supports + warping_rows(member, model.mesh) + restraint_rows(strict, model.mesh, None)


@dataclass(frozen=True)
class Projection:
    """The section-independent matrices of a Rayleigh-Ritz bound, over trial shapes D (n, k): D^T M D
    of every elastic term (by rigidity), of the springs, and of every geometric term of the loads and
    per kg/m of self-weight (by the name of the section scalar that weights it)."""

    elastic: dict[str, np.ndarray]
    springs: np.ndarray
    loads: dict[str, np.ndarray]
    per_mass: dict[str, np.ndarray]


def projected_elastic(model: MemberStability, trial: np.ndarray) -> dict[str, np.ndarray]:
    """D^T M D of every elastic term matrix M over orthonormal trial shapes D (n, k)."""
    return {name: trial.T @ matrix @ trial for name, matrix in model.elastic.items()}


def projected(trial: np.ndarray, terms: dict[str, np.ndarray], name: str) -> np.ndarray:
    """D^T M D of the term matrix `name` of `terms` over trial shapes D (n, k); zeros where it is absent."""
    return trial.T @ terms[name] @ trial if name in terms else np.zeros((trial.shape[1],) * 2)


def assemble(projection: Projection, sections: StabilitySection, masses: np.ndarray,
             coefficients: dict[str, Coefficient]) -> tuple[np.ndarray, np.ndarray]:
    """(S, k, k) stiffness D^T K D and geometry D^T B D of each section (arrays of S values), with
    B = -sum coefficient x (G_loads + mass x G_per_mass)."""
    count = len(np.atleast_1d(masses))

    def weighted(values: object, matrix: np.ndarray) -> np.ndarray:
        return np.multiply.outer(np.broadcast_to(np.asarray(values, float), (count,)), matrix)

    stiffness = projection.springs + np.zeros((count, 1, 1))
    for name, value in elastic_coefficients(sections).items():
        stiffness = stiffness + weighted(value, projection.elastic[name])
    geometric = np.zeros_like(stiffness)
    for name in projection.loads:
        weight = np.broadcast_to(np.asarray(coefficients[name], float), (count,))
        geometric -= weighted(weight, projection.loads[name]) + weighted(weight * masses, projection.per_mass[name])
    return stiffness, geometric


def orthonormal(shapes: np.ndarray) -> np.ndarray:
    """An orthonormal basis of the columns' span (nearly dependent columns dropped)."""
    q, r = np.linalg.qr(shapes)
    keep = np.abs(np.diag(r)) > 1e-8 * np.abs(np.diag(r)).max()
    return q[:, keep]


def largest_inverse(stiffness: np.ndarray, geometric: np.ndarray) -> np.ndarray:
    """(S,) 1 / the largest mu of geometric r = mu stiffness r per section (inf where mu <= 0, and
    where no trial shape is left: shapes that the strictest constraints hold entirely are dropped)."""
    if stiffness.shape[-1] == 0:
        return np.full(stiffness.shape[0], np.inf)
    try:
        lower = np.linalg.cholesky(stiffness)
    except np.linalg.LinAlgError:
        return np.full(stiffness.shape[0], np.inf)
    half = np.linalg.solve(lower, geometric)
    reduced = np.linalg.solve(lower, np.swapaxes(half, 1, 2))
    mu = np.linalg.eigvalsh((reduced + np.swapaxes(reduced, 1, 2)) / 2)[:, -1]
    scale = np.abs(reduced).max(axis=(1, 2))
    with np.errstate(divide="ignore"):
        return np.where(mu > 1e-12 * scale, 1.0 / mu, np.inf)
