"""Reading contact ratings (parts.md "Rules for reading ratings") at their edges.

All rating data below are invented and illustrative; they are no product's data.
Contact data go through the real part-library reader, so the tests see the same
converted mappings (quantities, tuples) the checks see. The IEC 60947-5-1
Table 4 values (DC-13 T0.95 = 6·P capped at 300 ms, DC-12 1 ms, DC-14 15 ms) and
the IEC 60947-4-1 L/R values are from memory, as the facts sheet gives them
(domain-facts §1, §2), wherever a comment below cites them.
"""

from __future__ import annotations

import math
import textwrap

import pytest

from netcheck.analysis.ratings import (
    MAX_POLES,
    STATUSES,
    Assessment,
    assess_breaking,
    category_tau_limit,
    dc13_t95_limit,
    has_dc_data,
    interpolate_curve,
    is_ac_category,
    poles_needed,
    t95_of,
)
from netcheck.input.parts import parse_library
from netcheck.units import Q_

# T0.95 = L/R·ln 20: the 95 % rise of an RL current (first principles).
# The spec's convention, T0.95 = 3·L/R (parts.md; IEC 60947-5-1 rounds ln 20 = 2.996
# to 3): worked examples computed with ln 20 differ from it by 0.14 %.
LN20 = 3.0


def contacts(body: str) -> dict:
    """Parse a ``contacts:`` block (YAML, indented as under a part) into its mapping."""
    text = (
        "format: netcheck-parts/1\n"
        "note: Illustrative values for tests; not any manufacturer's data.\n"
        "parts:\n"
        "  p:\n"
        "    kind: relay\n"
        "    contacts:\n" + textwrap.indent(textwrap.dedent(body), "      ")
    )
    return dict(parse_library(text, "test.parts.yaml")["p"].data["contacts"])


def one_row(category: str, volts: float, amps_rated: float) -> dict:
    """Contacts with one illustrative per-pole rating row."""
    row = f"{{category: {category}, voltage: {volts} V, current: {amps_rated} A}}"
    return contacts(f"ratings:\n  - {row}\n")


def assess(c, volts, amps, needed, tau_ms, poles=1) -> Assessment:
    tau = None if tau_ms is None else Q_(tau_ms, "ms")
    current = None if amps is None else Q_(amps, "A")
    return assess_breaking(
        c, voltage=Q_(volts, "V"), current=current, needed=needed,
        time_constant=tau, poles=poles,
    )  # fmt: skip


def amps(q) -> float:
    return q.to("A").magnitude


# Illustrative DC-13 table: two rated points.
DC13_TABLE = contacts("""
    voltage_max: 250 V
    ratings:
      - {category: AC-15, voltage: 230 V, current: 3 A}
      - {category: DC-13, voltage: 24 V, current: 1 A}
      - {category: DC-13, voltage: 110 V, current: 0.1 A}
""")
# Illustrative resistive curve, one pole (the points of the parts.md example).
CURVE = contacts("""
    dc_breaking_curve:
      - {voltage: 30 V, current: 10 A}
      - {voltage: 60 V, current: 1.5 A}
      - {voltage: 110 V, current: 0.5 A}
      - {voltage: 220 V, current: 0.25 A}
""")


# --- helpers -------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("volts", "amps_rated", "t95_ms", "tau_ms"),
    [
        # WE-1: 24 V 0.5 A, P = 12 W -> 6·12 = 72 ms (IEC 60947-5-1 Table 4 note)
        (24, 0.5, 72.0, 24.034),
        # WE-2a: 110 V 0.5 A, P = 55 W, 6P = 330 ms -> capped at 300 ms
        # (IEC 60947-5-1 Table 4 note, from memory); tau = 300/ln 20 = 100.14 ms
        (110, 0.5, 300.0, 100.14),
        # WE-2b: 220 V 0.1 A, P = 22 W -> 132 ms, tau 44.06 ms (same clause)
        (220, 0.1, 132.0, 44.06),
        # WE-2c: 24 V 2 A, P = 48 W -> 288 ms, tau 96.137 ms (same clause)
        (24, 2.0, 288.0, 96.137),
    ],
)
def test_dc13_t95_limit(volts, amps_rated, t95_ms, tau_ms):
    limit = dc13_t95_limit(Q_(volts, "V"), Q_(amps_rated, "A"))
    assert limit.to("ms").magnitude == pytest.approx(t95_ms, rel=1e-9)
    # The equivalent L/R of the test circuit, T0.95/ln 20 (WE-2, exact RL rise).
    assert (limit / math.log(20.0)).to("ms").magnitude == pytest.approx(tau_ms, rel=1e-4)


