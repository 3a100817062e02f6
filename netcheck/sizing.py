"""Suppression sizing for one inductive DC load: what each option does and what to buy.

Quantities in, quantities out. Each option is simulated with ``analysis.transients``;
ratings apply the margins of ``DEFAULT_MARGINS`` (overridable, e.g. from the config).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

from netcheck.analysis.snubber import (
    PEAK_LIMIT,
    capacitance_for_peak,
    capacitance_for_slew,
    common_practice_rc,
)
from netcheck.analysis.transients import (
    ACROSS_ELEMENT,
    FORWARD_VOLTAGE,
    RELEASE_FRACTION,
    VARISTOR_EXPONENT,
    OpeningTransient,
    opening_transient,
)
from netcheck.errors import ConfigError, QuantityError
from netcheck.units import Q_, Quantity, format_quantity

__all__ = [
    "DEFAULT_MARGINS",
    "DEFAULT_FORWARD_VOLTAGE",
    "VARISTOR_EXPONENT",
    "Rating",
    "SizeOption",
    "LoadSummary",
    "SizeResult",
    "size_load",
    "SI_UNITS",
    "si_unit",
]

# Multipliers applied to what the circuit needs, each with its source:
DEFAULT_MARGINS: dict[str, float] = {
    # Freewheel-diode PIV as a multiple of the circuit voltage: the conservative
    # relay-maker rule ">= 10 x circuit voltage" (relay contact protection appendix
    # of a data-acquisition manual); electronics practice uses 2-3 x.
    "diode-reverse-voltage": 10.0,
    # Diode forward current >= coil current (same source).
    "diode-current": 1.0,
    # Varistor V_1mA >= 1.2/(0.85 x 0.9) x Vdc: supply fluctuation 1.2, varistor
    # tolerance 0.85, ageing 0.9 (varistor selection rule of thumb).
    "varistor-voltage": 1.2 / (0.85 * 0.9),
    # Energy and capacitor-voltage headroom: common practice, no source on our sheet.
    "varistor-energy": 1.5,
    "tvs-energy": 1.5,
    "zener-energy": 1.5,
    "capacitor-voltage": 1.5,
    # TVS stand-off >= supply, so it does not conduct in normal operation (physics).
    "tvs-standoff": 1.0,
}
# Supply-fluctuation factor of the varistor rule above, for its continuous voltage.
SUPPLY_FLUCTUATION = 1.2
_REFERENCE = Q_(1, "mA")  # the varistor voltage is specified at 1 mA
# Diode forward drop (spec default for netcheck size --vf).
DEFAULT_FORWARD_VOLTAGE = Q_(FORWARD_VOLTAGE, "V")
SI_UNITS = ("V", "A", "s", "J", "ohm", "F")
_AT_OPENING = "coil current at opening"


@dataclass(frozen=True)
class Rating:
    """One rating to buy: ``name`` (JSON key), value, relation (>=, = or <=), basis."""

    name: str
    value: Quantity
    relation: str
    basis: str


@dataclass(frozen=True)
class SizeOption:
    """One way to suppress the load and its effect at opening."""

    kind: str
    peak_voltage: Quantity  # V across the opening contact
    release_time: Quantity  # s until the load current falls to the release current
    clamp_energy: Quantity  # J absorbed by the suppressor itself
    components: tuple[Rating, ...]
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class LoadSummary:
    """The load as sized: supply, coil and what it stores."""

    voltage: Quantity
    resistance: Quantity
    inductance: Quantity
    current: Quantity  # V/R
    time_constant: Quantity  # L/R
    energy: Quantity  # ½·L·I²
    release_current: Quantity


@dataclass(frozen=True)
class SizeResult:
    """The load and its suppression options, in the order of the spec."""

    load: LoadSummary
    options: tuple[SizeOption, ...]
    margins: tuple[tuple[str, float], ...]


def _number(value: Quantity, unit: str) -> float:
    return float(value.to(unit).magnitude)


def _require(name: str, value: Quantity, unit: str, *, zero_ok: bool = False) -> float:
    """SI magnitude of an input, or a QuantityError naming it."""
    try:
        number = _number(value, unit)
    except Exception as error:  # pint's DimensionalityError and friends
        raise QuantityError(f"{name} must be in {unit}, got {value}") from error
    if not math.isfinite(number) or number < 0 or (number == 0 and not zero_ok):
        bound = "zero or more" if zero_ok else "positive"
        raise QuantityError(f"{name} must be {bound}, got {format_quantity(value)}")
    return number


def _margins(overrides: Mapping[str, float] | None) -> dict[str, float]:
    """Defaults updated by ``overrides``; unknown names are configuration errors."""
    merged = dict(DEFAULT_MARGINS)
    for name, value in (overrides or {}).items():
        if name not in DEFAULT_MARGINS:
            known = ", ".join(DEFAULT_MARGINS)
            raise ConfigError(f"unknown margin {name!r} (known: {known})")
        if not isinstance(value, int | float) or not (0 < value < math.inf):
            raise ConfigError(f"margin {name!r} must be a positive number")
        merged[name] = float(value)
    return merged


@dataclass(frozen=True)
class _Circuit:
    """The validated inputs of one sizing run."""

    voltage: Quantity
    resistance: Quantity
    inductance: Quantity
    current: Quantity
    release: Quantity
    clamp: Quantity
    vf: Quantity
    margins: Mapping[str, float]
    peak_limit: Quantity
    surge: Quantity
    exponent: float

    def transient(self, kind: str, **parameters: Any) -> OpeningTransient:
        """Return the opening transient with one suppression arrangement."""
        return opening_transient(
            self.voltage,
            self.resistance,
            self.inductance,
            kind,
            release_current=self.release,
            **parameters,
        )

    def summary(self) -> LoadSummary:
        """Return the load as reported: current V/R, time constant L/R, ½·L·I²."""
        return LoadSummary(
            self.voltage,
            self.resistance,
            self.inductance,
            self.current,
            (self.inductance / self.resistance).to("s"),
            (0.5 * self.inductance * self.current**2).to("J"),
            self.release,
        )

    def margin(self, key: str, margin: str, needed: Quantity, what: str) -> Rating:
        """Return the rating ``key`` >= margin × needed, naming the margin."""
        factor = self.margins[margin]
        basis = f"{factor:.4g} × {what} (margin {margin})"
        return _rating(key, factor * needed, ">=", basis)


def si_unit(value: Quantity) -> str:
    """Return the SI unit of a value's dimension, one of V, A, s, J, ohm, F."""
    for unit in SI_UNITS:
        if value.dimensionality == Q_(1, unit).dimensionality:
            return unit
    raise ValueError(f"no SI unit for {value}")


