"""Files the tool writes are written whole or not at all: a temporary file beside the target, then
an atomic rename."""

from __future__ import annotations

import os
import tempfile
from functools import lru_cache
from pathlib import Path


def cache_root() -> Path:
    """The folder for sizer's caches: $SIZER_CACHE_DIR, else the user's cache folder (platformdirs)."""
    return Path(_cache_root(os.environ.get("SIZER_CACHE_DIR", "")))


@lru_cache(maxsize=8)
def _cache_root(override: str) -> str:
    if override:
        return override
    import platformdirs

    return platformdirs.user_cache_dir("sizer")


def write_atomic(path: str | Path, data: bytes | str) -> None:
    """Write `data` to `path` atomically (temp file in the same folder, fsync, os.replace)."""
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else data
    path.parent.mkdir(parents=True, exist_ok=True)
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        os.chmod(temporary, 0o666 & ~_current_umask())  # mkstemp makes 0600; give the usual mode
        with os.fdopen(handle, "wb") as stream:
            stream.write(payload)
            stream.flush()
            os.fsync(stream.fileno())
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise


def _current_umask() -> int:
    """The process umask (read by setting and restoring it)."""
    mask = os.umask(0)
    os.umask(mask)
    return mask