def test_t95_of_we1_coil():
    # WE-1: L/R = 0.48 H / 48 ohm = 10 ms -> T0.95 = 10·ln 20 = 29.96 ms exactly;
    # the spec's 3·L/R gives 30.0 ms (0.14 % more).
    assert t95_of(Q_(0.48, "H") / Q_(48, "ohm")).to("ms").magnitude == pytest.approx(
        30.0, rel=1e-9
    )
    assert 29.957 == pytest.approx(30.0, rel=2e-3)


@pytest.mark.parametrize(
    ("category", "tau_ms"),
    [
        ("DC-1", 1.0),  # IEC 60947-4-1 conventional operational performance: L/R 1 ms
        ("DC-3", 2.0),  # IEC 60947-4-1, from memory: DC-3 L/R 2 ms
        ("DC-5", 7.5),  # IEC 60947-4-1, from memory: DC-5 L/R 7.5 ms
        ("DC-12", 1.0),  # IEC 60947-5-1 Table 4, from memory: DC-12 L/R 1 ms
        ("DC-14", 15.0 / LN20),  # IEC 60947-5-1 Table 4, from memory: DC-14 T0.95 15 ms
    ],
)
def test_category_tau_limit(category, tau_ms):
    assert category_tau_limit(category).to("ms").magnitude == pytest.approx(tau_ms)


@pytest.mark.parametrize("category", ["DC-13", "DC-6", "AC-15", "AC-1"])
def test_category_tau_limit_none(category):
    # DC-13 depends on the rated power (Table 4 note); DC-6 is a lamp test (no L/R)
    # (IEC 60947-4-1, from memory); AC categories have none (common practice).
    assert category_tau_limit(category) is None


def test_is_ac_category_and_has_dc_data():
    assert is_ac_category("AC-15") and is_ac_category("ac-1")
    assert not is_ac_category("DC-13")
    assert has_dc_data(DC13_TABLE) and has_dc_data(CURVE)
    assert not has_dc_data(one_row("AC-15", 230, 3))
    assert not has_dc_data(None)


# --- voltage between rated points ----------------------------------------------------


def test_exactly_at_a_rated_voltage_and_current():
    # Row DC-13 110 V 0.1 A read at 110 V exactly (parts.md: rated point); 0.1 A
    # equals the rating, so it is covered, margin 1.
    a = assess(DC13_TABLE, 110, 0.1, "DC-13", 5.0)
    assert a.status == "ok"
    assert a.used.source == "ratings" and a.used.rated_voltage == Q_(110, "V")
    assert amps(a.allowed_current) == pytest.approx(0.1)
    assert a.margin == pytest.approx(1.0)
    assert assess(DC13_TABLE, 110, 0.101, "DC-13", 5.0).status == "current-over"


def test_exactly_at_lower_rated_voltage_uses_that_row():
    # At 24 V the 24 V row applies (1 A), not the 110 V one (parts.md).
    a = assess(DC13_TABLE, 24, 0.9, "DC-13", 5.0)
    assert a.status == "ok" and amps(a.allowed_current) == pytest.approx(1.0)


def test_between_rated_voltages_uses_next_higher():
    # 48 V lies between 24 V (1 A) and 110 V (0.1 A): the 110 V current applies
    # (parts.md: next higher rated voltage, conservative), so 0.2 A is over.
    a = assess(DC13_TABLE, 48, 0.2, "DC-13", 5.0)
    assert a.status == "current-over"
    assert a.used.rated_voltage == Q_(110, "V")
    assert amps(a.allowed_current) == pytest.approx(0.1)
    assert a.margin == pytest.approx(0.5)


def test_below_lowest_rated_voltage_uses_lowest_row():
    # 12 V is below 24 V: the next higher rated point is 24 V 1 A (parts.md).
    a = assess(DC13_TABLE, 12, 1.0, "DC-13", 5.0)
    assert a.status == "ok" and amps(a.allowed_current) == pytest.approx(1.0)


