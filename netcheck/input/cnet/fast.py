"""A line-oriented reader for well-formed ``.cnet`` text, without lark.

Almost every file of a design is well formed and made of a few statement shapes
(``kind ref key=value ... terminal:net ...``, ``title``/``parts``/``include``
with a string, ``waive``). Lexing them token by token through lark costs
several microseconds a token; this reads each line with one regular
expression instead. It reads only what it is sure of: a statement with
anything else (a syntax error, a space around ``=`` or ``:``, a keyword used as
a name) is handed alone to the grammar, its lines and positions kept; if the
grammar finds an error there, or the file's lines themselves are unusual (a
form feed, a stray carriage return, an indented first line), it gives up and
returns None, and ``parse.parse_text`` reads the whole file with the lark
parser, which finds and words every error. So the grammar stays the one
definition of the language; ``tests/test_fast_parse.py`` checks over every
``.cnet`` file in the repository and a generated corpus that both readers give
the same statements, spans included, and the same errors.
"""

from __future__ import annotations

import re
import sys
from collections.abc import Callable

from netcheck.input.cnet.statements import (
    ComponentStatement,
    FileStatement,
    RawAttribute,
    Statement,
    WaiveStatement,
    unquote,
)
from netcheck.source import Span

__all__ = ["fast_statements"]

# The grammar's terminals (grammar/cnet.lark), as written there.
_NAME = r"[A-Za-z0-9_+\-.\/~!*]+"
_VALUE = r"[^\s=:\"#]+"
_STRING = r'"(?:[^"\\\r\n]|\\.)*"'
# The grammar's keywords: a name spelled like one is lexed as the keyword.
KEYWORDS = frozenset({"title", "parts", "include", "waive"})

# One token of a line, after optional blanks: key=value, terminal:net, a bare
# name, or a string. Each must end at a blank, a comment or the line's end;
# anything else is left to the grammar. The last group that matched tells the
# shape (``match.lastindex``): 2 a quoted value, 3 a value, 5 a net, 6 a name,
# 7 a string.
_TOKEN = re.compile(
    rf"[ \t]*(?:"
    rf"({_NAME})=(?:({_STRING})|({_VALUE}))"
    rf"|({_NAME}):({_NAME})"
    rf"|({_NAME})"
    rf"|({_STRING})"
    rf")(?=[ \t]|#|\Z)"
)
_REST = re.compile(r"[ \t]*(?:#.*)?\Z")
_BLANK = _REST

# A token: (shape, first text, second text, line, column, end column); shapes
# are ITEM (key and value), QUOTED (key and quoted value), LINK (terminal and
# net), NAME and STRING (one text). Tokens never span lines.
ITEM, QUOTED, LINK, NAME, STRING = range(5)
Token = tuple[int, str, str, int, int, int]
# match.lastindex -> (shape, group of the token's start, first, second text).
_SHAPES = {
    2: (QUOTED, 1, 1, 2),
    3: (ITEM, 1, 1, 3),
    5: (LINK, 4, 4, 5),
    6: (NAME, 6, 6, 0),
    7: (STRING, 7, 7, 0),
}


class _GiveUp(Exception):
    """The text is not certainly well formed: leave it to the grammar."""


def _line_tokens(line: str, number: int, tokens: list[Token]) -> None:
    """Append the tokens of ``line`` to ``tokens``; raise _GiveUp if unsure."""
    at = 0
    shapes = _SHAPES
    # Kinds, keys, terminals, values and nets repeat throughout a design: one
    # string each (interned) instead of one per token, a tenth of the model.
    intern = sys.intern
    for match in _TOKEN.finditer(line):
        if match.start() != at:
            break  # something no token explains: only a comment may follow
        at = match.end()
        shape, begin, first, second = shapes[match.lastindex]  # type: ignore[index]
        tokens.append(
            (
                shape,
                intern(match[first]),
                intern(match[second]) if second else "",
                number,
                match.start(begin) + 1,
                at + 1,
            )
        )
    if not _REST.match(line, at):
        raise _GiveUp


class _Statement:
    """The lines of one statement (first and last line numbers) and its tokens.

    ``tokens`` is None once a line of it is not certainly well formed.
    """

    __slots__ = ("first", "last", "tokens")

    def __init__(self, first: int) -> None:
        self.first = self.last = first
        self.tokens: list[Token] | None = []

    def add(self, line: str, number: int) -> None:
        self.last = number
        if self.tokens is not None:
            try:
                _line_tokens(line, number, self.tokens)
            except _GiveUp:
                self.tokens = None


def _statements_lines(lines: list[str]) -> list[_Statement]:
    """The statements of a file's lines, continuation lines joined.

    A line that starts with a blank continues the statement above; blank and
    comment-only lines belong to none (the grammar's own rules, cnet.lark).
    """
    statements: list[_Statement] = []
    current: _Statement | None = None
    for number, line in enumerate(lines, start=1):
        if line.endswith("\r"):
            line = line[:-1]
        if "\r" in line or "\f" in line:
            raise _GiveUp  # how the grammar breaks such a line is its business
        if _BLANK.match(line):
            continue
        if line[0] in " \t":
            if current is None:
                raise _GiveUp  # an indented first statement: the grammar words it
        else:
            current = _Statement(number)
            statements.append(current)
        current.add(line, number)
    return statements


