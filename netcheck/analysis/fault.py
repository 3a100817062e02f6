"""Protective devices on DC: the voltage they must withstand and the fault current.

A fuse or circuit-breaker must clear the worst short circuit downstream of it,
which on a battery can be kiloamperes. The first-order prospective current is
the supply's EMF over its internal resistance (Ohm's law round the loop of a
bolted fault), capped by a stated short-circuit current ``isc``; the wiring's
resistance is ignored, which is conservative (it only lowers the current).
Several supplies of one domain feed the fault in parallel, so their currents
add. A supply that gives neither ``r_int`` nor ``isc`` leaves the current
unknown (None).
"""

from __future__ import annotations

from dataclasses import dataclass

import networkx as nx
import pint

from netcheck.graph import BRANCH, CONDUCTOR, SUPPLY, SWITCH, Branch, Graph, supply_kind
from netcheck.kinds import PROTECTIVE_KINDS
from netcheck.model import Component, Pole
from netcheck.units import Q_

__all__ = ["Protective", "supply_fault_current", "protective_devices", "inlet_of"]


@dataclass(frozen=True)
class Protective:
    """A fuse or breaker in a DC domain, with what the domain asks of it."""

    component: Component
    domain: str
    voltage: pint.Quantity  # the highest supply voltage of the domain
    prospective: pint.Quantity | None  # None: no r_int or isc given
    supplies: tuple[str, ...]


def supply_fault_current(supply: Component) -> pint.Quantity | None:
    """One supply's bolted-fault current: EMF / r_int, capped by ``isc``."""
    emf, r_int, isc = supply.value("dc"), supply.value("r_int"), supply.value("isc")
    if emf is None:
        return None
    currents = []
    if r_int is not None and r_int.magnitude > 0:
        currents.append((emf / r_int).to("A"))
    if isc is not None:
        currents.append(isc.to("A"))
    return min(currents) if currents else None


def _prospective(supplies: tuple[Component, ...]) -> pint.Quantity | None:
    total = Q_(0.0, "A")
    for supply in supplies:
        current = supply_fault_current(supply)
        if current is None:
            return None
        total = total + current
    return total


def protective_devices(graph: Graph) -> list[Protective]:
    """Every fuse and breaker in a DC domain, in file order."""
    out: list[Protective] = []
    for component in graph.netlist.components:
        if component.kind not in PROTECTIVE_KINDS:
            continue
        nets = [c.net for c in component.connections]
        domain = next((graph.domain(n) for n in nets if graph.domain(n)), None)
        if domain is None or not domain.supplies or domain.kind != "dc":
            continue
        supplies = tuple(s for s in domain.supplies if supply_kind(s) == "dc")
        voltage = max(s.value("dc").to("V") for s in supplies)
        out.append(
            Protective(
                component,
                domain.name,
                voltage,
                _prospective(supplies),
                tuple(s.ref for s in supplies),
            )
        )
    return out


def _low_impedance(graph: Graph, skip: Component) -> nx.MultiGraph:
    """Nets joined by conductors and switching elements only, ``skip`` left out."""
    joined = nx.MultiGraph()
    for branch in graph.branches:
        if branch.component is skip or branch.role not in (CONDUCTOR, SWITCH):
            continue
        joined.add_edge(branch.a, branch.b)
    return joined


def _terminals(graph: Graph, domain_nets: frozenset[str]) -> tuple[set[str], set[str]]:
    plus, minus = set(), set()
    for _a, _b, data in graph.graph.edges(data=True):
        branch: Branch = data[BRANCH]
        if branch.role == SUPPLY and branch.a in domain_nets:
            plus.add(branch.a)
            minus.add(branch.b)
    return plus, minus


def _reaches(joined: nx.MultiGraph, net: str, targets: set[str]) -> bool:
    if net in targets:
        return True
    if net not in joined:
        return False
    return bool(nx.node_connected_component(joined, net) & targets)


def inlet_of(graph: Graph, component: Component, pole: Pole) -> str | None:
    """The terminal load current enters a protective pole at, or None if unclear.

    A pole in the positive line takes the current in on the side wired (through
    conductors and contacts only) to the supply's ``+``; one in the negative
    line passes it out on the side wired to ``-``.
    """
    net = component.net_of
    a, b = net(pole.common), net(pole.no or "")
    domain = graph.domain(a or "")
    if not a or not b or domain is None:
        return None
    plus, minus = _terminals(graph, domain.nets)
    joined = _low_impedance(graph, component)
    a_plus, b_plus = _reaches(joined, a, plus), _reaches(joined, b, plus)
    a_minus, b_minus = _reaches(joined, a, minus), _reaches(joined, b, minus)
    if a_plus != b_plus and not (a_minus or b_minus):
        return pole.common if a_plus else pole.no
    if a_minus != b_minus and not (a_plus or b_plus):
        return pole.no if a_minus else pole.common
    return None