def test_above_highest_rated_voltage_is_voltage_over():
    # parts.md: above the highest rated voltage there is no rating.
    a = assess(DC13_TABLE, 125, 0.01, "DC-13", 5.0)
    assert a.status == "voltage-over"
    assert a.used is None and a.allowed_current is None
    assert a.max_dc_voltage == Q_(110, "V")
    assert a.poles_needed is not None  # V/n per pole gets it back under 110 V


# --- dc_breaking_curve ---------------------------------------------------------------


def hand_loglog(v, v1, i1, v2, i2):
    # log-log interpolation, parts.md rule; power law between points:
    # I = I1·(V/V1)^(ln(I2/I1)/ln(V2/V1))
    return i1 * (v / v1) ** (math.log(i2 / i1) / math.log(v2 / v1))


@pytest.mark.parametrize(
    ("volts", "expected"),
    [
        (45, 3.2964),  # between 30 V 10 A and 60 V 1.5 A, hand calculation above
        (80, 0.89052),  # between 60 V 1.5 A and 110 V 0.5 A
        (165, 0.33333),  # 110 V 0.5 A .. 220 V 0.25 A is constant power: 55 W / 165 V
    ],
)
def test_curve_loglog_between_points(volts, expected):
    points = CURVE["dc_breaking_curve"]
    pairs = [(p["voltage"].magnitude, p["current"].magnitude) for p in points]
    lower = max(p for p in pairs if p[0] < volts)
    upper = min(p for p in pairs if p[0] > volts)
    allowed = interpolate_curve(points, Q_(volts, "V"))
    assert amps(allowed) == pytest.approx(hand_loglog(volts, *lower, *upper), rel=1e-9)
    assert amps(allowed) == pytest.approx(expected, rel=1e-4)


def test_curve_edges():
    points = CURVE["dc_breaking_curve"]
    # parts.md: below the lowest point its current; at a point its current;
    # above the highest point no rating.
    assert amps(interpolate_curve(points, Q_(12, "V"))) == pytest.approx(10.0)
    assert amps(interpolate_curve(points, Q_(60, "V"))) == pytest.approx(1.5)
    assert amps(interpolate_curve(points, Q_(220, "V"))) == pytest.approx(0.25)
    assert interpolate_curve(points, Q_(221, "V")) is None


def test_curve_covers_resistive_load():
    # A DC-12 (resistive control) load on the curve: 80 V -> 0.8905 A allowed
    # (log-log, parts.md); curve L/R limit 1 ms (IEC 60947-5-1 Table 4 DC-12).
    a = assess(CURVE, 80, 0.85, "DC-12", 0.0)
    assert a.status == "ok" and not a.category_mismatch
    assert a.used.source == "dc_breaking_curve"
    assert amps(a.allowed_current) == pytest.approx(0.89052, rel=1e-4)
    assert any("resistive" in n for n in a.notes)
    assert assess(CURVE, 80, 0.9, "DC-12", 0.0).status == "current-over"


def test_curve_alone_for_a_coil_is_category_mismatch():
    # The curve is resistive (DC-1/DC-12, L/R <= 1 ms, parts.md): a DC-13 coil of
    # L/R 10 ms proceeds on it, flagged twice.
    a = assess(CURVE, 60, 0.5, "DC-13", 10.0)
    assert a.status == "ok"
    assert a.category_mismatch and a.time_constant_over
    assert a.used.tau_limit == Q_(1, "ms")


def test_curve_does_not_stand_in_for_a_dc13_row():
    # DC-13 table + curve: a DC-13 load at 60 V must use the DC-13 110 V 0.1 A row,
    # not the 1.5 A the resistive curve gives (category coverage, parts.md).
    both = {**DC13_TABLE, **CURVE}
    a = assess(both, 60, 0.5, "DC-13", 10.0)
    assert a.status == "current-over" and not a.category_mismatch
    assert a.used.category == "DC-13"
    assert amps(a.allowed_current) == pytest.approx(0.1)


