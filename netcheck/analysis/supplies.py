"""Supply voltages for the analysis: the top of a stated range (``ranges.py``)."""

from __future__ import annotations

from collections.abc import Iterable

from netcheck.analysis.si import si
from netcheck.graph import Branch, Graph
from netcheck.model import Component
from netcheck.ranges import ValueRange, highest_voltage, supply_range

__all__ = ["highest_emfs", "ranged_supply", "SUPPLY_NOTES"]

# What a finding in a domain whose supply states a range adds to its message:
# the voltage the finding was judged at (by basis: the range's top or bottom).
SUPPLY_NOTES = {
    "highest": " (judged at {supply_highest}, the highest voltage of supply "
    "{range_supply}, range {supply_lowest} to {supply_highest})",
    "lowest": " (judged at {supply_lowest}, the lowest voltage of supply "
    "{range_supply}, range {supply_lowest} to {supply_highest})",
}


def highest_emfs(edges: Iterable[Branch]) -> dict[str, float]:
    """Each supply's EMF at the top of its stated range (``ranges.py``).

    Supplies of one nominal voltage share the highest top among them, so a
    ranged supply in parallel with an unranged one of the same nominal is not
    taken for a KVL conflict.
    """
    nominal = {}
    for branch in edges:
        value = branch.component.value("dc")
        nominal[branch.ref] = si(value, "V") if value is not None else 0.0
    top: dict[float, float] = {}
    for branch in edges:
        high = highest_voltage(branch.component)
        volts = si(high, "V") if high is not None else 0.0
        key = nominal[branch.ref]
        top[key] = max(top.get(key, volts), volts)
    return {ref: top[value] for ref, value in nominal.items()}


def ranged_supply(graph: Graph, component: Component) -> tuple[str, ValueRange] | None:
    """The DC supply with the highest stated range top in a component's domain.

    None where the component is in no DC domain or no supply there states a
    range: its findings were then judged at the nominal voltage.
    """
    for connection in component.connections:
        domain = graph.domain(connection.net)
        if domain is None or domain.kind != "dc":
            continue
        bands = [(s.ref, b) for s in domain.supplies if (b := supply_range(s))]
        if bands:
            return max(bands, key=lambda one: one[1].high)
    return None
