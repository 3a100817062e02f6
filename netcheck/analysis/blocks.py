"""Biconnected components of a simple undirected graph, in one iterative pass.

The same node sets as ``networkx.biconnected_components`` (Hopcroft and
Tarjan's depth-first search with an edge stack; ``tests/analysis/
test_blocks.py`` compares the two), on a plain adjacency dict: building the
networkx graph and its views cost more than the search. ``block_tree`` runs
the same search on a multigraph with keyed edges and keeps what the zero-ohm
sides are read from (``netcheck.analysis.zero_ohm``).
"""

from __future__ import annotations

from collections.abc import Hashable, Iterable, Iterator, Mapping
from dataclasses import dataclass, field

__all__ = ["BlockTree", "biconnected_components", "block_tree"]


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


@dataclass
class BlockTree:
    """The blocks of a multigraph and the depth-first search that found them.

    Nets are numbered in discovery order (``pre``, ``order``), so the nets
    found below a net form one slice of ``pre``: ``size`` long. A block's
    *head* is its net nearest the search's root; every other net of the block
    entered it by a tree edge of that block. ``below[net]`` are the children
    whose search closed a block headed by ``net``: the block-cut subtree of a
    non-head net is the net plus those children's slices.
    """

    pre: list[str] = field(default_factory=list)
    order: dict[str, int] = field(default_factory=dict)
    size: dict[str, int] = field(default_factory=dict)
    below: dict[str, list[str]] = field(default_factory=dict)
    heads: list[str] = field(default_factory=list)  # block -> head net
    roots: list[str] = field(default_factory=list)  # block -> its search's root
    edges: list[list[str]] = field(default_factory=list)  # block -> edge keys
    block_of: dict[str, int] = field(default_factory=dict)  # edge key -> block

    def hanging(self, net: str) -> int:
        """How many nets the block-cut subtree of non-head ``net`` holds."""
        return 1 + sum(self.size[c] for c in self.below.get(net, ()))


def block_tree(adjacency: Mapping[str, Iterable[tuple[str, str]]]) -> BlockTree:
    """Blocks of a multigraph given as net -> (edge key, other net) pairs.

    Every edge key but a self-loop's is in one block (a bridge is a block of
    its own); parallel edges are a cycle. One iterative Hopcroft-Tarjan pass.
    """
    tree = BlockTree()
    for net in adjacency:
        if net not in tree.order:
            _search(adjacency, net, tree)
    return tree


def _search(
    adjacency: Mapping[str, Iterable[tuple[str, str]]], root: str, tree: BlockTree
) -> None:
    order, pre, low = tree.order, tree.pre, {root: len(tree.pre)}
    order[root] = len(pre)
    pre.append(root)
    edges: list[str] = []
    stack: list[tuple[str, str | None, Iterator[tuple[str, str]]]] = [
        (root, None, iter(adjacency.get(root, ())))
    ]
    while stack:
        node, via, pairs = stack[-1]
        for edge, other in pairs:
            if edge == via or other == node:
                continue
            seen = order.get(other)
            if seen is None:
                order[other] = low[other] = len(pre)
                pre.append(other)
                edges.append(edge)
                stack.append((other, edge, iter(adjacency.get(other, ()))))
                break
            if seen < order[node]:  # back to an ancestor (or a twin edge)
                edges.append(edge)
                if seen < low[node]:
                    low[node] = seen
        else:
            stack.pop()
            tree.size[node] = len(pre) - order[node]
            if not stack:
                continue
            parent = stack[-1][0]
            if low[node] < low[parent]:
                low[parent] = low[node]
            if low[node] >= order[parent]:  # parent cuts node's subtree off
                tree.below.setdefault(parent, []).append(node)
                _close_block(tree, edges, via, parent, root)


def _close_block(
    tree: BlockTree, edges: list[str], via: object, head: str, root: str
) -> None:
    index = len(tree.heads)
    tree.heads.append(head)
    tree.roots.append(root)
    block = []
    while True:
        edge = edges.pop()
        block.append(edge)
        tree.block_of[edge] = index
        if edge == via:
            break
    tree.edges.append(block)
