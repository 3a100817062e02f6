"""A line-oriented reader for well-formed ``.cnet`` text, without lark.

Almost every file of a design is well formed and made of a few statement shapes
(``kind ref key=value ... terminal:net ...``, ``title``/``parts``/``include``
with a string, ``waive``). Lexing them token by token through lark costs
several microseconds a token; this reads each line with one regular
expression instead. It reads only text it is sure of: anything else (a syntax
error, a space around ``=`` or ``:``, a keyword used as a name, a form feed, a
stray carriage return, an indented first line) makes it give up and return
None, and ``parse.parse_text`` then reads the file with the lark parser, which
finds and words every error. So the grammar stays the one definition of the
language; ``tests/input/test_fast_parse.py`` checks over every ``.cnet`` file
in the repository and a generated corpus that both readers give the same
statements, spans included.
"""

from __future__ import annotations

import re

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
# anything else is left to the grammar.
_TOKEN = re.compile(
    rf"[ \t]*("
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


class _GiveUp(Exception):
    """The text is not certainly well formed: leave it to the grammar."""


def _line_tokens(line: str, number: int) -> list[Token]:
    tokens: list[Token] = []
    at = 0
    for match in _TOKEN.finditer(line):
        if match.start() != at:
            break  # something no token explains: only a comment may follow
        at = match.end()
        key, quoted, value, terminal, net, name, string = match.groups()[1:]
        start = match.start(1) + 1
        if key is not None:
            if quoted is not None:
                tokens.append((QUOTED, key, quoted, number, start, at + 1))
            else:
                tokens.append((ITEM, key, value, number, start, at + 1))
        elif terminal is not None:
            tokens.append((LINK, terminal, net, number, start, at + 1))
        elif name is not None:
            tokens.append((NAME, name, "", number, start, at + 1))
        else:
            tokens.append((STRING, string, "", number, start, at + 1))
    if not _REST.match(line, at):
        raise _GiveUp
    return tokens


def _statements_tokens(text: str) -> list[list[Token]]:
    """The tokens of each statement, continuation lines joined."""
    statements: list[list[Token]] = []
    for number, line in enumerate(text.split("\n"), start=1):
        if line.endswith("\r"):
            line = line[:-1]
        if "\r" in line or "\f" in line:
            raise _GiveUp
        if _BLANK.match(line):
            continue
        tokens = _line_tokens(line, number)
        if line[0] in " \t":
            if not statements:
                raise _GiveUp  # an indented first statement: the grammar words it
            statements[-1].extend(tokens)
        else:
            statements.append(tokens)
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
    for shape, first, second, line, column, end in tokens:
        span = _new_span(file, line, column, line, end)
        if shape == LINK:
            _check_names(first, second)
            connections.append((first, second, span))
            continue
        if shape == ITEM:
            _check_names(first, second)
            text, quoted = second, False
        elif shape == QUOTED:
            _check_names(first)
            text, quoted = unquote(second), True
        else:
            raise _GiveUp
        value_span = _new_span(file, line, column + len(first) + 1, line, end)
        attributes.append(RawAttribute(first, text, quoted, span, value_span))
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
        kind_span=_span(file, kind, kind),
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


def fast_statements(text: str, file: str) -> list[Statement] | None:
    """The statements of ``text`` if it is certainly well formed, else None."""
    try:
        out: list[Statement] = []
        for tokens in _statements_tokens(text):
            first = tokens[0]
            if first[0] == NAME and first[1] in KEYWORDS:
                out.append(_keyword_statement(file, tokens))
            else:
                out.append(_component(file, tokens))
        return out
    except _GiveUp:
        return None
