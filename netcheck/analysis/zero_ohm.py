"""The zero-ohm graph of a group: bypass sets and the two sides of an element."""

from __future__ import annotations

from collections import deque
from collections.abc import Iterable, Iterator

from netcheck.analysis.blocks import biconnected_components
from netcheck.graph import SWITCH, Branch

__all__ = ["ZeroOhm"]


class ZeroOhm:
    """Closed switching elements and protective devices of one domain, as a graph."""

    def __init__(
        self, branches: Iterable[Branch], shunts: Iterable[Branch] = ()
    ) -> None:
        """Build from zero-ohm branches and the group's shunts.

        ``shunts`` are loads or resistors whose two ends lie in one group: they
        close cycles (a precharge resistor in parallel with a main contact) but
        carry no current in the closed state.
        """
        self.adjacent: dict[str, list[tuple[str, str]]] = {}
        self.by_key: dict[str, Branch] = {}
        self.shunt_keys: set[str] = set()
        # Each branch a net - edge - net path (parallel branches make a cycle),
        # a simple graph: every neighbour once, as networkx's Graph keeps it.
        subdivided: dict[tuple[str, str], dict[tuple[str, str], None]] = {}

        def link(u: tuple[str, str], v: tuple[str, str]) -> None:
            if u != v:
                subdivided.setdefault(u, {})[v] = None
                subdivided.setdefault(v, {})[u] = None

        for branch in shunts:
            self.shunt_keys.add(branch.key)
            link(("net", branch.a), ("edge", branch.key))
            link(("edge", branch.key), ("net", branch.b))
        for branch in branches:
            self.by_key[branch.key] = branch
            self.adjacent.setdefault(branch.a, []).append((branch.key, branch.b))
            self.adjacent.setdefault(branch.b, []).append((branch.key, branch.a))
            edge_node = ("edge", branch.key)
            link(("net", branch.a), edge_node)
            link(edge_node, ("net", branch.b))
        self.block_of: dict[str, int] = {}
        self.blocks: list[list[str]] = []
        self._switches: dict[int, list[str]] = {}
        for nodes in biconnected_components(subdivided):
            if len(nodes) <= 2:
                continue  # a bridge: its two halves are blocks of their own
            edges = sorted(key for kind, key in nodes if kind == "edge")  # type: ignore[misc]
            for key in edges:
                self.block_of[key] = len(self.blocks)
            self.blocks.append(edges)

    def bypass(self, key: str) -> tuple[str, ...]:
        """Switching elements that could carry the current around ``key``."""
        block = self.block_of.get(key)
        if block is None:
            return ()
        switches = self._switches.get(block)
        if switches is None:  # the block's switching elements, once per block
            switches = self._switches[block] = [
                k
                for k in self.blocks[block]
                if k in self.by_key and self.by_key[k].role == SWITCH
            ]
        return tuple(k for k in switches if k != key)

    def bypass_through_load(self, key: str) -> bool:
        """Whether a bypass path of ``key`` runs through a load or resistor."""
        block = self.block_of.get(key)
        return block is not None and any(
            k in self.shunt_keys for k in self.blocks[block]
        )

    def sides(self, key: str, removed: set[str]) -> tuple[set[str], str]:
        """The smaller side of ``key`` once it and ``removed`` are open.

        Returns (nets of that side, "a" or "b": the element terminal it holds);
        an empty set when the two ends stay joined. Side "b" is returned when
        the two sides hold equally many nets. The searches from both ends
        advance one edge at a time, so a call costs about the smaller side even
        when the other end is a rail net with thousands of branches.
        """
        branch = self.by_key[key]
        if branch.a == branch.b:
            return {branch.a}, "a"
        skip = removed | {key}
        seen = {"a": {branch.a}, "b": {branch.b}}
        steps = {side: self._walk(seen[side], skip) for side in ("a", "b")}
        while True:
            for side, other_side in (("b", "a"), ("a", "b")):
                step = next(steps[side], None)
                if step is None:
                    return self._settle(seen, steps, side, other_side)
                if step in seen[other_side]:
                    return set(), side  # still joined: nothing is switched

    def _walk(self, seen: set[str], skip: set[str]) -> Iterator[str]:
        """Breadth-first search that yields the far net of every edge it tries."""
        queue = deque(seen)
        while queue:
            net = queue.popleft()
            for edge, other in self.adjacent.get(net, ()):
                if edge in skip:
                    continue
                yield other
                if other not in seen:
                    seen.add(other)
                    queue.append(other)

    @staticmethod
    def _settle(
        seen: dict[str, set[str]],
        steps: dict[str, Iterator[str]],
        done: str,
        other: str,
    ) -> tuple[set[str], str]:
        """``done`` is a whole side apart from ``other``: return the smaller."""
        size = len(seen[done])
        # "b" wins a tie: the other side must outgrow it strictly to lose.
        limit = size if done == "b" else size + 1
        while len(seen[other]) < limit:
            if next(steps[other], None) is None:
                break
        if len(seen[other]) >= limit:
            return seen[done], done
        return seen[other], other
