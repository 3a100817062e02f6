"""Fixes for the battery findings: precharge paths, fuses, making capacity, arcs.

Issue 13's end-to-end criterion on the 400 V sample: ``netcheck check`` reports
the fuse that cannot break the pack's fault current and the contactors that
would weld, each with a verified fix; ``netcheck fix --write`` then leaves none
of them. The precharge path the fix adds is checked against ngspice's
transient (an independent simulator): the precharge contact's peak is
dV / (R + r_int) within its making current, and the main contact, closing
once the link is charged, makes only the small remaining step.
"""

from __future__ import annotations

import json
import math
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from netcheck import cli
from netcheck.findings import Severity
from netcheck.fixes.edits import AddComponent, Reconnect, SetValues, UsePart
from netcheck.fixes.propose_making import E12, e12_up
from netcheck.fixes.verify import Verifier, verify_fixes
from netcheck.pipeline import analyse_path, run_checks

ROOT = Path(__file__).parents[2]
SAMPLE = ROOT / "sample_nets" / "battery-400v"
CASES = ROOT / "tests" / "cases"
ISSUE_RULES = ("making-over-rating", "protection-dc-capacity")

needs_ngspice = pytest.mark.skipif(
    shutil.which("ngspice") is None, reason="ngspice not installed (Debian ngspice)"
)


def _verified(path: Path):  # type: ignore[no-untyped-def]
    netlist, analysis = analyse_path(path)
    before = run_checks(netlist, analysis)
    return netlist, before, verify_fixes(netlist, analysis, before, budget=None)


def _by_element(findings) -> dict:  # type: ignore[no-untyped-def]
    return {(f.rule, f.element): f for f in findings}


def test_e12_values_are_the_preferred_numbers() -> None:
    # IEC 60063, E12 series: 1.0 1.2 1.5 1.8 2.2 2.7 3.3 3.9 4.7 5.6 6.8 8.2.
    assert E12 == (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)
    assert e12_up(0.75) == [0.82, 1.0, 1.2]  # across a decade
    assert e12_up(7.95) == [8.2, 10.0, 12.0]
    assert e12_up(0.035, 1) == [0.039]
    assert e12_up(2.2, 1) == [2.2]  # an E12 value itself is kept


def test_battery_sample_findings_each_carry_a_verified_fix() -> None:
    _, _, found = _verified(SAMPLE / "battery-400v.cnet")
    by = _by_element(found)
    # F2: the library's closest fuse with 500 V DC >= 400 V and 10 kA >= the
    # 400 V / 50 mohm = 8 kA fault (hand calculation), not the 315 A main fuse.
    fuse = by[("protection-dc-capacity", "F2")]
    assert fuse.verified and fuse.edits == (UsePart("F2", "fuse-hv-16a-10k"),)
    # Q2: the precharge resistor raised to 8.2 ohm >= 400 V / 50 A - 50 mohm =
    # 7.95 ohm; the library holds one.
    pre = by[("making-over-rating", "Q2:1-2")]
    assert pre.verified and pre.edits == (UsePart("R1", "precharge-8r2"),)
    # Q4: a precharge path across it, 0.82 ohm (E12) >= 400 V / 500 A -
    # 50 mohm = 0.75 ohm, through a second contactor of Q4's own type.
    main = by[("making-over-rating", "Q4:1-2")]
    assert main.verified
    contact, resistor = main.edits
    assert isinstance(contact, AddComponent) and contact.kind == "contactor"
    assert dict(contact.attributes) == {"part": "hv-contactor-30a"}
    assert dict(resistor.attributes) == {"R": "0.82ohm"}
    middle = dict(contact.connections)["2"]
    assert dict(resistor.connections) == {"1": middle, "2": "AUX+"}


def test_a_precharge_resistor_one_step_too_small_does_not_verify() -> None:
    """Mutation check: 0.68 ohm gives 400 / 0.73 = 548 A > 500 A: not verified."""
    netlist, before, found = _verified(SAMPLE / "battery-400v.cnet")
    main = _by_element(found)[("making-over-rating", "Q4:1-2")]
    contact, resistor = main.edits
    small = AddComponent(
        resistor.kind, resistor.ref, (("R", "0.68ohm"),), resistor.connections, "Q4"
    )
    verifier = Verifier(netlist, before, {})
    assert verifier.passes(main, [contact, resistor])
    assert not verifier.passes(main, [contact, small])


