"""JSON report: the netcheck-findings/1 shape (spec cli.md, "JSON output")."""

from __future__ import annotations

import json

from report_samples import make_catalogue, make_findings

from netcheck import __version__
from netcheck.report import CAUTION, Report
from netcheck.report.json import render_json


def test_top_level_shape(report, catalogue):
    # cli.md: {"format": "netcheck-findings/1", "tool", "files", "findings", "summary"},
    # extended by "stale_baseline" (baseline entries matching no current finding)
    document = json.loads(render_json(report, catalogue))
    assert list(document) == [
        "format",
        "tool",
        "files",
        "findings",
        "errors",
        "unverified",
        "summary",
        "stale_baseline",
    ]
    assert document["stale_baseline"] == []
    assert document["format"] == "netcheck-findings/1"
    assert document["tool"] == {
        "name": "netcheck",
        "version": __version__,
        "caution": CAUTION,
    }
    assert document["errors"] == []
    assert document["files"] == ["design/sheet-02.cnet", "design/top.cnet"]


def test_finding_keys_and_values(report, catalogue):
    # cli.md: rule, severity, message, file, line, column, element, values
    # ({"value": float, "unit", "text"}), fix, references, fingerprint.
    document = json.loads(render_json(report, catalogue))
    first = document["findings"][0]
    assert set(first) >= {
        "rule",
        "severity",
        "message",
        "file",
        "line",
        "column",
        "element",
        "values",
        "fix",
        "references",
        "fingerprint",
    }
    breaking = next(
        f for f in document["findings"] if f["rule"] == "dc-break-over-rating"
    )
    assert breaking["values"]["voltage"] == {
        "value": 110.0,
        "unit": "V",
        "text": "110 V",
    }
    assert breaking["values"]["current"]["unit"] == "A"
    assert breaking["fix"]["values"].keys() == {"current", "voltage"}
    assert breaking["line"] == 7 and breaking["column"] == 3
    net = next(f for f in document["findings"] if f["rule"] == "single-connection-net")
    assert net["fix"] is None


def test_order_is_file_line_column(report, catalogue):
    document = json.loads(render_json(report, catalogue))
    keys = [(f["file"], f["line"], f["column"]) for f in document["findings"]]
    assert keys == sorted(keys)


def test_waived_listed_but_not_counted(report, catalogue):
    document = json.loads(render_json(report, catalogue))
    waived = [f for f in document["findings"] if f["waived"]]
    assert [f["element"] for f in waived] == ["Q2:1-2"]
    assert document["summary"] == {
        "error": 2,
        "warning": 1,
        "info": 1,
        "total": 4,
        "waived": 1,
        "baseline_suppressed": 0,
        "baseline_stale": 0,
        "by_rule": {
            "dc-break-over-rating": 1,
            "inductive-load-unsuppressed": 1,
            "single-connection-net": 1,
            "suppressor-underrated": 1,
        },  # the waived finding of inductive-load-unsuppressed is not counted
        "switching_elements": 4,
        "verified": 2,
        "unverified": 1,
        "input_errors": 0,
    }


def test_byte_identical_whatever_the_input_order(catalogue):
    # cli.md: "the same input gives byte-identical output".
    findings = make_findings(catalogue)
    one = render_json(Report.build(findings, ["b.cnet", "a.cnet"]), catalogue)
    two = render_json(Report.build(findings[::-1], ["a.cnet", "b.cnet"]), catalogue)
    assert one.encode() == two.encode()


def test_fingerprint_filled_when_missing_and_stable_across_line_moves(catalogue):
    # cli.md: a stable fingerprint "that survives reformatting and line moves".
    before = json.loads(render_json(Report.build(make_findings(catalogue)), catalogue))
    moved = Report.build(make_findings(catalogue, shift=5))
    after = json.loads(render_json(moved, catalogue))
    assert all(f["fingerprint"] for f in before["findings"])
    assert sorted(f["fingerprint"] for f in before["findings"]) == sorted(
        f["fingerprint"] for f in after["findings"]
    )


def test_pipeline_fingerprint_kept(catalogue):
    findings = make_findings(catalogue)
    from dataclasses import replace

    given = [replace(findings[0], fingerprint="0123456789abcdef")]
    document = json.loads(render_json(Report.build(given), catalogue))
    assert document["findings"][0]["fingerprint"] == "0123456789abcdef"


def test_golden(report, catalogue, golden):
    golden("findings.json", render_json(report, make_catalogue()))