def test_curve_chosen_when_most_favourable_for_resistive_load():
    # DC-12 load at 60 V: DC-13 covers DC-12 (parts.md) but allows 0.1 A (next
    # higher row); the curve allows 1.5 A and also covers it: the curve is used.
    both = {**DC13_TABLE, **CURVE}
    a = assess(both, 60, 1.2, "DC-12", 0.0)
    assert a.status == "ok" and a.used.source == "dc_breaking_curve"
    assert amps(a.allowed_current) == pytest.approx(1.5)


def test_voltage_max_caps_a_curve():
    # contacts.voltage_max is the per-pole switching limit (parts.md): a curve
    # reaching 300 V is not read above a 250 V voltage_max.
    c = contacts("""
        voltage_max: 250 V
        dc_breaking_curve:
          - {voltage: 110 V, current: 0.5 A}
          - {voltage: 300 V, current: 0.2 A}
    """)
    assert assess(c, 240, 0.1, "DC-12", 0.0).status == "ok"
    a = assess(c, 260, 0.1, "DC-12", 0.0)
    assert a.status == "voltage-over" and a.max_dc_voltage == Q_(250, "V")


# --- time constant -------------------------------------------------------------------


def test_we1_coil_within_dc13_rating():
    # WE-1: 24 V, 48 ohm, 0.48 H: I = 0.5 A, L/R 10 ms, T0.95 29.96 ms; a DC-13
    # 24 V 0.5 A rating tests at 6·12 W = 72 ms (IEC 60947-5-1 Table 4) -> covered.
    c = one_row("DC-13", 24, 0.5)
    a = assess(c, 24, 24 / 48, "DC-13", 0.48 / 48 * 1000)
    assert a.status == "ok" and not a.time_constant_over
    assert a.used.t95_limit.to("ms").magnitude == pytest.approx(72.0)
    assert a.margin == pytest.approx(1.0)


@pytest.mark.parametrize(
    ("volts", "amps_rated", "t95_ms"),
    [
        (110, 0.5, 300.0),  # WE-2a: cap 300 ms (IEC 60947-5-1 Table 4 note)
        (220, 0.1, 132.0),  # WE-2b: 6·22 W = 132 ms (same clause)
        (24, 2.0, 288.0),  # WE-2c: 6·48 W = 288 ms (same clause)
    ],
)
def test_dc13_limit_edges(volts, amps_rated, t95_ms):
    # A load at exactly the test T0.95 is covered; 0.1 % above it is not.
    c = one_row("DC-13", volts, amps_rated)
    tau_at_limit = t95_ms / LN20
    at = assess(c, volts, amps_rated / 2, "DC-13", tau_at_limit)
    over = assess(c, volts, amps_rated / 2, "DC-13", tau_at_limit * 1.001)
    assert at.status == over.status == "ok"
    assert not at.time_constant_over
    assert over.time_constant_over
    assert any("exceeds" in n for n in over.notes)


@pytest.mark.parametrize(
    ("category", "limit_ms"),
    [
        ("DC-1", 1.0),  # IEC 60947-4-1, from memory: DC-1 L/R 1 ms
        ("DC-3", 2.0),  # IEC 60947-4-1, from memory: DC-3 L/R 2 ms
        ("DC-5", 7.5),  # IEC 60947-4-1, from memory: DC-5 L/R 7.5 ms
        ("DC-12", 1.0),  # IEC 60947-5-1 Table 4, from memory: DC-12 L/R 1 ms
        ("DC-14", 15.0 / LN20),  # IEC 60947-5-1 Table 4, from memory: DC-14 T0.95 15 ms
    ],
)
def test_fixed_time_constant_edges(category, limit_ms):
    c = one_row(category, 48, 10)
    assert not assess(c, 48, 5, category, limit_ms).time_constant_over
    assert assess(c, 48, 5, category, limit_ms * 1.01).time_constant_over
    assert not assess(c, 48, 5, category, 0.0).time_constant_over  # resistive


def test_unknown_time_constant_is_reported_missing():
    # "A value missing is never guessed silently" (parts.md): status still decided.
    a = assess(DC13_TABLE, 24, 0.5, "DC-13", None)
    assert a.status == "ok" and not a.time_constant_over
    assert "load time constant" in a.missing


# --- categories ----------------------------------------------------------------------


def test_dc13_rating_covers_dc12_load():
    # parts.md: DC-13 covers DC-12.
    a = assess(DC13_TABLE, 24, 0.8, "DC-12", 0.5)
    assert a.status == "ok" and not a.category_mismatch