def test_write_then_check_clears_the_battery_findings(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys
) -> None:  # type: ignore[no-untyped-def]
    work = tmp_path / "battery-400v"
    shutil.copytree(SAMPLE, work)
    monkeypatch.chdir(work)
    cli.main(["check", ".", "--format", "json"])
    before = json.loads(capsys.readouterr().out)["findings"]
    assert {f["rule"] for f in before} == set(ISSUE_RULES)
    assert all(f["fix"]["verified"] for f in before)
    assert cli.main(["fix", "--write", "."]) == 0
    capsys.readouterr()
    text = (work / "battery-400v.cnet").read_text()
    assert re.search(r"^fuse\s+F2\s+part=fuse-hv-16a-10k", text, re.M)
    assert re.search(r"^resistor\s+R1\s+part=precharge-8r2", text, re.M)
    assert re.search(r"^resistor\s+RP_Q4\s+R=0.82ohm", text, re.M)
    assert cli.main(["check", "."]) == 0
    assert "no findings" in capsys.readouterr().out


@pytest.mark.parametrize(
    ("case", "element", "edit"),
    [
        # 48 V battery, 9.6 kA fault: the case library's 4 A fuse of 20 kA,
        # not its 250 A battery fuse (same rated current only).
        ("protection-dc-capacity/bad-battery-fault.cnet", "F2", UsePart),
        # A 32 V fuse stating no rated current: the 48 V rating to ask for.
        ("protection-dc-capacity/bad-dc-voltage.cnet", "F1", SetValues),
        # AC-only fuse, no DC part in the library: the DC ratings to ask for,
        # 110 V and 110 V / 50 mohm = 2.2 kA (hand calculation).
        ("protection-dc-capacity/bad-ac-only-fuse.cnet", "F1", SetValues),
        # The RC's own resistor: 2.7 ohm (E12) >= 110 V / 49 A = 2.2449 ohm.
        ("making-over-rating/bad-snubber-discharge.cnet", "K1:13-14", SetValues),
        # A bare capacitor's discharge: a resistor added in series with it.
        (
            "making-over-rating/bad-capacitor-and-resistor-discharge.cnet",
            "K1:13-14",
            Reconnect,
        ),
        # A motor: the making current asked of its DC-3 contactor, 40 A.
        ("making-over-rating/bad-motor-start.cnet", "Q1:1-2", SetValues),
        # A 48 V link with no precharge: a precharge path across Q1.
        (
            "making-over-rating/bad-main-contactor-no-precharge.cnet",
            "Q1:1-2",
            AddComponent,
        ),
    ],
)
def test_case_fix_is_the_expected_edit(case: str, element: str, edit: type) -> None:
    _, _, found = _verified(CASES / case)
    finding = next(f for f in found if f.element == element and f.fix)
    assert finding.verified and isinstance(finding.edits[0], edit)


def test_fix_values_name_the_ratings_that_pass() -> None:
    _, _, found = _verified(CASES / "protection-dc-capacity/bad-ac-only-fuse.cnet")
    (fuse,) = [f for f in found if f.rule == "protection-dc-capacity"]
    assert fuse.edits == (
        SetValues(
            "F1", (("dc_voltage_rating", "110V"), ("breaking_capacity", "2.2kA"))
        ),
    )
    _, _, found = _verified(CASES / "making-over-rating/bad-motor-start.cnet")
    (motor,) = [f for f in found if f.rule == "making-over-rating"]
    # 4 x 10 A (IEC 60947-4-1 Table 7, DC-3 making at 4 Ie): 40 A.
    assert motor.edits == (SetValues("Q1", (("contacts.making_current", "40A"),)),)


def test_a_fuse_of_another_rated_current_is_never_offered() -> None:
    """The 48 V sample: F2 is a 4 A control fuse; its library's 40 A and 250 A
    fuses break the 9.6 kA fault but would not protect the control wiring."""
    _, _, found = _verified(ROOT / "sample_nets/battery-48v/battery-48v.cnet")
    (fuse,) = [f for f in found if f.rule == "protection-dc-capacity"]
    assert fuse.verified
    assert fuse.edits == (SetValues("F2", (("breaking_capacity", "9.6kA"),)),)
    _, _, found = _verified(CASES / "protection-dc-capacity/bad-battery-fault.cnet")
    (fuse,) = [f for f in found if f.rule == "protection-dc-capacity"]
    assert fuse.edits == (UsePart("F2", "fuse-dc-4a-20k"),)


