"""The loads an element switches and what its analysis reads of them alone."""

from __future__ import annotations

from typing import NamedTuple

import pint

from netcheck.analysis.constants import T95_PER_TAU
from netcheck.analysis.domain import DomainState
from netcheck.analysis.found_suppressors import DomainContext, load_suppressors
from netcheck.analysis.loads import (
    LoadFacts,
    category_for,
    is_inductive,
    most_demanding,
    rated_as_power_device,
)
from netcheck.analysis.si import quantity, si
from netcheck.analysis.switched import Opening, Suppressor, SwitchedLoad
from netcheck.graph import Branch
from netcheck.model import Component

__all__ = ["Switched", "is_power", "switched_loads", "switched_once"]


def switched_loads(
    ctx: DomainContext, opening: Opening, power: bool, sag: float = 1.0
) -> list[SwitchedLoad]:
    """The loads the element switches, at the current it breaks.

    ``sag`` scales the ideal-rail solution for the supply's internal resistance
    (linear loads: every current and load voltage by the same factor).
    """
    state = ctx.state
    assert state is not None
    loads = []
    # DomainState.net_potential, inlined: a few reads per switched load.
    potentials, group = state.potentials, state.group
    by_key, all_facts, currents = state.branch_by_key, state.facts, state.currents
    for key in opening.switched:
        branch = by_key[key]
        facts = all_facts[key]
        current = sag * abs(currents.get(key, 0.0))
        voltage = sag * abs(
            potentials.get(group[branch.a], 0.0) - potentials.get(group[branch.b], 0.0)
        )
        energy = None
        if facts.inductance is not None:
            # pint's (0.5·L·I²).to("J") in floats: L is in H (load_facts), the
            # H·A² → J factor is exactly 1.0, so the product is bit-identical.
            energy = quantity(0.5 * si(facts.inductance, "H") * current**2, "J")
        loads.append(
            SwitchedLoad(
                facts,
                quantity(current, "A"),
                quantity(voltage, "V"),
                category_for(facts.type, power),
                energy,
                is_inductive(facts),
                load_suppressors(ctx, branch),
            )
        )
    return loads


class Switched(NamedTuple):
    """The loads an element switches and what its analysis reads of them alone."""

    loads: tuple[SwitchedLoad, ...]
    category: str | None
    tau: pint.Quantity | None
    t95: pint.Quantity | None
    energy: pint.Quantity
    suppression: tuple[Suppressor, ...]
    missing: tuple[str, ...]


def switched_once(
    ctx: DomainContext, opening: Opening, power: bool, sag: float
) -> Switched:
    """``_switched``, once per state for the same loads, flag and sag.

    The 30 contacts of an interlock chain switch the same coil at the same
    current. Kept in ``state.cache``: besides its key it reads only the state
    (its loads' facts, currents and potentials, and their suppressors, which
    ``load_suppressors`` keeps there too).
    """
    state = ctx.state
    assert state is not None
    memo: dict = state.cache.setdefault("switched-loads", {})  # type: ignore[assignment]
    key = (opening.switched, power, sag)
    found = memo.get(key)
    if found is None:
        found = memo[key] = _switched(ctx, opening, power, sag)
    return found  # type: ignore[no-any-return]


def _switched(
    ctx: DomainContext, opening: Opening, power: bool, sag: float
) -> Switched:
    if len(opening.switched) == 1:
        return _one_load(ctx, opening.switched[0], power, sag)
    loads = tuple(switched_loads(ctx, opening, power, sag))
    if not loads:
        return Switched((), None, None, None, quantity(0.0, "J"), (), ())
    if len(loads) == 1:
        return _one_switched(loads[0])
    taus = [
        ld.facts.time_constant for ld in loads if ld.facts.time_constant is not None
    ]
    tau = max(taus) if taus else quantity(0.0, "s")
    energies = [ld.energy for ld in loads if ld.energy is not None]
    return Switched(
        loads,
        most_demanding([ld.category for ld in loads]),
        tau,
        # Floats, then one quantity each: tau is in s and every energy in J
        # (load_facts, switched_loads), so these equal pint's own products.
        quantity(T95_PER_TAU * si(tau, "s"), "s") if tau is not None else None,
        quantity(sum((si(e, "J") for e in energies), 0.0), "J"),
        tuple(s for ld in loads for s in ld.suppressors),
        tuple(sorted({m for ld in loads for m in ld.facts.missing})),
    )


