"""Assemble the analysis of every switching element of a design."""

from __future__ import annotations

from collections.abc import Container, Mapping

from netcheck.alloc import collector_paused, is_loaded
from netcheck.analysis.domain import (
    DomainState,
    chain_drop,
    prospective_current,
    shunts,
    solve_domain,
)
from netcheck.analysis.element_loads import is_power, switched_once
from netcheck.analysis.found_suppressors import (
    DomainContext,
    load_suppressors,
    suppressors_between,
)
from netcheck.analysis.loads import (
    load_facts,
)
from netcheck.analysis.result import Analysis, LoadInfo
from netcheck.analysis.series import changeovers, mark_series
from netcheck.analysis.si import quantity
from netcheck.analysis.suppression import Chain, find_chains
from netcheck.analysis.switched import (
    ElementAnalysis,
    Suppressor,
    net_injections,
    open_element,
    with_fields,
)
from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.graph import COIL, CONDUCTOR, LOAD, SUPPLY, SWITCH, Branch, Domain, Graph

__all__ = ["Analysis", "LoadInfo", "analyse"]


def _wire_map(domain: Domain) -> dict[str, str]:
    parent = {n: n for n in domain.nets}

    def find(n: str) -> str:
        while parent[n] != n:
            parent[n] = parent[parent[n]]
            n = parent[n]
        return n

    for branch in domain.branches:
        if branch.role == CONDUCTOR:
            ra, rb = find(branch.a), find(branch.b)
            if ra != rb:
                parent[max(ra, rb)] = min(ra, rb)
    return {n: find(n) for n in domain.nets}


def _degrees(graph: Graph) -> dict[str, int]:
    return {net: len(conns) for net, conns in graph.connections.items()}


def _analyse_parallel(
    shared: dict[tuple, ElementAnalysis],
    ctx: DomainContext,
    branch: Branch,
    zero: ZeroOhm,
    injection: Mapping[str, float],
    terminals: set[str],
) -> ElementAnalysis:
    """``_analyse_dc``, once for elements in parallel between the same nets.

    Switching elements of one block between the same two nets (20 start
    buttons OR-ed, a seal-in beside them) open the same circuit: the sides are
    taken with all of the block's switching elements open, so everything but
    the element, its component and its bypass is the same, given the power
    flag. ``shared`` holds one state's results (``ctx``, ``zero``, the
    injections and the terminals are that state's), keyed on the block, the
    two nets and the flag; a bypass through a load re-solves per element and
    is not shared.
    """
    key = branch.key
    block = zero.block_of.get(key)
    if block is None or zero.bypass_through_load(key):
        return _analyse_dc(ctx, branch, zero, injection, terminals)
    assert ctx.state is not None
    power = is_power(ctx.state, branch)
    twin = (block, branch.a, branch.b, power)
    first = shared.get(twin)
    if first is None:
        first = shared[twin] = _analyse_dc(
            ctx, branch, zero, injection, terminals, power
        )
        return first
    return with_fields(
        first,
        element=branch.element,
        component=branch.component,
        bypass=zero.bypass(key),
    )


def _shorted_chains(state: DomainState, floating: frozenset[str]) -> list:
    """The supply shorts that the element feeds (a chain touching its open side)."""
    return [
        c for c in state.shorts if any(n in floating for b in c for n in (b.a, b.b))
    ]


def _sag(state: DomainState, current: float) -> tuple[float, str | None]:
    """Correct a current for the supply's internal resistance (linear loads).

    With only the switched circuit energised, I = G·E/(1 + G·r_int) where
    G = I0/E is the circuit's conductance seen from the rails (Ohm's law).
    """
    supplies = state.supplies
    if len(supplies) != 1:
        return current, None
    ref = supplies[0].ref
    emf, r_int = state.emf[ref], state.r_int[ref]
    if emf <= 0 or r_int <= 0:
        return current, ref
    conductance = abs(current) / emf
    return current / (1.0 + conductance * r_int), ref


