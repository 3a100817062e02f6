"""Where a run is: the project root that shown paths are relative to.

SARIF URIs and fingerprints use the same root, so a baseline made in one
working directory matches from any other.
"""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

from netcheck.config import find_config

__all__ = ["project_root"]


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
