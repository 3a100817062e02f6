"""The analysis does work in proportion to the design: counted, never timed.

Each design below is N independent rungs on one rail pair; the Python lines
the analysis (and the graph) executes must grow as N does. Two walks that
were quadratic are pinned: the circuit models looked up per internal
component (rungs with a series resistor), and the loads of unknown
resistance looked up per element (loads with no data).
"""

from __future__ import annotations

import sys
from collections.abc import Callable
from pathlib import Path

import pytest

from netcheck.analysis.elements import analyse
from netcheck.graph import build_graph
from netcheck.input import load_design

HEAD = "supply  G1  dc=24V  earth=minus  +:L+  -:M\n"


def _series_resistor(i: int) -> str:
    return (
        f"switch  S{i}  13:L+  14:A{i}\n"
        f"resistor  R{i}  R=100ohm  1:A{i}  2:B{i}\n"
        f"load  E{i}  type=heater  R=48ohm  1:B{i}  2:M\n"
    )


def _no_resistance(i: int) -> str:
    return f"switch  S{i}  13:L+  14:A{i}\nload  E{i}  type=heater  1:A{i}  2:M\n"


def _lines_executed(tmp: Path, rung: Callable[[int], str], count: int) -> int:
    path = tmp / f"rungs-{count}.cnet"
    path.write_text(HEAD + "".join(rung(i) for i in range(count)), encoding="utf-8")
    netlist = load_design(path, display_base=tmp)
    lines = 0

    def local(frame, event, arg):  # type: ignore[no-untyped-def]
        nonlocal lines
        lines += event == "line"
        return local

    def scope(frame, event, arg):  # type: ignore[no-untyped-def]
        name = frame.f_code.co_filename
        watched = "netcheck/analysis/" in name or name.endswith("netcheck/graph.py")
        return local if watched else None

    sys.settrace(scope)
    try:
        analyse(build_graph(netlist))
    finally:
        sys.settrace(None)
    return lines


@pytest.mark.parametrize("rung", [_series_resistor, _no_resistance])
def test_four_times_the_rungs_is_four_times_the_work(tmp_path, rung):
    small = _lines_executed(tmp_path, rung, 40)
    large = _lines_executed(tmp_path, rung, 160)
    # Linear work plus a constant: at most 4x, with 3 % for the rounding of
    # per-domain set-up; the quadratic walks made it 6x and more.
    assert large <= 4.12 * small, (small, large)
