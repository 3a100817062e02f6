"""A fix the budget left unchecked is ``null`` in JSON, not ``false``.

``false`` says the edits were applied and do not clear the finding; a fix the
re-check budget never reached has not been tried, and CI readers of the JSON
must be able to tell the two apart (findings schema, ``fix.verified``).
"""

from __future__ import annotations

import json
from pathlib import Path

from netcheck.catalogue import load_catalogue
from netcheck.fixes.verify import verify_fixes
from netcheck.pipeline import analyse_path, run_checks
from netcheck.report import Report
from netcheck.report.json import render_json
from netcheck.schema import iter_errors

ROOT = Path(__file__).parents[2]
SAMPLE = ROOT / "sample_nets" / "battery-400v" / "battery-400v.cnet"


def _json_verdicts(findings) -> tuple[list, dict]:  # type: ignore[no-untyped-def]
    data = json.loads(
        render_json(Report.build(findings, [str(SAMPLE)]), load_catalogue())
    )
    return [f["fix"]["verified"] for f in data["findings"]], data


def test_budget_spent_gives_null_and_checked_gives_a_boolean() -> None:
    netlist, analysis = analyse_path(SAMPLE)
    findings = run_checks(netlist, analysis)
    assert len(findings) >= 2
    # A budget smaller than one re-check of the design: nothing can be tried.
    starved, data = _json_verdicts(verify_fixes(netlist, analysis, findings, budget=1))
    assert starved == [None] * len(findings)
    assert not list(iter_errors("findings", data))
    full, data = _json_verdicts(verify_fixes(netlist, analysis, findings, budget=None))
    assert full == [True] * len(findings)
    assert not list(iter_errors("findings", data))