def _rating(name: str, value: Quantity, relation: str, basis: str) -> Rating:
    """Return a Rating with its value in the SI unit of its dimension."""
    return Rating(name, value.to(si_unit(value)), relation, basis)


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


def _diode_ratings(c: _Circuit) -> list[Rating]:
    return [
        c.margin("reverse_voltage", "diode-reverse-voltage", c.voltage, "supply"),
        c.margin("forward_current", "diode-current", c.current, "coil current"),
    ]


def _diode(c: _Circuit) -> SizeOption:
    transient = c.transient("diode", forward_voltage=c.vf)
    return _option("diode", transient, _diode_ratings(c), [])


def _diode_zener(c: _Circuit) -> SizeOption:
    transient = c.transient("diode-zener", forward_voltage=c.vf, clamp_voltage=c.clamp)
    zener_energy = c.clamp * transient.suppressor_charge  # the zener's share Vz·Q
    ratings = _diode_ratings(c) + [
        _rating("zener_voltage", c.clamp, "=", "the clamp asked for"),
        _rating("zener_current", c.current, ">=", _AT_OPENING),
        c.margin("zener_energy", "zener-energy", zener_energy, "Vz × charge"),
    ]
    return _option("diode-zener", transient, ratings, [])


def _varistor_notes(c: _Circuit, needed: Quantity) -> list[str]:
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


def _varistor(c: _Circuit) -> SizeOption:
    transient = c.transient("varistor", clamp_voltage=c.clamp, exponent=c.exponent)
    energy = transient.suppressor_energy
    ratings = [
        c.margin("varistor_voltage", "varistor-voltage", c.voltage, "supply"),
        _rating(
            "continuous_voltage",
            SUPPLY_FLUCTUATION * c.voltage,
            ">=",
            f"{SUPPLY_FLUCTUATION:g} × supply (supply fluctuation)",
        ),
        _rating("clamp_voltage", c.clamp, "<=", "at the coil current"),
        _rating("peak_current", c.current, ">=", _AT_OPENING),
        c.margin("energy", "varistor-energy", energy, "clamp energy"),
    ]
    notes = _varistor_notes(c, ratings[0].value)
    return _option("varistor", transient, ratings, notes)


