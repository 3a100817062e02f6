"""Fix verification does work in proportion to the fixes: counted, never timed.

Each design is the bench's unsuppressed shape (every load without a
suppressor) at two sizes, each fix verified by its own re-check. What is
compared per fix with the design's findings (their identities) must not grow
with the design: it once rebuilt the set of every finding's identity per fix,
O(N) each, which on 100,000 components of unsuppressed rungs was nine tenths
of ``check``.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

import netcheck.fixes.verify as verify
from netcheck.pipeline import CheckOptions, check_path

BENCH = Path(__file__).resolve().parents[2] / "bench"


def _generate(n: int, out: Path) -> Path:
    sys.path.insert(0, str(BENCH))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH))
    return gen_design.generate(n, out, shape="unsuppressed")  # type: ignore[no-any-return]


def _identities_per_fix(
    tmp: Path, count: int, monkeypatch: pytest.MonkeyPatch
) -> tuple[float, int]:
    top = _generate(count, tmp / str(count))
    calls = 0
    real = verify.identity

    def counted(finding):  # type: ignore[no-untyped-def]
        nonlocal calls
        calls += 1
        return real(finding)

    monkeypatch.setattr(verify, "identity", counted)
    monkeypatch.setattr(verify, "WORK_FACTOR", 10_000)  # no fix left unchecked
    result = check_path(top, CheckOptions(verify_fixes=True))
    fixed = [f for f in result.findings if f.fix is not None]
    assert all(f.verified is not None for f in fixed)
    verified = sum(f.verified is True for f in fixed)
    return calls / max(len(fixed), 1), verified


def test_identity_work_per_fix_does_not_grow(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    small, verified_small = _identities_per_fix(tmp_path, 300, monkeypatch)
    large, verified_large = _identities_per_fix(tmp_path, 1200, monkeypatch)
    assert verified_large > 3 * verified_small > 0
    # Linear work: about the same per fix at 4x the design (the old set of
    # every finding's identity per fix made it about 4x).
    assert large <= 1.5 * small
