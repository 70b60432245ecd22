"""The cache store: the one place for what sizer keeps between runs, how it is written and how it is
trusted again.

Folder: $SIZER_CACHE_DIR, else the user's cache folder (platformdirs.user_cache_dir("sizer")), with
one sub-folder per kind of kept result:

    catalogues/        parsed catalogue files (sizer.sections.catalogue_cache)
    sections/          a section's warping tier and unit stress fields (sizer.sections.cache)
    section-tables/    the scalars of a list of sections in one array (sizer.sections.cache)
    runs/              results of schedule rows and span-table cells (sizer.parallel)
    unit-factors       the SI factors of the unit texts met so far (sizer.units)
    catalogue-copies/  exact copies of catalogue files shipped inside jobs (compared with the text
                       they copy whenever used: not sealed)
    secret.key         the cache's own secret (below)

Sealed files. Every kept result is written whole or not at all (sizer.files.write_atomic: a
temporary file, then an atomic rename) as one line holding its seal, then its body. The seal is an
HMAC-SHA256, under the cache's secret, of the code fingerprint, the file's name within the cache
folder and the body. `read_sealed` gives the body only when the seal matches, so a file written by
other code (another fingerprint), copied to another name, damaged, or changed by anyone who cannot
read the secret reads as absent: its caller computes the result again and rewrites the file. Files
of earlier layouts (a digest of the content alone, or a hand-numbered schema) fail the seal the same
way and are rebuilt; none is ever read as a result.

The secret (`secret.key`, 32 random bytes, owner-only) is made on first use; one that is not a plain
file of the right size owned by this user with owner-only permissions is not trusted: it is replaced
(every file sealed with the old one is then rebuilt once). Where the cache folder cannot be written,
the secret lives in this process alone (nothing can be kept then anyway).

Code fingerprint (`code_fingerprint`): the sha256 of
  - the source text of every module of the sizer package (each .py file under it, with its path in
    the package; the .pyc files of a build that ships none): all of them, not a list, since every kept result comes from most of the package
    (a schedule row is the whole pipeline's output, down to its HTML record) and a hand-kept list of
    modules would go stale unseen;
  - the Python version;
  - the installed versions of the libraries whose numbers are kept: sectionproperties (the
    formulation of the warping tier), cytriangle (its mesh), numpy and scipy (the solves) and pint
    (the unit factors).
So any edit of sizer's code, or an upgrade of one of those libraries, invalidates every kept file by
itself: no version number is bumped by hand. It is worked out once per process (a few
milliseconds: the package's source is read once).
"""

from __future__ import annotations

import hashlib
import hmac
import json
import os
import stat
import sys
from dataclasses import fields, is_dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any, Sequence

from sizer.errors import InputError
from sizer.files import write_atomic

SECRET_NAME = "secret.key"
SECRET_BYTES = 32
CACHED_LIBRARIES = ("sectionproperties", "cytriangle", "numpy", "scipy", "pint")


# ----------------------------------------------------------------------------------------------
# the folder

def cache_root() -> Path:
    """The folder for sizer's caches: $SIZER_CACHE_DIR, else the user's cache folder (platformdirs)."""
    return Path(_cache_root(os.environ.get("SIZER_CACHE_DIR", "")))


@lru_cache(maxsize=8)
def _cache_root(override: str) -> str:
    if override:
        return override
    import platformdirs

    return platformdirs.user_cache_dir("sizer")


def cache_error(error: OSError) -> InputError:
    """The one line for a cache folder sizer cannot write, naming SIZER_CACHE_DIR and the fix."""
    where = error.filename or str(cache_root())
    return InputError("", "SIZER_CACHE_DIR", f"cannot write sizer's cache folder {str(cache_root())!r} "
                      f"({error.strerror or error} at {str(where)!r})",
                      "set the environment variable SIZER_CACHE_DIR to a folder you can write, e.g. SIZER_CACHE_DIR=/tmp/sizer-cache")


