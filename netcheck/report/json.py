"""The JSON report: ``netcheck-findings/1``, byte-identical for the same input.

Shape (cli.md, "JSON output")::

    {"format": "netcheck-findings/1",
     "tool": {"name": "netcheck", "version": "0.1.0"},
     "files": ["design/top.cnet", ...],          # every file read, sorted
     "findings": [ {finding}, ... ],             # sorted by file, line, column, rule
     "summary": {"error": n, "warning": n, "info": n, "total": n,
                 "waived": n, "baseline_suppressed": n, "baseline_stale": n},
     "stale_baseline": [{"fingerprint", "rule", "element", "file"}, ...]}

Each finding has ``rule``, ``severity``, ``message``, ``file``, ``line``,
``column``, ``element``, ``values`` (name -> ``{"value", "unit", "text"}``),
``fix`` (``{"text", "values"}`` or null), ``references``, ``fingerprint`` and
``waived``: null, or the reason of the ``waive`` statement that accepted it.
Waived findings are listed so that a review can see them, but the counts of
the summary (except ``waived``) and ``--fail-on`` leave them out.
``stale_baseline`` lists the baseline entries that matched no current finding
(empty without a baseline), as the baseline file has them.
"""

from __future__ import annotations

import json
from collections.abc import Mapping
from typing import Any

from netcheck import __version__
from netcheck.catalogue import RuleMeta
from netcheck.findings import Finding
from netcheck.report import Report, fix_dict, references, value_dicts

__all__ = ["FORMAT", "render_json", "finding_dict", "dump"]

FORMAT = "netcheck-findings/1"


def finding_dict(finding: Finding, meta: RuleMeta | None) -> dict[str, Any]:
    """One finding as the JSON object of the format."""
    return {
        "rule": finding.rule,
        "severity": finding.severity.label,
        "message": finding.message,
        "file": finding.span.file,
        "line": finding.span.line,
        "column": finding.span.column,
        "element": finding.element,
        "values": value_dicts(finding.values),
        "fix": fix_dict(finding, meta),
        "references": references(finding, meta),
        "fingerprint": finding.fingerprint,
        "waived": finding.waived,
    }


def render_json(report: Report, catalogue: Mapping[str, RuleMeta]) -> str:
    """Render the report as ``netcheck-findings/1`` JSON text."""
    document = {
        "format": FORMAT,
        "tool": {"name": "netcheck", "version": __version__},
        "files": list(report.files),
        "findings": [finding_dict(f, catalogue.get(f.rule)) for f in report.findings],
        "summary": report.summary(),
        "stale_baseline": [dict(entry) for entry in report.stale_baseline],
    }
    return dump(document)


def dump(document: Any) -> str:
    """Serialise deterministically: fixed key order, two-space indent, final newline."""
    return json.dumps(document, indent=2, ensure_ascii=False, allow_nan=False) + "\n"
