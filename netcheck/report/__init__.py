"""Reports: what one run found, prepared once for the text, JSON and SARIF writers.

The writers (``text``, ``json``, ``sarif``) are functions of (report, catalogue)
to text; they do no analysis and hold no rule logic.
"""

from __future__ import annotations

import contextlib
import dataclasses
import functools
import math
import os
from collections.abc import Iterable, Iterator, Mapping
from dataclasses import dataclass, field
from operator import attrgetter, itemgetter
from pathlib import Path, PurePath
from typing import Any

from netcheck.alloc import collector_paused
from netcheck.catalogue import RuleMeta
from netcheck.coverage import ElementStatus
from netcheck.error_records import ErrorRecord
from netcheck.findings import (
    Finding,
    Severity,
    evolve,
    fingerprint,
    placeholders,
    quantity_dict,
)
from netcheck.fixes.edits import edit_dict

__all__ = [
    "CAUTION",
    "Report",
    "display_path",
    "display_root",
    "working_path",
    "project_root_in_use",
    "prepare_finding",
    "unique_rules",
    "value_dicts",
    "fix_dict",
    "fix_note",
    "fix_names",
    "references",
]

# Printed once per run in text output (cli.md, "Text output").
CAUTION = (
    "Results depend on the rating data given; they do not replace the "
    "manufacturer's data, a qualified person's review, or local codes."
)


# The project root paths are shown relative to (one for the whole run), set by the
# session; without one, the working directory.
_ROOTS: list[Path] = []


@contextlib.contextmanager
def display_root(root: str | os.PathLike[str]) -> Iterator[Path]:
    """Show paths relative to ``root`` (made absolute) while the block runs."""
    absolute = Path(os.path.abspath(root))
    _ROOTS.append(absolute)
    try:
        yield absolute
    finally:
        _ROOTS.pop()


def project_root_in_use() -> Path | None:
    """The root set by :func:`display_root`, or None (working directory)."""
    return _ROOTS[-1] if _ROOTS else None


def display_path(file: str | os.PathLike[str]) -> str:
    """Return ``file`` relative to the project root when inside it, posix style.

    A relative ``file`` is taken relative to the working directory. The root is
    the one :func:`display_root` set, else the working directory. Paths outside
    the root stay absolute (there is no shorter name that means the same file
    wherever netcheck runs).
    """
    return _display_path(os.fspath(file), project_root_in_use(), os.getcwd())


@functools.lru_cache(maxsize=4096)
def _display_path(file: str, root: Path | None, cwd: str) -> str:
    # Once per file, root and working directory: reports show thousands of
    # findings from a few files.
    absolute = Path(os.path.normpath(os.path.join(cwd, file)))  # os.path.abspath
    try:
        relative = absolute.relative_to(root or Path(os.path.abspath(cwd)))
    except ValueError:
        return absolute.as_posix()
    return PurePath(relative).as_posix() or "."


def working_path(file: str | os.PathLike[str]) -> Path:
    """Return ``file`` relative to the working directory when inside it.

    For paths that are opened later, not shown: unlike :func:`display_path`
    this does not depend on the project root.
    """
    absolute = Path(os.path.abspath(Path(file)))
    try:
        return absolute.relative_to(Path(os.path.abspath(os.getcwd())))
    except ValueError:
        return absolute


def prepare_finding(finding: Finding, cwd: str | None = None) -> Finding:
    """Give a finding its display path and, if it has none, a fingerprint.

    The fingerprint made here is that of the display path; the session clears
    the pipeline's fingerprint first, so fingerprints are the same from whatever
    working directory netcheck runs in. ``cwd``: the working directory, where
    the caller has asked for it once for many findings.
    """
    file = finding.span.file
    if file:
        if cwd is None:
            cwd = os.getcwd()
        file = _display_path(os.fspath(file), project_root_in_use(), cwd)
    else:
        file = ""
    mark = finding.fingerprint or fingerprint(
        finding.rule, file, finding.element, finding.key
    )
    if file == finding.span.file and mark == finding.fingerprint:
        # Already shown as it is (spans are immutable): nothing to replace.
        return finding
    span = dataclasses.replace(finding.span, file=file)
    return evolve(finding, span=span, fingerprint=mark)


