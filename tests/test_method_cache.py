"""The kept compiled methods of dataclasses (sizer.method_cache): a class made through the cache
behaves exactly as the standard library's dataclasses module makes it (the reference here is the
module itself, run without the cache), a second run compiles nothing, and a damaged, foreign or
unwritable cache file is never an error."""

from __future__ import annotations

import builtins
import dataclasses
import sys
from pathlib import Path
from typing import Any

import pytest

from sizer import method_cache


def make_classes() -> tuple[Any, Any]:
    """A frozen dataclass with a default and a default factory, and a plain mutable one with ordering."""

    @dataclasses.dataclass(frozen=True)
    class Beam:
        name: str
        length: float = 2.5
        marks: tuple[str, ...] = dataclasses.field(default_factory=tuple)

    @dataclasses.dataclass(order=True)
    class Load:
        at: float
        value: float = 0.0

    return Beam, Load


def behaviour(beam_class: Any, load_class: Any) -> list[Any]:
    """What a user of the two classes sees: construction, defaults, equality, hashing, repr, fields,
    replace, ordering, and the refusal to change a frozen instance."""
    beam = beam_class("IPE 200")
    seen: list[Any] = [repr(beam), beam == beam_class("IPE 200", 2.5, ()), hash(beam) == hash(beam_class("IPE 200")),
                       [f.name for f in dataclasses.fields(beam)], repr(dataclasses.replace(beam, length=4.0)),
                       dataclasses.asdict(beam), repr(sorted([load_class(2.0, 1.0), load_class(1.0, 5.0)])),
                       load_class(1.0) < load_class(1.0, 1.0)]
    try:
        beam.length = 3.0
        seen.append("changed")
    except dataclasses.FrozenInstanceError:
        seen.append("frozen")
    return seen


@pytest.fixture
def restored(monkeypatch: pytest.MonkeyPatch) -> None:
    """dataclasses without the cache again after the test (the builtin exec)."""
    monkeypatch.setattr(dataclasses, "exec", builtins.exec, raising=False)


def test_classes_made_through_the_cache_behave_as_the_standard_library_makes_them(tmp_path: Path, restored: None) -> None:
    reference = behaviour(*make_classes())
    cache = method_cache.install(lambda package: tmp_path / f"{package}.marshal")
    assert behaviour(*make_classes()) == reference
    assert cache.grown == {__name__.partition(".")[0]}


def test_a_second_run_reads_the_kept_methods_and_compiles_none(tmp_path: Path, restored: None, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(sys, "dont_write_bytecode", False)
    package = __name__.partition(".")[0]
    first = method_cache.install(lambda name: tmp_path / f"{name}.marshal")
    reference = behaviour(*make_classes())
    method_cache.save(first)
    assert [path.name for path in tmp_path.iterdir()] == [f"{package}.marshal"]
    second = method_cache.install(lambda name: tmp_path / f"{name}.marshal")
    assert behaviour(*make_classes()) == reference
    assert second.grown == set() and second.used[__name__] == set(second.tables[package][__name__]) == first.used[__name__]


def test_an_edited_class_leaves_no_old_methods_behind(tmp_path: Path, restored: None, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(sys, "dont_write_bytecode", False)
    package = __name__.partition(".")[0]

    def made(field_name: str) -> method_cache.MethodCache:
        """One run: the module makes one class whose field is `field_name` (an edit between runs)."""
        cache = method_cache.install(lambda name: tmp_path / f"{name}.marshal")
        dataclasses.make_dataclass("Edited", [(field_name, float)], frozen=True, namespace={"__module__": __name__})
        method_cache.save(cache)
        return cache

    before, after = made("length"), made("span")
    kept = method_cache.read_table(tmp_path / f"{package}.marshal")[__name__]
    assert set(kept) == after.used[__name__] and not set(kept) & before.used[__name__]


def test_nothing_is_written_when_python_writes_no_bytecode(tmp_path: Path, restored: None, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(sys, "dont_write_bytecode", True)
    cache = method_cache.install(lambda package: tmp_path / f"{package}.marshal")
    make_classes()
    method_cache.save(cache)
    assert cache.grown and list(tmp_path.iterdir()) == []


@pytest.mark.parametrize("content", [b"", b"not marshal data at all", b"\x00\x01\x02\x03" + b"\xff" * 40])
def test_a_damaged_or_foreign_file_reads_as_empty(tmp_path: Path, content: bytes) -> None:
    path = tmp_path / "methods.marshal"
    path.write_bytes(content)
    assert method_cache.read_table(path) == {}


def test_a_file_of_the_right_interpreter_holding_other_data_reads_as_empty(tmp_path: Path) -> None:
    import marshal
    from importlib.util import MAGIC_NUMBER

    path = tmp_path / "methods.marshal"
    path.write_bytes(MAGIC_NUMBER + marshal.dumps(["a list", "not a table"]))
    assert method_cache.read_table(path) == {}
    path.write_bytes(MAGIC_NUMBER + marshal.dumps({"text": "not code", 3: compile("x = 1", "<string>", "exec")}))
    assert method_cache.read_table(path) == {}


def test_a_folder_that_cannot_be_written_is_no_error(tmp_path: Path, restored: None, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(sys, "dont_write_bytecode", False)
    blocker = tmp_path / "a file"
    blocker.write_text("in the way", encoding="utf-8")
    cache = method_cache.install(lambda package: blocker / f"{package}.marshal")  # its folder is a file: cannot be made
    make_classes()
    method_cache.save(cache)
    assert cache.grown and list(tmp_path.iterdir()) == [blocker]


def test_the_cache_files_sit_with_the_package_compiled_modules() -> None:
    path = method_cache.cache_file("rich")
    assert path is not None and path.suffix == ".marshal" and str(sys.implementation.cache_tag) in path.name and "rich" in path.name
    if sys.pycache_prefix is None:
        assert path.parent == Path(method_cache.__file__).parent / "__pycache__"