def test_dc12_rating_for_dc13_load_is_mismatch_and_proceeds():
    # parts.md: the load needs DC-13, only DC-12 rated -> category-mismatch; the
    # check proceeds with the weaker rating (24 V 2 A) and says so.
    c = one_row("DC-12", 24, 2)
    a = assess(c, 24, 1.5, "DC-13", 10.0)
    assert a.category_mismatch and a.status == "ok"
    assert amps(a.allowed_current) == pytest.approx(2.0)
    assert a.time_constant_over  # DC-12 tests at L/R 1 ms (IEC 60947-5-1 Table 4)
    assert any("weaker" in n for n in a.notes)
    assert assess(c, 24, 2.5, "DC-13", 10.0).status == "current-over"


@pytest.mark.parametrize(
    ("rated", "needed", "mismatch"),
    [
        ("DC-5", "DC-3", False),  # parts.md: DC-5 covers DC-3
        ("DC-5", "DC-1", False),  # parts.md: DC-5 covers DC-1
        ("DC-3", "DC-1", False),  # parts.md: DC-3 covers DC-1
        ("DC-1", "DC-3", True),  # weaker than needed
        ("DC-3", "DC-5", True),  # weaker than needed
    ],
)
def test_power_category_coverage(rated, needed, mismatch):
    c = one_row(rated, 110, 10)
    assert assess(c, 110, 5, needed, 0.5).category_mismatch is mismatch


def test_weaker_category_only_at_this_voltage():
    # DC-13 rated only up to 24 V; at 110 V only DC-1 is rated: the check proceeds
    # with DC-1 110 V 3 A (parts.md: weaker rating, said so), L/R 1 ms exceeded.
    c = contacts("""
        ratings:
          - {category: DC-13, voltage: 24 V, current: 1 A}
          - {category: DC-1, voltage: 110 V, current: 3 A}
    """)
    a = assess(c, 110, 0.2, "DC-13", 10.0)
    assert a.status == "ok" and a.category_mismatch and a.time_constant_over
    assert a.used.category == "DC-1"


def test_ac_only_contact():
    # parts.md: AC categories never cover a DC circuit, however large.
    c = contacts("""
        ratings:
          - {category: AC-15, voltage: 230 V, current: 3 A}
          - {category: AC-1, voltage: 250 V, current: 8 A}
    """)
    a = assess(c, 24, 0.01, "DC-12", 0.0)
    assert a.status == "ac-only" and a.used is None and a.allowed_current is None


@pytest.mark.parametrize("data", [None, {}, {"form": "single-break"}])
def test_no_data(data):
    a = assess(data, 24, 0.5, "DC-13", 10.0)
    assert a.status == "no-data" and a.missing and a.used is None


def test_missing_current_is_no_data_but_reports_the_rating():
    a = assess(DC13_TABLE, 24, None, "DC-13", 10.0)
    assert a.status == "no-data" and "breaking current" in a.missing
    assert amps(a.allowed_current) == pytest.approx(1.0)


def test_statuses_are_the_documented_set():
    assert set(STATUSES) == {"ok", "no-data", "ac-only", "voltage-over", "current-over"}


# --- breaking power ("W at L/R", IEC 60255-1 practice) ------------------------------

POWER_50W = contacts("""
    voltage_max: 250 V
    breaking_power:
      - {power: 50 W, time_constant: 40 ms, voltage_max: 250 V}
""")


@pytest.mark.parametrize(
    ("volts", "expected"),
    [
        (110, 0.4545),  # WE-11: 50 W / 110 V (IEC 60255-1 practice)
        (125, 0.400),  # WE-11: 50 W / 125 V
        (48, 1.042),  # WE-11: 50 W / 48 V
        (250, 0.200),  # WE-11: 50 W / 250 V, at voltage_max
    ],
)
def test_breaking_power_allowed_current(volts, expected):
    a = assess(POWER_50W, volts, expected * 0.99, "DC-13", 15.0)
    assert a.status == "ok" and a.used.source == "breaking_power"
    assert amps(a.allowed_current) == pytest.approx(expected, rel=1e-3)
    assert assess(POWER_50W, volts, expected * 1.01, "DC-13", 15.0).status == (
        "current-over"
    )


