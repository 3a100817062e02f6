"""Printing quantities: one SI prefix, chosen from the value in the unprefixed unit.

The rule checked is the SI Brochure's (BIPM, 9th edition, 2019, section 3):
prefixes are never combined, and a prefix attaches to the unit symbol only.
The round trip goes through the project's own quantity parser.
"""

from __future__ import annotations

import math
import re

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from netcheck.units import DIMENSIONS, Q_, format_quantity, parse_quantity

# What an input may be written in, per dimension (prefixed and not).
UNITS = {
    "voltage": ["V", "mV", "kV", "uV", "MV"],
    "current": ["A", "mA", "uA", "kA", "nA"],
    "resistance": ["ohm", "mohm", "kohm", "Mohm", "Ω", "kΩ"],
    "inductance": ["H", "mH", "uH", "nH"],
    "capacitance": ["F", "uF", "nF", "pF", "mF"],
    "time": ["s", "ms", "us", "ns", "ks"],
    "energy": ["J", "mJ", "kJ", "uJ", "MJ"],
    "power": ["W", "mW", "kW", "MW"],
    "frequency": ["Hz", "kHz", "MHz"],
    "length": ["m", "mm", "um", "km"],
}
PAIRS = [(dim, unit) for dim, units in UNITS.items() for unit in units]
# A number, one space, at most one prefix letter, the SI symbol of the dimension.
PREFIX = "[fpnµmkMGT]?"


def _shape(dimension: str) -> re.Pattern[str]:
    symbol = {"ohm": "Ω"}.get(DIMENSIONS[dimension], DIMENSIONS[dimension])
    number = r"-?[0-9]+(?:\.[0-9]+)?(?:e[+-][0-9]+)?"
    return re.compile(rf"\A{number} (?:{PREFIX}{re.escape(symbol)})\Z")


@pytest.mark.parametrize(
    ("quantity", "text"),
    [
        (Q_(0.048, "ms"), "48 µs"),  # was "48 mms"
        (Q_(0.0005, "kV"), "500 mV"),  # was "500 µkV"
        (Q_(0.0021, "H"), "2.1 mH"),
        (Q_(4.7, "kohm"), "4.7 kΩ"),
        (Q_(4700, "ohm"), "4.7 kΩ"),
        (Q_(0.4, "mm"), "400 µm"),
        (Q_(2.2e-6, "F"), "2.2 µF"),
        (Q_(1.5e-3, "kJ"), "1.5 J"),
        (Q_(0, "mA"), "0 A"),
        (Q_(-0.002, "A"), "-2 mA"),
        (Q_(0.99996, "V"), "1 V"),  # rounds up to the next prefix, not "1000 mV"
        (Q_(999.96, "V"), "1 kV"),
        (Q_(85, "percent"), "85 %"),
        (Q_(0.5, "percent"), "0.5 %"),  # no prefix on a percent
    ],
)
def test_known_values(quantity, text):
    assert format_quantity(quantity) == text


@settings(max_examples=400, deadline=None)
@given(
    pair=st.sampled_from(PAIRS),
    exponent=st.floats(min_value=-14.0, max_value=14.0),
    mantissa=st.floats(min_value=1.0, max_value=9.999),
    negative=st.booleans(),
)
def test_printed_text_parses_back_to_the_value(pair, exponent, mantissa, negative):
    dimension, unit = pair
    magnitude = (-1 if negative else 1) * mantissa * 10 ** math.floor(exponent)
    quantity = Q_(magnitude, unit)
    expected = float(quantity.to(DIMENSIONS[dimension]).magnitude)
    if abs(expected) > 1e14:  # parse_quantity refuses 1e15 and above as typing slips
        return
    text = format_quantity(quantity)
    assert _shape(dimension).match(text), text
    back = float(parse_quantity(text, dimension).magnitude)
    # Four significant digits: the printed value is within half a unit of the
    # fourth digit, 5e-4 of the value at most.
    assert back == pytest.approx(expected, rel=5.01e-4), text


@settings(max_examples=200, deadline=None)
@given(pair=st.sampled_from(PAIRS), magnitude=st.floats(1e-12, 1e12))
def test_never_two_prefixes(pair, magnitude):
    dimension, unit = pair
    text = format_quantity(Q_(magnitude, unit))
    symbol = text.split(" ", 1)[1]
    assert len(symbol) - len(_shape_symbol(dimension)) in (0, 1), text


def _shape_symbol(dimension: str) -> str:
    return {"ohm": "Ω"}.get(DIMENSIONS[dimension], DIMENSIONS[dimension])
