"""Solve one DC domain: zero-ohm groups, rails, the closed-state operating point.

Switching elements and protective devices are zero-ohm when closed, so the
nets they join form *groups*. Groups holding a supply terminal are *rails*
with potentials fixed by the supplies (no-load EMF); every other group is
solved per *internal component* (the groups that loads and resistors join
between rails), each on its own. That is the decomposition at the supply
rails that keeps the cost linear in the design's size.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field

import networkx as nx

from netcheck.analysis.circuit import Diode, Resistor, Solution, solve_dc
from netcheck.analysis.constants import SILICON_DIODE_CONDUCTION_VF
from netcheck.analysis.least_sets import least_of_sets
from netcheck.analysis.loads import LoadFacts, load_facts
from netcheck.analysis.si import si
from netcheck.analysis.supplies import highest_emfs
from netcheck.graph import COIL, CONDUCTOR, LOAD, SUPPLY, SWITCH, Branch, Domain
from netcheck.kinds import RECTIFYING_KINDS, conducts_one_way

__all__ = [
    "DomainState",
    "solve_domain",
    "UnionFind",
    "CONDUCTING",
    "shunts",
]


class UnionFind:
    """Disjoint sets of hashable items."""

    def __init__(self) -> None:
        self.parent: dict[str, str] = {}

    def find(self, item: str) -> str:
        """The representative of ``item``'s set."""
        parent = self.parent.setdefault(item, item)
        while parent != self.parent[parent]:
            self.parent[parent] = self.parent[self.parent[parent]]
            parent = self.parent[parent]
        self.parent[item] = parent
        return parent

    def union(self, a: str, b: str) -> None:
        """Join the sets of ``a`` and ``b``."""
        ra, rb = self.find(a), self.find(b)
        if ra != rb:
            self.parent[max(ra, rb)] = min(ra, rb)


@dataclass
class DomainState:
    """Everything solved once per DC domain and shared by its elements."""

    domain: Domain
    group: dict[str, str]  # net -> group representative
    wire: dict[str, str]  # net -> representative through fuses and breakers only
    rails: dict[str, float]  # rail group -> potential (V)
    emf: dict[str, float]  # supply ref -> EMF (V)
    r_int: dict[str, float]
    potentials: dict[str, float]  # group -> potential in the closed state
    currents: dict[str, float]  # branch key -> current a -> b (A)
    diode_state: dict[str, str]
    facts: dict[str, LoadFacts]  # load branch key -> facts
    resistive: list[Branch]  # branches with a resistance (loads, coils, resistors)
    unknown_resistance: list[Branch]
    shorts: list[tuple[Branch, ...]] = field(default_factory=list)
    supply_shorts: list[Branch] = field(default_factory=list)
    branch_by_key: dict[str, Branch] = field(default_factory=dict)
    attached: dict[str, list[Branch]] = field(default_factory=dict)  # net -> branches
    internal_of: dict[str, int] = field(default_factory=dict)  # group -> component id
    internal_rails: dict[int, frozenset[str]] = field(default_factory=dict)
    models: dict[str, Resistor | Diode] = field(default_factory=dict)  # by branch key
    comp_branches: dict[int, set[str]] = field(default_factory=dict)
    group_nets: dict[str, list[str]] = field(default_factory=dict)
    opened: frozenset[str] = frozenset()  # elements this state keeps open
    supplies: list[Branch] = field(default_factory=list)  # the supply branches
    # What later stages derive once per state (the closing network's blocks).
    cache: dict[str, object] = field(default_factory=dict, repr=False, compare=False)

    def model(self, key: str, rename: Mapping[str, str]) -> Resistor | Diode:
        """The branch's circuit model with its ends renamed (net -> node)."""
        branch = self.branch_by_key[key]
        a = rename.get(branch.a) or self.group[branch.a]
        b = rename.get(branch.b) or self.group[branch.b]
        model = self.models[key]
        if isinstance(model, Resistor):
            return Resistor(key, a, b, model.resistance)
        return Diode(key, a, b, model.vf, model.vz)

    def net_potential(self, net: str) -> float:
        """The closed-state potential of a net."""
        return self.potentials.get(self.group[net], 0.0)


