"""The rules' float short cuts give exactly what pint gives.

``quantity_like``, ``CheckContext.scaled``, ``exceeds`` and ``total`` skip
pint's operators in the rules' inner loops; the reports must not change by a
bit, so each is compared with the pint expression it replaces (magnitude,
units and the sign of zero), on same-unit and mixed-unit values.
"""

from __future__ import annotations

import math

import pytest

from netcheck.analysis.si import exceeds, quantity_like, total
from netcheck.catalogue import load_catalogue
from netcheck.checks.context import CheckContext
from netcheck.units import Q_

MAGNITUDES = [0.0, -0.0, 1.0, 0.1, 1 / 3, 24.000000000000004, 1e-300, 7, math.nan]
UNITS = ["V", "mV", "A", "mJ", "J"]


def _same(ours, theirs) -> None:  # type: ignore[no-untyped-def]
    assert type(ours) is type(theirs)
    assert ours.units == theirs.units
    a, b = ours.magnitude, theirs.magnitude
    assert type(a) is type(b)
    assert repr(a) == repr(b)  # bit for bit: -0.0 and nan included


@pytest.mark.parametrize("unit", UNITS)
@pytest.mark.parametrize("magnitude", MAGNITUDES)
def test_quantity_like_is_what_pint_multiplication_builds(magnitude, unit):
    value = Q_(magnitude, unit)
    for factor in (1.0, 1.1, 2.0, 1.25, 0.3):
        _same(quantity_like(value, value.magnitude * factor), value * factor)
    _same(quantity_like(value, value.magnitude / 3), value / 3)


@pytest.mark.parametrize("unit", UNITS)
@pytest.mark.parametrize("magnitude", MAGNITUDES)
def test_scaled_is_value_times_the_margin(magnitude, unit):
    # Margins from the catalogue and one from configuration.
    ctx = CheckContext(None, None, None, load_catalogue(), {"diode-current": 1.3})  # type: ignore[arg-type]
    value = Q_(magnitude, unit)
    for margin in ("diode-reverse-voltage", "diode-current", "capacitor-voltage"):
        _same(ctx.scaled(value, margin), value * ctx.option(margin))


@pytest.mark.parametrize("magnitude", MAGNITUDES)
def test_exceeds_is_greater_than(magnitude):
    for other in MAGNITUDES:
        for unit_a, unit_b in (("V", "V"), ("V", "mV"), ("mV", "V"), ("J", "mJ")):
            a, b = Q_(magnitude, unit_a), Q_(other, unit_b)
            assert exceeds(a, b) is bool(a > b)
            assert exceeds(b, a) is bool(b > a)


def test_exceeds_shares_units_in_the_fast_path():
    # The short cut only fires where both values hold one units object.
    a = Q_(2.0, "V")
    b = quantity_like(a, 1.0)
    assert a._units is b._units and exceeds(a, b) and not exceeds(b, a)


@pytest.mark.parametrize(
    "values",
    [
        [],
        [Q_(0.08, "J")],
        [Q_(0.08, "J"), Q_(0.1, "J"), Q_(1 / 3, "J")],
        [Q_(-0.0, "J")],
        [Q_(0.08, "J"), Q_(30.0, "mJ")],  # mixed units: pint's own path
        [Q_(5, "J"), Q_(0.5, "J")],  # an int magnitude: pint's own path
    ],
)
def test_total_is_pints_sum(values):
    _same(total(values, "J"), sum(values, Q_(0.0, "J")))
    _same(total(iter(values), "J"), sum(values, Q_(0.0, "J")))
