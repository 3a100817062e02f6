"""Which switching elements could be verified (netcheck.coverage), end to end.

"No findings" must never hide "nothing could be checked": every switching
element gets a status from all of its design's findings, whatever rules are
selected or waived, and the summary and ``--fail-on-unverified`` read it.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from netcheck import cli, pipeline, schema
from netcheck.coverage import MISSING_DATA, NOT_ANALYSED

# Illustrative designs (invented values).
PARTS = """\
format: netcheck-parts/1
note: Illustrative values for the tests; not any manufacturer's data.
parts:
  rated-relay:
    kind: relay
    contacts:
      form: single-break
      voltage_max: 250 V
      ratings:
        - {category: DC-13, voltage: 24 V, current: 1 A}
"""
# K1 has no part data (rating-data-missing); K2 is rated and suppressed.
MIXED = """\
parts "test.parts.yaml"
supply  G1  dc=24V  +:L+  -:M
relay   K1  13:L+  14:N1
load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
diode   V1  A:M  K:N1  voltage_rating=1000V  current_rating=1A  vf=0.9V
relay   K2  part=rated-relay  13:L+  14:N2
load    Y2  type=valve  R=48ohm  L=0.48H  1:N2  2:M
diode   V2  A:M  K:N2  voltage_rating=1000V  current_rating=1A  vf=0.9V
"""
# No supply: nothing can be analysed, and no check fires.
NO_SUPPLY = """\
parts "test.parts.yaml"
relay   K1  part=rated-relay  13:P  14:N1
load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:N
"""


@pytest.fixture
def folder(tmp_path, monkeypatch):
    (tmp_path / ".git").mkdir()
    (tmp_path / "test.parts.yaml").write_text(PARTS, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    return tmp_path


def _write(folder: Path, name: str, text: str) -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def _statuses(path: Path) -> dict[str, tuple[str, str]]:
    result = pipeline.check_path(path)
    return {e.element: (e.status, e.reason) for e in result.elements}


def test_missing_part_data_is_unverified_the_rated_one_verified(folder):
    path = _write(folder, "mixed.cnet", MIXED)
    assert _statuses(path) == {
        "K1:13-14": ("unverified", MISSING_DATA),
        "K2:13-14": ("verified", ""),
    }


def test_a_circuit_without_supply_is_not_analysed(folder, capsys):
    path = _write(folder, "nosupply.cnet", NO_SUPPLY)
    assert _statuses(path) == {"K1:13-14": ("unverified", NOT_ANALYSED)}
    assert cli.main(["check", "nosupply.cnet"]) == 0
    out = capsys.readouterr().out
    # The plain statement, not just "no findings".
    assert (
        "nothing could be verified: 1 switching element, none verified "
        "(1 unverified)" in out
    )


def test_ac_elements_are_outside_the_dc_checks(folder):
    text = MIXED.replace("dc=24V", "ac=24V  freq=50Hz")
    path = _write(folder, "ac.cnet", text.replace("+:L+  -:M", "L:L+  N:M"))
    assert {status for status, _ in _statuses(path).values()} == {"ac"}


def test_ignoring_or_waiving_the_rule_does_not_verify(folder, capsys):
    waived = MIXED + 'waive rating-data-missing K1 "data sheet requested"\n'
    _write(folder, "mixed.cnet", waived)
    cli.main(
        ["check", "mixed.cnet", "--ignore", "rating-data-missing", "--format", "json"]
    )
    document = json.loads(capsys.readouterr().out)
    schema.validate("findings", document)
    assert document["summary"]["unverified"] == 1
    assert document["summary"]["verified"] == 1
    assert [u["element"] for u in document["unverified"]] == ["K1:13-14"]
    assert document["unverified"][0]["reason"] == MISSING_DATA


def test_fail_on_unverified(folder, capsys):
    _write(folder, "mixed.cnet", MIXED)
    assert cli.main(["check", "mixed.cnet", "--fail-on", "never"]) == 0
    flags = ["--fail-on", "never", "--fail-on-unverified"]
    assert cli.main(["check", "mixed.cnet", *flags]) == 1
    rated = MIXED.replace("relay   K1  13", "relay   K1  part=rated-relay  13")
    _write(folder, "rated.cnet", rated)
    assert _statuses(folder / "rated.cnet")["K1:13-14"] == ("verified", "")
    assert cli.main(["check", "rated.cnet", *flags]) == 0


def test_series_poles_share_the_verdict_of_their_lead(folder):
    # rating-data-missing is reported once, on the lead pole of a series group.
    path = _write(
        folder,
        "series.cnet",
        """\
supply  G1  dc=24V  +:L+  -:M
relay   K1  13:L+  14:N1  23:N1  24:N2
load    Y1  type=valve  R=48ohm  L=0.48H  1:N2  2:M
diode   V1  A:M  K:N2  voltage_rating=1000V  current_rating=1A  vf=0.9V
""",
    )
    assert _statuses(path) == {
        "K1:13-14": ("unverified", MISSING_DATA),
        "K1:23-24": ("unverified", MISSING_DATA),
    }


def test_details_print_values_and_fix_under_the_line(folder, capsys):
    _write(folder, "mixed.cnet", MIXED)
    cli.main(["check", "mixed.cnet", "--details"])
    lines = capsys.readouterr().out.splitlines()
    head = next(i for i, x in enumerate(lines) if x.endswith("[rating-data-missing]"))
    assert lines[head].startswith("mixed.cnet:3:1: warning: K1:13-14 breaks 500 mA")
    # 24 V / 48 ohm = 0.5 A (Ohm's law)
    assert lines[head + 1] == "    values: current = 500 mA, voltage = 24 V"
    assert lines[head + 2].startswith("    fix: add the contact's DC ratings")
    assert any(
        x.startswith("mixed.cnet:3:1: note: K1:13-14 is not verified: ") for x in lines
    )


def test_quiet_prints_only_the_summary(folder, capsys):
    _write(folder, "mixed.cnet", MIXED)
    cli.main(["check", "mixed.cnet", "--quiet"])
    lines = capsys.readouterr().out.splitlines()
    # rating-data-missing and the arc-sustain estimate on K1 (no DC rating at all)
    assert lines[0] == "2 findings: 0 errors, 2 warnings, 0 info (1 file read)"
    assert lines[1:3] == [
        "by rule: arc-sustain-risk 1, rating-data-missing 1",
        "switching elements: 1 verified, 1 unverified",
    ]
    assert lines[3].startswith("note: Results depend on the rating data given")
    assert len(lines) == 4


def test_sarif_run_properties_count_unverified(folder, capsys):
    _write(folder, "mixed.cnet", MIXED)
    cli.main(["check", "mixed.cnet", "--format", "sarif"])
    run = json.loads(capsys.readouterr().out)["runs"][0]
    assert run["properties"]["summary"]["unverified"] == 1
    assert [u["element"] for u in run["properties"]["unverified"]] == ["K1:13-14"]
    (result,) = [r for r in run["results"] if r["ruleId"] == "rating-data-missing"]
    assert result["message"]["text"].endswith(
        "Fix: add the contact's DC ratings from the manufacturer's data sheet "
        "to the part library."
    )
