"""Transients when a switching element opens an inductive DC load, per suppression.

The physics works on plain floats in SI units (V, A, ohm, H, F, s, J, C): pint is far
too slow inside integrators and root searches. ``opening_transient`` is the thin
quantity-facing wrapper. Model: constant coil inductance L and resistance R fed from
a supply Vs; the element opens ideally at t = 0 carrying I0 (no arc, no armature
motion, no eddy currents), so real release times differ.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from netcheck.analysis.clamps import (
    clamp_transient,
    resistor_transient,
    varistor_transient,
)
from netcheck.analysis.constants import SILICON_RECTIFIER_VF, STRAY_CAPACITANCE
from netcheck.analysis.ringing import ring_transient
from netcheck.analysis.si import quantity, si
from netcheck.units import Q_, Quantity

__all__ = [
    "ACROSS_LOAD",
    "VARISTOR_EXPONENT",
    "RELEASE_FRACTION",
    "ACROSS_ELEMENT",
    "PLACEMENTS",
    "Load",
    "Suppression",
    "Transient",
    "OpeningTransient",
    "transient",
    "opening_transient",
]

ACROSS_LOAD = "across-load"
ACROSS_ELEMENT = "across-element"
# Where each arrangement may sit; the first placement is the default.
PLACEMENTS: dict[str, tuple[str, ...]] = {
    "none": (ACROSS_ELEMENT,),
    "diode": (ACROSS_LOAD,),
    "diode-zener": (ACROSS_LOAD,),
    "tvs": (ACROSS_LOAD, ACROSS_ELEMENT),
    "varistor": (ACROSS_LOAD,),
    "resistor": (ACROSS_LOAD,),
    "rc": (ACROSS_LOAD, ACROSS_ELEMENT),
    "capacitor": (ACROSS_ELEMENT, ACROSS_LOAD),
}
# Release current as a fraction of the steady current (spec: netcheck size).
RELEASE_FRACTION = 0.1
# Metal-oxide varistor nonlinearity exponent: typically 20-50 (from memory).
VARISTOR_EXPONENT = 25.0


@dataclass(frozen=True)
class Load:
    """An inductive DC load at the instant of opening (V, ohm, H, A)."""

    supply: float
    resistance: float
    inductance: float
    current: float | None = None  # steady current; None means supply / resistance

    @property
    def steady_current(self) -> float:
        """Current when the element opens (A)."""
        if self.current is not None:
            return self.current
        if self.resistance <= 0:
            raise ValueError("give the current of a coil without resistance")
        return self.supply / self.resistance


@dataclass(frozen=True)
class Suppression:
    """One suppression arrangement (V, A, ohm, F).

    ``clamp_voltage`` is the zener voltage (diode-zener), the clamp voltage (tvs) or
    the varistor's voltage at ``reference_current`` (default: the steady current).
    ``resistance`` is the series R of an rc or the resistor's value; ``capacitance``
    the rc/capacitor value, or for ``none`` the stray capacitance assumed across the
    element. Varistor law I = Iref·(V/Vref)^exponent.
    """

    kind: str = "none"
    placement: str | None = None
    forward_voltage: float = SILICON_RECTIFIER_VF
    clamp_voltage: float = 0.0
    reference_current: float | None = None
    exponent: float = VARISTOR_EXPONENT
    resistance: float = 0.0
    capacitance: float = STRAY_CAPACITANCE

    @property
    def where(self) -> str:
        """The placement, defaulting to the arrangement's usual one."""
        return self.placement or PLACEMENTS[self.kind][0]