def _analyse_dc(
    ctx: DomainContext,
    branch: Branch,
    zero: ZeroOhm,
    injection: Mapping[str, float],
    terminals: set[str],
    power: bool | None = None,
) -> ElementAnalysis:
    """The element's analysis; ``power``, if given, is ``is_power`` of it."""
    state = ctx.state
    assert state is not None and branch.element is not None
    if zero.bypass_through_load(branch.key):
        # A bypass through a load (a precharge resistor around a main contact):
        # solve again with the bypassing elements open, as the worst case asks.
        state = solve_domain(
            ctx.domain,
            state.opened | frozenset(zero.bypass(branch.key)),
            opened=state.opened,
        )
        ctx = DomainContext(ctx.domain, state, ctx.chains, ctx.wire)
        zero = _zero_ohm(ctx.domain, state)
        injection = net_injections(state)
    opening = open_element(state, zero, injection, terminals, branch)
    if power is None:
        power = is_power(state, branch)
    current, supply_ref = _sag(state, opening.current_ab)
    # The loads break at the sagged current too: ½·L·I² with I = E/(R + r_int).
    sag = abs(current / opening.current_ab) if abs(opening.current_ab) > 1e-12 else 1.0
    switched = switched_once(ctx, opening, power, sag)
    shorted = _shorted_chains(state, opening.floating_nets) if state.shorts else []
    if shorted:
        # A short on the switched side: Ohm's law does not apply to the diode;
        # KVL round the loop gives (E - its forward drops) / r_int.
        drop = min(chain_drop(state, chain) for chain in shorted)
        bounded = prospective_current(state, drop)
        current = bounded if bounded is not None else current
    inlet = branch.a if opening.current_ab >= 0 else branch.b
    across = suppressors_between(
        ctx.chains,
        ctx.wire,
        branch.a,
        branch.b,
        "across-element",
        None,
        state.currents,
        source=inlet,
    )
    unknown = (
        _unknown_resistance(state, opening.floating_nets)
        if state.unknown_resistance
        else ()
    )
    name, bidirectional = _domain_facts(state)
    return ElementAnalysis(
        element=branch.element,
        component=branch.component,
        domain=name,
        supply="dc",
        voltage=quantity(abs(opening.voltage_ab), "V"),
        current=quantity(abs(current), "A"),
        loads=switched.loads,
        load_category=switched.category,
        time_constant=switched.tau,
        t95=switched.t95,
        energy=switched.energy,
        suppression=switched.suppression + tuple(across),
        bypass=opening.bypass,
        direction=(
            1 if opening.current_ab > 1e-9 else -1 if opening.current_ab < -1e-9 else 0
        ),
        bidirectional=bidirectional,
        supply_ref=supply_ref,
        missing=(
            switched.missing + tuple(f"{r}: resistance" for r in unknown)
            if unknown
            else switched.missing
        ),
        short_circuit=bool(shorted),
    )


def _domain_facts(state: DomainState) -> tuple[str, bool]:
    """The domain's name and whether its first supply is bidirectional.

    The same for every element of the state: kept in ``state.cache``. It
    reads only ``state.domain`` (the domain the state was solved from, its
    nets and supplies, which name it), fixed once the state is made.
    """
    found = state.cache.get("element-domain")
    if found is None:
        supplies = state.domain.supplies
        supply = supplies[0] if supplies else None
        found = state.cache["element-domain"] = (
            state.domain.name,
            bool(supply is not None and supply.value("bidirectional")),
        )
    return found  # type: ignore[return-value]


def _unknown_resistance(state: DomainState, nets: frozenset[str]) -> list[str]:
    """References of the branches of unknown resistance touching ``nets``.

    In the order of ``state.unknown_resistance``, found through an index by
    net: a walk of the whole list per element was quadratic where many loads
    lack their data.
    """
    at: dict[str, list[int]] | None = state.cache.get("unknown-at")  # type: ignore[assignment]
    if at is None:
        at = {}
        for index, b in enumerate(state.unknown_resistance):
            at.setdefault(b.a, []).append(index)
            at.setdefault(b.b, []).append(index)
        state.cache["unknown-at"] = at
    if len(nets) > len(at):
        found = {i for net in at if net in nets for i in at[net]}
    else:
        found = {i for net in nets for i in at.get(net, ())}
    return [state.unknown_resistance[i].ref for i in sorted(found)]


def _record_loads(
    analysis: Analysis,
    domain: Domain,
    chains: Mapping[frozenset[str], list[Chain]],
    wire: Mapping[str, str],
) -> None:
    """Loads of domains that are not solved (AC, no supply): facts and suppressors."""
    if domain.kind == "dc":
        return
    ctx = DomainContext(domain, None, chains, wire)
    for branch in domain.branches:
        if branch.role in (LOAD, COIL):
            facts = load_facts(branch)
            suppressors = suppressors_between(
                chains, wire, branch.a, branch.b, "across-load", branch.ref, {}
            )
            if facts.suppression not in ("none", ""):
                suppressors.append(
                    Suppressor(facts.suppression, "built-in", (branch.ref,), branch.ref)
                )
            analysis.loads[branch.key] = LoadInfo(
                branch,
                facts,
                domain.name if domain.supplies else None,
                domain.kind,
                None,
                None,
                tuple(suppressors),
            )
    del ctx