def test_breaking_power_time_constant():
    # WE-11: L/R 40 ms <=> T0.95 119.8 ms; a 60 ms load is outside the rating even
    # at a lower current.
    ok = assess(POWER_50W, 110, 0.2, "DC-13", 40.0)
    assert not ok.time_constant_over
    # 3 x 40 ms by the spec's convention (119.8 ms with ln 20).
    assert ok.used.t95_limit.to("ms").magnitude == pytest.approx(120.0, rel=1e-9)
    over = assess(POWER_50W, 110, 0.2, "DC-13", 60.0)
    assert over.status == "ok" and over.time_constant_over


def test_breaking_power_above_voltage_max():
    a = assess(POWER_50W, 260, 0.1, "DC-13", 15.0)
    assert a.status == "voltage-over" and a.max_dc_voltage == Q_(250, "V")


def test_applicable_by_time_constant_before_current():
    # Choice pinned here: a rating whose time-constant test the load meets is
    # preferred to a larger one whose test it exceeds. DC-13 110 V 0.5 A (T0.95
    # capped 300 ms, IEC 60947-5-1 Table 4) vs 100 W at L/R 20 ms (0.909 A).
    c = contacts("""
        ratings:
          - {category: DC-13, voltage: 110 V, current: 0.5 A}
        breaking_power:
          - {power: 100 W, time_constant: 20 ms, voltage_max: 250 V}
    """)
    a = assess(c, 110, 0.4, "DC-13", 50.0)
    assert a.status == "ok" and a.used.source == "ratings" and not a.time_constant_over
    b = assess(c, 110, 0.4, "DC-13", 15.0)  # both apply: the larger allowance wins
    assert b.used.source == "breaking_power"
    assert amps(b.allowed_current) == pytest.approx(100 / 110)


# --- series poles --------------------------------------------------------------------

# The series rows of the parts.md example, with its per-pole data.
SERIES = contacts("""
    voltage_max: 250 V
    ratings:
      - {category: DC-13, voltage: 24 V, current: 1 A}
      - {category: DC-13, voltage: 110 V, current: 0.1 A}
    series:
      - {poles: 2, category: DC-1, voltage: 110 V, current: 2 A}
      - {poles: 3, category: DC-1, voltage: 220 V, current: 2 A}
""")


def test_two_pole_series_row_used():
    # parts.md: with n poles in series use the series row for n.
    a = assess(SERIES, 110, 1.5, "DC-1", 0.5, poles=2)
    assert a.status == "ok" and not a.assumed_series
    assert a.used.source == "series" and a.used.poles == 2
    assert amps(a.allowed_current) == pytest.approx(2.0)


def test_series_row_voltage_over_and_poles_needed():
    # 220 V 1.5 A: two poles are rated to 110 V only -> voltage-over; the 3-pole
    # row 220 V 2 A covers it, so 3 poles are needed (parts.md series rows).
    a = assess(SERIES, 220, 1.5, "DC-1", 0.5, poles=2)
    assert a.status == "voltage-over" and a.max_dc_voltage == Q_(110, "V")
    assert a.poles_needed == 3
    three = assess(SERIES, 220, 1.5, "DC-1", 0.5, poles=3)
    assert three.status == "ok" and three.poles_needed == 3


def test_three_poles_without_row_assumes_v_over_n():
    # parts.md: without a series row for n, each pole is assumed to see V/n and
    # the finding says the series rating was assumed, not rated.
    c = contacts("""
        ratings:
          - {category: DC-1, voltage: 24 V, current: 32 A}
          - {category: DC-1, voltage: 48 V, current: 10 A}
          - {category: DC-1, voltage: 110 V, current: 3 A}
        series:
          - {poles: 2, category: DC-1, voltage: 110 V, current: 12 A}
    """)
    a = assess(c, 110, 8, "DC-1", 0.5, poles=3)
    assert a.assumed_series and a.used.source == "per-pole"
    assert a.used.basis == "ratings"
    # 110 V / 3 = 36.7 V per pole -> next higher row 48 V 10 A (parts.md)
    assert a.used.pole_voltage.to("V").magnitude == pytest.approx(110 / 3)
    assert amps(a.allowed_current) == pytest.approx(10.0)
    assert a.status == "ok"
    assert a.max_dc_voltage == Q_(330, "V")  # 3 × 110 V per pole
    assert any("assumed" in n for n in a.notes)