@dataclass(frozen=True, eq=False)
class Transient:
    """The opening transient in SI units; waveforms are arrays over ``t``.

    Every solver fills it: the closed forms and the varistor integration of
    ``clamps``, the exact R-L-C loops of ``ringing`` (each returns the fields that
    depend on the arrangement); ``OpeningTransient.of`` gives it as quantities.

    Energy balance: stored_energy + supply_energy
    = suppressor_energy + coil_loss + final_energy.
    """

    kind: str
    placement: str
    peak_voltage: float  # V across the opening element
    release_time: float  # s until |i_load| <= release current (first time)
    suppressor_energy: float  # J dissipated in the suppressor itself
    suppressor_charge: float  # C through the suppressor
    suppressor_peak_voltage: float  # V, largest |voltage| across the suppressor
    coil_loss: float  # J in the coil resistance
    supply_energy: float  # J delivered by the supply after opening
    stored_energy: float  # J in the coil (and capacitors) at opening
    final_energy: float  # J left in capacitors at the end
    conducts_continuously: bool
    assumptions: tuple[str, ...]
    t: np.ndarray
    i_load: np.ndarray
    v_element: np.ndarray


def _check(load: Load, suppression: Suppression, release: float) -> None:
    """Reject values for which the model has no meaning."""
    if suppression.kind not in PLACEMENTS:
        raise ValueError(f"unknown suppression kind {suppression.kind!r}")
    if suppression.where not in PLACEMENTS[suppression.kind]:
        raise ValueError(f"{suppression.kind} cannot be placed {suppression.where}")
    if load.inductance <= 0 or load.resistance < 0 or load.steady_current <= 0:
        raise ValueError("need inductance > 0, resistance >= 0 and current > 0")
    if release < 0 or suppression.forward_voltage < 0 or suppression.resistance < 0:
        raise ValueError("release current, forward voltage, resistance must be >= 0")
    if suppression.kind in ("rc", "capacitor", "none") and suppression.capacitance <= 0:
        raise ValueError("capacitance must be > 0")
    if suppression.kind in ("tvs", "varistor") and suppression.clamp_voltage <= 0:
        raise ValueError("clamp voltage must be > 0")
    if suppression.kind == "varistor" and suppression.exponent <= 1:
        raise ValueError("varistor exponent must exceed 1")


def transient(
    load: Load, suppression: Suppression, release_current: float | None = None
) -> Transient:
    """Compute the opening transient of ``load`` with ``suppression`` (SI floats).

    The release current defaults to 10 % of the steady current.
    """
    i0 = load.steady_current
    release = RELEASE_FRACTION * i0 if release_current is None else release_current
    _check(load, suppression, release)
    if suppression.kind in ("none", "rc", "capacitor"):
        fields = _ringing(load, suppression, release)
    else:
        fields = _first_order(load, suppression, release)
    return Transient(
        kind=suppression.kind,
        placement=suppression.where,
        assumptions=_assumptions(suppression),
        **fields,
    )


def _first_order(load: Load, suppression: Suppression, release: float) -> dict:
    """Transient fields of the arrangements whose loop has the coil as only store."""
    coil = (load.resistance, load.inductance, load.supply, load.steady_current)
    kind = suppression.kind
    if kind == "resistor":
        return resistor_transient(*coil, suppression.resistance, release)
    if kind == "varistor":
        reference = suppression.reference_current or load.steady_current
        v_ref, exponent = suppression.clamp_voltage, suppression.exponent
        return varistor_transient(*coil, v_ref, reference, exponent, release)
    clamp = {
        "diode": suppression.forward_voltage,
        "diode-zener": suppression.clamp_voltage + suppression.forward_voltage,
        "tvs": suppression.clamp_voltage,
    }[kind]
    across_element = suppression.where == ACROSS_ELEMENT
    return clamp_transient(*coil, clamp, release, across_element=across_element)


def _ringing(load: Load, suppression: Suppression, release: float) -> dict:
    """RC, capacitor or unsuppressed (stray capacitance) opening."""
    series = (
        0.0 if suppression.kind in ("none", "capacitor") else suppression.resistance
    )
    return ring_transient(
        load.resistance,
        load.inductance,
        load.supply,
        load.steady_current,
        series,
        suppression.capacitance,
        across_element=suppression.where == ACROSS_ELEMENT,
        release_current=release,
    )


