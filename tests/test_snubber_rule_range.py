"""The empirical I²/10 RC rule outside its range gives no R, never a traceback."""

import math

from netcheck.analysis.snubber import common_practice_rc
from netcheck.cli import main
from netcheck.units import Q_


def test_power_form_inside_its_range() -> None:
    # Common practice: C = I²/10 µF, R = E/(10·I^(1+50/E)); at 110 V and 1 A the
    # power form gives R = 110/10 = 11 ohm (1 A to any power is 1).
    capacitance, resistance = common_practice_rc(Q_(110, "V"), Q_(1, "A"))
    assert math.isclose(capacitance.to("uF").magnitude, 0.1)
    assert resistance is not None
    assert math.isclose(resistance.to("ohm").magnitude, 11.0)


def test_power_form_out_of_range_gives_no_resistance() -> None:
    # At 0.1 V the exponent is 501: 0.025 A ** 501 underflows to zero.
    _, resistance = common_practice_rc(Q_(0.1, "V"), Q_(0.025, "A"))
    assert resistance is None


def test_size_on_a_tiny_load_does_not_crash(capsys) -> None:
    code = main(
        ["size", "--voltage", "0.1V", "--resistance", "4ohm", "--inductance", "2uH"]
    )
    assert code == 0
    assert "out of its range" in capsys.readouterr().out
