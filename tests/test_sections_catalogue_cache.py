"""Remembered catalogue files: a second read gives the same catalogue without parsing, an edited file
is read anew, damaged cache files are ignored and rewritten, bad files still fail the same way.

Check values: "1 mm = 0.001 m" and "1 GPa = 1e9 Pa" (SI prefixes, common practice); line numbers are
counted in the texts below.
"""

from __future__ import annotations

import os
import pickle
import subprocess
import sys
from functools import lru_cache
from pathlib import Path

import pytest

from sizer import cache_store
from sizer.cache_store import write_sealed
from sizer.errors import InputError
from sizer.sections import catalogue, catalogue_cache, load_catalogue
from sizer.sections.catalogue_cache import ParsedFile

STOCK = """title = "stock for the cache tests"

[materials.steel]
elastic_modulus = "200 GPa"
shear_modulus = "77 GPa"
density = "7850 kg/m^3"

[[sections]]
name = "flat 50x10"
shape = "rectangle"
family = "flat"
depth = "50 mm"
width = "10 mm"

[[sections]]
name = "beam 200"
shape = "i_beam"
material = "steel"
depth = "200 mm"
width = "100 mm"
flange_thickness = "8.5 mm"
web_thickness = "5.6 mm"
root_radius = "12 mm"

[[sections]]
name = "plate with a hole"
shape = "polygon"
points = [["0 mm", "0 mm"], ["60 mm", "0 mm"], ["60 mm", "40 mm"], ["0 mm", "40 mm"]]
holes = [[["20 mm", "10 mm"], ["40 mm", "10 mm"], ["40 mm", "30 mm"], ["20 mm", "30 mm"]]]
"""
NAME_LINES = {"flat 50x10": 9, "beam 200": 16, "plate with a hole": 26}  # the lines of their name = keys
MEMBER = '[member]\nlength = "3 m"\nsection = "beam 200"\n'


