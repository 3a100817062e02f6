"""Biconnected components of a simple undirected graph, in one iterative pass.

The same node sets as ``networkx.biconnected_components`` (Hopcroft and
Tarjan's depth-first search with an edge stack; ``tests/analysis/
test_blocks.py`` compares the two), on a plain adjacency dict: building the
networkx graph and its views cost more than the search.
"""

from __future__ import annotations

from collections.abc import Hashable, Iterable, Iterator, Mapping

__all__ = ["biconnected_components"]


def biconnected_components(
    adjacency: Mapping[Hashable, Iterable[Hashable]],
) -> Iterator[set[Hashable]]:
    """The node set of each biconnected component (a bridge gives its two ends).

    ``adjacency`` lists each node's neighbours once (a simple graph: no
    parallel edges, no self-loops); an isolated node is in no component.
    """
    order: dict[Hashable, int] = {}
    for root in adjacency:
        if root not in order:
            yield from _components_from(adjacency, root, order)


def _components_from(
    adjacency: Mapping[Hashable, Iterable[Hashable]],
    root: Hashable,
    order: dict[Hashable, int],
) -> Iterator[set[Hashable]]:
    order[root] = len(order)
    low = {root: order[root]}
    edges: list[tuple[Hashable, Hashable]] = []
    stack = [(root, None, iter(adjacency[root]))]
    while stack:
        node, parent, neighbours = stack[-1]
        for other in neighbours:
            if other == parent:
                continue
            if other not in order:
                order[other] = low[other] = len(order)
                edges.append((node, other))
                stack.append((other, node, iter(adjacency[other])))
                break
            if order[other] < order[node]:  # a back edge to an ancestor
                edges.append((node, other))
                low[node] = min(low[node], order[other])
        else:
            stack.pop()
            if parent is None:
                continue
            low[parent] = min(low[parent], low[node])
            if low[node] >= order[parent]:  # parent cuts node's subtree off
                component: set[Hashable] = set()
                while True:
                    edge = edges.pop()
                    component.update(edge)
                    if edge == (parent, node):
                        break
                yield component
