"""Section tables: the scalars of many sections in one array, read from one file on later runs;
damaged tables are ignored and rebuilt from the entries.

Check values for a b x d rectangle (elementary beam theory, e.g. Gere & Timoshenko, from memory):
A = b d, Iz = b d^3 / 12, peak bending stress per unit moment 6 / (b d^2) about z and 6 / (d b^2)
about y, axial stress per unit force 1 / A.
"""

from __future__ import annotations

import io
import os
import subprocess
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from sizer.cache_store import write_sealed
from sizer.sections import cache, peak_unit_stresses, section_properties, section_properties_many, section_table
from sizer.sections.catalogue import SectionSpec
from sizer.sections.properties import SCALAR_NAMES, clear_memory

FLAT = SectionSpec("flat 30x8", "rectangle", {"depth": 0.030, "width": 0.008}, source="test")
SPECS = [replace(FLAT, name=f"flat {depth}x8", dims={"depth": depth * 1e-3, "width": 0.008}) for depth in (30, 24, 36)]
SPECS.append(replace(SPECS[0], name="same shape, other name"))
COLUMN = {name: index for index, name in enumerate(SCALAR_NAMES)}


@pytest.fixture()
def cache_dir(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path))
    clear_memory()
    yield tmp_path
    clear_memory()


def _table_file(specs: list[SectionSpec]) -> Path:
    return cache.table_folder() / f"{cache.table_key([spec.geometry_key() for spec in specs], SCALAR_NAMES)}.table"


def _refuse_entries(monkeypatch: pytest.MonkeyPatch) -> None:
    """Make reading any per-section entry fail the test: what follows must come from the table."""
    def read_entry(*args: object) -> None:
        raise AssertionError("an entry was read")

    monkeypatch.setattr(cache, "read_entry", read_entry)


def test_rows_are_the_section_properties_in_spec_order(cache_dir: Path) -> None:
    table = section_table(SPECS)
    assert table.shape == (len(SPECS), len(SCALAR_NAMES)) and table.dtype == np.float64
    for row, spec in zip(table, SPECS):
        props = section_properties(spec)
        depth, width = spec.dims["depth"], spec.dims["width"]
        assert row[COLUMN["area"]] == props.area == pytest.approx(depth * width, rel=1e-9)  # A = b d
        assert row[COLUMN["Iz"]] == props.Iz == pytest.approx(width * depth**3 / 12, rel=1e-6)  # b d^3 / 12
        assert row[COLUMN["J"]] == props.J and row[COLUMN["mesh_nodes"]] == props.mesh_nodes
        assert (row[COLUMN["ys"]], row[COLUMN["zs"]]) == props.shear_centre
    assert np.array_equal(table[0], table[3])  # one geometry, two names


def test_a_later_run_reads_one_file_and_no_entry(cache_dir: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    first = section_table(SPECS)
    assert _table_file(SPECS).is_file()
    clear_memory()
    _refuse_entries(monkeypatch)
    seen: list[tuple[int, int, str]] = []
    again = section_table(SPECS, progress=lambda done, total, name: seen.append((done, total, name)))
    assert np.array_equal(again, first)
    assert seen == [(3, 3, "")]  # three geometries, nothing to compute
    flat = SPECS[1]  # 24 x 8
    assert section_properties(flat, 7850.0).mass_per_length == pytest.approx(0.024 * 0.008 * 7850.0)  # A rho
    sigma, tau = peak_unit_stresses(flat)
    assert sigma == pytest.approx([1 / (0.024 * 0.008), 6 / (0.024 * 0.008**2), 6 / (0.008 * 0.024**2)], rel=1e-6)
    assert tuple(tau) == section_properties(flat).tau_peak


def test_changing_the_returned_table_changes_nothing_remembered(cache_dir: Path) -> None:
    area = section_table(SPECS)[2, COLUMN["area"]]
    clear_memory()
    table = section_table(SPECS)  # read from its file
    table[:] = 0.0
    assert section_properties(SPECS[2]).area == area == pytest.approx(0.036 * 0.008, rel=1e-9)  # A = b d


def test_order_and_membership_make_other_tables(cache_dir: Path) -> None:
    table = section_table(SPECS)
    reordered = section_table(SPECS[::-1])
    assert np.array_equal(reordered, table[::-1])
    assert len({_table_file(SPECS), _table_file(SPECS[::-1]), _table_file(SPECS[:2])}) == 3
    assert np.array_equal(section_table(SPECS[:2]), table[:2])


def test_many_properties_go_through_the_table(cache_dir: Path) -> None:
    many = section_properties_many(SPECS, 7850.0)
    assert _table_file(SPECS).is_file()
    assert [props.name for props in many] == [spec.name for spec in SPECS]
    assert many[0].Iz == pytest.approx(0.008 * 0.030**3 / 12, rel=1e-6)  # b d^3 / 12


def _load(path: Path) -> np.ndarray:
    """A table file's array (after its seal line)."""
    return np.load(io.BytesIO(path.read_bytes().split(b"\n", 1)[1]), allow_pickle=True)


def _save(path: Path, table: np.ndarray, allow_pickle: bool = False) -> None:
    """Write `table` as a table file under a matching seal: only the content is wrong."""
    buffer = io.BytesIO()
    np.save(buffer, table, allow_pickle=allow_pickle)
    write_sealed(path, buffer.getvalue())


def _truncate(path: Path) -> None:
    path.write_bytes(path.read_bytes()[:100])


def _garbage(path: Path) -> None:
    path.write_bytes(os.urandom(500))


def _nan(path: Path) -> None:
    table = _load(path)
    table[1, COLUMN["J"]] = np.nan
    _save(path, table)


def _one_row_short(path: Path) -> None:
    _save(path, _load(path)[:-1])


def _whole_numbers(path: Path) -> None:
    _save(path, _load(path).astype(np.int64))


def _objects(path: Path) -> None:
    _save(path, _load(path).astype(object), allow_pickle=True)


@pytest.mark.parametrize("damage", [_truncate, _garbage, _nan, _one_row_short, _whole_numbers, _objects])
def test_damaged_table_is_ignored_and_rebuilt(cache_dir: Path, damage) -> None:
    good = section_table(SPECS)
    damage(_table_file(SPECS))
    clear_memory()
    assert np.array_equal(section_table(SPECS), good)
    assert np.array_equal(cache.read_table(_table_file(SPECS).stem, good.shape), good)  # whole again


def test_warm_table_needs_neither_metadata_nor_sectionproperties(cache_dir: Path) -> None:
    section_table(SPECS)
    script = (
        "import sys\n"
        "from sizer.sections import section_table\n"
        "from sizer.sections.catalogue import SectionSpec\n"
        "specs = [SectionSpec(f'flat {d}', 'rectangle', {'depth': d * 1e-3, 'width': 0.008}) for d in (30, 24, 36, 30)]\n"
        "table = section_table(specs)\n"
        "assert not {'sectionproperties', 'importlib.metadata'} & set(sys.modules), 'imported'\n"
        "print(table[2, 0])\n"
    )
    env = {"SIZER_CACHE_DIR": str(cache_dir), "PATH": "", "PYTHONDONTWRITEBYTECODE": "1"}
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, env=env, timeout=60)
    assert done.returncode == 0, done.stderr
    assert float(done.stdout) == pytest.approx(0.036 * 0.008, rel=1e-9)  # A = b d
