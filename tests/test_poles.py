"""Pole inference from terminal numbers.

Source: the terminal-marking convention for control devices (IEC 60947-1 Annex L /
EN 50005, as the spec states it): A1/A2 coil; units digit 1-2 NC, 3-4 NO,
1/2/4 changeover with 1 common; tens digit the pole's sequence number; main poles
1-2, 3-4, 5-6. The 5-6 / 7-8 special-function digits are from memory.
"""

from __future__ import annotations

import pytest

from netcheck.input.poles import infer_poles
from netcheck.model import Pole


@pytest.mark.parametrize(
    ("terminals", "poles"),
    [
        (["A1", "A2", "13", "14"], [Pole("13", no="14")]),
        (["21", "22"], [Pole("21", nc="22")]),
        (["11", "12", "14"], [Pole("11", no="14", nc="12")]),
        (["11", "14"], [Pole("11", no="14")]),  # a changeover used as NO
        (
            ["1", "2", "3", "4", "5", "6"],
            [Pole("1", no="2"), Pole("3", no="4"), Pole("5", no="6")],
        ),
        (
            ["1", "2", "3", "4", "5", "6", "7", "8"],
            [
                Pole("1", no="2"),
                Pole("3", no="4"),
                Pole("5", no="6"),
                Pole("7", no="8"),
            ],
        ),  # main pole 7-8 (from memory)
        (["7", "8"], [Pole("7", no="8")]),
        (["67", "68"], [Pole("67", no="68")]),  # special-function NO (from memory)
        (["55", "56"], [Pole("55", nc="56")]),  # special-function NC (from memory)
    ],
)
def test_convention(terminals: list[str], poles: list[Pole]) -> None:
    found, unexplained = infer_poles(terminals, has_coil=True)
    assert found == poles and unexplained == []


@pytest.mark.parametrize(
    ("terminals", "unexplained"),
    [
        (["13", "24"], ["13", "24"]),
        (["13"], ["13"]),
        (["X1"], ["X1"]),
        (["1"], ["1"]),
        (["A1", "A2"], []),
    ],
)
def test_unexplained_terminals_are_named(
    terminals: list[str], unexplained: list[str]
) -> None:
    assert infer_poles(terminals, has_coil=True)[1] == unexplained


def test_a1_is_not_a_coil_on_a_switch() -> None:
    assert infer_poles(["A1", "A2"], has_coil=False)[1] == ["A1", "A2"]
