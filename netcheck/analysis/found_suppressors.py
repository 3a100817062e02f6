"""The suppressors found across a load or an element in a solved domain state."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from netcheck.analysis.domain import CONDUCTING, DomainState
from netcheck.analysis.suppression import Chain
from netcheck.analysis.switched import Suppressor
from netcheck.graph import Branch, Domain

__all__ = ["DomainContext", "suppressors_between", "load_suppressors"]


@dataclass
class DomainContext:
    """One domain's solved state (None off DC) and its suppressor chains."""

    domain: Domain
    state: DomainState | None
    chains: Mapping[frozenset[str], list[Chain]]
    wire: Mapping[str, str]


def _passes(chain: Chain, source: str, wire: Mapping[str, str]) -> bool:
    """Whether the chain can carry current from ``source``'s side to the other.

    A plain diode must be forward in that direction; a zener or unidirectional TVS
    conducts forward or in breakdown, so either way (diode physics).
    """
    from_a = wire.get(chain.a, chain.a) == wire.get(source, source)
    for branch in chain.branches:
        sign = chain.polarity.get(branch.key)
        if sign is None or branch.kind != "diode":
            continue
        if (sign > 0) != from_a:
            return False
    return True


def suppressors_between(
    chains: Mapping[frozenset[str], list[Chain]],
    wire: Mapping[str, str],
    a: str,
    b: str,
    placement: str,
    load: str | None,
    currents: Mapping[str, float],
    source: str | None = None,
) -> list[Suppressor]:
    """Suppressors between nets ``a`` and ``b``.

    ``source`` is the net the suppressor must carry current away from at opening
    (the load's negative side, or the element's current inlet); a chain that
    cannot (a diode + zener with its diode turned round) is not functional.
    """
    found: list[Suppressor] = []
    if not chains:  # a domain with no suppressor chain at all (nothing to key)
        return found
    for chain in chains.get(frozenset({wire.get(a, a), wire.get(b, b)}), ()):
        conducts = False
        for br in chain.branches:
            if abs(currents.get(br.key, 0.0)) > CONDUCTING:
                conducts = True
                break
        functional = source is None or _passes(chain, source, wire)
        found.append(
            Suppressor(
                chain.kind, placement, chain.refs, load, chain, conducts, functional
            )
        )
    return found


def load_suppressors(ctx: DomainContext, branch: Branch) -> tuple[Suppressor, ...]:
    """A load's suppressors in ``ctx.state``: found once per state and load.

    The closed state's loads are recorded, and each is switched by one or more
    elements; all of them read the same suppressors.
    """
    if ctx.state is None:
        return _find_load_suppressors(ctx, branch)
    memo: dict = ctx.state.cache.setdefault("load-suppressors", {})  # type: ignore[assignment]
    found = memo.get(branch.key)
    if found is None:
        found = memo[branch.key] = _find_load_suppressors(ctx, branch)
    return found  # type: ignore[no-any-return]


def _find_load_suppressors(
    ctx: DomainContext, branch: Branch
) -> tuple[Suppressor, ...]:
    facts = ctx.state.facts[branch.key] if ctx.state else None
    low = branch.b
    state = ctx.state
    if state is not None:
        # net_potential, inlined: once per load and state.
        potentials, group = state.potentials, state.group
        if potentials.get(group[branch.a], 0.0) < potentials.get(group[branch.b], 0.0):
            low = branch.a
    # At opening the load drives its current on: out of its low side, round
    # through the suppressor, into its high side.
    found = suppressors_between(
        ctx.chains,
        ctx.wire,
        branch.a,
        branch.b,
        "across-load",
        branch.ref,
        ctx.state.currents if ctx.state else {},
        source=low if ctx.state is not None else None,
    )
    if facts is not None and facts.suppression not in ("none", ""):
        found.append(
            Suppressor(facts.suppression, "built-in", (branch.ref,), branch.ref)
        )
    return tuple(found)
