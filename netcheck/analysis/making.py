"""Making (closing) current of a DC contact: capacitor inrush, lamps, motors.

The first-order model, inductance neglected (it only slows the rise and lowers
the peak): at the instant a contact closes, every capacitor of its domain still
holds the voltage it had with the contact open, so it acts as a voltage source;
the current through the contact at that instant is found by nodal analysis
(modified nodal analysis with ideal voltage sources; closed contacts and fuses
are 0 V sources). A capacitor charging from empty through a loop resistance R
draws its peak V/R at once and decays with tau = R·C, dissipating ½·C·V² in R
(first-order RC circuit, any circuit-theory text). Lamps and motors add their
cold-filament or starting multiple of the steady current on top.
"""

from __future__ import annotations

from dataclasses import dataclass

from netcheck.analysis.closing_net import R_IDEAL, R_LEAK, Net, network_ohms
from netcheck.analysis.domain import DomainState
from netcheck.analysis.elements import Analysis
from netcheck.analysis.switched import ElementAnalysis
from netcheck.graph import CONDUCTOR, LOAD, SUPPLY, SWITCH, Branch

__all__ = ["Inrush", "Charge", "closing_inrush", "R_IDEAL", "UNBOUNDED_LOOP"]

# A loop below UNBOUNDED_LOOP is "limited only by the wiring" (None), never a
# number (a supply with no r_int is given R_IDEAL, closing_net.py).
UNBOUNDED_LOOP = 1e-3
# A domain of up to this many branches is solved whole (one dense system per
# closing); a larger one is cut at its rails into blocks (``making_cut.py``),
# which gives the same currents at a cost that grows with the rung, not the
# domain (tests/analysis/test_making_cut.py holds the two equal).
DENSE_BRANCHES = 64


@dataclass(frozen=True)
class Charge:
    """One capacitor that changes voltage when the contact closes (SI floats)."""

    ref: str
    capacitance: float  # F
    step: float  # V: its voltage after closing minus before
    loop: float | None  # ohm: the resistance it charges through; None: wiring only


@dataclass(frozen=True)
class Inrush:
    """The making current of one element: the first instant, in amperes."""

    peak: float | None  # None: limited only by the wiring (no resistance in the loop)
    steady: float  # the closed-state current
    charges: tuple[Charge, ...]


def _network(
    state: DomainState,
    shut: frozenset[str],
    held: dict[str, float] | None,
    loads: bool = True,
) -> Net:
    """The domain with the switches in ``shut`` closed and the others open.

    ``held``: capacitors as sources at these voltages (None: open, as in DC);
    ``loads=False`` leaves the loads out (a drive draws nothing before its
    link is up). Every node leaks to the reference through 1 Tohm so that a
    capacitor cut off from the supply sits empty, as it does at power-up.
    """
    net = Net(state.supplies[0].b)
    for branch in state.domain.branches:
        key = branch.key
        net.resistor(branch.a, net.ground, R_LEAK)
        if branch.role == SUPPLY:
            emf = f"{branch.ref}:emf"
            net.source(emf, branch.b, state.emf[branch.ref], key)
            net.resistor(emf, branch.a, state.r_int[branch.ref] or R_IDEAL)
        elif branch.role == CONDUCTOR or (branch.role == SWITCH and key in shut):
            net.source(branch.a, branch.b, 0.0, key)
        elif branch.kind in ("capacitor", "rc"):
            if held is not None and branch.component.value("C") is not None:
                _held_capacitor(net, branch, held.get(key, 0.0))
        elif branch.role == LOAD and not loads:
            continue
        elif (ohms := network_ohms(state, branch)) is not None:
            net.resistor(branch.a, branch.b, ohms)
    return net


def _held_capacitor(net: Net, branch: Branch, volts: float) -> None:
    series = branch.component.value("R") if branch.kind == "rc" else None
    ohms = float(series.to("ohm").magnitude) if series is not None else 0.0
    middle = f"{branch.key}:c"
    net.source(middle, branch.b, volts, branch.key)
    net.resistor(branch.a, middle, max(ohms, R_IDEAL))


def _capacitors(state: DomainState) -> list[Branch]:
    return [
        b
        for b in state.domain.branches
        if b.kind in ("capacitor", "rc") and b.component.value("C") is not None
    ]


def _voltages(net: Net, caps: list[Branch]) -> dict[str, float]:
    potentials, _ = net.solve()
    return {c.key: potentials.get(c.a, 0.0) - potentials.get(c.b, 0.0) for c in caps}


