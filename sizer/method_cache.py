"""The compiled methods of dataclasses, kept between runs of the command the way Python keeps compiled
modules. Python 3.11 and 3.12 write each dataclass's __init__, __repr__, __eq__, __hash__,
__setattr__ and __delattr__ as source text and compile it at import, one compile per method: some
500 compiles, about 40 ms of a `sizer size` run. `install()` has the dataclasses module compile each
distinct text once and keep the code object; `save()` writes the code objects beside the package's
compiled modules (its __pycache__ folder, or sys.pycache_prefix; one file per top-level package of
the classes: sizer, rich ...), so the next run reads them instead (about 2 ms for sizer's 500). A
module that made classes in a run keeps just the texts it used, so an edited class's old methods go
when the new ones are written, as a module's old .pyc does.

Every class comes out exactly as the dataclasses module makes it: the code object of a text is what
compiling that text gives (the same file name "<string>", no __future__ flags, the interpreter's
optimization level), looked up by the whole text, so an edited class finds no entry and is compiled
afresh. The file is trusted as Python trusts the .pyc files beside it (whoever may write the one
may write the other); it is read only when it starts with this interpreter's bytecode magic number,
a damaged or foreign file reads as empty, and nothing is written when Python writes no bytecode
(PYTHONDONTWRITEBYTECODE, -B) or where the folder cannot be written. Only the command line installs
it (sizer.cli.main): `import sizer` changes nothing in the importing process.
"""

from __future__ import annotations

import builtins
import marshal
import os
import sys
from contextlib import suppress
from pathlib import Path
from types import CodeType
from typing import Any, Callable

Table = dict[str, dict[str, CodeType]]  # module name -> source text -> code object


def cache_file(package: str) -> Path | None:
    """Where the compiled methods of the classes of `package` (a top-level package: sizer, rich ...)
    are kept: sizer/__pycache__/dataclass_methods_<package>.<tag>.marshal (under sys.pycache_prefix
    when set), or None when this interpreter keeps no bytecode (no cache tag)."""
    from importlib.util import cache_from_source

    try:
        compiled = cache_from_source(str(Path(__file__).with_name(f"dataclass_methods_{package}.py")))
    except NotImplementedError:  # sys.implementation.cache_tag is None
        return None
    return Path(compiled).with_suffix(".marshal")


def _magic() -> bytes:
    from importlib.util import MAGIC_NUMBER

    return MAGIC_NUMBER


class MethodCache:
    """Code objects by module and source text, one table per top-level package of the classes (each
    read from its file when a class of that package is first made, so `sizer --help` reads only the
    few it needs); the texts each module used in this run, and the packages whose table grew."""

    def __init__(self, where: Callable[[str], Path | None] = cache_file) -> None:
        self.where = where
        self.tables: dict[str, Table] = {}
        self.used: dict[str, set[str]] = {}
        self.grown: set[str] = set()

    def exec(self, source: Any, globals: Any = None, locals: Any = None, /, **options: Any) -> None:
        """builtins.exec, with a source text compiled once and its code object kept (`globals`, the
        class's module namespace, names the module)."""
        if not isinstance(source, str) or options:
            builtins.exec(source, globals, locals, **options)
            return
        module = _module(globals)
        package = module.partition(".")[0]
        codes = self.table(package).setdefault(module, {})
        code = codes.get(source)
        if code is None:
            code = codes[source] = compile(source, "<string>", "exec", dont_inherit=True)
            self.grown.add(package)
        self.used.setdefault(module, set()).add(source)
        builtins.exec(code, globals, locals)

    def table(self, package: str) -> Table:
        """The code objects of `package`'s classes by module, read from its file on first use."""
        if package not in self.tables:
            path = self.where(package)
            self.tables[package] = read_table(path) if path is not None else {}
        return self.tables[package]

    def kept(self, package: str) -> Table:
        """What to write for `package`: for each module that made classes in this run, the texts it
        used (an edited class's old text goes, as a module's old .pyc does); the others as read."""
        return {module: {text: codes[text] for text in self.used[module]} if module in self.used else codes
                for module, codes in self.tables[package].items()}


def _module(namespace: Any) -> str:
    """The module a namespace belongs to ("_" when it names none, or not as a dotted name)."""
    name = namespace.get("__name__") if isinstance(namespace, dict) else None
    return name if isinstance(name, str) and all(part.isidentifier() for part in name.split(".")) else "_"


def read_table(path: Path) -> Table:
    """The kept code objects of `path` by module; empty when the file is missing, damaged or of
    another interpreter."""
    magic = _magic()
    try:
        data = path.read_bytes()
        found = marshal.loads(data[len(magic):]) if data.startswith(magic) else {}
    except (OSError, EOFError, ValueError, TypeError):
        return {}
    if not isinstance(found, dict):
        return {}
    return {module: {text: code for text, code in codes.items() if isinstance(text, str) and isinstance(code, CodeType)}
            for module, codes in found.items() if isinstance(module, str) and isinstance(codes, dict)}


def install(where: Callable[[str], Path | None] = cache_file) -> MethodCache:
    """Have the dataclasses module compile through a MethodCache whose files `where` names."""
    import dataclasses

    cache = MethodCache(where)
    setattr(dataclasses, "exec", cache.exec)  # the module's global name, found before the builtin
    return cache


def save(cache: MethodCache) -> None:
    """Write the tables this run added to (MethodCache.kept; each atomically: a temporary file, then
    a rename); nothing when Python writes no bytecode or where a folder cannot be written."""
    if sys.dont_write_bytecode:
        return
    for package in sorted(cache.grown):
        path = cache.where(package)
        if path is not None:
            _write(path, cache.kept(package))


def _write(path: Path, table: Table) -> None:
    temporary = path.with_name(f"{path.name}.{os.getpid()}.tmp")
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        temporary.write_bytes(_magic() + marshal.dumps(table))
        os.replace(temporary, path)
    except (OSError, ValueError):
        with suppress(OSError):
            temporary.unlink(missing_ok=True)
