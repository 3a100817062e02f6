"""The input seam: a suffix picks the reader; include targets come from the lexer."""

from __future__ import annotations

from pathlib import Path

import pytest

from netcheck import input as design_input
from netcheck.input import (
    READERS,
    Reader,
    design_suffixes,
    included_files,
    load_design,
)
from netcheck.kinds import KIND_ATTRIBUTES, KIND_TERMINALS, KINDS, SWITCHING_KINDS
from netcheck.model import Netlist


def test_included_files_are_the_include_statements_only(tmp_path: Path) -> None:
    top = tmp_path / "top.cnet"
    top.write_text(
        'title "t"\n'
        'include "a.cnet"\n'
        '# include "comment.cnet"\n'
        "relay K1 A1:x\n"
        '  include "continued.cnet"\n'
        'load Y1 type="include"\n'
        'include "sub/b \\"q\\".cnet"\n',
        encoding="utf-8",
    )
    assert included_files(top) == [
        (tmp_path / "a.cnet").resolve(),
        (tmp_path / "sub" / 'b "q".cnet').resolve(),
    ]


def test_a_line_the_lexer_cannot_read_does_not_hide_later_includes(
    tmp_path: Path,
) -> None:
    top = tmp_path / "top.cnet"
    top.write_text('relay K1 A1:x "open\ninclude "later.cnet"\n', encoding="utf-8")
    assert included_files(top) == [(tmp_path / "later.cnet").resolve()]


def test_included_files_of_a_missing_or_foreign_file_is_empty(tmp_path: Path) -> None:
    assert included_files(tmp_path / "absent.cnet") == []
    other = tmp_path / "notes.txt"
    other.write_text('include "a.cnet"\n', encoding="utf-8")
    assert included_files(other) == []


def test_a_second_format_is_one_table_entry(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # A toy format: one reference per line, each a load with no connections.
    def load_toy(path: Path, extra_parts, allow_outside, display_base) -> Netlist:
        text = path.read_text(encoding="utf-8")
        cnet = "".join(f"load {ref}\n" for ref in text.split())
        return design_input.read_design_text(cnet)

    def toy_includes(path: Path) -> list[Path]:
        return [path.with_suffix(".more")]

    monkeypatch.setitem(READERS, ".toy", Reader(load_toy, toy_includes))
    design = tmp_path / "d.toy"
    design.write_text("Y1 Y2\n", encoding="utf-8")
    assert ".toy" in design_suffixes() and ".cnet" in design_suffixes()
    assert [c.ref for c in load_design(design).components] == ["Y1", "Y2"]
    assert included_files(design) == [tmp_path / "d.more"]
    # The .cnet reader is untouched by the registration.
    cnet = tmp_path / "d.cnet"
    cnet.write_text("load Y9\n", encoding="utf-8")
    assert [c.ref for c in load_design(cnet).components] == ["Y9"]


def test_every_kind_has_terminals_and_attributes() -> None:
    # language.md, "Component kinds": one table, no kind left out.
    assert set(KINDS) == set(KIND_ATTRIBUTES) == set(KIND_TERMINALS)
    for kind in SWITCHING_KINDS:
        assert kind in KINDS
