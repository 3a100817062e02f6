"""Time the input stage alone: parse, build and graph of generated designs.

Usage: ``python bench/input_stage.py [--shape NAME] [--runs 3] N [N ...]``
generates a design of about N components with ``gen_design.py`` for each N
(of the shape NAME of ``shapes.py``, mixed by default; ``--one-rail`` is
``--shape one-rail``),
then reads each in a fresh child process ``--runs`` times and prints the median
wall and CPU seconds of each step and the median peak resident memory of the
child. Parse is the reading of every file into statements; build is the rest
of ``load_design`` (part libraries, components, poles, waivers); graph is
``build_graph``. The whole pipeline is measured by ``bench.py``.
"""

from __future__ import annotations

import argparse
import json
import statistics
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent

# Run in the child: one read of one design, each step timed.
CHILD = r"""
import json, resource, sys, time
from pathlib import Path
import netcheck.input.cnet.read as read
from netcheck.graph import build_graph
from netcheck.input import load_design

spent = [0.0, 0.0]
parse_text = read.parse_text
def timed(text, file):
    wall, cpu = time.perf_counter(), time.process_time()
    try:
        return parse_text(text, file)
    finally:
        spent[0] += time.perf_counter() - wall
        spent[1] += time.process_time() - cpu
read.parse_text = timed
marks = [(time.perf_counter(), time.process_time())]
netlist = load_design(Path(sys.argv[1]))
marks.append((time.perf_counter(), time.process_time()))
build_graph(netlist)
marks.append((time.perf_counter(), time.process_time()))
(w0, c0), (w1, c1), (w2, c2) = marks
print(json.dumps({
    "components": len(netlist.components),
    "parse": spent[0], "parse_cpu": spent[1],
    "build": w1 - w0 - spent[0], "build_cpu": c1 - c0 - spent[1],
    "graph": w2 - w1, "graph_cpu": c2 - c1,
    "peak_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024,
}))
"""


def measure(design: Path, runs: int) -> dict[str, float]:
    """The medians over ``runs`` fresh processes reading ``design``."""
    results = []
    for _ in range(runs):
        done = subprocess.run(
            [sys.executable, "-c", CHILD, str(design)],
            capture_output=True,
            text=True,
            check=True,
        )
        results.append(json.loads(done.stdout))
    return {key: statistics.median(r[key] for r in results) for key in results[0]}


def main(argv: list[str] | None = None) -> int:
    """Generate, measure and print one line per size."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("sizes", nargs="+", type=int)
    parser.add_argument("--runs", type=int, default=3)
    parser.add_argument("--one-rail", action="store_true")
    parser.add_argument("--shape", default="mixed")
    args = parser.parse_args(argv)
    print("components  parse s (cpu)   build s (cpu)   graph s (cpu)   peak MB")
    with tempfile.TemporaryDirectory() as folder:
        for size in args.sizes:
            out = Path(folder) / str(size)
            extra = ["--shape", "one-rail" if args.one_rail else args.shape]
            made = subprocess.run(
                [sys.executable, str(HERE / "gen_design.py"), *extra, str(size), out],
                capture_output=True,
                text=True,
                check=True,
            )
            m = measure(Path(made.stdout.strip()), args.runs)
            print(
                f"{m['components']:>10.0f}  "
                f"{m['parse']:6.2f} ({m['parse_cpu']:5.2f})  "
                f"{m['build']:6.2f} ({m['build_cpu']:5.2f})  "
                f"{m['graph']:6.2f} ({m['graph_cpu']:5.2f})  "
                f"{m['peak_mb']:7.0f}",
                flush=True,
            )
    return 0


if __name__ == "__main__":
    sys.exit(main())
