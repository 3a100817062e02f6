"""The include targets of a .cnet file, found by the language's own lexer.

Discovery needs them before any design is read (a file that another file
includes is not a design of its own), and a broken file must not stop it, so
this lexes rather than parses: an ``include`` keyword that opens a statement,
followed by its string. A line the lexer cannot read is skipped; the reader
reports it, located, when the design is loaded.
"""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

from lark import Token
from lark.exceptions import UnexpectedCharacters

from netcheck.input.cnet.fast import fast_statements
from netcheck.input.cnet.parse import parser, unquote
from netcheck.input.cnet.statements import FileStatement

__all__ = ["included_files", "include_names", "lexed_include_names"]


def _tokens(text: str) -> Iterator[Token]:
    """Every token of ``text``; after a lexing error, go on at the next line."""
    while True:
        try:
            yield from parser().lex(text)
            return
        except UnexpectedCharacters as error:
            yield Token("_NL", "\n")
            lines = text.split("\n")
            if error.line >= len(lines):
                return
            text = "\n".join(lines[error.line :])


def include_names(text: str) -> list[str]:
    """The strings of the ``include`` statements of ``text``, unquoted, in order.

    Well-formed text is read by the fast reader (no lark); other text is lexed.
    Text without the word is not read at all: discovery asks this of every
    file of a folder, sheets included, before any design is loaded.
    """
    if "include" not in text:
        return []
    statements = fast_statements(text, "")
    if statements is None:
        return lexed_include_names(text)
    return [
        s.text
        for s in statements
        if isinstance(s, FileStatement) and s.keyword == "include"
    ]


def lexed_include_names(text: str) -> list[str]:
    """``include_names`` by the grammar's lexer, for text of any shape."""
    names: list[str] = []
    previous: Token | None = None
    keyword = False
    for token in _tokens(text):
        if keyword and token.type == "STRING":
            names.append(unquote(token))
        keyword = token.type == "INCLUDE" and (
            previous is None or previous.type == "_NL"
        )
        previous = token
    return names


def included_files(path: Path) -> list[Path]:
    """The files that the .cnet file ``path`` includes, resolved; [] if unreadable."""
    try:
        text = path.read_bytes().decode("utf-8", errors="replace")
    except OSError:
        return []  # the reader reports the unreadable file properly
    found = []
    for name in include_names(text):
        try:
            found.append((path.parent / name).resolve())
        except (RuntimeError, OSError):
            continue  # a symbolic-link loop: the reader reports it, located
    return found
