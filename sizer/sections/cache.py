"""The on-disk cache of section results, in platformdirs.user_cache_dir("sizer"), or $SIZER_CACHE_DIR:

- sections/: per geometry (an entry), one small JSON of the torsion-and-warping tier's scalars and
  one raw array file (.f64: little-endian float64, the unit stress fields' points, sigma and tau
  one after the other);
- section-tables/: the scalars of a whole list of sections in one array (a table: a digest line,
  then the .npy bytes), so that a large catalogue's properties are one file read instead of one per
  section: the geometric tier alone (the sizing's), or every tier (section_table's).

Entry key: a hash of the geometry (shape and dimensions), the mesh settings, the sectionproperties
version and SCHEMA_VERSION. Table key: a hash of its sections' geometry keys, in row order, its
column names, and the same mesh settings, version and schema. Files are written atomically (an
entry's arrays first, then the JSON that names the arrays' checksum), so an entry or a table is
whole or absent. Every file carries a keyed digest (HMAC-SHA256 with the cache's secret,
sizer.digests) of its whole content: an entry's JSON of its key, schema, scalars and the arrays'
sha256; a table's array bytes. A file changed by anyone without the secret fails its digest. Reading trusts nothing: an
entry that fails to load, does not match its digest, has missing or non-finite values, the wrong
shapes or the wrong arrays is reported as absent, and so is a table that fails to load, does not
match its digest, has the wrong shape or type or a non-finite value; the caller recomputes and
rewrites it (a table from its entries).
"""

from __future__ import annotations

import hashlib
import io
import json
import math
import os
import sys
from functools import lru_cache
from pathlib import Path
from typing import Sequence

import numpy as np

from sizer.digests import digest_matches, keyed_digest
from sizer.files import cache_root, write_atomic
from sizer.sections.geometry import mesh_settings
from sizer.sections.spec import SectionSpec

SCHEMA_VERSION = 8  # 7: entries hold the warping tier only (the geometric tier comes from the outline); 8: warping stress fields
ARRAY_NAMES = ("points", "sigma", "tau", "omega", "tau_w")
RAW = np.dtype("<f8")
_GEOMETRY_MARK = "GEOMETRY"  # stands for the geometry key in the key text built once per process


def cache_folder() -> Path:
    """Where entries live: $SIZER_CACHE_DIR/sections, else the user's cache folder."""
    return cache_root() / "sections"


def table_folder() -> Path:
    """Where tables live: $SIZER_CACHE_DIR/section-tables, else the user's cache folder."""
    return cache_root() / "section-tables"


@lru_cache(maxsize=1)
def sectionproperties_version() -> str:
    """The installed sectionproperties version, without importing it: from the name of its
    `sectionproperties-<version>.dist-info` folder on sys.path (PEP 376/427) when that settles it,
    else from importlib.metadata (about 10 ms to import)."""
    found = _version_from_dist_info("sectionproperties", sys.path)
    if found is not None:
        return found
    from importlib.metadata import version

    return version("sectionproperties")


def _version_from_dist_info(distribution: str, folders: Sequence[str]) -> str | None:
    """The version in the name of `distribution`'s `<name>-<version>.dist-info` folder in the first
    of `folders` that holds any metadata of it (.dist-info, .egg-info, .egg); None when there is
    none, or when that folder's is not exactly one .dist-info (importlib.metadata decides then)."""
    name = distribution.replace("-", "_").lower()
    for folder in folders:
        try:
            names = os.listdir(folder or ".")
        except OSError:
            continue
        candidates = [entry for entry in names if entry.lower().startswith((f"{name}-", f"{name}."))
                      and entry.endswith((".dist-info", ".egg-info", ".egg"))]
        if not candidates:
            continue
        if len(candidates) != 1 or not candidates[0].endswith(".dist-info"):
            return None
        version = candidates[0][len(name) + 1:-len(".dist-info")]
        return version if version and "-" not in version else None
    return None


def entry_key(spec: SectionSpec) -> str:
    """The cache key of a section's geometry under the current mesh settings and library version."""
    return _key_of_geometry(spec.geometry_key())


