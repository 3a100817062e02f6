"""The nodal solver's own paths give what numpy's LU solve gives, bit for bit."""

from __future__ import annotations

import random

import numpy as np
import pytest

from netcheck.analysis import circuit
from netcheck.analysis.circuit import Diode, Resistor, solve_dc


def _numpy(matrix: list[list[float]], rhs: list[float]) -> list[float]:
    return [float(v) for v in circuit._solve_dense(np.array(matrix), np.array(rhs))]


def test_one_unknown_is_the_division_lapack_does():
    # LAPACK's getrf/getrs on a 1x1 system divide once; the closed form must
    # match on conductances and currents over 26 decades (both signs).
    rng = random.Random(12)
    for _ in range(20000):
        a = rng.uniform(-1.0, 1.0) * 10 ** rng.uniform(-13, 13)
        b = rng.uniform(-1.0, 1.0) * 10 ** rng.uniform(-13, 13)
        assert circuit._solve([[a]], [b]) == _numpy([[a]], [b])


@pytest.mark.parametrize(
    ("matrix", "rhs"),
    [([[0.0]], [1.0]), ([[1e-300]], [1e300]), ([[2.0, 1.0], [1.0, 3.0]], [1.0, 2.0])],
)
def test_singular_overflowing_and_larger_systems_take_numpys_path(matrix, rhs):
    assert list(circuit._solve(matrix, rhs)) == _numpy(matrix, rhs)


def test_a_rung_solves_to_ohms_law():
    # 24 V across 100 ohm + 20 ohm in series: 0.2 A, 4 V across the lower one
    # (Ohm's law; one unknown node).
    solution = solve_dc(
        ["P", "M", "N"],
        {"P": 24.0, "N": 0.0},
        [Resistor("R1", "P", "M", 100.0), Resistor("R2", "M", "N", 20.0)],
        [Diode("D1", "N", "M", 0.7)],
    )
    assert solution.potentials["M"] == pytest.approx(4.0)
    assert solution.currents["R1"] == pytest.approx(0.2)
    assert solution.diode_state["D1"] == "off"
