"""Thresholds exactly at the limit, both sides: at the limit holds, one ulp over fails.

parts.md reads a rating as the most a pole may break; IEC 60947-5-1 and
60947-4-1 state ratings and test time constants as values not to be exceeded.
So the rated value itself passes and the next float above it fails. Each test
also names the mutation it kills.
"""

from __future__ import annotations

import math

from netcheck.analysis.ratings import assess_breaking
from netcheck.units import Q_


def _up(x: float) -> float:
    return math.nextafter(x, math.inf)


# DC-13 24 V 0.5 A: P = 12 W, T0.95 limit 6·P = 72 ms, L/R 72/3 = 24 ms
# (IEC 60947-5-1 Table 4 note, from memory per domain-facts §2; netcheck's
# T0.95 = 3·L/R, analysis/constants.py).
DC13 = {
    "form": "single-break",
    "voltage_max": Q_(250.0, "V"),
    "ratings": [
        {"category": "DC-13", "voltage": Q_(24.0, "V"), "current": Q_(0.5, "A")}
    ],
}


def _dc13(current: float, tau_ms: float = 10.0, volts: float = 24.0):  # type: ignore[no-untyped-def]
    return assess_breaking(
        DC13,
        voltage=Q_(volts, "V"),
        current=Q_(current, "A"),
        needed="DC-13",
        time_constant=Q_(tau_ms, "ms"),
    )


def test_current_at_the_rating_holds() -> None:
    # kills: "<=" turned into "<" in at_most
    assert _dc13(0.5).status == "ok"


def test_current_one_ulp_over_the_rating_fails() -> None:
    # kills: a relative tolerance in at_most (1e-9 let this pass)
    assert _dc13(_up(0.5)).status == "current-over"


def test_time_constant_at_the_dc13_limit_holds() -> None:
    verdict = _dc13(0.5, tau_ms=24.0)
    assert verdict.used is not None and verdict.used.tau_limit == Q_(24.0, "ms")
    assert not verdict.time_constant_over


def test_time_constant_one_ulp_over_the_dc13_limit_fails() -> None:
    assert _dc13(0.5, tau_ms=_up(24.0)).time_constant_over


def test_voltage_at_the_rated_row_holds_and_one_ulp_over_has_no_row() -> None:
    # 24 V is the only row: above it no rating applies (parts.md, voltage
    # between rated points; the next higher row is used, here none).
    assert _dc13(0.5, volts=24.0).status == "ok"
    assert _dc13(0.5, volts=_up(24.0)).status == "voltage-over"


# A breaking power with its own voltage_max below the contact's (WE-11 power).
POWER = {
    "form": "single-break",
    "voltage_max": Q_(250.0, "V"),
    "breaking_power": [
        {
            "power": Q_(50.0, "W"),
            "time_constant": Q_(40.0, "ms"),
            "voltage_max": Q_(60.0, "V"),
        }
    ],
}


def _power(volts: float, current: float = 0.1):  # type: ignore[no-untyped-def]
    return assess_breaking(
        POWER,
        voltage=Q_(volts, "V"),
        current=Q_(current, "A"),
        needed="DC-13",
        time_constant=Q_(10.0, "ms"),
    )


def test_breaking_power_holds_up_to_its_own_voltage_max() -> None:
    # kills: the row's voltage_max ignored in favour of the contact's 250 V
    assert _power(60.0).status == "ok"
    assert _power(_up(60.0)).status == "voltage-over"
    assert _power(110.0).status == "voltage-over"


def test_breaking_power_current_at_power_over_voltage() -> None:
    # WE-11: 50 W at 50 V allows 1 A exactly; one ulp more fails.
    assert _power(50.0, 1.0).status == "ok"
    assert _power(50.0, _up(1.0)).status == "current-over"


def test_duplicate_rows_at_one_voltage_take_the_lower_current() -> None:
    # Two DC-13 rows at 24 V (1 A and 0.4 A): contradictory data, the
    # conservative one applies (parts.md, "conservative"). kills: max() for min()
    contacts = {
        **DC13,
        "ratings": [
            {"category": "DC-13", "voltage": Q_(24.0, "V"), "current": Q_(1.0, "A")},
            {"category": "DC-13", "voltage": Q_(24.0, "V"), "current": Q_(0.4, "A")},
        ],
    }
    for rows in (contacts["ratings"], list(reversed(contacts["ratings"]))):
        verdict = assess_breaking(
            {**contacts, "ratings": rows},
            voltage=Q_(24.0, "V"),
            current=Q_(0.5, "A"),
            needed="DC-13",
            time_constant=Q_(10.0, "ms"),
        )
        assert verdict.status == "current-over"
        assert verdict.allowed_current == Q_(0.4, "A")
