"""Files the tool writes are written whole or not at all: a temporary file beside the target, then
an atomic rename."""

from __future__ import annotations

import os
import stat
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
    """Write `data` to `path` atomically (temp file in the same folder, fsync, os.replace). A file
    that is replaced keeps its permissions; a new one gets the usual mode (0o666 less the umask)."""
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else data
    path.parent.mkdir(parents=True, exist_ok=True)
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        os.chmod(temporary, _mode_for(path))  # mkstemp makes 0600
        with os.fdopen(handle, "wb") as stream:
            stream.write(payload)
            stream.flush()
            os.fsync(stream.fileno())
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise


def _mode_for(path: Path) -> int:
    """The mode the written file should have: the existing file's, else 0o666 less the umask."""
    try:
        return stat.S_IMODE(path.stat().st_mode)
    except OSError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask
