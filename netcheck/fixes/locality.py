"""The part of a design an edit can affect, cut out as a design of its own.

The analysis solves each domain (nets joined by conducting branches) on its
own, and a check about an element reads only its own domain and the other
branches of its own component (a relay's coil and its contacts sit in
different domains). So a finding can change only where an edit's nets are, in
the *cluster* of domains that components join together. Re-checking that
cluster alone gives the same findings there as re-checking the whole design,
and every finding outside it is unchanged.

Design-wide rules are covered too. A net's connections all lie in the net's
own cluster, so net rules see whole nets. A waiver is kept in the cut when its
target is in it; one elsewhere is matched (or left unused) exactly as before,
since no finding it could match changes.

Within the cluster, :mod:`netcheck.fixes.rungs` narrows what is analysed
again to the rungs the edits touch and the domains' global elements.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace
from functools import cached_property

from netcheck.fixes.edits import AddComponent, Edit, Reconnect
from netcheck.fixes.rungs import Restricted
from netcheck.graph import Graph
from netcheck.model import Netlist

__all__ = ["Locality", "Cut"]


@dataclass(frozen=True)
class Cut:
    """A sub-design, and the names (refs, nets) whose findings it decides.

    ``restricted``: only some of its elements are re-analysed and only their
    findings decided (:mod:`netcheck.fixes.rungs`); None re-checks it all.
    """

    netlist: Netlist
    names: frozenset[str]
    restricted: Restricted | None = None

    @property
    def size(self) -> int:
        """Components to re-analyse."""
        return len(self.netlist.components)

    def decides(self, element: str) -> bool:
        """Whether a finding on ``element`` is one the cut re-checks."""
        names = self.names if self.restricted is None else self.restricted.decided
        return element.split(":", 1)[0] in names or element in names


class Locality:
    """Clusters of a design's domains, and the cut of the clusters edits touch.

    The clusters are worked out when a cut is first asked for: where every
    re-check is a slice (:mod:`netcheck.fixes.slices`) none is.
    """

    def __init__(self, netlist: Netlist, graph: Graph) -> None:
        self.netlist = netlist
        self.graph = graph

    @cached_property
    def _clusters(self) -> _Clusters:
        return _clusters(self.netlist, self.graph)

    def _touched(self, edits: Sequence[Edit]) -> tuple[set[str], set[str]]:
        """(nets, refs) the edits touch in the original design."""
        nets: set[str] = set()
        refs: set[str] = set()
        for edit in edits:
            named = [edit.after] if isinstance(edit, AddComponent) else [edit.ref]
            if isinstance(edit, (AddComponent, Reconnect)):
                nets.update(net for _, net in edit.connections)
            for ref in named:
                component = self.netlist.component(ref)
                if component is not None:
                    refs.add(ref)
                    nets.update(c.net for c in component.connections)
        return nets, refs

    def cut(self, edits: Sequence[Edit]) -> Cut:
        """The sub-design of every cluster the edits touch (edits not applied)."""
        nets, refs = self._touched(edits)
        known = self._clusters
        clusters = {known.of_net[n] for n in nets if n in known.of_net}
        positions = {known.position[r] for r in refs}
        names = set(refs)
        for cluster in clusters:
            positions.update(known.members.get(cluster, ()))
            names.update(known.nets[cluster])
        components = tuple(self.netlist.components[i] for i in sorted(positions))
        names.update(c.ref for c in components)
        names.update(e.ref for e in edits if isinstance(e, AddComponent))
        waivers = tuple(
            w for w in self.netlist.waivers if w.target.split(":", 1)[0] in names
        )
        sub = replace(self.netlist, components=components, waivers=waivers)
        return Cut(sub, frozenset(names))


@dataclass(frozen=True)
class _Clusters:
    """Each net's cluster, a cluster's components (positions) and nets."""

    of_net: dict[str, int]
    members: dict[int, list[int]]
    nets: dict[int, list[str]]
    position: dict[str, int]


def _clusters(netlist: Netlist, graph: Graph) -> _Clusters:
    """Domains joined by the components that touch several (union-find)."""
    index = {id(d): i for i, d in enumerate(graph.domains)}
    domain_index = {net: index[id(d)] for net, d in graph.domain_of.items()}
    parent = list(range(len(graph.domains)))

    def root(i: int) -> int:
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i

    homes: list[tuple[int, int]] = []  # (position, a domain) per connected part
    for position, component in enumerate(netlist.components):
        connections = component.connections
        if not connections:
            continue
        first = domain_index[connections[0].net]
        for connection in connections[1:]:
            other = domain_index[connection.net]
            if other != first:
                parent[root(other)] = root(first)
        homes.append((position, first))
    roots = [root(i) for i in range(len(parent))]
    members: dict[int, list[int]] = {}
    for position, domain in homes:
        members.setdefault(roots[domain], []).append(position)
    of_net = {net: roots[i] for net, i in domain_index.items()}
    nets: dict[int, list[str]] = {}
    for net, cluster in of_net.items():
        nets.setdefault(cluster, []).append(net)
    position = {c.ref: i for i, c in enumerate(netlist.components)}
    return _Clusters(of_net, members, nets, position)
