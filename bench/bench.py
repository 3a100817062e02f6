"""Time netcheck's stages on synthetic designs of every shape and growing size.

Usage::

    python bench/bench.py                               # mixed shape, 1000..100000
    python bench/bench.py --shapes all --sizes 2000,8000,20000 --jobs 2 --json
    python bench/bench.py --quick                       # every shape, 200, once

Designs come from ``bench/gen_design.py`` (deterministic for a size, shape and
seed; the shapes are in ``bench/shapes.py``). Each size is measured in a fresh
subprocess (``bench/measure.py``), so that every size gets its own peak memory
(``ru_maxrss``) and no cache of one size helps the next. After a warm-up on a
tiny design (grammar compiled, rule catalogue loaded), each repeat times, in
wall clock and CPU time:

- ``parse``: ``netcheck.input.cnet.parse.parse_text`` over every ``.cnet`` file
  of the design (syntax only; a part of ``load``);
- ``load``: ``netcheck.input.load_design`` (reading, parsing, includes, part
  library, attributes, poles -> Netlist);
- ``analysis``: ``netcheck.graph.build_graph`` + ``netcheck.analysis.elements.analyse``;
- ``rules``: ``netcheck.pipeline.run_checks``;
- ``report``: ``netcheck.report.Report.build`` + ``netcheck.report.json.render_json``;
- ``lark``: a bare lark LALR parse of the same files with the project's grammar
  (no positions, no transformer), the yardstick of the ``ratio`` column.

``total`` is load + analysis + rules + report. Tables show medians over
``--repeat`` runs; ``exp`` is the growth exponent (log-log slope) of the total
between a size and the previous size of the same shape (1.0 is linear).
``--cli`` also times the whole command line once per size; ``--jobs N`` times
``netcheck check`` on a folder of 20 designs with ``--jobs 1`` and ``--jobs N``.
``--json`` writes everything to ``bench/results/latest.json``.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import subprocess
import sys
from collections.abc import Sequence
from pathlib import Path
from typing import Any

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import gen_design  # noqa: E402
from measure import STAGES, measure_jobs, measure_size, worker  # noqa: E402
from summary import exponents, shape_table, table  # noqa: E402

__all__ = ["STAGES", "main", "table", "shape_table", "build_parser"]

DEFAULT_SIZES = (1000, 5000, 20000, 100000)
QUICK_SIZE = 200
JOB_DESIGNS = 20
JOB_DESIGN_SIZE = 500
RESULTS = HERE / "results" / "latest.json"
FORMAT = "netcheck-bench/2"
_exponents = exponents  # the name the smoke test and older scripts use


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
        help="the one-rail shape only (every rung on one rail pair)",
    )
    parser.add_argument(
        "--shapes",
        type=_shapes,
        default=["mixed"],
        help=f"comma-separated shapes, or all ({', '.join(gen_design.SHAPES)})",
    )
    parser.add_argument(
        "--large",
        type=str,
        default=None,
        metavar="SHAPE:N",
        help="after the shapes, one run of N components of SHAPE (e.g. mixed:100000)",
    )
    parser.add_argument(
        "--jobs",
        type=int,
        default=0,
        metavar="N",
        help=f"also time {JOB_DESIGNS} designs with --jobs 1 and --jobs N",
    )
    parser.add_argument(
        "--quick",
        action="store_true",
        help=f"every shape at {QUICK_SIZE} components, one run (a smoke run)",
    )
    parser.add_argument(
        "--no-yardstick",
        action="store_true",
        help="skip the parse and bare lark stages (saves about a third of the run)",
    )
    parser.add_argument("--worker", type=Path, help=argparse.SUPPRESS)
    return parser


def _shapes(text: str) -> list[str]:
    names = [part for part in text.replace(",", " ").split()]
    if names == ["all"]:
        return list(gen_design.SHAPES)
    unknown = [n for n in names if n not in gen_design.SHAPES]
    if not names or unknown:
        raise argparse.ArgumentTypeError(
            f"unknown shape {', '.join(unknown) or text!r}; "
            f"choose from {', '.join(gen_design.SHAPES)} or all"
        )
    return names


def _large(text: str | None) -> tuple[str, int] | None:
    if text is None:
        return None
    shape, _, size = text.partition(":")
    return _shapes(shape)[0], _sizes(size)[0]


def _runs(args: argparse.Namespace) -> list[tuple[str, int, int]]:
    """(shape, size, repeat) of every measurement asked for, in order."""
    if args.quick:
        return [(shape, QUICK_SIZE, 1) for shape in gen_design.SHAPES]
    shapes = ["one-rail"] if args.one_rail else args.shapes
    runs = [(shape, size, args.repeat) for shape in shapes for size in args.sizes]
    large = _large(args.large)
    if large is not None:
        runs.append((*large, 1))
    return runs


def _write(target: Path, document: dict[str, Any]) -> None:
    target.parent.mkdir(parents=True, exist_ok=True)
    temporary = target.with_suffix(".tmp")
    temporary.write_text(json.dumps(document, indent=2) + "\n", encoding="utf-8")
    os.replace(temporary, target)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the bench; print the tables; optionally write JSON."""
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.repeat < 1:
        print("bench: error: --repeat must be at least 1", file=sys.stderr)
        return 2
    try:
        runs = _runs(args)
    except argparse.ArgumentTypeError as error:
        print(f"bench: error: --large: {error}", file=sys.stderr)
        return 2
    if args.worker is not None:
        print(json.dumps(worker(args.worker, args.repeat, not args.no_yardstick)))
        return 0
    results = []
    for shape, size, repeat in runs:
        print(f"bench: {shape} {size} components ...", file=sys.stderr, flush=True)
        results.append(
            measure_size(
                size,
                repeat,
                args.timeout,
                args.cli,
                args.keep,
                shape,
                yardstick=not args.no_yardstick,
            )
        )
    exponents(results)
    print(table(results))
    print()
    print(shape_table(results))
    jobs = None
    if args.jobs > 1:
        print(f"bench: --jobs on {JOB_DESIGNS} designs ...", file=sys.stderr)
        jobs = measure_jobs(
            JOB_DESIGNS, JOB_DESIGN_SIZE, args.jobs, args.repeat, args.timeout
        )
        print(f"\n{_jobs_line(jobs)}")
    if args.json or args.output is not None:
        target = args.output or RESULTS
        document = {
            "format": FORMAT,
            "machine": _machine(),
            "repeat": args.repeat,
            "results": results,
            "jobs": jobs,
        }
        _write(target, document)
        print(f"bench: wrote {target}", file=sys.stderr)
    return 0


def _jobs_line(jobs: dict[str, Any]) -> str:
    medians = jobs["median_s"]
    one, many = medians["1"], medians[str(jobs["jobs"])]
    if one is None or many is None:
        return "--jobs: timed out"
    return (
        f"--jobs on {jobs['designs']} designs of {jobs['components_each']} components:"
        f" 1 job {one:.2f} s, {jobs['jobs']} jobs {many:.2f} s,"
        f" speed-up {jobs['speed_up']:.2f}x"
    )


if __name__ == "__main__":
    sys.exit(main())
