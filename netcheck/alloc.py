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
reach; frozen objects are still freed by reference counting as usual. The graph
of that design is frozen too (``build_graph`` asks ``is_loaded``), but no
other: a networkx graph holds a cycle once its views are read, and the fixes'
re-checks build one per candidate fix from an edited copy, which must be
collected.
"""

from __future__ import annotations

import gc
import weakref
from collections.abc import Iterator
from contextlib import contextmanager

__all__ = ["collector_paused", "release_frozen", "loaded", "is_loaded"]

# The design load_design built last (a weak reference), or None.
_loaded: list[weakref.ref[object]] = []


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


def loaded(design: object) -> None:
    """Note ``design`` as the one ``load_design`` built (its model is frozen)."""
    _loaded[:] = [weakref.ref(design)]


def is_loaded(design: object) -> bool:
    """Whether ``design`` is the one ``load_design`` built last."""
    return bool(_loaded) and _loaded[0]() is design
