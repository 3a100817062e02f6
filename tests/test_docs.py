"""The documentation cannot drift: every name the code knows is documented, and
every example in README.md and docs/*.md runs as written.

Conventions in the Markdown: ``<!-- example: NAME exit N -->`` before a ``cnet``
block makes it a design checked with that exit status; ``<!-- file: NAME -->``
before a block makes it a file the page's examples may name (a sheet, a part
library). A README ``sh`` block is run where it calls ``netcheck``.
"""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import pytest

from netcheck import schema
from netcheck.attributes import LOAD_TYPES, choices
from netcheck.input.poles import COIL_TERMINALS
from netcheck.kinds import (
    COIL_KEYS,
    CONTACT_KEYS,
    KIND_ATTRIBUTES,
    KIND_TERMINALS,
    KINDS,
)
from netcheck.kinds import SUPPRESSION_CHOICES as SUPPRESSION_KINDS

ROOT = Path(__file__).resolve().parent.parent
PAGES = [ROOT / "README.md", *sorted((ROOT / "docs").glob("*.md"))]
LANGUAGE = (ROOT / "docs" / "language.md").read_text(encoding="utf-8")
PARTS = (ROOT / "docs" / "parts.md").read_text(encoding="utf-8")
BLOCK = re.compile(
    r"(?:<!-- (?P<mark>example|file): (?P<name>\S+)(?: exit (?P<exit>\d))? -->\n)?"
    r"^```(?P<lang>[a-z]*)\n(?P<body>.*?)^```",
    re.S | re.M,
)


def _code(text: str) -> set[str]:
    """Every `inline code` word of a page."""
    return set(re.findall(r"`([^`\n]+)`", text))


def test_every_kind_terminal_and_attribute_is_in_the_language_reference():
    code = _code(LANGUAGE)
    missing = [kind for kind in KINDS if kind not in code]
    for keys in KIND_ATTRIBUTES.values():
        missing += [key for key in keys if key not in code]
    for sets in KIND_TERMINALS.values():
        missing += [t for terminals in sets or () for t in terminals if t not in code]
    missing += [t for t in COIL_TERMINALS if t not in code]
    missing += [f"coil.{k}" for k in COIL_KEYS if f"coil.{k}" not in code]
    missing += [f"contacts.{k}" for k in CONTACT_KEYS if f"contacts.{k}" not in code]
    missing += [t for t in (*LOAD_TYPES, *SUPPRESSION_KINDS) if t not in code]
    missing += [t for t in ("fast-release", "safety") if t not in code]
    for key in {k for keys in KIND_ATTRIBUTES.values() for k in keys}:
        allowed = choices(key)
        if isinstance(allowed, tuple):
            missing += [f"{key}={c}" for c in allowed if c not in code]
    assert missing == []


def _schema_keys(node, found: set[str]) -> set[str]:
    if isinstance(node, dict):
        for key, value in node.items():
            if key == "properties":
                found |= set(value)
            _schema_keys(value, found)
    elif isinstance(node, list):
        for item in node:
            _schema_keys(item, found)
    return found


def test_every_part_library_key_is_in_the_parts_reference():
    keys = _schema_keys(schema.load_schema("parts"), set())
    code = _code(PARTS)
    assert sorted(k for k in keys if k not in code) == []
    enums = schema.load_schema("parts")["$defs"]["part"]["properties"]["kind"]["enum"]
    assert set(enums) == set(KINDS)


def _blocks(page: Path) -> list[dict[str, str | None]]:
    return [m.groupdict() for m in BLOCK.finditer(page.read_text(encoding="utf-8"))]


EXAMPLES = [
    (page, block)
    for page in PAGES
    for block in _blocks(page)
    if block["lang"] == "cnet"
]


def test_every_cnet_block_is_marked():
    unmarked = [
        (page.name, block["body"][:40])
        for page, block in EXAMPLES
        if block["mark"] is None
    ]
    assert unmarked == []
    assert {page.name for page, _ in EXAMPLES} >= {"README.md", "language.md"}


def _run(*args: str, cwd: Path) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "netcheck", *args],
        cwd=cwd,
        capture_output=True,
        text=True,
        timeout=300,
        env={"PATH": "/usr/bin:/bin", "NO_COLOR": "1", "PYTHONPATH": str(ROOT)},
    )


@pytest.mark.parametrize(
    ("page", "block"),
    [(p, b) for p, b in EXAMPLES if b["mark"] == "example"],
    ids=[f"{p.name}-{b['name']}" for p, b in EXAMPLES if b["mark"] == "example"],
)
def test_cnet_example_checks_as_stated(page, block, tmp_path):
    for other in _blocks(page):
        if other["mark"] == "file":
            (tmp_path / str(other["name"])).write_text(str(other["body"]), "utf-8")
    design = tmp_path / str(block["name"])
    design.write_text(str(block["body"]), encoding="utf-8")
    result = _run("check", design.name, cwd=tmp_path)
    assert result.returncode == int(str(block["exit"])), result.stdout + result.stderr


README = (ROOT / "README.md").read_text(encoding="utf-8")
SHELL = [b for b in _blocks(ROOT / "README.md") if b["lang"] == "sh"]


def test_readme_quick_start_is_two_commands_and_ci_runs_the_second():
    install, tests = (str(b["body"]).strip() for b in SHELL[:2])
    assert install.startswith("python3 -m venv .venv && .venv/bin/pip install . && ")
    assert tests.startswith("python3 -m venv .venv && .venv/bin/pip install '.[test]'")
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8").strip().splitlines()
    assert ci[-1] == tests


def test_readme_netcheck_commands_run_as_written():
    # The quick start's own command, after the install: the samples hold
    # deliberate hazards, so it exits 1 as the README says.
    install = str(SHELL[0]["body"]).strip()
    command = install.split(" && ")[-1].split()
    assert command[0] == ".venv/bin/netcheck"
    assert "it exits 1" in README
    result = _run(*command[1:], cwd=ROOT)
    assert result.returncode == 1, result.stderr
    assert "error" in result.stdout
