"""``check_path`` keeps the design it checked last, and only that one.

Freeing a large design's model costs as much as a stage of a small one, and a
command that checks one design exits right after; a run of many designs must
still hold at most one model at a time (memory), so the previous one goes as
the next check starts.
"""

from __future__ import annotations

import gc
import weakref
from pathlib import Path

from netcheck import pipeline
from tests.helpers import write_design

CASES = Path(__file__).parent / "cases" / "inductive-load-unsuppressed"
FIRST = CASES / "bad-coil-no-suppression.cnet"
SECOND = CASES / "bad-contact-no-suppression.cnet"


def _model_of_check(path: Path) -> weakref.ref[object]:
    pipeline.check_path(path)
    netlist = pipeline._last_design[0]
    return weakref.ref(netlist)


def test_the_last_design_stays_until_the_next_check() -> None:
    kept = _model_of_check(FIRST)
    gc.collect()
    assert kept() is not None  # held: nothing freed it one object at a time
    pipeline.check_path(SECOND)
    gc.collect()
    assert kept() is None  # the next check let it go: one model at a time
    assert pipeline._last_design[0].file.endswith(SECOND.name)


def test_a_failed_read_lets_the_previous_design_go(tmp_path: Path) -> None:
    kept = _model_of_check(FIRST)
    bad = write_design(
        tmp_path, "supply G1 dc=24V +:P\nnonsense here\n", name="bad.cnet"
    )
    result = pipeline.check_design(bad)
    gc.collect()
    assert result.errors and kept() is None
