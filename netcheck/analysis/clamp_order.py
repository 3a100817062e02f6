"""Two clamps in one loop: an external suppressor above an output's own clamp.

A semiconductor output with a built-in clamp (``clamp_voltage``) limits the
voltage across itself to that clamp. An external suppressor helps only if it
conducts first: a clamp across the load holds the output at
Vs + Vclamp + Vf (KVL at the instant of opening), a clamp across the output at
its own clamp voltage. Where that voltage reaches the internal clamp's, the
internal clamp conducts at its lower voltage and the external one, seeing less
than its clamp voltage, carries nothing: the internal clamp absorbs the whole
energy, ½·L·I0²·Vc/(Vc − Vs) for a clamp across the switch with the supply in
the loop (domain-facts §10). A fix must therefore clamp below the internal
clamp (or use a plain diode), never merely "lower" the external clamp to a
voltage that is still above it.
"""

from __future__ import annotations

from dataclasses import dataclass

import pint

from netcheck.analysis.constants import SILICON_RECTIFIER_VF
from netcheck.analysis.fitted import effective, element_peak
from netcheck.analysis.opening import element_transient
from netcheck.analysis.switched import ElementAnalysis, Suppressor
from netcheck.kinds import SEMICONDUCTOR_KINDS
from netcheck.units import Q_

__all__ = [
    "InternalClamp",
    "internal_clamp_takes",
    "ZENER_TOLERANCE",
    "external_suppressors",
    "zener_below",
]

# Zener voltages are commonly specified at +-5 % (common practice, E24 series
# zeners); a proposed zener sits at least this far below its limit.
ZENER_TOLERANCE = 0.05


@dataclass(frozen=True)
class InternalClamp:
    """An output whose built-in clamp takes the energy an external clamp was for."""

    element: ElementAnalysis
    voltage: pint.Quantity  # the internal clamp voltage
    external_peak: pint.Quantity  # what the external suppression alone would give
    energy: pint.Quantity | None  # what the internal clamp absorbs at opening
    rating: pint.Quantity | None  # its clamp_energy, if given
    external: tuple[Suppressor, ...]  # the external suppressors bypassed

    @property
    def zener_limit(self) -> pint.Quantity | None:
        """The highest zener voltage across the load that still conducts first.

        Vs + Vz + Vf must stay below the internal clamp; None where no zener
        across the load can (the supply alone is at or above it).
        """
        return _room(self.element, self.voltage)

    @property
    def overloaded(self) -> bool:
        """Whether the internal clamp's rating is unknown or below its energy."""
        return self.rating is None or (
            self.energy is not None and self.energy > self.rating
        )


def _room(element: ElementAnalysis, limit: pint.Quantity) -> pint.Quantity | None:
    supply = element.voltage
    if supply is None:
        return None
    room = limit - supply - Q_(SILICON_RECTIFIER_VF, "V")
    return room if room.magnitude > 0 else None


def zener_below(element: ElementAnalysis, limit: pint.Quantity) -> pint.Quantity | None:
    """The highest zener voltage that keeps the element below ``limit``.

    A diode + zener across the load holds the element at Vs + Vz + Vf (KVL);
    Vz is at most the room left over 1 + ZENER_TOLERANCE. None where none fits.
    """
    room = _room(element, limit)
    return room / (1 + ZENER_TOLERANCE) if room is not None else None


def external_suppressors(element: ElementAnalysis) -> tuple[Suppressor, ...]:
    """The suppressors that shape the element's opening (across it, else the loads')."""
    return _external(element)


def _external(element: ElementAnalysis) -> tuple[Suppressor, ...]:
    across = tuple(
        s
        for s in element.suppression
        if s.placement == "across-element" and s.functional and not s.conducts
    )
    if across:
        return across
    return tuple(
        s
        for load in element.inductive_loads
        for s in effective(load.suppressors)
        if s.placement != "built-in"
    )


def internal_clamp_takes(element: ElementAnalysis) -> InternalClamp | None:
    """The output's internal clamp, where it conducts before the external one.

    None for a mechanical contact, an output with no clamp voltage, no
    external suppressor, or an external one that holds the output below the
    internal clamp (then the external suppressor takes the energy).
    """
    component = element.component
    clamp = component.value("clamp_voltage")
    if component.kind not in SEMICONDUCTOR_KINDS or clamp is None:
        return None
    external = _external(element)
    opening = element_peak(element)
    if not external or opening is None or opening.kind == "none":
        return None
    if opening.peak_voltage < clamp:
        return None
    internal = element_transient(element, None)  # the internal clamp alone
    energy = internal.suppressor_energy if internal is not None else element.energy
    return InternalClamp(
        element,
        clamp.to("V"),
        opening.peak_voltage,
        energy,
        component.value("clamp_energy"),
        external,
    )
