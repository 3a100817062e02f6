"""The one output funnel: every command writes its product and messages through it.

So encoding, colour and ``-o FILE`` behave the same for every command:

- ``-o FILE`` writes the product atomically as UTF-8 (never the terminal view);
  ``stream`` writes a product made in pieces, each piece encoded and written as
  it comes (``atomic.write_atomic``), so a large report is never held whole;
- on standard output or error, a character the stream's encoding cannot hold is
  spelled in ASCII (``µ`` -> ``u``, ``Ω`` -> ``ohm``, ``°`` -> ``deg``, table
  borders as ``+-|``; anything else becomes ``?``): an ASCII or cp1252 console
  never crashes;
- colour only on a terminal, and never with ``--no-color`` or ``NO_COLOR`` set.
"""

from __future__ import annotations

import os
import sys
from typing import TYPE_CHECKING, NamedTuple, TextIO

if TYPE_CHECKING:
    from collections.abc import Callable
    from pathlib import Path

__all__ = ["ASCII_SPELLINGS", "Output", "Terminal", "encodable", "stdout_is_terminal"]

# How a symbol is written where the stream cannot encode it (SI unit names where
# the symbol is a unit; common practice for the rest).
ASCII_SPELLINGS = {
    "\u00b5": "u",  # MICRO SIGN, as pint prints the prefix
    "\u03bc": "u",  # GREEK SMALL LETTER MU
    "\u2126": "ohm",  # OHM SIGN
    "\u03a9": "ohm",  # GREEK CAPITAL LETTER OMEGA
    "\u00b0": "deg",
    "\u00bd": "1/2",
    "\u00b2": "^2",
    "\u00b7": "*",
    "\u00d7": "x",
    "\u2264": "<=",
    "\u2265": ">=",
    "\u2192": "->",
    "\u2013": "-",
    "\u2014": "--",
    "\u2026": "...",
    "\u2018": "'",
    "\u2019": "'",
    "\u201c": '"',
    "\u201d": '"',
}


def _spelling(char: str) -> str:
    """The ASCII spelling of a character: the table, box lines, else ``?``."""
    if char in ASCII_SPELLINGS:
        return ASCII_SPELLINGS[char]
    import unicodedata

    name = unicodedata.name(char, "")
    if name.startswith("BOX DRAWINGS"):  # rich's table borders
        ways = set(name.split()) & {"HORIZONTAL", "VERTICAL", "LEFT", "RIGHT", "UP"}
        ways |= {"UP"} if "DOWN" in name.split() else set()
        if ways <= {"HORIZONTAL", "LEFT", "RIGHT"} and len(ways) == 1:
            return "-"
        return "|" if ways in ({"VERTICAL"}, {"UP"}) else "+"
    return "?"


def encodable(text: str, encoding: str | None) -> str:
    """Return ``text`` with every character ``encoding`` cannot hold spelled out."""
    if not encoding:
        return text
    try:
        text.encode(encoding)
        return text
    except (UnicodeEncodeError, LookupError):
        pass
    out = []
    for char in text:
        try:
            char.encode(encoding)
            out.append(char)
        except (UnicodeEncodeError, LookupError):
            spelled = _spelling(char)
            out.append(spelled.encode(encoding, errors="replace").decode(encoding))
    return "".join(out)


def stdout_is_terminal() -> bool:
    """Tell whether standard output is a terminal (tests replace this)."""
    isatty = getattr(sys.stdout, "isatty", None)
    return bool(isatty and isatty())


class Terminal(NamedTuple):
    """Where output goes and how it may look."""

    is_terminal: bool
    color: bool
    width: int


def _write(stream: TextIO, text: str) -> None:
    stream.write(encodable(text, getattr(stream, "encoding", None)))
    stream.flush()


class Output:
    """A command's output: its product to ``path`` or standard output."""

    def __init__(self, path: Path | None = None, no_color: bool = False) -> None:
        self.path = path
        self.no_color = no_color

    @property
    def terminal(self) -> Terminal:
        """Terminal view only on a tty with no ``-o``; colour unless refused."""
        is_tty = self.path is None and stdout_is_terminal()
        refused = self.no_color or bool(os.environ.get("NO_COLOR"))
        width = 100
        if is_tty:
            import shutil

            width = shutil.get_terminal_size((100, 24)).columns
        return Terminal(is_tty, is_tty and not refused, width)

    def write(self, text: str) -> None:
        """Write the command's product: atomically to ``-o FILE``, else stdout."""
        if self.path is None:
            _write(sys.stdout, text)
            return
        from netcheck.atomic import write_text_atomic

        write_text_atomic(self.path, text)

    def stream(self, produce: Callable[[Callable[[str], object]], None]) -> None:
        """Write what ``produce(sink)`` hands ``sink``, piece by piece, as ``write``.

        To ``-o FILE`` atomically (a failure midway leaves no file and the old
        one as it was); to standard output with each piece spelled as
        ``write`` spells the whole (``encodable`` works character by character).
        """
        if self.path is None:
            stream = sys.stdout
            encoding = getattr(stream, "encoding", None)
            produce(lambda piece: stream.write(encodable(piece, encoding)))
            stream.flush()
            return
        from netcheck.atomic import write_atomic

        write_atomic(self.path, produce)

    def say(self, line: str) -> None:
        """A status line for the person running the command (stdout)."""
        _write(sys.stdout, line + "\n")

    def error(self, text: str) -> None:
        """An error report (stderr), one or more lines."""
        _write(sys.stderr, text.rstrip("\n") + "\n")
