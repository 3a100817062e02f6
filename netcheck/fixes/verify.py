"""Verify fixes: apply the edits to a copy of the design and check it again.

A fix is verified only when, with its edits applied, the finding it fixes is
gone and no error appears that the design did not have. Candidates are tried
in order of preference; the first that verifies is the one shown. A fix none
of whose candidates verifies keeps its text and is marked unverified.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field, replace

from netcheck.analysis.elements import Analysis, analyse
from netcheck.errors import InputError, InputErrors
from netcheck.findings import Finding, Severity
from netcheck.fixes.edits import Edit, apply_edits
from netcheck.fixes.propose import Proposer
from netcheck.graph import build_graph
from netcheck.model import Netlist

__all__ = ["Verifier", "verify_fixes", "identity"]

MAX_CANDIDATES = 12  # re-checks per finding: bounds the cost on large designs


def identity(finding: Finding) -> tuple[str, str, str]:
    """What makes two findings the same across a re-check: rule, element, key."""
    return (finding.rule, finding.element, finding.key)


@dataclass
class Verifier:
    """Re-checks one design with candidate edits applied, memoised by edits."""

    netlist: Netlist
    findings: Sequence[Finding]
    margins: Mapping[str, float]
    _results: dict[tuple[Edit, ...], list[Finding] | None] = field(default_factory=dict)

    def recheck(self, edits: Sequence[Edit]) -> list[Finding] | None:
        """The findings of the edited design, or None if the edits do not build."""
        key = tuple(edits)
        if key not in self._results:
            self._results[key] = self._run(edits)
        return self._results[key]

    def _run(self, edits: Sequence[Edit]) -> list[Finding] | None:
        from netcheck.pipeline import run_checks  # the pipeline calls this module

        try:
            edited = apply_edits(self.netlist, edits)
        except (InputError, InputErrors, ValueError, KeyError):
            return None
        return run_checks(edited, analyse(build_graph(edited)), self.margins)

    def passes(self, finding: Finding, edits: Sequence[Edit]) -> bool:
        """The finding is gone and no new error appears."""
        after = self.recheck(edits)
        if after is None:
            return False
        before = {identity(f) for f in self.findings if f.waived is None}
        target = identity(finding)
        for other in after:
            if other.waived is not None:
                continue
            if identity(other) == target:
                return False
            if other.severity == Severity.ERROR and identity(other) not in before:
                return False
        return True


def verify_fixes(
    netlist: Netlist,
    analysis: Analysis,
    findings: Sequence[Finding],
    margins: Mapping[str, float] = {},
) -> list[Finding]:
    """The findings, each fix given its verified edits (or marked unverified)."""
    proposer = Proposer(netlist, analysis, dict(margins))
    verifier = Verifier(netlist, findings, margins)
    out = []
    for finding in findings:
        if finding.fix is None or finding.waived is not None:
            out.append(finding)
            continue
        first: list[Edit] | None = None
        chosen: list[Edit] | None = None
        for count, edits in enumerate(proposer.candidates(finding)):
            if count >= MAX_CANDIDATES:
                break
            first = first if first is not None else edits
            if verifier.passes(finding, edits):
                chosen = edits
                break
        if chosen is not None:
            out.append(replace(finding, edits=tuple(chosen), verified=True))
        else:
            out.append(replace(finding, edits=tuple(first or ()), verified=False))
    return out