def test_reversed_polarized_breaker_is_turned_round() -> None:
    _, _, found = _verified(
        CASES / "protection-dc-capacity/bad-polarized-breaker-reversed.cnet"
    )
    (breaker,) = [f for f in found if f.rule == "protection-dc-capacity"]
    assert breaker.verified
    (edit,) = breaker.edits
    assert dict(edit.connections) == {"1": "B+", "2": "W1"}


def test_a_lamp_fix_is_a_making_capacity_never_suppression() -> None:
    _, _, found = _verified(CASES / "making-over-rating/bad-lamp-cold-filament.cnet")
    lamps = [f for f in found if f.rule == "making-over-rating"]
    assert lamps and all(f.verified for f in lamps)
    for finding in lamps:
        assert not any(isinstance(e, AddComponent) for e in finding.edits)


def test_spare_pole_in_series_clears_the_likely_arc_and_leaves_the_note() -> None:
    netlist, before, found = _verified(CASES / "arc-sustain-risk/bad-spare-poles.cnet")
    (arc,) = [f for f in found if f.rule == "arc-sustain-risk"]
    assert arc.verified and arc.key == "likely"
    from netcheck.analysis.elements import analyse
    from netcheck.fixes.edits import apply_edits
    from netcheck.graph import build_graph

    edited = apply_edits(netlist, arc.edits)
    after = [
        f
        for f in run_checks(edited, analyse(build_graph(edited)))
        if f.rule == arc.rule
    ]
    # Two breaks need 2 x 12 V = 24 V (Ag, facts sheet 6): an estimate of
    # "unlikely" that stays as info, never a pass.
    assert [(f.key, f.severity) for f in after] == [("unlikely", Severity.INFO)]


@needs_ngspice
def test_fixed_precharge_path_against_ngspice(tmp_path: Path) -> None:
    """The Q4 fix simulated: precharge through 0.82 ohm, then the main contact.

    ngspice transient, 400 V behind 50 mohm, 200 uF from empty, the 100 ohm
    converter load: the precharge contact peaks at 400 / 0.87 = 459.8 A
    (hand calculation) <= 500 A; the main contact closes after 5 tau and
    makes the remaining step, about 6 V over 50 mohm, about 120 A <= 500 A:
    closing on the charged link does not weld it.
    """
    tau = 0.87 * 200e-6
    close = 5 * tau
    circuit = (
        "* fixed precharge path of the battery sample\n"
        "V1 emf 0 DC 400\nRint emf w20 0.05\n"
        "Vpre w20 pre DC 0\nRp pre aux 0.82\n"
        "Vmain w20 m DC 0\nSmain m aux ctl 0 sw\n"
        f"Vctl ctl 0 PULSE(0 1 {close} 1n 1n 1 2)\n"
        ".model sw sw(vt=0.5 ron=1e-9 roff=1e12)\n"
        "C2 aux 0 200u IC=0\nRL aux 0 100\n"
        ".control\ntran 0.1u 3m uic\n"
        "meas tran pre max i(vpre) from=0 to=1m\n"
        f"meas tran main max i(vmain) from={close} to=3m\n.endc\n.end\n"
    )
    path = tmp_path / "pre.cir"
    path.write_text(circuit, encoding="ascii")
    out = subprocess.run(
        ["ngspice", "-b", str(path)], capture_output=True, text=True, timeout=60
    ).stdout
    values = dict(re.findall(r"^(pre|main)\s*=\s*(\S+)", out, re.M))
    assert float(values["pre"]) == pytest.approx(400 / 0.87, rel=0.01)
    assert float(values["pre"]) <= 500.0
    # The link charges towards 400 x 100 / 100.87 V with tau' = (0.87 || 100)
    # ohm x 200 uF (Thevenin); the main contact then makes (400 V - v) / 50 mohm.
    final = 400 * 100 / 100.87
    link = final * (1 - math.exp(-close / (0.87 * 100 / 100.87 * 200e-6)))
    assert float(values["main"]) == pytest.approx((400 - link) / 0.05, rel=0.03)
    assert float(values["main"]) <= 500.0
