"""What ``alloc.py`` freezes, and that it hands it back.

The model ``load_design`` builds is frozen (out of the cyclic collector's
passes) until the next design is read; nothing later is, so the cycles a
networkx graph holds once its views are read are still collected.
"""

from __future__ import annotations

import dataclasses
import gc
import weakref

from netcheck.alloc import collector_paused
from netcheck.graph import build_graph
from netcheck.input import read_design_text


def _tracked(thing: object) -> bool:
    """Whether the collector's generations hold ``thing`` (not frozen)."""
    return any(o is thing for o in gc.get_objects())


TEXT = "supply G1 dc=24V +:P -:M\nload H1 1:P 2:M\n"


def test_a_design_is_frozen_until_the_next_is_read():
    gc.collect()
    first = read_design_text(TEXT)
    frozen = gc.get_freeze_count()
    assert frozen > 0 and gc.isenabled()
    del first
    read_design_text(TEXT)
    # The first design's objects were released: the count does not add up.
    assert gc.get_freeze_count() < 2 * frozen


def test_the_loaded_designs_graph_is_frozen_with_it():
    graph = build_graph(read_design_text(TEXT))
    # Frozen: out of the generations (the branches, the domains and their
    # lists). The multigraph is made only when first read (graph.py), later.
    assert not _tracked(graph.branches)
    assert not _tracked(graph.domains[0].branches)
    assert graph._net_graph is None


def test_an_edited_copys_graph_is_not_frozen_and_its_cycle_is_collected():
    netlist = dataclasses.replace(read_design_text(TEXT))  # as fixes edit it
    graph = build_graph(netlist)
    assert _tracked(graph.graph._adj)
    list(graph.graph.edges(data=True))  # the view cached on the graph: a cycle
    gone = weakref.ref(graph.graph)
    del graph
    gc.collect()
    assert gone() is None


def test_the_collector_state_is_restored():
    gc.disable()
    try:
        with collector_paused(freeze=True):
            pass
        assert not gc.isenabled()
    finally:
        gc.enable()
    with collector_paused():
        assert not gc.isenabled()
    assert gc.isenabled()
