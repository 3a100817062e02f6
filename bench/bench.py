"""Time netcheck's stages on synthetic designs of growing size.

Usage::

    python bench/bench.py                       # sizes 1000 5000 20000 100000
    python bench/bench.py --sizes 200,2000 --repeat 5 --json

For each size the design comes from ``bench/gen_design.py`` (deterministic for
a given size and seed) and is measured in a fresh subprocess, so that every
size gets its own peak-memory figure (``ru_maxrss``) and no cache of one size
helps the next. In the subprocess, after a warm-up on a tiny design (grammar
compiled, rule catalogue loaded), each repeat times:

- ``parse``: ``netcheck.input.cnet.parse.parse_text`` over every ``.cnet`` file of the
  design (syntax only; a part of ``load``);
- ``load``: ``netcheck.input.load_design`` (reading, parsing, includes, part
  library, attributes, poles -> Netlist);
- ``analysis``: ``netcheck.graph.build_graph`` + ``netcheck.analysis.elements.analyse``;
- ``rules``: ``netcheck.pipeline.run_checks``;
- ``report``: ``netcheck.report.Report.build`` + ``netcheck.report.json.render_json``
  (what ``netcheck check --format json`` does with the findings);
- ``lark``: a bare lark LALR parse of the same files with the project's grammar
  (no positions, no transformer), the yardstick of the ``ratio`` column.

``total`` is load + analysis + rules + report. The table shows medians over
``--repeat`` runs; ``ratio`` is total / lark. ``exp`` is the growth exponent of
the total between a size and the previous one (1.0 is linear). ``--cli``
also times the whole command line (``netcheck check --format json``) once per
size, interpreter start-up and imports included. ``--json`` writes the
results to ``bench/results/latest.json``.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import platform
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import gen_design  # noqa: E402

DEFAULT_SIZES = (1000, 5000, 20000, 100000)
STAGES = ("parse", "load", "analysis", "rules", "report", "lark")
RESULTS = HERE / "results" / "latest.json"
FORMAT = "netcheck-bench/1"


# --------------------------------------------------------------------------
# The measuring subprocess
# --------------------------------------------------------------------------


def _timed(function: Callable[[], Any]) -> tuple[float, Any]:
    start = time.perf_counter()
    value = function()
    return time.perf_counter() - start, value


def _cnet_files(top: Path) -> list[Path]:
    return sorted(top.parent.rglob("*.cnet"))


def _measure_once(top: Path, texts: dict[str, str], bare: Any) -> dict[str, Any]:
    """Time every stage once on the design whose top file is ``top``."""
    from netcheck.analysis.elements import analyse
    from netcheck.catalogue import load_catalogue
    from netcheck.graph import build_graph
    from netcheck.input import load_design
    from netcheck.input.cnet.parse import parse_text
    from netcheck.pipeline import run_checks
    from netcheck.report import Report
    from netcheck.report.json import render_json

    out: dict[str, Any] = {}
    out["parse"], _ = _timed(lambda: [parse_text(t, f) for f, t in texts.items()])
    out["lark"], _ = _timed(lambda: [bare.parse(t) for t in texts.values()])
    out["load"], netlist = _timed(lambda: load_design(top, display_base=top.parent))

    def analysis() -> Any:
        return analyse(build_graph(netlist))

    out["analysis"], result = _timed(analysis)
    out["rules"], findings = _timed(lambda: run_checks(netlist, result))
    catalogue = load_catalogue()

    def report() -> str:
        built = Report.build(findings, netlist.files)
        return render_json(built, catalogue)

    out["report"], text = _timed(report)
    out["findings"] = len(findings)
    out["json_bytes"] = len(text.encode("utf-8"))
    out["components"] = len(netlist.components)
    return out


def _warm_up() -> None:
    """Compile the grammar, load the catalogue and checks on a tiny design."""
    from netcheck.pipeline import check_path

    with tempfile.TemporaryDirectory() as folder:
        check_path(gen_design.generate(30, Path(folder)))


def worker(top: Path, repeat: int) -> dict[str, Any]:
    """Measure the design ``top`` ``repeat`` times; return the raw figures."""
    from lark import Lark

    from netcheck.resources import read_text

    rss_start = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    _warm_up()
    bare = Lark(read_text("grammar", "cnet.lark"), parser="lalr")
    texts = {
        f.relative_to(top.parent).as_posix(): f.read_text(encoding="utf-8")
        for f in _cnet_files(top)
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


# --------------------------------------------------------------------------
# The driver
# --------------------------------------------------------------------------


def _summarise(size: int, raw: dict[str, Any]) -> dict[str, Any]:
    runs = raw["runs"]
    median = {s: statistics.median(r[s] for r in runs) for s in STAGES}
    totals = [r["load"] + r["analysis"] + r["rules"] + r["report"] for r in runs]
    total = statistics.median(totals)
    return {
        "size": size,
        "components": runs[0]["components"],
        "files": raw["files"],
        "bytes": raw["bytes"],
        "findings": runs[0]["findings"],
        "repeat": len(runs),
        "median_s": {**median, "total": total},
        "min_total_s": min(totals),
        "max_total_s": max(totals),
        "ratio_total_to_lark": total / median["lark"] if median["lark"] else None,
        "per_1000_components_s": total / runs[0]["components"] * 1000,
        "peak_rss_mib": raw["rss_peak_kib"] / 1024,
        "rss_before_design_mib": raw["rss_ready_kib"] / 1024,
        "runs": runs,
    }


def _time_cli(top: Path, timeout: float) -> float | None:
    command = [
        sys.executable,
        "-m",
        "netcheck",
        "check",
        top.name,
        "--format",
        "json",
        "-o",
        os.devnull,
    ]
    start = time.perf_counter()
    try:
        done = subprocess.run(
            command, cwd=top.parent, capture_output=True, timeout=timeout, check=False
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
    one_rail: bool = False,
) -> dict[str, Any]:
    """Generate a design of ``size`` components and measure it in a subprocess."""
    with tempfile.TemporaryDirectory(prefix=f"netcheck-bench-{size}-") as folder:
        out_dir = (keep / str(size)) if keep is not None else Path(folder)
        top = gen_design.generate(size, out_dir, one_rail=one_rail)
        command = [
            sys.executable,
            str(Path(__file__).resolve()),
            "--worker",
            str(top),
            "--repeat",
            str(repeat),
        ]
        try:
            done = subprocess.run(
                command, capture_output=True, text=True, timeout=timeout, check=False
            )
        except subprocess.TimeoutExpired:
            return {"size": size, "timed_out": timeout}
        if done.returncode != 0:
            raise RuntimeError(f"bench worker failed for {size}:\n{done.stderr}")
        result = _summarise(size, json.loads(done.stdout))
        if cli:
            result["cli_s"] = _time_cli(top, timeout)
        return result


def _machine() -> dict[str, Any]:
    import lark

    import netcheck

    return {
        "python": platform.python_version(),
        "implementation": platform.python_implementation(),
        "platform": platform.platform(),
        "architecture": platform.machine(),
        "cpus": os.cpu_count(),
        "netcheck": netcheck.__version__,
        "lark": lark.__version__,
        "commit": _commit(),
    }


def _commit() -> str | None:
    try:
        done = subprocess.run(
            ["git", "rev-parse", "--short", "HEAD"],
            cwd=HERE,
            capture_output=True,
            text=True,
            timeout=10,
            check=False,
        )
    except (OSError, subprocess.TimeoutExpired):
        return None
    return done.stdout.strip() or None


def _exponents(results: Sequence[dict[str, Any]]) -> None:
    previous = None
    for result in results:
        if "timed_out" in result:
            previous = None
            continue
        if previous is not None:
            t0, t1 = previous["median_s"]["total"], result["median_s"]["total"]
            n0, n1 = previous["components"], result["components"]
            if t0 > 0 and t1 > 0 and n1 != n0:
                result["growth_exponent"] = math.log(t1 / t0) / math.log(n1 / n0)
        previous = result


def table(results: Sequence[dict[str, Any]]) -> str:
    """The results as a plain-text (and Markdown) table."""
    head = [
        "components",
        "files",
        "parse",
        "load",
        "analysis",
        "rules",
        "report",
        "total",
        "lark",
        "ratio",
        "ms/1k",
        "exp",
        "peak MiB",
    ]
    if any("cli_s" in r for r in results):
        head.append("cli")
    rows = [head, ["---:"] * len(head)]
    for r in results:
        if "timed_out" in r:
            rows.append(
                [str(r["size"]), f"timed out after {r['timed_out']:.0f} s"]
                + [""] * (len(head) - 2)
            )
            continue
        m = r["median_s"]
        exp = r.get("growth_exponent")
        row = [
            str(r["components"]),
            str(r["files"]),
            *(
                f"{m[s]:.3f}"
                for s in (
                    "parse",
                    "load",
                    "analysis",
                    "rules",
                    "report",
                    "total",
                    "lark",
                )
            ),
            f"{r['ratio_total_to_lark']:.1f}",
            f"{r['per_1000_components_s'] * 1000:.0f}",
            f"{exp:.2f}" if exp is not None else "-",
            f"{r['peak_rss_mib']:.0f}",
        ]
        if "cli" in head:
            cli = r.get("cli_s")
            row.append(f"{cli:.2f}" if cli is not None else "-")
        rows.append(row)
    return "\n".join("| " + " | ".join(row) + " |" for row in rows)


def _sizes(text: str) -> list[int]:
    try:
        sizes = [int(part) for part in text.replace(",", " ").split()]
    except ValueError:
        raise argparse.ArgumentTypeError(
            f"not a list of whole numbers: {text!r}"
        ) from None
    if not sizes or min(sizes) < 1:
        raise argparse.ArgumentTypeError("sizes must be whole numbers >= 1")
    return sizes


def build_parser() -> argparse.ArgumentParser:
    """The bench's command line."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument(
        "--sizes",
        type=_sizes,
        default=list(DEFAULT_SIZES),
        help="comma-separated component counts "
        f"(default {','.join(map(str, DEFAULT_SIZES))})",
    )
    parser.add_argument(
        "--repeat",
        type=int,
        default=3,
        help="runs per size; the table shows medians (default 3)",
    )
    parser.add_argument(
        "--timeout",
        type=float,
        default=3600.0,
        help="seconds allowed per size (default 3600)",
    )
    parser.add_argument(
        "--cli",
        action="store_true",
        help="also time the whole command line once per size",
    )
    parser.add_argument(
        "--json",
        action="store_true",
        help=f"write the results to {RESULTS.relative_to(HERE.parent)}",
    )
    parser.add_argument(
        "--output",
        type=Path,
        default=None,
        help="write the JSON results here instead (implies --json)",
    )
    parser.add_argument(
        "--keep",
        type=Path,
        default=None,
        help="keep the generated designs under this directory",
    )
    parser.add_argument(
        "--one-rail",
        action="store_true",
        help="generate every rung on one rail pair (one supply, one sheet)",
    )
    parser.add_argument("--worker", type=Path, help=argparse.SUPPRESS)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    """Run the bench; print the table; optionally write JSON."""
    args = build_parser().parse_args(argv)
    if args.repeat < 1:
        print("bench: error: --repeat must be at least 1", file=sys.stderr)
        return 2
    if args.worker is not None:
        print(json.dumps(worker(args.worker, args.repeat)))
        return 0
    results = []
    for size in args.sizes:
        print(f"bench: {size} components ...", file=sys.stderr, flush=True)
        results.append(
            measure_size(
                size, args.repeat, args.timeout, args.cli, args.keep, args.one_rail
            )
        )
    _exponents(results)
    print(table(results))
    if args.json or args.output is not None:
        target = args.output or RESULTS
        target.parent.mkdir(parents=True, exist_ok=True)
        document = {
            "format": FORMAT,
            "machine": _machine(),
            "repeat": args.repeat,
            "results": results,
        }
        target.write_text(json.dumps(document, indent=2) + "\n", encoding="utf-8")
        print(f"bench: wrote {target}", file=sys.stderr)
    return 0


if __name__ == "__main__":
    sys.exit(main())