def _one_switched(load: SwitchedLoad) -> Switched:
    """``_switched`` of one load (most elements): its own values, no aggregates.

    The same operations on the one value: ``max`` of one time constant is
    itself, the energy sum is ``0.0 + E`` as ``sum`` adds from its start.
    """
    facts = load.facts
    tau = facts.time_constant if facts.time_constant is not None else quantity(0.0, "s")
    energy = 0.0 + si(load.energy, "J") if load.energy is not None else 0.0
    return Switched(
        (load,),
        most_demanding([load.category]),
        tau,
        quantity(T95_PER_TAU * si(tau, "s"), "s"),
        quantity(energy, "J"),
        load.suppressors,
        tuple(sorted(set(facts.missing))),
    )


def _one_load(ctx: DomainContext, key: str, power: bool, sag: float) -> Switched:
    """``_one_switched(switched_loads(...)[0])``, its values shared per state.

    Repeated rungs switch loads of one part at one current and voltage: what
    ``switched_loads`` and ``_one_switched`` make of such a load's values (its
    quantities, category, inductive flag, time constants, energy, missing
    data) is the same, so it is made once per state and shared (quantities are
    never changed in place: DEVELOPERS.md). Kept in ``state.cache``, keyed on
    all it reads: the identities of the facts' inductance and time constant
    (the objects kept beside the entry, so an identity met again is the same
    object), the type, the missing data, the two floats exactly and the power
    flag. The floats are ``sag * abs(...)`` with ``sag >= 0``: never -0.0, and
    a NaN only misses. The load's own facts and suppressors are its own.
    """
    state = ctx.state
    assert state is not None
    branch = state.branch_by_key[key]
    facts = state.facts[key]
    potentials, group = state.potentials, state.group
    current = sag * abs(state.currents.get(key, 0.0))
    voltage = sag * abs(
        potentials.get(group[branch.a], 0.0) - potentials.get(group[branch.b], 0.0)
    )
    memo: dict = state.cache.setdefault("one-load-values", {})  # type: ignore[assignment]
    inductance, tau = facts.inductance, facts.time_constant
    values_key = (
        id(inductance),
        id(tau),
        facts.type,
        facts.missing,
        current,
        voltage,
        power,
    )
    found = memo.get(values_key)
    if found is None or found[0] is not inductance or found[1] is not tau:
        found = memo[values_key] = (
            inductance,
            tau,
            *_one_load_values(facts, current, voltage, power),
        )
    q_current, q_voltage, energy, category, inductive = found[2:7]
    load = SwitchedLoad(
        facts,
        q_current,
        q_voltage,
        category,
        energy,
        inductive,
        load_suppressors(ctx, branch),
    )
    demanding, q_tau, t95, total, missing = found[7:]
    return Switched((load,), demanding, q_tau, t95, total, load.suppressors, missing)


def _one_load_values(
    facts: LoadFacts, current: float, voltage: float, power: bool
) -> tuple:
    """The values of ``switched_loads`` then ``_one_switched`` for one load."""
    energy = None
    if facts.inductance is not None:
        energy = quantity(0.5 * si(facts.inductance, "H") * current**2, "J")
    category = category_for(facts.type, power)
    tau = facts.time_constant if facts.time_constant is not None else quantity(0.0, "s")
    total = 0.0 + si(energy, "J") if energy is not None else 0.0
    return (
        quantity(current, "A"),
        quantity(voltage, "V"),
        energy,
        category,
        is_inductive(facts),
        most_demanding([category]),
        tau,
        quantity(T95_PER_TAU * si(tau, "s"), "s"),
        quantity(total, "J"),
        tuple(sorted(set(facts.missing))),
    )


def _rated_as_power_device(state: DomainState, component: Component) -> bool:
    """``rated_as_power_device``, once per merged values (one per pole before).

    It reads nothing but ``component.values``, and components of one part
    without inline overrides share that dict: 20 pushbuttons of one part are
    judged once. The memo holds each dict it is keyed on by identity, so no
    other dict can take its id while the state lives.
    """
    memo: dict = state.cache.setdefault("power-device", {})  # type: ignore[assignment]
    values = component.values
    found = memo.get(id(values))
    if found is None:
        found = memo[id(values)] = (values, rated_as_power_device(component))
    return found[1]  # type: ignore[no-any-return]


def is_power(state: DomainState, branch: Branch) -> bool:
    """Whether the element's loads need the power categories (a main pole)."""
    assert branch.element is not None
    return (
        branch.component.kind == "contactor" and len(branch.element.a) == 1
    ) or _rated_as_power_device(state, branch.component)
