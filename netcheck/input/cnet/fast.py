"""A line-oriented reader for well-formed ``.cnet`` text, without lark.

Almost every file of a design is well formed and made of a few statement shapes
(``kind ref key=value ... terminal:net ...``, ``title``/``parts``/``include``
with a string, ``waive``). Lexing them token by token through lark costs
several microseconds a token; this checks a plain line (names, ``key=value``
and ``terminal:net``, no string or comment: most lines) with one validating
match and splits it with ``str.split``, and splits any other line into its
tokens with one regular expression (``findall``, no match objects), building a
component's attributes and connections as it goes. It reads only what it is sure of: a
statement with anything else (a syntax error, a space around ``=`` or ``:``, a
keyword used as a name) is handed alone to the grammar, its lines and
positions kept; if the grammar finds an error there, or the file's lines
themselves are unusual (a form feed, a stray carriage return, an indented
first line), it gives up and returns None, and ``parse.parse_text`` reads the
whole file with the lark parser, which finds and words every error. So the
grammar stays the one definition of the language; ``tests/test_fast_parse.py``
checks over every ``.cnet`` file in the repository and a generated corpus that
both readers give the same statements, spans included, and the same errors.
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
    new_span,
    unquote,
)
from netcheck.model import Connection
from netcheck.source import Span

__all__ = ["fast_statements", "KEYWORDS"]

# The grammar's terminals (grammar/cnet.lark), as written there.
_NAME = r"[A-Za-z0-9_+\-.\/~!*]+"
_VALUE = r"[^\s=:\"#]+"
_STRING = r'"(?:[^"\\\r\n]|\\.)*"'
# The grammar's keywords: a name spelled like one is lexed as the keyword.
KEYWORDS = frozenset({"title", "parts", "include", "waive"})

# One token of a line and the blanks before it (kept for its column): a name,
# alone or as key=value (a quoted or a plain value) or terminal:net, or a
# string, each ending at a blank, a comment or the line's end; else a comment,
# or any other character (which leaves the statement to the grammar).
# ``findall`` gives one tuple a token, its groups in this order: blanks, the
# token, name, quoted value, value, net, string, comment, other character. It
# skips nothing but trailing blanks, since "any other character" matches
# wherever no token does. (Possessive: a name or value never gives back.)
_TOKEN = re.compile(
    rf"([ \t]*+)(?:("
    rf"({_NAME}+)(?:=(?:({_STRING})|({_VALUE}+))|:({_NAME}+))?"
    rf"|({_STRING})"
    rf")(?=[ \t]|#|\Z)|(#.*)|(.))"
)
_TOKEN_FIELD, _NAME_FIELD, _COMMENT_FIELD = 1, 2, 7
# A plain line: blank-separated names, key=value (unquoted) and terminal:net,
# no string and no comment, which most lines of a design are. Such a line
# holds only these characters and blanks, so ``str.split`` gives its tokens
# and ``str.find`` their columns, without a tuple of groups a token.
_PLAIN = re.compile(
    rf"(?:[ \t]*+{_NAME}+(?:={_VALUE}+|:{_NAME}+)?+(?![^ \t]))*+[ \t]*+"
)
# A token as keyword statements use it: (text, second text, shape, line,
# column, end column); shapes NAME, LINK (terminal:net) and STRING.
NAME, LINK, STRING = range(3)
Token = tuple[str, str, int, int, int, int]


_NEW = object.__new__


class _GiveUp(Exception):
    """The text is not certainly well formed: leave it to the grammar."""


def _items(
    file: str,
    tokens: list[tuple[str, ...]],
    number: int,
    at: int,
    attributes: list[RawAttribute],
    connections: list[Connection],
) -> int | None:
    """Add a line's attributes and connections; the end column of its last one.

    ``at`` is where the tokens start on the line (0-based); 0 if there are none
    (a comment only). None if the line holds anything else (a bare name, a
    string, a keyword where a name stands, a character no token explains).
    """
    keywords = KEYWORDS  # how the grammar lexes a keyword there is its business
    # Kinds, keys, terminals, values and nets repeat throughout a design: one
    # string each (interned) instead of one per token, a tenth of the model.
    intern = sys.intern
    end = 0
    for blanks, token, name, quoted, value, net, _, comment, _ in tokens:
        if not name or name in keywords:
            if comment:
                break
            return None  # a string, a keyword, a character no token explains
        if net:
            if net in keywords:
                return None
        elif not quoted and (not value or value in keywords):
            return None  # a bare name, or a keyword as a value
        column = at + len(blanks) + 1
        end = column + len(token)
        # new_span(file, number, column, number, end), written out: a call per
        # token was a fifth of the read.
        span = _NEW(Span)
        fields = span.__dict__
        fields["file"] = file
        fields["line"] = number
        fields["column"] = column
        fields["end_line"] = number
        fields["end_column"] = end
        if net:
            connections.append(Connection(intern(name), intern(net), span))
        elif quoted:
            attributes.append(RawAttribute(intern(name), unquote(quoted), True, span))
        else:
            attributes.append(RawAttribute(intern(name), intern(value), False, span))
        at = end - 1
    return end


def _plain_items(
    file: str,
    number: int,
    line: str,
    words: list[str],
    at: int,
    attributes: list[RawAttribute],
    connections: list[Connection],
    shape: list[str],
) -> int | None:
    """``_items`` for ``words`` of a plain line, the first at or after ``at``.

    The same checks and objects as ``_items`` (a plain line's token is a bare
    name, ``key=value`` or ``terminal:net``; neither a name nor a value holds
    ``=`` or ``:``), except that each keeps where it starts, its span worked
    out when read (``model.token_span``): the span is from there to the end
    of the token, which is its key (terminal), one separator and its value
    (net). Adds to ``shape`` each attribute's word and each terminal, in the
    line's order (see ``_plain_statement``).
    """
    keywords = KEYWORDS
    intern = sys.intern
    find = line.find
    for word in words:
        start = find(word, at)  # only blanks lie between ``at`` and the word
        at = start + len(word)
        # ":" first: most items are connections (a plain word holds at most
        # one ``=`` or ``:``, and never both)
        name, colon, value = word.partition(":")
        if not colon:
            name, equals, value = word.partition("=")
            if not equals:
                return None  # a bare name
        if name in keywords or value in keywords:
            return None  # how the grammar lexes a keyword there is its business
        if not colon:
            item = _NEW(RawAttribute)  # RawAttribute(...), written out
            fields = item.__dict__
            fields["key"] = intern(name)
            fields["text"] = intern(value)
            fields["quoted"] = False
            fields["_file"] = file
            fields["_line"] = number
            fields["_column"] = start + 1
            attributes.append(item)
            shape.append(word)
        else:
            item = _NEW(Connection)  # Connection(...), written out
            fields = item.__dict__
            fields["terminal"] = name = intern(name)
            fields["net"] = intern(value)
            fields["_file"] = file
            fields["_line"] = number
            fields["_column"] = start + 1
            connections.append(item)
            shape.append(name)
    return at + 1 if words else 0


def _plain_statement(file: str, group: Group) -> Statement | None:
    """``_statement`` for a statement of plain lines (``_PLAIN``), or None.

    The statement keeps the column of its reference instead of its span
    (``statements.ComponentStatement.ref_span``), and its shape key as
    ``_shape`` (``template.shape_of``): the kind, then each attribute's
    ``key=value`` word and each terminal in the order written. A word holds
    ``=`` and a terminal cannot, so the key tells the attributes' keys and
    texts and the terminals, in order: what decides a template.
    """
    first, line, _ = group[0]
    words = line.split()
    if len(words) < 2:
        return None
    kind, ref = words[0], words[1]
    if (
        kind in KEYWORDS
        or ref in KEYWORDS
        or "=" in kind
        or ":" in kind
        or "=" in ref
        or ":" in ref
    ):
        return None  # a keyword statement (which needs a string) or no name
    kind = sys.intern(kind)
    ref_at = line.find(ref, len(kind))  # a statement starts in column 1
    attributes: list[RawAttribute] = []
    connections: list[Connection] = []
    shape = [kind]
    at = ref_at + len(ref)
    last = _plain_items(
        file, first, line, words[2:], at, attributes, connections, shape
    )
    if last is None:
        return None
    end_line, end_column = first, last or at + 1
    for number, line, _ in group[1:]:
        last = _plain_items(
            file, number, line, line.split(), 0, attributes, connections, shape
        )
        if last is None:
            return None
        end_line, end_column = number, last
    span = _NEW(Span)  # new_span(file, first, 1, end_line, end_column)
    fields = span.__dict__
    fields["file"] = file
    fields["line"] = first
    fields["column"] = 1
    fields["end_line"] = end_line
    fields["end_column"] = end_column
    statement = _NEW(ComponentStatement)  # its __init__, written out
    fields = statement.__dict__
    fields["kind"] = kind
    fields["ref"] = ref
    fields["attributes"] = tuple(attributes)
    fields["connections"] = tuple(connections)
    fields["span"] = span
    fields["_ref_column"] = ref_at + 1
    fields["_shape"] = tuple(shape)
    return statement


def _bare(token: tuple[str, ...]) -> str:
    """The name of a bare-name token, else ''."""
    name = token[_NAME_FIELD]
    return name if name == token[_TOKEN_FIELD] else ""


def _keyword_tokens(tokens: list[tuple[str, ...]], number: int) -> list[Token]:
    """A line's tokens as keyword statements read them; raise _GiveUp if unsure."""
    out: list[Token] = []
    at = 0
    for blanks, token, name, quoted, value, net, string, comment, _ in tokens:
        column = at + len(blanks) + 1
        if comment:
            break
        if net:
            text, second, shape = name, net, LINK
        elif name and not (quoted or value):
            text, second, shape = name, "", NAME
        elif string:
            text, second, shape = string, "", STRING
        else:
            raise _GiveUp  # key=value or a character no token explains
        out.append((text, second, shape, number, column, column + len(token)))
        at = column - 1 + len(token)
    return out