@pytest.fixture()
def folder(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A catalogue folder holding stock.toml, with a cache folder of its own; each read goes to the
    cache folder, as a new process's would (the reads within one process: test_read_again_here)."""
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.setattr(catalogue, "_remembered_file", catalogue._remembered_file.__wrapped__)
    library = tmp_path / "library"
    library.mkdir()
    (library / "stock.toml").write_text(STOCK, encoding="utf-8")
    return library


def _slots() -> list[Path]:
    folder = catalogue_cache.cache_folder()
    return sorted(folder.iterdir()) if folder.is_dir() else []


def _no_parsing(monkeypatch: pytest.MonkeyPatch) -> None:
    """Make any parse of a catalogue file fail the test: what follows must come from the cache."""
    def parse(*args: object) -> None:
        raise AssertionError("the file was parsed")

    monkeypatch.setattr(catalogue, "_parse_file", parse)


def _summary(loaded: catalogue.Catalogue) -> list[tuple]:
    return [(spec.name, spec.shape, spec.dims, spec.points, spec.holes, spec.family, spec.material, spec.source,
             spec.line, spec.geometry_key()) for spec in loaded.sections.values()]


def test_second_read_is_remembered_and_equal(folder: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    first = load_catalogue([folder])
    assert len(_slots()) == 1
    _no_parsing(monkeypatch)
    second = load_catalogue([folder])
    assert _summary(second) == _summary(first)
    assert second.materials == first.materials and second.files == first.files
    beam = second.sections["beam 200"]
    assert beam.dims["flange_thickness"] == pytest.approx(0.0085) and beam.dims["root_radius"] == pytest.approx(0.012)  # 1 mm = 0.001 m
    assert second.sections["plate with a hole"].holes[0][2] == pytest.approx((0.040, 0.030))
    assert second.materials["steel"].elastic_modulus == pytest.approx(200e9)  # 1 GPa = 1e9 Pa
    assert {name: spec.line for name, spec in second.sections.items()} == NAME_LINES
    assert {spec.source for spec in second.sections.values()} == {str(folder / "stock.toml")}


def test_edited_file_is_read_anew_in_the_same_slot(folder: Path) -> None:
    load_catalogue([folder])
    stock = folder / "stock.toml"
    stock.write_text("# a new first line\n" + STOCK.replace('width = "10 mm"', 'width = "12 mm"'), encoding="utf-8")
    edited = load_catalogue([folder])
    assert edited.sections["flat 50x10"].dims["width"] == pytest.approx(0.012)
    assert {name: spec.line for name, spec in edited.sections.items()} == {name: line + 1 for name, line in NAME_LINES.items()}
    assert len(_slots()) == 1  # the file's one slot, overwritten


def test_path_as_given_is_kept_in_sources(folder: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(folder.parent)
    relative, absolute = Path("library/stock.toml"), folder / "stock.toml"
    for _ in range(2):  # the second round reads the cache
        assert {spec.source for spec in load_catalogue([relative]).sections.values()} == {"library/stock.toml"}
        assert {spec.source for spec in load_catalogue([absolute]).sections.values()} == {str(absolute)}
    assert len(_slots()) == 2


def _truncate(slot: Path) -> None:
    slot.write_bytes(slot.read_bytes()[:300])


def _garbage(slot: Path) -> None:
    slot.write_bytes(os.urandom(2000))


def _text_digest(slot: Path) -> str:
    """The slot's digest of the catalogue text (the line after its seal)."""
    return slot.read_bytes().split(b"\n", 2)[1].decode()


def _reseal(slot: Path, payload: bytes) -> None:
    """Write `payload` as the slot's pickle under a matching seal: the deeper checks must catch it."""
    write_sealed(slot, catalogue_cache.slot_body(_text_digest(slot), payload))


def _garbage_after_the_digest(slot: Path) -> None:
    _reseal(slot, b"not a pickle at all")


def _wrong_types(slot: Path) -> None:
    _reseal(slot, pickle.dumps(ParsedFile(False, ["not a section"], {})))


def _one_byte_changed(slot: Path) -> None:
    data = bytearray(slot.read_bytes())
    data[-10] ^= 1
    slot.write_bytes(bytes(data))


def _empty(slot: Path) -> None:
    slot.write_bytes(b"")


@pytest.mark.parametrize("damage", [_truncate, _garbage, _garbage_after_the_digest, _wrong_types, _empty, _one_byte_changed])
def test_damaged_slot_is_ignored_and_rewritten(folder: Path, damage) -> None:
    good = _summary(load_catalogue([folder]))
    [slot] = _slots()
    damage(slot)
    assert _summary(load_catalogue([folder])) == good
    stock = folder / "stock.toml"
    remembered = catalogue_cache.read_parsed(stock, catalogue_cache.content_digest(stock, stock.read_text(encoding="utf-8")))
    assert remembered is not None and [spec.name for spec in remembered.sections] == list(NAME_LINES)


class _MakesAFolder:
    """A pickle that would create a folder when loaded by an unrestricted unpickler."""

    def __init__(self, path: Path) -> None:
        self.path = path

    def __reduce__(self) -> tuple:
        return os.mkdir, (str(self.path),)


def test_a_slot_naming_other_classes_runs_nothing(folder: Path, tmp_path: Path) -> None:
    good = _summary(load_catalogue([folder]))
    [slot] = _slots()
    marker = tmp_path / "made by unpickling"
    _reseal(slot, pickle.dumps(ParsedFile(False, [], {"steel": _MakesAFolder(marker)})))
    assert _summary(load_catalogue([folder])) == good
    assert not marker.exists()


def test_bad_file_raises_the_same_error_every_time_and_is_not_remembered(folder: Path) -> None:
    stock = folder / "stock.toml"
    load_catalogue([folder])  # the good text is remembered first
    stock.write_text(STOCK.replace('depth = "50 mm"', 'depth = "-50 mm"'), encoding="utf-8")
    errors = []
    for _ in range(2):
        with pytest.raises(InputError) as caught:
            load_catalogue([folder])
        errors.append((caught.value.file, caught.value.key, caught.value.line, caught.value.problem))
    assert errors[0] == errors[1] == (str(stock), "sections[1].depth", 12, errors[0][3])
    assert "greater than zero" in errors[0][3]
    remembered = catalogue_cache.read_parsed(stock, catalogue_cache.content_digest(stock, stock.read_text(encoding="utf-8")))
    assert remembered is None


def test_bad_file_writes_no_cache_file(folder: Path) -> None:
    (folder / "stock.toml").write_text(STOCK.replace('width = "10 mm"', 'widht = "10 mm"'), encoding="utf-8")
    with pytest.raises(InputError) as caught:
        load_catalogue([folder])
    assert (caught.value.key, caught.value.line) == ("sections[1].widht", 13)
    assert _slots() == []


def test_member_file_is_skipped_in_a_folder_but_fails_alone(folder: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    member = folder / "beam.toml"
    member.write_text(MEMBER, encoding="utf-8")
    first = load_catalogue([folder])
    assert first.files == (folder / "stock.toml",)
    problems = []
    for _ in range(2):  # the member file's skip is remembered; given alone it is still an error
        assert load_catalogue([folder]).files == (folder / "stock.toml",)
        with pytest.raises(InputError) as caught:
            load_catalogue([member])
        problems.append((caught.value.file, caught.value.key, caught.value.problem))
    assert problems[0] == problems[1] and problems[0][:2] == (str(member), "member")
    _no_parsing(monkeypatch)
    assert load_catalogue([folder]).files == (folder / "stock.toml",)


def test_other_code_is_another_digest(folder: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    load_catalogue([folder])
    parsed = []
    parse = catalogue._parse_file
    monkeypatch.setattr(catalogue, "_parse_file", lambda *args: parsed.append(args[0]) or parse(*args))
    monkeypatch.setattr(cache_store, "code_fingerprint", lambda: "code of another version")
    load_catalogue([folder])
    load_catalogue([folder])
    assert parsed == [folder / "stock.toml"]  # parsed once under the new code, then remembered


def test_warm_read_needs_no_toml_parser(folder: Path) -> None:
    load_catalogue([folder])
    script = (
        "import sys\n"
        "from pathlib import Path\n"
        "from sizer.sections import load_catalogue\n"
        f"loaded = load_catalogue([Path({str(folder)!r})])\n"
        "assert not {'tomllib', 'sizer.inputfile', 'pint'} & set(sys.modules), 'parsed'\n"
        "print(loaded.sections['beam 200'].dims['web_thickness'])\n"
    )
    env = {"SIZER_CACHE_DIR": os.environ["SIZER_CACHE_DIR"], "PATH": "", "PYTHONDONTWRITEBYTECODE": "1"}
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, env=env, timeout=60)
    assert done.returncode == 0, done.stderr
    assert float(done.stdout) == pytest.approx(0.0056)  # 5.6 mm


def test_read_again_here_skips_the_cache_folder_until_the_text_changes(folder: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(catalogue, "_remembered_file", lru_cache(maxsize=4)(catalogue._remembered_file))  # this process's memory, empty
    parsed: list[Path] = []
    parse = catalogue._parse_file
    monkeypatch.setattr(catalogue, "_parse_file", lambda path, *rest: parsed.append(path) or parse(path, *rest))
    good = _summary(load_catalogue([folder]))
    [slot] = _slots()
    _garbage(slot)  # a read that went to the cache folder would have to parse again
    assert _summary(load_catalogue([folder])) == good
    assert len(parsed) == 1
    stock = folder / "stock.toml"
    stock.write_text(STOCK.replace('"50 mm"', '"60 mm"'), encoding="utf-8")
    edited = load_catalogue([folder])
    assert len(parsed) == 2
    assert edited.sections["flat 50x10"].dims["depth"] == pytest.approx(0.060)  # 60 mm (SI prefixes, common practice)