def _new_span(
    file: str, line: int, column: int, end_line: int, end_column: int
) -> Span:
    """``Span(...)`` without the frozen dataclass's five ``__setattr__`` calls.

    Half a dozen spans are made per statement, and the frozen ``__init__`` was
    a tenth of the read; the object is the same (tests compare them equal).
    """
    span = _NEW(Span)
    fields = span.__dict__
    fields["file"] = file
    fields["line"] = line
    fields["column"] = column
    fields["end_line"] = end_line
    fields["end_column"] = end_column
    return span


_NEW = object.__new__


def _span(file: str, first: Token, last: Token) -> Span:
    return _new_span(file, first[3], first[4], last[3], last[5])


def _check_names(*texts: str) -> None:
    if not KEYWORDS.isdisjoint(texts):
        raise _GiveUp  # how the grammar lexes a keyword there is its business


def _items(
    file: str, tokens: list[Token]
) -> tuple[list[RawAttribute], list[tuple[str, str, Span]]]:
    attributes: list[RawAttribute] = []
    connections: list[tuple[str, str, Span]] = []
    keywords = KEYWORDS  # how the grammar lexes a keyword there is its business
    for shape, first, second, line, column, end in tokens:
        if first in keywords:
            raise _GiveUp
        span = _new_span(file, line, column, line, end)
        if shape == LINK:
            if second in keywords:
                raise _GiveUp
            connections.append((first, second, span))
            continue
        if shape == ITEM:
            if second in keywords:
                raise _GiveUp
            text, quoted = second, False
        elif shape == QUOTED:
            text, quoted = unquote(second), True
        else:
            raise _GiveUp
        attributes.append(RawAttribute(first, text, quoted, span))
    return attributes, connections


def _component(file: str, tokens: list[Token]) -> ComponentStatement:
    if len(tokens) < 2 or tokens[0][0] != NAME or tokens[1][0] != NAME:
        raise _GiveUp
    kind, ref = tokens[0], tokens[1]
    _check_names(ref[1])
    attributes, connections = _items(file, tokens[2:])
    return ComponentStatement(
        kind=kind[1],
        ref=ref[1],
        attributes=tuple(attributes),
        connections=tuple(connections),
        span=_span(file, kind, tokens[-1]),
        ref_span=_span(file, ref, ref),
    )


def _keyword_statement(
    file: str, tokens: list[Token]
) -> FileStatement | WaiveStatement:
    keyword, last = tokens[0], tokens[-1]
    if last[0] != STRING:
        raise _GiveUp
    span = _span(file, keyword, last)
    last_span = _span(file, last, last)
    if keyword[1] != "waive":
        if len(tokens) != 2:
            raise _GiveUp
        return FileStatement(keyword[1], unquote(last[1]), span, last_span)
    if len(tokens) != 4 or tokens[1][0] != NAME or tokens[2][0] not in (NAME, LINK):
        raise _GiveUp
    rule, target = tokens[1], tokens[2]
    _check_names(rule[1], target[1], target[2])
    return WaiveStatement(
        rule[1],
        f"{target[1]}:{target[2]}" if target[0] == LINK else target[1],
        unquote(last[1]),
        span,
        _span(file, target, target),
        last_span,
    )


# Parses the text of some lines of a file (a statement the line reader is not
# sure of) with the grammar: (text, lines before it) -> its statements with
# their spans in the file, or None if the grammar finds any error there.
Grammar = Callable[[str, int], "list[Statement] | None"]


def fast_statements(
    text: str, file: str, grammar: Grammar | None = None
) -> list[Statement] | None:
    """The statements of ``text`` if it is certainly well formed, else None.

    With ``grammar``, a statement the line reader is not sure of is handed to
    it alone (its lines, positions kept); None only if the grammar finds an
    error in one, or the file's line structure itself is unusual (a form
    feed, a stray carriage return, an indented first line). The caller then
    reads the whole file with the grammar, so every error and caret is the
    grammar's, as if the line reader did not exist.
    """
    try:
        lines = text.split("\n")
        out: list[Statement] = []
        for statement in _statements_lines(lines):
            read = _statement(file, statement.tokens)
            if read is not None:
                out.append(read)
                continue
            if grammar is None:
                return None
            chunk = "\n".join(lines[statement.first - 1 : statement.last])
            parsed = grammar(chunk, statement.first - 1)
            if parsed is None:
                return None
            out.extend(parsed)
        return out
    except _GiveUp:
        return None


def _statement(file: str, tokens: list[Token] | None) -> Statement | None:
    """One statement from its tokens, or None if the line reader is unsure."""
    if tokens is None:
        return None
    try:
        first = tokens[0]
        if first[0] == NAME and first[1] in KEYWORDS:
            return _keyword_statement(file, tokens)
        return _component(file, tokens)
    except _GiveUp:
        return None