@dataclass(frozen=True)
class Report:
    """The findings of one run, sorted, with the files read and what was suppressed.

    ``findings`` holds waived findings too (``finding.waived`` is the reason);
    they are shown only where a format has a place for them and never count
    towards ``--fail-on``. Findings matched by a baseline are not kept at all;
    ``baseline_suppressed`` says how many there were, ``stale_baseline`` lists
    the baseline entries that matched no current finding. ``root`` is the
    absolute project root the paths are relative to (None: not known).
    ``elements`` is the status of every switching element checked (see
    :mod:`netcheck.coverage`); ``errors`` the input errors of the files that
    could not be checked.
    """

    findings: tuple[Finding, ...]
    files: tuple[str, ...] = ()
    baseline_suppressed: int = 0
    stale_baseline: tuple[Mapping[str, str], ...] = field(default=())
    root: str | None = None
    elements: tuple[ElementStatus, ...] = ()
    errors: tuple[ErrorRecord, ...] = ()

    @classmethod
    def build(
        cls,
        findings: Iterable[Finding],
        files: Iterable[str] = (),
        baseline_suppressed: int = 0,
        stale_baseline: Iterable[Mapping[str, str]] = (),
        *,
        elements: Iterable[ElementStatus] = (),
        errors: Iterable[ErrorRecord] = (),
    ) -> Report:
        """Prepare and sort findings, files, elements and errors; drop repeats."""
        with collector_paused():  # copies and tuples: nothing to collect
            return cls._build(
                findings,
                files,
                baseline_suppressed,
                stale_baseline,
                elements=elements,
                errors=errors,
            )

    @classmethod
    def _build(
        cls,
        findings: Iterable[Finding],
        files: Iterable[str],
        baseline_suppressed: int,
        stale_baseline: Iterable[Mapping[str, str]],
        *,
        elements: Iterable[ElementStatus],
        errors: Iterable[ErrorRecord],
    ) -> Report:
        # Two designs that include one sheet can both report the same finding.
        unique = {}
        cwd = os.getcwd()  # once: it cannot change while the report is built
        for finding in (prepare_finding(f, cwd) for f in findings):
            order = _order(finding)
            # One per identity: its order and its waiver.
            unique[(*order, finding.waived)] = (order, finding)
        ordered = sorted(unique.values(), key=itemgetter(0))
        prepared = [finding for _, finding in ordered]
        shown = sorted({display_path(f) for f in files})
        root = project_root_in_use()
        return cls(
            tuple(prepared),
            tuple(shown),
            baseline_suppressed,
            tuple(stale_baseline),
            root.as_posix() if root is not None else None,
            _shown(elements),
            _shown(errors),
        )

    @property
    def active(self) -> tuple[Finding, ...]:
        """The findings that are not waived."""
        return tuple(f for f in self.findings if f.waived is None)

    @property
    def waived(self) -> tuple[Finding, ...]:
        """The waived findings."""
        return tuple(f for f in self.findings if f.waived is not None)

    def counts(self) -> dict[str, int]:
        """Count active findings by severity label, most severe first."""
        counts = {s.label: 0 for s in sorted(Severity, reverse=True)}
        for finding in self.active:
            counts[finding.severity.label] += 1
        return counts

    @property
    def unverified(self) -> tuple[ElementStatus, ...]:
        """The switching elements no check could verify."""
        return tuple(e for e in self.elements if e.status == "unverified")

    def by_rule(self) -> dict[str, int]:
        """Count active findings by rule, in rule-name order."""
        counts: dict[str, int] = {}
        for finding in self.active:
            counts[finding.rule] = counts.get(finding.rule, 0) + 1
        return dict(sorted(counts.items()))

    def element_counts(self) -> dict[str, int]:
        """Switching elements: all of them, verified, unverified."""
        statuses = [e.status for e in self.elements]
        return {
            "switching_elements": len(statuses),
            "verified": statuses.count("verified"),
            "unverified": statuses.count("unverified"),
        }

    def summary(self) -> dict[str, Any]:
        """Counts by severity, total, waived, baseline, by rule, elements, errors."""
        counts = self.counts()
        return {
            **counts,
            "total": sum(counts.values()),
            "waived": len(self.waived),
            "baseline_suppressed": self.baseline_suppressed,
            "baseline_stale": len(self.stale_baseline),
            "by_rule": self.by_rule(),
            **self.element_counts(),
            "input_errors": len(self.errors),
        }


