"""The suppressors fitted to DC circuits, and what each one sees at opening.

Computed once per design (the check context memoises it) and shared by the
suppressor rules: which suppressors act at opening, the transient each one
takes, and the largest voltage each part sees in normal service.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import pint

from netcheck.analysis.elements import Analysis
from netcheck.analysis.opening import element_transient, load_transient
from netcheck.analysis.switched import ElementAnalysis, Suppressor, SwitchedLoad
from netcheck.analysis.transients import OpeningTransient
from netcheck.model import Component
from netcheck.units import Q_

__all__ = [
    "Fitted",
    "effective",
    "unsuppressed_loads",
    "fitted_suppressors",
    "element_peak",
    "service_voltages",
    "standing_voltage",
]


@dataclass(frozen=True)
class Fitted:
    """A suppressor as fitted: where, across what, and its transient at opening."""

    suppressor: Suppressor
    voltage: pint.Quantity  # across it in normal operation (or across the open element)
    current: pint.Quantity  # the load current it takes over at opening
    opening: OpeningTransient | None
    about: str  # the load or element it protects

    def parts(self) -> list[Component]:
        """The components of the suppressor's chain."""
        chain = self.suppressor.chain
        return [b.component for b in chain.branches] if chain is not None else []


def effective(suppressors: tuple[Suppressor, ...]) -> tuple[Suppressor, ...]:
    """Suppressors that act at opening: not conducting in normal operation."""
    return tuple([s for s in suppressors if not s.conducts and s.functional])


def _acts(suppressors: tuple[Suppressor, ...]) -> bool:
    """``bool(effective(suppressors))``, without building the tuple."""
    for s in suppressors:
        if not s.conducts and s.functional:
            return True
    return False


def unsuppressed_loads(element: ElementAnalysis) -> list[SwitchedLoad]:
    """Inductive loads with nothing across them, nothing built in, nothing across E.

    ``element.inductive_loads`` and ``effective`` asked as yes/no, inline
    (the rules ask this of every DC element); tests/test_check_shortcuts.py
    compares it with the function as first written.
    """
    for s in element.suppression:
        if s.placement == "across-element" and not s.conducts and s.functional:
            return []
    return [ld for ld in element.loads if ld.inductive and not _acts(ld.suppressors)]


def fitted_suppressors(analysis: Analysis) -> list[Fitted]:
    """Every effective suppressor of a DC element's circuit, once each, by refs."""
    out: dict[tuple[str, ...], Fitted] = {}
    for element in analysis.sorted_elements():
        if element.supply != "dc" or element.voltage is None:
            continue
        for load in element.loads:  # element.inductive_loads, without the tuple
            if not load.inductive:
                continue
            for s in effective(load.suppressors):
                if s.placement != "built-in" and s.refs not in out:
                    opening = load_transient(load, element.voltage, s)
                    out[s.refs] = Fitted(
                        s, load.voltage, load.current, opening, load.facts.ref
                    )
        for s in effective(element.suppression):
            if s.placement == "across-element" and s.refs not in out:
                current = sum((ld.current for ld in element.loads), Q_(0.0, "A"))
                opening = _with_load_clamp(element, element_transient(element, s))
                out[s.refs] = Fitted(s, element.voltage, current, opening, element.name)
    return [out[k] for k in sorted(out)]


def _load_clamp(element: ElementAnalysis) -> OpeningTransient | None:
    """The opening as the loads' own clamps shape it, if every inductive load has one.

    A freewheel diode (or zener, TVS, varistor) across the load takes the load's
    current at opening; the element then sees the supply plus that clamp (KVL)
    and a snubber across the element no longer rings with the load.
    """
    loads = element.inductive_loads
    clamps = [
        s
        for ld in loads
        for s in effective(ld.suppressors)
        if s.placement != "built-in" and s.kind not in ("rc", "capacitor")
    ]
    if not loads or len(clamps) < len(loads):
        return None
    peaks = [element_transient(element, s) for s in clamps]
    known = [p for p in peaks if p is not None]
    return max(known, key=lambda p: p.peak_voltage) if known else None


def _with_load_clamp(
    element: ElementAnalysis, own: OpeningTransient | None
) -> OpeningTransient | None:
    """An across-element snubber's stress when the loads clamp themselves first."""
    clamped = _load_clamp(element)
    if clamped is None or (
        own is not None and own.peak_voltage <= clamped.peak_voltage
    ):
        return own
    return replace(
        clamped,
        suppressor_energy=Q_(0.0, "J"),
        suppressor_peak_voltage=clamped.peak_voltage,
    )


def element_peak(element: ElementAnalysis) -> OpeningTransient | None:
    """The opening transient the switching element itself sees."""
    across = [
        s
        for s in element.suppression
        if s.placement == "across-element" and s.functional and not s.conducts
    ]
    if across:
        return _with_load_clamp(element, element_transient(element, across[0]))
    loads = element.inductive_loads
    active = effective(loads[0].suppressors) if len(loads) == 1 else ()
    if active:
        s = active[0]
        if s.placement != "built-in":
            return element_transient(element, s)
        return None
    return element_transient(element, None)


def service_voltages(fitted: list[Fitted]) -> dict[str, pint.Quantity]:
    """The largest fitted voltage on each suppressor part, by reference."""
    worst: dict[str, pint.Quantity] = {}
    for one in fitted:
        for ref in one.suppressor.refs:
            if ref not in worst or one.voltage > worst[ref]:
                worst[ref] = one.voltage
    return worst


def standing_voltage(analysis: Analysis, component: Component) -> pint.Quantity | None:
    """The voltage across a two-terminal part in the solved closed state, if any."""
    if len(component.connections) != 2:
        return None
    a, b = (c.net for c in component.connections)
    domain = analysis.graph.domain_of.get(a)
    state = analysis.states.get(domain.name) if domain is not None else None
    if state is None or a not in state.group or b not in state.group:
        return None
    return Q_(abs(state.net_potential(a) - state.net_potential(b)), "V")
