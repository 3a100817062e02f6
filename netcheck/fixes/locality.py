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
    """Clusters of a design's domains, and the cut of the clusters edits touch."""

    def __init__(self, netlist: Netlist, graph: Graph) -> None:
        self.netlist = netlist
        index = {id(d): i for i, d in enumerate(graph.domains)}
        parent = list(range(len(graph.domains)))

        def root(i: int) -> int:
            while parent[i] != i:
                parent[i] = parent[parent[i]]
                i = parent[i]
            return i

        homes: list[list[int]] = []
        for component in netlist.components:
            domains = {index[id(graph.domain_of[c.net])] for c in component.connections}
            homes.append(sorted(domains))
            for other in homes[-1][1:]:
                parent[root(other)] = root(homes[-1][0])
        self._cluster_of_net = {
            net: root(index[id(d)]) for net, d in graph.domain_of.items()
        }
        self._members: dict[int, list[int]] = {}
        self._nets: dict[int, list[str]] = {}
        for position, domains in enumerate(homes):
            if domains:
                self._members.setdefault(root(domains[0]), []).append(position)
        for net, cluster in self._cluster_of_net.items():
            self._nets.setdefault(cluster, []).append(net)
        self._position = {c.ref: i for i, c in enumerate(netlist.components)}

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
        clusters = {self._cluster_of_net[n] for n in nets if n in self._cluster_of_net}
        positions = {self._position[r] for r in refs}
        names = set(refs)
        for cluster in clusters:
            positions.update(self._members.get(cluster, ()))
            names.update(self._nets[cluster])
        components = tuple(self.netlist.components[i] for i in sorted(positions))
        names.update(c.ref for c in components)
        names.update(e.ref for e in edits if isinstance(e, AddComponent))
        waivers = tuple(
            w for w in self.netlist.waivers if w.target.split(":", 1)[0] in names
        )
        sub = replace(self.netlist, components=components, waivers=waivers)
        return Cut(sub, frozenset(names))
