"""Keyed digests of the files sizer keeps in its cache folder: HMAC-SHA256 with a secret of the cache's
own, kept beside it (`secret.key`, 32 random bytes, readable and writable by its owner alone).

A plain hash only finds damage: whoever changes a cached file can change its hash with it. A keyed
digest cannot be made without the secret, so a file changed by anyone who cannot read the secret
fails its digest and is recomputed. The secret is made on first use; one that is not a plain file of
the right size owned by this user with owner-only permissions is not trusted: it is replaced by a new
one (every file digested with the old one is then recomputed once). Where the cache folder cannot be
written, the secret lives in this process alone (nothing can be kept then anyway).
"""

from __future__ import annotations

import hashlib
import hmac
import os
import secrets
import stat
from functools import lru_cache
from pathlib import Path

from sizer.files import cache_root

SECRET_NAME = "secret.key"
SECRET_BYTES = 32


def keyed_digest(data: bytes) -> str:
    """HMAC-SHA256 (hex) of `data` under the cache's secret."""
    return hmac.new(cache_secret(), data, hashlib.sha256).hexdigest()


def digest_matches(data: bytes, digest: object) -> bool:
    """True when `digest` is the keyed digest of `data` (compared in constant time)."""
    return isinstance(digest, str) and hmac.compare_digest(keyed_digest(data), digest)


def cache_secret() -> bytes:
    """The secret of the current cache folder ($SIZER_CACHE_DIR or the user's cache folder)."""
    return _secret_of(str(cache_root()))


@lru_cache(maxsize=8)
def _secret_of(root: str) -> bytes:
    path = Path(root) / SECRET_NAME
    found = _trusted_secret(path)
    if found is not None:
        return found
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