def test_series_row_is_used_even_where_the_assumption_would_pass():
    # Illustrative 3-pole contactor: 2-pole row 48 V 20 A; a heater at 48 V 24.9 A.
    # The V/2 assumption would give 24 V per pole (32 A) but the series row rules
    # (parts.md), so it is over; 3 poles (48 V 32 A) would do.
    c = contacts("""
        ratings:
          - {category: DC-1, voltage: 24 V, current: 32 A}
          - {category: DC-1, voltage: 48 V, current: 10 A}
        series:
          - {poles: 2, category: DC-1, voltage: 48 V, current: 20 A}
          - {poles: 3, category: DC-1, voltage: 48 V, current: 32 A}
    """)
    a = assess(c, 48, 24.9, "DC-1", 0.0, poles=2)
    assert a.status == "current-over" and not a.assumed_series
    assert amps(a.allowed_current) == pytest.approx(20.0)
    assert a.margin == pytest.approx(20 / 24.9)
    assert a.poles_needed == 3


def test_series_rating_in_ratings_rows_with_poles():
    # The schema lets a ratings row name its poles; such a row is a series row.
    c = contacts("""
        ratings:
          - {category: DC-1, voltage: 110 V, current: 3 A}
          - {category: DC-1, voltage: 220 V, current: 5 A, poles: 2}
    """)
    a = assess(c, 220, 4, "DC-1", 0.5, poles=2)
    assert a.status == "ok" and a.used.source == "series" and not a.assumed_series


def test_series_category_coverage_applies():
    # The 2-pole row is DC-1: a DC-13 coil on it is a category mismatch (parts.md).
    a = assess(SERIES, 110, 1.0, "DC-13", 10.0, poles=2)
    assert a.category_mismatch and a.time_constant_over and a.status == "ok"


def test_poles_needed_none_when_nothing_works():
    a = assess(DC13_TABLE, 110, 50.0, "DC-13", 5.0)
    assert a.status == "current-over" and a.poles_needed is None
    kwargs = {"voltage": Q_(110, "V"), "current": Q_(50, "A"), "needed": "DC-13"}
    assert poles_needed(DC13_TABLE, **kwargs, max_poles=MAX_POLES) is None


def test_poles_must_be_positive():
    with pytest.raises(ValueError):
        assess(DC13_TABLE, 24, 0.5, "DC-13", 5.0, poles=0)


# --- pilot-duty-style table (WE-10) --------------------------------------------------

# Q300-like rows read as DC-13 (UL 508 / NEMA ICS 5 DC pilot duty: 0.55 A at 125 V,
# 0.27 A at 250 V); R300-like rows 0.22 A / 0.11 A.
Q300_LIKE = contacts("""
    ratings:
      - {category: DC-13, voltage: 125 V, current: 0.55 A}
      - {category: DC-13, voltage: 250 V, current: 0.27 A}
""")
R300_LIKE = contacts("""
    ratings:
      - {category: DC-13, voltage: 125 V, current: 0.22 A}
      - {category: DC-13, voltage: 250 V, current: 0.11 A}
""")


def test_pilot_duty_40w_coil_at_110v():
    # WE-10: 40 W / 110 V = 0.364 A <= 0.55 A (next higher point 125 V, parts.md).
    a = assess(Q300_LIKE, 110, 40 / 110, "DC-13", 20.0)
    assert a.status == "ok" and amps(a.allowed_current) == pytest.approx(0.55)
    assert a.margin == pytest.approx(0.55 / 0.3636, rel=1e-3)


def test_pilot_duty_40w_coil_at_220v():
    # WE-10: 40 W / 220 V = 0.182 A <= 0.27 A (250 V point): OK; with the R300-like
    # rows (0.11 A at 250 V) it is underrated.
    q = assess(Q300_LIKE, 220, 40 / 220, "DC-13", 20.0)
    assert q.status == "ok" and amps(q.allowed_current) == pytest.approx(0.27)
    r = assess(R300_LIKE, 220, 40 / 220, "DC-13", 20.0)
    assert r.status == "current-over" and amps(r.allowed_current) == pytest.approx(0.11)
    assert r.margin == pytest.approx(0.11 / 0.1818, rel=1e-3)
