"""The zero-ohm graph of a group: bypass sets and the two sides of an element."""

from __future__ import annotations

from collections import deque
from collections.abc import Iterable, Iterator

from netcheck.analysis.blocks import BlockTree, block_tree
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
        adjacent = self.adjacent
        for branch in branches:
            key, a, b = branch.key, branch.a, branch.b
            self.by_key[key] = branch
            adjacent.setdefault(a, []).append((key, b))
            adjacent.setdefault(b, []).append((key, a))
        self._shunts: dict[str, Branch] = {s.key: s for s in shunts}
        self.shunt_keys: set[str] = set(self._shunts)
        # Branches and shunts together: the multigraph whose blocks are the
        # bypass sets (parallel branches make a cycle).
        joined = adjacent
        if self._shunts:
            joined = {net: list(pairs) for net, pairs in adjacent.items()}
            for key, shunt in self._shunts.items():
                joined.setdefault(shunt.a, []).append((key, shunt.b))
                joined.setdefault(shunt.b, []).append((key, shunt.a))
        self.tree: BlockTree = block_tree(joined)
        self.block_of: dict[str, int] = {}
        self.blocks: list[list[str]] = []
        self._switches: dict[int, list[str]] = {}  # each kept once asked for
        self._bypass: dict[str, tuple[str, ...]] = {}
        self._through_load: dict[int, bool] = {}
        for edges in self.tree.edges:
            if len(edges) < 2:
                continue  # a bridge: no bypass
            for key in edges:
                self.block_of[key] = len(self.blocks)
            self.blocks.append(sorted(edges))
        self._exact = _shunts_inside(self.by_key.values(), self._shunts.values())
        self._parts: dict[int, tuple[dict[str, int], list[int]]] = {}

    def bypass(self, key: str) -> tuple[str, ...]:
        """Switching elements that could carry the current around ``key``."""
        found = self._bypass.get(key)
        if found is None:
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
            if key in switches:  # the others, in order: two slices
                at = switches.index(key)
                found = tuple(switches[:at]) + tuple(switches[at + 1 :])
            else:
                found = tuple(switches)
            self._bypass[key] = found
        return found

    def bypass_through_load(self, key: str) -> bool:
        """Whether a bypass path of ``key`` runs through a load or resistor."""
        block = self.block_of.get(key)
        if block is None:
            return False
        found = self._through_load.get(block)
        if found is None:
            found = self._through_load[block] = any(
                k in self.shunt_keys for k in self.blocks[block]
            )
        return found

    def sides(self, key: str, removed: set[str]) -> tuple[set[str], str]:
        """The smaller side of ``key`` once it and ``removed`` are open.

        Returns (nets of that side, "a" or "b": the element terminal it holds):
        every net still joined to that terminal by the other zero-ohm branches.
        Side "b" is returned when the two sides hold equally many nets. When
        the two ends stay joined the set is empty (and the terminal "b").

        With ``removed`` the element's bypass (what ``open_element`` opens) the
        sides are read from the block tree: the element's block with its
        switching elements open, each of its nets carrying the nets that hang
        below it, so a call costs about the smaller side's nets however long
        the chain or wide the rail. Any other ``removed`` set is searched.
        """
        branch = self.by_key[key]
        if branch.a == branch.b:
            return {branch.a}, "a"
        if self._exact and self._is_bypass(key, removed):
            return self._tree_sides(branch)
        return self._searched_sides(branch, removed)

    def _is_bypass(self, key: str, removed: set[str]) -> bool:
        bypass = self.bypass(key)
        return len(removed) == len(bypass) and removed.issuperset(bypass)

    def _tree_sides(self, branch: Branch) -> tuple[set[str], str]:
        """``sides`` with the bypass open, from the block tree.

        Opening the block's switching elements (and ``branch``) leaves classes
        of its nets joined by its other zero-ohm branches; each class holds its
        nets and what hangs below them (the head's class: the whole search
        tree less the other classes' subtrees, see ``BlockTree``).
        """
        block = self.tree.block_of[branch.key]
        if len(self.tree.edges[block]) == 1:
            return self._bridge_sides(block, branch)
        part, sizes = self._partition(block, branch)
        end_a, end_b = part[branch.a], part[branch.b]
        if end_a == end_b:
            return set(), "b"
        if sizes[end_a] < sizes[end_b]:
            return self._class_nets(block, part, end_a), "a"
        return self._class_nets(block, part, end_b), "b"

    def _bridge_sides(self, block: int, branch: Branch) -> tuple[set[str], str]:
        """``_tree_sides`` of a bridge: its lower end's search subtree, or the rest.

        Nothing below a bridge reaches back above it, so every child of its
        lower end hangs below it: the lower side is one slice of ``pre``.
        """
        tree = self.tree
        head = tree.heads[block]
        lower, end_lower = (branch.b, "b") if head == branch.a else (branch.a, "a")
        start = tree.order[lower]
        stop = start + tree.size[lower]
        root = tree.roots[block]
        first = tree.order[root]
        last = first + tree.size[root]
        upper = (last - first) - (stop - start)
        lower_wins = stop - start < upper if end_lower == "a" else stop - start <= upper
        if lower_wins:
            return set(tree.pre[start:stop]), end_lower
        nets = set(tree.pre[first:start])
        nets.update(tree.pre[stop:last])
        return nets, "b" if end_lower == "a" else "a"

    def _partition(
        self, block: int, branch: Branch
    ) -> tuple[dict[str, int], list[int]]:
        """Class of each net of ``block`` with ``branch`` and its switches open.

        ``block`` has two edges or more (a bridge is ``_bridge_sides``). With
        ``branch`` a switching element the classes are the block's own (the
        same for all its switching elements), kept; with a conductor they are
        worked out for it alone.
        """
        is_switch = branch.role == SWITCH
        if is_switch and block in self._parts:
            return self._parts[block]
        kept = []
        for key in self.tree.edges[block]:
            other = self.by_key.get(key)
            if other is not None and other.role != SWITCH and key != branch.key:
                kept.append(other)
        part = _classes(self._block_nets(block), kept)
        found = part, self._class_sizes(block, part)
        if is_switch:
            self._parts[block] = found
        return found

    def _block_nets(self, block: int) -> list[str]:
        nets: dict[str, None] = {}
        for key in self.tree.edges[block]:
            ends = self.by_key.get(key) or self._shunts[key]
            nets[ends.a] = nets[ends.b] = None
        return list(nets)

    def _class_sizes(self, block: int, part: dict[str, int]) -> list[int]:
        """Nets on each class's side: its nets and what hangs below them."""
        tree = self.tree
        head = tree.heads[block]
        sizes = [0] * (max(part.values()) + 1)
        for net, index in part.items():
            if net != head:
                sizes[index] += tree.hanging(net)
        own = part[head]
        others = sum(sizes) - sizes[own]
        sizes[own] = tree.size[tree.roots[block]] - others
        return sizes

    def _class_nets(self, block: int, part: dict[str, int], index: int) -> set[str]:
        """The nets of one class's side, from slices of the search order."""
        tree = self.tree
        pre, order, size, below = tree.pre, tree.order, tree.size, tree.below
        head = tree.heads[block]
        nets: set[str] = set()
        if part[head] != index:
            for net, at in part.items():
                if at == index:
                    nets.add(net)
                    for child in below.get(net, ()):
                        nets.update(pre[order[child] : order[child] + size[child]])
            return nets
        # The head's class: the whole search tree but the other classes' parts.
        cut = []
        for net, at in part.items():
            if at != index:
                cut.append((order[net], order[net] + 1))
                cut.extend((order[c], order[c] + size[c]) for c in below.get(net, ()))
        root = tree.roots[block]
        start, end = order[root], order[root] + size[root]
        for low, high in sorted(cut):
            nets.update(pre[start:low])
            start = high
        nets.update(pre[start:end])
        return nets

    def _searched_sides(
        self, branch: Branch, removed: set[str]
    ) -> tuple[set[str], str]:
        """``sides`` by searching: both ends advance one edge at a time.

        A call costs about the smaller side even when the other end is a rail
        net with thousands of branches.
        """
        skip = removed | {branch.key}
        seen = {"a": {branch.a}, "b": {branch.b}}
        steps = {side: self._walk(seen[side], skip) for side in ("a", "b")}
        while True:
            for side, other_side in (("b", "a"), ("a", "b")):
                step = next(steps[side], None)
                if step is None:
                    return self._settle(seen, steps, side, other_side)
                if step in seen[other_side]:
                    return set(), "b"  # still joined: nothing is switched

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


