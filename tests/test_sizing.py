"""Suppression sizing: ratings, rules of thumb and the transients behind each option."""

from __future__ import annotations

import dataclasses
import math

import pytest

from netcheck.analysis.snubber import (
    capacitance_for_peak,
    capacitance_for_slew,
    common_practice_rc,
    common_practice_rc_product,
)
from netcheck.errors import ConfigError, InputError, QuantityError
from netcheck.sizing import margin_defaults, size_load
from netcheck.units import Q_


def magnitude(value, unit):
    return float(value.to(unit).magnitude)


def option(result, kind):
    return next(o for o in result.options if o.kind == kind)


def component(opt, name, unit):
    return magnitude(next(c.value for c in opt.components if c.name == name), unit)


COIL = {
    "voltage": Q_(24, "V"),
    "resistance": Q_(48, "ohm"),
    "inductance": Q_(0.48, "H"),
}


# --- RC rules ------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("e", "i", "c_uf", "r_power", "r_product"),
    [
        # Common practice "I²/10" rule (film-capacitor catalogue), both algebraic
        # readings; worked-example values WE-3 (a), (b), (c). (b)'s product form
        # matches the "about 76 ohm" printed in an instrument manual.
        (24, 0.5, 0.025, 20.34, 1.557),
        (110, 0.1, 0.001, 313.3, 75.62),
        (220, 1.0, 0.1, 22.0, 17.93),
    ],
)
def test_common_practice_rule_both_readings(e, i, c_uf, r_power, r_product):
    c, r = common_practice_rc(Q_(e, "V"), Q_(i, "A"))
    c2, r2 = common_practice_rc_product(Q_(e, "V"), Q_(i, "A"))
    assert magnitude(c, "uF") == pytest.approx(c_uf, rel=1e-9)
    assert magnitude(c2, "uF") == pytest.approx(c_uf, rel=1e-9)
    assert magnitude(r, "ohm") == pytest.approx(r_power, rel=1e-3)
    assert magnitude(r2, "ohm") == pytest.approx(r_product, rel=1e-3)


def test_energy_balance_and_slew_capacitance():
    # RC-network data sheet rules: C >= L*(I/300 V)^2 and C >= I * 1 µF/A;
    # worked-example values WE-4a: 1.333 µF and 0.5 µF for L = 0.48 H, I = 0.5 A.
    c = capacitance_for_peak(Q_(0.48, "H"), Q_(0.5, "A"), Q_(300, "V"))
    assert magnitude(c, "uF") == pytest.approx(1.3333, rel=1e-4)
    assert magnitude(capacitance_for_slew(Q_(0.5, "A")), "uF") == pytest.approx(0.5)


def test_capacitance_with_supply_gives_the_peak_limit_exactly():
    # With the supply in the loop the exact undamped peak is Vs + sqrt(Vs^2 + I^2 L/C)
    # (energy conservation, as WE-4b); the C returned must make it equal the limit.
    c = magnitude(
        capacitance_for_peak(Q_(2, "H"), Q_(0.2, "A"), Q_(300, "V"), Q_(110, "V")), "F"
    )
    assert 110 + math.sqrt(110**2 + 0.04 * 2 / c) == pytest.approx(300, rel=1e-12)
    assert (
        capacitance_for_peak(Q_(2, "H"), Q_(0.2, "A"), Q_(300, "V"), Q_(150, "V"))
        is None
    )


# --- size_load -----------------------------------------------------------------------


def test_load_summary_of_spec_example():
    # cli.md example 110 V / 440 ohm / 2.1 H; first principles: I = V/R = 0.25 A,
    # tau = L/R = 4.773 ms, W = L*I^2/2 = 65.63 mJ; release default 10 % of I.
    result = size_load(Q_(110, "V"), Q_(440, "ohm"), Q_(2.1, "H"))
    assert magnitude(result.load.current, "A") == pytest.approx(0.25)
    assert magnitude(result.load.time_constant, "ms") == pytest.approx(4.7727, rel=1e-4)
    assert magnitude(result.load.energy, "J") == pytest.approx(0.065625)
    assert magnitude(result.load.release_current, "mA") == pytest.approx(25)
    assert [o.kind for o in result.options] == [
        "diode",
        "diode-zener",
        "varistor",
        "tvs",
        "rc",
    ]


def test_diode_ratings_worked_example():
    # WE-12: 110 V coil drawing 0.364 A. PIV >= 2 x (electronics rule, the default)
    # = 220 V, or 10 x circuit voltage (conservative relay-maker rule) = 1100 V;
    # IF >= 0.364 A.
    resistance = Q_(110 / 0.364, "ohm")
    default = option(size_load(Q_(110, "V"), resistance, Q_(1, "H")), "diode")
    assert component(default, "reverse_voltage", "V") == pytest.approx(220)
    assert component(default, "forward_current", "A") == pytest.approx(0.364)
    ten = option(
        size_load(
            Q_(110, "V"), resistance, Q_(1, "H"), margins={"diode-reverse-voltage": 10}
        ),
        "diode",
    )
    assert component(ten, "reverse_voltage", "V") == pytest.approx(1100)


