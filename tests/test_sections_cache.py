"""The section cache: keys follow the geometry, damaged entries are rebuilt, warm look-ups need no sectionproperties, catalogues build in parallel.

Check values: rectangle A = bh, I = bh^3/12 (elementary beam theory, any mechanics of materials
text, e.g. Gere & Timoshenko, from memory); mass per length = A x density with steel at 7850 kg/m^3
(docs/references.md, common practice)."""

from __future__ import annotations

import hashlib
import json
import math
import subprocess
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from sizer.cache_store import read_sealed, write_sealed
from sizer.sections import build_catalogue, section_properties, unit_stress_field
from sizer.sections import cache
from sizer.errors import InputError
from sizer.sections.catalogue import SectionSpec
from sizer.sections.properties import clear_memory
from sizer.sections.warping import WARPING_NAMES

FLAT = SectionSpec("flat 30x8", "rectangle", {"depth": 0.030, "width": 0.008}, source="test")


@pytest.fixture()
def cache_dir(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path))
    clear_memory()
    yield tmp_path / "sections"
    clear_memory()


def test_key_follows_geometry_not_name() -> None:
    renamed = replace(FLAT, name="other name", family="flat", material="mild-steel")
    deeper = replace(FLAT, dims={"depth": 0.0301, "width": 0.008})
    assert cache.entry_key(renamed) == cache.entry_key(FLAT)
    assert cache.entry_key(deeper) != cache.entry_key(FLAT)


def test_key_is_the_geometry_and_the_mesh_settings() -> None:
    """The code and the libraries' versions are in each file's seal (sizer.cache_store), not the key:
    an entry from other code is rebuilt in place."""
    from sizer.sections.geometry import mesh_settings

    text = json.dumps({"geometry": FLAT.geometry_key(), "mesh": mesh_settings()}, sort_keys=True)
    assert cache.entry_key(FLAT) == hashlib.sha256(text.encode()).hexdigest()[:32]


def test_entry_is_written_whole_and_read_back(cache_dir: Path) -> None:
    first = section_properties(FLAT)
    key = cache.entry_key(FLAT)
    assert sorted(path.name for path in cache_dir.iterdir()) == [f"{key}.entry", f"{key}.f64"]  # no temporary files left
    clear_memory()
    again = section_properties(FLAT)
    assert again.area == first.area == pytest.approx(0.030 * 0.008)  # A = bh
    assert again.mesh_nodes == unit_stress_field(FLAT).sigma.shape[1]


def _rewrite(path: Path, entry: dict) -> None:
    """Write an entry whose content is wrong but whose seal matches it: the deeper checks must catch it."""
    write_sealed(path, json.dumps(entry).encode())


def _read(path: Path) -> dict:
    body = read_sealed(path)
    assert body is not None
    return json.loads(body)


def _damage_json(path: Path) -> None:
    path.write_text("{ not json", encoding="utf-8")


def _sealed_not_json(path: Path) -> None:
    write_sealed(path, b"{ not json")


def _one_value_changed_unsealed(path: Path) -> None:
    """J with a digit put in front, the seal left as it was (someone without the secret)."""
    data = path.read_bytes()
    assert b'"J": ' in data
    path.write_bytes(data.replace(b'"J": ', b'"J": 1', 1))


def _nan_in_scalars(path: Path) -> None:
    entry = _read(path)
    entry["scalars"]["J"] = math.nan
    _rewrite(path, entry)


def _truncate_arrays(path: Path) -> None:
    path.with_suffix(".f64").write_bytes(path.with_suffix(".f64").read_bytes()[:200])


def _nan_in_arrays_with_matching_checksum(path: Path) -> None:
    raw = path.with_suffix(".f64")
    values = np.frombuffer(raw.read_bytes(), dtype="<f8").copy()
    values[7] = np.nan
    raw.write_bytes(values.tobytes())
    entry = _read(path)
    entry["arrays_sha256"] = hashlib.sha256(values.tobytes()).hexdigest()
    _rewrite(path, entry)


