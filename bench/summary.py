"""The bench's tables: stage split per size, and one line per shape with targets.

Growth exponents are log-log slopes of the median total between consecutive
sizes of one shape (1.0 is linear), from wall clock and from CPU time; on a
shared machine the CPU-time slope is the steadier of the two.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

__all__ = ["exponents", "table", "shape_table", "TARGETS"]

# issue 12's targets, checked by the shape table (never by timed tests).
TARGETS = {
    "exponent": 1.1,
    "one_rail_20k_s": 10.0,
    "large_s": 10.0,
    "large_components": 100_000,
    "peak_mib": 1024.0,
}


def _slope(t0: float, t1: float, n0: int, n1: int) -> float | None:
    if t0 > 0 and t1 > 0 and n1 != n0:
        return math.log(t1 / t0) / math.log(n1 / n0)
    return None


def exponents(results: Sequence[dict[str, Any]]) -> None:
    """Set ``growth_exponent`` (and ``growth_exponent_cpu``) on each result."""
    previous: dict[str, dict[str, Any]] = {}
    for result in results:
        shape = result.get("shape", "mixed")
        before = previous.pop(shape, None)
        if "timed_out" in result:
            continue
        if before is not None:
            n0, n1 = before["components"], result["components"]
            wall = _slope(
                before["median_s"]["total"], result["median_s"]["total"], n0, n1
            )
            if wall is not None:
                result["growth_exponent"] = wall
            if "median_cpu_s" in result and "median_cpu_s" in before:
                cpu = _slope(
                    before["median_cpu_s"]["total"],
                    result["median_cpu_s"]["total"],
                    n0,
                    n1,
                )
                if cpu is not None:
                    result["growth_exponent_cpu"] = cpu
        previous[shape] = result


_STAGE_COLUMNS = ("parse", "load", "analysis", "rules", "report", "total", "lark")


def _row(r: dict[str, Any], head: Sequence[str]) -> list[str]:
    m = r["median_s"]
    exp = r.get("growth_exponent")
    row = [
        r.get("shape", "mixed"),
        str(r["components"]),
        str(r["files"]),
        *(f"{m[s]:.3f}" for s in _STAGE_COLUMNS),
        f"{r['ratio_total_to_lark']:.1f}" if r["ratio_total_to_lark"] else "-",
        f"{r['per_1000_components_s'] * 1000:.0f}",
        f"{exp:.2f}" if exp is not None else "-",
        f"{r['peak_rss_mib']:.0f}",
    ]
    if "cli" in head:
        cli = r.get("cli_s")
        row.append(f"{cli:.2f}" if cli is not None else "-")
    return row


def _markdown(rows: Sequence[Sequence[str]]) -> str:
    return "\n".join("| " + " | ".join(row) + " |" for row in rows)


def table(results: Sequence[dict[str, Any]]) -> str:
    """Every size's stage medians as a plain-text (and Markdown) table."""
    head = ["shape", "components", "files", *_STAGE_COLUMNS]
    head += ["ratio", "ms/1k", "exp", "peak MiB"]
    if any("cli_s" in r for r in results):
        head.append("cli")
    rows = [head, ["---:"] * len(head)]
    for r in results:
        if "timed_out" in r:
            rows.append(
                [r.get("shape", "mixed"), str(r["size"])]
                + [f"timed out after {r['timed_out']:.0f} s"]
                + [""] * (len(head) - 3)
            )
            continue
        rows.append(_row(r, head))
    return _markdown(rows)


def _verdict(shape: str, done: Sequence[dict[str, Any]]) -> str:
    notes = []
    slopes = [r.get("growth_exponent_cpu", r.get("growth_exponent")) for r in done]
    slopes = [s for s in slopes if s is not None]
    if slopes:
        worst = max(slopes)
        ok = worst <= TARGETS["exponent"]
        notes.append(
            f"exp {'≤' if ok else '>'} {TARGETS['exponent']}: {'yes' if ok else 'no'}"
        )
    for r in done:
        total, n = r["median_s"]["total"], r["components"]
        if shape == "one-rail" and 19_000 <= n <= 21_000:
            ok = total < TARGETS["one_rail_20k_s"]
            notes.append(f"20k < 10 s: {'yes' if ok else 'no'}")
        if n >= TARGETS["large_components"] * 0.95:
            ok = total < TARGETS["large_s"] and r["peak_rss_mib"] < TARGETS["peak_mib"]
            notes.append(f"100k < 10 s and < 1 GB: {'yes' if ok else 'no'}")
    return "; ".join(notes) or "-"


def shape_table(results: Sequence[dict[str, Any]]) -> str:
    """One line per shape: sizes, medians, worst exponent, peak, targets met."""
    head = [
        "shape",
        "components",
        "median s",
        "cpu s",
        "exp (cpu)",
        "peak MiB",
        "target met?",
    ]
    rows = [head, ["---"] + ["---:"] * 5 + ["---"]]
    shapes = list(dict.fromkeys(r.get("shape", "mixed") for r in results))
    for shape in shapes:
        done = [
            r
            for r in results
            if r.get("shape", "mixed") == shape and "timed_out" not in r
        ]
        if not done:
            continue
        cpu = [f"{r['median_cpu_s']['total']:.2f}" for r in done if "median_cpu_s" in r]
        slopes = [r.get("growth_exponent_cpu") for r in done]
        slopes_text = "/".join(f"{s:.2f}" for s in slopes if s is not None) or "-"
        rows.append(
            [
                shape,
                " / ".join(str(r["components"]) for r in done),
                " / ".join(f"{r['median_s']['total']:.2f}" for r in done),
                " / ".join(cpu) or "-",
                slopes_text,
                f"{max(r['peak_rss_mib'] for r in done):.0f}",
                _verdict(shape, done),
            ]
        )
    return _markdown(rows)
