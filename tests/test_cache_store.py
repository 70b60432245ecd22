"""The cache store: one code fingerprint made from the package's source, so that editing a module
whose results are kept invalidates them by itself; a stale (other code), tampered or old-layout file
of every kind is rebuilt, never read as a result.

Check values: rectangle A = bh (elementary beam theory, from memory); 1 daN = 10 N (SI prefix deca,
common practice); HMAC-SHA256 as RFC 2104 and FIPS 198-1 define it (Python's hmac module)."""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from sizer import cache_store, units
from sizer.cache_store import code_fingerprint, installed_versions, read_sealed, source_fingerprint, write_sealed
from sizer.sections import cache, section_properties, section_table
from sizer.sections.catalogue import SectionSpec
from sizer.sections.properties import SCALAR_NAMES, clear_memory
from sizer.sections.warping import WARPING_NAMES

PACKAGE = Path(cache_store.__file__).resolve().parent
FLAT = SectionSpec("flat 30x8", "rectangle", {"depth": 0.030, "width": 0.008}, source="test")


@pytest.fixture()
def root(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    clear_memory()
    yield tmp_path / "cache"
    clear_memory()


def _copy_of_the_package(tmp_path: Path) -> Path:
    """The sizer package's Python sources, copied (a folder holding `sizer`, for PYTHONPATH)."""
    shutil.copytree(PACKAGE, tmp_path / "code" / "sizer", ignore=shutil.ignore_patterns("__pycache__", "*.toml", "*.md"))
    return tmp_path / "code"


# ----------------------------------------------------------------------------------------------
# the fingerprint

def test_fingerprint_follows_the_source_of_every_module(tmp_path: Path) -> None:
    copy = _copy_of_the_package(tmp_path) / "sizer"
    original = source_fingerprint(PACKAGE)
    assert source_fingerprint(copy) == original  # the same source wherever it lies
    warping = copy / "sections" / "warping.py"
    warping.write_text(warping.read_text(encoding="utf-8") + "\n# an edit\n", encoding="utf-8")
    edited = source_fingerprint(copy)
    assert edited != original
    (copy / "sections" / "added.py").write_text("", encoding="utf-8")
    assert source_fingerprint(copy) not in (original, edited)  # a module added counts too
    os.utime(copy / "model.py", (0, 0))
    assert source_fingerprint(copy) == source_fingerprint(copy)  # the text decides, not the time stamps


def test_code_fingerprint_is_made_of_the_source_python_and_libraries() -> None:
    expected = cache_store.content_hash(source_fingerprint(PACKAGE), sys.version, installed_versions(cache_store.CACHED_LIBRARIES, sys.path))
    assert code_fingerprint() == expected and len(expected) == 64


def test_versions_are_read_from_the_dist_info_folder(tmp_path: Path) -> None:
    from importlib.metadata import version

    assert installed_versions(["sectionproperties"], sys.path) == {"sectionproperties": version("sectionproperties")}
    empty, plain, egg, twice = (tmp_path / name for name in ("empty", "plain", "egg", "twice"))
    for folder, names in ((empty, ["numpy-2.0.0.dist-info"]), (plain, ["sectionproperties-9.8.7.dist-info"]),
                          (egg, ["sectionproperties-1.0.egg-info"]),
                          (twice, ["sectionproperties-1.0.dist-info", "sectionproperties-2.0.dist-info"])):
        for name in names:
            (folder / name).mkdir(parents=True)
    installed = version("sectionproperties")
    assert installed_versions(["sectionproperties"], [str(tmp_path / "absent"), str(empty), str(plain), str(egg)]) == {"sectionproperties": "9.8.7"}
    assert installed_versions(["sectionproperties"], [str(egg), str(plain)]) == {"sectionproperties": installed}  # importlib.metadata decides
    assert installed_versions(["sectionproperties"], [str(twice)]) == {"sectionproperties": installed}
    assert installed_versions(["no-such-library-here"], [str(empty)]) == {"no-such-library-here": "absent"}


def test_an_edited_module_invalidates_the_kept_sections(root: Path, tmp_path: Path) -> None:
    """A section entry kept by this code is read by a process running the same source from elsewhere,
    and rebuilt by one whose sections/warping.py differs by a comment alone."""
    area = section_properties(FLAT).area
    assert area == pytest.approx(0.030 * 0.008)  # A = bh
    entry = root / "sections" / f"{cache.entry_key(FLAT)}.entry"
    kept = entry.read_bytes()
    code = _copy_of_the_package(tmp_path)
    script = ("from sizer.sections import section_properties\nfrom sizer.sections.catalogue import SectionSpec\n"
              "print(section_properties(SectionSpec('flat 30x8', 'rectangle', {'depth': 0.030, 'width': 0.008})).J)\n")
    env = {**os.environ, "PYTHONPATH": str(code), "SIZER_CACHE_DIR": str(root), "PYTHONDONTWRITEBYTECODE": "1"}

    def run() -> float:
        done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, env=env, cwd=tmp_path, timeout=120)
        assert done.returncode == 0, done.stderr
        return float(done.stdout)

    same = run()
    assert entry.read_bytes() == kept  # same source: the kept entry was read, not rewritten
    warping = code / "sizer" / "sections" / "warping.py"
    warping.write_text(warping.read_text(encoding="utf-8") + "\n# an edit\n", encoding="utf-8")
    assert run() == same
    rebuilt = entry.read_bytes()
    assert rebuilt != kept and rebuilt.partition(b"\n")[2] == kept.partition(b"\n")[2]  # resealed by the new code, same numbers
    assert read_sealed(entry) is None  # and no longer this code's


