"""Read a .cnet design's files: includes, confinement, waivers, part libraries."""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path

from netcheck.errors import IncludeError, InputError, InputErrors
from netcheck.input.cnet.parse import (
    ComponentStatement,
    FileStatement,
    WaiveStatement,
    decode_source,
    parse_text,
)
from netcheck.input.parts import load_library
from netcheck.model import Part, Waiver
from netcheck.source import Span

__all__ = ["Reader", "read_libraries", "MAX_FILE_BYTES", "MAX_INCLUDE_DEPTH"]

MAX_FILE_BYTES = 32 * 1024 * 1024
MAX_INCLUDE_DEPTH = 16


@dataclass
class Reader:
    """The statements, waivers and libraries of a design's files, in order."""

    root: Path
    allow_outside: bool
    display_base: Path
    errors: list[InputError] = field(default_factory=list)
    statements: list[ComponentStatement] = field(default_factory=list)
    waivers: list[Waiver] = field(default_factory=list)
    libraries: list[tuple[Path, Span | None]] = field(default_factory=list)
    files: list[str] = field(default_factory=list)
    title: str | None = None
    title_span: Span | None = None

    def display(self, path: Path) -> str:
        """The path as reports show it, relative to the display base."""
        try:
            return Path(os.path.relpath(path, self.display_base)).as_posix()
        except ValueError:
            return path.as_posix()

    def resolve(self, base: Path, text: str, span: Span, what: str) -> Path | None:
        """The file that ``text`` names from ``base``, or None (error recorded)."""
        try:
            target = (base.parent / text).resolve()
        except (RuntimeError, OSError) as problem:  # a symbolic-link loop
            self.errors.append(IncludeError(f"{what} {text!r}: {problem}", span))
            return None
        if not self.allow_outside and not target.is_relative_to(self.root):
            self.errors.append(
                IncludeError(
                    f"{what} {text!r} is outside the design's folder "
                    f"({self.display(self.root)}); --allow-outside permits it",
                    span,
                )
            )
            return None
        if not target.is_file():
            self.errors.append(IncludeError(f"{what} {text!r} not found", span))
            return None
        return target

    def read(self, path: Path, chain: tuple[Path, ...], span: Span | None) -> None:
        """Read one file of the design and, through its includes, the rest."""
        display = self.display(path)
        if path in chain:
            cycle = " -> ".join(self.display(p) for p in (*chain, path))
            self.errors.append(IncludeError(f"include cycle: {cycle}", span))
            return
        if len(chain) > MAX_INCLUDE_DEPTH:
            self.errors.append(
                IncludeError(f"includes nested deeper than {MAX_INCLUDE_DEPTH}", span)
            )
            return
        if path.stat().st_size > MAX_FILE_BYTES:
            self.errors.append(
                InputError(f"{display} is larger than {MAX_FILE_BYTES} bytes", span)
            )
            return
        self.files.append(display)
        try:
            parsed = parse_text(decode_source(path.read_bytes(), display), display)
        except InputErrors as errors:
            self.errors.extend(errors.errors)
            return
        except InputError as error:
            self.errors.append(error)
            return
        inner = (*chain, path)
        components = self.statements
        for statement in parsed.statements:
            if type(statement) is ComponentStatement:  # nearly all: no call each
                components.append(statement)
            else:
                self.statement(statement, path, inner)

    def statement(self, statement: object, path: Path, chain: tuple[Path, ...]) -> None:
        """Collect one statement: a component, a waiver, or a file statement."""
        if isinstance(statement, ComponentStatement):
            self.statements.append(statement)
        elif isinstance(statement, WaiveStatement):
            if not statement.reason.strip():
                self.errors.append(
                    InputError(
                        "a waiver needs a non-empty reason: say why the finding "
                        "is acceptable, e.g. waive "
                        f'{statement.rule} {statement.target} "diode fitted in the '
                        'valve plug"',
                        statement.reason_span,
                    )
                )
            self.waivers.append(
                Waiver(
                    statement.rule,
                    statement.target,
                    statement.reason,
                    statement.span,
                    statement.target_span,
                )
            )
        elif isinstance(statement, FileStatement):
            self.file_statement(statement, path, chain)

    def file_statement(
        self, statement: FileStatement, path: Path, chain: tuple[Path, ...]
    ) -> None:
        """Handle ``title``, ``parts`` or ``include``."""
        if statement.keyword == "title":
            if self.title_span is not None:
                self.errors.append(
                    InputError(
                        f"a second title (the first is at {self.title_span})",
                        statement.span,
                    )
                )
            self.title, self.title_span = statement.text, statement.span
        elif statement.keyword == "parts":
            target = self.resolve(
                path, statement.text, statement.text_span, "part library"
            )
            if target is not None:
                self.libraries.append((target, statement.text_span))
        else:
            target = self.resolve(path, statement.text, statement.text_span, "include")
            if target is not None:
                self.read(target, chain, statement.text_span)


def read_libraries(reader: Reader, extra: Sequence[Path]) -> dict[str, Part]:
    """Load the design's part libraries and ``extra`` ones, later ones winning."""
    parts: dict[str, Part] = {}
    for path, span in [*reader.libraries, *((p, None) for p in extra)]:
        try:
            parts.update(load_library(path, reader.display(path)))
        except InputErrors as errors:
            reader.errors.extend(errors.errors)
        except InputError as error:
            if error.span is None:
                error.span = span
            reader.errors.append(error)
    return parts
