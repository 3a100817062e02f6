"""Baselines: fingerprints survive line moves; broken files are located (cli.md)."""

from __future__ import annotations

import json
from dataclasses import replace

import pytest
from report_samples import make_catalogue, make_findings

from netcheck.baseline import (
    BaselineError,
    apply_baseline,
    load_baseline,
    render_baseline,
)
from netcheck.report import Report

ERROR = "# fake: dc-break-over-rating K1:13-14"
WARNING = "# fake: inductive-load-unsuppressed K1:23-24"
INFO = "# fake: single-connection-net N9"


def test_render_sorted_without_waived():
    report = Report.build(make_findings(make_catalogue()))
    document = json.loads(render_baseline(report.findings))
    assert document["format"] == "netcheck-baseline/1"
    entries = document["fingerprints"]
    assert len(entries) == 4  # the waived Q2:1-2 finding is not in it
    assert all(set(e) == {"fingerprint", "rule", "element", "file"} for e in entries)
    keys = [(e["file"], e["rule"], e["element"]) for e in entries]
    assert keys == sorted(keys)


def test_round_trip_survives_line_moves(tmp_path):
    catalogue = make_catalogue()
    before = Report.build(make_findings(catalogue))
    path = tmp_path / "baseline.json"
    path.write_text(render_baseline(before.findings))
    # The same findings after a reformat: every span moved, fingerprints did not.
    after = Report.build(make_findings(catalogue, shift=17))
    assert [f.span.line for f in after.findings] != [
        f.span.line for f in before.findings
    ]
    kept, suppressed = apply_baseline(after.findings, load_baseline(path))
    assert [f.waived for f in kept] == ["suppressed inside the valve, checked on site"]
    assert suppressed == 4


def test_new_finding_not_suppressed(tmp_path):
    catalogue = make_catalogue()
    old = Report.build(make_findings(catalogue)[:2])
    path = tmp_path / "baseline.json"
    path.write_text(render_baseline(old.findings))
    new = Report.build(make_findings(catalogue))
    kept, suppressed = apply_baseline(new.active, load_baseline(path))
    assert suppressed == 2
    assert {f.element for f in kept} == {"N9", "V1"}


def test_fingerprint_ignores_wording():
    catalogue = make_catalogue()
    one = Report.build(make_findings(catalogue)).findings
    two = Report.build(
        [
            replace(f, message=f.message + " (reworded)")
            for f in make_findings(catalogue)
        ]
    ).findings
    assert [f.fingerprint for f in one] == [f.fingerprint for f in two]


@pytest.mark.parametrize(
    ("text", "fragment", "line", "column"),
    [
        (
            '{"format": "netcheck-baseline/1",\n "fingerprints": [,]}',
            "not valid JSON",
            2,
            19,
        ),
        (
            '{"format": "netcheck-findings/1",\n "fingerprints": []}',
            "not a baseline",
            1,
            2,
        ),
        (
            '{"format": "netcheck-baseline/1",\n "fingerprints": {}}',
            "must be a list",
            2,
            2,
        ),
        (
            '{"format": "netcheck-baseline/1", "fingerprints": [\n'
            '  {"fingerprint": "ab"},\n  {"rule": "x"}\n]}',
            "needs a string 'fingerprint'",
            3,
            3,
        ),
        ("[]", "must be a JSON object", 1, 1),
    ],
)
# A wrong value is located at its key (the shared located-YAML reader keeps key spans).
def test_broken_baseline_located(tmp_path, monkeypatch, text, fragment, line, column):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "b.json").write_text(text)
    with pytest.raises(BaselineError) as caught:
        load_baseline(tmp_path / "b.json")
    assert fragment in caught.value.message
    assert (
        caught.value.span.file,
        caught.value.span.line,
        caught.value.span.column,
    ) == ("b.json", line, column)


# --- through the command line


def test_cli_round_trip_after_reformat(project, capsys):
    project.write("a.cnet", "\n".join(['title "x"', ERROR, WARNING, INFO, ""]))
    assert project.run("baseline", "a.cnet", "-o", "netcheck-baseline.json") == 0
    assert "wrote 3 fingerprints" in capsys.readouterr().out
    # Reformat: blank lines and comments added, statements reordered.
    project.write(
        "a.cnet", "\n".join(["", "# moved", INFO, "", WARNING, ERROR, "", ""])
    )
    assert project.run("check", "a.cnet", "--baseline", "netcheck-baseline.json") == 0
    out = capsys.readouterr().out.splitlines()
    assert out[0] == "no findings (1 file read, 3 in the baseline)"
    # A new finding is reported; the old ones stay quiet.
    project.write(
        "a.cnet",
        "\n".join([INFO, WARNING, ERROR, "# fake: dc-break-over-rating K7:13-14", ""]),
    )
    assert (
        project.run(
            "check",
            "a.cnet",
            "--baseline",
            "netcheck-baseline.json",
            "--format",
            "json",
        )
        == 1
    )
    document = json.loads(capsys.readouterr().out)
    assert [f["element"] for f in document["findings"]] == ["K7:13-14"]
    assert document["summary"]["baseline_suppressed"] == 3


def test_cli_baseline_from_config(project, capsys):
    project.write("a.cnet", ERROR + "\n")
    project.run("baseline", "a.cnet", "-o", "base.json")
    project.write("netcheck.yaml", "baseline: base.json\n")
    assert project.run("check", "a.cnet") == 0


def test_cli_baseline_needs_output(project, capsys):
    project.write("a.cnet", ERROR + "\n")
    assert project.run("baseline", "a.cnet") == 2


def test_cli_broken_baseline_exit_2(project, capsys):
    project.write("a.cnet", ERROR + "\n")
    project.write("base.json", '{\n  "format": 1\n}\n')
    assert project.run("check", "a.cnet", "--baseline", "base.json") == 2
    err = capsys.readouterr().err
    assert err.startswith("base.json:2:3: error: not a baseline")
    assert "Traceback" not in err
