"""The validated inputs of one sizing run and the margins it applies."""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

from netcheck.analysis.transients import (
    RELEASE_FRACTION,
    OpeningTransient,
    opening_transient,
)
from netcheck.catalogue import all_margins, load_catalogue
from netcheck.errors import ConfigError, QuantityError
from netcheck.sizing.results import LoadSummary, Rating, rating
from netcheck.units import Q_, Quantity, format_quantity

__all__ = [
    "SIZE_MARGINS",
    "Circuit",
    "build_circuit",
    "margin_defaults",
    "resolve_margins",
]

# The catalogue margins (rules/*.yaml) the options apply; ``check`` reads the same.
SIZE_MARGINS = (
    "diode-reverse-voltage",
    "diode-current",
    "zener-energy",
    "varistor-voltage",
    "varistor-continuous-voltage",
    "varistor-energy",
    "tvs-standoff",
    "tvs-energy",
    "capacitor-voltage",
)


def margin_defaults() -> dict[str, float]:
    """The catalogue's default of every margin ``size`` applies."""
    known = all_margins(load_catalogue())
    return {name: known[name].default for name in SIZE_MARGINS}


def resolve_margins(overrides: Mapping[str, float] | None) -> dict[str, float]:
    """Catalogue defaults updated by ``overrides`` (e.g. a netcheck.yaml's margins).

    Any catalogue margin may be given, as netcheck.yaml accepts them all; an unknown
    name or a value that is not a positive number is a configuration error.
    """
    known = all_margins(load_catalogue())
    merged = margin_defaults()
    for name, value in (overrides or {}).items():
        if name not in known:
            raise ConfigError(f"unknown margin {name!r} (known: {', '.join(known)})")
        if not isinstance(value, int | float) or not (0 < value < math.inf):
            raise ConfigError(f"margin {name!r} must be a positive number")
        if name in merged:
            merged[name] = float(value)
    return merged


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


@dataclass(frozen=True)
class Circuit:
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
        return rating(key, factor * needed, ">=", basis)


def build_circuit(
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
) -> Circuit:
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
    return Circuit(
        voltage=voltage.to("V"),
        resistance=resistance.to("ohm"),
        inductance=inductance.to("H"),
        current=current,
        release=release.to("A"),
        clamp=clamp.to("V"),
        vf=vf.to("V"),
        margins=resolve_margins(margins),
        peak_limit=peak_limit.to("V"),
        surge=surge.to("A"),
        exponent=exponent,
    )
