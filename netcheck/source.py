"""Source positions (spans) and excerpts with a caret for error messages."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

__all__ = ["Span", "excerpt", "register_text"]

# The lines of every file read, so that an error can show its line without
# re-reading. Lines are split at "\n" only, as the parser counts them (not at
# form feeds or U+2028 as str.splitlines would).
_LINES: dict[str, list[str]] = {}


def register_text(file: str, text: str) -> None:
    """Remember a file's text for later excerpts (replacing any earlier one)."""
    _LINES[file] = [line.rstrip("\r") for line in text.split("\n")]


@dataclass(frozen=True, order=True)
class Span:
    """A 1-based region of a file; end is exclusive."""

    file: str
    line: int
    column: int
    end_line: int = 0
    end_column: int = 0

    def __str__(self) -> str:
        return f"{self.file}:{self.line}:{self.column}"


def _line_of(span: Span) -> str | None:
    lines = _LINES.get(span.file)
    if lines is None:
        try:
            text = Path(span.file).read_text(encoding="utf-8", errors="replace")
        except OSError:
            return None
        register_text(span.file, text)
        lines = _LINES[span.file]
    if 1 <= span.line <= len(lines):
        return lines[span.line - 1]
    return None


def excerpt(span: Span) -> str:
    """Return the source line of ``span`` and a caret under it ('' if unknown)."""
    line = _line_of(span)
    if line is None:
        return ""
    line = line.replace("\t", " ")
    width = 1
    if span.end_line == span.line and span.end_column > span.column:
        width = span.end_column - span.column
    width = max(1, min(width, len(line) - span.column + 1))
    return f"{line}\n{' ' * (span.column - 1)}{'^' * width}"
