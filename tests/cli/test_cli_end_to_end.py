"""End to end through the real pipeline, on a copy of sample_nets/machine-24v.

Skipped only while ``check_path`` still raises NotImplementedError; once the
pipeline exists these run.
"""

from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import jsonschema
import pytest

from netcheck import cli, pipeline

SAMPLE = Path(__file__).resolve().parents[2] / "sample_nets" / "machine-24v"


def _pipeline_pending() -> bool:
    try:
        pipeline.check_path(SAMPLE / "machine-24v.cnet")
    except NotImplementedError:
        return True
    except Exception:  # noqa: BLE001 - any other outcome means the pipeline runs
        return False
    return False


pytestmark = pytest.mark.skipif(
    _pipeline_pending(), reason="pipeline not implemented yet"
)


@pytest.fixture
def design(tmp_path, monkeypatch):
    (tmp_path / ".git").mkdir()
    shutil.copytree(SAMPLE, tmp_path / "machine")
    monkeypatch.chdir(tmp_path)
    monkeypatch.delenv("NO_COLOR", raising=False)
    return tmp_path / "machine"


def run_json(capsys, *argv: str) -> tuple[int, dict, bytes]:
    status = cli.main(["check", *argv, "--format", "json"])
    out = capsys.readouterr().out
    return status, json.loads(out), out.encode()


def test_directory_check_is_deterministic_and_consistent(design, capsys):
    status, document, first = run_json(capsys, "machine")
    _, _, second = run_json(capsys, "machine")
    _, _, parallel = run_json(capsys, "machine", "--jobs", "2")
    assert first == second == parallel
    assert document["findings"], "the sample design has expected findings"
    errors = document["summary"]["error"]
    assert status == (1 if errors else 0)
    # The included sheet is part of the top design, not a design of its own.
    assert "machine/sheet-02-plc-outputs.cnet" in document["files"]
    assert all(not Path(f).is_absolute() for f in document["files"])


def test_sarif_of_a_real_run_is_valid(design, capsys):
    cli.main(["check", "machine", "--format", "sarif"])
    log = json.loads(capsys.readouterr().out)
    schema_path = (
        Path(__file__).resolve().parents[1] / "report" / "sarif-schema-2.1.0.json"
    )
    schema = json.loads(schema_path.read_text(encoding="utf-8"))
    jsonschema.validators.validator_for(schema)(schema).validate(log)


def test_baseline_survives_reformatting(design, capsys):
    _, before, _ = run_json(capsys, "machine")
    assert cli.main(["baseline", "machine", "-o", "base.json"]) == 0
    capsys.readouterr()
    # Reformat: comment and blank lines at the top of every file move every line.
    for path in design.glob("*.cnet"):
        text = path.read_text(encoding="utf-8")
        path.write_text("# reformatted\n\n\n" + text, encoding="utf-8")
    status, after, _ = run_json(capsys, "machine", "--baseline", "base.json")
    active = [f for f in after["findings"] if f["waived"] is None]
    assert active == []
    assert status == 0
    expected = len(
        {f["fingerprint"] for f in before["findings"] if f["waived"] is None}
    )
    assert after["summary"]["baseline_suppressed"] >= expected
    _, moved, _ = run_json(capsys, "machine")
    assert sorted(f["fingerprint"] for f in moved["findings"]) == sorted(
        f["fingerprint"] for f in before["findings"]
    )
    assert [f["line"] for f in moved["findings"]] != [
        f["line"] for f in before["findings"]
    ]


def test_piped_text_of_a_real_run(design, capsys):
    cli.main(["check", "machine"])
    lines = capsys.readouterr().out.splitlines()
    assert lines[-1].startswith("note: Results depend on the rating data given")
    assert re.fullmatch(r"\d+ findings: .+ \(\d+ files read\)", lines[-4])
    assert lines[-3].startswith("by rule: inductive-load-unsuppressed ")
    assert re.fullmatch(r"switching elements: \d+ verified", lines[-2])
    assert all(line.startswith("machine/") for line in lines[:-4])
