"""The pipeline: design file -> model -> graph -> analysis -> checks -> findings."""

from __future__ import annotations

import difflib
import os
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field, replace
from functools import lru_cache
from pathlib import Path

from netcheck.alloc import collector_paused
from netcheck.analysis.elements import Analysis, analyse
from netcheck.catalogue import RuleMeta, load_catalogue, verify_catalogue
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import all_checks
from netcheck.coverage import ElementStatus, element_statuses
from netcheck.error_records import ErrorRecord, os_error_record, records_of
from netcheck.errors import InputError
from netcheck.findings import Finding, fingerprint, stamp_fingerprint
from netcheck.fixes.verify import verify_fixes
from netcheck.graph import build_graph
from netcheck.input import load_design
from netcheck.model import Netlist, Waiver

__all__ = [
    "CheckOptions",
    "CheckResult",
    "check_design",
    "check_path",
    "analyse_path",
    "run_checks",
]


@dataclass(frozen=True)
class CheckOptions:
    """What the command line and configuration pass to the pipeline."""

    extra_parts: tuple[Path, ...] = ()
    allow_outside: bool = False
    margins: Mapping[str, float] = field(default_factory=dict)
    # Re-check the design with each fix applied (netcheck.fixes.verify).
    verify_fixes: bool = True


@dataclass(frozen=True)
class CheckResult:
    """The findings of one design (waivers applied) and the files it read.

    ``elements`` is the status of each switching element (see
    :mod:`netcheck.coverage`). A design that could not be read has no findings
    and no elements, and ``errors`` says why.
    """

    file: str
    findings: Sequence[Finding]
    files: Sequence[str]
    elements: Sequence[ElementStatus] = ()
    errors: Sequence[ErrorRecord] = ()


def _matches(
    waiver: Waiver, finding: Finding, catalogue: Mapping[str, RuleMeta]
) -> bool:
    meta = catalogue.get(waiver.rule)
    if meta is None or meta.name != finding.rule:
        return False
    device = finding.element.split(":", 1)[0]
    return waiver.target in (finding.element, device)


def _apply_waivers(
    netlist: Netlist, findings: list[Finding], catalogue: Mapping[str, RuleMeta]
) -> list[Finding]:
    used: set[int] = set()
    out = []
    for finding in findings:
        for index, waiver in enumerate(netlist.waivers):
            if _matches(waiver, finding, catalogue):
                used.add(index)
                finding = replace(finding, waived=waiver.reason)
                break
        out.append(finding)
    out += [
        _unused_waiver(waiver, catalogue)
        for index, waiver in enumerate(netlist.waivers)
        if index not in used
    ]
    return out


def _unused_waiver(waiver: Waiver, catalogue: Mapping[str, RuleMeta]) -> Finding:
    """``unused-waiver``; a misspelled rule name gets the closest real one."""
    values: dict[str, str] = {"rule": waiver.rule, "target": waiver.target}
    variant = "default"
    if waiver.rule not in catalogue:
        close = difflib.get_close_matches(waiver.rule, sorted(catalogue), 1, 0.6)
        variant = "misspelled-rule" if close else "unknown-rule"
        if close:
            values["suggestion"] = catalogue[close[0]].name
    return catalogue["unused-waiver"].finding(
        waiver.span,
        waiver.target,
        values,
        message=variant,
        fix=variant if variant == "misspelled-rule" else "default",
        key=waiver.rule,
    )


def run_checks(
    netlist: Netlist, analysis: Analysis, margins: Mapping[str, float] = {}
) -> list[Finding]:
    """Run every check on an analysed design and apply its waivers."""
    catalogue = load_catalogue()
    checks = all_checks()
    verify_catalogue(catalogue, checks)
    ctx = CheckContext(netlist, analysis.graph, analysis, catalogue, margins)
    findings: list[Finding] = []
    with collector_paused():  # the checks allocate; the model needs no scan
        for rule, function in checks.items():
            ctx.rule = rule
            findings.extend(function(ctx))
    out = _apply_waivers(netlist, findings, catalogue)
    for finding in out:
        file = _relative(finding.span.file)
        # Made by this run and held nowhere else yet: no copy to fingerprint.
        stamp_fingerprint(
            finding, fingerprint(finding.rule, file, finding.element, finding.key)
        )
    out.sort(key=Finding.sort_key)
    return out


@lru_cache(maxsize=4096)
def _relative(file: str) -> str:
    # Once per file, not per finding: a heavy report has thousands of findings.
    return Path(file).as_posix()


def analyse_path(
    path: Path, options: CheckOptions = CheckOptions()
) -> tuple[Netlist, Analysis]:
    """Read and analyse one design; raises InputError on bad input."""
    netlist = load_design(
        path, options.extra_parts, options.allow_outside, display_base=Path(os.getcwd())
    )
    return netlist, analyse(build_graph(netlist))


# The model and analysis of the design checked last. Freeing a large design's
# objects one by one costs (0.4 s of 12 at 100,000 components) and a command
# that checks one design exits right after, when the memory is no longer
# needed; a run of many designs frees each one as the next check starts, so at
# most one design is held as before.
_last_design: list[object] = []


def check_path(path: Path, options: CheckOptions = CheckOptions()) -> CheckResult:
    """Check one top-level ``.cnet`` design; raises InputError on bad input."""
    _last_design.clear()
    netlist, analysis = analyse_path(path, options)
    _last_design[:] = (netlist, analysis)
    findings = run_checks(netlist, analysis, options.margins)
    if options.verify_fixes:
        findings = verify_fixes(netlist, analysis, findings, options.margins)
    statuses = element_statuses(analysis, findings)
    return CheckResult(netlist.file, findings, netlist.files, statuses)


def check_design(path: Path, options: CheckOptions = CheckOptions()) -> CheckResult:
    """Check one design as :func:`check_path` does, an input error included.

    Bad input does not raise: the result carries it as records, so that one
    broken file among many costs only its own findings.
    """
    file = Path(path).as_posix()
    try:
        return check_path(path, options)
    except InputError as err:
        return CheckResult(file, (), (file,), errors=tuple(records_of(err, file)))
    except OSError as err:
        return CheckResult(file, (), (), errors=(os_error_record(err, file),))
