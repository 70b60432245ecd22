"""The on-disk cache of section results, in the cache store (sizer.cache_store):

- sections/: per geometry (an entry), one small sealed JSON of the torsion-and-warping tier's
  scalars and the sha256 of one raw array file beside it (.f64: little-endian float64, the unit
  stress fields' points, sigma and tau one after the other);
- section-tables/: the scalars of a whole list of sections in one array (a table: the .npy bytes,
  sealed), so that a large catalogue's properties are one file read instead of one per section: the
  geometric tier alone (the sizing's), or every tier (section_table's).

Entry key: a hash of the geometry (shape and dimensions) and the mesh settings. Table key: a hash of
its sections' geometry keys, in row order, its column names, and the same mesh settings. The code
that computed a file (and the libraries' versions) is in its seal (the store's code fingerprint), so
a file from other code reads as absent and is rebuilt in place. Files are written atomically (an
entry's arrays first, then the JSON that names the arrays' checksum), so an entry or a table is
whole or absent. Reading trusts nothing: an entry whose seal does not match, that fails to load, has
missing or non-finite values, the wrong shapes or the wrong arrays is reported as absent, and so is
a table whose seal does not match, that fails to load, has the wrong shape or type or a non-finite
value; the caller recomputes and rewrites it (a table from its entries).
"""

from __future__ import annotations

import hashlib
import io
import json
import math
import os
from functools import lru_cache
from pathlib import Path
from typing import Sequence

import numpy as np

from sizer.cache_store import cache_root, read_sealed, write_sealed
from sizer.files import write_atomic
from sizer.sections.geometry import mesh_settings
from sizer.sections.spec import SectionSpec

ARRAY_NAMES = ("points", "sigma", "tau", "omega", "tau_w")
RAW = np.dtype("<f8")
_GEOMETRY_MARK = "GEOMETRY"  # stands for the geometry key in the key text built once per process


def cache_folder() -> Path:
    """Where entries live: $SIZER_CACHE_DIR/sections, else the user's cache folder."""
    return cache_root() / "sections"


def table_folder() -> Path:
    """Where tables live: $SIZER_CACHE_DIR/section-tables, else the user's cache folder."""
    return cache_root() / "section-tables"


def entry_key(spec: SectionSpec) -> str:
    """The cache key of a section's geometry under the current mesh settings."""
    return _key_of_geometry(spec.geometry_key())


@lru_cache(maxsize=4096)
def _key_of_geometry(geometry_key: str) -> str:
    """sha256 of the JSON {"geometry", "mesh"} (sorted keys): the text around the geometry key is
    built once per process."""
    before, after = _key_text_around_geometry()
    return hashlib.sha256(f"{before}{geometry_key}{after}".encode()).hexdigest()[:32]


@lru_cache(maxsize=1)
def _key_text_around_geometry() -> tuple[str, str]:
    """The key's JSON text before and after the geometry key (a hex string: JSON writes it as is)."""
    text = json.dumps({"geometry": _GEOMETRY_MARK, "mesh": mesh_settings()}, sort_keys=True)
    before, after = text.split(_GEOMETRY_MARK)
    return before, after


def table_key(geometry_keys: Sequence[str], columns: Sequence[str]) -> str:
    """The cache key of a table: a hash of its sections' geometry keys, in row order, its column
    names, in order, and what each entry key adds (the mesh settings)."""
    before, after = _key_text_around_geometry()
    text = "\n".join([before + after, ",".join(columns), *geometry_keys])
    return hashlib.sha256(text.encode()).hexdigest()[:32]


def _paths(key: str) -> tuple[str, str]:
    folder = str(cache_folder())
    return os.path.join(folder, f"{key}.entry"), os.path.join(folder, f"{key}.f64")


def read_entry(key: str, names: tuple[str, ...]) -> dict | None:
    """The entry's JSON (arrays_sha256, scalars) if its seal matches, it is whole and every scalar in
    `names` is a finite number; else None."""
    path, _ = _paths(key)
    body = read_sealed(path)
    if body is None:
        return None
    try:
        data = json.loads(body)
        if not isinstance(data["arrays_sha256"], str):
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
        nodes = int(entry["scalars"]["mesh_nodes"])
        values = np.frombuffer(payload, dtype=RAW).astype(float)
        if values.size != 14 * nodes or not np.isfinite(values).all():  # 2 + 3 + 6 + 1 + 2 values per node
            return None
        return _split_arrays(values, nodes)
    except Exception:  # any damage at all: recompute
        return None


def _split_arrays(values: np.ndarray, nodes: int) -> dict[str, np.ndarray]:
    """points (nodes, 2), sigma (3, nodes), tau (3, nodes, 2), omega (nodes,), tau_w (nodes, 2) from
    their values one after the other."""
    points, sigma, tau, omega, tau_w = np.split(values, [2 * nodes, 5 * nodes, 11 * nodes, 12 * nodes])
    return {"points": points.reshape(nodes, 2), "sigma": sigma.reshape(3, nodes), "tau": tau.reshape(3, nodes, 2),
            "omega": omega, "tau_w": tau_w.reshape(nodes, 2)}


def write_entry(key: str, scalars: dict[str, float], arrays: dict[str, np.ndarray]) -> bool:
    """Store an entry atomically (arrays, then the sealed JSON naming their checksum). False when the
    cache folder cannot be written (results then live in memory only)."""
    entry_path, arrays_path = _paths(key)
    payload = np.concatenate([np.asarray(arrays[name], dtype=RAW).ravel() for name in ARRAY_NAMES]).tobytes()
    entry = {"arrays_sha256": hashlib.sha256(payload).hexdigest(), "scalars": scalars}
    try:
        write_atomic(arrays_path, payload, durable=False)  # checked when read (sha256): no fsync
        write_sealed(entry_path, json.dumps(entry).encode())
    except OSError:
        return False
    return True


def _table_path(key: str) -> str:
    return os.path.join(str(table_folder()), f"{key}.table")


def read_table(key: str, shape: tuple[int, int]) -> np.ndarray | None:
    """The table stored under `key` if its seal matches and it loads as a float64 array of `shape` with
    every value finite; else None."""
    payload = read_sealed(_table_path(key))
    if payload is None:
        return None
    try:
        table = np.load(io.BytesIO(payload), allow_pickle=False)
        if table.dtype != np.float64 or table.shape != shape or not np.isfinite(table).all():
            return None
        return table
    except Exception:  # any damage at all: rebuild from the entries
        return None


def write_table(key: str, table: np.ndarray) -> bool:
    """Store a table atomically (the .npy bytes, sealed). False when the cache folder cannot be written."""
    buffer = io.BytesIO()
    np.save(buffer, np.asarray(table, dtype=np.float64), allow_pickle=False)
    payload = buffer.getvalue()
    try:
        write_sealed(_table_path(key), payload)
    except OSError:
        return False
    return True
