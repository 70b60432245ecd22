"""The stability solver's matrices: dense numpy arrays for small meshes, scipy.sparse (CSR) ones for
meshes of more than SPARSE_FROM freedoms: the refined meshes of the convergence check (a banded
shift-invert solve is much faster than a dense one there) and members with many restraints (a node
at each: thousands of freedoms whose dense matrices would take gigabytes). scipy is imported only
then.
"""

from __future__ import annotations

from typing import Any

import numpy as np

SPARSE_FROM = 300  # freedoms: above this the matrices are sparse and the eigen-solve iterative (scipy's import, some 0.2 s,
# then). 600 saved that import on the demo's refined meshes but a ten-span patterned purlin kept some 900 dense
# per-switch matrices of 300-600 freedoms: 81 s and 2.7 GB against 2.8 s and 157 MB at 300


def is_sparse(size: int) -> bool:
    """True when a mesh of `size` freedoms gets sparse matrices."""
    return size > SPARSE_FROM


def assemble(shape: tuple[int, int], rows: np.ndarray, columns: np.ndarray, values: np.ndarray) -> Any:
    """The matrix with `values` summed at (`rows`, `columns`): sparse when shape[0] is large."""
    rows, columns, values = np.ravel(rows), np.ravel(columns), np.ravel(values)
    if is_sparse(shape[0]):
        from scipy.sparse import coo_matrix

        return coo_matrix((values, (rows, columns)), shape=shape).tocsr()
    flat = np.asarray(rows, dtype=np.intp) * shape[1] + columns  # summed in the order given, as np.add.at does, and faster
    return np.bincount(flat, weights=values, minlength=shape[0] * shape[1]).astype(float, copy=False).reshape(shape)


def diagonal(values: np.ndarray) -> Any:
    """The diagonal matrix of `values`."""
    index = np.arange(len(values))
    return assemble((len(values), len(values)), index, index, values)


def largest_entry(matrix: Any) -> float:
    """The largest |entry| of a dense or sparse matrix (0 when empty)."""
    if hasattr(matrix, "tocsr"):
        return float(abs(matrix).max()) if matrix.nnz else 0.0
    return float(np.abs(matrix).max(initial=0.0))


def as_matrix(value: Any, size: int) -> Any:
    """A weighted sum that may be the number 0 (no terms) as a (size, size) matrix."""
    if isinstance(value, (int, float)):
        return assemble((size, size), np.zeros(0, int), np.zeros(0, int), np.zeros(0))
    return value
