"""Fixes re-checked on the part of the design their edits touch.

The verifier re-analyses only the cluster of domains an edit touches
(netcheck.fixes.locality). The reference is the whole edited design re-checked,
kept here: on every rule case and sample both must give the same verdict and
the same edits for every finding. A second test counts the components
re-analysed on generated designs of two sizes: local re-checks make the work
grow with the design, whole-design re-checks with its square.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

import netcheck.fixes.verify as verify
from netcheck.errors import InputError
from netcheck.fixes.verify import verify_fixes
from netcheck.input import load_design
from netcheck.pipeline import analyse_path, run_checks

ROOT = Path(__file__).parents[2]
BENCH = ROOT / "bench"
DESIGNS = sorted((ROOT / "tests" / "cases").rglob("*.cnet")) + sorted(
    (ROOT / "sample_nets").rglob("*.cnet")
)


def _verdicts(findings):  # type: ignore[no-untyped-def]
    return [(f.rule, f.element, f.key, f.verified, f.edits) for f in findings]


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: str(p.relative_to(ROOT)))
def test_local_recheck_agrees_with_whole_design(path: Path) -> None:
    try:
        netlist, analysis = analyse_path(path)
    except InputError:
        pytest.skip("an included sheet or an input-error case, checked elsewhere")
    findings = run_checks(netlist, analysis)
    local = verify_fixes(netlist, analysis, findings)  # the default work budget
    whole = verify_fixes(netlist, analysis, findings, budget=None, local=False)
    assert _verdicts(local) == _verdicts(whole)
    assert all(f.verified is not None for f in local if f.fix and not f.waived)


def _work(tmp: Path, n: int, monkeypatch: pytest.MonkeyPatch) -> tuple[int, int]:
    """(components re-analysed, budget) verifying the fixes of a generated design."""
    sys.path.insert(0, str(BENCH))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH))
    top = gen_design.generate(n, tmp / str(n), shape="unsuppressed")
    netlist, analysis = analyse_path(top)
    assert len(load_design(top, display_base=tmp).components) == n
    counted = [0]
    real = verify.analyse

    def counting(graph, only=None):  # type: ignore[no-untyped-def]
        # Counted apart from the budget: a restricted re-check analyses the
        # elements of ``only`` and makes passes over the part (DOMAIN_PASSES).
        size = len(graph.netlist.components)
        if only is None:
            counted[0] += size
        else:
            counted[0] += len(only) + -(-size // verify.DOMAIN_PASSES)
        return real(graph, only)

    monkeypatch.setattr(verify, "analyse", counting)
    findings = verify_fixes(netlist, analysis, run_checks(netlist, analysis))
    monkeypatch.setattr(verify, "analyse", real)
    assert any(f.verified for f in findings)
    return counted[0], verify.work_budget(netlist)


def test_recheck_work_grows_linearly(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """The re-checks of ``check`` cost at most a fixed multiple of the design.

    The generated shape puts up to a few thousand components in one domain, so
    at these sizes a re-check is half the design or all of it: the work budget,
    not the cut, is what bounds the work. The whole design re-checked 64 times
    (the former count budget) would be 51,200 components at 800.
    """
    small, small_budget = _work(tmp_path, 200, monkeypatch)
    large, large_budget = _work(tmp_path, 800, monkeypatch)
    assert small_budget == 4 * 200 + verify.WORK_FLOOR
    assert 0 < small <= small_budget and 0 < large <= large_budget
    assert large - small <= verify.WORK_FACTOR * (800 - 200) + verify.WORK_FLOOR
