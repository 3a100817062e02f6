"""One broken file costs only its own findings (real pipeline, every format).

A folder holds two good designs and one with an input error. Whatever the
format and ``--jobs``, the good files' findings are all reported, exactly as
when they are checked without the broken one; the input error is reported
too (JSON ``errors``, SARIF invocation notifications, text on stderr with a
caret); the ``-o`` file is written; the exit status is 2.
"""

from __future__ import annotations

import json
from pathlib import Path

import jsonschema
import pytest

from netcheck import cli, schema

SARIF_SCHEMA = (
    Path(__file__).resolve().parents[1] / "report" / "sarif-schema-2.1.0.json"
)

# Illustrative designs (invented): a valve opened with nothing across it and a
# relay with no part data; a decimal comma; a lamp on a rated relay.
VALVE = """\
supply  G1  dc=24V  +:L+  -:M
relay   K1  13:L+  14:N1
load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
"""
BROKEN = """\
supply  G1  dc=24V  +:L+  -:M
load    Y2  type=valve  R=4,7kohm  1:L+  2:M
"""
LAMP = """\
parts "lamp.parts.yaml"
supply  G2  dc=24V  +:P  -:N
relay   K2  part=lamp-relay  13:P  14:N2
load    H1  type=lamp  R=240ohm  1:N2  2:N
load    H2  type=lamp  R=480ohm  1:N9  2:N
"""
LAMP_PARTS = """\
format: netcheck-parts/1
parts:
  lamp-relay:
    kind: relay
    description: illustrative relay contact, DC-13 1 A at 24 V
    contacts:
      form: single-break
      voltage_max: 250 V
      ratings:
        - {category: DC-13, voltage: 24 V, current: 1 A}
"""
# The error: line 2, column 27 is the start of "4,7kohm".
BROKEN_AT = ("drawings/b-broken.cnet", 2, 27)


@pytest.fixture
def drawings(tmp_path, monkeypatch):
    (tmp_path / ".git").mkdir()
    folder = tmp_path / "drawings"
    folder.mkdir()
    (folder / "a-valve.cnet").write_text(VALVE, encoding="utf-8")
    (folder / "b-broken.cnet").write_text(BROKEN, encoding="utf-8")
    (folder / "c-lamp.cnet").write_text(LAMP, encoding="utf-8")
    (folder / "lamp.parts.yaml").write_text(LAMP_PARTS, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    monkeypatch.delenv("NO_COLOR", raising=False)
    return folder


def _good_alone(capsys, fmt: str) -> dict:
    """The report of the two good files checked on their own."""
    code = cli.main(
        ["check", "drawings/a-valve.cnet", "drawings/c-lamp.cnet", "--format", fmt]
    )
    assert code in (0, 1)
    return json.loads(capsys.readouterr().out)


@pytest.mark.parametrize("jobs", ["1", "2"])
def test_json_keeps_every_good_finding_and_lists_the_error(drawings, capsys, jobs):
    alone = _good_alone(capsys, "json")
    assert {f["file"] for f in alone["findings"]} == {
        "drawings/a-valve.cnet",
        "drawings/c-lamp.cnet",
    }
    code = cli.main(
        ["check", "drawings", "--format", "json", "-o", "out.json", "-j", jobs]
    )
    assert code == 2
    out, err = capsys.readouterr()
    assert out == ""
    document = json.loads(Path("out.json").read_text(encoding="utf-8"))
    schema.validate("findings", document)
    assert document["findings"] == alone["findings"]
    file, line, column = BROKEN_AT
    assert [(e["file"], e["line"], e["column"]) for e in document["errors"]] == [
        (file, line, column)
    ]
    assert "decimal comma" in document["errors"][0]["message"]
    assert document["summary"]["input_errors"] == 1
    assert f"{file}:{line}:{column}: error:" in err
    assert "drawings/b-broken.cnet" in document["files"]


@pytest.mark.parametrize("jobs", ["1", "2"])
def test_sarif_says_execution_failed_with_the_location(drawings, capsys, jobs):
    alone = _good_alone(capsys, "sarif")
    code = cli.main(
        ["check", "drawings", "--format", "sarif", "-o", "out.sarif", "--jobs", jobs]
    )
    assert code == 2
    capsys.readouterr()
    log = json.loads(Path("out.sarif").read_text(encoding="utf-8"))
    jsonschema.validate(log, json.loads(SARIF_SCHEMA.read_text(encoding="utf-8")))
    run = log["runs"][0]
    assert run["results"] == alone["runs"][0]["results"]
    assert alone["runs"][0]["invocations"][0]["executionSuccessful"] is True
    invocation = run["invocations"][0]
    assert invocation["executionSuccessful"] is False
    (note,) = invocation["toolExecutionNotifications"]
    assert note["level"] == "error" and "decimal comma" in note["message"]["text"]
    physical = note["locations"][0]["physicalLocation"]
    file, line, column = BROKEN_AT
    assert physical["artifactLocation"] == {"uri": file, "uriBaseId": "%SRCROOT%"}
    assert physical["region"] == {"startLine": line, "startColumn": column}


@pytest.mark.parametrize("jobs", ["1", "2"])
def test_text_findings_on_stdout_error_with_caret_on_stderr(drawings, capsys, jobs):
    assert cli.main(["check", "drawings/a-valve.cnet", "drawings/c-lamp.cnet"]) == 0
    alone = capsys.readouterr().out.splitlines()
    code = cli.main(["check", "drawings", "--jobs", jobs])
    assert code == 2
    out, err = capsys.readouterr()
    lines = out.splitlines()
    findings = [line for line in lines if line.startswith("drawings/")]
    assert findings == [line for line in alone if line.startswith("drawings/")]
    # 4 findings, and the arc-sustain estimate on the valve's contact that has
    # no DC rating at all (arc-sustain-risk).
    assert len(findings) == 5
    assert "(3 files read, 1 input error)" in lines[len(findings)]
    file, line, column = BROKEN_AT
    head, source, caret = err.splitlines()[:3]
    assert head.startswith(f"{file}:{line}:{column}: error: ")
    assert "R=4,7kohm" in source
    assert caret.index("^") == column - 1


def test_text_output_file_written_despite_the_error(drawings, capsys):
    assert cli.main(["check", "drawings", "-o", "report.txt"]) == 2
    text = Path("report.txt").read_text(encoding="utf-8")
    assert "drawings/c-lamp.cnet:5:1: info:" in text
    assert "1 input error" in text


def test_baseline_not_written_from_a_partial_run(drawings, capsys):
    assert cli.main(["baseline", "drawings", "-o", "base.json"]) == 2
    assert not Path("base.json").exists()
    assert "baseline not written" in capsys.readouterr().err


def test_broken_configuration_still_writes_the_report(drawings, capsys):
    Path("netcheck.yaml").write_text("fail-on: sometimes\n", encoding="utf-8")
    code = cli.main(["check", "drawings", "--format", "json", "-o", "out.json"])
    assert code == 2
    document = json.loads(Path("out.json").read_text(encoding="utf-8"))
    schema.validate("findings", document)
    assert [e["file"] for e in document["errors"]] == ["netcheck.yaml"]
    assert document["findings"] == []
    assert "netcheck.yaml:1:" in capsys.readouterr().err


def test_json_byte_identical_run_to_run(drawings, capsys):
    outputs = set()
    for jobs in ("1", "2", "1"):
        cli.main(["check", "drawings", "--format", "json", "-j", jobs])
        outputs.add(capsys.readouterr().out.encode())
    assert len(outputs) == 1
