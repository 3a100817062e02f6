"""The measuring side of the bench: one design per fresh subprocess, and --jobs.

``worker`` runs inside the subprocess: after a warm-up on a tiny design it
times every stage ``repeat`` times (wall clock and CPU time) and reports its
own peak resident memory. ``measure_size`` generates a design of one shape and
size and runs the worker on it; ``measure_jobs`` times the whole command line
on a folder of designs with ``--jobs 1`` and ``--jobs N``.
"""

from __future__ import annotations

import json
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

import gen_design

__all__ = ["STAGES", "worker", "measure_size", "measure_jobs", "summarise"]

STAGES = ("parse", "load", "analysis", "rules", "report", "lark")
TOTAL = ("load", "analysis", "rules", "report")
BENCH = Path(__file__).resolve().parent / "bench.py"


def _timed(function: Callable[[], Any]) -> tuple[float, float, Any]:
    wall, cpu = time.perf_counter(), time.process_time()
    value = function()
    return time.perf_counter() - wall, time.process_time() - cpu, value


def _measure_once(top: Path, texts: dict[str, str], bare: Any) -> dict[str, Any]:
    """Time every stage once on the design whose top file is ``top``.

    ``bare`` is the yardstick lark parser, or None to skip the parse and lark
    stages (they repeat work ``load`` does; recorded as 0).
    """
    from netcheck.analysis.elements import analyse
    from netcheck.catalogue import load_catalogue
    from netcheck.graph import build_graph
    from netcheck.input import load_design
    from netcheck.input.cnet.parse import parse_text
    from netcheck.pipeline import run_checks
    from netcheck.report import Report
    from netcheck.report.json import render_json

    out: dict[str, Any] = {}
    cpu: dict[str, float] = {}

    def stage(name: str, function: Callable[[], Any]) -> Any:
        out[name], cpu[name], value = _timed(function)
        return value

    if bare is not None:
        stage("parse", lambda: [parse_text(t, f) for f, t in texts.items()])
        stage("lark", lambda: [bare.parse(t) for t in texts.values()])
    else:
        out["parse"] = out["lark"] = cpu["parse"] = cpu["lark"] = 0.0
    netlist = stage("load", lambda: load_design(top, display_base=top.parent))
    result = stage("analysis", lambda: analyse(build_graph(netlist)))
    findings = stage("rules", lambda: run_checks(netlist, result))
    catalogue = load_catalogue()
    text = stage(
        "report", lambda: render_json(Report.build(findings, netlist.files), catalogue)
    )
    out["cpu"] = cpu
    out["findings"] = len(findings)
    out["json_bytes"] = len(text.encode("utf-8"))
    out["components"] = len(netlist.components)
    out["elements"] = len(result.elements)
    return out


def _warm_up() -> None:
    """Compile the grammar, load the catalogue and checks on a tiny design."""
    from netcheck.pipeline import check_path

    with tempfile.TemporaryDirectory() as folder:
        check_path(gen_design.generate(30, Path(folder)))


def worker(top: Path, repeat: int, yardstick: bool = True) -> dict[str, Any]:
    """Measure the design ``top`` ``repeat`` times; return the raw figures."""
    from lark import Lark

    from netcheck.resources import read_text

    rss_start = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    _warm_up()
    bare = Lark(read_text("grammar", "cnet.lark"), parser="lalr") if yardstick else None
    files = sorted(top.parent.rglob("*.cnet"))
    texts = {
        f.relative_to(top.parent).as_posix(): f.read_text(encoding="utf-8")
        for f in files
    }
    rss_ready = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    runs = [_measure_once(top, texts, bare) for _ in range(repeat)]
    rss_peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    return {
        "runs": runs,
        "files": len(texts),
        "bytes": sum(len(t.encode("utf-8")) for t in texts.values()),
        # ru_maxrss is in KiB on Linux.
        "rss_start_kib": rss_start,
        "rss_ready_kib": rss_ready,
        "rss_peak_kib": rss_peak,
    }