def _vf(branch: Branch) -> float:
    value = branch.component.value("vf")
    return si(value, "V") if value is not None else SILICON_DIODE_CONDUCTION_VF


def _groups(
    domain: Domain, open_keys: frozenset[str]
) -> tuple[dict[str, str], dict[str, str]]:
    joined, wired = [], []
    for branch in domain.branches:
        role = branch.role
        if role in (SWITCH, CONDUCTOR) and branch.key not in open_keys:
            joined.append((branch.a, branch.b))
        if role == CONDUCTOR:
            wired.append((branch.a, branch.b))
    return least_of_sets(domain.nets, joined), least_of_sets(domain.nets, wired)


def _rails(domain: Domain, group: dict[str, str]) -> tuple[dict, dict, dict, list]:
    emf, r_int, rails, shorted = {}, {}, {}, []
    edges = [b for b in domain.branches if b.role == SUPPLY]
    graph = nx.Graph()
    highest = highest_emfs(edges)
    for branch in edges:
        emf[branch.ref] = highest[branch.ref]
        r = branch.component.value("r_int")
        r_int[branch.ref] = si(r, "ohm") if r is not None else 0.0
        ga, gb = group[branch.a], group[branch.b]
        if ga == gb:
            shorted.append(branch)
            continue
        if not graph.has_edge(gb, ga):  # the first supply between two rails sets them
            graph.add_edge(gb, ga, rise=emf[branch.ref], tail=gb)
    negatives = [group[b.b] for b in edges]
    for component in nx.connected_components(graph):
        # The first supply's negative terminal is 0 V: floating nodes, held by
        # G_MIN, then sit at the common negative rail as they do in practice.
        root = next((g for g in negatives if g in component), min(component))
        rails[root] = 0.0
        for u, v in nx.bfs_edges(graph, root):
            data = graph.edges[u, v]
            rise = data["rise"] if data["tail"] == u else -data["rise"]
            rails[v] = rails[u] + rise
    for branch in edges:
        ga, gb = group[branch.a], group[branch.b]
        if ga != gb and abs(rails[ga] - rails[gb] - emf[branch.ref]) > 1e-6 * max(
            1.0, abs(emf[branch.ref])
        ):
            # Supplies in a loop whose EMFs do not add up (one fitted the wrong
            # way round): KVL cannot hold without a large circulating current.
            shorted.append(branch)
    return emf, r_int, rails, shorted


def _internal_components(state: DomainState) -> list[set[str]]:
    graph = nx.Graph()
    for branch in state.resistive + [
        b for b in state.domain.branches if b.kind in RECTIFYING_KINDS
    ]:
        ga, gb = state.group[branch.a], state.group[branch.b]
        for g in (ga, gb):
            if g not in state.rails:
                graph.add_node(g)
        if ga not in state.rails and gb not in state.rails:
            graph.add_edge(ga, gb)
    return [set(c) for c in nx.connected_components(graph)]


def _elements(state: DomainState) -> tuple[list[Resistor], list[Diode]]:
    """Every resistive branch and every one-way part, as circuit models."""
    group, facts = state.group, state.facts
    resistors = [
        Resistor(
            b.key,
            group[b.a],
            group[b.b],
            # _resistance, inlined (one call per resistive branch).
            si(facts[b.key].resistance, "ohm")
            if b.role in _FACTS_ROLES
            else _resistance(state, b),
        )
        for b in state.resistive
    ]
    diodes = [
        Diode(branch.key, group[branch.a], group[branch.b], vf, vz)
        for branch, vf, vz in _one_way_parts(state.domain)
    ]
    return resistors, diodes


