"""The five suppression options of ``netcheck size``: transient, ratings, notes."""

from __future__ import annotations

from netcheck.analysis.snubber import (
    capacitance_for_peak,
    capacitance_for_slew,
    common_practice_rc,
)
from netcheck.analysis.transients import ACROSS_ELEMENT, OpeningTransient
from netcheck.sizing.circuit import Circuit
from netcheck.sizing.results import Rating, SizeOption, rating
from netcheck.units import Q_, Quantity, format_quantity

__all__ = ["OPTIONS"]

_REFERENCE = Q_(1, "mA")  # the varistor voltage is specified at 1 mA
_AT_OPENING = "coil current at opening"


def _option(
    kind: str, transient: OpeningTransient, ratings: list[Rating], notes: list[str]
) -> SizeOption:
    """Assemble an option from its transient, ratings and notes."""
    notes = notes + list(transient.assumptions)
    if transient.conducts_continuously:
        notes.append("the suppressor conducts continuously: its energy is unbounded")
    return SizeOption(
        kind,
        transient.peak_voltage,
        transient.release_time,
        transient.suppressor_energy,
        tuple(ratings),
        tuple(notes),
    )


def _diode_ratings(c: Circuit) -> list[Rating]:
    return [
        c.margin("reverse_voltage", "diode-reverse-voltage", c.voltage, "supply"),
        c.margin("forward_current", "diode-current", c.current, "coil current"),
    ]


def _diode(c: Circuit) -> SizeOption:
    transient = c.transient("diode", forward_voltage=c.vf)
    return _option("diode", transient, _diode_ratings(c), [])


def _diode_zener(c: Circuit) -> SizeOption:
    transient = c.transient("diode-zener", forward_voltage=c.vf, clamp_voltage=c.clamp)
    zener_energy = c.clamp * transient.suppressor_charge  # the zener's share Vz·Q
    ratings = _diode_ratings(c) + [
        rating("zener_voltage", c.clamp, "=", "the clamp asked for"),
        rating("zener_current", c.current, ">=", _AT_OPENING),
        c.margin("zener_energy", "zener-energy", zener_energy, "Vz × charge"),
    ]
    return _option("diode-zener", transient, ratings, [])


def _varistor_notes(c: Circuit, needed: Quantity) -> list[str]:
    """Say how the varistor is modelled and whether its clamp suits the supply."""
    ratio = float((_REFERENCE / c.current).to("").magnitude)
    implied = c.clamp * ratio ** (1 / c.exponent)  # its V_1mA by the power law
    notes = [
        f"modelled as I = I0·(V/{format_quantity(c.clamp)})^{c.exponent:g} "
        "(clamp voltage at the coil current)"
    ]
    if implied < needed:
        least = needed / ratio ** (1 / c.exponent)
        notes.append(
            f"a varistor clamping at {format_quantity(c.clamp)} at "
            f"{format_quantity(c.current)} has V_1mA ≈ {format_quantity(implied)}, "
            f"below the {format_quantity(needed)} this supply needs: it would conduct "
            f"in normal operation; choose a clamp of at least {format_quantity(least)}"
        )
    return notes


def _varistor(c: Circuit) -> SizeOption:
    transient = c.transient("varistor", clamp_voltage=c.clamp, exponent=c.exponent)
    energy = transient.suppressor_energy
    ratings = [
        c.margin("varistor_voltage", "varistor-voltage", c.voltage, "supply"),
        c.margin(
            "continuous_voltage",
            "varistor-continuous-voltage",
            c.voltage,
            "supply",
        ),
        rating("clamp_voltage", c.clamp, "<=", "at the coil current"),
        rating("peak_current", c.current, ">=", _AT_OPENING),
        c.margin("energy", "varistor-energy", energy, "clamp energy"),
    ]
    notes = _varistor_notes(c, ratings[0].value)
    return _option("varistor", transient, ratings, notes)


def _tvs(c: Circuit) -> SizeOption:
    transient = c.transient("tvs", clamp_voltage=c.clamp)
    standoff = c.margin("standoff_voltage", "tvs-standoff", c.voltage, "supply")
    notes = [
        "a bidirectional TVS: a unidirectional one across the coil conducts "
        "forward at opening, like a plain diode"
    ]
    if c.clamp <= standoff.value:
        notes.append(
            f"the stand-off must be at least {format_quantity(standoff.value)}, so "
            f"the clamp lies above it; the {format_quantity(c.clamp)} asked for "
            "cannot be met: choose a higher clamp"
        )
    ratings = [
        standoff,
        rating("clamp_voltage", c.clamp, "<=", "at the coil current"),
        rating("peak_pulse_current", c.current, ">=", _AT_OPENING),
        c.margin("energy", "tvs-energy", transient.suppressor_energy, "clamp energy"),
    ]
    return _option("tvs", transient, ratings, notes)


def _rc_capacitance(c: Circuit, notes: list[str]) -> Quantity:
    """Return the larger of the peak-limit and dv/dt capacitances."""
    for_peak = capacitance_for_peak(c.inductance, c.current, c.peak_limit, c.voltage)
    for_slew = capacitance_for_slew(c.current)
    if for_peak is None:
        notes.append(
            f"a {format_quantity(c.peak_limit)} peak is out of reach: with "
            "an RC the undamped contact peak exceeds twice the supply"
        )
        return for_slew
    return max(for_peak, for_slew)


def _rc(c: Circuit) -> SizeOption:
    notes = [
        f"C = larger of the energy balance for a {format_quantity(c.peak_limit)} "
        "contact peak and dv/dt <= 1 V/µs; R = supply / closing surge "
        f"({format_quantity(c.surge)}), at most the coil resistance"
    ]
    capacitance = _rc_capacitance(c, notes)
    lowest = (c.voltage / c.surge).to("ohm")  # limits the discharge at closing
    if lowest > c.resistance:
        notes.append(
            f"R bounds conflict: supply/surge = {format_quantity(lowest)} "
            "exceeds the coil resistance; the coil resistance is used"
        )
    resistance = min(lowest, c.resistance)
    transient = c.transient(
        "rc",
        placement=ACROSS_ELEMENT,
        capacitance=capacitance,
        suppressor_resistance=resistance,
    )
    rule_c, rule_r = common_practice_rc(c.voltage, c.current)
    peak_c = transient.suppressor_peak_voltage
    ratings = [
        rating("capacitance", capacitance, "=", "energy balance / dv/dt"),
        rating("resistance", resistance, "=", "lower bound"),
        c.margin("capacitor_voltage", "capacitor-voltage", peak_c, "peak voltage"),
        rating("resistance_min", lowest, ">=", "supply / closing surge current"),
        rating("resistance_max", c.resistance, "<=", "coil resistance"),
        rating("common_practice_capacitance", rule_c, "=", "I²/10 µF"),
    ]
    if rule_r is not None:
        ratings.append(
            rating("common_practice_resistance", rule_r, "=", "E/(10·I^(1+50/E))")
        )
    else:
        notes.append("the I²/10 rule's R is out of its range at this voltage")
    notes.append("the I²/10 values are common practice (power form), not used here")
    return _option("rc", transient, ratings, notes)


# In the order of the spec.
OPTIONS = (_diode, _diode_zener, _varistor, _tvs, _rc)
