"""The session: many designs, one project root, one report.

For now this holds the pieces that decide *where* a run is: the project root
that every shown path, SARIF URI and fingerprint is relative to, and the cheap
include scan that discovery uses to leave included sheets to their includer.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from pathlib import Path

from netcheck.config import find_config

__all__ = ["included_files", "project_root"]


def project_root(paths: Sequence[Path], config: Path | None = None) -> Path:
    """Return the absolute folder that paths are shown relative to.

    The folder of the configuration in use (``config``, else the nearest
    ``netcheck.yaml`` of the first checked path), else the git top level (the
    nearest folder above it holding ``.git``), else the checked path itself (a
    folder, or a file's folder). Nothing here depends on the working directory
    except how a relative ``paths[0]`` is read.
    """
    start = Path(paths[0]).resolve() if paths else Path.cwd().resolve()
    folder = start if start.is_dir() else start.parent
    found = config if config is not None else find_config(folder)
    if found is not None:
        return Path(found).resolve().parent
    for candidate in (folder, *folder.parents):
        if (candidate / ".git").exists():
            return candidate
    return folder


# An include statement starts in column 1 (language.md, "Lexical rules").
_INCLUDE = re.compile(r'^include[ \t]+"((?:[^"\\\r\n]|\\.)*)"', re.MULTILINE)


def included_files(file: Path) -> list[Path]:
    """Return the files that ``file`` includes, resolved, by a cheap scan.

    No parsing: a file that cannot be read includes nothing here, and the
    pipeline reports it properly when it checks it.
    """
    try:
        text = file.read_text(encoding="utf-8", errors="replace")
    except OSError:
        return []
    names = (re.sub(r"\\(.)", r"\1", m.group(1)) for m in _INCLUDE.finditer(text))
    found = []
    for name in names:
        try:
            found.append((file.parent / name).resolve())
        except (RuntimeError, OSError):
            continue  # a symbolic-link loop: the pipeline reports it, located
    return found
