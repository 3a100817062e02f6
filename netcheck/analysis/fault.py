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

import pint

from netcheck.graph import CONDUCTOR, SUPPLY, SWITCH, Graph, supply_kind
from netcheck.kinds import PROTECTIVE_KINDS
from netcheck.model import Component, Pole
from netcheck.ranges import highest_voltage
from netcheck.units import Q_

__all__ = [
    "Protective",
    "supply_fault_current",
    "protective_devices",
    "inlet_of",
    "Feeds",
]


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
    emf, r_int, isc = (
        highest_voltage(supply),
        supply.value("r_int"),
        supply.value("isc"),
    )
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
        voltage = max(highest_voltage(s).to("V") for s in supplies)
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


class Feeds:
    """Which nets reach a supply terminal through conductors and contacts only.

    Built once per graph. For a device with one edge, both sides are searched
    in step and the search stops when one side is exhausted (the other side
    is the rest of the component) or the two meet, so a question costs the
    smaller side, not a walk of the whole design.
    """

    def __init__(self, graph: Graph) -> None:
        self.adjacent: dict[str, list[tuple[str, int]]] = {}
        self.edges: dict[int, int] = {}  # component id -> its edges here
        for branch in graph.branches:
            if branch.role in (CONDUCTOR, SWITCH):
                mark = id(branch.component)
                self.adjacent.setdefault(branch.a, []).append((branch.b, mark))
                self.adjacent.setdefault(branch.b, []).append((branch.a, mark))
                self.edges[mark] = self.edges.get(mark, 0) + 1
        supplies = [b for b in graph.branches if b.role == SUPPLY]
        self.plus = {b.a for b in supplies}
        self.minus = {b.b for b in supplies}
        self._counts: dict[str, tuple[int, int]] = {}  # net -> its component's (+, -)

    def _whole(self, net: str) -> tuple[int, int]:
        """Supply terminals (+, -) in the net's component, every edge in."""
        if net not in self._counts:
            seen = _search(self.adjacent, net, None)
            counts = (len(seen & self.plus), len(seen & self.minus))
            for member in seen:
                self._counts[member] = counts
        return self._counts[net]

    def reaches(self, skip: Component, a: str, b: str) -> tuple[bool, bool, bool, bool]:
        """(a reaches +, b reaches +, a reaches -, b reaches -), ``skip`` left out."""
        mark = id(skip)
        if self.edges.get(mark, 0) != 1 or a == b:
            sa, sb = (_search(self.adjacent, n, mark) for n in (a, b))
            return (
                bool(sa & self.plus),
                bool(sb & self.plus),
                bool(sa & self.minus),
                bool(sb & self.minus),
            )
        plus, minus = self._whole(a)
        side = _smaller_side(self.adjacent, a, b, mark)
        if side is None:  # still joined: both see the whole component
            return (plus > 0, plus > 0, minus > 0, minus > 0)
        index, nets = side
        own = (len(nets & self.plus), len(nets & self.minus))
        rest = (plus - own[0], minus - own[1])
        first, second = (own, rest) if index == 0 else (rest, own)
        return (first[0] > 0, second[0] > 0, first[1] > 0, second[1] > 0)


def _search(
    adjacent: dict[str, list[tuple[str, int]]], start: str, mark: int | None
) -> set[str]:
    seen, stack = {start}, [start]
    while stack:
        for neighbour, m in adjacent.get(stack.pop(), ()):
            if m != mark and neighbour not in seen:
                seen.add(neighbour)
                stack.append(neighbour)
    return seen


def _smaller_side(
    adjacent: dict[str, list[tuple[str, int]]], a: str, b: str, mark: int
) -> tuple[int, set[str]] | None:
    """The side (0: a's, 1: b's) searched to its end, or None if a and b meet."""
    seen: tuple[set[str], set[str]] = ({a}, {b})
    stacks = ([a], [b])
    while True:
        for k in (0, 1):
            if not stacks[k]:
                return k, seen[k]
            for neighbour, m in adjacent.get(stacks[k].pop(), ()):
                if m == mark or neighbour in seen[k]:
                    continue
                if neighbour in seen[1 - k]:
                    return None
                seen[k].add(neighbour)
                stacks[k].append(neighbour)


def inlet_of(
    graph: Graph, component: Component, pole: Pole, feeds: Feeds | None = None
) -> str | None:
    """The terminal load current enters a protective pole at, or None if unclear.

    A pole in the positive line takes the current in on the side wired (through
    conductors and contacts only) to the supply's ``+``; one in the negative
    line passes it out on the side wired to ``-``. ``feeds``: the graph's
    ``Feeds``, shared between questions (built here if not given).
    """
    net = component.net_of
    a, b = net(pole.common), net(pole.no or "")
    domain = graph.domain(a or "")
    if not a or not b or domain is None:
        return None
    feeds = feeds if feeds is not None else Feeds(graph)
    a_plus, b_plus, a_minus, b_minus = feeds.reaches(component, a, b)
    if a_plus != b_plus and not (a_minus or b_minus):
        return pole.common if a_plus else pole.no
    if a_minus != b_minus and not (a_plus or b_plus):
        return pole.no if a_minus else pole.common
    return None
