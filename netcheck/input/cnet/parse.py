"""Parse ``.cnet`` text into statements; the only place lark exceptions are seen."""

from __future__ import annotations

import re
from functools import lru_cache, partial

from lark import Lark, Token, Transformer, Tree, UnexpectedInput, v_args
from lark.exceptions import UnexpectedCharacters, UnexpectedEOF, UnexpectedToken

from netcheck.errors import InputError, InputErrors, SyntaxInputError
from netcheck.input.cnet.fast import fast_statements
from netcheck.input.cnet.messages import (
    CHARACTER_HINTS,
    STATE_EXAMPLES,
    SYNTAX_MESSAGES,
)
from netcheck.input.cnet.slips import slip
from netcheck.input.cnet.statements import (
    ComponentStatement,
    FileStatement,
    RawAttribute,
    SourceFile,
    WaiveStatement,
    unquote,
)
from netcheck.model import Connection
from netcheck.resources import read_text
from netcheck.source import Span, register_text

__all__ = [
    "RawAttribute",
    "ComponentStatement",
    "FileStatement",
    "WaiveStatement",
    "SourceFile",
    "SYNTAX_MESSAGES",
    "parse_text",
    "parse_with_grammar",
    "decode_source",
]

MAX_ERRORS = 20


@lru_cache(maxsize=1)
def parser() -> Lark:
    """The .cnet LALR parser (built once)."""
    return Lark(
        read_text("grammar", "cnet.lark"),
        parser="lalr",
        propagate_positions=True,
        maybe_placeholders=False,
    )


def _span(file: str, token: Token | Tree, lines: int = 0) -> Span:
    """The span of a token or tree; ``lines`` before the text that was parsed."""
    meta = token if isinstance(token, Token) else token.meta
    return Span(
        file, meta.line + lines, meta.column, meta.end_line + lines, meta.end_column
    )


class _ToStatements(Transformer):
    def __init__(self, file: str, lines: int = 0) -> None:
        super().__init__()
        self.file = file
        self.lines = lines  # of the file before the text parsed
        self.errors: list[InputError] = []

    def _span(self, token: Token | Tree) -> Span:
        return _span(self.file, token, self.lines)

    def _file_statement(self, keyword: str, meta: Tree, string: Token) -> FileStatement:
        return FileStatement(
            keyword, unquote(string), self._span(meta), self._span(string)
        )

    @v_args(tree=True)
    def title(self, tree: Tree) -> FileStatement:
        return self._file_statement("title", tree, tree.children[0])

    @v_args(tree=True)
    def parts(self, tree: Tree) -> FileStatement:
        return self._file_statement("parts", tree, tree.children[0])

    @v_args(tree=True)
    def include(self, tree: Tree) -> FileStatement:
        return self._file_statement("include", tree, tree.children[0])

    @v_args(tree=True)
    def target(self, tree: Tree) -> tuple[str, Span]:
        text = ":".join(str(child) for child in tree.children)
        return text, self._span(tree)

    @v_args(tree=True)
    def waive(self, tree: Tree) -> WaiveStatement:
        rule, (target, target_span), reason = tree.children
        return WaiveStatement(
            str(rule),
            target,
            unquote(reason),
            self._span(tree),
            target_span,
            self._span(reason),
        )

    def _value_of(self, tree: Tree) -> tuple[str, bool]:
        token = tree.children[0]
        quoted = token.type == "STRING"
        return (unquote(token) if quoted else str(token)), quoted

    def _joined(self, tree: Tree, first: Token, last: Token, sign: str) -> Span:
        span = self._span(tree)
        if (first.end_line, first.end_column) != (last.line, last.column - 1):
            self.errors.append(
                SyntaxInputError(
                    f"no space may stand around '{sign}' (write {first}{sign}{last})",
                    span,
                )
            )
        return span

    @v_args(tree=True)
    def attribute(self, tree: Tree) -> RawAttribute:
        key, value_tree = tree.children
        text, quoted = self._value_of(value_tree)
        span = self._joined(tree, key, value_tree.children[0], "=")
        return RawAttribute(str(key), text, quoted, span)

    @v_args(tree=True)
    def connection(self, tree: Tree) -> Connection:
        terminal, net = tree.children
        span = self._joined(tree, terminal, net, ":")
        return Connection(str(terminal), str(net), span)

    @v_args(tree=True)
    def component(self, tree: Tree) -> ComponentStatement:
        kind, ref, *items = tree.children
        return ComponentStatement(
            kind=str(kind),
            ref=str(ref),
            attributes=tuple(i for i in items if isinstance(i, RawAttribute)),
            connections=tuple(i for i in items if isinstance(i, Connection)),
            span=self._span(tree),
            ref_span=self._span(ref),
        )

    def start(self, children: list) -> list:
        return children


