"""What ``netcheck size`` returns: the load, its options and the ratings to buy."""

from __future__ import annotations

from dataclasses import dataclass

from netcheck.units import Q_, Quantity

__all__ = [
    "Rating",
    "SizeOption",
    "LoadSummary",
    "SizeResult",
    "SI_UNITS",
    "si_unit",
    "rating",
]

SI_UNITS = ("V", "A", "s", "J", "ohm", "F")


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


def si_unit(value: Quantity) -> str:
    """Return the SI unit of a value's dimension, one of V, A, s, J, ohm, F."""
    for unit in SI_UNITS:
        if value.dimensionality == Q_(1, unit).dimensionality:
            return unit
    raise ValueError(f"no SI unit for {value}")


def rating(name: str, value: Quantity, relation: str, basis: str) -> Rating:
    """Return a Rating with its value in the SI unit of its dimension."""
    return Rating(name, value.to(si_unit(value)), relation, basis)
