"""Short-circuit currents of reversed freewheel chains against ngspice's .op.

A diode conducting forward holds its forward drop and a zener conducting in
reverse its breakdown voltage (diode physics), so a reversed diode + zener
chain across an energised load draws (E - vf - vz) / r_int by KVL. ngspice
(Debian package ``ngspice``, an independent circuit simulator) solves the same
circuit with near-ideal diodes: a sharp junction (N = 0.01, so the junction
itself holds under 10 mV at 100 A) in series with a DC source for vf, and a
breakdown BV = vz. The tests skip without ngspice.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest
from helpers import net

from netcheck.analysis.shorts import reversed_diodes, supply_shorts

pytestmark = pytest.mark.skipif(
    shutil.which("ngspice") is None,
    reason="ngspice not installed (Debian package ngspice); .ci/run installs it",
)

PARTS = """
fw:
  kind: diode
  vf: 0.9 V
zd:
  kind: zener
  vz: {vz} V
"""


def _op_supply_current(vz: float, emf: float, r_int: float, tmp: Path) -> float:
    circuit = f"""chain
VG P0 0 DC {emf}
RINT P0 P {r_int}
RY P 0 48
VF1 P A1 DC 0.9
D1 A1 N2 DIDEAL
D2 0 N2 DZ
.model DIDEAL D(IS=1e-14 N=0.01)
.model DZ D(IS=1e-14 N=0.01 BV={vz} IBV=1e-3)
.control
op
print i(vg)
.endc
.end
"""
    path = tmp / "chain.cir"
    path.write_text(circuit, encoding="ascii")
    result = subprocess.run(
        ["ngspice", "-b", str(path)],
        capture_output=True,
        text=True,
        timeout=60,
        check=False,
    )
    match = re.search(r"^i\(vg\) = (\S+)$", result.stdout, re.M)
    assert match, result.stdout + result.stderr
    return abs(float(match.group(1)))


@pytest.mark.parametrize("vz", [6.0, 12.0, 18.0])
def test_reversed_diode_zener_chain_counts_breakdown(vz: float, tmp_path: Path) -> None:
    text = (
        "supply G1 dc=24V r_int=0.1ohm +:P -:M\n"
        "load Y1 type=valve R=48ohm L=0.5H 1:P 2:M\n"
        "diode V1 part=fw A:P K:N2\n"
        "zener V2 part=zd K:N2 A:M\n"
    )
    _, analysis = net(tmp_path, text, PARTS.format(vz=vz))
    found = reversed_diodes(analysis)
    assert len(found) == 1
    reference = _op_supply_current(vz, 24.0, 0.1, tmp_path)
    # ngspice's supply current also feeds the 48 ohm valve (under 0.5 A of
    # about 100 A): the short's own current agrees within 1 %.
    assert found[0].current is not None
    assert found[0].current.to("A").magnitude == pytest.approx(reference, rel=0.01)
    # KVL by hand: (24 V - 0.9 V - vz) / 0.1 ohm.
    assert found[0].current.to("A").magnitude == pytest.approx((24 - 0.9 - vz) / 0.1)


def test_two_chains_in_one_domain_are_two_paths(tmp_path: Path) -> None:
    text = (
        "supply G1 dc=24V r_int=0.1ohm +:P -:M\n"
        "diode V1 part=fw A:P K:M\n"
        "diode V3 part=fw A:P K:N4\n"
        "zener V4 part=zd K:N4 A:M\n"
    )
    _, analysis = net(tmp_path, text, PARTS.format(vz=12))
    shorts = sorted(supply_shorts(analysis), key=lambda s: s.path)
    assert [s.path for s in shorts] == [("V1",), ("V3", "V4")]
    # KVL per path, each as if it were the only fault: (24 - 0.9)/0.1 and
    # (24 - 0.9 - 12)/0.1.
    assert [s.current.to("A").magnitude for s in shorts] == pytest.approx([231, 111])
