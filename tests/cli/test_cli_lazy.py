"""``netcheck --help`` and ``--version`` load no heavy library and no pipeline.

The module set is asserted, not the time: the time is measured in bench/ (the
command line's start-up figures are in DEVELOPERS.md).
"""

from __future__ import annotations

import re
import subprocess
import sys

import pytest

# What a start-up that answers --help must not pay for.
HEAVY = ("pint", "numpy", "networkx", "lark", "rich", "yaml", "jsonschema", "scipy")
PIPELINE = (
    "netcheck.pipeline",
    "netcheck.analysis",
    "netcheck.checks",
    "netcheck.input",
    "netcheck.findings",
    "netcheck.catalogue",
    "netcheck.report",
    "netcheck.session",
)


def _imported(argv: list[str]) -> tuple[subprocess.CompletedProcess[str], set[str]]:
    """Run ``python -X importtime -m netcheck ARGV``; the modules it imported."""
    done = subprocess.run(
        [sys.executable, "-X", "importtime", "-m", "netcheck", *argv],
        capture_output=True,
        text=True,
        check=False,
    )
    names = set(
        re.findall(r"^import time:\s+\d+ \|\s+\d+ \|\s*(\S+)", done.stderr, re.M)
    )
    return done, names


def _heavy(names: set[str]) -> set[str]:
    return {
        name
        for name in names
        if name.split(".")[0] in HEAVY
        or any(name == p or name.startswith(p + ".") for p in PIPELINE)
    }


@pytest.mark.parametrize(
    "argv", [["--version"], ["--help"], ["check", "--help"], ["size", "--help"]]
)
def test_help_and_version_import_nothing_heavy(argv):
    done, names = _imported(argv)
    assert done.returncode == 0, done.stderr[-2000:]
    assert "netcheck.cli" in names  # the parse did run (the check can fail)
    assert _heavy(names) == set()


def test_a_real_command_does_load_the_pipeline():
    # The other side of the test above: the import-time scan sees the pipeline
    # when a command needs it, so an empty set above means it was not loaded.
    done, names = _imported(["rules"])
    assert done.returncode == 0, done.stderr[-2000:]
    assert {"netcheck.catalogue", "rich"} <= _heavy(names)


def test_in_process_help_leaves_sys_modules_light():
    code = (
        "import sys\n"
        "from netcheck.cli import main\n"
        "status = main(['--help'])\n"
        "print(status, ' '.join(sorted(sys.modules)))\n"
    )
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    )
    status, modules = done.stdout.strip().splitlines()[-1].split(" ", 1)
    assert status == "0"
    assert _heavy(set(modules.split())) == set()
