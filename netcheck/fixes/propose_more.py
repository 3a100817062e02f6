"""Candidate edits for rules whose fix was advice only.

A polarized suppressor across an AC load (``diode-on-ac-load``) must go: a
``Remove`` edit takes it out. A finding that says "the data for this part are
missing" (``rating-data-missing``) or "this pass rests on the V/n series-pole
assumption" (``series-poles-assumed``) has one design change that really clears
it: use a part of the loaded library that carries the data (a rated series row,
the DC ratings). The verifier keeps only a part that passes every check: the
finding goes and no new error appears. The data themselves (adding the maker's
ratings to the library) stay the advice of the rule's fix text.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Protocol

from netcheck.analysis.result import Analysis
from netcheck.findings import Finding
from netcheck.fixes.edits import Edit, Remove

__all__ = ["USE_PART_RULES", "REMOVE_RULES", "more_candidates"]

USE_PART_RULES = frozenset({"rating-data-missing", "series-poles-assumed"})
# A polarized suppressor across an AC load conducts every half cycle: it must go
# (the rule's text names the varistor or RC to fit in its place).
REMOVE_RULES = frozenset({"diode-on-ac-load"})


class _Proposer(Protocol):
    analysis: Analysis

    def _other_parts(self, finding: Finding) -> Iterator[list[Edit]]: ...


def _chain(analysis: Analysis, finding: Finding) -> tuple[str, ...]:
    """Every part of the suppressor chain the finding names (a diode + zener)."""
    ref = finding.element.split(":", 1)[0]
    load = finding.values.get("load")
    for info in analysis.loads.values():
        if info.branch.ref != load:
            continue
        for suppressor in info.suppressors:
            if ref in suppressor.refs:
                return suppressor.refs
    return (ref,)


def more_candidates(proposer: _Proposer, finding: Finding) -> Iterator[list[Edit]]:
    """Candidates beyond ``Proposer.candidates``: a library part with the data."""
    if finding.rule in USE_PART_RULES:
        yield from proposer._other_parts(finding)
    if finding.rule in REMOVE_RULES:
        yield [Remove(ref) for ref in _chain(proposer.analysis, finding)]
