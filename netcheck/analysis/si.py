"""Fast crossings between pint quantities and SI floats for the inner loops.

pint spends most of a large design's analysis time building quantities
(``Quantity.__new__`` parses or checks its unit on every call) and converting
them (``.to`` looks the factor up afresh each time). The analysis computes in
SI floats and makes quantities only where a value leaves for a result; these
helpers make those crossings cheap while giving exactly what pint gives:
``si(q, u) == float(q.to(u).magnitude)``, ``quantity(x, u) == Q_(x, u)``,
``ratio(a, b, u) == (a / b).to(u)`` and ``converted(q, u) == q.to(u)``, bit for
bit (``tests/analysis/test_si.py``). The rules' inner loops use three more:
``quantity_like`` (what ``q * k`` builds), ``exceeds`` (``a > b``) and
``total`` (``sum`` from zero), held to pint by ``tests/test_check_context_values.py``.
"""

from __future__ import annotations

import numbers
from collections.abc import Iterable
from typing import Any

import numpy as np
import pint

from netcheck.units import Q_

__all__ = ["si", "quantity", "ratio", "converted", "quantity_like", "exceeds", "total"]

# (source units, target unit text) -> multiplicative factor, or None where the
# conversion is not a plain factor (offset units such as degC): those take
# pint's own path every time.
_FACTORS: dict[tuple[Any, str], float | None] = {}
# (numerator units, denominator units, target unit text) -> the factor of the
# quotient's units: pint's ``UnitsContainer`` division, done once per pair.
_RATIO_FACTORS: dict[tuple[Any, Any, str], float | None] = {}
_CONTAINERS: dict[str, Any] = {}
# Magnitude types pint stores unchanged (its _to_magnitude returns them as is).
_PLAIN = frozenset({float, int, np.float64, np.ndarray})


def _factor(units: Any, unit: str) -> float | None:
    key = (units, unit)
    try:
        return _FACTORS[key]
    except KeyError:
        pass
    one = float(Q_(1.0, units).to(unit).magnitude)
    zero = float(Q_(0.0, units).to(unit).magnitude)
    two = float(Q_(2.0, units).to(unit).magnitude)
    factor = one if zero == 0.0 and two == 2.0 * one else None
    _FACTORS[key] = factor
    return factor


def si(value: pint.Quantity, unit: str) -> float:
    """``float(value.to(unit).magnitude)`` without pint's per-call look-ups."""
    magnitude = value._magnitude
    factor = _factor(value._units, unit)
    if factor is None or (
        type(magnitude) is not float and not isinstance(magnitude, numbers.Real)
    ):
        return float(value.to(unit).magnitude)
    # pint converts a multiplicative unit as magnitude * factor; with matching
    # units the factor is 1.0 and the product is the magnitude exactly.
    return float(magnitude * factor)


def _container(unit: str) -> Any:
    try:
        return _CONTAINERS[unit]
    except KeyError:
        container = Q_(1.0, unit)._units
        _CONTAINERS[unit] = container
        return container


def quantity(magnitude: Any, unit: str) -> pint.Quantity:
    """``Q_(magnitude, unit)``, the unit text parsed once per process."""
    container = _container(unit)
    if type(magnitude) in _PLAIN:
        # What Quantity.__new__ does for these magnitudes (keeps them as they
        # are), without re-checking the unit and the type on every call.
        inst = object.__new__(Q_)
        inst._magnitude = magnitude
        inst._units = container
        return inst
    return Q_(magnitude, container)


def ratio(
    numerator: pint.Quantity, denominator: pint.Quantity, unit: str
) -> pint.Quantity:
    """``(numerator / denominator).to(unit)`` with one cached factor."""
    top, bottom = numerator._magnitude, denominator._magnitude
    key = (numerator._units, denominator._units, unit)
    try:
        factor = _RATIO_FACTORS[key]
    except KeyError:
        factor = _RATIO_FACTORS[key] = _factor(key[0] / key[1], unit)
    if factor is None or not (isinstance(top, float) and isinstance(bottom, float)):
        return (numerator / denominator).to(unit)
    # pint divides the magnitudes, then converts the quotient's units.
    return quantity((top / bottom) * factor, unit)


def converted(value: pint.Quantity, unit: str) -> pint.Quantity:
    """``value.to(unit)`` with one cached factor (float magnitudes)."""
    magnitude = value._magnitude
    if type(magnitude) is float:
        factor = _factor(value._units, unit)
        if factor is not None:
            # pint's multiplicative conversion: the magnitude times the factor.
            return quantity(magnitude * factor, unit)
    return value.to(unit)


def quantity_like(value: pint.Quantity, magnitude: Any) -> pint.Quantity:
    """A quantity of ``magnitude`` in the units of ``value``.

    What pint's ``value * k`` and ``value / k`` build for a plain number
    ``k`` (magnitude op k, the units kept), made without pint's dispatch.
    """
    if type(magnitude) is not float:
        return type(value)(magnitude, value._units)
    # Quantity.__new__ stores a float magnitude and a units container as given.
    made = object.__new__(type(value))
    made._magnitude = magnitude
    made._units = value._units
    return made


def exceeds(value: pint.Quantity, limit: pint.Quantity) -> bool:
    """``value > limit``, as pint compares them, for the rules' inner loops.

    pint compares the magnitudes when both quantities have the same units;
    where the units are one object (as a design's values mostly are) that is
    done here without pint's dispatch, else pint compares.
    """
    units = getattr(value, "_units", None)
    if units is not None and units is getattr(limit, "_units", None):
        return bool(value._magnitude > limit._magnitude)
    return bool(value > limit)


def total(values: Iterable[pint.Quantity], unit: str) -> pint.Quantity:
    """``sum(values, Q_(0.0, unit))``, bit for bit.

    pint adds quantities of equal units as their magnitudes, left to right,
    in those units; values of other units (or not floats) take pint's path.
    """
    values = tuple(values)
    start = quantity(0.0, unit)
    magnitude = 0.0
    for value in values:
        if type(value._magnitude) is not float or value._units != start._units:
            return sum(values, start)
        magnitude = magnitude + value._magnitude
    return quantity_like(start, magnitude)
