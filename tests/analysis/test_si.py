"""The SI crossings of the inner loops give exactly what pint gives."""

from __future__ import annotations

import random

import numpy as np
import pytest

from netcheck.analysis.si import converted, quantity, ratio, si
from netcheck.units import Q_

# Units the analysis reads and writes, with prefixes a design may use.
UNITS = [
    ("V", "V"),
    ("mV", "V"),
    ("kV", "V"),
    ("ohm", "ohm"),
    ("kohm", "ohm"),
    ("mohm", "ohm"),
    ("mH", "H"),
    ("H", "H"),
    ("uF", "F"),
    ("nF", "F"),
    ("mA", "A"),
    ("A", "A"),
    ("ms", "s"),
    ("mJ", "J"),
    ("W", "W"),
]


@pytest.mark.parametrize(("given", "target"), UNITS)
def test_si_is_bit_identical_to_pint(given: str, target: str) -> None:
    rng = random.Random(12)  # fixed seed: the same magnitudes every run
    values = [rng.uniform(-1e4, 1e4) for _ in range(200)] + [0.0, -0.0, 1, 7, 1e-12]
    for value in values:
        q = Q_(value, given)
        assert si(q, target) == float(q.to(target).magnitude), (value, given)


def test_si_follows_pint_for_offset_units() -> None:
    # degC -> K is not a plain factor; pint's own path must be taken.
    q = Q_(25.0, "degC")
    assert si(q, "K") == float(q.to("K").magnitude) == pytest.approx(298.15)


def test_si_refuses_what_pint_refuses() -> None:
    with pytest.raises(Exception, match="[Cc]annot convert"):
        si(Q_(1.0, "V"), "A")


@pytest.mark.parametrize("magnitude", [0.0, 2.5, 3, np.float64(1.25)])
def test_quantity_equals_pint_construction(magnitude: object) -> None:
    made, reference = quantity(magnitude, "mH"), Q_(magnitude, "mH")
    assert made == reference
    assert made.units == reference.units and type(made) is type(reference)
    assert type(made.magnitude) is type(reference.magnitude)
    assert f"{made:~P}" == f"{reference:~P}"
    assert made.to("H").magnitude == reference.to("H").magnitude


def test_quantity_keeps_arrays_and_converts_lists() -> None:
    wave = np.linspace(0.0, 1.0, 5)
    assert np.array_equal(quantity(wave, "s").to("ms").magnitude, wave * 1000)
    listed = quantity([1.0, 2.0], "V")
    assert isinstance(listed.magnitude, np.ndarray)


@pytest.mark.parametrize(
    ("top", "bottom", "target"),
    [("H", "ohm", "s"), ("mH", "ohm", "s"), ("mH", "kohm", "ms"), ("V", "mA", "ohm")],
)
def test_ratio_is_bit_identical_to_pint(top: str, bottom: str, target: str) -> None:
    rng = random.Random(7)  # fixed seed
    for _ in range(200):
        a, b = Q_(rng.uniform(1e-3, 1e3), top), Q_(rng.uniform(1e-3, 1e3), bottom)
        made, reference = ratio(a, b, target), (a / b).to(target)
        assert made.magnitude == reference.magnitude and made.units == reference.units
    # Whole-number magnitudes take pint's own path.
    assert ratio(Q_(3, top), Q_(7, bottom), target) == (Q_(3, top) / Q_(7, bottom)).to(
        target
    )


@pytest.mark.parametrize(("given", "target"), UNITS)
def test_converted_is_bit_identical_to_pint(given: str, target: str) -> None:
    rng = random.Random(11)  # fixed seed
    for magnitude in [
        0.0,
        -0.0,
        1.0,
        3,
        24,
        *(rng.uniform(-1e6, 1e6) for _ in range(200)),
    ]:
        value = Q_(magnitude, given)
        ours, theirs = converted(value, target), value.to(target)
        assert type(ours.magnitude) is type(theirs.magnitude)
        assert repr(ours) == repr(theirs) and ours.units == theirs.units


def test_converted_follows_pint_for_offset_units() -> None:
    assert converted(Q_(20.0, "degC"), "K") == Q_(20.0, "degC").to("K")
