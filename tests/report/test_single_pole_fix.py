"""A one-pole device is never told to wire poles in series (issue: "put 5 poles")."""

from __future__ import annotations

from pathlib import Path

from netcheck.pipeline import check_path

CASES = Path(__file__).parents[1] / "cases"


def _fix_text(case: str, rule: str) -> str:
    findings = check_path(CASES / case).findings
    (finding,) = [f for f in findings if f.rule == rule]
    return finding.fix


def test_single_output_rated_in_watts_gets_a_buildable_fix() -> None:
    # 50 W at L/R 40 ms breaking 2 A at 110 V: V/n would need 5 poles (WE-11).
    text = _fix_text(
        "dc-break-over-rating/bad-breaking-power-single-output.cnet",
        "dc-break-over-rating",
    )
    assert "in series" not in text
    assert "2 A at 110 V" in text


def test_a_listed_spare_pole_is_offered() -> None:
    text = _fix_text(
        "dc-voltage-over-rating/bad-above-top-spare-pole.cnet",
        "dc-voltage-over-rating",
    )
    assert text.startswith("put 2 poles of the device in series")
