"""Keeping the cyclic garbage collector off the objects a stage builds.

Reading a design makes a few objects per token (spans, statements, model
objects) and keeps nearly all of them to the end of the run. Python's cyclic
collector scans the young objects every few hundred allocations and the whole
heap each time long-lived objects grow by a quarter, so while a large design
is read and then analysed it scans the growing model again and again: on a
20,000-component design those passes cost more than the reading itself. The
objects built form no reference cycles worth collecting (they are frozen
dataclasses, tuples and dicts), and reference counting frees everything else
at once.

So a stage runs with the collector paused, and what is alive at its end is
frozen: left out of every later pass. ``input.load_design`` first hands the
previous design's frozen objects back (``release_frozen``), so a process that
checks many designs keeps at most one design's worth out of the collector's
reach. Frozen objects are still freed by reference counting as usual; only a
cycle among them waits for the release.
"""

from __future__ import annotations

import gc
from collections.abc import Iterator
from contextlib import contextmanager

__all__ = ["collector_paused", "release_frozen"]


@contextmanager
def collector_paused() -> Iterator[None]:
    """Pause the cyclic collector for the block; after it, freeze what is alive.

    Freezing moves the objects out of the collector's generations without a
    pass over them (the pass on re-enabling cost as much as a large design's
    read); the collector's own state is restored.
    """
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.freeze()
            gc.enable()


def release_frozen() -> None:
    """Hand every frozen object back to the collector (its oldest generation)."""
    gc.unfreeze()
