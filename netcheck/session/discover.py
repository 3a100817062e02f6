"""Discovery: the top-level designs among the paths named on the command line.

The input seam (``netcheck.input``) says which suffixes are designs and what a
design file includes; nothing here knows a file format.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from pathlib import Path

from netcheck.input import design_suffixes, included_files
from netcheck.report import display_path
from netcheck.session.settings import UsageError

__all__ = ["discover_designs"]


def _design_files(directory: Path) -> list[Path]:
    """List every design file below ``directory``, skipping hidden directories."""
    suffixes = design_suffixes()
    found = []
    for root, dirs, files in os.walk(directory):
        dirs[:] = sorted(d for d in dirs if not d.startswith("."))
        found += [Path(root) / f for f in sorted(files) if f.lower().endswith(suffixes)]
    return found


def _reach(starts: list[Path], graph: dict[Path, list[Path]]) -> set[Path]:
    seen: set[Path] = set()
    todo = list(starts)
    while todo:
        node = todo.pop()
        if node not in seen:
            seen.add(node)
            todo += graph.get(node, [])
    return seen


def _candidates(paths: Sequence[Path]) -> dict[Path, Path]:
    """Every design file named or below a named folder: resolved -> as given."""
    candidates: dict[Path, Path] = {}
    for path in paths:
        found = _design_files(path) if path.is_dir() else [path]
        if not found:
            kinds = ", ".join(design_suffixes())
            raise UsageError(f"{path}: no {kinds} files found below it")
        for file in found:
            candidates.setdefault(file.resolve(), Path(os.path.normpath(file)))
    return candidates


def discover_designs(paths: Sequence[Path]) -> list[Path]:
    """Return the top-level designs among ``paths``, sorted by display path.

    A directory stands for every design file below it. A file that another of
    the files includes is checked as part of that file, not on its own; files
    that are only reachable inside an include cycle are checked once so that the
    cycle is reported.
    """
    candidates = _candidates(paths)
    graph = {
        key: [t for t in included_files(key) if t in candidates] for key in candidates
    }
    included = {target for targets in graph.values() for target in targets}
    order = sorted(candidates, key=lambda key: display_path(candidates[key]))
    tops = [key for key in order if key not in included]
    covered = _reach(tops, graph)
    for key in order:
        if key not in covered:
            tops.append(key)
            covered |= _reach([key], graph)
    return sorted((candidates[key] for key in tops), key=display_path)
