"""RC contact-protection (snubber) rules: physics limits and the common-practice rule.

Quantities in, quantities out. Sources are named beside each rule; the "I²/10" rule
is common practice with no published validation, and has two algebraic readings.
"""

from __future__ import annotations

import math

from netcheck.units import Q_, Quantity

__all__ = [
    "PEAK_LIMIT",
    "SLEW_LIMIT",
    "common_practice_rc",
    "common_practice_rc_product",
    "capacitance_for_peak",
    "capacitance_for_slew",
]

# Keep the contact voltage below about 300 V (RC-network data sheet; the ~300 V
# Paschen minimum of air is where a glow can re-strike across the open gap).
PEAK_LIMIT = Q_(300, "V")
# dv/dt <= 1 V/µs "to prevent arcing as the gap opens" (same data sheet).
SLEW_LIMIT = Q_(1, "V/us")


def _number(value: Quantity, unit: str) -> float:
    return float(value.to(unit).magnitude)


def common_practice_rc(
    voltage: Quantity, current: Quantity
) -> tuple[Quantity, Quantity | None]:
    """Return the "I²/10" rule, power form: C = I²/10 µF, R = E/(10·I^(1+50/E)).

    Common practice: an empirical rule in A and V, printed in a film-capacitor
    catalogue and attributed to a 1960s transient-suppression guide. The power form
    is the formula as printed there; ``common_practice_rc_product`` is the other one.
    R is None where the power form leaves floating point (a few volts or less, or
    tens of amperes: far outside the range the rule was drawn for).
    """
    e, i = _number(voltage, "V"), _number(current, "A")
    try:
        resistance = e / (10 * i ** (1 + 50 / e))
    except (ZeroDivisionError, OverflowError):
        resistance = math.inf
    usable = math.isfinite(resistance) and resistance > 0
    return Q_(i * i / 10, "uF").to("F"), Q_(resistance, "ohm") if usable else None


def common_practice_rc_product(
    voltage: Quantity, current: Quantity
) -> tuple[Quantity, Quantity]:
    """Return the rule's other reading, R = E/(10·I·(1 + 50/E)) (product form)."""
    e, i = _number(voltage, "V"), _number(current, "A")
    return Q_(i * i / 10, "uF").to("F"), Q_(e / (10 * i * (1 + 50 / e)), "ohm")


def capacitance_for_peak(
    inductance: Quantity,
    current: Quantity,
    peak_limit: Quantity = PEAK_LIMIT,
    supply: Quantity | None = None,
) -> Quantity | None:
    """Return the smallest C that keeps the undamped contact peak at ``peak_limit``.

    Energy balance ½·L·I² <= ½·C·V² gives C >= L·(I/Vmax)² (RC-network data sheet).
    With a supply Vs in the loop and the capacitor ending charged to Vs, the exact
    undamped peak Vs + √(Vs² + I²·L/C) (energy conservation) gives
    C >= L·I²/((Vmax - Vs)² - Vs²). None if Vmax <= 2·Vs (out of reach).
    """
    vs = 0.0 if supply is None else _number(supply, "V")
    swing = (_number(peak_limit, "V") - vs) ** 2 - vs**2
    if swing <= 0:
        return None
    return Q_(_number(inductance, "H") * _number(current, "A") ** 2 / swing, "F")


def capacitance_for_slew(current: Quantity, slew: Quantity = SLEW_LIMIT) -> Quantity:
    """Return C >= I/(dv/dt): the initial slope is I/C (1 V/µs: 1 µF per ampere)."""
    return (current / slew).to("F")
