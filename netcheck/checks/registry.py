"""The registry of checks: one small pure function per rule."""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from netcheck.checks.context import CheckContext
    from netcheck.findings import Finding

__all__ = ["check", "all_checks", "CheckFunction"]

CheckFunction = Callable[["CheckContext"], Iterator["Finding"]]
_CHECKS: dict[str, CheckFunction] = {}


def check(rule: str) -> Callable[[CheckFunction], CheckFunction]:
    """Register a check for ``rule``; its function name must be the rule's name."""

    def register(function: CheckFunction) -> CheckFunction:
        expected = rule.replace("-", "_")
        if function.__name__ != expected:
            raise ValueError(f"check for {rule} must be named {expected}")
        if rule in _CHECKS:
            raise ValueError(f"two checks for {rule}")
        _CHECKS[rule] = function
        return function

    return register


def all_checks() -> dict[str, CheckFunction]:
    """Every registered check, by rule name (importing the check modules)."""
    import netcheck.checks  # noqa: F401  (registers the checks)

    return dict(sorted(_CHECKS.items()))
