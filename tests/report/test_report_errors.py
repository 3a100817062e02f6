"""Input errors in every report format, and the records they travel in.

A report holds the input errors of the files it could not check next to the
findings of those it could (cli.md: exit 2 on input error).
"""

from __future__ import annotations

import json
import pickle

from jsonschema import validate

from netcheck import schema
from netcheck.error_records import ErrorRecord, os_error_record, records_of
from netcheck.errors import InputErrors, QuantityError, SyntaxInputError
from netcheck.report import CAUTION, Report
from netcheck.report.json import render_json
from netcheck.report.sarif import render_sarif
from netcheck.report.text import render_plain
from netcheck.source import Span

BROKEN = ErrorRecord(
    "design/broken.cnet", 4, 9, "expected a statement", "design/broken.cnet:4:9: ..."
)
UNPLACED = ErrorRecord("", 0, 0, "no configuration", "netcheck: error: ...")


def _report(findings, *errors: ErrorRecord) -> Report:
    files = ["design/top.cnet", "design/broken.cnet"]
    return Report.build(findings, files, errors=[*errors, *errors])  # repeats dropped


def test_records_of_every_error_keep_position_and_rendering():
    err = InputErrors(
        [
            QuantityError("bad quantity", Span("a.cnet", 3, 7)),
            SyntaxInputError("expected a statement", Span("a.cnet", 1, 1)),
        ]
    )
    records = records_of(err, "a.cnet")
    assert [(r.file, r.line, r.column) for r in records] == [
        ("a.cnet", 1, 1),
        ("a.cnet", 3, 7),
    ]
    assert records[1].rendered.startswith("a.cnet:3:7: error: bad quantity")
    # They cross process boundaries (--jobs) unchanged.
    assert pickle.loads(pickle.dumps(records)) == records


def test_records_of_an_unplaced_error_go_on_the_design():
    (record,) = records_of(SyntaxInputError("empty"), "top.cnet")
    assert (record.file, record.line, record.column) == ("top.cnet", 0, 0)


def test_os_error_record_names_the_file():
    record = os_error_record(
        FileNotFoundError(2, "No such file or directory", "gone.cnet"), "top.cnet"
    )
    assert record.file == "gone.cnet" and record.line == 0
    assert record.rendered == "gone.cnet: error: No such file or directory"


def test_json_lists_errors_and_validates(findings, catalogue):
    document = json.loads(render_json(_report(findings, BROKEN, UNPLACED), catalogue))
    schema.validate("findings", document)
    assert document["errors"] == [
        {"file": "", "line": 0, "column": 0, "message": "no configuration"},
        {
            "file": "design/broken.cnet",
            "line": 4,
            "column": 9,
            "message": "expected a statement",
        },
    ]
    assert document["summary"]["input_errors"] == 2
    assert len(document["findings"]) == len(findings)
    assert document["tool"]["caution"] == CAUTION


def test_sarif_invocation_failed_with_located_notifications(
    findings, catalogue, sarif_schema
):
    log = json.loads(render_sarif(_report(findings, BROKEN, UNPLACED), catalogue))
    validate(log, sarif_schema)
    run = log["runs"][0]
    (invocation,) = run["invocations"]
    assert invocation["executionSuccessful"] is False
    unplaced, located = invocation["toolExecutionNotifications"]
    assert unplaced == {"level": "error", "message": {"text": "no configuration"}}
    assert located["locations"] == [
        {
            "physicalLocation": {
                "artifactLocation": {
                    "uri": "design/broken.cnet",
                    "uriBaseId": "%SRCROOT%",
                },
                "region": {"startLine": 4, "startColumn": 9},
            }
        }
    ]
    assert len(run["results"]) == len(findings)
    assert CAUTION in run["tool"]["driver"]["fullDescription"]["text"]


def test_sarif_markdown_escapes_markup(findings, catalogue):
    from dataclasses import replace

    odd = replace(findings[1], message="K1_A breaks [x]", fix="use *two* poles")
    result = json.loads(render_sarif(Report.build([odd]), catalogue))["runs"][0][
        "results"
    ][0]
    assert result["message"]["text"] == "K1_A breaks [x]. Fix: use *two* poles."
    assert result["message"]["markdown"] == (
        "K1\\_A breaks \\[x\\].\n\n**Fix:** use \\*two\\* poles."
    )


def test_text_counts_input_errors_in_the_summary(findings):
    lines = render_plain(_report(findings, BROKEN)).splitlines()
    summary = "4 findings: 2 errors, 1 warning, 1 info (2 files read, 1 waived, "
    assert lines[-4] == summary + "1 input error)"
