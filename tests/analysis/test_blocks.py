"""Our biconnected components are networkx's, node set for node set.

Reference: ``networkx.biconnected_components`` (Hopcroft-Tarjan), on random
graphs of every density, trees, cycles and the subdivided multigraphs the
zero-ohm analysis builds.
"""

from __future__ import annotations

import random

import networkx as nx
import pytest

from netcheck.analysis.blocks import biconnected_components


def _ours(graph: nx.Graph) -> list[frozenset]:
    adjacency = {n: list(graph.adj[n]) for n in graph}
    return sorted(map(frozenset, biconnected_components(adjacency)), key=sorted)


def _theirs(graph: nx.Graph) -> list[frozenset]:
    return sorted(map(frozenset, nx.biconnected_components(graph)), key=sorted)


@pytest.mark.parametrize("seed", range(40))
def test_random_graphs(seed: int) -> None:
    rng = random.Random(seed)  # fixed seeds
    graph = nx.gnm_random_graph(rng.randint(1, 40), rng.randint(0, 80), seed=seed)
    assert _ours(graph) == _theirs(graph)


@pytest.mark.parametrize(
    "graph",
    [
        nx.path_graph(6),
        nx.cycle_graph(7),
        nx.balanced_tree(2, 4),
        nx.barbell_graph(4, 3),
        nx.complete_graph(5),
        nx.empty_graph(3),
    ],
)
def test_shapes(graph: nx.Graph) -> None:
    assert _ours(graph) == _theirs(graph)


def test_a_subdivided_multigraph_keeps_parallel_edges_in_one_block() -> None:
    # Two contacts in parallel (P-Q twice) then one in series (Q-R).
    graph = nx.Graph()
    for key, a, b in (("k1", "P", "Q"), ("k2", "P", "Q"), ("k3", "Q", "R")):
        graph.add_edge(("net", a), ("edge", key))
        graph.add_edge(("edge", key), ("net", b))
    assert _ours(graph) == _theirs(graph)
    assert len([c for c in _ours(graph) if len(c) > 2]) == 1