def decode_source(data: bytes, file: str) -> str:
    """Decode UTF-8 text or raise an InputError at the first bad byte.

    The text is registered for excerpts only on an error: ``parse_text``
    registers what it reads.
    """
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as error:
        register_text(file, data.decode("utf-8", errors="replace"))
        before = data[: error.start]
        line = before.count(b"\n") + 1
        column = len(before) - (before.rfind(b"\n") + 1) + 1
        raise SyntaxInputError(
            f"not UTF-8 text (byte 0x{data[error.start]:02x})",
            Span(file, line, column, line, column + 1),
        ) from None
    if "\x00" in text:
        register_text(file, text)
        index = text.index("\x00")
        line = text.count("\n", 0, index) + 1
        column = index - (text.rfind("\n", 0, index) + 1) + 1
        raise SyntaxInputError("NUL character in text", Span(file, line, column))
    return text.removeprefix("\ufeff")


@lru_cache(maxsize=1)
def _examples() -> dict[str, list[str]]:
    """The table's inputs at the start of a file and after other statements.

    The parser is in a different state after earlier lines, and examples match
    by state, so each input is also tried after a blank line and a statement.
    """
    prefixes = ("", "\n", "# c\n", "x y\n", 'title "t"\n')
    return {
        message: [p + e for p in prefixes for e in examples]
        for message, examples in SYNTAX_MESSAGES.items()
    } | {
        message: [p + e for p in prefixes for e in SYNTAX_MESSAGES[message] + more]
        for message, more in STATE_EXAMPLES.items()
    }


def _message(error: UnexpectedInput) -> str:
    if isinstance(error, UnexpectedCharacters):
        char = error.char
        hint = CHARACTER_HINTS.get(char)
        if hint:
            return hint
        if char in " \t":
            return "unexpected white space"
        return f"unexpected character {char!r} (names use A-Z a-z 0-9 _ + - . / ~ ! *)"
    label = error.match_examples(
        parser().parse, _examples(), use_accepts=True, token_type_match_fallback=True
    )
    if label:
        return str(label)
    if isinstance(error, UnexpectedToken) and error.token.type == "$END":
        return "unexpected end of file"
    token = getattr(error, "token", None)
    return f"unexpected {str(token)!r}" if token else "syntax error"


def _error_span(file: str, error: UnexpectedInput, text: str) -> Span:
    token = getattr(error, "token", None)
    if isinstance(error, UnexpectedEOF) or (token is not None and token.type == "$END"):
        lines = text.split("\n")
        return _after_content(file, lines, len(lines))
    line, column = error.line, error.column
    history = getattr(error, "token_history", None) or []
    last = history[-1] if history else None
    if isinstance(error, UnexpectedToken) and last is not None and last.type == "NAME":
        previous = history[-1]
        if {"EQUAL", "COLON"} <= set(error.accepts or error.expected):
            # 'R 1:N5': the bare name is the mistake, not what follows it.
            return _span(file, previous)
    if token is not None and token.type == "_NL":
        # A line break where more was expected: point just past the content of
        # the last line that has any (blank and comment lines mean nothing).
        return _after_content(file, text.split("\n"), line)
    end = column + (len(str(token)) if token is not None else 1)
    return Span(file, line, column, line, end)


