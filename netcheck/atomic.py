"""Atomic file writing: a temporary file in the same directory, renamed into place.

A reader (or a CI step that uploads the report) sees either the old file or the
complete new one, never a half-written file.
"""

from __future__ import annotations

import contextlib
import os
import tempfile
from pathlib import Path

__all__ = ["write_text_atomic"]


def write_text_atomic(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` to ``path`` atomically, as UTF-8 with newline line ends.

    The temporary file is created next to the target so that ``os.replace`` is a
    rename within one file system; it is removed if anything fails.
    """
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    fd, temp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=directory)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as handle:
            handle.write(text)
            handle.flush()
            os.fsync(handle.fileno())
        _keep_mode(target, temp)
        os.replace(temp, target)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(temp)
        raise


def _keep_mode(target: Path, temp: str) -> None:
    """Give the new file the old file's mode, or the umask default for a new file."""
    try:
        mode = target.stat().st_mode & 0o777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        mode = 0o666 & ~umask
    os.chmod(temp, mode)