def _one_way_parts(domain: Domain) -> list[tuple[Branch, float, float | None]]:
    """The domain's branches that conduct one way, with vf and vz (V)."""
    parts = domain.cache.get("one-way")
    if parts is None:
        parts = []
        for branch in domain.branches:
            component = branch.component
            if branch.kind in RECTIFYING_KINDS and conducts_one_way(
                branch.kind,
                component.value("bidirectional"),
                {c.terminal for c in component.connections},
            ):
                vz = component.value("vz") if branch.kind == "zener" else None
                parts.append(
                    (branch, _vf(branch), si(vz, "V") if vz is not None else None)
                )
        domain.cache["one-way"] = parts
    return parts  # type: ignore[return-value]


def _by_internal(
    state: DomainState, models: list, count: int
) -> list[list[Resistor | Diode]]:
    """The models touching each internal component, in the order of ``models``."""
    found: list[list[Resistor | Diode]] = [[] for _ in range(count)]
    internal = state.internal_of
    for model in models:
        ia, ib = internal.get(model.a), internal.get(model.b)
        if ia is not None:
            found[ia].append(model)
        if ib is not None and ib != ia:
            found[ib].append(model)
    return found


_FACTS_ROLES = frozenset({LOAD, COIL})  # branches whose resistance is a load fact


def _resistance(state: DomainState, branch: Branch) -> float:
    if branch.role in _FACTS_ROLES:
        value = state.facts[branch.key].resistance
    else:
        value = branch.component.value("R")
    # Zero and negative values are refused on input; what is left is used as given.
    return si(value, "ohm")


def _direct_solve(
    state: DomainState, resistors: list[Resistor], diodes: list[Diode]
) -> Solution:
    """Branches whose two ends are both rails: no unknown node at all."""
    rails = state.rails
    return solve_dc(
        list(rails),
        rails,
        [r for r in resistors if r.a in rails and r.b in rails],
        [d for d in diodes if d.a in rails and d.b in rails],
    )


CONDUCTING = (
    1e-6  # A; a suppressor carrying more than this conducts in normal operation
)


def _find_shorts(state: DomainState, diodes: list[Diode]) -> None:
    """Conducting diode paths from rail to rail with no resistance: a short circuit.

    Each path is reported on its own: chains that meet only at the rails are
    separate faults with their own drops, not one lumped chain.
    """
    links = nx.Graph()
    for d in diodes:
        if abs(state.currents.get(d.key, 0.0)) > CONDUCTING:
            links.add_edge(d.a, d.b, key=d.key)
    rails = set(state.rails)
    inner = links.subgraph(n for n in links if n not in rails)
    paths = [list(links.edges(c, data="key")) for c in nx.connected_components(inner)]
    paths += [[(u, v, k)] for u, v, k in links.edges(data="key") if {u, v} <= rails]
    for edges in paths:
        touched = {n for u, v, _k in edges for n in (u, v) if n in rails}
        if len({round(state.rails[g], 9) for g in touched}) > 1:
            keys = sorted({k for _u, _v, k in edges})
            state.shorts.append(tuple(state.branch_by_key[k] for k in keys))


