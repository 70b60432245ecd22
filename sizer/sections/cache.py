"""The on-disk cache of section results: one small JSON of scalars and one .npz of the unit stress
fields per geometry, in platformdirs.user_cache_dir("sizer")/sections, or $SIZER_CACHE_DIR/sections.

Key: a hash of the geometry (shape and dimensions), the mesh settings, the sectionproperties
version and SCHEMA_VERSION. Files are written atomically (arrays first, then the JSON that names
the arrays' checksum), so an entry is whole or absent. Reading trusts nothing: any entry that fails
to load, has missing or non-finite values, the wrong shapes or the wrong checksum is reported as
absent, and the caller recomputes and rewrites it.
"""

from __future__ import annotations

import hashlib
import io
import json
import math
import os
from functools import lru_cache
from pathlib import Path

import numpy as np

from sizer.files import cache_root, write_atomic
from sizer.sections.catalogue import SectionSpec
from sizer.sections.geometry import mesh_settings

SCHEMA_VERSION = 4
ARRAY_NAMES = ("points", "sigma", "tau")


def cache_folder() -> Path:
    """Where entries live: $SIZER_CACHE_DIR/sections, else the user's cache folder."""
    return cache_root() / "sections"


@lru_cache(maxsize=1)
def sectionproperties_version() -> str:
    """The installed sectionproperties version (from package metadata: no import)."""
    from importlib.metadata import version

    return version("sectionproperties")


def entry_key(spec: SectionSpec) -> str:
    """The cache key of a section's geometry under the current mesh settings and library version."""
    return _key_of_geometry(spec.geometry_key())


@lru_cache(maxsize=4096)
def _key_of_geometry(geometry_key: str) -> str:
    text = json.dumps({"geometry": geometry_key, "mesh": mesh_settings(), "schema": SCHEMA_VERSION,
                       "sectionproperties": sectionproperties_version()}, sort_keys=True)
    return hashlib.sha256(text.encode()).hexdigest()[:32]


def _paths(key: str) -> tuple[str, str]:
    folder = str(cache_folder())
    return os.path.join(folder, f"{key}.json"), os.path.join(folder, f"{key}.npz")


def read_entry(key: str, names: tuple[str, ...]) -> dict | None:
    """The entry's JSON (key, schema, arrays_sha256, scalars) if it is whole and every scalar in
    `names` is a finite number; else None."""
    path, _ = _paths(key)
    try:
        with open(path, "rb") as stream:
            data = json.loads(stream.read())
        if data["key"] != key or data["schema"] != SCHEMA_VERSION or not isinstance(data["arrays_sha256"], str):
            return None
        scalars = data["scalars"]
        values = [scalars[name] for name in names]
        # plain numbers only; a NaN or infinity anywhere makes the sum non-finite
        if not {type(value) for value in values} <= {int, float} or not math.isfinite(sum(values)):
            return None
        return data
    except Exception:  # any damage at all: recompute
        return None


def read_arrays(key: str, entry: dict) -> dict[str, np.ndarray] | None:
    """The entry's arrays if the file matches the JSON's checksum and node count, with consistent
    shapes and finite values; else None."""
    _, path = _paths(key)
    try:
        with open(path, "rb") as stream:
            payload = stream.read()
        if hashlib.sha256(payload).hexdigest() != entry["arrays_sha256"]:
            return None
        with np.load(io.BytesIO(payload), allow_pickle=False) as archive:
            arrays = {name: np.array(archive[name], dtype=float) for name in ARRAY_NAMES}
        nodes = int(entry["scalars"]["mesh_nodes"])
        shapes_ok = (arrays["points"].shape == (nodes, 2) and arrays["sigma"].shape == (3, nodes)
                     and arrays["tau"].shape == (3, nodes, 2))
        if not shapes_ok or not all(np.isfinite(array).all() for array in arrays.values()):
            return None
        return arrays
    except Exception:  # any damage at all: recompute
        return None


def write_entry(key: str, scalars: dict[str, float], arrays: dict[str, np.ndarray]) -> bool:
    """Store an entry atomically (arrays, then the JSON naming their checksum). False when the
    cache folder cannot be written (results then live in memory only)."""
    json_path, npz_path = _paths(key)
    buffer = io.BytesIO()
    np.savez(buffer, **{name: arrays[name] for name in ARRAY_NAMES})
    payload = buffer.getvalue()
    entry = {"key": key, "schema": SCHEMA_VERSION, "arrays_sha256": hashlib.sha256(payload).hexdigest(), "scalars": scalars}
    try:
        write_atomic(npz_path, payload)
        write_atomic(json_path, json.dumps(entry))
    except OSError:
        return False
    return True