def _record_dc_loads(analysis: Analysis, ctx: DomainContext) -> None:
    state = ctx.state
    assert state is not None
    name, currents = ctx.domain.name, state.currents
    potentials, group = state.potentials, state.group  # net_potential, inlined
    for key, facts in state.facts.items():
        branch = state.branch_by_key[key]
        current = abs(currents[key]) if key in currents else None
        voltage = abs(
            potentials.get(group[branch.a], 0.0) - potentials.get(group[branch.b], 0.0)
        )
        analysis.loads[key] = LoadInfo(
            branch,
            facts,
            name,
            "dc",
            quantity(current, "A") if current is not None else None,
            quantity(voltage, "V"),
            load_suppressors(ctx, branch),
        )


def _zero_ohm(domain: Domain, state: DomainState) -> ZeroOhm:
    closed = [
        b
        for b in domain.branches
        if b.role in (SWITCH, CONDUCTOR) and state.group[b.a] == state.group[b.b]
    ]
    return ZeroOhm(closed, shunts(state))


def analyse(graph: Graph, only: Container[str] | None = None) -> Analysis:
    """Analyse every switching element of the design.

    ``only``, if given, names the components whose DC elements are analysed
    (the others are left unanalysed, as off any domain); the domains are
    solved in full either way. Fix verification uses it to re-check the few
    elements an edit can change (``netcheck.fixes.rungs``).

    The cyclic collector is paused meanwhile (``netcheck.alloc``): its full
    passes over the growing analysis were a quarter of the stage's time on a
    20,000-component design. The analysis of the loaded design lives as long
    as its model and is frozen with it, as its graph is: re-enabling would
    otherwise start one pass over everything the analysis built (a tenth of the
    stage; it leaves no cycles to collect). Re-checks of edited copies are not
    frozen: those must be collected.
    """
    with collector_paused(freeze=is_loaded(graph.netlist)):
        return _analyse(graph, only)


def _analyse(graph: Graph, only: Container[str] | None = None) -> Analysis:
    elements: dict[str, ElementAnalysis] = {}
    analysis = Analysis(graph, elements)
    degree = _degrees(graph)
    for domain in graph.domains:
        wire = _wire_map(domain)
        chains = find_chains(domain.branches, degree, wire)
        analysis.chains[domain.name] = chains
        analysis.wires[domain.name] = wire
        switches = [b for b in domain.branches if b.role == SWITCH]
        kind = domain.kind
        _record_loads(analysis, domain, chains, wire)
        if kind != "dc":
            for branch in switches:
                assert branch.element is not None
                elements[branch.element.name] = ElementAnalysis(
                    branch.element,
                    branch.component,
                    domain.name if domain.supplies else None,
                    kind,
                )
            continue
        terminals = {n for b in domain.branches if b.role == SUPPLY for n in (b.a, b.b)}
        no_side, nc_side = changeovers(switches)
        for mode, opened in (("no", nc_side), ("nc", no_side)):
            members = [b for b in switches if (b.key in nc_side) == (mode == "nc")]
            if mode == "nc" and not members:
                continue
            state = solve_domain(domain, frozenset(opened), opened=frozenset(opened))
            ctx = DomainContext(domain, state, chains, wire)
            if mode == "no":
                analysis.states[domain.name] = state
                _record_dc_loads(analysis, ctx)
            else:
                analysis.alternate_states[domain.name] = state
            zero = _zero_ohm(domain, state)
            injection = net_injections(state)
            shared: dict[tuple, ElementAnalysis] = {}
            for branch in members:
                assert branch.element is not None
                if only is not None and branch.ref not in only:
                    continue
                elements[branch.element.name] = _analyse_parallel(
                    shared, ctx, branch, zero, injection, terminals
                )
    for component in graph.netlist.components:
        for element in component.elements:
            if element.name not in elements:
                elements[element.name] = ElementAnalysis(element, component, None, None)
    analysis.elements = mark_series(elements)
    return analysis
