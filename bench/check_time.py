"""Time the whole ``netcheck check`` of one design, fix verification apart.

``python bench/check_time.py DIR`` runs ``check_path`` (what ``netcheck check``
runs per design) and prints wall and CPU seconds, those of ``verify_fixes``,
and the fixes verified and left not checked for want of budget.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import netcheck.pipeline as pipeline


def main(argv: list[str]) -> int:
    path = Path(argv[1])
    top = path / "design.cnet" if path.is_dir() else path
    real = pipeline.verify_fixes
    spent: dict[str, float] = {}

    def timed(*args, **kwargs):  # type: ignore[no-untyped-def]
        cpu, wall = time.process_time(), time.perf_counter()
        out = real(*args, **kwargs)
        spent["cpu"] = time.process_time() - cpu
        spent["wall"] = time.perf_counter() - wall
        return out

    pipeline.verify_fixes = timed  # type: ignore[assignment]
    cpu, wall = time.process_time(), time.perf_counter()
    result = pipeline.check_path(top)
    cpu, wall = time.process_time() - cpu, time.perf_counter() - wall
    fixes = [f for f in result.findings if f.fix is not None and f.waived is None]
    verified = sum(1 for f in fixes if f.verified)
    unchecked = sum(1 for f in fixes if f.verified is None)
    print(
        f"{path.name}: wall {wall:.2f} cpu {cpu:.2f} "
        f"verify cpu {spent.get('cpu', 0.0):.2f} wall {spent.get('wall', 0.0):.2f} "
        f"fixes {len(fixes)} verified {verified} not checked {unchecked}"
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv))