# The lines of one statement: (line number, its findall tuples) each.
Lines = list[tuple[int, list[tuple[str, ...]]]]
# The lines of one statement as the reader collects them: (number, text, its
# findall tuples, or None for a plain line, which ``_plain_statement`` reads).
Group = list[tuple[int, str, "list[tuple[str, ...]] | None"]]


def _statement(file: str, group: Lines) -> Statement | None:
    """The statement of ``group``'s lines, or None if the line reader is unsure."""
    number, tokens = group[0]
    kind = _bare(tokens[0])
    if kind in KEYWORDS:
        try:
            keyword = [t for n, line in group for t in _keyword_tokens(line, n)]
            return _keyword_statement(file, keyword)
        except _GiveUp:
            return None
    ref = _bare(tokens[1]) if len(tokens) > 1 else ""
    if not kind or not ref or ref in KEYWORDS:
        return None
    ref_at = len(kind) + len(tokens[1][0])  # a statement starts in column 1
    at = ref_at + len(ref)  # where the first line's items start (0-based)
    end = (number, at + 1)
    attributes: list[RawAttribute] = []
    connections: list[Connection] = []
    for line, items in [(number, tokens[2:]), *group[1:]]:
        last = _items(file, items, line, at, attributes, connections)
        if last is None:
            return None
        if last:
            end = (line, last)
        at = 0  # a continuation line's items start at its beginning
    return ComponentStatement(
        sys.intern(kind),
        ref,
        tuple(attributes),
        tuple(connections),
        new_span(file, number, 1, *end),
        new_span(file, number, ref_at + 1, number, ref_at + 1 + len(ref)),
    )


