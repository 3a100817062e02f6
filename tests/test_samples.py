"""End to end: each shipped sample design against its reviewer's expect.yaml.

``sample_nets/*/expect.yaml`` lists the findings an experienced reviewer expects,
with values worked out by hand from circuit laws and the part data (the arithmetic
is in each entry's ``why``); values are compared with a 1 % tolerance.
"""

from __future__ import annotations

import os
from pathlib import Path

import pint
import pytest
import yaml

from netcheck.analysis.elements import Analysis
from netcheck.pipeline import analyse_path, run_checks
from netcheck.units import Q_

SAMPLES = Path(__file__).resolve().parent.parent / "sample_nets"
# The expect.yaml names of values -> the names the findings carry them under.
ALIASES = {"rating_current": "allowed", "series_poles": "poles", "vdc_max": "rated",
           "release_time": "release_diode"}


def _designs() -> list[Path]:
    return sorted(p.parent for p in SAMPLES.glob("*/expect.yaml"))


def _run(folder: Path) -> tuple[dict, list, Analysis]:
    expect = yaml.safe_load((folder / "expect.yaml").read_text(encoding="utf-8"))
    cwd = os.getcwd()
    os.chdir(folder)  # findings name files relative to the working directory
    try:
        netlist, analysis = analyse_path(Path(expect["top"]))
        findings = run_checks(netlist, analysis)
    finally:
        os.chdir(cwd)
    return expect, findings, analysis


def _key(item) -> tuple:  # type: ignore[no-untyped-def]
    if isinstance(item, dict):
        return (item["rule"], item["element"], item["file"], item["line"])
    return (item.rule, item.element, item.span.file, item.span.line)


@pytest.mark.parametrize("folder", _designs(), ids=lambda p: p.name)
def test_sample_findings_are_the_reviewers(folder: Path) -> None:
    expect, findings, _ = _run(folder)
    got = {_key(f) for f in findings if not f.waived}
    want = {_key(e) for e in expect.get("findings") or []}
    diff = [f"-missing {k}" for k in sorted(want - got)] + [
        f"+unexpected {k}" for k in sorted(got - want)]
    assert not diff, "\n".join(diff)
    waived = {_key(f) for f in findings if f.waived}
    assert waived == {_key(e) for e in expect.get("waived") or []}


def _actual(name: str, finding, analysis: Analysis) -> pint.Quantity | None:  # type: ignore[no-untyped-def]
    value = finding.values.get(ALIASES.get(name, name))
    if isinstance(value, pint.Quantity):
        return value
    if isinstance(value, (int, float)):
        return Q_(value, "")
    element = analysis.elements.get(finding.element)
    if element is not None:
        return getattr(element, name, None)
    for info in analysis.loads.values():
        if info.branch.ref == finding.element:
            return getattr(info, name, None) or getattr(info.facts, name, None)
    return None


@pytest.mark.parametrize("folder", _designs(), ids=lambda p: p.name)
def test_sample_values_match_hand_calculations(folder: Path) -> None:
    expect, findings, analysis = _run(folder)
    by_key = {_key(f): f for f in findings}
    checked = 0
    for entry in (expect.get("findings") or []) + (expect.get("waived") or []):
        finding = by_key.get(_key(entry))
        if finding is None:
            continue  # reported by the test above
        for name, text in (entry.get("values") or {}).items():
            want = Q_(text) if not str(text).isdigit() else Q_(float(text), "")
            got = _actual(name, finding, analysis)
            assert got is not None, f"{_key(entry)}: no value {name}"
            # Hand calculation in expect.yaml ("why"), 1 % tolerance.
            assert got.to(want.units).magnitude == pytest.approx(
                want.magnitude, rel=0.01), f"{_key(entry)} {name}: {got} != {want}"
            checked += 1
    if expect.get("findings"):
        assert checked, "no hand-computed value was compared"


def test_clean_sample_stays_clean() -> None:
    # A design with correct suppression everywhere must raise nothing at all:
    # false alarms cost users' trust as much as misses.
    _, findings, _ = _run(SAMPLES / "clean-brake-24v")
    assert findings == []
