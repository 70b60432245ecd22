"""Files the tool writes: checked before any work (`check_output`), then written whole or not at all
(`write_atomic`: a temporary file beside the target, then an atomic rename)."""

from __future__ import annotations

import errno
import os
import stat
from pathlib import Path
from typing import Iterable

from sizer.errors import InputError

_ANY_WRITE = stat.S_IWUSR | stat.S_IWGRP | stat.S_IWOTH


def check_output(path: str | Path, option: str, inputs: Iterable[str | Path] = ()) -> Path:
    """`path` if sizer may write a file there, else InputError naming `option` (e.g. "-o").

    Refused: a folder, something that is not a plain file, a folder that does not exist (it is not
    created) or cannot be written, a file that is read-only (no write permission for this user, or
    marked read-only for everyone), and any of `inputs` (the files the command reads)."""
    path = Path(path)
    shown = str(path)
    folder = path.parent
    if path.is_dir():
        raise InputError("", option, f"{shown!r} is a folder", "give a file name, e.g. " + str(path / f"out{path.suffix or '.html'}"))
    if path.exists() and not path.is_file():
        raise InputError("", option, f"{shown!r} is not a plain file", "give the name of a file to write")
    for source in inputs:
        if _same_file(path, Path(source)):
            raise InputError("", option, f"{shown!r} is the input file {str(source)!r}: writing there would replace it", "give another file name")
    if not folder.is_dir():
        raise InputError("", option, f"the folder {str(folder)!r} does not exist", "create the folder first, or give a file in an existing folder")
    if not _writable(folder, os.W_OK | os.X_OK):
        raise InputError("", option, f"cannot write into the folder {str(folder)!r} (read-only)", "give a file in a folder you can write")
    if path.exists() and not _writable(path, os.W_OK):
        raise InputError("", option, f"{shown!r} is read-only", "give another file name, or make the file writable first")
    return path


def check_record_folder(folder: Path, option: str) -> Path:
    """`folder` if sizer may put records there: a folder it can write, or none yet (made when the
    records are written, beside a file check_output allowed); else InputError naming `option`."""
    if folder.exists() and not folder.is_dir():
        raise InputError("", option, f"{str(folder)!r} is in the way: the records go into a folder of that name",
                         "move that file away, or give another file name")
    if folder.is_dir() and not _writable(folder, os.W_OK | os.X_OK):
        raise InputError("", option, f"cannot write into the folder {str(folder)!r} (read-only)", "give a file in a folder you can write")
    return folder


def write_all(outputs: Iterable[tuple[Path, bytes | str]]) -> None:
    """Write every (path, data) atomically, in order; if one fails, the files and folders this call
    made are removed again (files it replaced cannot be restored) and the error raised: no run
    leaves part of its outputs behind."""
    made: list[Path] = []
    try:
        for path, data in outputs:
            path = Path(path)
            missing = [folder for folder in (path.parent, *path.parent.parents) if not folder.exists()]
            new = not path.exists()
            write_atomic(path, data)
            made.extend(missing[::-1] + ([path] if new else []))  # removed in reverse: the file, then its new folders
    except BaseException:
        for path in reversed(made):
            try:
                path.rmdir() if path.is_dir() else path.unlink()
            except OSError:
                pass
        raise


def _same_file(a: Path, b: Path) -> bool:
    try:
        return a.exists() and b.exists() and os.path.samefile(a, b)
    except OSError:
        return False


def _writable(path: Path, mode: int) -> bool:
    """True when this user may write `path` and it is not marked read-only for everyone (so that a
    read-only mark holds even for an administrator, whom os.access always lets write)."""
    try:
        return os.access(path, mode) and bool(path.stat().st_mode & _ANY_WRITE)
    except OSError:
        return False


MAX_INPUT_BYTES = 16 * 2**20  # the largest input file sizer reads (member, schedule, span table, catalogue)


def read_text(path: str | Path, what: str = "the file", fix: str = "check the path") -> str:
    """The UTF-8 text of a file the user named (a leading byte-order mark kept for the caller);
    InputError naming it where it cannot be read, is not a plain file (a device, a pipe: /dev/zero
    would never end) or is larger than MAX_INPUT_BYTES."""
    try:
        return read_bytes(path, what).decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputError(str(path), "", f"{what} is not UTF-8 text (byte {exc.start + 1})", "save it as UTF-8 text") from None
    except OSError as exc:
        raise InputError(str(path), "", f"cannot read {what} ({exc.strerror or exc})", fix) from None


def read_bytes(path: str | Path, what: str = "the file") -> bytes:
    """The bytes of a plain file of at most MAX_INPUT_BYTES; InputError for anything else (OSError
    where it cannot be opened)."""
    with open(path, "rb") as stream:
        if not stat.S_ISREG(os.fstat(stream.fileno()).st_mode):
            raise InputError(str(path), "", f"{what} is not a plain file (a folder, device or pipe)", "give the path of a text file")
        data = stream.read(MAX_INPUT_BYTES + 1)
    if len(data) > MAX_INPUT_BYTES:
        raise InputError(str(path), "", f"{what} is larger than sizer reads ({MAX_INPUT_BYTES // 2**20} MiB)",
                         "split it into smaller files (see docs/limits.md)")
    return data


def write_atomic(path: str | Path, data: bytes | str, durable: bool = True) -> None:
    """Write `data` to `path` atomically (temp file in the same folder, fsync, os.replace). A file
    that is replaced keeps its permissions; a new one gets the usual mode (0o666 less the umask).
    A read-only file is not replaced (PermissionError). Missing folders are made (caches); a file
    the user named is checked with check_output first, which refuses a missing folder.
    `durable=False` skips the fsync: for cache entries that are checked when read and redone when
    damaged, where a power cut may lose the entry but no reader ever sees half of it."""
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else data
    path.parent.mkdir(parents=True, exist_ok=True)
    if path.exists() and not _writable(path, os.W_OK):
        raise PermissionError(errno.EACCES, "the file is read-only", str(path))
    import tempfile

    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        os.chmod(temporary, _mode_for(path))  # mkstemp makes 0600
        with os.fdopen(handle, "wb") as stream:
            stream.write(payload)
            stream.flush()
            if durable:
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
