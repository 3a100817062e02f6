"""The circuit graph: nets as nodes, one edge per branch, and supply domains."""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, field

import networkx as nx

from netcheck.alloc import collector_paused, is_loaded
from netcheck.kinds import (
    COIL_KINDS,
    NON_CONDUCTING_KINDS,
    PROTECTIVE_KINDS,
    SWITCHING_KINDS,
)
from netcheck.model import Component, Netlist, SwitchingElement, once

__all__ = [
    "Branch",
    "Domain",
    "Graph",
    "build_graph",
    "ROLE",
    "BRANCH",
]

# Edge attribute keys.
ROLE = "role"
BRANCH = "branch"

# Roles of branches.
SUPPLY, SWITCH, CONDUCTOR, LOAD, COIL = "supply", "switch", "conductor", "load", "coil"


@dataclass(frozen=True)
class Branch:
    """One conducting path of a component between two nets (``a`` to ``b``)."""

    component: Component
    role: str
    a: str
    b: str
    element: SwitchingElement | None = None

    def __init__(
        self,
        component: Component,
        role: str,
        a: str,
        b: str,
        element: SwitchingElement | None = None,
    ) -> None:
        # The frozen dataclass's __init__, without its five object.__setattr__
        # calls (one branch per conducting path of a large design).
        fields = self.__dict__
        fields["component"] = component
        fields["role"] = role
        fields["a"] = a
        fields["b"] = b
        fields["element"] = element

    # ref, kind and key are read a dozen times per branch by the analysis and
    # the checks: each is worked out once (the fields are frozen) and then read
    # from the instance like a field.
    @once
    def ref(self) -> str:
        """The component's reference."""
        return self.component.ref

    @once
    def kind(self) -> str:
        """The component's kind."""
        return self.component.kind

    @once
    def key(self) -> str:
        """A unique name: the element name, or ``REF`` (``REF:coil`` for coils)."""
        if self.element is not None:
            return self.element.name
        return f"{self.ref}:coil" if self.role == COIL else self.ref


@dataclass
class Domain:
    """The nets reached from one or more supplies through conducting elements."""

    nets: frozenset[str]
    supplies: tuple[Component, ...]
    branches: list[Branch] = field(default_factory=list)
    # What the analysis derives once per domain from its branches alone.
    cache: dict[str, object] = field(default_factory=dict, repr=False, compare=False)

    @property
    def name(self) -> str:
        """The reference of the domain's first supply, or the first net."""
        return self.supplies[0].ref if self.supplies else sorted(self.nets)[0]

    @property
    def kind(self) -> str | None:
        """``dc``, ``ac``, or None (no supply / mixed)."""
        kinds = {supply_kind(s) for s in self.supplies}
        return kinds.pop() if len(kinds) == 1 else None


def supply_kind(component: Component) -> str:
    """``dc`` or ``ac`` for a supply component."""
    return "ac" if component.value("ac") is not None else "dc"


# Where a two-terminal part's terminals go: the first (a) end, the second (b).
_END = {"1": 0, "+": 0, "A": 0, "2": 1, "-": 1, "K": 1}.get


_NEW = object.__new__
# Kinds whose branches are not just their two terminals' (``_add_branches``).
_SPECIAL = COIL_KINDS | SWITCHING_KINDS | PROTECTIVE_KINDS | {"supply"}


def _branch(
    component: Component,
    role: str,
    a: str,
    b: str,
    element: SwitchingElement | None,
    key: str,
) -> Branch:
    """``Branch(component, role, a, b, element)``, its ``ref``, ``kind``, ``key`` set.

    ``key`` is what ``Branch.key`` works out (the caller knows which case it
    is); ``tests/test_graph_build.py`` holds all three equal to the properties.
    """
    branch = _NEW(Branch)
    fields = branch.__dict__
    fields["component"] = component
    fields["role"] = role
    fields["a"] = a
    fields["b"] = b
    fields["element"] = element
    fields["ref"] = component.ref
    fields["kind"] = component.kind
    fields["key"] = key
    return branch


def _component_branches(component: Component) -> list[Branch]:
    """The branches of one component, in order (coil, elements, poles, body)."""
    out: list[Branch] = []
    _add_branches(component, out)
    return out


def _add_branches(component: Component, out: list[Branch]) -> None:
    """Append the branches of ``component`` to ``out``: coil, elements, poles, body.

    Called once a component of a large design, so it appends instead of
    yielding (a generator resumes once a branch) and orders a two-terminal
    part's ends by comparison instead of a keyed sort.
    """
    connections = component.connections
    kind = component.kind
    if len(connections) == 2 and kind not in _SPECIAL and not component.elements:
        # A two-terminal part (most of a design's loads): the general path's
        # one branch, without its dict of nets. A terminal named twice is on
        # its first connection's net, as the dict below gives.
        first, second = connections
        if first.terminal == second.terminal:
            a = b = first.net
        else:
            if _END(second.terminal, 2) < _END(first.terminal, 2):
                first, second = second, first
            a, b = first.net, second.net
        role = LOAD if kind == "load" else kind
        out.append(_branch(component, role, a, b, None, component.ref))
        return
    # Component.net_of as one dict (the first connection of a terminal wins).
    net = {c.terminal: c.net for c in reversed(connections)}.get
    if kind == "supply":
        a, b = ("+", "-") if net("+") or net("-") else ("L", "N")
        if net(a) and net(b):
            out.append(_branch(component, SUPPLY, net(a), net(b), None, component.ref))  # type: ignore[arg-type]
        return
    if kind in COIL_KINDS and net("A1") and net("A2"):
        key = f"{component.ref}:coil"
        out.append(_branch(component, COIL, net("A1"), net("A2"), None, key))  # type: ignore[arg-type]
    for element in component.elements:
        a, b = net(element.a), net(element.b)
        if a and b:
            out.append(_branch(component, SWITCH, a, b, element, element.name))
    if kind in PROTECTIVE_KINDS:
        for pole in component.poles:
            a, b = net(pole.common), net(pole.no or "")
            if a and b:
                out.append(_branch(component, CONDUCTOR, a, b, None, component.ref))
        return
    if kind in SWITCHING_KINDS or len(connections) != 2:
        return
    first, second = connections[0].terminal, connections[1].terminal
    if _END(second, 2) < _END(first, 2):  # the stable sort by end: ties keep order
        first, second = second, first
    role = LOAD if kind == "load" else kind
    ends = net(first), net(second)
    out.append(_branch(component, role, *ends, None, component.ref))  # type: ignore[arg-type]


