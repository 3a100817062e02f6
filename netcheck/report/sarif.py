"""The SARIF 2.1.0 report: one run, the rule catalogue as the driver's rules.

Artifact URIs are relative to the working directory under the base id
``%SRCROOT%``; the base itself is left for the consumer to resolve so that the
output holds no absolute path and stays byte-identical between machines.
Waived findings are results with an ``inSource`` suppression that carries the
waiver's reason. Input errors of files that could not be checked are
``toolExecutionNotifications`` of the one invocation, which then says
``executionSuccessful: false``; the other files' results are all there.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Mapping
from pathlib import Path
from typing import Any
from urllib.parse import quote

from netcheck import __version__
from netcheck.catalogue import RuleMeta
from netcheck.error_records import ErrorRecord
from netcheck.findings import Finding, Severity
from netcheck.report import (
    CAUTION,
    Report,
    fix_dict,
    references,
    unique_rules,
    value_dicts,
)
from netcheck.report.json import LazyList, dump, dump_to, unverified_dict
from netcheck.report.template_words import readable

__all__ = ["SCHEMA_URI", "LEVELS", "render_sarif", "write_sarif"]

SCHEMA_URI = (
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/"
    "sarif-schema-2.1.0.json"
)
# rules.md: SARIF levels error, warning, note.
LEVELS = {Severity.ERROR: "error", Severity.WARNING: "warning", Severity.INFO: "note"}
SRCROOT = "%SRCROOT%"
DESCRIPTION = "Lints control-circuit netlists for DC switching hazards."


def render_sarif(report: Report, catalogue: Mapping[str, RuleMeta]) -> str:
    """Render the report as a SARIF 2.1.0 log with one run."""
    return dump(_log(report, catalogue))


def write_sarif(
    report: Report, catalogue: Mapping[str, RuleMeta], sink: Callable[[str], object]
) -> None:
    """Write ``render_sarif(report, catalogue)`` to ``sink`` in pieces, in order.

    Each result's dict is made, written and dropped in turn: neither the
    results nor the text are ever held whole.
    """
    dump_to(_log(report, catalogue), sink)


def _log(report: Report, catalogue: Mapping[str, RuleMeta]) -> dict[str, Any]:
    rules = unique_rules(catalogue)
    index = {meta.name: i for i, meta in enumerate(rules)}
    run = {
        "tool": {
            "driver": {
                "name": "netcheck",
                "version": __version__,
                "semanticVersion": __version__,
                "fullDescription": {"text": f"{DESCRIPTION} {CAUTION}"},
                "rules": [_descriptor(meta) for meta in rules],
                "properties": {"caution": CAUTION},
            }
        },
        "invocations": [_invocation(report)],
        "originalUriBaseIds": {
            SRCROOT: {"description": {"text": "The directory netcheck was run in."}}
        },
        "columnKind": "unicodeCodePoints",
        "results": LazyList(
            lambda: (
                _result(f, catalogue.get(f.rule), index.get(f.rule))
                for f in report.findings
            )
        ),
        "properties": {
            "summary": report.summary(),
            "unverified": [unverified_dict(e) for e in report.unverified],
        },
    }
    return {"$schema": SCHEMA_URI, "version": "2.1.0", "runs": [run]}


def _descriptor(meta: RuleMeta) -> dict[str, Any]:
    return {
        "id": meta.name,
        "name": meta.name,
        "shortDescription": {"text": meta.title},
        "fullDescription": {"text": meta.rationale},
        "help": {"text": help_text(meta)},
        "defaultConfiguration": {"level": LEVELS[meta.severity]},
        "properties": {"family": meta.family, "tags": [meta.family]},
    }


def help_text(meta: RuleMeta) -> str:
    """Join the rationale, the references and the fix template(s) as help text.

    Placeholders of the templates read as words (``<breaking current>``): the
    help is shown before any finding fills them.
    """
    parts = [meta.rationale]
    if meta.references:
        parts.append("References: " + "; ".join(meta.references) + ".")
    for variant, template in sorted(meta.fixes.items()):
        label = "Fix" if variant == "default" else f"Fix ({variant})"
        parts.append(f"{label}: {readable(template, meta.name)}")
    return "\n\n".join(parts)


def _result(
    finding: Finding, meta: RuleMeta | None, index: int | None
) -> dict[str, Any]:
    result: dict[str, Any] = {"ruleId": finding.rule}
    if index is not None:
        result["ruleIndex"] = index
    result.update(
        {
            "level": LEVELS[finding.severity],
            "message": result_message(finding),
            "locations": [_location(finding)],
            "partialFingerprints": {"netcheck/v1": finding.fingerprint},
            "properties": {
                "element": finding.element,
                "values": value_dicts(finding.values),
                "fix": fix_dict(finding, meta),
                "references": references(finding, meta),
            },
        }
    )
    if finding.waived is not None:
        result["suppressions"] = [
            {"kind": "inSource", "status": "accepted", "justification": finding.waived}
        ]
    return result


def _invocation(report: Report) -> dict[str, Any]:
    """Whether every file could be checked; each input error as a notification."""
    return {
        "executionSuccessful": not report.errors,
        "toolExecutionNotifications": [_notification(e) for e in report.errors],
    }


def _notification(error: ErrorRecord) -> dict[str, Any]:
    notification: dict[str, Any] = {
        "level": "error",
        "message": {"text": error.message},
    }
    if error.file:
        region = {"startLine": error.line, "startColumn": max(1, error.column)}
        physical: dict[str, Any] = {"artifactLocation": artifact_location(error.file)}
        if error.line >= 1:
            physical["region"] = region
        notification["locations"] = [{"physicalLocation": physical}]
    return notification


def result_message(finding: Finding) -> dict[str, str]:
    """The message, and the fix as its second sentence, in text and markdown.

    SARIF's own ``fixes`` need concrete file replacements (``artifactChanges``
    is required); a fix such as "fit a diode" is advice, not an edit, so it
    travels in the message, where viewers show it, and in ``properties.fix``.
    """
    if not finding.fix:
        return {"text": finding.message}
    message, fix = _sentence(finding.message), _sentence(finding.fix)
    return {
        "text": f"{message} Fix: {fix}",
        "markdown": f"{_markdown(message)}\n\n**Fix:** {_markdown(fix)}",
    }


def _sentence(text: str) -> str:
    text = " ".join(text.split())
    return text if text.endswith((".", "!", "?")) else f"{text}."


_MARKDOWN_SPECIAL = re.compile(r"([\\`*_{}\[\]<>()#+!|~])")


def _markdown(text: str) -> str:
    """Escape what markdown would read as markup (names like K1_A, [rule])."""
    return _MARKDOWN_SPECIAL.sub(r"\\\1", text)


def _location(finding: Finding) -> dict[str, Any]:
    span = finding.span
    region: dict[str, int] = {"startLine": max(1, span.line)}
    if span.column >= 1:
        region["startColumn"] = span.column
    if span.end_line >= span.line and span.end_line >= 1 and span.end_column >= 1:
        if (span.end_line, span.end_column) > (span.line, span.column):
            region["endLine"] = span.end_line
            region["endColumn"] = span.end_column
    return {
        "physicalLocation": {
            "artifactLocation": artifact_location(span.file),
            "region": region,
        }
    }


def artifact_location(file: str) -> dict[str, str]:
    """Return a relative URI under ``%SRCROOT%``, or a ``file:`` URI outside it."""
    path = Path(file)
    if path.is_absolute():
        return {"uri": path.as_uri()}
    return {"uri": quote(path.as_posix()), "uriBaseId": SRCROOT}
