"""The suppressors fitted to a design, as the analysis hands them to the checks.

The opening transient of a fitted freewheel diode keeps its waveforms, and
they agree with the closed form it came from: i(t) of a coil freewheeling
through a diode of forward drop Vf decays as (I0 + Vf/R)·exp(-t·R/L) - Vf/R
(first-order RL circuit, KVL round the coil and diode; any circuits text).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from netcheck.analysis.constants import SILICON_RECTIFIER_VF
from netcheck.analysis.fitted import fitted_suppressors, service_voltages
from tests.helpers import net

DESIGN = """\
supply  G1  dc=24V  earth=minus  +:L+  -:M
relay   K1  part=relay  13:L+  14:N1
load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
diode   D1  A:M  K:N1
"""
RELAY = """\
relay:
  kind: relay
  contacts:
    form: single-break
    ratings:
      - {category: DC-13, voltage: 24 V, current: 1 A}
"""


def test_a_fitted_diode_keeps_its_opening_waveforms(tmp_path: Path) -> None:
    _, analysis = net(tmp_path, DESIGN, RELAY)
    fitted = fitted_suppressors(analysis)
    assert [f.suppressor.refs for f in fitted] == [("D1",)]
    opening = fitted[0].opening
    assert opening is not None
    t = opening.t.to("s").magnitude
    i = opening.i_load.to("A").magnitude
    assert t.shape == i.shape and t.size > 10
    r, l_h, i0, vf = 48.0, 0.48, 0.5, SILICON_RECTIFIER_VF
    expected = np.maximum((i0 + vf / r) * np.exp(-t * r / l_h) - vf / r, 0.0)
    assert np.allclose(i, expected, atol=1e-9 * i0)
    # The release time the checks report is where that waveform falls to 10 %.
    release = opening.release_time.to("s").magnitude
    assert math.isclose(
        release, l_h / r * math.log((i0 + vf / r) / (0.1 * i0 + vf / r)), rel_tol=1e-9
    )


def test_a_fitted_diode_sees_the_load_voltage_in_service(tmp_path: Path) -> None:
    _, analysis = net(tmp_path, DESIGN, RELAY)
    assert service_voltages(fitted_suppressors(analysis))["D1"].to("V").magnitude == (
        24.0
    )


def test_the_check_context_computes_shared_physics_once(tmp_path: Path) -> None:
    from netcheck.catalogue import load_catalogue
    from netcheck.checks.context import CheckContext

    netlist, analysis = net(tmp_path, DESIGN, RELAY)
    ctx = CheckContext(netlist, analysis.graph, analysis, load_catalogue(), {})
    first = ctx.fitted_suppressors()
    assert first and ctx.fitted_suppressors() is first
    assert ctx.shorts() is ctx.shorts()
    assert ctx.shorts() == []  # the diode is reversed-biased in service: no short
