"""The eigen-solve: the lowest positive load factor lam with (K + lam G) d = 0 on the freedoms the
supports and restraints leave free, and its buckled shape.

With B = -G this is K d = lam B d. K is positive definite on the admissible freedoms (when nothing
is free to move), B is indefinite, so the solve is scipy's symmetric generalized eigen-solver on
B d = mu K d: the largest mu > 0 gives lam = 1 / mu (no mu > 0: the loading cannot buckle the
member, lam = infinity). Freedoms that no geometric term touches are condensed out exactly first.
A member free to move in a way the loading drives (a mechanism of the buckling fields, such as a
beam whose twist nothing holds) has lam = 0.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

ZERO_GEOMETRY = 1e-13  # |B| entries below this fraction of the largest count as zero
ZERO_STIFFNESS = 1e-10  # eigenvalues of the scaled K below this are free movements
NO_BUCKLING = 1e-12  # mu below this fraction of the largest |B| eigenvalue scale: no buckling


@dataclass(frozen=True)
class Buckling:
    """The lowest positive load factor (math.inf when the loading cannot buckle the member; 0 when
    the member is free to move under it) and the buckled shape on every freedom (None without one),
    scaled so that its largest |value| is 1."""

    load_factor: float
    mode: np.ndarray | None
    free_movement: bool = False


def lowest_buckling(K: np.ndarray, B: np.ndarray, basis: np.ndarray) -> Buckling:
    """Solve K d = lam B d on the admissible freedoms d = basis @ r (see the module docstring)."""
    from scipy.linalg import eigh

    k = basis.T @ K @ basis
    b = basis.T @ B @ basis
    diagonal = np.diag(k).copy()
    diagonal[diagonal <= 0] = 1.0
    scale = 1.0 / np.sqrt(diagonal)
    k, b = k * np.outer(scale, scale), b * np.outer(scale, scale)
    size = np.abs(b).max(initial=0.0)
    if size == 0.0:
        return Buckling(math.inf, None)
    active = np.abs(b).max(axis=1) > ZERO_GEOMETRY * size
    passive = ~active
    free = _free_movements(k)
    if free is not None:
        driven = np.abs(free.T @ b @ free).max(initial=0.0) > ZERO_GEOMETRY * size or np.abs(b @ free).max(initial=0.0) > 1e-8 * size
        if driven:
            return Buckling(0.0, _full(basis, scale, free[:, 0]), free_movement=True)
        keep = _complement(free)
        reduced = lowest_buckling(k, b, keep)
        return reduced if reduced.mode is None else Buckling(reduced.load_factor, _full(basis, scale, reduced.mode), reduced.free_movement)
    kaa = k[np.ix_(active, active)]
    if passive.any():
        kap = k[np.ix_(active, passive)]
        if np.abs(kap).max(initial=0.0) > 0.0:
            coupling = np.linalg.solve(k[np.ix_(passive, passive)], kap.T)
            kaa = kaa - kap @ coupling
        else:
            coupling = np.zeros((int(passive.sum()), int(active.sum())))
    baa = b[np.ix_(active, active)]
    n = kaa.shape[0]
    mu, vector = eigh(baa, kaa, subset_by_index=[n - 1, n - 1], check_finite=False)
    if mu[0] <= NO_BUCKLING * np.abs(baa).max():
        return Buckling(math.inf, None)
    reduced = np.zeros(k.shape[0])
    reduced[active] = vector[:, 0]
    if passive.any():
        reduced[passive] = -coupling @ vector[:, 0]
    return Buckling(1.0 / float(mu[0]), _full(basis, scale, reduced))


def _free_movements(k: np.ndarray) -> np.ndarray | None:
    """(n, r) orthonormal free movements of a (diagonally scaled) stiffness, its null space; None
    when there is none (the usual case, settled by a Cholesky factorization)."""
    try:
        np.linalg.cholesky(k)
        return None
    except np.linalg.LinAlgError:
        values, vectors = np.linalg.eigh(k)
    free = vectors[:, values < ZERO_STIFFNESS * max(1.0, values.max(initial=0.0))]
    return free if free.shape[1] else None


def _complement(free: np.ndarray) -> np.ndarray:
    """(n, n - r) orthonormal basis of the complement of the columns of `free`."""
    q, _ = np.linalg.qr(free, mode="complete")
    return q[:, free.shape[1]:]


def _full(basis: np.ndarray, scale: np.ndarray, reduced: np.ndarray) -> np.ndarray:
    """A reduced vector back on every freedom, largest |value| 1."""
    full = basis @ (scale * reduced)
    peak = np.abs(full).max(initial=0.0)
    return full / peak if peak > 0 else full
