"""Part libraries: schema validation with file, line and key path; safe YAML."""

from __future__ import annotations

import pytest

from netcheck.errors import InputError, InputErrors
from netcheck.input.parts import parse_library

HEAD = "format: netcheck-parts/1\nnote: Illustrative values for the tests.\nparts:\n"
RELAY = (
    HEAD
    + """\
  gp-relay-10a:
    kind: relay
    coil: {supply: dc, voltage: 24 V, resistance: 640 ohm, inductance: 1.1 H}
    poles:
      - {common: "11", nc: "12", no: "14"}
    contacts:
      ratings:
        - {category: AC-15, voltage: 230 V, current: 3 A}
        - {category: DC-13, voltage: 24 V, current: 1 A}
"""
)


def _errors(text: str) -> list[tuple[str, int, int]]:
    with pytest.raises(InputError) as caught:
        parse_library(text, "lib.parts.yaml")
    error = caught.value
    errors = error.errors if isinstance(error, InputErrors) else [error]
    return [(e.message, e.span.line, e.span.column) for e in errors]


def test_valid_library_converts_quantities() -> None:
    parts = parse_library(RELAY, "lib.parts.yaml")
    relay = parts["gp-relay-10a"]
    assert relay.kind == "relay"
    assert relay.data["coil"]["resistance"].to("ohm").magnitude == 640
    # YAML 1.1 reads a bare 'no:' key as the boolean false; the key stays 'no'.
    assert relay.data["poles"][0]["no"] == "14"


def test_wrong_dimension_names_key_path_and_line() -> None:
    bad = RELAY.replace(
        "{category: DC-13, voltage: 24 V", "{category: DC-13, voltage: 3 A"
    )
    [(message, line, column)] = _errors(bad)
    assert message.startswith("parts.gp-relay-10a.contacts.ratings[1].voltage:")
    assert "expected a voltage" in message and (line, column) == (12, 29)


def test_unknown_key_for_kind_is_named() -> None:
    bad = HEAD + "  d1:\n    kind: diode\n    vf: 0.7 V\n    colour: red\n"
    [(message, line, column)] = _errors(bad)
    assert "colour" in message and (line, column) == (7, 5)


def test_bare_number_quantity_is_refused() -> None:
    bad = HEAD + "  d1:\n    kind: diode\n    vf: 0.7\n"
    [(message, line, _)] = _errors(bad)
    assert "parts.d1.vf" in message and "unit" in message and line == 6


@pytest.mark.parametrize(
    ("text", "fragment"),
    [
        (HEAD + "  a: {kind: diode}\n  a: {kind: diode}\n", "duplicate key"),
        (
            "format: netcheck-parts/1\nparts: !!python/object:os.system {}\n",
            "not allowed",
        ),
        ("format: [unclosed\n", "invalid YAML"),
        ("format: netcheck-parts/2\nparts: {}\n", "format"),
        ("parts: {}\n", "format"),
        (
            HEAD
            + "  r: {kind: relay, contacts: {ratings: [{category: DC-99x, voltage: 1 V,"
            " current: 1 A}]}}\n",
            "category",
        ),
    ],
)
def test_broken_libraries_give_located_errors(text: str, fragment: str) -> None:
    errors = _errors(text)
    assert any(fragment in message for message, _, _ in errors), errors
    assert all(line >= 1 and column >= 1 for _, line, column in errors)


def test_alias_bomb_is_refused_quickly() -> None:
    # "Billion laughs": nine levels of nine aliases would expand to 9^9 nodes.
    lines = ['a0: &a0 ["x","x","x","x","x","x","x","x","x"]']
    for i in range(1, 9):
        refs = ",".join([f"*a{i - 1}"] * 9)
        lines.append(f"a{i}: &a{i} [{refs}]")
    errors = _errors("\n".join(lines) + "\n")
    assert any("too large" in message for message, _, _ in errors)


def test_unit_case_slip_in_a_library_says_what_to_write() -> None:
    bad = RELAY.replace("inductance: 1.1 H", "inductance: 1.1 h")  # h is the hour
    [(message, line, column)] = _errors(bad)
    assert message.startswith("parts.gp-relay-10a.coil.inductance:")
    assert message.endswith("write 1.1 H")
    assert (line, column) == (6, bad.splitlines()[5].index("inductance") + 1)
