"""Two clamps in one loop, and a contact's gap voltage, against scipy.

When an output's internal clamp (Vc across the output, supply Vs in the loop)
conducts, the coil current obeys L·di/dt = -(R·i + Vc - Vs) (KVL round supply,
clamp and coil) until it reaches zero; the clamp absorbs ∫Vc·i dt. The same
loop with an RC (Rs, C) across an opened contact obeys
L·di/dt = Vs - R·i - Rs·i - vC, C·dvC/dt = i. scipy's solve_ivp integrates both
as the independent reference for what the analysis computes.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from netcheck.analysis.clamp_order import internal_clamp_takes
from netcheck.analysis.fitted import element_peak
from tests.helpers import findings_of, net

VS, R, L = 24.0, 48.0, 0.48  # WE-1 valve (domain-facts): I0 = 0.5 A, L/R = 10 ms
OUTPUT = """\
out:
  kind: output
  voltage_max: 40 V
  current_max: 1 A
  clamp_voltage: 36 V
  clamp_energy: 50 mJ
"""


def _clamp_energy(vs: float, vc: float) -> float:
    """∫Vc·i dt while the internal clamp conducts (scipy, event at i = 0)."""

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        return [-(R * y[0] + vc - vs) / L, vc * y[0]]

    def stop(_t: float, y: np.ndarray) -> float:
        return y[0]

    stop.terminal = True  # type: ignore[attr-defined]
    result = solve_ivp(
        rhs, (0.0, 1.0), [vs / R, 0.0], events=stop, rtol=1e-10, atol=1e-12
    )
    return float(result.y[1, -1])


@pytest.mark.parametrize("vz", ["24V", "12V"])
def test_the_internal_clamp_takes_the_energy_when_the_zener_is_above_it(
    tmp_path: Path, vz: str
) -> None:
    design = f"""\
    supply  G1  dc=24V  earth=minus  +:L+  -:M
    output  Q1  part=out  +:L+  -:N1
    load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
    diode   V1  vf=0.9V  A:N2  K:N1
    zener   V2  vz={vz}  A:N2  K:M
    """
    _, analysis = net(tmp_path, design, OUTPUT)
    clamp = internal_clamp_takes(analysis.elements["Q1"])
    assert clamp is not None
    # KVL: the external chain alone would hold Vs + Vz + Vf at the output.
    assert clamp.external_peak.to("V").magnitude == pytest.approx(
        VS + float(vz[:-1]) + 0.9
    )
    assert clamp.energy.to("J").magnitude == pytest.approx(
        _clamp_energy(VS, 36.0), rel=1e-3
    )
    assert clamp.overloaded  # 81 mJ against 50 mJ
    # The highest zener that still conducts first: Vs + Vz + Vf < Vc.
    assert clamp.zener_limit.to("V").magnitude == pytest.approx(36.0 - VS - 0.9)


def test_a_zener_below_the_internal_clamp_takes_the_energy_itself(
    tmp_path: Path,
) -> None:
    design = """\
    supply  G1  dc=24V  earth=minus  +:L+  -:M
    output  Q1  part=out  +:L+  -:N1
    load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
    diode   V1  vf=0.9V  A:N2  K:N1
    zener   V2  vz=10V  A:N2  K:M
    """
    _, analysis = net(tmp_path, design, OUTPUT)
    assert internal_clamp_takes(analysis.elements["Q1"]) is None


def test_the_rc_peak_across_a_contact_matches_scipy(tmp_path: Path) -> None:
    design = """\
    supply  G1  dc=24V  earth=minus  +:L+  -:M
    relay   K1  contacts.voltage_max=125V  13:L+  14:N1
    rc      Z1  R=22ohm  C=4.7uF  voltage_rating=250V  1:L+  2:N1
    load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
    """
    _, analysis = net(tmp_path, design)
    opening = element_peak(analysis.elements["K1:13-14"])
    rs, c = 22.0, 4.7e-6

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        i, vc = y
        return [(VS - R * i - rs * i - vc) / L, i / c]

    result = solve_ivp(
        rhs, (0.0, 5e-3), [VS / R, 0.0], max_step=1e-6, rtol=1e-9, atol=1e-12
    )
    peak = float(np.max(rs * result.y[0] + result.y[1]))
    assert opening.peak_voltage.to("V").magnitude == pytest.approx(peak, rel=2e-3)


def test_series_poles_share_the_gap_voltage_and_report_once(tmp_path: Path) -> None:
    # Diode + 150 V zener across a 110 V brake: the open gaps see
    # 110 + 150 + 0.9 = 260.9 V (KVL), 130.45 V per pole of two in series
    # (V/n), above 125 V; a zener of at most (250 - 110.9) / 1.05 = 132.5 V
    # keeps both within it.
    found = findings_of(
        tmp_path,
        """\
        supply  G1  dc=110V  earth=none  +:L+  -:L-
        contactor K1  contacts.voltage_max=125V  1:L+  2:W1  3:W1  4:N1
        load    Y1  type=brake  R=220ohm  L=2.2H  1:N1  2:L-
        diode   V1  A:N2  K:N1
        zener   V2  vz=150V  A:N2  K:L-
        """,
    )
    peaks = [f for f in found if f.rule == "peak-voltage-over-rating"]
    assert [f.element for f in peaks] == ["K1:1-2"]
    assert peaks[0].values["peak"].to("V").magnitude == pytest.approx(130.45)
    assert peaks[0].values["zener_max"].to("V").magnitude == pytest.approx(
        (250 - 110.9) / 1.05
    )