def _classes(nets: list[str], edges: list[Branch]) -> dict[str, int]:
    """Number the classes of ``nets`` joined by ``edges`` (in order of first net)."""
    parent = {net: net for net in nets}

    def find(net: str) -> str:
        while parent[net] != net:
            parent[net] = parent[parent[net]]
            net = parent[net]
        return net

    for edge in edges:
        parent[find(edge.a)] = find(edge.b)
    index: dict[str, int] = {}
    return {net: index.setdefault(find(net), len(index)) for net in nets}


def _shunts_inside(branches: Iterable[Branch], shunts: Iterable[Branch]) -> bool:
    """Whether each shunt's ends are already joined by the zero-ohm branches.

    ``shunts`` says they are (two ends in one group), and the block tree relies
    on it: a shunt then closes cycles but joins nothing the branches do not,
    so the nets hanging below a net are the same with or without shunts.
    """
    pairs = [(s.a, s.b) for s in shunts if s.a != s.b]
    if not pairs:
        return True
    parent: dict[str, str] = {}

    def find(net: str) -> str:
        parent.setdefault(net, net)
        while parent[net] != net:
            parent[net] = parent[parent[net]]
            net = parent[net]
        return net

    for branch in branches:
        parent[find(branch.a)] = find(branch.b)
    return all(find(a) == find(b) for a, b in pairs)