def _closed_switches(state: DomainState) -> frozenset[str]:
    return frozenset(
        b.key
        for b in state.domain.branches
        if b.role == SWITCH and b.key not in state.opened
    )


def _cap_current(
    state: DomainState, shut: frozenset[str], held: dict, key: str
) -> float:
    return _network(state, shut, held, False).solve()[1].get(key, 0.0)


def _loop(
    state: DomainState, shut: frozenset[str], held: dict, key: str
) -> float | None:
    """The Thevenin resistance a capacitor sees (ohm): 1 V more, how much current."""
    first = _cap_current(state, shut, held, key)
    second = _cap_current(state, shut, {**held, key: held.get(key, 0.0) + 1.0}, key)
    change = abs(second - first)
    loop = 1.0 / change if change > 0 else None
    return loop if loop is not None and loop >= UNBOUNDED_LOOP else None


@dataclass(frozen=True)
class _Scenario:
    shut: frozenset[str]  # switches closed once the element has closed
    before: dict[str, float]  # capacitor voltages just before
    after: dict[str, float]  # and once settled (loads off)


def _scenario(state, shut, name, caps) -> _Scenario:  # type: ignore[no-untyped-def]
    before = _voltages(_network(state, shut - {name}, None, False), caps)
    return _Scenario(shut, before, _voltages(_network(state, shut, None, False), caps))


def _charges(
    state: DomainState, scenario: _Scenario, caps: list[Branch]
) -> list[Charge]:
    out = []
    scale = max((abs(v) for v in state.emf.values()), default=1.0)
    for cap in caps:
        step = scenario.after[cap.key] - scenario.before[cap.key]
        if abs(step) < 1e-3 * max(scale, 1.0):
            continue  # unchanged (the leak resistors leave millivolts)
        loop = _loop(state, scenario.shut, scenario.after, cap.key)
        capacitance = float(cap.component.value("C").to("F").magnitude)
        out.append(Charge(cap.ref, capacitance, step, loop))
    return out


def _precharged(state, usual: _Scenario, own: list[Charge], name: str) -> bool:  # type: ignore[no-untyped-def]
    """Whether a slower path (higher loop resistance) charges what ``name`` would."""
    opened = usual.shut - {name}
    for charge in own:
        key = next(b.key for b in state.domain.branches if b.ref == charge.ref)
        full = usual.after[key]
        if abs(full - usual.before[key]) > 0.05 * max(abs(full), 1.0):
            return False
        slow = _loop(state, opened, usual.before, key)
        if slow is None or (charge.loop is not None and slow <= charge.loop):
            return False
    return True


def _peak(state: DomainState, scenario: _Scenario, name: str) -> float:
    return abs(
        _network(state, scenario.shut, scenario.before).solve()[1].get(name, 0.0)
    )


def closing_inrush(analysis: Analysis, element: ElementAnalysis) -> Inrush | None:
    """The current through ``element`` at the instant it closes (A), or None.

    Two closings are judged, loads drawing nothing before: with every other
    switching element closed as in service, and at power-up with only the
    element's own series path closed (capacitors empty). The power-up one is
    left out where a slower path (a precharge resistor: higher loop resistance
    than the element's own) has already charged each capacitor the element
    would charge.
    """
    state = analysis.states.get(element.domain or "")
    if state is None or not state.supplies or element.name in state.opened:
        return None
    if len(state.domain.branches) > DENSE_BRANCHES:
        # Imported here: making_cut builds on this module's results.
        from netcheck.analysis.closing_net import blocks_of
        from netcheck.analysis.making_cut import cut_inrush

        blocks = blocks_of(state)
        if blocks.regular:
            return cut_inrush(blocks, element)
    caps, name = _capacitors(state), element.name
    shut = _closed_switches(state)
    series = {name, *element.series_elements, *element.other_series}
    usual = _scenario(state, shut, name, caps)
    power_up = _scenario(state, frozenset(s for s in shut if s in series), name, caps)
    own = _charges(state, power_up, caps)
    chosen = usual if not own or _precharged(state, usual, own, name) else power_up
    charges = own if chosen is power_up else _charges(state, usual, caps)
    steady = abs(_network(state, shut, None).solve()[1].get(name, 0.0))
    if any(c.loop is None for c in charges):
        return Inrush(None, steady, tuple(charges))
    return Inrush(_peak(state, chosen, name), steady, tuple(charges))