def solve_domain(
    domain: Domain,
    open_keys: frozenset[str] = frozenset(),
    opened: frozenset[str] = frozenset(),
) -> DomainState:
    """Solve a DC domain with every switching element closed but ``open_keys``.

    ``opened`` records the elements the state itself keeps open (changeover
    sides), as opposed to those opened for one element's worst case.
    """
    # Branches that leave the domain (a TVS to a net nothing else reaches: it
    # does not join domains) take no part in its operating point.
    domain = Domain(
        domain.nets,
        domain.supplies,
        [b for b in domain.branches if b.a in domain.nets and b.b in domain.nets],
        domain.cache,
    )
    group, wire = _groups(domain, open_keys)
    emf, r_int, rails, supply_shorts = _rails(domain, group)
    facts, resistive, unknown = {}, [], []
    for branch in domain.branches:
        if branch.role in (LOAD, COIL):
            facts[branch.key] = load_facts(branch)
            (resistive if facts[branch.key].resistance is not None else unknown).append(
                branch
            )
        elif branch.role == "resistor":
            (resistive if branch.component.value("R") is not None else unknown).append(
                branch
            )
    state = DomainState(
        domain,
        group,
        wire,
        rails,
        emf,
        r_int,
        {},
        {},
        {},
        facts,
        resistive,
        unknown,
        supply_shorts=supply_shorts,
        branch_by_key={b.key: b for b in domain.branches},
        opened=opened,
    )
    state.supplies = [b for b in domain.branches if b.role == SUPPLY]
    attach = state.attached.setdefault
    for branch in domain.branches:
        attach(branch.a, []).append(branch)
        attach(branch.b, []).append(branch)
    all_r, all_diodes = _elements(state)
    solutions = [_direct_solve(state, all_r, all_diodes)]
    internal = _internal_components(state)
    for index, members in enumerate(internal):
        for g in members:
            state.internal_of[g] = index
    # Each internal component gets the models touching it, found in one pass
    # (not one pass over the domain per component).
    resistors_of = _by_internal(state, all_r, len(internal))
    diodes_of = _by_internal(state, all_diodes, len(internal))
    for index, members in enumerate(internal):
        resistors, diodes = resistors_of[index], diodes_of[index]
        nodes = sorted(
            members
            | {n for r in resistors for n in (r.a, r.b)}
            | {n for d in diodes for n in (d.a, d.b)}
        )
        fixed = {n: state.rails[n] for n in nodes if n in state.rails}
        solutions.append(solve_dc(nodes, fixed, resistors, diodes))  # type: ignore[arg-type]
        state.internal_rails[index] = frozenset(n for n in nodes if n in state.rails)
    for solution in solutions:
        state.potentials.update(solution.potentials)
        state.currents.update(solution.currents)
        state.diode_state.update(solution.diode_state)
    for g in set(group.values()):
        state.potentials.setdefault(g, 0.0)
    state.models = {m.key: m for m in [*all_r, *all_diodes]}
    for key, m in state.models.items():
        for g in (m.a, m.b):
            if g in state.internal_of:
                state.comp_branches.setdefault(state.internal_of[g], set()).add(key)
    for net, g in group.items():
        state.group_nets.setdefault(g, []).append(net)
    _find_shorts(state, all_diodes)
    return state


def shunts(state: DomainState) -> list[Branch]:
    """Loads and resistors whose two ends lie in one zero-ohm group."""
    return [
        b
        for b in state.resistive
        if state.group[b.a] == state.group[b.b] and b.a != b.b
    ]


def prospective_current(state: DomainState, drop: float = 0.0) -> float | None:
    """The current a short across the domain's supply draws (A), or None if unbounded.

    Kirchhoff's voltage law round the loop: (E - the forward drops in the path)
    / r_int, capped by the supply's stated short-circuit current ``isc``.
    """
    if not state.supplies:
        return None
    supply = state.supplies[0]
    emf, r_int = state.emf[supply.ref], state.r_int[supply.ref]
    isc = supply.component.value("isc")
    limit = si(isc, "A") if isc is not None else None
    if r_int > 0:
        current = max(emf - drop, 0.0) / r_int
        return min(current, limit) if limit is not None else current
    return limit


def chain_drop(state: DomainState, chain: Iterable[Branch]) -> float:
    """The voltage a conducting chain holds (V), by KVL along it.

    A diode conducting forward holds its forward drop; a zener conducting in
    reverse holds its breakdown voltage vz (diode physics).
    """
    total = 0.0
    for branch in chain:
        model = state.models.get(branch.key)
        if not isinstance(model, Diode):
            continue
        reverse = state.diode_state.get(branch.key) == "reverse"
        total += model.vz if reverse and model.vz is not None else model.vf
    return total
