"""``check`` and ``size`` apply the same margins: the rule catalogue's.

Same load both ways (24 V, 48 ohm, 0.5 H: 0.5 A): what ``size`` recommends must
pass ``check``, and the threshold ``check`` states must be ``size``'s minimum.
"""

from __future__ import annotations

import pytest

from netcheck.catalogue import all_margins, load_catalogue
from netcheck.sizing import SIZE_MARGINS, margin_defaults, size_load
from netcheck.units import Q_
from tests.helpers import findings_of

LOAD = dict(voltage=Q_(24, "V"), resistance=Q_(48, "ohm"), inductance=Q_(0.5, "H"))
DESIGN = """\
supply  G1  dc=24V  earth=minus  +:L+  -:M
relay   K1  part=relay  13:L+  14:N1
load    Y1  type=valve  R=48ohm  L=0.5H  1:N1  2:M
{diode}
"""
RELAY = """\
relay:
  kind: relay
  contacts:
    form: single-break
    ratings:
      - {category: DC-13, voltage: 24 V, current: 1 A}
"""


def _diode_ratings(margins=None) -> tuple[float, float]:
    diode = next(o for o in size_load(**LOAD, margins=margins).options)
    values = {r.name: r.value for r in diode.components}
    return (
        float(values["reverse_voltage"].to("V").magnitude),
        float(values["forward_current"].to("A").magnitude),
    )


def _findings(tmp_path, volts: float, amps: float) -> list[str]:
    part = (
        f"diode:\n  kind: diode\n  voltage_rating: {volts:g} V\n"
        f"  current_rating: {amps:g} A\n"
    )
    text = DESIGN.format(diode="diode   D1  part=diode  A:M  K:N1")
    return [f.rule for f in findings_of(tmp_path, text, RELAY + part)]


def test_every_size_margin_is_a_catalogue_margin():
    # netcheck.yaml accepts the catalogue's margins; size must use no other.
    known = all_margins(load_catalogue())
    assert set(SIZE_MARGINS) <= set(known)
    assert margin_defaults() == {name: known[name].default for name in SIZE_MARGINS}


def test_sized_diode_passes_check(tmp_path):
    volts, amps = _diode_ratings()
    # Default: 2 x 24 V = 48 V (WE-12's 2-3 x electronics rule), IF >= 0.5 A.
    assert (volts, amps) == pytest.approx((48.0, 0.5))
    assert "suppressor-underrated" not in _findings(tmp_path, volts, amps)
    assert "suppressor-underrated" in _findings(tmp_path, volts - 1, amps)


def test_check_threshold_is_size_minimum(tmp_path):
    text = DESIGN.format(diode="")
    (finding,) = [
        f
        for f in findings_of(tmp_path, text, RELAY)
        if f.rule == "inductive-load-unsuppressed"
    ]
    volts, amps = _diode_ratings()
    assert finding.values["diode_voltage"].to("V").magnitude == pytest.approx(volts)
    assert finding.values["diode_current"].to("A").magnitude == pytest.approx(amps)


def test_overridden_margin_moves_both(tmp_path):
    # The relay makers' conservative 10 x rule (WE-12), set for both commands.
    from netcheck.pipeline import run_checks
    from tests.helpers import net

    volts, _ = _diode_ratings({"diode-reverse-voltage": 10})
    assert volts == pytest.approx(240.0)
    netlist, analysis = net(tmp_path, DESIGN.format(diode=""), RELAY)
    (finding,) = [
        f
        for f in run_checks(netlist, analysis, {"diode-reverse-voltage": 10})
        if f.rule == "inductive-load-unsuppressed"
    ]
    assert finding.values["diode_voltage"].to("V").magnitude == pytest.approx(volts)
