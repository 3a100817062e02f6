"""The inductance a switching element itself breaks, after the loads' own suppressors.

A rating's L/R (or T0.95) test condition describes the inductance in series with
the breaking contact. A suppressor across a load (freewheel diode, diode + zener,
TVS, varistor, RC, resistor, or one built in) takes that load's current when the
element opens: the load's inductance then circulates in the suppressor's own
loop, and the contact breaks the supply with no inductance of that load in
series; it sees Vs plus the clamp voltage (KVL; domain-facts §9 "peak voltages
across the opening switch", §10 "clamp across the load ... supply
disconnected"). A suppressor across the element does not do this: the load's
inductance stays in series with the contact, the supply keeps driving the
decaying L/R current through the contact's parallel path while the gap holds the
clamp voltage for tau·ln(1 + R·I0/(Vc - Vs)) (domain-facts §10, clamp across the
switch), and a restrike puts that current back on the contact.
"""

from __future__ import annotations

import pint

from netcheck.analysis.fitted import effective
from netcheck.analysis.switched import ElementAnalysis, SwitchedLoad
from netcheck.units import Q_

__all__ = ["takes_energy_off_contact", "contact_time_constant"]


def takes_energy_off_contact(load: SwitchedLoad) -> bool:
    """Whether an effective suppressor across the load (or built in) takes it over."""
    return any(s.placement != "across-element" for s in effective(load.suppressors))


def contact_time_constant(element: ElementAnalysis) -> pint.Quantity | None:
    """The largest L/R of the loads whose inductance stays in series with the element.

    Loads of unknown L/R are left out, as ``ElementAnalysis.time_constant`` does;
    0 s when every load is resistive or suppressed across itself; None when the
    element's own time constant is unknown.
    """
    if element.time_constant is None:
        return None
    taus = [
        ld.facts.time_constant
        for ld in element.loads
        if ld.facts.time_constant is not None and not takes_energy_off_contact(ld)
    ]
    return max(taus) if taus else Q_(0.0, "s")
