"""The Remove edit: a part that must go leaves the model and is commented out.

Used for a polarized suppressor across an AC load (diode-on-ac-load): on AC the
voltage across the load reverses every half cycle, so a diode across it
conducts in one of them (diode physics; the rule's rationale).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from netcheck.analysis.elements import analyse
from netcheck.cli import main as cli_main
from netcheck.fixes.diff import REMOVED, edited_texts
from netcheck.fixes.edits import Remove, apply_edits, edit_dict
from netcheck.fixes.verify import verify_fixes
from netcheck.graph import build_graph
from netcheck.input import load_design
from netcheck.pipeline import analyse_path, run_checks
from netcheck.schema import validate

DESIGN = """\
title "illustrative remove test"
supply G1 ac=24V freq=50Hz L:L1 N:N
relay K1 contacts.voltage_max=250V 13:L1 14:N1
load Y1 type=valve R=48ohm L=0.1H 1:N1 2:N
diode V1 voltage_rating=1000V current_rating=1A
    A:N2 K:N1   # across the valve on AC
zener V2 vz=24V power=1W A:N2 K:N
"""


@pytest.fixture
def path(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.chdir(tmp_path)
    file = tmp_path / "d.cnet"
    file.write_text(DESIGN, encoding="utf-8")
    return file


def test_remove_takes_the_part_out_of_a_copy(path: Path) -> None:
    netlist = load_design(path, display_base=path.parent)
    edited = apply_edits(netlist, [Remove("V1")])
    assert edited.component("V1") is None
    assert netlist.component("V1") is not None  # the input is untouched
    assert edit_dict(Remove("V1")) == {"action": "remove", "ref": "V1"}


def test_remove_of_an_unknown_part_is_refused(path: Path) -> None:
    netlist = load_design(path, display_base=path.parent)
    with pytest.raises(KeyError):
        apply_edits(netlist, [Remove("V9")])


def test_the_diff_comments_out_every_line_of_the_statement(path: Path) -> None:
    netlist = load_design(path, display_base=path.parent)
    ((old, new),) = edited_texts(
        netlist, [("diode-on-ac-load at V1", [Remove("V1")])]
    ).values()
    lines = new.split("\n")
    assert lines[4].startswith(f"{REMOVED} diode-on-ac-load at V1: diode V1")
    assert lines[5].startswith(REMOVED) and "A:N2 K:N1" in lines[5]
    assert lines[6] == "zener V2 vz=24V power=1W A:N2 K:N"
    assert old == DESIGN


def test_the_chain_on_ac_is_removed_whole_and_verified(path: Path) -> None:
    netlist, analysis = analyse_path(path)
    findings = verify_fixes(netlist, analysis, run_checks(netlist, analysis))
    (finding,) = [f for f in findings if f.rule == "diode-on-ac-load"]
    assert finding.verified
    assert [edit_dict(e) for e in finding.edits] == [
        {"action": "remove", "ref": "V1"},
        {"action": "remove", "ref": "V2"},
    ]
    edited = apply_edits(netlist, finding.edits)
    again = run_checks(edited, analyse(build_graph(edited)))
    assert not [f for f in again if f.rule == "diode-on-ac-load"]
    assert edited.component("V2") is None  # no zener left dangling


def test_the_json_report_with_a_remove_edit_is_valid(
    path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    cli_main(["check", "--format", "json", str(path)])
    data = json.loads(capsys.readouterr().out)
    edits = [e for f in data["findings"] for e in (f["fix"] or {}).get("edits", [])]
    assert {"action": "remove", "ref": "V1"} in edits
    validate("findings", data)  # raises on a shape the schema does not allow