def _tvs(c: _Circuit) -> SizeOption:
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
        _rating("clamp_voltage", c.clamp, "<=", "at the coil current"),
        _rating("peak_pulse_current", c.current, ">=", _AT_OPENING),
        c.margin("energy", "tvs-energy", transient.suppressor_energy, "clamp energy"),
    ]
    return _option("tvs", transient, ratings, notes)


def _rc_capacitance(c: _Circuit, notes: list[str]) -> Quantity:
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


def _rc(c: _Circuit) -> SizeOption:
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
        _rating("capacitance", capacitance, "=", "energy balance / dv/dt"),
        _rating("resistance", resistance, "=", "lower bound"),
        c.margin("capacitor_voltage", "capacitor-voltage", peak_c, "peak voltage"),
        _rating("resistance_min", lowest, ">=", "supply / closing surge current"),
        _rating("resistance_max", c.resistance, "<=", "coil resistance"),
        _rating("common_practice_capacitance", rule_c, "=", "I²/10 µF"),
        _rating("common_practice_resistance", rule_r, "=", "E/(10·I^(1+50/E))"),
    ]
    notes.append("the I²/10 values are common practice (power form), not used here")
    return _option("rc", transient, ratings, notes)


def size_load(
    voltage: Quantity,
    resistance: Quantity,
    inductance: Quantity,
    release_current: Quantity | None = None,
    clamp: Quantity | None = None,
    vf: Quantity = DEFAULT_FORWARD_VOLTAGE,
    margins: Mapping[str, float] | None = None,
    *,
    peak_limit: Quantity = PEAK_LIMIT,
    surge_current: Quantity | None = None,
    exponent: float = VARISTOR_EXPONENT,
) -> SizeResult:
    """Size diode, diode-zener, varistor, TVS (across the load) and RC (across contact).

    ``clamp`` (zener/varistor/TVS clamp voltage) defaults to the supply voltage, the
    release current to 10 % of the steady current V/R, the closing surge current that
    bounds the RC's R to the steady current. Raises QuantityError or ConfigError.
    """
    circuit = _circuit(
        voltage,
        resistance,
        inductance,
        release_current,
        clamp,
        vf,
        margins,
        peak_limit,
        surge_current,
        exponent,
    )
    options = tuple(
        build(circuit) for build in (_diode, _diode_zener, _varistor, _tvs, _rc)
    )
    return SizeResult(circuit.summary(), options, tuple(circuit.margins.items()))


def _circuit(
    voltage: Quantity,
    resistance: Quantity,
    inductance: Quantity,
    release_current: Quantity | None,
    clamp: Quantity | None,
    vf: Quantity,
    margins: Mapping[str, float] | None,
    peak_limit: Quantity,
    surge_current: Quantity | None,
    exponent: float,
) -> _Circuit:
    """Check the inputs and fill in the defaults."""
    v = _require("voltage", voltage, "V")
    current = Q_(v / _require("resistance", resistance, "ohm"), "A")
    _require("inductance", inductance, "H")
    release = RELEASE_FRACTION * current if release_current is None else release_current
    _require("release current", release, "A", zero_ok=True)
    clamp = voltage if clamp is None else clamp
    _require("clamp voltage", clamp, "V")
    _require("forward voltage", vf, "V", zero_ok=True)
    _require("peak limit", peak_limit, "V")
    surge = current if surge_current is None else surge_current
    _require("surge current", surge, "A")
    if not exponent > 1:
        raise QuantityError(f"varistor exponent must exceed 1, got {exponent}")
    return _Circuit(
        voltage=voltage.to("V"),
        resistance=resistance.to("ohm"),
        inductance=inductance.to("H"),
        current=current,
        release=release.to("A"),
        clamp=clamp.to("V"),
        vf=vf.to("V"),
        margins=_margins(margins),
        peak_limit=peak_limit.to("V"),
        surge=surge.to("A"),
        exponent=exponent,
    )
