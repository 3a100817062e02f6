"""Findings that share one quantity object per value read as findings with copies.

``CheckContext.finding`` puts one quantity object per (units, float magnitude,
sign of a zero) into the findings' values; a report must not tell the
difference. Compared on every rule case and the unsuppressed bench shape.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

from netcheck.analysis.elements import analyse
from netcheck.catalogue import load_catalogue
from netcheck.checks.context import CheckContext
from netcheck.graph import build_graph
from netcheck.input import load_design
from netcheck.pipeline import run_checks
from netcheck.report import Report
from netcheck.report.json import render_json
from netcheck.report.sarif import render_sarif
from netcheck.report.text import render_plain

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "bench"))
import gen_design  # noqa: E402

CASES = sorted((ROOT / "tests" / "cases").glob("*/*.cnet"))


def _outputs(top: Path) -> tuple[list, list[str]]:
    netlist = load_design(top, display_base=top.parent)
    findings = run_checks(netlist, analyse(build_graph(netlist)))
    report = Report.build(findings, netlist.files)
    catalogue = load_catalogue()
    texts = [
        render_json(report, catalogue),
        render_sarif(report, catalogue),
        render_plain(report, details=True),
    ]
    return findings, texts


def test_shared_quantities_change_no_output(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    tops = CASES + [gen_design.generate(600, tmp_path / "bare", shape="unsuppressed")]
    shared = [_outputs(top) for top in tops]
    monkeypatch.setattr(CheckContext, "_share_quantities", lambda self, values: None)
    copies = [_outputs(top) for top in tops]
    repeats = 0
    for (one, texts), (other, plain) in zip(shared, copies, strict=True):
        assert texts == plain
        assert [f.values for f in one] == [f.values for f in other]
        ids = [id(v) for f in one for v in f.values.values()]
        repeats += len(ids) - len(set(ids))
    assert repeats > 1000  # the objects are in fact shared
