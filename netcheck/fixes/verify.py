"""Verify fixes: apply the edits to a copy of the design and check it again.

A fix is verified only when, with its edits applied, the finding it fixes is
gone and no error appears that the design did not have. Only the part of the
design the edits can affect is re-checked (:mod:`netcheck.fixes.locality`):
findings elsewhere cannot change; within it, only the elements the edits can
change are analysed again where that is shown exact (:mod:`netcheck.fixes.rungs`,
which falls back to the whole part otherwise; where the touched domains have
no global element, :mod:`netcheck.fixes.slices` builds and checks only the
slice of the touched rungs and the bus). Candidates are tried
in order of preference; the first that verifies is the one shown. A fix none
of whose candidates verifies keeps its text and is marked unverified.
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping, Sequence
from dataclasses import dataclass, field, replace
from functools import cached_property
from typing import Any

from netcheck.analysis.elements import Analysis, analyse
from netcheck.errors import InputError, InputErrors
from netcheck.findings import Finding, Severity
from netcheck.fixes.edits import AddComponent, Edit, apply_edits
from netcheck.fixes.locality import Cut, Locality
from netcheck.fixes.propose import Proposer, rating_attribute
from netcheck.fixes.rungs import Restricted, Rungs
from netcheck.fixes.slices import Slices
from netcheck.graph import build_graph
from netcheck.model import Netlist

__all__ = ["Verifier", "verify_fixes", "identity"]

MAX_CANDIDATES = 12  # candidates per finding
# Work of the re-checks of one design during ``check``, in components
# re-analysed: WORK_FACTOR times the design's size plus WORK_FLOOR, so the cost
# stays linear in the design and small designs verify every fix.
# ``netcheck fix`` lifts the budget (None).
WORK_FACTOR = 4
WORK_FLOOR = 5000
DESIGN_BUDGET = -1  # verify_fixes: the budget of work_budget()
# A restricted re-check (netcheck.fixes.rungs) still builds and solves the
# whole part: measured on 20,000 components (mixed shape, 4,001-component
# parts), 0.57-0.65 s against 1.62-1.68 s for re-checking every element, so it
# is charged 2/5 of the part's components (bench/README.md).
RESTRICTED_SHARE = (2, 5)
# A slice (netcheck.fixes.slices) is charged its own components: measured on
# 20,000 components (mixed and one-rail shapes), 8-18 ms per slice of 65-280
# components, 0.06-0.1 ms a component with its fixed costs, against ~0.1 ms a
# component for checking the design itself, so the charge follows the work.
_UNKNOWN: Any = object()  # a re-check refused for want of budget
_WHOLE_CLUSTER: Any = object()  # a slice cannot decide: the cluster's re-check


def work_budget(netlist: Netlist) -> int:
    """Components ``check`` may re-analyse verifying the fixes of ``netlist``."""
    return WORK_FACTOR * len(netlist.components) + WORK_FLOOR


def identity(finding: Finding) -> tuple[str, str, str]:
    """What makes two findings the same across a re-check: rule, element, key."""
    return (finding.rule, finding.element, finding.key)


@dataclass
class Verifier:
    """Re-checks one design with candidate edits applied, memoised by edits.

    ``locality`` cuts out the part of the design the edits touch; without one
    the whole design is re-checked (the reference the tests compare with).
    ``rungs``, with a locality, re-analyses within that part only the
    elements an edit can change (:mod:`netcheck.fixes.rungs`), falling back
    to the whole part where it cannot show that exact.
    ``budget`` and ``spent`` count components re-analysed.
    """

    netlist: Netlist
    findings: Sequence[Finding]
    margins: Mapping[str, float]
    budget: int | None = None
    locality: Locality | None = None
    rungs: Rungs | None = None
    slices: Slices | None = None
    spent: int = 0
    refused: bool = False
    _results: dict[tuple[Edit, ...], tuple[list[Finding], Cut] | None] = field(
        default_factory=dict
    )

    def recheck(self, edits: Sequence[Edit]) -> list[Finding] | None:
        """The findings of the edited part, or None if the edits do not build."""
        result = self._result(edits)
        return None if result is None else result[0]

    def _result(
        self, edits: Sequence[Edit], whole: bool = False
    ) -> tuple[list[Finding], Cut] | None:
        key = tuple(edits)
        known = self._results.get(key, _UNKNOWN)
        if known is _UNKNOWN or (whole and known and known[1].restricted):
            plan = None if whole or self.rungs is None else self.rungs.plan(edits)
            result = _WHOLE_CLUSTER
            if plan is not None and self.slices is not None:
                result = self._sliced(edits, plan)
            if result is _WHOLE_CLUSTER:
                result = self._run(self._cut(edits), edits, plan)
            if result is _UNKNOWN:
                return None  # refused for want of budget: not memoised
            self._results[key] = result  # type: ignore[assignment]
        return self._results[key]

    def _charge(self, cost: int) -> bool:
        if self.budget is not None and self.spent + cost > self.budget:
            self.refused = True
            return False
        self.spent += cost
        return True

    def _cut(self, edits: Sequence[Edit]) -> Cut:
        if self.locality is None:
            everything = {c.ref for c in self.netlist.components}
            return Cut(self.netlist, frozenset(everything))
        return self.locality.cut(edits)

    @property
    def exhausted(self) -> bool:
        """Whether a re-check was refused for want of budget."""
        return self.refused

    def _run(self, cut: Cut, edits: Sequence[Edit], plan: Restricted | None) -> Any:
        """(findings, cut), None if the edits do not build, _UNKNOWN if refused."""
        from netcheck.pipeline import run_checks  # the pipeline calls this module

        added = sum(isinstance(e, AddComponent) for e in edits)
        if plan is not None:
            if not self._charge(plan.cost + added + _share(cut.size)):
                return _UNKNOWN
        elif not self._charge(cut.size + added):
            return _UNKNOWN
        try:
            edited = apply_edits(cut.netlist, edits)
        except (InputError, InputErrors, ValueError, KeyError):
            return None
        graph = build_graph(edited)
        if plan is not None:
            assert self.rungs is not None
            analysis = analyse(graph, only=plan.only)
            if self.rungs.unchanged(analysis, plan):
                local = replace(cut, restricted=plan)
                after = run_checks(edited, analysis, self.margins)
                return [f for f in after if local.decides(f.element)], local
            if not self._charge(cut.size + added):  # not shown exact: all of it
                return _UNKNOWN
        return run_checks(edited, analyse(graph), self.margins), cut

    def _sliced(self, edits: Sequence[Edit], plan: Restricted) -> Any:
        """The re-check of the edited slice (:mod:`netcheck.fixes.slices`).

        _WHOLE_CLUSTER where the slice cannot decide: the cluster is then
        re-checked as before.
        """
        from netcheck.pipeline import run_checks  # the pipeline calls this module

        assert self.slices is not None
        if not self.slices.allows(plan, edits):
            return _WHOLE_CLUSTER
        added = sum(isinstance(e, AddComponent) for e in edits)
        if not self._charge(self.slices.cost(plan) + added):
            return _UNKNOWN
        try:
            edited = self.slices.edited(edits, plan)
        except (InputError, InputErrors, ValueError, KeyError):
            return None
        piece = self.slices.build(edited, plan)
        if not self.slices.exact(piece, plan):
            return _WHOLE_CLUSTER
        local = Cut(piece.netlist, frozenset(), restricted=plan)
        after = run_checks(piece.netlist, piece.analysis, self.margins)
        return [f for f in after if local.decides(f.element)], local

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
        before = self._identities
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

    @cached_property
    def _identities(self) -> frozenset[tuple[str, str, str]]:
        """The design's findings, as identities: worked out once, not per fix."""
        return frozenset(identity(f) for f in self.findings)

    @cached_property
    def _standing(self) -> frozenset[tuple[str, str, str]]:
        """Identities of the design's findings not waived."""
        return frozenset(identity(f) for f in self.findings if f.waived is None)

    def passes(self, finding: Finding, edits: Sequence[Edit]) -> bool:
        """The finding is gone and no new error appears.

        A finding outside the re-checked part stays as it was, so it is not
        gone; errors outside are unchanged, so none of them is new.
        """
        result = self._result(edits)
        if result is not None and not result[1].decides(finding.element):
            if result[1].restricted is not None:
                result = self._result(edits, whole=True)  # the finding is elsewhere
        if result is None:
            return False
        after, cut = result
        if self.locality is not None and not cut.decides(finding.element):
            return False
        before = self._standing
        target = identity(finding)
        for other in after:
            if other.waived is not None:
                continue
            if identity(other) == target:
                return False
            if other.severity == Severity.ERROR and identity(other) not in before:
                return False
        return True


