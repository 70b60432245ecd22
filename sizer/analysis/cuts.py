"""Internal actions at any cut by the method of sections: minus the resultant of every load and
reaction on the left segment [0, x], line loads integrated exactly, moments taken about the cut.
Actions on the +x face of the left segment (N, Vy, Vz, T in N and N*m; My, Mz in N*m):
    N = -sum fx,  Vy = -sum fy,  Vz = -sum fz,  T = -sum mx,
    Mz = -sum mz - sum (a - x) fy,  My = -sum my + sum (a - x) fz.
"""

from __future__ import annotations

import math
from typing import Sequence

import numpy as np
from numpy.typing import ArrayLike

from sizer.analysis.loads import Lines, Points

SIDES: tuple[str, ...] = ("left", "right")


def as_stations(x: ArrayLike, length: float, tol: float) -> np.ndarray:
    """x as a 1-D float array, checked to lie on the member."""
    xs = np.atleast_1d(np.asarray(x, dtype=float)).ravel()
    if xs.size and (not np.all(np.isfinite(xs)) or xs.min() < -tol or xs.max() > length + tol):
        raise ValueError(f"stations must lie on the member, 0 to {length:g} m")
    return xs


def right_side(side: str | ArrayLike, n: int) -> np.ndarray:
    """Bool (n,): True where the value just right of x is wanted. `side`: "left", "right" or an
    array of those, one per station."""
    if isinstance(side, str):
        if side not in SIDES:
            raise ValueError(f"side must be one of {SIDES}, got {side!r}")
        return np.full(n, side == "right")
    sides = np.asarray(side)
    if sides.shape != (n,) or not np.all(np.isin(sides, SIDES)):
        raise ValueError(f"side must be 'left', 'right' or an array of those with one per station ({n})")
    return sides == "right"


def section_actions(sources: Sequence[tuple[Points, Lines] | None], weights: np.ndarray, xs: np.ndarray, right: np.ndarray,
                     tol: float) -> np.ndarray:
    """(C, n, 6) N, Vy, Vz, T, My, Mz on the +x face of the left segment [0, x] for the C load sets
    weights (C, S) @ sources (S sets of concentrated items and line loads; None: nothing).
    Minus the resultant of the items (at a < x, or a <= x where `right`) and line loads on [0, x],
    moments about the cut: Mz = -sum mz - sum (a - x) Fy, My = -sum my + sum (a - x) Fz."""
    n_sets = weights.shape[0]
    used = [(j, src) for j, src in enumerate(sources) if src is not None]
    at = np.concatenate([src[0].at for _, src in used]) if used else np.zeros(0)
    forces = np.concatenate([src[0].forces[:, None, :] * weights[:, j][None, :, None] for j, src in used]) if used else np.zeros((0, n_sets, 6))
    cut = np.where(right[:, None], at[None, :] <= xs[:, None] + tol, at[None, :] < xs[:, None] - tol).astype(float)
    # columns 0-5: sum of F; 6-8: sum of a * F (forces only), over the items left of each cut
    totals = contract(cut, np.concatenate([forces, at[:, None, None] * forces[:, :, :3]], axis=2))  # (n, C, 9)
    lines = [(j, src[1]) for j, src in used if len(src[1].start)]
    if lines:
        start = np.concatenate([ln.start for _, ln in lines])
        end = np.concatenate([ln.end for _, ln in lines])
        q0 = np.concatenate([ln.q0[:, None, :] * weights[:, j][None, :, None] for j, ln in lines])  # (J, C, 4)
        slope = np.concatenate([ln.slope[:, None, :] * weights[:, j][None, :, None] for j, ln in lines])
        u = np.clip(xs[:, None], start[None, :], end[None, :]) - start[None, :]
        lever = start[:, None, None]
        # resultant: u q0 + u^2/2 slope; its first moment about x = 0: u lever q0 + u^2/2 (lever slope + q0) + u^3/3 slope
        powers = np.concatenate([u, u * u / 2, u**3 / 3], axis=1)  # (n, 3J)
        zero = np.zeros_like(q0)
        resultant = np.concatenate([q0, slope, zero])
        moment = np.concatenate([lever * q0, lever * slope + q0, slope])[:, :, :3]
        from_lines = contract(powers, np.concatenate([resultant, moment], axis=2))  # (n, C, 7)
        totals[:, :, :4] += from_lines[:, :, :4]
        totals[:, :, 6:] += from_lines[:, :, 4:]
    sums, first = totals[:, :, :6], totals[:, :, 6:]
    out = np.empty((n_sets, xs.size, 6))
    x = xs[:, None]
    out[:, :, :4] = -sums[:, :, :4].transpose(1, 0, 2)
    out[:, :, 4] = (-sums[:, :, 4] + first[:, :, 2] - x * sums[:, :, 2]).T
    out[:, :, 5] = (-sums[:, :, 5] - first[:, :, 1] + x * sums[:, :, 1]).T
    return out + 0.0  # no negative zeros


def contract(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """(n, C, d) sums over k of a (n, k) times b (k, C, d): one matrix product."""
    return (a @ b.reshape(b.shape[0], math.prod(b.shape[1:]))).reshape((a.shape[0],) + b.shape[1:])