def summarise(size: int, raw: dict[str, Any], shape: str = "mixed") -> dict[str, Any]:
    """Medians over the runs of one size, wall clock and CPU time."""
    runs = raw["runs"]
    median = {s: statistics.median(r[s] for r in runs) for s in STAGES}
    cpu = {s: statistics.median(r["cpu"][s] for r in runs) for s in STAGES}
    totals = [sum(r[s] for s in TOTAL) for r in runs]
    total = statistics.median(totals)
    first = runs[0]
    return {
        "shape": shape,
        "size": size,
        "components": first["components"],
        "elements": first["elements"],
        "files": raw["files"],
        "bytes": raw["bytes"],
        "findings": first["findings"],
        "repeat": len(runs),
        "median_s": {**median, "total": total},
        "median_cpu_s": {
            **cpu,
            "total": statistics.median(sum(r["cpu"][s] for s in TOTAL) for r in runs),
        },
        "min_total_s": min(totals),
        "max_total_s": max(totals),
        "ratio_total_to_lark": total / median["lark"] if median["lark"] else None,
        "per_1000_components_s": total / first["components"] * 1000,
        "peak_rss_mib": raw["rss_peak_kib"] / 1024,
        "rss_before_design_mib": raw["rss_ready_kib"] / 1024,
        "runs": runs,
    }


def _command(target: Path, *extra: str) -> list[str]:
    return [
        sys.executable,
        "-m",
        "netcheck",
        "check",
        str(target),
        "--format",
        "json",
        "-o",
        os.devnull,
        *extra,
    ]


def _time_cli(command: Sequence[str], cwd: Path, timeout: float) -> float | None:
    start = time.perf_counter()
    try:
        done = subprocess.run(
            command, cwd=cwd, capture_output=True, timeout=timeout, check=False
        )
    except subprocess.TimeoutExpired:
        return None
    if done.returncode not in (0, 1):
        raise RuntimeError(f"netcheck check failed:\n{done.stderr.decode()}")
    return time.perf_counter() - start


def measure_size(
    size: int,
    repeat: int,
    timeout: float,
    cli: bool,
    keep: Path | None = None,
    shape: str = "mixed",
    yardstick: bool = True,
) -> dict[str, Any]:
    """Generate a design of ``size`` components and measure it in a subprocess."""
    with tempfile.TemporaryDirectory(prefix=f"netcheck-bench-{size}-") as folder:
        out_dir = (keep / shape / str(size)) if keep is not None else Path(folder)
        top = gen_design.generate(size, out_dir, shape=shape)
        command = [sys.executable, str(BENCH), "--worker", str(top)]
        command += ["--repeat", str(repeat)] + ([] if yardstick else ["--no-yardstick"])
        try:
            done = subprocess.run(
                command, capture_output=True, text=True, timeout=timeout, check=False
            )
        except subprocess.TimeoutExpired:
            return {"shape": shape, "size": size, "timed_out": timeout}
        if done.returncode != 0:
            raise RuntimeError(f"bench worker failed for {size}:\n{done.stderr}")
        result = summarise(size, json.loads(done.stdout), shape)
        if cli:
            result["cli_s"] = _time_cli(_command(Path(top.name)), top.parent, timeout)
        return result


def measure_jobs(
    designs: int, size: int, jobs: int, repeat: int, timeout: float
) -> dict[str, Any]:
    """Time ``netcheck check FOLDER`` with ``--jobs 1`` and ``--jobs N``."""
    with tempfile.TemporaryDirectory(prefix="netcheck-bench-jobs-") as folder:
        root = Path(folder)
        for index in range(designs):
            # Each design its own folder; distinct seeds, distinct circuits.
            gen_design.generate(
                size, root / f"d{index:02d}", seed=gen_design.SEED + index
            )
        times: dict[str, list[float | None]] = {}
        for count in (1, jobs):
            command = _command(root, "--jobs", str(count))
            times[str(count)] = [
                _time_cli(command, root, timeout) for _ in range(repeat)
            ]
    medians = {
        k: statistics.median(t for t in v if t is not None) if all(v) else None
        for k, v in times.items()
    }
    one, many = medians["1"], medians[str(jobs)]
    return {
        "designs": designs,
        "components_each": size,
        "jobs": jobs,
        "runs_s": times,
        "median_s": medians,
        "speed_up": one / many if one and many else None,
    }
