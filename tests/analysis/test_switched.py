"""Breaking voltage and current of switching elements against hand calculations.

Every expected value is worked out with Ohm's and Kirchhoff's laws in the comment
beside it (circuit laws; no project code involved).
"""

from __future__ import annotations

from pathlib import Path

from helpers import approx_q, net

DIODE = """
  fw:
    kind: diode
    voltage_rating: 1000 V
    current_rating: 1 A
    vf: 0.7 V
"""


def test_single_rung_coil(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=24V +:P -:M
        switch S1 13:P 14:N1
        relay K1 A1:N1 A2:M coil.resistance=48ohm coil.inductance=0.48H
    """)
    e = a.elements["S1:13-14"]
    approx_q(e.current, 0.5, "A")  # Ohm: 24 V / 48 ohm
    approx_q(e.voltage, 24.0, "V")  # the open contact sees the whole supply
    approx_q(e.time_constant, 0.010, "s")  # L/R = 0.48 H / 48 ohm
    approx_q(e.t95, 0.030, "s")  # T0.95 = 3·L/R (IEC 60947-5-1 convention)
    approx_q(e.energy, 0.06, "J")  # ½·0.48 H·(0.5 A)²
    assert e.load_category == "DC-13"  # a relay coil is an electromagnet


def test_parallel_loads_and_internal_resistance(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=110V r_int=1ohm +:P -:M
        contactor Q1 1:P 2:N1
        load Y1 type=heater R=100ohm 1:N1 2:M
        load Y2 type=heater R=100ohm 1:N1 2:M
    """)
    e = a.elements["Q1:1-2"]
    # Two 100 ohm loads in parallel = 50 ohm, plus r_int 1 ohm: I = 110/51 A.
    approx_q(e.current, 110 / 51, "A")
    assert sorted(ld.facts.ref for ld in e.loads) == ["Y1", "Y2"]
    assert e.load_category == "DC-1"  # resistive on a contactor main pole


def test_seal_in_does_not_halve_the_start_button(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=24V +:P -:M
        switch S0 11:P 12:N1
        switch S1 13:N1 14:N2
        relay K1 A1:N2 A2:M 13:N1 14:N2 coil.resistance=240ohm coil.inductance=1H
        diode V1 part=fw A:M K:N2
    """, parts=DIODE)
    start, seal, stop = (a.elements[n] for n in ("S1:13-14", "K1:13-14", "S0:11-12"))
    # With the seal-in open (it bypasses S1), S1 carries the whole coil current.
    approx_q(start.current, 0.1, "A")  # 24 V / 240 ohm
    approx_q(seal.current, 0.1, "A")  # and the seal-in, with S1 open, likewise
    assert start.bypass == ("K1:13-14",) and seal.bypass == ("S1:13-14",)
    approx_q(stop.current, 0.1, "A")  # the stop button is in series with both
    # S0 is in series with S1 (other device) but not with its own bypass.
    assert "S1:13-14" in stop.other_series and "K1:13-14" in stop.other_series
    assert start.other_series == ("S0:11-12",)


def test_series_poles_of_one_device_split_between_polarities(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=220V earth=none +:P -:M
        contactor Q1 1:P 2:N1 3:N2 4:M
        load E1 type=heater R=110ohm 1:N1 2:N2
    """)
    first, second = a.elements["Q1:1-2"], a.elements["Q1:3-4"]
    approx_q(first.current, 2.0, "A")  # 220 V / 110 ohm
    assert first.series_poles == 2 and second.series_poles == 2
    assert first.series_elements == ("Q1:1-2", "Q1:3-4")
    # Opening one pole alone leaves the load floating at the other rail: it sees
    # the full 220 V (poles share the voltage only when they open together).
    approx_q(first.voltage, 220.0, "V")


def test_series_resistor_divides_and_current_direction(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=24V +:P -:M
        switch S1 13:N1 14:P
        resistor R1 R=120ohm 1:N1 2:N2
        load Y1 type=valve R=120ohm L=1.2H 1:N2 2:M
        diode V1 part=fw A:M K:N2
    """, parts=DIODE)
    e = a.elements["S1:13-14"]
    approx_q(e.current, 0.1, "A")  # 24 V / (120 + 120) ohm
    assert e.direction == -1  # current enters at 14 (P side) and leaves at 13
    assert [ld.facts.ref for ld in e.loads] == ["Y1"]  # a series resistor is no load
    approx_q(e.energy, 0.5 * 1.2 * 0.1**2, "J")  # only Y1 stores energy


def test_resistor_across_contact_gives_a_divided_breaking_voltage(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=24V +:P -:M
        switch S1 13:P 14:N1
        resistor R1 R=72ohm 1:P 2:N1
        relay K1 A1:N1 A2:M coil.resistance=48ohm coil.inductance=0.48H
        diode V1 part=fw A:M K:N1
    """, parts=DIODE)
    e = a.elements["S1:13-14"]
    approx_q(e.current, 0.5, "A")  # closed: the contact shorts R1, 24/48
    # Open: R1 (72) and the coil (48) divide 24 V; the contact sees R1's share.
    approx_q(e.voltage, 24 * 72 / 120, "V")
    # The coil falls from 0.5 A to 0.2 A (24 V / 120 ohm): it loses more than half
    # its current, so it counts as switched (it drops out).
    assert [ld.facts.ref for ld in e.loads] == ["K1"]


def test_precharge_resistor_bypass(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=48V r_int=5mohm +:P -:M
        contactor Q1 1:P 2:L
        contactor Q2 1:P 2:W
        resistor R1 R=12ohm 1:W 2:L
        load U1 type=resistive R=0.8ohm 1:L 2:M
    """)
    main, pre = a.elements["Q1:1-2"], a.elements["Q2:1-2"]
    # Main contact with the precharge path open: 48 V / (0.8 + 0.005) ohm.
    approx_q(main.current, 48 / 0.805, "A", rel=1e-4)
    approx_q(main.voltage, 48.0, "V", rel=1e-6)
    # Precharge contact with the main contact open: 48 / (12 + 0.8 + 0.005).
    approx_q(pre.current, 48 / 12.805, "A", rel=1e-4)


def test_reversed_freewheel_diode_is_a_short(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 dc=24V r_int=0.1ohm +:P -:M
        switch S1 13:P 14:N1
        relay K1 A1:N1 A2:M coil.resistance=48ohm coil.inductance=0.48H
        diode V1 part=fw A:N1 K:M
    """, parts=DIODE)
    info = a.loads["K1:coil"]
    assert [s.conducts for s in info.suppressors] == [True]
    state = next(iter(a.states.values()))
    assert state.shorts and state.shorts[0][0].ref == "V1"
    assert a.elements["S1:13-14"].short_circuit


def test_ac_elements_have_no_dc_numbers(tmp_path: Path) -> None:
    _, a = net(tmp_path, """
        supply G1 ac=230V L:L1 N:N
        switch S1 13:L1 14:N1
        load H1 type=lamp R=1000ohm 1:N1 2:N
    """)
    e = a.elements["S1:13-14"]
    assert e.supply == "ac" and e.current is None and e.domain == "G1"