def _shown(
    items: Iterable[ElementStatus] | Iterable[ErrorRecord],
) -> tuple[Any, ...]:
    """Give records their display path; sort them; drop repeats (shared sheets).

    A design's many records share a few files: each file's path is worked out
    once, and a record whose path reads the same already is kept as it is.
    """
    shown: dict[str, str] = {}
    out = set()
    for item in items:
        file = item.file
        if file not in shown:
            shown[file] = display_path(file) if file else ""
        if shown[file] != file:
            item = dataclasses.replace(item, file=shown[file])
        out.add(item)
    if not out:
        return ()
    # The records' own order (dataclass order=True compares their fields as a
    # tuple), by a key made once per record instead of per comparison.
    names = [f.name for f in dataclasses.fields(next(iter(out)))]
    return tuple(sorted(out, key=attrgetter(*names)))


def _order(finding: Finding) -> tuple[Any, ...]:
    # Finding.sort_key first; severity, message and fingerprint only break ties so
    # that equal keys can never reorder between runs.
    return (
        *finding.sort_key(),
        -finding.severity,
        finding.message,
        finding.fingerprint,
    )


def unique_rules(catalogue: Mapping[str, RuleMeta]) -> list[RuleMeta]:
    """Return the catalogue's rules once each (aliases dropped), sorted by name."""
    return sorted(
        {m.name: m for m in catalogue.values()}.values(), key=lambda m: m.name
    )


def value_dicts(values: Mapping[str, Any]) -> dict[str, dict[str, Any]]:
    """Each value as ``{"value", "unit", "text"}``, keyed by name in sorted order."""
    out = {}
    for name in sorted(values):
        entry = quantity_dict(values[name])
        number = entry["value"]
        if isinstance(number, float) and not math.isfinite(number):
            # JSON has no NaN or infinity; the text still says what it was.
            entry = {**entry, "value": None}
        out[name] = entry
    return out


def fix_dict(
    finding: Finding,
    meta: RuleMeta | None,
    entries: Mapping[str, dict[str, Any]] | None = None,
) -> dict[str, Any] | None:
    """Return the fix as ``{"text", "values"}`` (values its templates use) or None.

    ``entries``: the finding's ``value_dicts`` where the caller has them (each
    entry stands alone, so the fix's are the same dicts, not formatted twice).
    """
    if finding.fix is None:
        return None
    used = fix_names(meta)
    if entries is None:
        values = value_dicts({k: v for k, v in finding.values.items() if k in used})
    else:
        values = {k: entries[k] for k in entries if k in used}
    return {
        "text": finding.fix,
        "values": values,
        "edits": [edit_dict(edit) for edit in finding.edits],
        # None (JSON null): not re-checked, the design's re-check budget spent.
        "verified": finding.verified,
    }


_FIX_NAMES: dict[tuple[str, tuple[str, ...]], frozenset[str]] = {}


def fix_names(meta: RuleMeta | None) -> frozenset[str]:
    """The placeholders of a rule's fix templates, found once per rule."""
    if meta is None:
        return frozenset()
    key = (meta.name, tuple(meta.fixes.values()))
    if key not in _FIX_NAMES:
        names: set[str] = set()
        for template in meta.fixes.values():
            names |= placeholders(template)
        _FIX_NAMES[key] = frozenset(names)
    return _FIX_NAMES[key]


def fix_note(finding: Finding) -> str:
    """What the text report says of a fix's verification ('' if not checked)."""
    if finding.verified is None:
        # Unverified findings with edits: the design's re-check budget was spent.
        if finding.edits:
            return "not verified: too many findings to re-check each"
        return ""
    if finding.verified:
        return "verified: applied to a copy of the design, it clears the finding"
    if not finding.edits:
        return "not verified: no edit the tool can apply"
    return "not verified: applied, it does not clear the finding on its own"


def references(finding: Finding, meta: RuleMeta | None) -> list[str]:
    """Return the finding's references, or its rule's where it carries none."""
    if finding.references:
        return list(finding.references)
    return list(meta.references) if meta is not None else []
