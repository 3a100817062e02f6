"""Start-up time of the command line: ``netcheck --help`` and ``--version``.

Target: under 0.2 s wall (median) on an idle machine; the pipeline, pint,
numpy, networkx and lark must not load for these (``tests/cli/test_cli_lazy.py``
pins the module set; this measures the time). Each run is a fresh interpreter;
the median and minimum of ``--repeat`` runs are shown with CPU time (user+sys),
which a busy machine inflates less than wall time, and a bare ``python -c pass``
as the yardstick.

    .venv/bin/python bench/startup.py --repeat 10
"""

from __future__ import annotations

import argparse
import resource
import statistics
import subprocess
import sys
import time

CASES = {
    "python -c pass": [sys.executable, "-c", "pass"],
    "netcheck --help": [sys.executable, "-m", "netcheck", "--help"],
    "netcheck --version": [sys.executable, "-m", "netcheck", "--version"],
    "netcheck check --help": [sys.executable, "-m", "netcheck", "check", "--help"],
}


def measure(argv: list[str], repeat: int) -> tuple[list[float], list[float]]:
    """Wall and CPU seconds of ``repeat`` runs of ``argv``."""
    walls, cpus = [], []
    for _ in range(repeat):
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        start = time.perf_counter()
        subprocess.run(argv, stdout=subprocess.DEVNULL, check=True)
        walls.append(time.perf_counter() - start)
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        cpus.append(after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime)
    return walls, cpus


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=10)
    repeat = parser.parse_args().repeat
    print(f"{'command':24} {'wall median':>12} {'wall min':>9} {'cpu median':>11}")
    for name, argv in CASES.items():
        walls, cpus = measure(argv, repeat)
        print(
            f"{name:24} {statistics.median(walls):11.3f}s {min(walls):8.3f}s "
            f"{statistics.median(cpus):10.3f}s"
        )


if __name__ == "__main__":
    main()