_CODE = re.compile(r'(?:"(?:[^"\\\r\n]|\\.)*"|[^"#\r\n])*')


def _after_content(file: str, lines: list[str], line: int) -> Span:
    """The position just past the content of ``line``, or of the last such line."""
    for number in range(min(line, len(lines)), 0, -1):
        code = _CODE.match(lines[number - 1])
        content = code.group(0).rstrip() if code else ""
        if content:
            return Span(file, number, len(content) + 1)
    return Span(file, max(line, 1), 1)


def _statement_lines(lines: list[str], line: int) -> range:
    """The lines of the statement that holds ``line`` (1-based, inclusive range)."""
    first = line
    while first > 1 and (
        not lines[first - 1][:1].strip() or lines[first - 1][0] == "#"
    ):
        first -= 1
    last = line
    while last < len(lines) and (
        lines[last][:1] in (" ", "\t") or not lines[last].strip()
    ):
        last += 1
    return range(first, last + 1)


def _shifted(span: Span, lines: int) -> Span:
    return Span(
        span.file,
        span.line + lines,
        span.column,
        span.end_line + lines if span.end_line else 0,
        span.end_column,
    )


def _syntax_errors(text: str, file: str) -> tuple[Tree | None, list[InputError]]:
    """Parse ``text``; on an error, go on after the failing statement.

    Only the rest of the file is parsed again (its line numbers shifted back),
    so a file with many errors still costs about one parse.
    """
    errors: list[InputError] = []
    work, offset = text, 0
    while True:
        try:
            tree = parser().parse(work)
            return (tree if not errors else None), errors
        except UnexpectedInput as error:
            span = _error_span(file, error, work)
            lines = work.split("\n")
            message, span = slip(lines, span) or (_message(error), span)
            errors.append(SyntaxInputError(message, _shifted(span, offset)))
            rest = _statement_lines(lines, span.line).stop
            if len(errors) >= MAX_ERRORS or rest > len(lines):
                return None, errors
            work = "\n".join(lines[rest - 1 :])
            offset += rest - 1


def parse_text(text: str, file: str) -> SourceFile:
    """Parse one file's text; raise InputErrors with every syntax error found."""
    register_text(file, text)
    fast = fast_statements(text, file, partial(_grammar_statements, file=file))
    if fast is not None:
        return SourceFile(file, tuple(fast))
    return parse_with_grammar(text, file)


def _grammar_statements(text: str, lines: int, file: str) -> list | None:
    """The statements of some lines of ``file`` by the grammar, or None on an error.

    ``text`` is the lines after the file's first ``lines``; the spans are the
    file's. On an error the whole file is read again by ``parse_with_grammar``,
    so that the errors are worded and placed exactly as for any other file.
    """
    try:
        tree = parser().parse(text)
    except UnexpectedInput:
        return None
    transformer = _ToStatements(file, lines)
    statements = transformer.transform(tree)
    return None if transformer.errors else statements


def parse_with_grammar(text: str, file: str) -> SourceFile:
    """Parse one file's text with the lark parser, which words every error.

    ``parse_text`` comes here for any text the fast reader is not sure of; the
    tests compare the two readers on well-formed text.
    """
    tree, errors = _syntax_errors(text, file)
    if errors:
        raise InputErrors(errors)
    transformer = _ToStatements(file)
    statements = transformer.transform(tree)
    errors = transformer.errors
    for statement in statements[:1]:
        if statement.span.column != 1:
            errors.append(
                SyntaxInputError(
                    "a statement starts in column 1 (an indented line continues "
                    "the statement above, and there is none)",
                    statement.span,
                )
            )
    if errors:
        raise InputErrors(errors)
    return SourceFile(file, tuple(statements))
