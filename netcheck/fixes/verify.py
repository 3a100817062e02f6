"""Verify fixes: apply the edits to a copy of the design and check it again.

A fix is verified only when, with its edits applied, the finding it fixes is
gone and no error appears that the design did not have. Candidates are tried
in order of preference; the first that verifies is the one shown. A fix none
of whose candidates verifies keeps its text and is marked unverified.
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping, Sequence
from dataclasses import dataclass, field, replace

from netcheck.analysis.elements import Analysis, analyse
from netcheck.errors import InputError, InputErrors
from netcheck.findings import Finding, Severity
from netcheck.fixes.edits import AddComponent, Edit, apply_edits
from netcheck.fixes.propose import Proposer, rating_attribute
from netcheck.graph import build_graph
from netcheck.model import Netlist

__all__ = ["Verifier", "verify_fixes", "identity"]

MAX_CANDIDATES = 12  # candidates per finding
# Re-checks of one design during ``check``: each is a full analysis, so a large
# design with many findings would otherwise cost findings x candidates analyses.
# ``netcheck fix`` lifts the budget (None).
CHECK_BUDGET = 64


def identity(finding: Finding) -> tuple[str, str, str]:
    """What makes two findings the same across a re-check: rule, element, key."""
    return (finding.rule, finding.element, finding.key)


@dataclass
class Verifier:
    """Re-checks one design with candidate edits applied, memoised by edits."""

    netlist: Netlist
    findings: Sequence[Finding]
    margins: Mapping[str, float]
    budget: int | None = None
    spent: int = 0
    _results: dict[tuple[Edit, ...], list[Finding] | None] = field(default_factory=dict)

    def recheck(self, edits: Sequence[Edit]) -> list[Finding] | None:
        """The findings of the edited design, or None if the edits do not build."""
        key = tuple(edits)
        if key not in self._results:
            if self.exhausted:
                return None
            self.spent += 1
            self._results[key] = self._run(edits)
        return self._results[key]

    @property
    def exhausted(self) -> bool:
        """Whether the re-check budget is spent."""
        return self.budget is not None and self.spent >= self.budget

    def _run(self, edits: Sequence[Edit]) -> list[Finding] | None:
        from netcheck.pipeline import run_checks  # the pipeline calls this module

        try:
            edited = apply_edits(self.netlist, edits)
        except (InputError, InputErrors, ValueError, KeyError):
            return None
        return run_checks(edited, analyse(build_graph(edited)), self.margins)

    def refined(self, edits: list[Edit]) -> list[Edit]:
        """The edits with each added part rated at what the re-check asks of it.

        A check that finds an added suppressor's rating missing or short names
        the rating it needs; that value (rounded up) becomes the part's rating,
        a few rounds at most, so the suggested part passes the checks themselves.
        """
        for _ in range(3):
            after = self.recheck(edits)
            needs = self._needs(after or [], edits)
            if not needs:
                return edits
            edits = [_rated(edit, needs) for edit in edits]
        return edits

    def _needs(
        self, after: list[Finding], edits: list[Edit]
    ) -> dict[str, dict[str, str]]:
        added = {e.ref for e in edits if isinstance(e, AddComponent)}
        before = {identity(f) for f in self.findings}
        needs: dict[str, dict[str, str]] = {}
        for f in after:
            ref = f.element.split(":", 1)[0]
            if ref not in added or identity(f) in before or f.waived is not None:
                continue
            if f.rule in ("suppressor-underrated", "rating-data-missing"):
                rating = rating_attribute(f.values.get("what"), f.values.get("needed"))
                if rating is not None:
                    needs.setdefault(ref, {})[rating[0]] = rating[1]
        return needs

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


def _rated(edit: Edit, needs: dict[str, dict[str, str]]) -> Edit:
    if not isinstance(edit, AddComponent) or edit.ref not in needs:
        return edit
    ratings = {**dict(edit.attributes), **needs[edit.ref]}
    return replace(edit, attributes=tuple(ratings.items()))


def _first_passing(
    finding: Finding, candidates: Iterator[list[Edit]], verifier: Verifier
) -> tuple[list[Edit] | None, list[Edit] | None]:
    """(the first candidate, the first that verifies) among the candidates."""
    first: list[Edit] | None = None
    for count, edits in enumerate(candidates):
        if count >= MAX_CANDIDATES:
            break
        first = first if first is not None else edits
        edits = verifier.refined(edits)
        if verifier.passes(finding, edits):
            return first, edits
    return first, None


def verify_fixes(
    netlist: Netlist,
    analysis: Analysis,
    findings: Sequence[Finding],
    margins: Mapping[str, float] = {},
    budget: int | None = CHECK_BUDGET,
) -> list[Finding]:
    """The findings, each fix given its verified edits (or marked unverified).

    Fixes left when the re-check ``budget`` is spent keep their first candidate
    and ``verified`` None: not checked, rather than checked and failed.

    A finding that is a consequence of another (a contact "breaking" the short
    of a reversed diode) has no fix of its own that works; the verified edits
    of the other findings are tried for it too. Their re-checks are memoised,
    so this costs nothing more.
    """
    proposer = Proposer(netlist, analysis, dict(margins))
    verifier = Verifier(netlist, findings, margins, budget)
    chosen: dict[int, list[Edit]] = {}
    unchecked: set[int] = set()
    firsts: dict[int, list[Edit] | None] = {}
    for index, finding in enumerate(findings):
        if finding.fix is None or finding.waived is not None:
            continue
        if verifier.exhausted:
            unchecked.add(index)
        firsts[index], edits = _first_passing(
            finding, proposer.candidates(finding), verifier
        )
        if edits is not None:
            chosen[index] = edits
    borrowed = [chosen[i] for i in sorted(chosen)]
    for index in firsts:
        if index not in chosen:
            _, edits = _first_passing(findings[index], iter(borrowed), verifier)
            if edits is not None:
                chosen[index] = edits
    out = []
    for index, finding in enumerate(findings):
        if index in chosen:
            finding = replace(finding, edits=tuple(chosen[index]), verified=True)
        elif index in firsts:
            verified = None if index in unchecked or verifier.exhausted else False
            edits = tuple(firsts[index] or ())
            finding = replace(finding, edits=edits, verified=verified)
        out.append(finding)
    return out
