"""Bad input ends in ``file:line:col: error: message``, the line, a caret, exit 2.

``tests/input_errors/*.cnet`` mark each expected error with
``# error: <fragment> @line:col``; every marked error must be reported (all of a
file's errors together, where they can be collected), nothing else, and no
traceback. The friendly syntax messages are pinned by their own table.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from netcheck import cli
from netcheck.errors import InputError, InputErrors
from netcheck.input.cnet.parse import SYNTAX_MESSAGES, parse_text
from netcheck.input.cnet.slips import SLIP_EXAMPLES
from netcheck.quantity_hints import quantity_hint

CASES = Path(__file__).resolve().parent / "input_errors"
MARK = re.compile(r"#\s*error:\s*(?P<text>.*?)\s*@(?P<line>\d+):(?P<col>\d+)\s*$")
HEAD = re.compile(
    r"^(?P<file>[^\n]*?):(?P<line>\d+):(?P<col>\d+): error: (?P<msg>.*)$", re.M
)


def _marks(path: Path) -> list[tuple[str, int, int]]:
    text = path.read_bytes().decode("utf-8", errors="replace")
    return [
        (m["text"], int(m["line"]), int(m["col"]))
        for m in map(MARK.search, text.splitlines())
        if m
    ]


@pytest.mark.parametrize("path", sorted(CASES.glob("*.cnet")), ids=lambda p: p.name)
def test_input_error_is_located(path: Path, capsys, monkeypatch) -> None:
    monkeypatch.chdir(CASES)
    code = cli.main(["check", path.name, "--no-color"])
    out, err = capsys.readouterr()
    assert code == 2
    assert "Traceback" not in out + err
    found = [(m["msg"], int(m["line"]), int(m["col"])) for m in HEAD.finditer(err)]
    for fragment, line, col in _marks(path):
        assert any(
            fragment in msg and (line, col) == (l_, c_) for msg, l_, c_ in found
        ), f"missing {fragment!r} @{line}:{col}; got {found}"
    assert len(found) == len(_marks(path)), f"unexpected errors: {found}"
    # Each located error is followed by its source line and a caret under it.
    lines = err.splitlines()
    for index, line in enumerate(lines):
        match = HEAD.match(line)
        if match and index + 2 < len(lines) + 1:
            caret = lines[index + 2] if index + 2 < len(lines) else ""
            assert caret.strip().startswith("^"), f"no caret after {line!r}"
            assert caret.index("^") == int(match["col"]) - 1


@pytest.mark.parametrize(
    ("message", "example"),
    [(m, e) for m, examples in SYNTAX_MESSAGES.items() for e in examples],
)
def test_syntax_message_table(message: str, example: str) -> None:
    # The table of friendly messages is its own test: each tiny input gives its message.
    with pytest.raises(InputError) as caught:
        parse_text(example, "t.cnet")
    error = caught.value
    messages = (
        [e.message for e in error.errors]
        if isinstance(error, InputErrors)
        else [error.message]
    )
    assert message in messages


@pytest.mark.parametrize(("example", "message"), sorted(SLIP_EXAMPLES.items()))
def test_slip_message_table(example: str, message: str) -> None:
    # The common slips are named with what to write instead, and only them.
    with pytest.raises(InputErrors) as caught:
        parse_text(example, "t.cnet")
    assert [e.message for e in caught.value.errors] == [message]


def test_every_syntax_error_of_a_file_is_reported() -> None:
    text = "relay\nload Y1 R\n  1:N5\ntitle x\nswitch S1 13:A 14:B\n"
    with pytest.raises(InputErrors) as caught:
        parse_text(text, "t.cnet")
    assert [(e.span.line, e.span.column) for e in caught.value.errors] == [
        (1, 6),
        (2, 9),
        (4, 7),
    ]


@pytest.mark.parametrize(
    ("text", "dimension", "write"),
    [
        ("200mh", "inductance", "write 200mH"),  # mh parses as milli-hour
        ("300MS", "time", "write 300ms"),  # not megaseconds
        ("2.2UF", "capacitance", "write 2.2uF"),
        ("24v", "voltage", "write 24V"),
        ("48kOhm", "resistance", "write 48kohm"),
        ("4,7kohm", "resistance", "write 4.7kohm"),
    ],
)
def test_quantity_hint_says_what_to_write(
    text: str, dimension: str, write: str
) -> None:
    assert write in (quantity_hint(text, dimension) or "")


@pytest.mark.parametrize(
    ("text", "dimension"),
    [("24V", "current"), ("10blorp", "voltage"), ("48", "resistance")],
)
def test_no_quantity_hint_where_case_is_not_the_slip(text: str, dimension: str) -> None:
    # A volt where a current is wanted is a wrong dimension, not a case slip.
    assert quantity_hint(text, dimension) is None


@pytest.mark.parametrize(
    ("text", "dimension", "named"),
    [
        ("200mh", "inductance", True),
        ("300MS", "time", True),
        ("48Ohm", "resistance", False),
        ("2.2UF", "capacitance", False),
    ],
)
def test_prefix_rule_is_named_only_where_a_prefix_is_in_play(
    text: str, dimension: str, named: bool
) -> None:
    # SI Brochure, 9th edition, 3: m is milli, M is mega; Ohm has no prefix letter.
    assert ("m is milli" in (quantity_hint(text, dimension) or "")) is named