def _span(file: str, first: Token, last: Token) -> Span:
    return new_span(file, first[3], first[4], last[3], last[5])


def _keyword_statement(
    file: str, tokens: list[Token]
) -> FileStatement | WaiveStatement:
    keyword, last = tokens[0], tokens[-1]
    if last[2] != STRING:
        raise _GiveUp
    span = _span(file, keyword, last)
    last_span = _span(file, last, last)
    if keyword[0] != "waive":
        if len(tokens) != 2:
            raise _GiveUp
        return FileStatement(keyword[0], unquote(last[0]), span, last_span)
    if len(tokens) != 4 or tokens[1][2] != NAME or tokens[2][2] == STRING:
        raise _GiveUp
    rule, target = tokens[1], tokens[2]
    if not KEYWORDS.isdisjoint((rule[0], target[0], target[1])):
        raise _GiveUp  # how the grammar lexes a keyword there is its business
    return WaiveStatement(
        rule[0],
        f"{target[0]}:{target[1]}" if target[2] == LINK else target[0],
        unquote(last[0]),
        span,
        _span(file, target, target),
        last_span,
    )


# Parses the text of some lines of a file (a statement the line reader is not
# sure of) with the grammar: (text, lines before it) -> its statements with
# their spans in the file, or None if the grammar finds any error there.
Grammar = Callable[[str, int], "list[Statement] | None"]


