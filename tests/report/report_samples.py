"""Sample findings, a small rule catalogue and fixtures for report and CLI tests.

The catalogue here is a stand-in with the shape of ``rules/*.yaml``; the rule
names and severities follow the spec's rules.md so that the tests read like real
runs. Margins and their sources are illustrative only.
"""

from __future__ import annotations

import json
import os
from pathlib import Path

import pytest

from netcheck.catalogue import Margin, RuleMeta
from netcheck.coverage import NOT_ANALYSED, ElementStatus
from netcheck.findings import Finding, Severity, fill_template
from netcheck.report import Report
from netcheck.source import Span
from netcheck.units import Q_

# A copy of the OASIS SARIF 2.1.0 schema (errata 01), as shared with the spec.
SARIF_SCHEMA = Path(__file__).with_name("sarif-schema-2.1.0.json")
GOLDEN = Path(__file__).with_name("golden")


def make_catalogue() -> dict[str, RuleMeta]:
    """Four rules of rules.md (names and default severities from there)."""
    rules = [
        RuleMeta(
            name="dc-break-over-rating",
            severity=Severity.ERROR,
            family="ratings",
            title="Breaking current above the DC rating",
            rationale="A contact that breaks more DC current than it is rated for "
            "may hold an arc and weld or burn.",
            references=("IEC 60947-5-1, DC-13 utilization category",),
            messages={
                "default": "{element} breaks {current} at {voltage}, "
                "above its rating of {rated_current}"
            },
            fixes={"default": "use a pole rated for at least {current} at {voltage}"},
        ),
        RuleMeta(
            name="inductive-load-unsuppressed",
            severity=Severity.WARNING,
            family="suppression",
            title="Inductive DC load without suppression",
            rationale="Opening an inductive DC load without suppression produces a "
            "high voltage spike across the opening contact.",
            references=("common practice",),
            messages={
                "default": "{load} (L/R {time_constant}) is switched by "
                "{element} with no suppression"
            },
            fixes={
                "default": "fit a diode rated {diode_voltage}, {diode_current} "
                "across {load}"
            },
            aliases=("unsuppressed-inductive-load",),
        ),
        RuleMeta(
            name="single-connection-net",
            severity=Severity.INFO,
            family="coils-supplies",
            title="Net with one connection",
            rationale="A net with a single connection is usually a mistyped name.",
            references=("common practice",),
            messages={"default": "net {net} has one connection only"},
            fixes={},
        ),
        RuleMeta(
            name="suppressor-underrated",
            severity=Severity.ERROR,
            family="suppression",
            title="Suppressor rating below what the circuit needs",
            rationale="A suppressor below its needed rating fails short or open.",
            references=("common practice",),
            messages={"default": "{element} reverse voltage {rated} below {needed}"},
            fixes={"default": "use a diode rated at least {needed}"},
            margins={
                "diode-reverse-voltage": Margin(
                    "diode-reverse-voltage", 2.0, "common practice", "factor on V"
                )
            },
        ),
    ]
    catalogue = {meta.name: meta for meta in rules}
    for meta in rules:
        for alias in meta.aliases:
            catalogue[alias] = meta
    return catalogue


def finding(
    catalogue: dict[str, RuleMeta],
    rule: str,
    file: str,
    line: int,
    element: str,
    values: dict,
    *,
    column: int = 1,
    key: str = "",
    waived: str | None = None,
    fingerprint: str = "",
) -> Finding:
    """A finding whose message and fix are filled from the catalogue's templates."""
    meta = catalogue[rule]
    fix = meta.fix()
    return Finding(
        rule=rule,
        severity=meta.severity,
        message=fill_template(meta.message(), {"element": element, **values}),
        span=Span(file, line, column, line, column + 8),
        element=element,
        values=values,
        fix=fill_template(fix, {"element": element, **values}) if fix else None,
        references=meta.references,
        key=key,
        fingerprint=fingerprint,
        waived=waived,
    )


def make_findings(catalogue: dict[str, RuleMeta], shift: int = 0) -> list[Finding]:
    """Findings over two files; ``shift`` moves every line (as a reformat would)."""
    top, sheet = "design/top.cnet", "design/sheet-02.cnet"
    return [
        finding(
            catalogue,
            "inductive-load-unsuppressed",
            sheet,
            12 + shift,
            "K1:13-14",
            {
                "load": "Y1",
                "time_constant": Q_(0.0048, "s"),
                "diode_voltage": Q_(48, "V"),
                "diode_current": Q_(0.5, "A"),
            },
        ),
        finding(
            catalogue,
            "dc-break-over-rating",
            top,
            7 + shift,
            "K1:13-14",
            {
                "current": Q_(2.5, "A"),
                "voltage": Q_(110, "V"),
                "rated_current": Q_(0.5, "A"),
            },
            column=3,
        ),
        finding(
            catalogue, "single-connection-net", top, 3 + shift, "N9", {"net": "N9"}
        ),
        finding(
            catalogue,
            "suppressor-underrated",
            top,
            9 + shift,
            "V1",
            {"rated": Q_(50, "V"), "needed": Q_(220, "V")},
        ),
        finding(
            catalogue,
            "inductive-load-unsuppressed",
            top,
            11 + shift,
            "Q2:1-2",
            {
                "load": "Y5",
                "time_constant": Q_(0.021, "s"),
                "diode_voltage": Q_(220, "V"),
                "diode_current": Q_(1, "A"),
            },
            waived="suppressed inside the valve, checked on site",
        ),
    ]


@pytest.fixture
def catalogue() -> dict[str, RuleMeta]:
    return make_catalogue()


@pytest.fixture
def findings(catalogue: dict[str, RuleMeta]) -> list[Finding]:
    return make_findings(catalogue)


def make_elements() -> list[ElementStatus]:
    """The switching elements of the sample: each status once."""
    top, sheet = "design/top.cnet", "design/sheet-02.cnet"
    return [
        ElementStatus(top, 7, 3, "K1:13-14", "verified"),
        ElementStatus(top, 11, 1, "Q2:1-2", "verified"),
        ElementStatus(top, 15, 1, "K7:13-14", "unverified", NOT_ANALYSED),
        ElementStatus(sheet, 20, 1, "K8:1-2", "ac"),
    ]


@pytest.fixture
def report(findings: list[Finding]) -> Report:
    return Report.build(
        findings,
        ["design/top.cnet", "design/sheet-02.cnet"],
        elements=make_elements(),
    )


@pytest.fixture
def sarif_schema() -> dict:
    return json.loads(SARIF_SCHEMA.read_text(encoding="utf-8"))


@pytest.fixture
def golden(request: pytest.FixtureRequest):
    """Compare with ``golden/NAME``; NETCHECK_UPDATE_GOLDEN=1 rewrites the file."""

    def check(name: str, text: str) -> None:
        path = GOLDEN / name
        if os.environ.get("NETCHECK_UPDATE_GOLDEN"):
            path.write_text(text, encoding="utf-8", newline="\n")
        if not path.exists():
            pytest.fail(f"no golden file {path}; run with NETCHECK_UPDATE_GOLDEN=1")
        assert text == path.read_text(encoding="utf-8"), f"differs from {path}"

    return check
