"""Catalogue files remembered parsed, so that reading an unchanged catalogue file needs no TOML
parse, no unit parsing and no validation.

One file per catalogue file (as named: its resolved path and the path as given) in
$SIZER_CACHE_DIR/catalogues, else the user's cache folder: a line of two digests, then a pickle of
a ParsedFile. The first digest (of what was parsed) is a sha256 of the code fingerprint, the path as
given (it is in every SectionSpec's source and in messages) and the file's text (so every line
number too); the second is the keyed digest (HMAC-SHA256 with the cache's secret, sizer.digests)
of both, so that no value in it can change unseen, even by someone who rewrites the digests. The code
fingerprint covers the Python version and the size and modification time of the source of each
module whose code shapes the parse result: the test Python itself applies before it reuses a
module's compiled code. A file whose text, path or code changed is parsed again and its slot
overwritten, so the folder holds one file per catalogue file read.

Only files that parsed without error are stored, so a bad file is parsed, and its error raised, on
every read. Reading trusts nothing: a missing or damaged file, another digest of the text, a pickle
that does not match its digest, a pickle naming any class but ParsedFile, SectionSpec, Material,
Allowables and Purchase, or contents of the wrong types all read as absent. Files are written atomically (sizer.files.write_atomic).
"""

from __future__ import annotations

import gc
import hashlib
import io
import os
import pickle
import sys
from functools import lru_cache
from pathlib import Path
from typing import TypeGuard

from sizer.digests import digest_matches, keyed_digest
from sizer.files import cache_root, write_atomic
from sizer.model import Allowables, Material
from sizer.sections.purchase import Purchase
from sizer.sections.spec import SectionSpec

# the modules whose code shapes a catalogue file's parse result, relative to the sizer package
FINGERPRINT_SOURCES = (
    "sections/catalogue.py", "sections/catalogue_cache.py", "sections/shapes.py", "sections/spec.py", "sections/purchase.py", "model.py", "units.py", "inputfile/__init__.py", "inputfile/reader.py",
    "inputfile/materials.py",
)


class ParsedFile:
    """What one catalogue file holds; `foreign`: a table of FOREIGN_TABLES (a member file or
    project file: skipped in a folder, and then neither sections nor materials are read).
    (A plain class: a dataclass or NamedTuple would add up to half a millisecond to importing this
    module, which every catalogue read pays.)"""

    __slots__ = ("foreign", "sections", "materials", "currency", "families")

    def __init__(self, foreign: bool, sections: list[SectionSpec], materials: dict[str, Material], currency: str | None = None,
                 families: dict[str, Purchase] | None = None) -> None:
        self.foreign = foreign
        self.sections = sections
        self.materials = materials
        self.currency = currency  # the file's top-level currency
        self.families = families or {}  # [families.NAME] purchase terms


_ALLOWED_CLASSES = {(cls.__module__, cls.__qualname__): cls for cls in (ParsedFile, SectionSpec, Material, Allowables, Purchase)}


def cache_folder() -> Path:
    """Where parsed catalogue files live: $SIZER_CACHE_DIR/catalogues, else the user's cache folder."""
    return cache_root() / "catalogues"


@lru_cache(maxsize=1)
def code_fingerprint() -> str | None:
    """sha256 of the Python version and the path, size and modification time (ns) of each of
    FINGERPRINT_SOURCES (once per process); None when a source is missing (nothing is remembered)."""
    package = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    parts = [sys.version]
    try:
        for relative in FINGERPRINT_SOURCES:
            source = os.path.join(package, relative)
            status = os.stat(source)
            parts.append(f"{source}|{status.st_size}|{status.st_mtime_ns}")
    except OSError:
        return None
    return hashlib.sha256("\n".join(parts).encode()).hexdigest()


def content_digest(path: Path, text: str) -> str | None:
    """The digest a remembered parse of `text`, read from `path`, must carry (None: remember nothing)."""
    fingerprint = code_fingerprint()
    if fingerprint is None:
        return None
    return hashlib.sha256(f"{fingerprint}\0{path}\0".encode() + text.encode()).hexdigest()


def slot_path(path: Path) -> Path:
    """The one cache file of the catalogue file `path` (named from its resolved path and the path
    as given)."""
    name = hashlib.sha256(f"{Path(path).resolve()}\0{path}".encode()).hexdigest()[:32]
    return cache_folder() / f"{name}.pickle"


def slot_bytes(digest: str, payload: bytes) -> bytes:
    """A slot's content: the digest of the text, the keyed digest of it and the pickle `payload`, then the pickle."""
    return f"{digest} {keyed_digest(digest.encode() + payload)}\n".encode() + payload


def read_parsed(path: Path, digest: str | None) -> ParsedFile | None:
    """The remembered parse of `path` if its slot holds one with `digest` whose pickle matches its
    own digest, whole and of the right types; else None."""
    if digest is None:
        return None
    try:
        with open(slot_path(path), "rb") as stream:
            header, payload = stream.read().split(b"\n", 1)
        found, _, signature = header.decode().partition(" ")
        if found != digest or not digest_matches(digest.encode() + payload, signature):
            return None
        parsed = _unpickle(payload)
        return parsed if _well_typed(parsed) else None
    except Exception:  # any damage at all: parse the file
        return None


def write_parsed(path: Path, digest: str | None, parsed: ParsedFile) -> None:
    """Remember `parsed` for `path` with `digest`, each section's geometry key computed first (so a
    later read need not hash it). A cache folder that cannot be written only costs speed."""
    if digest is None:
        return
    for spec in parsed.sections:
        spec.geometry_key()
    payload = pickle.dumps(parsed, protocol=pickle.HIGHEST_PROTOCOL)
    try:
        write_atomic(slot_path(path), slot_bytes(digest, payload), durable=False)  # checked when read: no fsync
    except OSError:
        pass


def _well_typed(parsed: object) -> TypeGuard[ParsedFile]:
    """True when `parsed` is a ParsedFile whose parts have the types it declares."""
    return (type(parsed) is ParsedFile and type(parsed.foreign) is bool
            and type(parsed.sections) is list and all(type(spec) is SectionSpec for spec in parsed.sections)
            and type(parsed.materials) is dict
            and all(type(name) is str and type(material) is Material for name, material in parsed.materials.items())
            and (parsed.currency is None or type(parsed.currency) is str)
            and type(parsed.families) is dict
            and all(type(name) is str and type(terms) is Purchase for name, terms in parsed.families.items())
            and all(spec.purchase is None or type(spec.purchase) is Purchase for spec in parsed.sections))


def _unpickle(payload: bytes) -> object:
    """Unpickle with only the allowed classes, the garbage collector paused: the result holds no
    cycles, and the collections its thousands of new objects would trigger cost a millisecond."""
    collecting = gc.isenabled()
    gc.disable()
    try:
        return _AllowedClassesUnpickler(io.BytesIO(payload)).load()
    finally:
        if collecting:
            gc.enable()


class _AllowedClassesUnpickler(pickle.Unpickler):
    """An unpickler that builds only the classes a ParsedFile is made of (and builtin containers)."""

    def find_class(self, module: str, name: str) -> type:
        if (module, name) not in _ALLOWED_CLASSES:
            raise pickle.UnpicklingError(f"{module}.{name} is not part of a parsed catalogue file")
        return _ALLOWED_CLASSES[(module, name)]
