"""The eigen-solve: the lowest positive load factor lam with (K + lam G) d = 0 on the freedoms the
supports and restraints leave free, and its buckled shape.

With B = -G this is K d = lam B d. K is positive definite on the admissible freedoms (when nothing
is free to move), B is indefinite, so the solve is the symmetric generalized eigenproblem
B d = mu K d, reduced to standard form with the Cholesky factor K = L L^T (C = L^-1 B L^-T, numpy's
symmetric eigen-solver, the shape by inverse iteration; scipy.linalg would cost its 0.2 s import on every command): the largest
mu > 0 gives lam = 1 / mu (no mu > 0: the loading cannot buckle the member, lam = infinity). Freedoms that no geometric term touches are condensed out exactly first.
A member free to move in a way the loading drives (a mechanism of the buckling fields, such as a
beam whose twist nothing holds) has lam = 0.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np

ZERO_GEOMETRY = 1e-13  # |B| entries below this fraction of the largest count as zero
ZERO_STIFFNESS = 1e-10  # eigenvalues of the scaled K below this are free movements
NO_BUCKLING = 1e-12  # mu below this fraction of the largest |B| eigenvalue scale: no buckling
BRACKET = 1.25  # the sparse solve's bracket of the lowest load factor is closed to this ratio before iterating
NO_LOAD_FACTOR = 1e15  # the sparse solve looks for load factors up to this (above: no buckling)
HINT_ABOVE = 1e-9  # the sparse solve's first bracket: from the hint times (1 - HINT_BELOW) to the hint times (1 + HINT_ABOVE)
HINT_BELOW = 1e-2
INVERSE_SHIFT = 1e-9  # inverse iteration's shift above the largest eigenvalue, as a fraction of the largest |eigenvalue|
NEAR_SHIFT = 1e-6  # the dense solve near a hint: its first shift, the hint times (1 + NEAR_SHIFT), above the load factor sought
NEAR_STEPS = 8  # ... at most this many steps
NEAR_BAND = 0.5  # ... each step's shift the last Rayleigh quotient where that lies within this (relative) of the hint, else the first
NEAR_SETTLED = 1e-10  # ... stopped when the Rayleigh quotient changes by at most this (relative; it settles to some 1e-12 in two or three)
CERTIFIED = 1e-7  # ... the load factor taken where K - lam (1 - CERTIFIED) B is positive definite: no lower one lies more than this below


@dataclass(frozen=True)
class Buckling:
    """The lowest positive load factor (math.inf when the loading cannot buckle the member; 0 when
    the member is free to move under it) and the buckled shape on every freedom (None without one),
    scaled so that its largest |value| is 1."""

    load_factor: float
    mode: np.ndarray | None
    free_movement: bool = False


class Congruence:
    """P^T A P for a basis P (n, k) whose columns are mostly unit vectors (a free freedom each) and a
    few short ones (the freedoms a support or restraint ties together): the unit columns pick rows
    and columns of A, the others act through their few rows, so the cost is about n k, not n^2 k."""

    def __init__(self, basis: np.ndarray) -> None:
        nonzero = basis != 0
        unit = (nonzero.sum(axis=0) == 1) & np.isclose(np.abs(basis).max(axis=0, initial=0.0), 1.0, rtol=0.0, atol=1e-15)
        self.unit_columns = np.flatnonzero(unit)
        self.unit_rows = np.argmax(nonzero[:, unit], axis=0)
        self.unit_signs = basis[self.unit_rows, self.unit_columns]
        self.other_columns = np.flatnonzero(~unit)
        self.touched = np.flatnonzero(nonzero[:, ~unit].any(axis=1))
        self.block = basis[np.ix_(self.touched, self.other_columns)]
        self.shape = basis.shape

    def of(self, A: np.ndarray) -> np.ndarray:
        """P^T A P (k, k), block by block (unit columns u, other columns o)."""
        u, o, rows, touched, block = self.unit_columns, self.other_columns, self.unit_rows, self.touched, self.block
        signs = self.unit_signs
        out = np.empty((self.shape[1],) * 2)
        out[np.ix_(u, u)] = A[np.ix_(rows, rows)] * np.outer(signs, signs)
        if len(o):
            out[np.ix_(u, o)] = (A[np.ix_(rows, touched)] @ block) * signs[:, None]
            out[np.ix_(o, u)] = (block.T @ A[np.ix_(touched, rows)]) * signs[None, :]
            out[np.ix_(o, o)] = block.T @ A[np.ix_(touched, touched)] @ block
        return out


class Reduced:
    """K on the admissible freedoms, diagonally scaled, with what does not depend on B made once: its
    free movements, and for each set of freedoms that B touches the exact condensation of the others
    and the inverse Cholesky factor (one section's solves under many load sets share them)."""

    def __init__(self, K: np.ndarray, basis: np.ndarray) -> None:
        self.basis = basis
        self._congruence = Congruence(basis)
        k = self._congruence.of(K)
        diagonal = np.diag(k).copy()
        diagonal[diagonal <= 0] = 1.0
        self.scale = 1.0 / np.sqrt(diagonal)
        self.k = k * np.outer(self.scale, self.scale)
        self.free = _free_movements(self.k)
        self._condensations: dict[bytes, tuple[np.ndarray, np.ndarray]] = {}
        self._factors: dict[bytes, tuple[np.ndarray, np.ndarray]] = {}

    def project(self, B: np.ndarray) -> np.ndarray:
        """B on the admissible freedoms, scaled as K is (the solves are linear in it)."""
        return self._congruence.of(B) * np.outer(self.scale, self.scale)

    def modes(self, B: np.ndarray, count: int, hint: float = math.inf) -> list[Buckling]:
        """The `count` lowest positive load factors of K d = lam B d and their shapes; `hint`: a load
        factor at or just above the lowest (a coarser mesh's, whose shapes this mesh holds), where known."""
        return self.projected_modes(self.project(B), count, hint)

    def projected_modes(self, b: np.ndarray, count: int, hint: float = math.inf) -> list[Buckling]:
        """modes() of a B already projected (Reduced.project): the lowest one near the hint where
        that is proven (near_hint), else from every eigenvalue of the standard form."""
        size = np.abs(b).max(initial=0.0)
        if size == 0.0:
            return [Buckling(math.inf, None)]
        if self.free is not None:
            free = self.free
            driven = np.abs(free.T @ b @ free).max(initial=0.0) > ZERO_GEOMETRY * size or np.abs(b @ free).max(initial=0.0) > 1e-8 * size
            if driven:
                return [Buckling(0.0, self._full(free[:, 0]), free_movement=True)]
            keep = _complement(free)
            found = Reduced(self.k, keep).modes(b, count)
            return [item if item.mode is None else Buckling(item.load_factor, self._full(item.mode)) for item in found]
        if count == 1 and 0.0 < hint < math.inf:
            near = self.near_hint(b, hint)
            if near is not None:
                return [near]
        active = _touched(b, size)
        baa = b[np.ix_(active, active)]
        inverse, coupling = self._factor(active)
        standard = inverse @ baa @ inverse.T
        mu, vectors = largest_eigenpairs((standard + standard.T) / 2, count)
        vectors = inverse.T @ vectors
        threshold = NO_BUCKLING * np.abs(baa).max()
        found = []
        for value, vector in zip(mu, vectors.T):
            if value <= threshold:
                break
            found.append(Buckling(1.0 / float(value), self._on_all(active, coupling, vector)))
        return found or [Buckling(math.inf, None)]

    def near_hint(self, b: np.ndarray, hint: float) -> Buckling | None:
        """The lowest positive load factor of K d = lam B d (B projected, not zero; K without free
        movements) found near `hint`, or None where it is not proven so; on the freedoms B touches,
        K condensed onto them exactly, as in the full solve. Rayleigh quotient iteration (each step
        one solve of (K - shift B) x = B x, the shift the last Rayleigh quotient d^T K d / d^T B d
        once that lies near the hint, the hint times 1 + NEAR_SHIFT before: inverse iteration, which
        draws the shape towards the modes nearest the hint first) converges to a load factor near it. The
        Rayleigh quotient lam of any shape with d^T B d > 0 is at or above the lowest load factor (K
        positive definite), and where K - lam (1 - CERTIFIED) B is positive definite (a Cholesky
        factorization) no load factor lies in (0, lam (1 - CERTIFIED)] (Sylvester's law of
        inertia): lam is then the lowest, to within CERTIFIED above it. Some three solves and one
        factorization, against K's inverse Cholesky factor and a full eigen-solve of the standard form."""
        active = _touched(b, np.abs(b).max())
        k, coupling = self._condensed(active)
        b = b[np.ix_(active, active)]
        shape = _start_vector(len(k))
        shift, value = hint * (1.0 + NEAR_SHIFT), math.nan
        for _ in range(NEAR_STEPS):
            try:
                shape = np.linalg.solve(k - shift * b, b @ shape)
            except np.linalg.LinAlgError:  # exactly singular at the shift: left to the full solve
                return None
            shape /= np.linalg.norm(shape)
            work = float(shape @ b @ shape)
            quotient = float(shape @ k @ shape) / work if work > 0.0 else math.inf
            settled = abs(quotient - value) <= NEAR_SETTLED * quotient
            value = quotient
            if settled:
                break
            if abs(quotient - hint) <= NEAR_BAND * hint:  # the shape is near the mode sought: its quotient the next shift
                shift = quotient
        if not (math.isfinite(value) and value > 0.0) or not _positive_definite(k - value * (1.0 - CERTIFIED) * b):
            return None
        return Buckling(value, self._on_all(active, coupling, shape))

    def standard_forms(self, matrices: list[np.ndarray]) -> list[np.ndarray] | None:
        """Each B (already projected) in standard form C = L^-1 B L^-T on the freedoms any of them
        touches (K condensed onto those exactly), so that the largest eigenvalue of a sum of them is
        1 / the load factor of the summed load set; None when K has free movements."""
        if self.free is not None:
            return None
        size = max((np.abs(b).max(initial=0.0) for b in matrices), default=0.0)
        if size == 0.0:
            return [np.zeros((0, 0)) for _ in matrices]
        active = np.zeros(self.k.shape[0], bool)
        for b in matrices:
            active |= _touched(b, size)
        inverse, _ = self._factor(active)
        forms = []
        for b in matrices:
            c = inverse @ b[np.ix_(active, active)] @ inverse.T
            forms.append((c + c.T) / 2)
        return forms

    def _condensed(self, active: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """For the freedoms `active` that B touches: K condensed onto them (exact: the others carry no
        geometric term) and the condensation (others = -coupling @ active)."""
        key = active.tobytes()
        if key not in self._condensations:
            k, passive = self.k, ~active
            kaa = k[np.ix_(active, active)]
            coupling = np.zeros((int(passive.sum()), int(active.sum())))
            if passive.any():
                kap = k[np.ix_(active, passive)]
                if np.abs(kap).max(initial=0.0) > 0.0:
                    coupling = np.linalg.solve(k[np.ix_(passive, passive)], kap.T)
                    kaa = kaa - kap @ coupling
            self._condensations[key] = (kaa, coupling)
        return self._condensations[key]

    def _factor(self, active: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """For the freedoms `active` that B touches: the inverse Cholesky factor of K condensed onto
        them and the condensation (see _condensed)."""
        key = active.tobytes()
        if key not in self._factors:
            kaa, coupling = self._condensed(active)
            self._factors[key] = (np.linalg.inv(np.linalg.cholesky(kaa)), coupling)
        return self._factors[key]

    def _on_all(self, active: np.ndarray, coupling: np.ndarray, vector: np.ndarray) -> np.ndarray:
        """A shape on the freedoms `active` (and the others by the condensation) on every freedom."""
        reduced = np.zeros(self.k.shape[0])
        reduced[active] = vector
        reduced[~active] = -coupling @ vector
        return self._full(reduced)

    def _full(self, reduced: np.ndarray) -> np.ndarray:
        return _full(self.basis, self.scale, reduced)


def reduced(K: Any, basis: Any) -> Any:
    """The solver of K d = lam B d on the admissible freedoms: Reduced for dense matrices,
    SparseReduced for sparse ones (sizer.stability.matrices)."""
    return SparseReduced(K, basis) if hasattr(K, "tocsr") else Reduced(K, basis)


class SparseReduced:
    """Reduced for sparse matrices (thousands of freedoms): K on the admissible freedoms, diagonally
    scaled, factorized once (sparse LU); each B solved by Lanczos iteration (scipy's eigsh, ARPACK)
    for the largest mu of B d = mu K d, with K's factors as the inverse. Where K is singular on the
    admissible freedoms (a free movement: rare with the many restraints that make a mesh this
    large) the dense Reduced decides instead."""

    def __init__(self, K: Any, basis: Any) -> None:
        from scipy.sparse import diags
        from scipy.sparse.linalg import splu

        self.basis = basis.tocsr()
        k = (self.basis.T @ K @ self.basis).tocsc()
        diagonal = k.diagonal().copy()
        diagonal[diagonal <= 0] = 1.0
        self.scale = 1.0 / np.sqrt(diagonal)
        self._scaling = diags(self.scale)
        self.k = (self._scaling @ k @ self._scaling).tocsc()
        self.dense: Reduced | None = None
        try:
            self.factors = splu(self.k)
            pivots = np.abs(self.factors.U.diagonal())
            singular = pivots.min(initial=np.inf) <= ZERO_STIFFNESS * max(1.0, pivots.max(initial=0.0))
        except RuntimeError:  # exactly singular
            singular = True
        if singular:
            self.dense = Reduced(self.k.toarray(), np.eye(self.k.shape[0]))
        self.offset = 0 if singular else _negative_pivots(self.k)[1]  # K's own (round-off on very fine meshes), not counted

    def project(self, B: Any) -> Any:
        """B on the admissible freedoms, scaled as K is."""
        return (self._scaling @ (self.basis.T @ B @ self.basis) @ self._scaling).tocsr()

    def modes(self, B: Any, count: int, hint: float = math.inf) -> list[Buckling]:
        return self.projected_modes(self.project(B), count, hint)

    def projected_modes(self, b: Any, count: int, hint: float = math.inf) -> list[Buckling]:
        """modes() of a B already projected: the lowest positive load factor bracketed by the inertia
        of K - sigma B (its negative pivots count the load factors in (0, sigma): Sylvester's law of
        inertia, K positive definite), then found by shift-invert Lanczos iteration about the
        bracket's lower end (scipy's eigsh in buckling mode), where it is the largest transformed
        eigenvalue, well apart from the others. `count` > 1: the others above it follow. `hint`: where
        the bracket search starts (see _bracket; 1 where not finite)."""
        from scipy.sparse.linalg import LinearOperator, eigsh

        size = float(abs(b).max()) if b.nnz else 0.0
        if size == 0.0:
            return [Buckling(math.inf, None)]
        if self.dense is not None:
            found = self.dense.projected_modes(b.toarray(), count)
            return [item if item.mode is None else Buckling(item.load_factor, self._full(item.mode), item.free_movement) for item in found]
        bracket = self._bracket(b, hint)
        if bracket is None:
            return [Buckling(math.inf, None)]
        sigma, factors = bracket
        n = self.k.shape[0]
        inverse = LinearOperator((n, n), matvec=factors.solve, dtype=float)
        values, vectors = eigsh(self.k, k=count, M=b, sigma=sigma, mode="buckling", OPinv=inverse, which="LA", tol=1e-12,
                                v0=_start_vector(n))
        order = np.argsort(values)
        return [Buckling(float(values[i]), self._full(vectors[:, i])) for i in order if values[i] > 0]

    def _bracket(self, b: Any, hint: float) -> tuple[float, Any] | None:
        """(sigma, LU factors of K - sigma B) with no load factor in (0, sigma] and the lowest within
        (sigma, BRACKET sigma]; None when there is none below NO_LOAD_FACTOR (no buckling). Tried
        first: the narrow bracket HINT_BELOW under the hint (a coarser mesh's load factor, which the
        finer one's lies just under), two factorizations; the search below where that fails."""
        hinted = math.isfinite(hint) and hint > 0
        if hinted and self._inertia(b, hint * (1 + HINT_ABOVE))[1]:
            factors, below = self._inertia(b, hint * (1 - HINT_BELOW))
            if not below:
                return hint * (1 - HINT_BELOW), factors
        sigma = hint if hinted else 1.0
        factors, below = self._inertia(b, sigma)
        if below:
            while below:
                high, sigma = sigma, sigma / 2
                factors, below = self._inertia(b, sigma)
                if below and sigma < NO_LOAD_FACTOR**-1:  # buckles under next to no load
                    return sigma, factors
        else:
            high = 2 * sigma
            while not self._inertia(b, high)[1]:
                sigma, high = high, 2 * high
                if high > NO_LOAD_FACTOR:
                    return None
            factors = self._inertia(b, sigma)[0]
        while high > BRACKET * sigma:  # bisect: the closer sigma, the faster the iteration
            middle = math.sqrt(sigma * high)
            middle_factors, below = self._inertia(b, middle)
            if below:
                high = middle
            else:
                sigma, factors = middle, middle_factors
        return sigma, factors

    def _inertia(self, b: Any, sigma: float) -> tuple[Any, int]:
        """LU factors of K - sigma B and the count of its negative pivots beyond K's own (`offset`)."""
        factors, negative = _negative_pivots(self.k - sigma * b)
        return factors, negative - self.offset

    def _full(self, reduced: np.ndarray) -> np.ndarray:
        return _full(self.basis, self.scale, reduced)


def _negative_pivots(matrix: Any) -> tuple[Any, int]:
    """Sparse LU factors of a symmetric matrix with a symmetric ordering and no row exchanges (the
    pivots are those of an LDL^T factorization: their signs give its inertia), and the count of
    negative pivots."""
    from scipy.sparse.linalg import splu

    factors = splu(matrix.tocsc(), permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0, options={"SymmetricMode": True})
    return factors, int(np.sum(factors.U.diagonal() < 0))


def largest_eigenpairs(c: np.ndarray, count: int) -> tuple[np.ndarray, np.ndarray]:
    """The `count` largest eigenvalues of the symmetric `c`, largest first, and their unit vectors (as
    columns). For one: all eigenvalues without vectors (numpy's eigvalsh, about 2.5 times faster
    than eigh), then the vector by inverse iteration with the shift just above the largest value
    (two solves: the error shrinks by (shift gap / spectral gap) per solve); else eigh."""
    if count > 1:
        values, vectors = np.linalg.eigh(c)
        return values[::-1][:count], vectors[:, ::-1][:, :count]
    values = np.linalg.eigvalsh(c)
    top = values[-1]
    shifted = c - (top + INVERSE_SHIFT * max(np.abs(values).max(), np.finfo(float).tiny)) * np.eye(len(c))
    vector = _start_vector(len(c))
    for _ in range(2):
        vector = np.linalg.solve(shifted, vector)
        vector /= np.linalg.norm(vector)
    return values[-1:], vector[:, None]


@lru_cache(maxsize=64)
def _start_vector(size: int) -> np.ndarray:
    """A fixed start for inverse iteration without symmetry (a vector of ones is orthogonal to every
    antisymmetric mode; the sines of multiples of the golden angle have no such pattern, and each
    solve amplifies the wanted mode some 1e8 times over the others), the same in every run
    (read-only: it is shared; numpy.random would cost its import)."""
    vector = np.sin(2.399963229728653 * np.arange(1, size + 1))
    vector.flags.writeable = False
    return vector


def _touched(b: np.ndarray, size: float) -> np.ndarray:
    """The freedoms a geometric matrix B touches: a row with an entry above ZERO_GEOMETRY times `size`
    (the largest |entry| considered)."""
    return np.abs(b).max(axis=1) > ZERO_GEOMETRY * size


def _positive_definite(matrix: np.ndarray) -> bool:
    """Whether the symmetric `matrix` has a Cholesky factor (is positive definite)."""
    try:
        np.linalg.cholesky(matrix)
    except np.linalg.LinAlgError:
        return False
    return True


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
