"""Plain JSON values from numpy results, and round-off of sums that are zero in exact arithmetic."""

from __future__ import annotations

import math
from typing import Any

def without_round_off(values: Any, scale: float | None = None, relative: float = 1e-9) -> Any:
    """`values` (an array) with entries smaller than `relative` x `scale` (default: its largest entry)
    set to exactly 0: the round-off of sums that are zero in exact arithmetic."""
    import numpy as np

    values = np.asarray(values, dtype=float)
    scale = np.abs(values).max(initial=0.0) if scale is None else scale
    return np.where(np.abs(values) <= relative * scale, 0.0, values)


def reactions_without_round_off(reactions: Any, length: float) -> Any:
    """(n, 6) reactions Fx, Fy, Fz (N), Mx, My, Mz (N*m) with round-off set to exactly 0, forces and
    moments each on their own scale: a force below 1e-9 of the largest force (or 1e-12 of the largest
    moment / length), a moment below 1e-9 of the largest moment (or 1e-12 of the largest force x
    length). Statics sums of terms of size F L carry round-off of about 1e-15 F L, far below these."""
    import numpy as np

    values = np.asarray(reactions, dtype=float).reshape(-1, 6)
    force, moment = np.abs(values[:, :3]).max(initial=0.0), np.abs(values[:, 3:]).max(initial=0.0)
    forces = without_round_off(values[:, :3], max(1e-9 * force, 1e-12 * moment / length), relative=1.0)
    moments = without_round_off(values[:, 3:], max(1e-9 * moment, 1e-12 * force * length), relative=1.0)
    return np.concatenate([forces, moments], axis=1)


def to_jsonable(value: Any) -> Any:
    """Convert numpy scalars/arrays and tuples to plain JSON types; NaN/inf become null, -0.0 becomes 0.0."""
    import numpy as np

    if isinstance(value, dict):
        return {str(key): to_jsonable(item) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [to_jsonable(item) for item in value]
    if isinstance(value, np.ndarray):
        return to_jsonable(value.tolist())
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float):
        return value + 0.0 if math.isfinite(value) else None  # + 0.0: never "-0.0"
    return value