def _share(size: int) -> int:
    """Components charged for the passes of a restricted re-check over ``size``."""
    numerator, denominator = RESTRICTED_SHARE
    return -(-size * numerator // denominator)


def _fixable(findings: Sequence[Finding]) -> bool:
    return any(f.fix is not None and f.waived is None for f in findings)


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
        if verifier.exhausted:
            break  # past the budget: the first candidate, not checked
        edits = verifier.refined(edits)
        if verifier.passes(finding, edits):
            return first, edits
    return first, None


def verify_fixes(
    netlist: Netlist,
    analysis: Analysis,
    findings: Sequence[Finding],
    margins: Mapping[str, float] = {},
    budget: int | None = DESIGN_BUDGET,
    local: bool = True,
    sliced: bool = True,
) -> list[Finding]:
    """The findings, each fix given its verified edits (or marked unverified).

    ``budget`` counts components re-analysed: DESIGN_BUDGET is
    :func:`work_budget`, None no limit. Fixes left when it is spent keep their
    first candidate and ``verified`` None: not checked, rather than checked and
    failed. ``local`` False re-checks the whole design each time (the
    reference for the tests). ``sliced`` False re-checks the whole cluster
    where a slice could do (:mod:`netcheck.fixes.slices`; for the tests).

    A finding that is a consequence of another (a contact "breaking" the short
    of a reversed diode) has no fix of its own that works; the verified edits
    of the other findings are tried for it too. Their re-checks are memoised,
    so this costs nothing more.
    """
    proposer = Proposer(netlist, analysis, dict(margins))
    if budget == DESIGN_BUDGET:
        budget = work_budget(netlist)
    locality = Locality(netlist, analysis.graph) if local else None
    rungs = Rungs(netlist, analysis) if local and _fixable(findings) else None
    slices = Slices(rungs) if rungs is not None and sliced else None
    verifier = Verifier(netlist, findings, margins, budget, locality, rungs, slices)
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
