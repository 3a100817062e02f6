"""Cuts of one shape share a solve, and the shared solve changes nothing.

No outside source: each design is analysed twice, once as shipped and once
with ``cut_solve``'s memo off (every cut solved as given by ``solve_dc``);
every element's analysis must print the same (repr keeps every bit of a
float and tells -0.0 from 0.0). Designs: every rule case, the samples and
the bench's shapes, where rungs repeat under other names (one rail, PLC
cards, mixed, unsuppressed).
"""

from __future__ import annotations

from pathlib import Path

import pytest
from helpers import REPOSITORY_DESIGNS, bench_design, design_id, load_or_skip

from netcheck.analysis import cut_solve
from netcheck.analysis.circuit import Diode, Resistor
from netcheck.analysis.elements import analyse
from netcheck.graph import build_graph
from netcheck.input import load_design


def _both(netlist, monkeypatch):  # type: ignore[no-untyped-def]
    calls = []
    solve = cut_solve.solve_dc

    def counted(*args):  # type: ignore[no-untyped-def]
        calls.append(args)
        return solve(*args)

    monkeypatch.setattr(cut_solve, "solve_dc", counted)
    shipped = analyse(build_graph(netlist)).elements
    shared = len(calls)
    with monkeypatch.context() as patch:
        patch.setattr(cut_solve, "_shape", lambda *args: None)
        alone = analyse(build_graph(netlist)).elements
    assert list(shipped) == list(alone)
    for name, element in shipped.items():
        assert repr(element) == repr(alone[name]), name
    return shared, len(calls) - shared


@pytest.mark.parametrize("path", REPOSITORY_DESIGNS, ids=design_id)
def test_repository_designs(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    netlist = load_or_skip(path)
    shared, alone = _both(netlist, monkeypatch)
    assert shared <= alone


@pytest.mark.parametrize(
    "shape", ["one-rail", "plc", "mixed", "unsuppressed", "series"]
)
def test_bench_shapes(
    shape: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    top = bench_design(600, tmp_path, shape)
    shared, alone = _both(load_design(top, display_base=tmp_path), monkeypatch)
    assert shared < alone  # repeated rungs: fewer solves


ROWS = [
    ("K1:coil", "<open>", "M", Resistor("K1:coil", "x", "y", 240.0)),
    ("V1", "M", "<open>", Diode("V1", "x", "y", 0.7)),
]


def _shape(nodes, fixed, rows, node="<open>", group="L+"):  # type: ignore[no-untyped-def]
    return cut_solve._shape(nodes, fixed, rows, node, group)


def test_the_shape_holds_what_the_solve_reads() -> None:
    nodes = ["<open>", "L+", "M"]
    fixed = {"L+": 24.0, "M": 0.0}
    base = _shape(nodes, fixed, ROWS)
    renamed = [
        ("K9:coil", "<open>", "N", ROWS[0][3]),
        ("V9", "N", "<open>", ROWS[1][3]),
    ]
    assert _shape(["<open>", "L+", "N"], {"L+": 24.0, "N": 0.0}, renamed) == base
    assert _shape(nodes, {"L+": 24.0, "M": -0.0}, ROWS) != base  # -0.0 is not 0.0
    assert _shape(nodes, {"L+": 24.0, "M": 1.0}, ROWS) != base
    other = [(*ROWS[0][:3], Resistor("K1:coil", "x", "y", 480.0)), ROWS[1]]
    assert _shape(nodes, fixed, other) != base
    zener = [ROWS[0], (*ROWS[1][:3], Diode("V1", "x", "y", 0.7, 33.0))]
    assert _shape(nodes, fixed, zener) != base
    turned = [ROWS[0], ("V1", "<open>", "M", ROWS[1][3])]
    assert _shape(nodes, fixed, turned) != base
    assert _shape(nodes, fixed, ROWS, group="M") != base  # another node read back
    assert _shape(nodes, {"L+": 24, "M": 0.0}, ROWS) is None  # not a float


def test_remembered_values_give_the_same_shape() -> None:
    """``_shape`` with its memo of model values is ``_shape`` without it."""
    nodes = ["<open>", "L+", "M"]
    fixed = {"L+": 24.0, "M": 0.0}
    values: dict = {}
    base = _shape(nodes, fixed, ROWS)
    assert cut_solve._shape(nodes, fixed, ROWS, "<open>", "L+", values) == base
    assert cut_solve._shape(nodes, fixed, ROWS, "<open>", "L+", values) == base
    assert len(values) == 2
    # An entry is read only for the very model it holds (ids can be reused).
    model = ROWS[0][3]
    values[id(model)] = (Resistor("K1:coil", "x", "y", 1.0), ("r", 1.0))
    assert cut_solve._shape(nodes, fixed, ROWS, "<open>", "L+", values) == base
    integer = [(*ROWS[0][:3], Resistor("K1:coil", "x", "y", 240)), ROWS[1]]
    assert cut_solve._shape(nodes, fixed, integer, "<open>", "L+", values) is None
