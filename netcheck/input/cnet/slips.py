"""Messages for the common slips behind a syntax error, each saying what to write.

The parser knows only that a token was unexpected; these look at the line the
error is on and recognise what the writer most likely meant: a continuation
line that lost its indent, a quantity with a space inside, a waiver without
its quoted reason. None of them changes what parses; they only name the slip.
"""

from __future__ import annotations

import re

from netcheck.source import Span

__all__ = ["slip", "SLIP_EXAMPLES"]

# Each slip with a tiny input that makes it and the exact message (the table is
# also the test of these messages, tests/test_input_errors.py).
SLIP_EXAMPLES: dict[str, str] = {
    "waive rule-x K1": "a waiver needs a quoted reason: write waive rule-x K1 "
    '"why this finding is acceptable"',
    "waive rule-x K1:13-14 diode fitted": "a waiver's reason is quoted: write "
    'waive rule-x K1:13-14 "diode fitted"',
    "supply G1 dc=24 V +:P -:M": "no space may stand inside a quantity: write "
    'dc=24V (or quote it: dc="24 V")',
    "load Y1 L=0.2 H": "no space may stand inside a quantity: write L=0.2H "
    '(or quote it: L="0.2 H")',
    "relay K1 A1:P\nA2:M": "'A2:M' starts in column 1, so it begins a new "
    "statement; indent it to continue the statement above (write '  A2:M')",
    "load Y1 1:P\n\n# c\nR=48ohm 2:M": "'R=48ohm' starts in column 1, so it "
    "begins a new statement; indent it to continue the statement above "
    "(write '  R=48ohm 2:M')",
}

_FIRST_ITEM = re.compile(r"\A([^\s=:\"#]+)[:=]\S*")
_SPACED_QUANTITY = re.compile(
    r"(?P<key>[^\s=:\"#]+)=(?P<number>[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)"
    r"[ \t]+(?P<unit>[A-Za-zΩµμ%°]+)(?=[\s#]|\Z)"
)
_TARGET = re.compile(r"\A[^\s=:\"#]+(?::[^\s=:\"#]+)?\Z")
_CONTENT = re.compile(r"\A\s*(#.*)?\Z")


def slip(lines: list[str], span: Span) -> tuple[str, Span] | None:
    """The message and span for a recognised slip at ``span``, or None."""
    line = lines[span.line - 1] if 0 < span.line <= len(lines) else ""
    for finder in (_spaced_quantity, _unquoted_reason, _lost_indent):
        found = finder(lines, line, span)
        if found is not None:
            return found
    return None


def _spaced_quantity(
    lines: list[str], line: str, span: Span
) -> tuple[str, Span] | None:
    for match in _SPACED_QUANTITY.finditer(line):
        if match.start("unit") <= span.column - 1 <= match.end("unit"):
            key, number, unit = match["key"], match["number"], match["unit"]
            message = (
                f"no space may stand inside a quantity: write {key}={number}{unit} "
                f'(or quote it: {key}="{number} {unit}")'
            )
            where = Span(
                span.file,
                span.line,
                match.start("number") + 1,
                span.line,
                match.end("unit") + 1,
            )
            return message, where
    return None


def _unquoted_reason(
    lines: list[str], line: str, span: Span
) -> tuple[str, Span] | None:
    words = line.split("#", 1)[0].split()
    if len(words) < 3 or words[0] != "waive" or '"' in line:
        return None
    if not _TARGET.match(words[2]):
        return None
    rule, target, rest = words[1], words[2], words[3:]
    reason = " ".join(rest) or "why this finding is acceptable"
    head = (
        "a waiver needs a quoted reason" if not rest else "a waiver's reason is quoted"
    )
    return f'{head}: write waive {rule} {target} "{reason}"', span


def _lost_indent(lines: list[str], line: str, span: Span) -> tuple[str, Span] | None:
    match = _FIRST_ITEM.match(line)
    if match is None or span.line < 2:
        return None
    above = [text for text in lines[: span.line - 1] if not _CONTENT.match(text)]
    if not above:
        return None
    message = (
        f"{match[0]!r} starts in column 1, so it begins a new statement; "
        "indent it to continue the statement above (write "
        f"'  {line.strip()}')"
    )
    return message, Span(span.file, span.line, 1, span.line, match.end() + 1)
