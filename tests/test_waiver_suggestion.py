"""A waiver naming a misspelled rule says which rule it probably meant."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from netcheck.pipeline import check_path

CASES = Path(__file__).parent / "cases" / "unused-waiver"
DESIGN = """\
parts "case.parts.yaml"
supply  G1  dc=24V  earth=minus  +:L+  -:M
relay   K1  part=relay-dc13  13:L+  14:N1
load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
waive {rule} K1:13-14 "suppressed in the valve plug"
"""


def unused(tmp_path: Path, rule: str):
    shutil.copy(CASES / "case.parts.yaml", tmp_path)
    design = tmp_path / "a.cnet"
    design.write_text(DESIGN.format(rule=rule))
    result = check_path(design)
    (finding,) = [f for f in result.findings if f.rule == "unused-waiver"]
    return finding


@pytest.mark.parametrize(
    ("typed", "meant"),
    [
        ("inductive-load-unsupressed", "inductive-load-unsuppressed"),
        ("inductive-load-unsuppresed", "inductive-load-unsuppressed"),
        ("dc-break-over-ratng", "dc-break-over-rating"),
    ],
)
def test_misspelled_rule_gets_the_closest_name(tmp_path, typed, meant):
    finding = unused(tmp_path, typed)
    assert finding.variant == "misspelled-rule"
    assert finding.values == {"rule": typed, "target": "K1:13-14", "suggestion": meant}
    assert f"did you mean {meant}?" in finding.message
    assert finding.fix is not None and meant in finding.fix


def test_no_close_rule_no_guess(tmp_path):
    finding = unused(tmp_path, "zzz-qqq")
    assert finding.variant == "unknown-rule"
    assert "suggestion" not in finding.values
    assert "did you mean" not in finding.message
