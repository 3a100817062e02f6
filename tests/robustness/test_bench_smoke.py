"""The benchmark runs end to end on a small design (no timing assertions)."""

from __future__ import annotations

import contextlib
import importlib.util
import io
import json
import sys
from pathlib import Path
from types import ModuleType

import pytest

BENCH = Path(__file__).resolve().parents[2] / "bench" / "bench.py"


def _load_bench() -> ModuleType:
    spec = importlib.util.spec_from_file_location("netcheck_bench", BENCH)
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    sys.modules["netcheck_bench"] = module
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def bench() -> ModuleType:
    return _load_bench()


def test_the_bench_measures_a_small_design(bench: ModuleType, tmp_path: Path) -> None:
    target = tmp_path / "results.json"
    out = io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(io.StringIO()):
        code = bench.main(
            ["--sizes", "200", "--repeat", "1", "--cli", "--output", str(target)]
        )
    assert code == 0
    table = out.getvalue()
    assert "| components |" in table and "\n| mixed | 200 |" in table
    document = json.loads(target.read_text(encoding="utf-8"))
    assert document["format"] == "netcheck-bench/2"
    assert document["machine"]["cpus"] >= 1
    (result,) = document["results"]
    assert result["size"] == 200 and result["components"] == 200
    assert result["repeat"] == 1 and len(result["runs"]) == 1
    for stage in (*bench.STAGES, "total"):
        assert result["median_s"][stage] >= 0, stage
    assert result["median_s"]["total"] >= result["median_s"]["rules"]
    assert result["ratio_total_to_lark"] > 0
    assert result["peak_rss_mib"] > 0
    assert result["cli_s"] is not None and result["cli_s"] > 0
    assert result["median_cpu_s"]["total"] > 0


def test_the_table_shows_growth_and_timeouts(bench: ModuleType) -> None:
    def fake(size: int, total: float) -> dict:
        stages = dict.fromkeys(bench.STAGES, total / 10)
        return {
            "size": size,
            "components": size,
            "files": 1,
            "median_s": {**stages, "total": total},
            "ratio_total_to_lark": 10.0,
            "per_1000_components_s": total / size * 1000,
            "peak_rss_mib": 50.0,
        }

    results = [fake(1000, 1.0), fake(4000, 4.0), {"size": 9000, "timed_out": 60.0}]
    bench._exponents(results)
    assert results[1]["growth_exponent"] == pytest.approx(1.0)
    table = bench.table(results)
    assert "| 1.00 |" in table and "timed out after 60 s" in table


def test_exponents_are_per_shape(bench: ModuleType) -> None:
    def fake(shape: str, size: int, total: float) -> dict:
        return {
            "shape": shape,
            "components": size,
            "median_s": {"total": total},
            "median_cpu_s": {"total": total / 2},
        }

    # A slow shape after a fast one must not make a slope between the two.
    results = [fake("a", 1000, 1.0), fake("b", 4000, 64.0), fake("a", 4000, 8.0)]
    bench._exponents(results)
    assert "growth_exponent" not in results[1]
    assert results[2]["growth_exponent"] == pytest.approx(1.5)
    assert results[2]["growth_exponent_cpu"] == pytest.approx(1.5)


@pytest.mark.parametrize(
    ("text", "sizes"),
    [("200", [200]), ("1000,5000", [1000, 5000]), ("10 20", [10, 20])],
)
def test_sizes_are_parsed(bench: ModuleType, text: str, sizes: list[int]) -> None:
    assert bench._sizes(text) == sizes


@pytest.mark.parametrize("text", ["", "0", "-5", "ten", "1,x"])
def test_bad_sizes_are_refused(bench: ModuleType, text: str) -> None:
    import argparse

    with pytest.raises(argparse.ArgumentTypeError):
        bench._sizes(text)


def test_the_one_rail_shape_puts_every_rung_on_one_bus(tmp_path: Path) -> None:
    """One supply, one fused bus: every rung hangs off the same rail pair."""
    sys.path.insert(0, str(BENCH.parent))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH.parent))
    from netcheck.analysis.elements import analyse
    from netcheck.graph import build_graph
    from netcheck.input import load_design

    top = gen_design.generate(300, tmp_path, one_rail=True)
    netlist = load_design(top, display_base=tmp_path)
    assert len(netlist.components) == 300
    kinds = [c for c in netlist.components if c.ref.startswith("G")]
    assert len(kinds) == 1  # one supply
    assert len(list((tmp_path / gen_design.SHEET_DIR).glob("*.cnet"))) == 1
    graph = build_graph(netlist)
    assert len(graph.domains) == 1  # one supply, one domain
    analysis = analyse(graph)
    switches = [b for b in graph.domains[0].branches if b.role == "switch"]
    assert switches and set(analysis.elements) >= {b.key for b in switches}


