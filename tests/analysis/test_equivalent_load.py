"""Several inductive loads on one element act as one equivalent load.

Same total current and same total stored energy: I = ΣI_k, E = Σ½·L_k·I_k²,
L_eq = 2·E/I², R_eq = V/I (energy and KCL; hand calculation below).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from netcheck.analysis.opening import element_load
from netcheck.pipeline import analyse_path

CASE = (
    Path(__file__).parents[1]
    / "cases/inductive-load-unsuppressed/bad-two-loads-sum-of-energies.cnet"
)


def test_two_loads_give_the_equivalent_inductance() -> None:
    _, analysis = analyse_path(CASE)
    element = analysis.elements["K1:13-14"]
    load = element_load(element)
    assert load is not None
    # Y1: 0.5 A, 0.06 J (WE-1); Y2: 0.25 A, ½ x 2.4 H x 0.0625 = 0.075 J.
    # I = 0.75 A; E = 0.135 J; L_eq = 0.27 / 0.5625 = 0.48 H; R_eq = 24/0.75 = 32 ohm.
    assert load.current.to("A").magnitude == pytest.approx(0.75, rel=1e-9)
    assert load.energy.to("J").magnitude == pytest.approx(0.135, rel=1e-9)
    assert load.facts.inductance.to("H").magnitude == pytest.approx(0.48, rel=1e-9)
    assert load.facts.resistance.to("ohm").magnitude == pytest.approx(32.0, rel=1e-9)
    # tau_eq = 0.48 H / 32 ohm = 15 ms
    assert load.facts.time_constant.to("ms").magnitude == pytest.approx(15.0, rel=1e-9)