def _wrong_node_count(path: Path) -> None:
    entry = _read(path)
    entry["scalars"]["mesh_nodes"] += 1
    _rewrite(path, entry)


@pytest.mark.parametrize("damage", [_damage_json, _sealed_not_json, _one_value_changed_unsealed, _nan_in_scalars, _truncate_arrays, _nan_in_arrays_with_matching_checksum, _wrong_node_count])
def test_damaged_entry_is_recomputed_and_rewritten(cache_dir: Path, damage) -> None:
    good = unit_stress_field(FLAT)
    area = section_properties(FLAT).area
    key = cache.entry_key(FLAT)
    damage(cache_dir / f"{key}.entry")
    clear_memory()
    rebuilt = unit_stress_field(FLAT)
    assert np.array_equal(rebuilt.sigma, good.sigma) and np.array_equal(rebuilt.points, good.points)
    assert section_properties(FLAT).area == area
    entry = cache.read_entry(key, WARPING_NAMES)  # an entry holds the warping tier (the geometric one comes from the outline)
    assert entry is not None and cache.read_arrays(key, entry) is not None  # the entry on disk is whole again


def test_warm_lookup_does_not_import_sectionproperties(cache_dir: Path) -> None:
    section_properties(FLAT)
    script = (
        "import sys\n"
        "from sizer.sections import section_properties, peak_unit_stresses, unit_stress_field\n"
        "from sizer.sections.catalogue import SectionSpec\n"
        "spec = SectionSpec('flat 30x8', 'rectangle', {'depth': 0.030, 'width': 0.008})\n"
        "p = section_properties(spec, 7850.0)\n"
        "peak_unit_stresses(spec); unit_stress_field(spec)\n"
        "assert 'sectionproperties' not in sys.modules, 'imported'\n"
        "print(repr(p.area), repr(p.mass_per_length))\n"
    )
    env = {"SIZER_CACHE_DIR": str(cache_dir.parent), "PATH": "", "PYTHONDONTWRITEBYTECODE": "1"}
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, env=env, timeout=60)
    assert done.returncode == 0, done.stderr
    area, mass = map(float, done.stdout.split())
    assert area == pytest.approx(0.030 * 0.008) and mass == pytest.approx(0.030 * 0.008 * 7850.0)  # A rho


def test_parallel_build_then_all_from_cache(cache_dir: Path) -> None:
    specs = [replace(FLAT, name=f"flat {depth}", dims={"depth": depth * 1e-3, "width": 0.008}) for depth in (20, 25, 35, 40)]
    seen: list[tuple[int, int]] = []
    summary = build_catalogue(specs + [replace(specs[0], name="twin")], workers=2, progress=lambda done, total, name: seen.append((done, total)))
    assert (summary.sections, summary.geometries, summary.computed, summary.workers) == (5, 4, 4, 2)
    assert seen[-1] == (4, 4)
    clear_memory()
    again = build_catalogue(specs)
    assert (again.computed, again.from_cache) == (0, 4)
    assert section_properties(specs[2]).Iz == pytest.approx(0.008 * 0.035**3 / 12, rel=1e-6)  # bh^3/12


def test_a_shape_that_cannot_be_meshed_is_bad_input_from_any_worker(cache_dir: Path) -> None:
    # built directly, past the catalogue's checks: a zero depth leaves nothing to mesh
    flat = SectionSpec("no depth", "rectangle", {"depth": 0.0, "width": 0.008}, source="stock.toml", line=7)
    others = [replace(FLAT, name=f"flat {depth}", dims={"depth": depth * 1e-3, "width": 0.008}) for depth in (21, 22, 23)]
    for workers in (1, 2):
        with pytest.raises(InputError) as caught:
            build_catalogue(others + [flat], workers=workers)
        assert (caught.value.file, caught.value.line) == ("stock.toml", 7) and "'no depth'" in caught.value.problem
