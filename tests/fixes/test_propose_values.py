"""The proposer's values, computed without pint's dispatch, equal pint's own.

``quantity_text`` reads the magnitude with ``si`` and the margins are applied
with ``quantity_like``; both must give, bit for bit, what ``value.to(unit)``
and ``value * margin`` give (the texts are the fix's edits in every report).
The margin defaults are read once per catalogue object.
"""

from __future__ import annotations

import math
import random

import pytest

from netcheck.catalogue import all_margins, load_catalogue
from netcheck.fixes import propose
from netcheck.units import Q_


def _pint_text(value, unit: str) -> str:  # type: ignore[no-untyped-def]
    """The former ``quantity_text``: pint's conversion and rounding."""
    magnitude = float(value.to(unit).magnitude)
    if magnitude <= 0:
        return f"0{unit}"
    step = 10 ** (math.floor(math.log10(magnitude)) - 1)
    rounded = math.ceil(round(magnitude / step, 9)) * step
    return f"{float(f'{rounded:.2g}'):g}{unit}"


CASES = [
    (unit, target)
    for unit, target in (
        ("V", "V"),
        ("mV", "V"),
        ("kV", "V"),
        ("A", "A"),
        ("mA", "A"),
        ("ohm", "ohm"),
        ("kohm", "ohm"),
        ("J", "J"),
        ("mJ", "J"),
        ("W", "W"),
    )
]


@pytest.mark.parametrize(("unit", "target"), CASES)
def test_scaled_texts_equal_pints(unit: str, target: str) -> None:
    rng = random.Random(f"{unit}-{target}")  # reproducible
    for _ in range(300):
        value = Q_(rng.uniform(1e-4, 1e4), unit)
        factor = rng.choice([1.0, 1.1, 1.25, 1.5, 2.0, rng.uniform(0.5, 3.0)])
        scaled = propose._times(value, factor)
        pint_scaled = value * factor
        assert scaled.magnitude == pint_scaled.magnitude  # bit for bit
        assert scaled.units == pint_scaled.units
        assert propose.quantity_text(scaled, target) == _pint_text(pint_scaled, target)


def test_integer_factors_take_pints_path() -> None:
    value = Q_(24, "V")  # an int magnitude: pint's own multiplication
    assert propose._times(value, 2).magnitude == 48
    assert type(propose._times(value, 2).magnitude) is int


def test_default_margins_equal_the_catalogues() -> None:
    expected = {k: m.default for k, m in all_margins(load_catalogue()).items()}
    assert {k: m.default for k, m in propose._default_margins().items()} == expected
    for name in expected:
        assert propose._margin(name, {}) == expected[name]
        assert propose._margin(name, {name: 3}) == 3.0  # configured wins