def _assumptions(suppression: Suppression) -> tuple[str, ...]:
    """What the model assumes beyond the circuit given (the stray capacitance)."""
    if suppression.kind != "none":
        return ()
    stray = Q_(suppression.capacitance, "F").to_compact()
    return (
        f"unsuppressed: the peak is limited only by an assumed {stray:~.3g} of "
        "stray capacitance across the element",
        "a real contact arcs, or its gap breaks down (air: about 300 V at the "
        "Paschen minimum), and a semiconductor avalanches, below such a peak",
    )


_UNITS = {
    "peak_voltage": "V",
    "release_time": "s",
    "suppressor_energy": "J",
    "suppressor_charge": "C",
    "suppressor_peak_voltage": "V",
    "coil_loss": "J",
    "supply_energy": "J",
    "stored_energy": "J",
    "final_energy": "J",
    "t": "s",
    "i_load": "A",
    "v_element": "V",
}


@dataclass(frozen=True, eq=False)
class OpeningTransient:
    """The opening transient as quantities, waveforms kept (quantity arrays).

    The one result the analysis, the checks and ``size`` read; ``of`` builds it
    from the solvers' SI ``Transient``.
    """

    kind: str
    placement: str
    peak_voltage: Quantity
    release_time: Quantity
    suppressor_energy: Quantity
    suppressor_charge: Quantity
    suppressor_peak_voltage: Quantity
    coil_loss: Quantity
    supply_energy: Quantity
    stored_energy: Quantity
    final_energy: Quantity
    conducts_continuously: bool
    assumptions: tuple[str, ...]
    t: Quantity
    i_load: Quantity
    v_element: Quantity

    @classmethod
    def of(cls, result: Transient) -> OpeningTransient:
        """The quantity form of an SI ``Transient``, waveforms included."""
        values = {
            name: quantity(getattr(result, name), u) for name, u in _UNITS.items()
        }
        return cls(
            kind=result.kind,
            placement=result.placement,
            conducts_continuously=result.conducts_continuously,
            assumptions=result.assumptions,
            **values,
        )


def _si(value: Quantity | None, unit: str) -> float | None:
    return None if value is None else _magnitude(value, unit)


def _magnitude(value: Quantity, unit: str) -> float:
    return si(value, unit)


def opening_transient(
    voltage: Quantity,
    resistance: Quantity,
    inductance: Quantity,
    kind: str = "none",
    *,
    placement: str | None = None,
    current: Quantity | None = None,
    release_current: Quantity | None = None,
    forward_voltage: Quantity | None = None,
    clamp_voltage: Quantity | None = None,
    reference_current: Quantity | None = None,
    exponent: float | None = None,
    suppressor_resistance: Quantity | None = None,
    capacitance: Quantity | None = None,
) -> OpeningTransient:
    """Quantity-facing ``transient``: quantities in, quantities out.

    Example: ``opening_transient(Q_(24, "V"), Q_(48, "ohm"), Q_(0.48, "H"), "diode")``.
    """
    load = Load(
        _magnitude(voltage, "V"),
        _magnitude(resistance, "ohm"),
        _magnitude(inductance, "H"),
        _si(current, "A"),
    )
    given: dict[str, Any] = {
        "placement": placement,
        "forward_voltage": _si(forward_voltage, "V"),
        "clamp_voltage": _si(clamp_voltage, "V"),
        "exponent": exponent,
        "reference_current": _si(reference_current, "A"),
        "resistance": _si(suppressor_resistance, "ohm"),
        "capacitance": _si(capacitance, "F"),
    }
    suppression = replace(
        Suppression(kind), **{k: v for k, v in given.items() if v is not None}
    )
    return OpeningTransient.of(transient(load, suppression, _si(release_current, "A")))
