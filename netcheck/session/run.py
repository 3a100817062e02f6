"""Running many designs into one report.

The process pool, rule selection, severity overrides, baselines and
``--fail-on``.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, replace
from pathlib import Path

from netcheck import pipeline
from netcheck.baseline import apply_baseline
from netcheck.catalogue import RuleMeta
from netcheck.findings import Finding, fingerprint
from netcheck.pipeline import CheckOptions, CheckResult
from netcheck.report import Report, display_path
from netcheck.session.discover import discover_designs
from netcheck.session.settings import Request, Settings, SettingsCache

__all__ = ["Outcome", "check_designs", "os_error_line"]


@dataclass(frozen=True)
class Outcome:
    """One run: its report, and whether a finding reached ``--fail-on``."""

    report: Report
    failing: bool


def os_error_line(err: OSError) -> str:
    """``file: error: reason`` for an operating-system error."""
    if err.filename is None:
        return f"netcheck: error: {err.strerror or err}"
    return f"{display_path(err.filename)}: error: {err.strerror or err}"


def _check_one(path: Path, options: CheckOptions) -> CheckResult:
    """Check one design; its input errors come back in the result, rendered."""
    return pipeline.check_design(path, options)


def _check_all(
    designs: list[Path], settings: list[Settings], jobs: int
) -> list[CheckResult]:
    """Results in the order of ``designs``, whatever order the workers finish in."""
    options = [s.options for s in settings]
    if jobs <= 1 or len(designs) <= 1:
        return [_check_one(p, o) for p, o in zip(designs, options, strict=True)]
    with ProcessPoolExecutor(max_workers=min(jobs, len(designs))) as pool:
        return list(pool.map(_check_one, designs, options))


def _marked(findings: Iterable[Finding]) -> list[Finding]:
    """Fingerprint each finding again from its project-root display path.

    The span keeps its working path until ``Report.build`` shows it.
    """
    out = []
    for finding in findings:
        shown = display_path(finding.span.file) if finding.span.file else ""
        mark = fingerprint(finding.rule, shown, finding.element, finding.key)
        out.append(replace(finding, fingerprint=mark))
    return out


def _applied(findings: Iterable[Finding], settings: Settings) -> list[Finding]:
    """Select/ignore, then severity overrides."""
    return [
        replace(f, severity=settings.severity.get(f.rule, f.severity))
        for f in findings
        if settings.keeps(f.rule)
    ]


def _stale_entries(
    settings: Sequence[Settings], seen: set[str]
) -> list[Mapping[str, str]]:
    """Baseline entries that match no current finding, in baseline order."""
    entries: dict[str, Mapping[str, str]] = {}
    for setting in settings:
        entries.update(setting.baseline or {})
    return [entry for mark, entry in entries.items() if mark not in seen]


def check_designs(request: Request, catalogue: Mapping[str, RuleMeta]) -> Outcome:
    """Check every design of ``request.paths`` into one report.

    Call inside ``report.display_root(project_root(...))`` so that shown paths
    and fingerprints are the project root's. A baseline entry is stale only if
    no finding of the design matches it, whether or not ``--select`` and
    ``--ignore`` keep that finding: narrowing a run does not make entries stale.
    """
    designs = discover_designs(request.paths)
    cache = SettingsCache(request, catalogue)
    settings = [cache.for_design(path) for path in designs]
    results = _check_all(designs, settings, request.jobs)
    findings: list[Finding] = []
    files: set[str] = set()
    seen: set[str] = set()
    suppressed, failing = 0, False
    for path, setting, result in zip(designs, settings, results, strict=True):
        marked = _marked(result.findings)
        seen |= {f.fingerprint for f in marked if f.fingerprint}
        kept = _applied(marked, setting)
        if setting.baseline is not None:
            kept, count = apply_baseline(kept, setting.baseline)
            suppressed += count
        threshold = setting.fail_on
        failing |= threshold is not None and any(
            f.waived is None and f.severity >= threshold for f in kept
        )
        findings += kept
        files |= {str(path), *(str(f) for f in result.files)}
    report = Report.build(
        findings,
        files,
        suppressed,
        _stale_entries(settings, seen),
        elements=[e for result in results for e in result.elements],
        errors=[e for result in results for e in result.errors],
    )
    return Outcome(report, failing)
