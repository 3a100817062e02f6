"""The text report: a grouped rich view on a terminal, one line a finding when piped.

Waived findings are not listed in text; the summary says how many there were.
"""

from __future__ import annotations

import io
import re
import textwrap
from collections.abc import Callable, Iterator, Mapping
from itertools import groupby

import pint
from rich.console import Console, Group, RenderableType
from rich.padding import Padding
from rich.table import Table
from rich.text import Text

from netcheck.catalogue import RuleMeta
from netcheck.coverage import MISSING_DATA, NOT_ANALYSED
from netcheck.findings import Finding, Severity, quantity_dict
from netcheck.report import CAUTION, Report, fix_note, unique_rules
from netcheck.report.edit_words import edit_lines
from netcheck.report.template_words import readable

__all__ = [
    "render_plain",
    "write_plain",
    "render_rich",
    "stale_lines",
    "unverified_lines",
    "elements_line",
    "summary_line",
    "summary_lines",
    "render_rules",
    "render_explain",
    "to_text",
]

_TRAILING = re.compile(r"[ \t]+((?:\x1b\[[0-9;]*m)*)$", re.MULTILINE)
STYLES = {Severity.ERROR: "bold red", Severity.WARNING: "yellow", Severity.INFO: "cyan"}


def _one_line(text: str) -> str:
    return " ".join(text.split())


def render_plain(report: Report, *, details: bool = False, quiet: bool = False) -> str:
    """Render ``file:line:column: severity: message [rule]`` lines and a summary.

    ``details`` adds the computed values and the fix, indented under each
    finding (the first line stays one finding for grep), and a note per
    unverified element; ``quiet`` leaves only the summary and the caution.
    """
    return "".join(line + "\n" for line in _plain_lines(report, details, quiet))


def write_plain(
    report: Report,
    sink: Callable[[str], object],
    *,
    details: bool = False,
    quiet: bool = False,
) -> None:
    """Write ``render_plain(report, ...)`` to ``sink`` in chunks of lines, in order."""
    chunk: list[str] = []
    for line in _plain_lines(report, details, quiet):
        chunk.append(line)
        if len(chunk) >= 4096:
            chunk.append("")
            sink("\n".join(chunk))
            chunk.clear()
    if chunk:
        chunk.append("")
        sink("\n".join(chunk))


def _plain_lines(report: Report, details: bool, quiet: bool) -> Iterator[str]:
    """The lines of the one-a-line report, each without its newline."""
    for finding in () if quiet else report.active:
        span = finding.span
        yield (
            f"{span.file}:{span.line}:{span.column}: {finding.severity.label}: "
            f"{_one_line(finding.message)} [{finding.rule}]"
        )
        if details:
            yield from _detail_lines(finding)
    if not quiet:
        yield from stale_lines(report)
        yield from unverified_lines(report) if details else []
    yield from summary_lines(report)
    yield f"note: {CAUTION}"


def _detail_lines(finding: Finding) -> list[str]:
    values = _values_text(finding)
    lines = [f"    values: {values}"] if values else []
    if finding.fix:
        note = fix_note(finding)
        suffix = f" ({note})" if note else ""
        lines.append(f"    fix: {_one_line(finding.fix)}{suffix}")
        lines += edit_lines(finding.edits)
    return lines


# Why an element is unverified, in words (netcheck.coverage's reasons).
_REASONS = {
    MISSING_DATA: "a value its checks need is not given (rating-data-missing)",
    NOT_ANALYSED: "its circuit was not analysed (no supply, or AC and DC together)",
}


def unverified_lines(report: Report) -> list[str]:
    """One ``note:`` line per switching element no check could verify."""
    return [
        f"{e.file}:{e.line}:{e.column}: note: {e.element} is not verified: "
        f"{_REASONS.get(e.reason, e.reason)}"
        for e in report.unverified
    ]


def summary_lines(report: Report) -> list[str]:
    """The summary: counts by severity, by rule, and what could be verified."""
    by_rule = report.by_rule()
    lines = []
    if by_rule:
        lines.append(
            "by rule: " + ", ".join(f"{rule} {n}" for rule, n in by_rule.items())
        )
    return [summary_line(report), *lines, elements_line(report)]


