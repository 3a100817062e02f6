"""Edits apply to a copy of the model, and their .cnet text is what they build."""

from __future__ import annotations

from pathlib import Path

import pytest

from netcheck.errors import InputErrors
from netcheck.fixes.diff import MARK, edited_texts, unified_diff
from netcheck.fixes.edits import (
    AddComponent,
    Reconnect,
    SetValues,
    UsePart,
    apply_edits,
    statement_text,
)
from netcheck.fixes.propose import quantity_text
from netcheck.input import load_design
from netcheck.units import Q_

DESIGN = """\
title "illustrative edit test"
supply G1 dc=24V +:L+ -:M
relay K1 coil.resistance=480ohm contacts.voltage_max=250V   # a relay
    A1:L+ A2:M
    13:L+ 14:N1
load Y1 type=valve R=48ohm L=0.5H 1:N1 2:M
diode V1 voltage_rating=50V current_rating=1A A:N1 K:M  # fitted backwards
"""


@pytest.fixture
def design(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):  # type: ignore[no-untyped-def]
    monkeypatch.chdir(tmp_path)  # shown paths are relative to the working folder
    path = tmp_path / "d.cnet"
    path.write_text(DESIGN, encoding="utf-8")
    return load_design(path, display_base=tmp_path), path


def test_add_component_leaves_the_original_untouched(design) -> None:  # type: ignore[no-untyped-def]
    netlist, _ = design
    edit = AddComponent(
        "diode", "V2", (("voltage_rating", "48V"),), (("A", "M"), ("K", "N1")), "Y1"
    )
    edited = apply_edits(netlist, [edit])
    assert netlist.component("V2") is None
    added = edited.component("V2")
    assert added is not None and added.value("voltage_rating") == Q_(48, "V")
    assert added.net_of("K") == "N1"


def test_reconnect_swaps_nets(design) -> None:  # type: ignore[no-untyped-def]
    netlist, _ = design
    edited = apply_edits(netlist, [Reconnect("V1", (("A", "M"), ("K", "N1")))])
    diode = edited.component("V1")
    assert diode is not None and diode.net_of("A") == "M" and diode.net_of("K") == "N1"
    assert diode.span == netlist.component("V1").span  # findings keep their place


def test_bad_edit_is_an_input_error(design) -> None:  # type: ignore[no-untyped-def]
    netlist, _ = design
    with pytest.raises(InputErrors):
        apply_edits(netlist, [UsePart("V1", "no-such-part")])


def test_text_of_each_edit_keeps_layout_and_comments(design) -> None:  # type: ignore[no-untyped-def]
    netlist, path = design
    fixes = [
        (
            "freewheel-diode-reversed at V1",
            [Reconnect("V1", (("A", "M"), ("K", "N1")))],
        ),
        ("suppressor-underrated at V1", [SetValues("V1", (("current_rating", "2A"),))]),
        (
            "inductive-load-unsuppressed at K1:13-14",
            [AddComponent("diode", "V2", (), (("A", "M"), ("K", "N1")), "K1")],
        ),
    ]
    texts = edited_texts(netlist, fixes)
    old, new = texts[netlist.file]
    assert old == DESIGN
    lines = new.split("\n")
    assert (
        "diode V1 voltage_rating=50V current_rating=2A A:M K:N1  # fitted backwards"
        in lines
    )
    # the new statement follows the relay's continuation lines, under the marker
    index = lines.index("    13:L+ 14:N1")
    assert lines[index + 1] == f"{MARK}: inductive-load-unsuppressed at K1:13-14"
    assert lines[index + 2] == "diode V2 A:M K:N1"
    diff = unified_diff(texts)
    assert diff.startswith(f"--- a/{netlist.file}\n+++ b/{netlist.file}\n")


def test_statement_text_quotes_values_with_spaces(design) -> None:  # type: ignore[no-untyped-def]
    netlist, _ = design
    edit = AddComponent("resistor", "R9", (("R", "47 ohm"),), (("1", "N1"),), "Y1")
    assert statement_text(edit, netlist) == 'resistor R9 R="47 ohm" 1:N1'


@pytest.mark.parametrize(
    ("value", "unit", "text"),
    [
        (Q_(48, "V"), "V", "48V"),  # exact values stay
        (Q_(37.5, "mA"), "A", "0.038A"),  # rounded up, never down
        (Q_(0.2045, "J"), "J", "0.21J"),
        (Q_(101, "V"), "V", "110V"),
    ],
)
def test_quantity_text_rounds_up(value, unit, text) -> None:  # type: ignore[no-untyped-def]
    assert quantity_text(value, unit) == text
    assert Q_(text).to(unit).magnitude >= value.to(unit).magnitude