def test_varistor_voltage_worked_example():
    # WE-12: V_1mA >= 1.2/(0.85*0.9) x V = 1.5686 x 24 V = 37.6 V (varistor rule).
    varistor = option(size_load(**COIL, clamp=Q_(60, "V")), "varistor")
    assert component(varistor, "varistor_voltage", "V") == pytest.approx(
        37.65, abs=0.01
    )
    assert margin_defaults()["varistor-voltage"] == pytest.approx(1.5686, rel=1e-4)


def test_diode_option_follows_rl_decay():
    # First-principles RL decay against the diode drop (KVL), WE-5 values with
    # Vf = 0.7 V, Id = 0.1 A: 15.02 ms and 24.7 V at the contact.
    result = size_load(**COIL, vf=Q_(0.7, "V"), release_current=Q_(0.1, "A"))
    diode = option(result, "diode")
    assert magnitude(diode.release_time, "ms") == pytest.approx(15.02, rel=1e-3)
    assert magnitude(diode.peak_voltage, "V") == pytest.approx(24.7)
    zener = option(result, "diode-zener")  # clamp defaults to the supply: 24 V zener
    assert magnitude(zener.release_time, "ms") == pytest.approx(5.013, rel=1e-3)
    assert magnitude(zener.peak_voltage, "V") == pytest.approx(48.7)


def test_zener_energy_is_its_share_with_margin():
    zener = option(size_load(**COIL, clamp=Q_(30, "V")), "diode-zener")
    total = magnitude(zener.clamp_energy, "J")  # diode and zener together
    share = total * 30 / 30.9  # same charge through both: energy splits as voltages
    assert component(zener, "zener_energy", "J") == pytest.approx(1.5 * share)
    assert component(zener, "zener_voltage", "V") == pytest.approx(30)


def test_clamp_energy_worked_example_through_sizing():
    # WE-6 (first-principles clamp energy across the load): 40 V clamp, 0.04333 J.
    tvs = option(size_load(**COIL, clamp=Q_(40, "V")), "tvs")
    assert magnitude(tvs.clamp_energy, "J") == pytest.approx(0.04333, rel=1e-4)
    assert component(tvs, "energy", "J") == pytest.approx(1.5 * 0.043332, rel=1e-4)
    assert component(tvs, "standoff_voltage", "V") == pytest.approx(24)


def test_low_clamp_is_flagged_for_varistor_and_tvs():
    result = size_load(**COIL)  # clamp defaults to the 24 V supply
    assert any("V_1mA" in note for note in option(result, "varistor").notes)
    assert any("stand-off" in note for note in option(result, "tvs").notes)
    high = size_load(**COIL, clamp=Q_(60, "V"))
    assert not any("V_1mA" in note for note in option(high, "varistor").notes)
    assert not any("stand-off must" in note for note in option(high, "tvs").notes)


def test_rc_option_meets_its_own_limits():
    rc = option(size_load(**COIL), "rc")
    c = component(rc, "capacitance", "F")
    # larger of the two rules (values as in WE-4a, with the supply in the loop)
    by_peak = 0.48 * 0.25 / ((300 - 24) ** 2 - 24**2)
    assert c == pytest.approx(max(by_peak, 0.5e-6), rel=1e-12)
    # damping by the coil and Rs keeps the computed peak below the undamped limit
    assert magnitude(rc.peak_voltage, "V") <= 300
    assert component(rc, "resistance", "ohm") == pytest.approx(48)  # Vs/I0 = R_load
    assert component(rc, "capacitor_voltage", "V") >= 1.5 * 24
    assert component(rc, "common_practice_resistance", "ohm") == pytest.approx(
        20.34, rel=1e-3
    )


def test_rc_resistance_follows_surge_current():
    rc = option(size_load(**COIL, surge_current=Q_(2, "A")), "rc")
    assert component(rc, "resistance", "ohm") == pytest.approx(12)  # 24 V / 2 A


def test_rc_peak_limit_out_of_reach_uses_slew_rule():
    rc = option(size_load(Q_(200, "V"), Q_(400, "ohm"), Q_(2, "H")), "rc")
    assert component(rc, "capacitance", "uF") == pytest.approx(0.5)  # 0.5 A x 1 µF/A
    assert any("out of reach" in note for note in rc.notes)


@pytest.mark.parametrize(
    ("change", "error"),
    [
        ({"resistance": Q_(-4, "ohm")}, QuantityError),
        ({"inductance": Q_(0, "H")}, QuantityError),
        ({"voltage": Q_(24, "A")}, QuantityError),
        ({"release_current": Q_(-1, "mA")}, QuantityError),
        ({"margins": {"diode-reverse": 2.0}}, ConfigError),
        ({"margins": {"diode-current": -1}}, ConfigError),
    ],
)
def test_bad_inputs_are_input_errors(change, error):
    with pytest.raises(error) as caught:
        size_load(**{**COIL, **change})
    assert isinstance(caught.value, InputError)
    assert caught.value.render().startswith("netcheck: error: ")


def test_results_are_frozen():
    result = size_load(**COIL)
    with pytest.raises(dataclasses.FrozenInstanceError):
        result.options[0].kind = "other"  # type: ignore[misc]
    with pytest.raises(dataclasses.FrozenInstanceError):
        result.load.current = Q_(1, "A")  # type: ignore[misc]


def test_release_current_above_steady_gives_zero_release_time():
    result = size_load(**COIL, release_current=Q_(1, "A"))
    assert all(magnitude(o.release_time, "s") == 0.0 for o in result.options)