def elements_line(report: Report) -> str:
    """Say how many switching elements were verified; plainly when none was."""
    counts = report.element_counts()
    total, verified = counts["switching_elements"], counts["verified"]
    unverified = counts["unverified"]
    ac = total - verified - unverified
    others = [f"{unverified} unverified"] if unverified else []
    if ac:
        others.append(f"{ac} on AC supplies, outside the DC checks")
    if total == 0:
        return "nothing could be verified: no switching element was checked"
    if verified == 0:
        return (
            f"nothing could be verified: {_plural(total, 'switching element')}, "
            f"none verified ({', '.join(others)})"
        )
    return f"switching elements: {', '.join([f'{verified} verified', *others])}"


def _plural(count: int, word: str) -> str:
    return f"{count} {word}" if count == 1 or word == "info" else f"{count} {word}s"


def stale_lines(report: Report) -> list[str]:
    """One ``note:`` line per baseline entry that matches no current finding."""
    return [
        f"{entry.get('file') or '(baseline)'}: note: baseline entry matches no "
        f"current finding: {entry.get('rule', '?')} {entry.get('element', '?')} "
        f"[{entry['fingerprint']}]"
        for entry in report.stale_baseline
    ]


def summary_line(report: Report) -> str:
    """Summarise in one line: findings by severity, files read, what was hidden."""
    counts = report.counts()
    total = sum(counts.values())
    if total:
        by_severity = ", ".join(_plural(n, label) for label, n in counts.items())
        line = f"{_plural(total, 'finding')}: {by_severity}"
    else:
        line = "no findings"
    notes = [f"{_plural(len(report.files), 'file')} read"] if report.files else []
    if report.waived:
        notes.append(f"{len(report.waived)} waived")
    if report.baseline_suppressed:
        notes.append(f"{report.baseline_suppressed} in the baseline")
    if report.stale_baseline:
        notes.append(f"{len(report.stale_baseline)} stale in the baseline")
    if report.errors:
        notes.append(_plural(len(report.errors), "input error"))
    return f"{line} ({', '.join(notes)})" if notes else line


def _groups(findings: tuple[Finding, ...]) -> list[list[Finding]]:
    """Group one file's findings by element, the most severe group first."""
    by_element: dict[str, list[Finding]] = {}
    for finding in findings:
        by_element.setdefault(finding.element, []).append(finding)
    groups = [
        sorted(group, key=lambda f: (-f.severity, f.span.line, f.span.column, f.rule))
        for group in by_element.values()
    ]
    return sorted(groups, key=lambda g: (-g[0].severity, g[0].span.line, g[0].element))


def _values_text(finding: Finding) -> str:
    """The computed quantities behind a finding (names and texts live in JSON too)."""
    return ", ".join(
        f"{name} = {quantity_dict(value)['text']}"
        for name, value in sorted(finding.values.items())
        if isinstance(value, pint.Quantity)
    )


def _finding_table(group: list[Finding]) -> Table:
    table = Table.grid(padding=(0, 1))
    table.add_column(width=7, no_wrap=True)
    table.add_column(overflow="fold")
    for finding in group:
        body = Text()
        body.append(
            f"{finding.span.file}:{finding.span.line}:{finding.span.column}", "dim"
        )
        body.append("  ")
        body.append(_one_line(finding.message))
        body.append(f" [{finding.rule}]", "dim")
        values = _values_text(finding)
        if values:
            body.append("\nvalues: ", "bold")
            body.append(values)
        if finding.fix:
            body.append("\nfix: ", "bold green")
            body.append(_one_line(finding.fix))
            note = fix_note(finding)
            if note:
                body.append(f" ({note})", "dim")
            for line in edit_lines(finding.edits, indent=""):
                body.append("\n" + line, "green")
        label = Text(finding.severity.label, STYLES[finding.severity])
        table.add_row(label, body)
    return table


