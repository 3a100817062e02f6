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

So a stage runs with the collector paused. What ``input.load_design`` built
(the model: frozen dataclasses, tuples, dicts, no cycles) is then frozen: left
out of every later pass, the analysis's included. ``load_design`` first hands
the previous design's frozen objects back (``release_frozen``), so a process
that checks many designs keeps at most one model out of the collector's
reach; frozen objects are still freed by reference counting as usual. Later
stages are not frozen: a networkx graph holds a cycle once its views are read,
and the fixes' re-checks build one per candidate fix, which must be collected.
"""

from __future__ import annotations

import gc
from collections.abc import Iterator
from contextlib import contextmanager

__all__ = ["collector_paused", "release_frozen"]


@contextmanager
def collector_paused(freeze: bool = False) -> Iterator[None]:
    """Pause the cyclic collector for the block; restore its state after.

    With ``freeze``, what is alive at the end is frozen first: moved out of
    the collector's generations without the pass over it that re-enabling
    would start (it cost as much as a large design's read).
    """
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            if freeze:
                gc.freeze()
            gc.enable()


def release_frozen() -> None:
    """Hand every frozen object back to the collector (its oldest generation)."""
    gc.unfreeze()