# ----------------------------------------------------------------------------------------------
# sealed files

def test_a_sealed_file_reads_back_only_under_its_own_name_and_code(root: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    path = root / "runs" / "ab" / "one.json"
    write_sealed(path, b'{"passes": false}')
    assert read_sealed(path) == b'{"passes": false}'
    other = root / "runs" / "ab" / "two.json"
    other.write_bytes(path.read_bytes())  # a valid file copied to another key's name
    assert read_sealed(other) is None
    monkeypatch.setattr(cache_store, "code_fingerprint", lambda: "other code")
    assert read_sealed(path) is None
    for damaged in (b"", b"no seal line", path.read_bytes()[:-1]):
        path.write_bytes(damaged)
        assert read_sealed(path) is None


def _stale(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    """Reseal the file as other code would have written it (another fingerprint)."""
    body = read_sealed(path)
    assert body is not None
    with monkeypatch.context() as patched:
        patched.setattr(cache_store, "code_fingerprint", lambda: "code of an earlier version")
        write_sealed(path, body)


def _tampered(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    """One byte of the body changed, the seal left as it was."""
    data = bytearray(path.read_bytes())
    data[-3] ^= 0x01
    path.write_bytes(bytes(data))


def _old_layout(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    """The body behind a plain sha256 line, as files of earlier layouts began (no seal)."""
    import hashlib

    body = path.read_bytes().partition(b"\n")[2]
    path.write_bytes(hashlib.sha256(body).hexdigest().encode() + b"\n" + body)


@pytest.mark.parametrize("spoil", [_stale, _tampered, _old_layout])
def test_a_stale_or_tampered_section_entry_and_table_are_rebuilt(root: Path, monkeypatch: pytest.MonkeyPatch, spoil) -> None:
    table = section_table([FLAT])
    key = cache.entry_key(FLAT)
    entry = root / "sections" / f"{key}.entry"
    [table_file] = (root / "section-tables").iterdir()
    good_entry = read_sealed(entry)
    spoil(entry, monkeypatch)
    spoil(table_file, monkeypatch)
    assert cache.read_entry(key, WARPING_NAMES) is None and cache.read_table(table_file.stem, table.shape) is None
    clear_memory()
    assert (section_table([FLAT]) == table).all()
    assert read_sealed(entry) == good_entry and cache.read_table(table_file.stem, (1, len(SCALAR_NAMES))) is not None


@pytest.mark.parametrize("spoil", [_stale, _tampered, _old_layout])
def test_a_stale_or_tampered_unit_file_is_rebuilt(root: Path, monkeypatch: pytest.MonkeyPatch, spoil) -> None:
    assert units.parse("12 daN", "force") == pytest.approx(120.0)  # a unit pint is asked for (1 daN = 10 N)
    memory = root / units.UNIT_CACHE_NAME
    spoil(memory, monkeypatch)
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    assert units._read_unit_cache() == {}
    assert units.parse("12 daN", "force") == pytest.approx(120.0)
    assert json.loads(read_sealed(memory) or b"{}") == {"daN|force": 10.0}  # rewritten


@pytest.mark.parametrize("spoil", [_stale, _tampered, _old_layout])
def test_a_stale_or_tampered_kept_result_is_worked_out_again(root: Path, monkeypatch: pytest.MonkeyPatch, spoil) -> None:
    from sizer.parallel import Job, _kept_path, run_jobs
    from sizer.workers import Workers

    runs: list[int] = []

    def work(payload: int) -> dict:
        runs.append(payload)
        return {"square": payload * payload}

    jobs = [Job(f"{k:02d}" + "c" * 62, k) for k in range(3)]
    assert run_jobs(Workers(1), work, jobs, show_progress=False)[0] == [{"square": 0}, {"square": 1}, {"square": 4}]
    spoil(_kept_path(jobs[1].key), monkeypatch)
    results, summary = run_jobs(Workers(1), work, jobs, show_progress=False)
    assert results == [{"square": 0}, {"square": 1}, {"square": 4}] and runs == [0, 1, 2, 1]
    assert (summary.resumed, summary.ran) == (2, 1)


def test_a_build_without_sources_is_fingerprinted_by_its_compiled_modules(tmp_path: Path) -> None:
    """Where only .pyc files are shipped, they decide the fingerprint (never a constant shared by every build)."""
    compiled = tmp_path / "sizer" / "__pycache__"
    compiled.mkdir(parents=True)
    (compiled / "model.cpython-311.pyc").write_bytes(b"one build")
    first = source_fingerprint(tmp_path / "sizer")
    (compiled / "model.cpython-311.pyc").write_bytes(b"another build")
    assert source_fingerprint(tmp_path / "sizer") != first
