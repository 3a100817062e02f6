"""Network rules: supply domains, nets with one connection, shorted supplies."""

from __future__ import annotations

from collections.abc import Iterator

import networkx as nx

from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding
from netcheck.graph import supply_kind

__all__ = ["ac_dc_interconnected", "single_connection_net", "supply_short_circuit"]


def _describe(component) -> str:  # type: ignore[no-untyped-def]
    kind = supply_kind(component)
    voltage = component.value(kind)
    return f"{kind.upper()} supply {component.ref} ({voltage:~g})"


@check("ac-dc-interconnected")
def ac_dc_interconnected(ctx: CheckContext) -> Iterator[Finding]:
    """Flag domains fed by AC and DC supplies, or by DC supplies of other voltages."""
    for domain in ctx.domains():
        if len(domain.supplies) < 2:
            continue
        first = domain.supplies[0]
        for other in domain.supplies[1:]:
            same_kind = supply_kind(first) == supply_kind(other)
            if same_kind and (
                supply_kind(first) == "ac" or first.value("dc") == other.value("dc")
            ):
                continue
            net = _meeting_net(ctx, first, other)
            yield ctx.finding(
                (other, net),
                net=net,
                first=_describe(first),
                second=_describe(other),
                key=first.ref,
            )


def _meeting_net(ctx: CheckContext, first, other) -> str:  # type: ignore[no-untyped-def]
    """The net where two supplies meet: one both touch, else the first on a path."""
    mine = {c.net for c in first.connections}
    theirs = {c.net for c in other.connections}
    shared = sorted(mine & theirs)
    if shared:
        return shared[0]
    graph = ctx.graph.graph
    path = min(
        (
            nx.shortest_path(graph, a, b)
            for a in sorted(mine)
            for b in sorted(theirs)
            if nx.has_path(graph, a, b)
        ),
        key=len,
        default=[min(theirs)],
    )
    return path[1] if len(path) > 2 else path[-1]


@check("single-connection-net")
def single_connection_net(ctx: CheckContext) -> Iterator[Finding]:
    """Flag nets with one connection only (usually a mistyped net name)."""
    names = [net for net, _ in ctx.nets()]
    for net, connections in ctx.nets():
        if len(connections) != 1:
            continue
        component, terminal = connections[0]
        similar = [n for n in names if n != net and n.lower() == net.lower()]
        hint = f"did you mean {similar[0]}?" if similar else "check the net name"
        yield ctx.finding(
            component,
            net=net,
            terminal=f"{component.ref}:{terminal}",
            hint=hint,
            key=net,
        )


@check("supply-short-circuit")
def supply_short_circuit(ctx: CheckContext) -> Iterator[Finding]:
    """Flag paths across a supply with no load: forward diodes or closed contacts."""
    for short in ctx.shorts():
        if short.kind == "supplies":
            yield ctx.finding(
                short.component,
                message="supplies",
                fix="supplies",
                others=", ".join(short.others),
                key="supplies",
            )
            continue
        if short.kind == "contacts":
            yield ctx.finding(
                short.component,
                message="contacts",
                fix="contacts",
                current=short.current,
                key="contacts",
            )
            continue
        path = ", ".join(short.path)
        yield ctx.finding(short.component, path=path, current=short.current, key=path)
