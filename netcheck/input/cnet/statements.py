"""The statements a .cnet file is read into, with the spans of their parts.

``RawAttribute`` and ``ComponentStatement``, made once per token and per
statement, write their fields into ``__dict__`` instead of the frozen
dataclass's ``object.__setattr__`` per field (``tests/test_model_init.py``
holds them equal to the generated ``__init__``).
"""

from __future__ import annotations

from dataclasses import dataclass

from netcheck.source import Span

__all__ = [
    "RawAttribute",
    "ComponentStatement",
    "FileStatement",
    "WaiveStatement",
    "Statement",
    "SourceFile",
    "unquote",
]


@dataclass(frozen=True)
class RawAttribute:
    """``key=value`` as written: the value's text, unquoted, and if it was quoted."""

    key: str
    text: str
    quoted: bool
    span: Span
    value_span: Span

    def __init__(
        self, key: str, text: str, quoted: bool, span: Span, value_span: Span
    ) -> None:
        fields = self.__dict__
        fields["key"] = key
        fields["text"] = text
        fields["quoted"] = quoted
        fields["span"] = span
        fields["value_span"] = value_span


@dataclass(frozen=True)
class ComponentStatement:
    """``kind ref key=value ... terminal:net ...``."""

    kind: str
    ref: str
    attributes: tuple[RawAttribute, ...]
    connections: tuple[tuple[str, str, Span], ...]
    span: Span
    kind_span: Span
    ref_span: Span

    def __init__(
        self,
        kind: str,
        ref: str,
        attributes: tuple[RawAttribute, ...],
        connections: tuple[tuple[str, str, Span], ...],
        span: Span,
        kind_span: Span,
        ref_span: Span,
    ) -> None:
        fields = self.__dict__
        fields["kind"] = kind
        fields["ref"] = ref
        fields["attributes"] = attributes
        fields["connections"] = connections
        fields["span"] = span
        fields["kind_span"] = kind_span
        fields["ref_span"] = ref_span


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