@lru_cache(maxsize=4096)
def _key_of_geometry(geometry_key: str) -> str:
    """sha256 of the JSON {"geometry", "mesh", "schema", "sectionproperties"} (sorted keys): the text
    around the geometry key is built once per process."""
    before, after = _key_text_around_geometry()
    return hashlib.sha256(f"{before}{geometry_key}{after}".encode()).hexdigest()[:32]


@lru_cache(maxsize=1)
def _key_text_around_geometry() -> tuple[str, str]:
    """The key's JSON text before and after the geometry key (a hex string: JSON writes it as is)."""
    text = json.dumps({"geometry": _GEOMETRY_MARK, "mesh": mesh_settings(), "schema": SCHEMA_VERSION,
                       "sectionproperties": sectionproperties_version()}, sort_keys=True)
    before, after = text.split(_GEOMETRY_MARK)
    return before, after


def table_key(geometry_keys: Sequence[str], columns: Sequence[str]) -> str:
    """The cache key of a table: a hash of its sections' geometry keys, in row order, its column
    names, in order, and what each entry key adds (mesh settings, schema, sectionproperties version)."""
    before, after = _key_text_around_geometry()
    text = "\n".join([before + after, ",".join(columns), *geometry_keys])
    return hashlib.sha256(text.encode()).hexdigest()[:32]


def _paths(key: str) -> tuple[str, str]:
    folder = str(cache_folder())
    return os.path.join(folder, f"{key}.json"), os.path.join(folder, f"{key}.f64")


def _entry_text(entry: dict) -> bytes:
    """An entry's JSON text (sorted keys) without its own digest: what the digest covers."""
    return json.dumps({name: value for name, value in entry.items() if name != "digest"}, sort_keys=True).encode()


def read_entry(key: str, names: tuple[str, ...]) -> dict | None:
    """The entry's JSON (key, schema, arrays_sha256, scalars, digest) if it is whole, matches its
    digest and every scalar in `names` is a finite number; else None."""
    path, _ = _paths(key)
    try:
        with open(path, "rb") as stream:
            data = json.loads(stream.read())
        if data["key"] != key or data["schema"] != SCHEMA_VERSION or not isinstance(data["arrays_sha256"], str):
            return None
        if not digest_matches(_entry_text(data), data["digest"]):
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
    """Store an entry atomically (arrays, then the JSON naming their checksum). False when the
    cache folder cannot be written (results then live in memory only)."""
    json_path, arrays_path = _paths(key)
    payload = np.concatenate([np.asarray(arrays[name], dtype=RAW).ravel() for name in ARRAY_NAMES]).tobytes()
    entry = {"key": key, "schema": SCHEMA_VERSION, "arrays_sha256": hashlib.sha256(payload).hexdigest(), "scalars": scalars}
    entry["digest"] = keyed_digest(_entry_text(entry))
    try:
        write_atomic(arrays_path, payload, durable=False)  # checked when read (sha256): no fsync
        write_atomic(json_path, json.dumps(entry), durable=False)
    except OSError:
        return False
    return True


def _table_path(key: str) -> str:
    return os.path.join(str(table_folder()), f"{key}.table")


def read_table(key: str, shape: tuple[int, int]) -> np.ndarray | None:
    """The table stored under `key` if its array bytes match the keyed digest line before them and load
    as a float64 array of `shape` with every value finite; else None."""
    try:
        with open(_table_path(key), "rb") as stream:
            header, payload = stream.read().split(b"\n", 1)
        if not digest_matches(payload, header.decode()):
            return None
        table = np.load(io.BytesIO(payload), allow_pickle=False)
        if table.dtype != np.float64 or table.shape != shape or not np.isfinite(table).all():
            return None
        return table
    except Exception:  # any damage at all: rebuild from the entries
        return None


def write_table(key: str, table: np.ndarray) -> bool:
    """Store a table atomically (a digest line, then the .npy bytes). False when the cache folder
    cannot be written."""
    buffer = io.BytesIO()
    np.save(buffer, np.asarray(table, dtype=np.float64), allow_pickle=False)
    payload = buffer.getvalue()
    try:
        write_atomic(_table_path(key), keyed_digest(payload).encode() + b"\n" + payload, durable=False)
    except OSError:
        return False
    return True
