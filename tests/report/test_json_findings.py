"""The JSON report's direct finding writer against the generic dict writer.

``netcheck.report.json_findings.findings_text`` must write exactly what
``dump`` makes of the findings' ``finding_dict``s: the report's bytes may not
depend on which path wrote them. Compared on every rule case, the samples
(with their verified fixes and edits) and findings with awkward values.
"""

from __future__ import annotations

import math
from pathlib import Path

from netcheck.catalogue import load_catalogue
from netcheck.findings import Finding, Severity
from netcheck.pipeline import CheckOptions, check_path
from netcheck.report import Report
from netcheck.report.json import finding_dict, render_json, write
from netcheck.report.json_findings import findings_text
from netcheck.source import Span
from netcheck.units import Q_

ROOT = Path(__file__).resolve().parents[2]
CASES = sorted((ROOT / "tests" / "cases").glob("*/*.cnet"))
SAMPLES = sorted(p.parent for p in (ROOT / "sample_nets").glob("*/expect.yaml"))
PADS = ("\n  ", "\n", "\n      ")


def _generic(findings: tuple[Finding, ...], pad: str) -> str:
    catalogue = load_catalogue()
    out: list[str] = []
    write([finding_dict(f, catalogue.get(f.rule)) for f in findings], pad, out)
    return "".join(out)


def _assert_same(findings: tuple[Finding, ...]) -> None:
    catalogue = load_catalogue()
    for pad in PADS:
        # Twice: the second run is served from the written-entry caches.
        for _ in range(2):
            assert findings_text(findings, catalogue, pad) == _generic(findings, pad)


def _report(path: Path, verify: bool) -> Report:
    result = check_path(path, CheckOptions(verify_fixes=verify))
    return Report.build(result.findings, result.files)


def test_every_rule_case_writes_the_same() -> None:
    findings = []
    for path in CASES:
        findings += _report(path, verify=False).findings
    assert len({f.rule for f in findings}) >= 25  # the cases cover the catalogue
    _assert_same(tuple(findings))


def test_samples_with_fixes_write_the_same() -> None:
    findings = []
    for folder in SAMPLES:
        findings += _report(folder / f"{folder.name}.cnet", verify=True).findings
    assert any(f.edits for f in findings)  # edits and verified are written too
    assert {f.verified for f in findings} >= {True}
    _assert_same(tuple(findings))


def _odd(values: dict, **more) -> Finding:
    fields = {
        "rule": "inductive-load-unsuppressed",
        "severity": Severity.WARNING,
        "message": 'K1 "quoted" \\ back-slash, tab\t, ünïcode Ω µ, \u2028',
        "span": Span("dir/a b.cnet", 3, 7),
        "element": "K1",
        "values": values,
        "fix": "fit a diode",
        "fingerprint": "0123456789abcdef",
    }
    fields.update(more)
    return Finding(**fields)


def test_awkward_values_write_the_same() -> None:
    numbers = [
        0.0,
        -0.0,
        1e-300,
        -1e-300,
        5e-324,
        1e300,
        -2.5,
        999.95,
        0.0009995,
        1 / 3,
        2**53 + 1.0,
        math.nan,
        math.inf,
        -math.inf,
        7,
        0,
        -3,
    ]
    values: dict = {f"v{i}": Q_(n, "V") for i, n in enumerate(numbers)}
    values.update(
        {
            "ms": Q_(1.5, "ms"),
            "ratio": Q_(0.5, ""),
            "kwh": Q_(2.0, "kWh"),
            "none": None,
            "yes": True,
            "no": False,
            "count": 3,
            "float": 0.1,
            "nan": math.nan,
            "text": "a\nb",
            "refs": ("K1", "K2"),
            "set": frozenset(),
            "diode_voltage": Q_(48.0, "V"),
            "loads": "Y1, Y2",
        }
    )
    findings = (
        _odd(values),
        _odd({}, fix=None, waived='accepted: "reason"', references=("own ref",)),
        _odd(
            {"loads": "Y1"}, rule="no-such-rule", severity=Severity.INFO, verified=True
        ),
        _odd({"current": Q_(-0.0, "A"), "loads": "Y9"}, verified=False),
        _odd({1: Q_(2.0, "V"), 2: "two", 3: None}),  # names that are not text
    )
    _assert_same(findings)
    _assert_same(())


def test_render_json_uses_the_direct_writer_and_agrees() -> None:
    report = _report(SAMPLES[0] / f"{SAMPLES[0].name}.cnet", verify=True)
    text = render_json(report, load_catalogue())
    findings_part = _generic(report.findings, "\n  ")
    assert f'"findings": {findings_part},' in text


def test_zeros_of_either_sign_keep_their_own_entries() -> None:
    # IEEE 754: 0.0 == -0.0, so a cache keyed by the number alone would serve
    # one for the other; both are cached now and must still write apart.
    for order in ((0.0, -0.0, 0), (-0.0, 0.0, 0), (0, -0.0, 0.0)):
        findings = tuple(_odd({"v": Q_(n, "V")}) for n in order)
        _assert_same(findings)
        _assert_same(findings)  # again, from the caches


def test_zeros_of_either_sign_are_worded_apart() -> None:
    from netcheck.findings import _quantity_text
    from netcheck.units import format_quantity

    for order in ((0.0, -0.0, 0), (-0.0, 0.0, 0)):
        for n in order * 2:
            assert _quantity_text(Q_(n, "A")) == format_quantity(Q_(n, "A"))
    assert _quantity_text(Q_(-0.0, "A")) != _quantity_text(Q_(0.0, "A"))


def test_edits_of_every_kind_write_the_same() -> None:
    from netcheck.fixes.edits import AddComponent, Reconnect, Remove, SetValues, UsePart

    edits = (
        AddComponent(
            "diode",
            'V"1',
            (("voltage_rating", "48V"), ("note", "tab\t back\\ µ Ω \u2028")),
            (("A", "M1"), ("K", "W1.1")),
            "Y1",
        ),
        AddComponent("varistor", "RV1", (), (("1", "a"), ("1", "b")), "K1"),
        Reconnect("K1", (("13", "N2"),)),
        SetValues("K2", (("dc_current", "2A"), ("dc_current", "3A"))),
        UsePart("K3", "relay-x", ("coil",)),
        Remove("V9"),
    )
    findings = tuple(
        _odd({"loads": "Y1"}, edits=edits[i:], verified=bool(i % 2))
        for i in range(len(edits))
    )
    _assert_same(findings)


def test_one_value_object_shared_by_findings_and_names_writes_the_same() -> None:
    # Findings share value objects (one quantity per value): the member written
    # for an object is remembered by its identity, with its name and pad.
    shared, text = Q_(0.25, "A"), "Y1, Y2"
    findings = tuple(
        _odd({"current": shared, "diode_current": shared, "loads": text, "x": i})
        for i in range(3)
    )
    _assert_same(findings)
    _assert_same(tuple(_odd({"other": shared, "loads": text}) for _ in range(2)))