def _gen_design() -> ModuleType:
    sys.path.insert(0, str(BENCH.parent))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH.parent))
    return gen_design


def _kinds(netlist) -> dict[str, int]:  # noqa: ANN001
    counts: dict[str, int] = {}
    for component in netlist.components:
        counts[component.kind] = counts.get(component.kind, 0) + 1
    return counts


def _chains(lines: list[str]) -> list[int]:
    """Lengths of the runs of switches written one after another."""
    runs, run = [], 0
    for line in lines:
        if line.startswith("switch"):
            run += 1
        elif run:
            runs.append(run)
            run = 0
    return runs


SHAPE_SIZE = 400


@pytest.mark.parametrize(
    "shape",
    [
        "mixed",
        "one-rail",
        "many-supplies",
        "series",
        "parallel",
        "sheets",
        "plc",
        "unsuppressed",
    ],
)
def test_every_shape_generates_and_checks(shape: str, tmp_path: Path) -> None:
    """Each shape: exact component count, its structure, and a clean check."""
    from netcheck.analysis.elements import analyse
    from netcheck.graph import build_graph
    from netcheck.input import load_design
    from netcheck.pipeline import run_checks

    gen = _gen_design()
    top = gen.generate(SHAPE_SIZE, tmp_path, shape=shape)
    again = gen.generate(SHAPE_SIZE, tmp_path / "again", shape=shape)
    assert top.read_text() == again.read_text()  # deterministic
    netlist = load_design(top, display_base=tmp_path)
    assert len(netlist.components) == SHAPE_SIZE
    graph = build_graph(netlist)
    analysis = analyse(graph)
    findings = run_checks(netlist, analysis)
    kinds = _kinds(netlist)
    sheets = sorted((tmp_path / gen.SHEET_DIR).glob("*.cnet"))
    text = [ln for f in sheets for ln in f.read_text().splitlines()]
    unsuppressed = [f for f in findings if f.rule == "inductive-load-unsuppressed"]
    switches = sum(1 for b in graph.domains[0].branches if b.role == "switch")
    assert switches and len(analysis.elements) >= switches
    if shape == "one-rail":
        assert kinds["supply"] == 1 and len(sheets) == 1
    elif shape == "many-supplies":
        assert kinds["supply"] == SHAPE_SIZE // 25 == len(graph.domains)
    elif shape == "series":
        # 10-50 interlock contacts per rung (the last rung may be cut short).
        chains = _chains(text)
        assert all(10 <= c <= 50 for c in chains[:-1]) and max(chains) >= 20
    elif shape == "parallel":
        # Stop contact then 20 start contacts: 21 switches written together.
        assert set(_chains(text)) == {21}
        assert sum(1 for ln in text if ln.strip().startswith("13:")) == kinds["relay"]
    elif shape == "sheets":
        assert len(sheets) == SHAPE_SIZE // 20  # 100 from 2,000 components up
    elif shape == "plc":
        assert kinds["output"] >= 100 and kinds["diode"] >= kinds["output"] * 0.9
    elif shape == "unsuppressed":
        assert "diode" not in kinds
        loads = [ld for ld in analysis.loads.values() if ld.facts.inductance]
        assert len(unsuppressed) >= len(loads) * 0.9 > 0
    if shape != "unsuppressed":
        assert len(unsuppressed) < kinds.get("diode", 1)


def test_the_quick_bench_runs_every_shape(bench: ModuleType) -> None:
    args = bench.build_parser().parse_args(["--quick"])
    runs = bench._runs(args)
    assert [shape for shape, _, _ in runs] == list(bench.gen_design.SHAPES)
    assert {(size, repeat) for _, size, repeat in runs} == {(bench.QUICK_SIZE, 1)}
    large = bench.build_parser().parse_args(["--large", "plc:100000"])
    assert bench._runs(large)[-1] == ("plc", 100000, 1)
