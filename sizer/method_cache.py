"""The compiled methods of dataclasses, kept between runs of the command the way Python keeps compiled
modules. Python 3.11 and 3.12 write each dataclass's __init__, __repr__, __eq__, __hash__,
__setattr__ and __delattr__ as source text and compile it at import, one compile per method: some
500 compiles, about 40 ms of a `sizer size` run. `install()` has the dataclasses module compile each
distinct text once and keep the code object; `save()` writes the code objects beside the package's
compiled modules (its __pycache__ folder, or sys.pycache_prefix), so the next run reads them
instead (about 1 ms).

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
from typing import Any

MAX_ENTRIES = 5000  # beyond this many kept texts (old versions of edited classes), a save keeps only this run's


def cache_file() -> Path | None:
    """Where the compiled methods are kept: sizer/__pycache__/dataclass_methods.<tag>.marshal (under
    sys.pycache_prefix when set), or None when this interpreter keeps no bytecode (no cache tag)."""
    from importlib.util import cache_from_source

    try:
        compiled = cache_from_source(str(Path(__file__).with_name("dataclass_methods.py")))
    except NotImplementedError:  # sys.implementation.cache_tag is None
        return None
    return Path(compiled).with_suffix(".marshal")


def _magic() -> bytes:
    from importlib.util import MAGIC_NUMBER

    return MAGIC_NUMBER


class MethodCache:
    """Code objects by source text: the ones read from `path` and the ones compiled in this run."""

    def __init__(self, path: Path | None) -> None:
        self.path = path
        self.codes: dict[str, CodeType] = read_codes(path) if path is not None else {}
        self.used: set[str] = set()
        self.added = 0

    def exec(self, source: Any, globals: Any = None, locals: Any = None, /, **options: Any) -> None:
        """builtins.exec, with a source text compiled once and its code object kept."""
        if not isinstance(source, str) or options:
            builtins.exec(source, globals, locals, **options)
            return
        code = self.codes.get(source)
        if code is None:
            code = self.codes[source] = compile(source, "<string>", "exec", dont_inherit=True)
            self.added += 1
        self.used.add(source)
        builtins.exec(code, globals, locals)


def read_codes(path: Path) -> dict[str, CodeType]:
    """The kept code objects of `path`; empty when the file is missing, damaged or of another
    interpreter."""
    magic = _magic()
    try:
        data = path.read_bytes()
        found = marshal.loads(data[len(magic):]) if data.startswith(magic) else {}
    except (OSError, EOFError, ValueError, TypeError):
        return {}
    if not isinstance(found, dict):
        return {}
    return {text: code for text, code in found.items() if isinstance(text, str) and isinstance(code, CodeType)}


def install(path: Path | None = None) -> MethodCache:
    """Have the dataclasses module compile through a MethodCache of `path` (default: cache_file())."""
    import dataclasses

    cache = MethodCache(path if path is not None else cache_file())
    setattr(dataclasses, "exec", cache.exec)  # the module's global name, found before the builtin
    return cache


def save(cache: MethodCache) -> None:
    """Write the cache's code objects when this run compiled any (atomically: a temporary file, then a
    rename); nothing when Python writes no bytecode or the folder cannot be written."""
    if not cache.added or cache.path is None or sys.dont_write_bytecode:
        return
    kept = cache.codes if len(cache.codes) <= MAX_ENTRIES else {text: cache.codes[text] for text in cache.used}
    temporary = cache.path.with_name(f"{cache.path.name}.{os.getpid()}.tmp")
    try:
        cache.path.parent.mkdir(parents=True, exist_ok=True)
        temporary.write_bytes(_magic() + marshal.dumps(kept))
        os.replace(temporary, cache.path)
    except (OSError, ValueError):
        with suppress(OSError):
            temporary.unlink(missing_ok=True)