@dataclass
class Graph:
    """The design as a multigraph of nets, with its branches and domains.

    The networkx multigraph (``graph``) is built when first read: only the
    supply-meeting check walks it, and building it was a fifth of this stage
    on a large design. It is built from the nets and branches the graph was
    made with (``connections`` may be replaced later, as fix slices do).
    """

    netlist: Netlist
    branches: list[Branch]
    domains: list[Domain]
    domain_of: dict[str, Domain]
    connections: dict[str, list[tuple[Component, str]]]
    _net_graph: nx.MultiGraph | None = field(default=None, repr=False, compare=False)
    _nets: Iterable[str] = field(default=(), repr=False, compare=False)

    @property
    def graph(self) -> nx.MultiGraph:
        """The multigraph of nets, one edge per branch (``net_graph``)."""
        if self._net_graph is None:
            self._net_graph = net_graph(self._nets, self.branches)
        return self._net_graph

    def domain(self, net: str) -> Domain | None:
        """The domain a net belongs to."""
        return self.domain_of.get(net)


def build_graph(netlist: Netlist) -> Graph:
    """Build the net graph and the supply domains of a netlist."""
    # The loaded design's graph lives as long as its model: frozen with it.
    with collector_paused(freeze=is_loaded(netlist)):
        return _build_graph(netlist)


def _build_graph(netlist: Netlist) -> Graph:
    connections: dict[str, list[tuple[Component, str]]] = {}
    for component in netlist.components:
        for connection in component.connections:
            at = connections.get(connection.net)
            if at is None:
                connections[connection.net] = [(component, connection.terminal)]
            else:
                at.append((component, connection.terminal))
    branches: list[Branch] = []
    for component in netlist.components:
        _add_branches(component, branches)
    domains, domain_of = [], {}
    supplies_at: dict[str, list[Component]] = {}
    for branch in branches:
        if branch.role == SUPPLY:
            supplies_at.setdefault(branch.a, []).append(branch.component)
    for nets in _joined_nets(connections, branches):
        supplies = sorted(
            {s.ref: s for n in nets for s in supplies_at.get(n, [])}.values(),
            key=lambda s: (s.span, s.ref),
        )
        domain = Domain(frozenset(nets), tuple(supplies))
        domains.append(domain)
        for net in nets:
            domain_of[net] = domain
    for branch in branches:
        domain_of[branch.a].branches.append(branch)
    domains.sort(key=lambda d: (d.name, min(d.nets)))
    return Graph(netlist, branches, domains, domain_of, connections, _nets=connections)


def net_graph(nets: Iterable[str], branches: Iterable[Branch]) -> nx.MultiGraph:
    """The multigraph of ``nets`` with one edge per branch, keyed by ``Branch.key``.

    The same graph as ``add_nodes_from(nets)`` then ``add_edges_from((a, b, key,
    {ROLE: role, BRANCH: branch}))`` (``tests/test_graph_build.py`` compares
    them: nodes, adjacency order, keys and data), written straight into the
    graph's adjacency dicts: networkx's per-edge checks and views were three
    quarters of the graph stage on a large design.
    """
    graph = nx.MultiGraph()
    graph.add_nodes_from(nets)
    adjacency = graph._adj
    for branch in branches:
        a, b = branch.a, branch.b
        if a not in adjacency or b not in adjacency:
            graph.add_node(a)  # a branch's nets are connection nets: never here
            graph.add_node(b)
        keys = adjacency[a].get(b)
        if keys is None:
            keys = adjacency[a][b] = {}
            adjacency[b][a] = keys
        key = branch.key
        data = keys.get(key)
        if data is None:
            data = keys[key] = {}
        data[ROLE] = branch.role
        data[BRANCH] = branch
    return graph


def _joined_nets(nets: Iterable[str], branches: list[Branch]) -> list[list[str]]:
    """The nets that conducting branches join, group by group (union-find)."""
    parent = {net: net for net in nets}

    def root(net: str) -> str:
        while parent[net] != net:
            parent[net] = parent[parent[net]]  # path halving keeps trees flat
            net = parent[net]
        return net

    for branch in branches:
        if branch.role not in NON_CONDUCTING_KINDS:
            a, b = root(branch.a), root(branch.b)
            if a != b:
                parent[a] = b
    groups: dict[str, list[str]] = {}
    for net in parent:
        groups.setdefault(root(net), []).append(net)
    return list(groups.values())
