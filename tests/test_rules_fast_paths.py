"""The rules stage's remembered values equal what they stand for.

``findings._quantity_text`` finds a non-zero float's text by magnitude and
units identity, ``result._magnitude_of`` remembers the verdict key's rounding
the same way, and ``RuleMeta.finding(copy_values=False)`` keeps the dict it is
given. Each is compared with the plain computation on values chosen to
collide: equal magnitudes in other units, equal units as other objects, the
sign of zero, NaN, integers and arrays.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from netcheck.analysis import result
from netcheck.catalogue import load_catalogue
from netcheck.findings import _quantity_text
from netcheck.source import Span
from netcheck.units import Q_, format_quantity

VALUES = [
    Q_(24.0, "V"),
    Q_(24.0, "mV"),
    Q_(24.0, "A"),
    Q_(24, "V"),
    Q_(0.0, "V"),
    Q_(-0.0, "V"),
    Q_(-0.0, "mV"),
    Q_(math.nan, "V"),
    Q_(math.inf, "V"),
    Q_(1e-12, "s"),
    Q_(0.3333333333333, "J"),
    Q_(2.5e6, "ohm"),
    Q_(np.float64(1.5), "V"),
    Q_(21.6, "degC"),
]


@pytest.mark.parametrize("rounds", [1, 2])
def test_quantity_text_is_format_quantity(rounds: int) -> None:
    for _ in range(rounds):  # the second round is answered from the memo
        for value in VALUES:
            assert _quantity_text(value) == format_quantity(value), value
            # Equal units as another container object: still the same text.
            again = Q_(value._magnitude, str(value.units))
            assert _quantity_text(again) == format_quantity(again), again


def test_quantity_text_keeps_the_units_it_was_keyed_on() -> None:
    # An identity met again is the same units object: the entry holds it.
    value = Q_(7.25, "kV")
    _quantity_text(value)
    units, text = next(
        entry
        for key, entry in _quantity_text.__globals__["_FORMATTED_FLOATS"].items()
        if key == (7.25, id(value._units))
    )
    assert units is value._units and text == format_quantity(value)


@pytest.mark.parametrize("unit", ["V", "A", "s"])
def test_verdict_rounding_memo_is_the_rounding(unit: str) -> None:
    same_kind = [v for v in VALUES if v.dimensionality == Q_(1.0, unit).dimensionality]
    assert same_kind
    for _ in range(2):  # the second round is answered from the memo
        for value in [*same_kind, None]:
            # repr: NaN equals NaN and -0.0 differs from 0.0.
            fast = result._magnitude_of(value, unit)
            assert repr(fast) == repr(result._magnitude(value, unit)), value


def test_finding_copies_values_unless_told_not_to() -> None:
    meta = load_catalogue()["inductive-load-unsuppressed"]
    values = {
        "loads": "Y1",
        "energy": Q_(0.02, "J"),
        "current": Q_(0.5, "A"),
        "voltage": Q_(24.0, "V"),
        "diode_voltage": Q_(48.0, "V"),
        "diode_current": Q_(0.5, "A"),
    }
    span = Span("design.cnet", 3, 1)
    copied = meta.finding(span, "K1:13-14", values)
    kept = meta.finding(span, "K1:13-14", values, copy_values=False)
    assert copied.values == values and copied.values is not values
    assert kept.values is values
    assert (kept.message, kept.fix) == (copied.message, copied.fix)
