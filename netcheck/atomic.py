"""Atomic file writing: a temporary file in the same directory, renamed into place.

A reader (or a CI step that uploads the report) sees either the old file or the
complete new one, never a half-written file. ``write_atomic`` takes a producer
that writes the text piece by piece (a large report is encoded and written in
chunks, never held whole as one string and one encoded copy);
``write_text_atomic`` writes one string.
"""

from __future__ import annotations

import contextlib
import os
import tempfile
from collections.abc import Callable
from pathlib import Path

__all__ = ["write_atomic", "write_text_atomic"]


def write_text_atomic(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` to ``path`` atomically, as UTF-8 with newline line ends."""
    write_atomic(path, lambda write: write(text))


def write_atomic(
    path: str | os.PathLike[str], produce: Callable[[Callable[[str], object]], None]
) -> None:
    """Write what ``produce(write)`` writes to ``path`` atomically, as UTF-8.

    ``produce`` calls ``write`` with the text in pieces, in order; newlines are
    written as they are. The temporary file is created next to the target so
    that ``os.replace`` is a rename within one file system; it is removed if
    anything fails, ``produce`` raising included, and the target is untouched.
    """
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    fd, temp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=directory)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as handle:
            produce(handle.write)
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
