"""Stamping a fingerprint on a fresh finding is ``evolve`` without the copy."""

from __future__ import annotations

from pathlib import Path

from netcheck.findings import Finding, Severity, evolve, fingerprint, stamp_fingerprint
from netcheck.source import Span
from netcheck.units import Q_


def test_stamp_is_evolve_without_a_copy() -> None:
    made = Finding(
        "dc-break-over-rating",
        Severity.ERROR,
        "K1 breaks 2 A",
        Span(Path("a.cnet").as_posix(), 3, 1),
        "K1:13-14",
        {"current": Q_(2.0, "A")},
        key="k",
    )
    mark = fingerprint(made.rule, made.span.file, made.element, made.key)
    copy = evolve(made, fingerprint=mark)
    stamp_fingerprint(made, mark)
    assert made == copy and made.fingerprint == mark != ""
