"""Checks never import one another: shared physics lives in netcheck.analysis.

The check context and the registry are the only modules of netcheck.checks a
check may import (DEVELOPERS.md, "Checks").
"""

from __future__ import annotations

import ast
from pathlib import Path

import netcheck.checks

CHECKS = Path(netcheck.checks.__file__).parent
ALLOWED = {"netcheck.checks.context", "netcheck.checks.registry"}


def _imports(path: Path) -> set[str]:
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            names |= {alias.name for alias in node.names}
        elif isinstance(node, ast.ImportFrom) and node.module:
            names.add(node.module)
            if node.module == "netcheck.checks":
                names |= {f"netcheck.checks.{a.name}" for a in node.names}
    return names


def _check_modules() -> list[Path]:
    return [
        p
        for p in sorted(CHECKS.glob("*.py"))
        if p.stem not in ("__init__", "context", "registry")
    ]


def test_there_are_check_modules_to_scan() -> None:
    assert len(_check_modules()) >= 5


def test_no_check_module_imports_another() -> None:
    offenders = {}
    for path in _check_modules():
        bad = {
            name
            for name in _imports(path)
            if name.startswith("netcheck.checks") and name not in ALLOWED
        }
        if bad:
            offenders[path.name] = sorted(bad)
    assert offenders == {}


def test_the_scan_sees_a_check_import(tmp_path: Path) -> None:
    sample = tmp_path / "sample.py"
    sample.write_text("from netcheck.checks.ratings import x\n", encoding="utf-8")
    assert "netcheck.checks.ratings" in _imports(sample)
