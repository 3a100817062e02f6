"""Rule cases: every ``tests/cases/<rule>/*.cnet`` against its ``# expect:`` markers.

Each case file marks every finding it expects on the finding's anchor line (the
first line of the component or waive statement) with ``# expect: <rule>``;
several rules on one line are written ``# expect: rule-a, rule-b``. Findings
accepted by a ``waive`` statement are marked ``# waived: <rule>`` instead. The
test diffs the (rule, line) sets of the tool's non-waived findings against the
markers and prints ``-missing rule@line`` / ``+unexpected rule@line``.

A marker may also pin the severity and some of the finding's values, each
number citing its source in a comment of the case file:

    # expect: inductive-load-unsuppressed=error
    # expect: dc-break-over-rating(current=0.5A, allowed=0.4545A)

Quantities compare within ``REL_TOL``; other values compare as text.

A case whose expectation is right but whose check is wrong stays in the suite
with its correct expectation and is listed in ``KNOWN_WRONG`` (strict xfail), so
that the fix turns it into a visible XPASS failure that removes the entry.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from functools import cache
from pathlib import Path

import pint
import pytest

from netcheck.catalogue import load_catalogue
from netcheck.findings import Finding
from netcheck.pipeline import check_path
from netcheck.units import Q_

CASES = Path(__file__).parent / "cases"
REL_TOL = 0.01  # hand calculations are given to 3-4 digits (sample expect.yaml: 1 %)

# Case file (relative to tests/cases) -> why the check gets it wrong today.
KNOWN_WRONG: dict[str, str] = {}

_MARKER = re.compile(r"#\s*(expect|waived):\s*(.*?)\s*(?=#|$)")
_ITEM = re.compile(
    r"(?P<rule>[a-z0-9-]+)(?:=(?P<severity>error|warning|info))?"
    r"(?:\((?P<values>[^)]*)\))?\s*(?:,|$)"
)
_INCLUDE = re.compile(r'^include\s+"([^"]+)"', re.MULTILINE)


@dataclass(frozen=True)
class Marker:
    """One expected finding: where, which rule, and optionally how it must look."""

    file: Path
    line: int
    rule: str
    severity: str = ""
    values: tuple[tuple[str, str], ...] = field(default=())

    @property
    def key(self) -> tuple[Path, str, int]:
        return (self.file, self.rule, self.line)


def _parse_items(text: str, where: str) -> list[re.Match[str]]:
    items, position = [], 0
    while position < len(text):
        match = _ITEM.match(text, position)
        if match is None:
            raise ValueError(f"{where}: cannot read marker {text[position:]!r}")
        items.append(match)
        position = match.end()
        while position < len(text) and text[position] == " ":
            position += 1
    return items


def markers(path: Path, kind: str = "expect") -> list[Marker]:
    """The markers (``# expect:`` or ``# waived:``) written in one file."""
    found = []
    file = path.resolve()
    for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
        for match in _MARKER.finditer(line):
            if match.group(1) != kind:
                continue
            for item in _parse_items(match.group(2), f"{path.name}:{number}"):
                values = tuple(
                    (k.strip(), v.strip())
                    for k, _, v in (
                        pair.partition("=")
                        for pair in (item["values"] or "").split(",")
                        if pair.strip()
                    )
                )
                found.append(
                    Marker(file, number, item["rule"], item["severity"] or "", values)
                )
    return found


def included(path: Path) -> list[Path]:
    """Files a case file splices in with ``include`` (recursively)."""
    out = []
    for target in _INCLUDE.findall(path.read_text(encoding="utf-8")):
        child = (path.parent / target).resolve()
        out += [child, *included(child)]
    return out


def all_markers(path: Path, kind: str = "expect") -> list[Marker]:
    """Markers of a case file and of every file it includes."""
    return [m for file in (path, *included(path)) for m in markers(file, kind)]


def included_files() -> set[Path]:
    """Case files spliced into another case file (they are not run alone)."""
    return {child for path in CASES.rglob("*.cnet") for child in included(path)}


def case_files() -> list[Path]:
    """Every top-level case file, sorted."""
    skip = included_files()
    return sorted(p for p in CASES.rglob("*.cnet") if p.resolve() not in skip)


def case_id(path: Path) -> str:
    return path.relative_to(CASES).as_posix()


@cache
def run_case(path: Path) -> tuple[Finding, ...]:
    """The findings of one case file (cached: the catalogue tests reuse them)."""
    return tuple(check_path(path).findings)


def _key(finding: Finding) -> tuple[Path, str, int]:
    return (Path(finding.span.file).resolve(), finding.rule, finding.span.line)


def _value_problem(finding: Finding, name: str, text: str) -> str | None:
    if name not in finding.values:
        return f"has no value {name!r} (it has {sorted(finding.values)})"
    got = finding.values[name]
    if isinstance(got, pint.Quantity):
        want = Q_(text)
        magnitude = float(got.to(want.units).magnitude)
        target = float(want.magnitude)
        if abs(magnitude - target) <= REL_TOL * abs(target):
            return None
        return f"{name} = {got:~.5g}, expected {text}"
    return None if str(got) == text else f"{name} = {got!r}, expected {text!r}"


def _detail_problems(wanted: list[Marker], findings: tuple[Finding, ...]) -> list[str]:
    """``~`` lines where a marker's severity or values disagree with its finding."""
    out = []
    for marker in wanted:
        if not (marker.severity or marker.values):
            continue
        matching = [f for f in findings if _key(f) == marker.key]
        for f in matching:
            if marker.severity and f.severity.label != marker.severity:
                out.append(
                    f"~{marker.rule}@{marker.line}: severity {f.severity.label}, "
                    f"expected {marker.severity}"
                )
            for name, text in marker.values:
                problem = _value_problem(f, name, text)
                if problem:
                    out.append(f"~{marker.rule}@{marker.line}: {problem}")
    return out


def diff(path: Path) -> list[str]:
    """``-missing`` / ``+unexpected`` / ``~`` lines between markers and findings."""
    findings = run_case(path)
    top = path.resolve()

    def where(item: tuple[Path, str, int], label: str) -> str:
        file, rule, line = item
        name = "" if file == top else f"{file.name}:"
        return f"{rule}@{name}{line}{label}"

    lines = []
    for kind, waived in (("expect", False), ("waived", True)):
        wanted = all_markers(path, kind)
        got = {_key(f) for f in findings if bool(f.waived) == waived}
        want = {m.key for m in wanted}
        label = "" if kind == "expect" else " (waived)"
        lines += [f"-missing {where(k, label)}" for k in sorted(want - got)]
        lines += [f"+unexpected {where(k, label)}" for k in sorted(got - want)]
        lines += _detail_problems(
            wanted, tuple(f for f in findings if bool(f.waived) == waived)
        )
    if lines:
        lines += ["", "findings:"] + [
            f"  {f.rule}@{f.span.line} {f.element}{' (waived)' if f.waived else ''}"
            f" [{f.severity.label}]: {f.message}"
            for f in findings
        ]
    return lines


def _params() -> list[object]:
    params = []
    for path in case_files():
        reason = KNOWN_WRONG.get(case_id(path))
        marks = [pytest.mark.xfail(strict=True, reason=reason)] if reason else []
        params.append(pytest.param(path, id=case_id(path), marks=marks))
    return params


@pytest.mark.parametrize("path", _params())
def test_case(path: Path) -> None:
    problems = diff(path)
    assert not problems, f"{case_id(path)}:\n" + "\n".join(problems)


def test_known_wrong_entries_exist() -> None:
    ids = {case_id(p) for p in case_files()}
    assert set(KNOWN_WRONG) <= ids, sorted(set(KNOWN_WRONG) - ids)


def test_markers_name_known_rules() -> None:
    rules = {meta.name for meta in load_catalogue().values()}
    odd = [
        f"{m.file.name}:{m.line}: {m.rule}"
        for path in CASES.rglob("*.cnet")
        for kind in ("expect", "waived")
        for m in markers(path, kind)
        if m.rule not in rules
    ]
    assert not odd, odd


def rule_folders() -> dict[str, Path]:
    return {p.name: p for p in CASES.iterdir() if p.is_dir()}


def test_every_rule_has_bad_and_ok_cases() -> None:
    rules = {meta.name for meta in load_catalogue().values()}
    folders = rule_folders()
    problems = []
    for rule in sorted(rules):
        folder = folders.get(rule)
        if folder is None:
            problems.append(f"{rule}: no folder tests/cases/{rule}/")
            continue
        tops = [p for p in case_files() if p.parent == folder]
        for prefix in ("bad-", "ok-"):
            if not [p for p in tops if p.name.startswith(prefix)]:
                problems.append(f"{rule}: no {prefix}*.cnet case")
    assert not problems, "\n".join(problems)


def test_case_folders_are_rules() -> None:
    rules = {meta.name for meta in load_catalogue().values()}
    assert set(rule_folders()) <= rules, sorted(set(rule_folders()) - rules)


def test_case_file_names() -> None:
    """Top-level case files are ``bad-*`` or ``ok-*``; included sheets are neither."""
    odd = [case_id(p) for p in case_files() if not p.name.startswith(("bad-", "ok-"))]
    odd += [case_id(p) for p in included_files() if p.name.startswith(("bad-", "ok-"))]
    assert not odd, odd


def test_bad_cases_expect_their_rule_and_ok_cases_do_not() -> None:
    problems = []
    for path in case_files():
        rule = path.parent.name
        marked = {m.rule for m in all_markers(path)}
        if path.name.startswith("bad-") and rule not in marked:
            problems.append(f"{case_id(path)}: no '# expect: {rule}' marker")
        if path.name.startswith("ok-") and rule in marked:
            problems.append(f"{case_id(path)}: an ok case expects {rule}")
    assert not problems, "\n".join(problems)


def test_part_libraries_say_they_are_illustrative() -> None:
    note = "note: Illustrative values for the tests; not any manufacturer's data."
    missing = [
        p.relative_to(CASES).as_posix()
        for p in CASES.rglob("*.parts.yaml")
        if note not in p.read_text(encoding="utf-8")
    ]
    assert not missing, missing