def require_writable_cache() -> Path:
    """The cache folder, made if missing, once a file can be written there; else cache_error. For the
    commands that keep results and catalogue copies there (schedules, span tables)."""
    import tempfile

    root = cache_root()
    try:
        root.mkdir(parents=True, exist_ok=True)
        with tempfile.TemporaryFile(dir=root):
            pass
    except OSError as error:
        raise cache_error(error) from None
    return root


# ----------------------------------------------------------------------------------------------
# sealed files

def read_sealed(path: str | Path) -> bytes | None:
    """The body of the sealed file at `path` (in the cache folder), or None when it is missing,
    unreadable, or its seal does not match (other code, another name, damage, tampering)."""
    try:
        with open(path, "rb") as stream:
            seal, newline, body = stream.read().partition(b"\n")
    except OSError:
        return None
    if not newline or not hmac.compare_digest(_seal(path, body), seal):
        return None
    return body


def write_sealed(path: str | Path, body: bytes) -> None:
    """Keep `body` at `path` (in the cache folder) under its seal, atomically; OSError when the folder
    cannot be written. No fsync: a sealed file is checked when read, so a power cut may lose it but no
    reader ever takes half of it."""
    write_atomic(path, _seal(path, body) + b"\n" + body, durable=False)


def _seal(path: str | Path, body: bytes) -> bytes:
    """HMAC-SHA256 (hex, ASCII) of the code fingerprint, the file's name in the cache folder and `body`."""
    name = os.path.relpath(path, cache_root()).replace(os.sep, "/")
    mac = hmac.new(cache_secret(), f"{code_fingerprint()}\0{name}\0".encode(), hashlib.sha256)
    mac.update(body)
    return mac.hexdigest().encode("ascii")


# ----------------------------------------------------------------------------------------------
# the code fingerprint

@lru_cache(maxsize=1)
def code_fingerprint() -> str:
    """The fingerprint of the code whose results are kept (see the module docstring)."""
    package = Path(__file__).resolve().parent
    return content_hash(source_fingerprint(package), sys.version, installed_versions(CACHED_LIBRARIES, sys.path))


def source_fingerprint(package: Path) -> str:
    """sha256 of every module file under `package`: its path relative to `package` and its bytes, files
    in sorted order (a module added, removed, moved or edited changes it). The .py sources; the
    compiled .pyc files where a build ships no source."""
    digest = hashlib.sha256()
    for source in _module_files(package, ".py") or _module_files(package, ".pyc"):
        with open(source, "rb") as stream:
            text = stream.read()
        digest.update(f"{os.path.relpath(source, package)}\0{len(text)}\0".encode())
        digest.update(text)
    return digest.hexdigest()


def _module_files(package: Path, suffix: str) -> list[str]:
    """The files ending in `suffix` under `package`, in sorted order (__pycache__ only for .pyc)."""
    found: list[str] = []
    for folder, subfolders, names in os.walk(package):
        subfolders[:] = sorted(name for name in subfolders if suffix == ".pyc" or name != "__pycache__")
        found.extend(os.path.join(folder, name) for name in sorted(names) if name.endswith(suffix))
    return found


def installed_versions(distributions: Sequence[str], folders: Sequence[str]) -> dict[str, str]:
    """Each distribution's installed version ("absent" when not installed): read from the name of its
    `<name>-<version>.dist-info` folder in the first of `folders` that holds metadata of it (no import,
    one listing per folder), else from importlib.metadata (about 10 ms to import)."""
    found: dict[str, str | None] = {}
    for folder in folders:
        if len(found) == len(distributions):
            break
        try:
            entries = os.listdir(folder or ".")
        except OSError:
            continue
        for distribution in distributions:
            if distribution not in found:
                candidates = _metadata_entries(distribution, entries)
                if candidates:
                    found[distribution] = _dist_info_version(distribution, candidates)
    return {distribution: found.get(distribution) or _metadata_version(distribution) for distribution in distributions}


