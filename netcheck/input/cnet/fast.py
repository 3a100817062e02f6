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
    rf"[ \t]*(?:"
    rf"(?P<key>{_NAME})=(?:(?P<quoted>{_STRING})|(?P<value>{_VALUE}))"
    rf"|(?P<terminal>{_NAME}):(?P<net>{_NAME})"
    rf"|(?P<name>{_NAME})"
    rf"|(?P<string>{_STRING})"
    rf")(?=[ \t]|#|\Z)"
)
_REST = re.compile(r"[ \t]*(?:#.*)?\Z")
_BLANK = re.compile(r"[ \t]*(?:#.*)?\Z")

# A token: (shape, texts, line, column, end column); shapes are "item" (key and
# value), "quoted" (key and quoted value), "link" (terminal and net), "name"
# and "string". Tokens never span lines.
Token = tuple[str, tuple[str, ...], int, int, int]


class _GiveUp(Exception):
    """The text is not certainly well formed: leave it to the grammar."""


def _line_tokens(line: str, number: int) -> list[Token]:
    tokens: list[Token] = []
    at, end = 0, len(line)
    while at < end:
        match = _TOKEN.match(line, at)
        if match is None:
            if _REST.match(line, at):
                return tokens
            raise _GiveUp
        tokens.append(_token(match, number))
        at = match.end()
    return tokens


def _token(match: re.Match[str], number: int) -> Token:
    kind = match.lastgroup
    start, stop = match.span(kind if kind in ("name", "string") else 0)
    if kind == "name" or kind == "string":
        return kind, (match[kind],), number, start + 1, stop + 1
    if kind == "net":
        texts = (match["terminal"], match["net"])
        shape = "link"
    else:
        texts = (match["key"], match[kind])
        shape = "quoted" if kind == "quoted" else "item"
    start = match.start("terminal" if shape == "link" else "key")
    return shape, texts, number, start + 1, stop + 1


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


def _span(file: str, first: Token, last: Token) -> Span:
    return Span(file, first[2], first[3], last[2], last[4])


def _check_names(texts: tuple[str, ...]) -> None:
    if any(text in KEYWORDS for text in texts):
        raise _GiveUp  # how the grammar lexes a keyword there is its business


def _component(file: str, tokens: list[Token]) -> ComponentStatement:
    if len(tokens) < 2 or tokens[0][0] != "name" or tokens[1][0] != "name":
        raise _GiveUp
    kind, ref = tokens[0], tokens[1]
    _check_names((ref[1][0],))
    attributes: list[RawAttribute] = []
    connections: list[tuple[str, str, Span]] = []
    for token in tokens[2:]:
        shape, texts, line, column, end = token
        span = Span(file, line, column, line, end)
        if shape == "link":
            _check_names(texts)
            connections.append((texts[0], texts[1], span))
            continue
        if shape == "item":
            _check_names(texts)
            text, quoted = texts[1], False
        elif shape == "quoted":
            _check_names(texts[:1])
            text, quoted = unquote(texts[1]), True
        else:
            raise _GiveUp
        start = column + len(texts[0]) + 1
        value_span = Span(file, line, start, line, end)
        attributes.append(RawAttribute(texts[0], text, quoted, span, value_span))
    return ComponentStatement(
        kind=kind[1][0],
        ref=ref[1][0],
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
    if last[0] != "string":
        raise _GiveUp
    span = _span(file, keyword, last)
    last_span = _span(file, last, last)
    if keyword[1][0] != "waive":
        if len(tokens) != 2:
            raise _GiveUp
        return FileStatement(keyword[1][0], unquote(last[1][0]), span, last_span)
    if (
        len(tokens) != 4
        or tokens[1][0] != "name"
        or tokens[2][0]
        not in (
            "name",
            "link",
        )
    ):
        raise _GiveUp
    rule, target = tokens[1], tokens[2]
    _check_names(rule[1] + target[1])
    return WaiveStatement(
        rule[1][0],
        ":".join(target[1]),
        unquote(last[1][0]),
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
            if first[0] == "name" and first[1][0] in KEYWORDS:
                out.append(_keyword_statement(file, tokens))
            else:
                out.append(_component(file, tokens))
        return out
    except _GiveUp:
        return None
