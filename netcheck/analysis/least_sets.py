"""Joined sets of nets, each named by its least member."""

from __future__ import annotations

from collections.abc import Iterable

__all__ = ["least_of_sets"]


def least_of_sets(nets: Iterable[str], pairs: list[tuple[str, str]]) -> dict[str, str]:
    """Each net's representative: the least net of its joined set.

    What ``UnionFind`` gives (its union keeps the lesser root, so a root is
    always its set's least member), without a method call per look-up: the
    representative of a set does not depend on how it was found.
    """
    parent = {n: n for n in nets}

    def find(item: str) -> str:
        root = parent[item]
        while root != parent[root]:
            root = parent[root]
        while item != root:  # path compression
            parent[item], item = root, parent[item]
        return root

    for a, b in pairs:
        ra, rb = find(a), find(b)
        if ra != rb:
            if ra < rb:
                parent[rb] = ra
            else:
                parent[ra] = rb
    return {n: find(n) for n in nets}
