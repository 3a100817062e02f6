"""The statements a .cnet file is read into, with the spans of their parts.

``RawAttribute`` and ``ComponentStatement``, made once per token and per
statement, write their fields into ``__dict__`` instead of the frozen
dataclass's ``object.__setattr__`` per field (``tests/test_model_init.py``
holds them equal to the generated ``__init__``), and work out the spans only
error messages use (a value's, a kind's) from the spans they keep
(``tests/test_fast_parse.py`` holds those equal to the grammar's tokens).
The fast reader leaves even those spans to be worked out when read, for the
tokens of a plain line (``model.token_span``) and for a reference (only a
reference defined twice needs its span): it keeps where they start.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import overload

from netcheck.model import Connection, token_span
from netcheck.source import Span

__all__ = [
    "RawAttribute",
    "ComponentStatement",
    "FileStatement",
    "WaiveStatement",
    "Statement",
    "SourceFile",
    "unquote",
    "new_span",
]


@dataclass(frozen=True)
class RawAttribute:
    """``key=value`` as written: the value's text, unquoted, and if it was quoted."""

    key: str
    text: str
    quoted: bool
    span: Span

    def __init__(self, key: str, text: str, quoted: bool, span: Span) -> None:
        fields = self.__dict__
        fields["key"] = key
        fields["text"] = text
        fields["quoted"] = quoted
        fields["span"] = span

    @property
    def value_span(self) -> Span:
        """The value's span, as written (quotes included).

        Only error messages need it, so it is worked out, not kept: the value
        starts just after ``key=`` on the line (the readers refuse a space
        around ``=``) and ends where the attribute does.
        """
        span = self.span
        return Span(
            span.file,
            span.line,
            span.column + len(self.key) + 1,
            span.end_line,
            span.end_column,
        )


RawAttribute.span = token_span("key", "text")  # type: ignore[assignment]


@dataclass(frozen=True)
class ComponentStatement:
    """``kind ref key=value ... terminal:net ...``."""

    kind: str
    ref: str
    attributes: tuple[RawAttribute, ...]
    connections: tuple[Connection, ...]
    span: Span
    ref_span: Span

    def __init__(
        self,
        kind: str,
        ref: str,
        attributes: tuple[RawAttribute, ...],
        connections: tuple[Connection, ...],
        span: Span,
        ref_span: Span,
    ) -> None:
        fields = self.__dict__
        fields["kind"] = kind
        fields["ref"] = ref
        fields["attributes"] = attributes
        fields["connections"] = connections
        fields["span"] = span
        fields["ref_span"] = ref_span

    @property
    def kind_span(self) -> Span:
        """The kind's span: the statement's first word (only errors need it)."""
        span = self.span
        return Span(
            span.file, span.line, span.column, span.line, span.column + len(self.kind)
        )


class _RefSpan:
    """``ref_span`` of a statement that holds the reference's column instead.

    The fast reader leaves ``_ref_column`` (1-based, on the statement's first
    line) in ``__dict__``; the span is worked out on the first read and kept.
    """

    @overload
    def __get__(self, instance: None, owner: type | None = None) -> _RefSpan: ...
    @overload
    def __get__(self, instance: object, owner: type | None = None) -> Span: ...
    def __get__(self, instance: object, owner: type | None = None) -> Span | _RefSpan:
        if instance is None:
            return self
        fields = instance.__dict__
        span, column = fields["span"], fields["_ref_column"]
        end = column + len(fields["ref"])
        line = span.line
        ref_span = fields["ref_span"] = Span(span.file, line, column, line, end)
        return ref_span


# After the dataclass is made (a class attribute before would be a default).
ComponentStatement.ref_span = _RefSpan()  # type: ignore[assignment]


@dataclass(frozen=True)
class FileStatement:
    """``title``, ``parts`` or ``include`` with its string."""

    keyword: str
    text: str
    span: Span
    text_span: Span


@dataclass(frozen=True)
class WaiveStatement:
    """``waive rule target "reason"``."""

    rule: str
    target: str
    reason: str
    span: Span
    target_span: Span
    reason_span: Span


Statement = ComponentStatement | FileStatement | WaiveStatement


@dataclass(frozen=True)
class SourceFile:
    """The statements of one file, in order."""

    file: str
    statements: tuple[ComponentStatement | FileStatement | WaiveStatement, ...]


def unquote(token: str) -> str:
    """The text of a STRING token, quotes and escapes removed."""
    body = str(token)[1:-1]
    out, i = [], 0
    while i < len(body):
        if body[i] == "\\" and i + 1 < len(body):
            out.append(body[i + 1])
            i += 2
        else:
            out.append(body[i])
            i += 1
    return "".join(out)


def new_span(file: str, line: int, column: int, end_line: int, end_column: int) -> Span:
    """``Span(...)`` without the frozen dataclass's five ``__setattr__`` calls.

    A few spans are made per statement, and the frozen ``__init__`` was a
    tenth of the read; the object is the same (tests compare them equal).
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
