"""The eigen-solve: the lowest positive load factor lam with (K + lam G) d = 0 on the freedoms the
supports and restraints leave free, and its buckled shape.

With B = -G this is K d = lam B d. K is positive definite on the admissible freedoms (when nothing
is free to move), B is indefinite, so the solve is the symmetric generalized eigenproblem
B d = mu K d, reduced to standard form with the Cholesky factor K = L L^T (C = L^-1 B L^-T, numpy's
symmetric eigen-solver; scipy.linalg would cost its 0.2 s import on every command): the largest
mu > 0 gives lam = 1 / mu (no mu > 0: the loading cannot buckle the member, lam = infinity). Freedoms that no geometric term touches are condensed out exactly first.
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
    return lowest_modes(K, B, basis, 1)[0]


def lowest_modes(K: np.ndarray, B: np.ndarray, basis: np.ndarray, count: int) -> list[Buckling]:
    """The `count` lowest positive load factors and their shapes (fewer where fewer exist; one
    Buckling(inf, None) when none does)."""
    k = basis.T @ K @ basis
    b = basis.T @ B @ basis
    diagonal = np.diag(k).copy()
    diagonal[diagonal <= 0] = 1.0
    scale = 1.0 / np.sqrt(diagonal)
    k, b = k * np.outer(scale, scale), b * np.outer(scale, scale)
    size = np.abs(b).max(initial=0.0)
    if size == 0.0:
        return [Buckling(math.inf, None)]
    free = _free_movements(k)
    if free is not None:
        driven = np.abs(free.T @ b @ free).max(initial=0.0) > ZERO_GEOMETRY * size or np.abs(b @ free).max(initial=0.0) > 1e-8 * size
        if driven:
            return [Buckling(0.0, _full(basis, scale, free[:, 0]), free_movement=True)]
        found = lowest_modes(k, b, _complement(free), count)
        return [item if item.mode is None else Buckling(item.load_factor, _full(basis, scale, item.mode)) for item in found]
    active = np.abs(b).max(axis=1) > ZERO_GEOMETRY * size
    passive = ~active
    kaa = k[np.ix_(active, active)]
    coupling = np.zeros((int(passive.sum()), int(active.sum())))
    if passive.any():
        kap = k[np.ix_(active, passive)]
        if np.abs(kap).max(initial=0.0) > 0.0:
            coupling = np.linalg.solve(k[np.ix_(passive, passive)], kap.T)
            kaa = kaa - kap @ coupling
    baa = b[np.ix_(active, active)]
    mu, vectors = generalized_eigh(baa, kaa)
    mu, vectors = mu[-min(count, len(mu)):], vectors[:, -min(count, len(mu)):]
    threshold = NO_BUCKLING * np.abs(baa).max()
    found = []
    for value, vector in zip(mu[::-1], vectors.T[::-1]):
        if value <= threshold:
            break
        reduced = np.zeros(k.shape[0])
        reduced[active] = vector
        reduced[passive] = -coupling @ vector
        found.append(Buckling(1.0 / float(value), _full(basis, scale, reduced)))
    return found or [Buckling(math.inf, None)]


def generalized_eigh(b: np.ndarray, k: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Eigenvalues (ascending) and eigenvectors of b x = mu k x, k symmetric positive definite,
    with the eigenvectors k-orthonormal."""
    inverse = np.linalg.inv(np.linalg.cholesky(k))
    standard = inverse @ b @ inverse.T
    mu, vectors = np.linalg.eigh((standard + standard.T) / 2)
    return mu, inverse.T @ vectors


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
