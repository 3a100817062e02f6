"""Short circuits the solved closed states show, and diodes that conduct reversed.

Read once from the domain states (the check context memoises them) so the
network and suppression rules never read solver state themselves.
"""

from __future__ import annotations

from dataclasses import dataclass

import pint

from netcheck.analysis.domain import (
    CONDUCTING,
    DomainState,
    chain_drop,
    prospective_current,
)
from netcheck.analysis.elements import Analysis, LoadInfo
from netcheck.analysis.switched import Suppressor
from netcheck.graph import Branch
from netcheck.model import Component
from netcheck.units import Q_

__all__ = [
    "Short",
    "ReversedDiode",
    "supply_shorts",
    "reversed_diodes",
    "in_breakdown",
]


@dataclass(frozen=True)
class Short:
    """A path across a supply with no load in it.

    ``kind`` is ``supplies`` (supplies of one voltage in parallel), ``contacts``
    (closed contacts straight across a supply) or ``chain`` (forward diodes or
    other parts with no resistance). ``current`` is the prospective current, or
    None where only the wiring limits it.
    """

    kind: str
    component: Component
    path: tuple[str, ...] = ()  # references along the path
    others: tuple[str, ...] = ()  # for ``supplies``: the other supplies
    current: pint.Quantity | None = None


@dataclass(frozen=True)
class ReversedDiode:
    """A polarized suppressor across a DC load that conducts when it is energised."""

    load: LoadInfo
    suppressor: Suppressor
    diode: Component
    current: pint.Quantity | None  # None: a short limited only by the wiring
    positive: str  # the load's net at the higher potential
    negative: str


def _prospective(state: DomainState, drop: float) -> pint.Quantity | None:
    current = prospective_current(state, drop)
    return Q_(current, "A") if current is not None else None


def _state_shorts(
    state: DomainState, reported: set[str], across_load: set[str]
) -> list[Short]:
    out: list[Short] = []
    for supply in state.supply_shorts:
        if supply.ref in reported:
            continue
        reported.add(supply.ref)
        if state.group[supply.a] == state.group[supply.b]:
            out.append(
                Short(
                    "contacts",
                    supply.component,
                    current=_prospective(state, 0.0),
                )
            )
        elif len({round(v, 9) for v in state.emf.values()}) == 1:
            # Of different voltages, ac-dc-interconnected reports them instead.
            others = sorted(b.ref for b in state.supplies if b is not supply)
            out.append(Short("supplies", supply.component, others=tuple(others)))
    for chain in state.shorts:
        if any(b.ref in across_load for b in chain):
            continue  # freewheel-diode-reversed reports it, with the load
        refs = tuple(b.ref for b in chain)
        current = _prospective(state, chain_drop(state, chain))
        out.append(Short("chain", chain[0].component, refs, current=current))
    return out


def supply_shorts(analysis: Analysis) -> list[Short]:
    """Every short across a supply, in both solved states, each supply once."""
    states = [*analysis.states.items(), *analysis.alternate_states.items()]
    reported: set[str] = set()
    across_load = analysis.reversed_suppressors
    out: list[Short] = []
    for _name, state in sorted(states, key=lambda item: item[0]):
        out.extend(_state_shorts(state, reported, across_load))
    return out


def _diode_current(state: DomainState, chain, diode: Branch) -> pint.Quantity | None:  # type: ignore[no-untyped-def]
    if any(diode in group for group in state.shorts):
        return _prospective(state, chain_drop(state, chain.branches))
    return Q_(abs(state.currents.get(diode.key, 0.0)), "A")


def reversed_diodes(analysis: Analysis) -> list[ReversedDiode]:
    """Suppressors with a polarity that conduct across energised DC loads."""
    out: list[ReversedDiode] = []
    for _key, info in sorted(analysis.loads.items()):
        if info.supply != "dc":
            continue
        for suppressor in info.suppressors:
            chain = suppressor.chain
            if not suppressor.conducts or chain is None or not chain.polarity:
                continue
            state = analysis.states[info.domain or ""]
            if not any(
                state.diode_state.get(key) == "forward" for key in chain.polarity
            ):
                # Conducting by breakdown alone (a zener whose vz is below the
                # working voltage): fitted the right way round, but it conducts
                # in service: suppressor-conducts-normally says so.
                continue
            diode = next(b for b in chain.branches if b.key in chain.polarity)
            high, low = sorted(
                (info.branch.a, info.branch.b), key=lambda n: -state.net_potential(n)
            )
            current = _diode_current(state, chain, diode)
            out.append(
                ReversedDiode(info, suppressor, diode.component, current, high, low)
            )
    return out


def in_breakdown(analysis: Analysis) -> set[str]:
    """References of zeners and TVS conducting in reverse in a solved state."""
    states = [*analysis.states.values(), *analysis.alternate_states.values()]
    out: set[str] = set()
    for state in states:
        for key, mode in state.diode_state.items():
            if mode == "reverse" and abs(state.currents.get(key, 0.0)) > CONDUCTING:
                out.add(state.branch_by_key[key].ref)
    return out