def render_rich(
    report: Report, *, color: bool = True, width: int = 100, quiet: bool = False
) -> str:
    """Render the grouped terminal view (file, element, most severe first).

    ``quiet`` leaves only the summary and the caution.
    """
    parts: list[RenderableType] = []
    shown = () if quiet else report.active
    for file, findings in groupby(shown, key=lambda f: f.span.file):
        parts.append(Text(file, "bold underline"))
        for group in _groups(tuple(findings)):
            parts.append(
                Padding(
                    Text(group[0].element or "(design)", "bold"),
                    (0, 0, 0, 2),
                    expand=False,
                )
            )
            parts.append(Padding(_finding_table(group), (0, 0, 1, 4), expand=False))
    if not quiet:
        parts += [Text(line, "dim") for line in stale_lines(report)]
    parts += [Text(line, "bold") for line in summary_lines(report)]
    parts.append(Text(CAUTION, "italic dim"))
    return to_text(Group(*parts), color=color, width=width)


def to_text(renderable: RenderableType, *, color: bool, width: int) -> str:
    """Render with rich to a string (ANSI styles only when ``color``)."""
    buffer = io.StringIO()
    console = Console(
        file=buffer,
        width=width,
        force_terminal=color,
        no_color=not color,
        color_system="standard" if color else None,
        highlight=False,
        emoji=False,
        soft_wrap=False,
    )
    console.print(renderable)
    # Rich pads wrapped cells to the column width; trailing blanks only get in the way.
    return _TRAILING.sub(r"\1", buffer.getvalue())


def render_rules(
    catalogue: Mapping[str, RuleMeta], *, terminal: bool, color: bool, width: int = 100
) -> str:
    """Render the rule list (name, severity, family, title) by family and name."""
    rules = sorted(unique_rules(catalogue), key=lambda m: (m.family, m.name))
    if not terminal:
        rows = [("name", "severity", "family", "title")]
        rows += [(m.name, m.severity.label, m.family, m.title) for m in rules]
        widths = [max(len(row[i]) for row in rows) for i in range(3)]
        lines = [
            "  ".join(cell.ljust(w) for cell, w in zip(row[:3], widths, strict=True))
            + "  "
            + row[3]
            for row in rows
        ]
        return "\n".join(lines) + "\n"
    table = Table(box=None, pad_edge=False, header_style="bold")
    for heading in ("name", "severity", "family", "title"):
        table.add_column(heading, no_wrap=heading != "title")
    for meta in rules:
        severity = Text(meta.severity.label, STYLES[meta.severity])
        table.add_row(meta.name, severity, meta.family, meta.title)
    return to_text(table, color=color, width=width)


def render_explain(meta: RuleMeta, asked: str) -> str:
    """One rule: title, severity, rationale, references, templates and margins."""
    head = meta.name if asked == meta.name else f"{meta.name} (alias: {asked})"
    lines = [head, f"  {meta.title}", ""]
    lines.append(f"default severity: {meta.severity.label}")
    lines.append(f"family: {meta.family}")
    if meta.aliases:
        lines.append(f"aliases: {', '.join(meta.aliases)}")
    lines += ["", "rationale:", _wrap(meta.rationale)]
    if meta.references:
        lines += ["", "references:", *(f"  - {r}" for r in meta.references)]
    lines += ["", "message:", *_templates(meta.messages, meta.name)]
    if meta.fixes:
        lines += ["", "fix:", *_templates(meta.fixes, meta.name)]
    if meta.margins:
        lines += ["", "margins (configurable under 'margins' in netcheck.yaml):"]
        for name in sorted(meta.margins):
            margin = meta.margins[name]
            lines.append(f"  {name}: {margin.default:g}  (source: {margin.source})")
            if margin.description:
                lines.append(f"      {margin.description}")
    return "\n".join(lines) + "\n"


def _wrap(text: str) -> str:
    return textwrap.fill(text, width=86, initial_indent="  ", subsequent_indent="  ")


def _templates(templates: Mapping[str, str], rule: str) -> list[str]:
    # Placeholders read as words: nothing has filled them yet.
    shown = {variant: readable(text, rule) for variant, text in templates.items()}
    if set(shown) == {"default"}:
        return [f"  {shown['default']}"]
    return [f"  {variant}: {text}" for variant, text in sorted(shown.items())]