def _metadata_entries(distribution: str, entries: Sequence[str]) -> list[str]:
    name = distribution.replace("-", "_").lower()
    return [entry for entry in entries if entry.lower().startswith((f"{name}-", f"{name}."))
            and entry.endswith((".dist-info", ".egg-info", ".egg"))]


def _dist_info_version(distribution: str, candidates: list[str]) -> str | None:
    """The version in the name of the one .dist-info folder among `candidates`; None when that does not
    settle it (several, or another kind of metadata: importlib.metadata decides then)."""
    if len(candidates) != 1 or not candidates[0].endswith(".dist-info"):
        return None
    version = candidates[0][len(distribution) + 1:-len(".dist-info")]
    return version if version and "-" not in version else None


def _metadata_version(distribution: str) -> str:
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version(distribution)
    except PackageNotFoundError:
        return "absent"


# ----------------------------------------------------------------------------------------------
# content hashes

def content_hash(*parts: Any) -> str:
    """sha256 of the parts' canonical JSON: sorted keys, dataclasses as their fields, sets sorted, so the
    same content gives the same key in every process (set order varies with string hashing)."""
    text = json.dumps(parts, sort_keys=True, default=_canonical, ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _canonical(value: Any) -> Any:
    """A JSON-ready stand-in for what json cannot write itself."""
    if is_dataclass(value) and not isinstance(value, type):
        return {"__type__": type(value).__name__, **{item.name: getattr(value, item.name) for item in fields(value)}}
    if isinstance(value, (set, frozenset)):
        return sorted(value, key=lambda item: json.dumps(item, sort_keys=True, default=_canonical))
    if isinstance(value, Path):
        return str(value)
    raise TypeError(f"no canonical form for {type(value).__name__}")


# ----------------------------------------------------------------------------------------------
# the secret

def cache_secret() -> bytes:
    """The secret of the current cache folder ($SIZER_CACHE_DIR or the user's cache folder)."""
    return _secret_of(str(cache_root()))


@lru_cache(maxsize=8)
def _secret_of(root: str) -> bytes:
    path = Path(root) / SECRET_NAME
    found = _trusted_secret(path)
    if found is not None:
        return found
    import secrets  # only when a secret is made (random and base64 with it, 1.4 ms)

    made = secrets.token_bytes(SECRET_BYTES)
    try:
        _store_secret(path, made)
    except OSError:
        return made  # an unwritable cache: this process's secret alone
    return _trusted_secret(path) or made


def _trusted_secret(path: Path) -> bytes | None:
    """The secret in `path` if it is a plain file of SECRET_BYTES bytes, owned by this user and
    readable or writable by no one else; else None."""
    try:
        descriptor = os.open(path, os.O_RDONLY | getattr(os, "O_NOFOLLOW", 0))
    except OSError:
        return None
    try:
        status = os.fstat(descriptor)
        if not stat.S_ISREG(status.st_mode) or status.st_mode & 0o077 or status.st_size != SECRET_BYTES:
            return None
        if hasattr(os, "getuid") and status.st_uid != os.getuid():
            return None
        data = os.read(descriptor, SECRET_BYTES + 1)
        return data if len(data) == SECRET_BYTES else None
    finally:
        os.close(descriptor)


def _store_secret(path: Path, secret: bytes) -> None:
    """Write the secret owner-only, whole: a temporary file (mode 0600) moved into place. A secret
    another process stored meanwhile is kept when it is trusted (both then read the same one)."""
    import secrets

    path.parent.mkdir(parents=True, exist_ok=True)
    temporary = path.with_name(f".{SECRET_NAME}.{os.getpid()}.{secrets.token_hex(4)}")
    descriptor = os.open(temporary, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
    try:
        with os.fdopen(descriptor, "wb") as stream:
            stream.write(secret)
        try:
            os.link(temporary, path)  # fails where a secret is already in place
        except OSError:  # one is in place (or no hard links here): keep it only if trusted
            if _trusted_secret(path) is None:
                os.replace(temporary, path)
    finally:
        temporary.unlink(missing_ok=True)
