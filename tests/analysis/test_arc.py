"""The arc-sustain screening against the facts sheet's worked examples."""

from __future__ import annotations

import numpy as np
import pytest

from netcheck.analysis.arc import MIN_ARC, ayrton_margin, ayrton_voltage, estimate


def test_minimum_arc_values_are_the_handbook_table() -> None:
    # Holm's values as a contact-protection data sheet reproduces them
    # (facts sheet 6): Ag 12 V / 0.4 A, Au 15 V / 0.4 A, Pd 16 V / 0.8 A,
    # Pt 17.5 V / 0.7 A.
    assert MIN_ARC["Ag"] == (12.0, 0.40)
    assert MIN_ARC["Au"] == (15.0, 0.40)
    assert MIN_ARC["Pd"] == (16.0, 0.80)
    assert MIN_ARC["Pt"] == (17.5, 0.70)


@pytest.mark.parametrize(
    ("voltage", "current", "inductive", "sustained"),
    [
        (24.0, 0.3, False, False),  # WE-14: I < Im
        (24.0, 1.0, False, True),  # WE-14: V > Um and I > Im
        (9.0, 5.0, False, False),  # WE-14: V < Um
        (5.7, 0.5, False, False),  # WE-14: 5 V coil + diode, 5.7 V < 12 V
        (5.0, 0.5, True, True),  # unclamped kick exceeds Um: only Im counts
    ],
)
def test_screening_matches_the_worked_example(
    voltage: float, current: float, inductive: bool, sustained: bool
) -> None:
    assert estimate(voltage, current, 1, "Ag", inductive).sustained is sustained


def test_series_breaks_multiply_the_minimum_arc_voltage() -> None:
    # Two breaks need 2 x 12 V = 24 V: 20 V / 1 A no longer holds an arc.
    assert estimate(20.0, 1.0, 1, "Ag", False).sustained
    assert not estimate(20.0, 1.0, 2, "Ag", False).sustained


def test_unlisted_material_is_taken_as_silver_and_says_so() -> None:
    result = estimate(24.0, 1.0, 1, "AgSnO2", False)
    assert result.assumed_material and (result.um, result.im) == (12.0, 0.4)


def test_ayrton_voltage_worked_example() -> None:
    # WE-9: V(10 A, 2 mm) = 38.88 + 4.148 + 3.274 = 46.302 V.
    assert ayrton_voltage(10.0, 2.0) == pytest.approx(46.302, abs=1e-3)


@pytest.mark.parametrize(
    ("emf", "r", "n", "margin"),
    [
        (48, 4.8, 1, 20.10),  # WE-9 rows: f_min = a - E + 2 sqrt(c R)
        (110, 11, 1, -29.02),
        (110, 11, 2, 29.73),
        (220, 22, 2, -58.03),
        (220, 22, 3, 2.05),
    ],
)
def test_ayrton_load_line_margin(emf: float, r: float, n: int, margin: float) -> None:
    assert ayrton_margin(emf, r, n, 2.0) == pytest.approx(margin, abs=0.02)
    # Brute force over the load line as an independent check of the closed form.
    current = np.linspace(1e-3, emf / r, 200_001)
    brute = n * ayrton_voltage(current, 2.0) - (emf - current * r)
    assert brute.min() == pytest.approx(ayrton_margin(emf, r, n, 2.0), abs=1e-3)
