"""The seam for input formats: a file suffix picks the reader that builds the model.

Each format is one module with a loader (path -> ``model.Netlist``, raising
``InputErrors``) and an include finder (path -> the files it pulls in), and one
row of ``READERS``. Discovery asks ``design_suffixes()`` and ``included_files``;
everything else calls ``load_design``.
"""

from __future__ import annotations

import tempfile
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

from netcheck.alloc import collector_paused, loaded, release_frozen
from netcheck.input import cnet
from netcheck.model import Netlist

__all__ = [
    "Reader",
    "READERS",
    "design_suffixes",
    "included_files",
    "load_design",
    "read_design_text",
]


@dataclass(frozen=True)
class Reader:
    """One input format: how to load a design and how to find its includes."""

    load: Callable[..., Netlist]
    """``load(path, extra_parts, allow_outside, display_base) -> Netlist``."""
    includes: Callable[[Path], list[Path]]


# File suffix (lower case, with the dot) -> its reader.
READERS: dict[str, Reader] = {
    ".cnet": Reader(cnet.load_cnet, cnet.included_files),
}


def design_suffixes() -> tuple[str, ...]:
    """The suffixes of design files, as discovery looks for them."""
    return tuple(READERS)


def _reader(path: Path) -> Reader | None:
    return READERS.get(path.suffix.lower())


def included_files(path: Path) -> list[Path]:
    """The files that the design file ``path`` includes ([] for other files)."""
    reader = _reader(path)
    return reader.includes(path) if reader is not None else []


def load_design(
    path: Path,
    extra_parts: Sequence[Path] = (),
    allow_outside: bool = False,
    display_base: Path | None = None,
) -> Netlist:
    """Read the design whose top file is ``path``; raise InputErrors on bad input.

    The suffix picks the format; a file of no known suffix is read as .cnet
    (a design named on the command line may be called anything).
    """
    reader = _reader(path) or READERS[".cnet"]
    release_frozen()  # the previous design's objects (alloc.py)
    with collector_paused(freeze=True):
        netlist = reader.load(path, extra_parts, allow_outside, display_base)
        loaded(netlist)
    return netlist


def read_design_text(text: str, file: str = "design.cnet") -> Netlist:
    """Build a Netlist from text alone (tests and snippets; no includes or parts)."""
    with tempfile.TemporaryDirectory() as folder:
        target = Path(folder) / file
        target.write_text(text, encoding="utf-8")
        return load_design(target, display_base=Path(folder))
