"""The pre-commit hook runs on every kind of file that changes the results."""

from __future__ import annotations

import re
from pathlib import Path

import pytest
import yaml

ROOT = Path(__file__).resolve().parent.parent
[HOOK] = yaml.safe_load((ROOT / ".pre-commit-hooks.yaml").read_text(encoding="utf-8"))
# pre-commit matches `files` with Python's re.search on the repository-relative
# path, '/' separated (pre-commit documentation, "Filtering files with types").
FILES = re.compile(HOOK["files"])


@pytest.mark.parametrize(
    "path",
    [
        "top.cnet",
        "drawings/panel-7/sheet-02.cnet",
        "parts/company.parts.yaml",
        "c7.parts.yml",
        "netcheck.yaml",
        "drawings/netcheck.yaml",
        *(
            p.relative_to(ROOT).as_posix()
            for p in sorted((ROOT / "sample_nets").rglob("*"))
            if p.suffix in (".cnet", ".yaml") and p.name != "expect.yaml"
        ),
    ],
)
def test_hook_covers(path):
    assert FILES.search(path), path


@pytest.mark.parametrize(
    "path",
    [
        "README.md",
        "sample_nets/machine-24v/expect.yaml",
        "ci/other.yaml",
        "my-netcheck.yaml",
        "notes.cnet.txt",
        "netcheck.yaml.bak",
    ],
)
def test_hook_skips(path):
    assert not FILES.search(path), path


def test_hook_checks_the_whole_tree():
    assert HOOK["entry"] == "netcheck check"
    assert HOOK["pass_filenames"] is False and HOOK["args"] == ["."]