def _lines(text: str) -> list[str]:
    """The file's lines; raise _GiveUp if a form feed or a lone CR is in them.

    How the grammar breaks such a line is its business. A CR is allowed only
    before a line break (CRLF line ends) or at the very end.
    """
    if "\f" in text:
        raise _GiveUp
    lines = text.split("\n")
    if "\r" in text:
        lines = [line.removesuffix("\r") for line in lines]
        if any("\r" in line for line in lines):
            raise _GiveUp
    return lines


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

    A line that starts with a blank continues the statement above; blank and
    comment-only lines belong to none (the grammar's own rules, cnet.lark).
    """
    try:
        lines = _lines(text)
    except _GiveUp:
        return None
    out: list[Statement] = []
    group: Group = []  # the lines of the statement being read
    plain_group = True  # whether they are all plain lines
    tokens_of = _TOKEN.findall
    plain = _PLAIN.fullmatch
    for number, line in enumerate(lines, start=1):
        if plain(line) is not None:
            if not line or line.isspace():
                continue  # a blank line belongs to no statement
            tokens = None
        else:
            tokens = tokens_of(line)
            if not tokens or tokens[0][_COMMENT_FIELD]:
                continue
        if line[0] in " \t":
            if not group:
                return None  # an indented first statement: the grammar words it
            group.append((number, line, tokens))
            if tokens is not None:
                plain_group = False
            continue
        if group:
            # _add(file, group, ...), its usual case (plain lines, read) inline
            read = _plain_statement(file, group) if plain_group else None
            if read is not None:
                out.append(read)
            elif not _add(file, group, lines, grammar, out):
                return None
        group = [(number, line, tokens)]
        plain_group = tokens is None
    if group and not _add(file, group, lines, grammar, out):
        return None
    return out


def _read(file: str, group: Group) -> Statement | None:
    """The statement of ``group``'s lines, or None if the line reader is unsure."""
    for _, _, tokens in group:
        if tokens is not None:
            break
    else:
        return _plain_statement(file, group)
    findall = _TOKEN.findall
    return _statement(
        file,
        [
            (number, findall(line) if tokens is None else tokens)
            for number, line, tokens in group
        ],
    )


def _add(
    file: str,
    group: Group,
    lines: list[str],
    grammar: Grammar | None,
    out: list,
) -> bool:
    """Add the statement of ``group`` to ``out`` (by the grammar if unsure).

    False if the line reader is unsure and the grammar (if any) finds an error.
    """
    read = _read(file, group)
    if read is not None:
        out.append(read)
        return True
    if grammar is None:
        return False
    first, last = group[0][0], group[-1][0]
    parsed = grammar("\n".join(lines[first - 1 : last]), first - 1)
    if parsed is None:
        return False
    out.extend(parsed)
    return True
