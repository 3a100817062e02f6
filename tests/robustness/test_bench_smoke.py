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
    assert "| components |" in table and "\n| 200 |" in table
    document = json.loads(target.read_text(encoding="utf-8"))
    assert document["format"] == "netcheck-bench/1"
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
    from netcheck.input import load_design
    from netcheck.graph import build_graph

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
