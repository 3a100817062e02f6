"""SARIF report: valid against the OASIS SARIF 2.1.0 schema (spec cli.md)."""

from __future__ import annotations

import json

import jsonschema
import pytest
from report_samples import make_catalogue, make_findings

from netcheck.report import Report
from netcheck.report.sarif import render_sarif


def validate(document: dict, schema: dict) -> None:
    # The schema declares its own draft ("$schema": draft-04); use that validator.
    validator_class = jsonschema.validators.validator_for(schema)
    validator_class.check_schema(schema)
    validator_class(schema).validate(document)


def test_valid_against_schema(report, catalogue, sarif_schema):
    validate(json.loads(render_sarif(report, catalogue)), sarif_schema)


def test_empty_report_valid(catalogue, sarif_schema):
    validate(json.loads(render_sarif(Report.build([]), catalogue)), sarif_schema)


def test_schema_catches_a_broken_log(report, catalogue, sarif_schema):
    # The validation is not vacuous: a result without a message fails it.
    document = json.loads(render_sarif(report, catalogue))
    del document["runs"][0]["results"][0]["message"]
    with pytest.raises(jsonschema.ValidationError):
        validate(document, sarif_schema)


def test_driver_rules(report, catalogue):
    run = json.loads(render_sarif(report, catalogue))["runs"][0]
    driver = run["tool"]["driver"]
    assert driver["name"] == "netcheck"
    assert "informationUri" not in driver
    ids = [rule["id"] for rule in driver["rules"]]
    assert ids == sorted(ids) and "unsuppressed-inductive-load" not in ids  # no aliases
    rule = driver["rules"][ids.index("single-connection-net")]
    # rules.md: severities map to SARIF error, warning, note.
    assert rule["defaultConfiguration"] == {"level": "note"}
    assert rule["shortDescription"]["text"] == "Net with one connection"
    assert "common practice" in rule["help"]["text"]


def test_results(report, catalogue):
    run = json.loads(render_sarif(report, catalogue))["runs"][0]
    rules = [rule["id"] for rule in run["tool"]["driver"]["rules"]]
    result = next(r for r in run["results"] if r["ruleId"] == "dc-break-over-rating")
    assert rules[result["ruleIndex"]] == "dc-break-over-rating"
    assert result["level"] == "error"
    location = result["locations"][0]["physicalLocation"]
    assert location["artifactLocation"] == {
        "uri": "design/top.cnet",
        "uriBaseId": "%SRCROOT%",
    }
    assert location["region"]["startLine"] == 7
    assert location["region"]["startColumn"] == 3
    assert list(result["partialFingerprints"]) == ["netcheck/v1"]
    assert result["properties"]["values"]["current"]["text"] == "2.5 A"
    assert result["properties"]["fix"]["text"].startswith("use a pole")
    assert "%SRCROOT%" in run["originalUriBaseIds"]


def test_waived_is_a_suppressed_result(report, catalogue):
    run = json.loads(render_sarif(report, catalogue))["runs"][0]
    waived = [r for r in run["results"] if "suppressions" in r]
    assert len(waived) == 1
    assert waived[0]["suppressions"][0]["kind"] == "inSource"
    assert "checked on site" in waived[0]["suppressions"][0]["justification"]


def test_byte_identical(catalogue):
    findings = make_findings(catalogue)
    one = render_sarif(Report.build(findings), catalogue)
    two = render_sarif(Report.build(list(reversed(findings))), catalogue)
    assert one == two


def test_golden(report, golden):
    golden("findings.sarif", render_sarif(report, make_catalogue()))
