"""Catalogue files remembered parsed, so that reading an unchanged catalogue file needs no TOML
parse, no unit parsing and no validation.

One sealed file (sizer.cache_store) per catalogue file (as named: its resolved path and the path as
given) in the store's catalogues/ folder: a line with the sha256 of the path as given (it is in
every SectionSpec's source and in messages) and the file's text (so every line number too), then a
pickle of a ParsedFile. The seal covers the code that parsed it (the store's code fingerprint), so a
file whose text, path or parsing code changed is parsed again and its slot overwritten: the folder
holds one file per catalogue file read.

Only files that parsed without error are stored, so a bad file is parsed, and its error raised, on
every read. Reading trusts nothing: a missing or damaged file, a seal that does not match, another
digest of the text, a pickle naming any class but ParsedFile, SectionSpec, Material, Allowables and
Purchase, or contents of the wrong types all read as absent.
"""

from __future__ import annotations

import gc
import hashlib
import io
import pickle
from pathlib import Path
from typing import TypeGuard

from sizer.cache_store import cache_root, read_sealed, write_sealed
from sizer.model import Allowables, Material
from sizer.sections.purchase import Purchase
from sizer.sections.spec import SectionSpec

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


def content_digest(path: Path, text: str) -> str:
    """The digest a remembered parse of `text`, read from `path`, must carry."""
    return hashlib.sha256(f"{path}\0".encode() + text.encode()).hexdigest()


def slot_path(path: Path) -> Path:
    """The one cache file of the catalogue file `path` (named from its resolved path and the path
    as given)."""
    name = hashlib.sha256(f"{Path(path).resolve()}\0{path}".encode()).hexdigest()[:32]
    return cache_folder() / f"{name}.pickle"


def slot_body(digest: str, payload: bytes) -> bytes:
    """A slot's body (sealed when written): the digest of the text, then the pickle `payload`."""
    return digest.encode() + b"\n" + payload


def read_parsed(path: Path, digest: str) -> ParsedFile | None:
    """The remembered parse of `path` if its slot's seal matches, it holds `digest`, and its pickle
    is whole and of the right types; else None."""
    body = read_sealed(slot_path(path))
    if body is None:
        return None
    found, _, payload = body.partition(b"\n")
    if found != digest.encode():
        return None
    try:
        parsed = _unpickle(payload)
    except Exception:  # any damage at all: parse the file
        return None
    return parsed if _well_typed(parsed) else None


def write_parsed(path: Path, digest: str, parsed: ParsedFile) -> None:
    """Remember `parsed` for `path` with `digest`, each section's geometry key computed first (so a
    later read need not hash it). A cache folder that cannot be written only costs speed."""
    for spec in parsed.sections:
        spec.geometry_key()
    payload = pickle.dumps(parsed, protocol=pickle.HIGHEST_PROTOCOL)
    try:
        write_sealed(slot_path(path), slot_body(digest, payload))
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
