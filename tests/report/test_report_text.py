"""Text report: one line a finding when piped, grouped view on a terminal (cli.md)."""

from __future__ import annotations

import re

from report_samples import make_catalogue

from netcheck.report import CAUTION, Report
from netcheck.report.text import render_explain, render_plain, render_rich, render_rules

LINE = re.compile(
    r"^(?P<file>[^:]+):(?P<line>\d+):(?P<col>\d+): (?P<sev>error|warning|info): "
    r".+ \[(?P<rule>[a-z-]+)\]$"
)


def test_plain_one_line_a_finding(report):
    # cli.md: "file:line:column: severity: message [rule]".
    lines = render_plain(report).splitlines()
    findings = [m for m in map(LINE.match, lines) if m]
    assert [
        (m["file"], int(m["line"]), int(m["col"]), m["rule"]) for m in findings
    ] == [
        ("design/sheet-02.cnet", 12, 1, "inductive-load-unsuppressed"),
        ("design/top.cnet", 3, 1, "single-connection-net"),
        ("design/top.cnet", 7, 3, "dc-break-over-rating"),
        ("design/top.cnet", 9, 1, "suppressor-underrated"),
    ]  # the waived Q2:1-2 finding is not listed


def test_plain_summary_and_caution_last(report):
    lines = render_plain(report).splitlines()
    summary = "4 findings: 2 errors, 1 warning, 1 info (2 files read, 1 waived)"
    assert lines[-4] == summary
    assert lines[-3] == (
        "by rule: dc-break-over-rating 1, inductive-load-unsuppressed 1, "
        "single-connection-net 1, suppressor-underrated 1"
    )
    assert lines[-2] == (
        "switching elements: 2 verified, 1 unverified, "
        "1 on AC supplies, outside the DC checks"
    )
    assert lines[-1] == f"note: {CAUTION}"


def test_plain_no_findings():
    # "No findings" must not read as "all is well" when nothing was checked.
    lines = render_plain(Report.build([], ["a.cnet"])).splitlines()
    assert lines == [
        "no findings (1 file read)",
        "nothing could be verified: no switching element was checked",
        f"note: {CAUTION}",
    ]


def test_summary_mentions_baseline(findings):
    report = Report.build(findings[:1], ["design/top.cnet"], baseline_suppressed=3)
    assert "(1 file read, 3 in the baseline)" in render_plain(report)


def test_rich_groups_by_file_then_element_most_severe_first(report):
    text = render_rich(report, color=False, width=120)
    assert "\x1b[" not in text
    top = text.index("design/top.cnet\n")
    sheet = text.index("design/sheet-02.cnet\n")
    assert sheet < top  # files in sorted order
    # In top.cnet the error groups (K1:13-14 at line 7, V1 at line 9) come before
    # the info group (N9 at line 3) although N9 is earlier in the file.
    body = text[top:]
    assert body.index("K1:13-14") < body.index("V1") < body.index("  N9")
    assert "values: current = 2.5 A" in text
    assert "fix: use a pole rated for at least 2.5 A at 110 V" in text
    assert " ".join(text.split()).endswith(CAUTION)
    assert " ".join(text.split()).count(CAUTION) == 1


def test_rich_colour_only_when_asked(report):
    assert "\x1b[" in render_rich(report, color=True, width=120)


def test_rich_escapes_markup_in_messages(catalogue, findings):
    from dataclasses import replace

    odd = replace(findings[1], message="bracket [bold]not markup[/bold]")
    text = render_rich(Report.build([odd]), color=False, width=120)
    assert "[bold]not markup[/bold]" in text


def test_rules_table(catalogue):
    text = render_rules(catalogue, terminal=False, color=False)
    rows = text.splitlines()
    assert rows[0].split() == ["name", "severity", "family", "title"]
    names = [row.split()[0] for row in rows[1:]]
    assert len(names) == 4 and "unsuppressed-inductive-load" not in names
    row = next(r for r in rows if r.startswith("single-connection-net "))
    assert row.split()[:3] == ["single-connection-net", "info", "coils-supplies"]


def test_explain_lists_everything(catalogue):
    text = render_explain(catalogue["suppressor-underrated"], "suppressor-underrated")
    for part in (
        "Suppressor rating below",
        "default severity: error",
        "rationale:",
        "references:",
        "message:",
        "fix:",
        "diode-reverse-voltage: 2",
        "source: common practice",
    ):
        assert part in text


def test_explain_alias(catalogue):
    text = render_explain(
        catalogue["unsuppressed-inductive-load"], "unsuppressed-inductive-load"
    )
    assert text.startswith(
        "inductive-load-unsuppressed (alias: unsuppressed-inductive-load)"
    )


def test_golden(report, golden):
    golden("findings.txt", render_plain(report))
    golden("findings-grouped.txt", render_rich(report, color=False, width=100))
    golden("rules.txt", render_rules(make_catalogue(), terminal=False, color=False))
