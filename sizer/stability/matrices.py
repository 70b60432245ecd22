"""The stability solver's matrices: dense numpy arrays for small meshes, scipy.sparse (CSR) ones for
large meshes: the refined meshes of the convergence check (a banded shift-invert solve is much
faster than a dense one there) and members with many restraints (a node at each: thousands of
freedoms whose dense matrices would take gigabytes). scipy is imported only then.

Where a mesh turns sparse depends on what its member keeps: each load-case column's geometric
matrices are made once and kept (for every section's solves, and a patterned member's branch and
bound keeps each switch's), so a member with many load-case columns (a patterned one: a column per
span and patterned case) keeps many matrices, and its meshes turn sparse sooner (dense_limit).
"""

from __future__ import annotations

from typing import Any

import numpy as np

DENSE_MOST = 600  # freedoms: a mesh larger than this is sparse whatever its member
DENSE_LEAST = 300  # ... and one of at most this many is dense
DENSE_BYTES = 12e6  # in between, a mesh is dense while one dense matrix per load-case column fits in this (bytes)
# Measured (2 cores): a member of 4 columns (3 load cases and the self-weight) stays dense to 600 freedoms, which saves
# scipy's import (some 0.1 s) on the refined meshes of the convergence check; a ten-span purlin with two patterned cases
# (22 columns) kept some 900 dense per-switch matrices of 300-600 freedoms at a fixed limit of 600: 81 s and 2.7 GB
# against 1.6 s and 150 MB with its meshes above 300 freedoms sparse, which this limit keeps.


def dense_limit(columns: int) -> int:
    """The most freedoms of a mesh with dense matrices, for a member of `columns` load-case columns
    (its load cases and the self-weight): one (n, n) float matrix per column within DENSE_BYTES,
    and within DENSE_LEAST..DENSE_MOST."""
    fits = int(np.sqrt(DENSE_BYTES / (8.0 * max(columns, 1))))
    return min(max(fits, DENSE_LEAST), DENSE_MOST)


def assemble(shape: tuple[int, int], rows: np.ndarray, columns: np.ndarray, values: np.ndarray, sparse: bool) -> Any:
    """The matrix with `values` summed at (`rows`, `columns`): scipy.sparse (CSR) when `sparse`."""
    rows, columns, values = np.ravel(rows), np.ravel(columns), np.ravel(values)
    if sparse:
        from scipy.sparse import coo_matrix

        return coo_matrix((values, (rows, columns)), shape=shape).tocsr()
    flat = np.asarray(rows, dtype=np.intp) * shape[1] + columns  # summed in the order given, as np.add.at does, and faster
    return np.bincount(flat, weights=values, minlength=shape[0] * shape[1]).astype(float, copy=False).reshape(shape)


def diagonal(values: np.ndarray, sparse: bool) -> Any:
    """The diagonal matrix of `values`."""
    index = np.arange(len(values))
    return assemble((len(values), len(values)), index, index, values, sparse)


def largest_entry(matrix: Any) -> float:
    """The largest |entry| of a dense or sparse matrix (0 when empty)."""
    if hasattr(matrix, "tocsr"):
        return float(abs(matrix).max()) if matrix.nnz else 0.0
    return float(np.abs(matrix).max(initial=0.0))


def as_matrix(value: Any, size: int, sparse: bool) -> Any:
    """A weighted sum that may be the number 0 (no terms) as a (size, size) matrix."""
    if isinstance(value, (int, float)):
        return assemble((size, size), np.zeros(0, int), np.zeros(0, int), np.zeros(0), sparse)
    return value
