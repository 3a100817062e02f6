"""One set of edits for a whole design: the verified fixes that work together.

Each fix is verified alone; applied together two fixes could disagree (two
parts for one reference) or interact. The plan adds the verified fixes one by
one and keeps a fix only when the design with every kept edit applied still
clears every finding kept so far and shows no error the design did not have.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from netcheck.findings import Finding, Severity
from netcheck.fixes.edits import Edit
from netcheck.fixes.verify import Verifier, identity
from netcheck.model import Netlist

__all__ = ["Plan", "plan_fixes"]


@dataclass(frozen=True)
class Plan:
    """The fixes kept, their edits in order, and the findings left after them."""

    fixed: tuple[Finding, ...]
    edits: tuple[Edit, ...]
    remaining: tuple[Finding, ...]


def _merged(edits: Sequence[Edit], more: Sequence[Edit]) -> list[Edit]:
    return [*edits, *(e for e in more if e not in edits)]


def _holds(
    after: list[Finding] | None, fixed: Sequence[Finding], before: set[tuple]
) -> bool:
    if after is None:
        return False
    left = {identity(f) for f in after if f.waived is None}
    if any(identity(f) in left for f in fixed):
        return False
    return not any(
        f.severity == Severity.ERROR and f.waived is None and identity(f) not in before
        for f in after
    )


def plan_fixes(
    netlist: Netlist, findings: Sequence[Finding], margins: Mapping[str, float] = {}
) -> Plan:
    """The verified fixes of ``findings`` that can be applied together."""
    verifier = Verifier(netlist, findings, margins)
    before = {identity(f) for f in findings if f.waived is None}
    fixed: list[Finding] = []
    edits: list[Edit] = []
    after: list[Finding] | None = list(findings)
    for finding in findings:
        if not finding.verified or not finding.edits:
            continue
        if after is not None and identity(finding) not in {
            identity(f) for f in after if f.waived is None
        }:
            continue  # already cleared by an earlier fix's edits
        trial = _merged(edits, finding.edits)
        result = verifier.recheck(trial)
        if _holds(result, [*fixed, finding], before):
            fixed.append(finding)
            edits, after = trial, result
    remaining = tuple(f for f in (after or ()) if f.waived is None)
    return Plan(tuple(fixed), tuple(edits), remaining)
