"""The member's nodes: its ends, every support and every hinge (m), merged when closer than
POSITION_TOLERANCE x length; which nodes carry a split hinge, and the node of each support.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from sizer.model import Member

POSITION_TOLERANCE = 1e-9  # relative to the member length: positions closer than this coincide


def position_tolerance(member: Member) -> float:
    """The distance (m) below which two positions on the member coincide."""
    return POSITION_TOLERANCE * member.length


@dataclass(frozen=True)
class Layout:
    """Nodes (m) and where supports and hinges sit on them."""

    length: float
    tol: float
    nodes: np.ndarray  # (m,) sorted
    split: np.ndarray  # (m,) bool: an interior hinge (separate rotations each side)
    released: np.ndarray  # (m,) bool: any hinge (support rotations about y and z act on nothing)
    support_nodes: np.ndarray  # (n_supports,) node index of each support

    @property
    def lengths(self) -> np.ndarray:
        return np.diff(self.nodes)

    def node_of(self, at: np.ndarray) -> np.ndarray:
        """Index of the node nearest each position."""
        at = np.atleast_1d(np.asarray(at, dtype=float))
        right = np.clip(np.searchsorted(self.nodes, at), 1, len(self.nodes) - 1)
        left = right - 1
        return np.where(np.abs(self.nodes[left] - at) <= np.abs(self.nodes[right] - at), left, right)


def distinct(values: ArrayLike) -> np.ndarray:
    """Sorted distinct values of a 1-D array: np.unique without its masked-array test, which imports
    numpy.ma (about 7 ms of every command's start-up)."""
    ordered = np.sort(np.asarray(values).ravel())
    return ordered[np.concatenate([[True], ordered[1:] != ordered[:-1]])] if ordered.size else ordered


def merge_positions(positions: np.ndarray, tol: float) -> np.ndarray:
    """Sorted positions with those closer than `tol` to the previous kept one merged."""
    ordered = np.sort(positions)
    kept = [ordered[0]]
    for value in ordered[1:]:
        if value - kept[-1] > tol:
            kept.append(value)
    return np.array(kept)


def build_layout(member: Member) -> Layout:
    """Nodes at the ends, supports and hinges."""
    length, tol = member.length, position_tolerance(member)
    xs = [0.0, length] + [s.at for s in member.supports] + [h.at for h in member.hinges]
    nodes = merge_positions(np.clip(np.array(xs, dtype=float), 0.0, length), tol)
    nodes[0], nodes[-1] = 0.0, length
    layout = Layout(length, tol, nodes, np.zeros(len(nodes), bool), np.zeros(len(nodes), bool), np.zeros(0, int))
    hinge_nodes = layout.node_of(np.array([h.at for h in member.hinges], dtype=float)) if member.hinges else np.zeros(0, int)
    released = np.zeros(len(nodes), bool)
    released[hinge_nodes] = True
    split = released.copy()
    split[[0, -1]] = False
    support_nodes = layout.node_of(np.array([s.at for s in member.supports], dtype=float)) if member.supports else np.zeros(0, int)
    return Layout(length, tol, nodes, split, released, support_nodes)
