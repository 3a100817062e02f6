"""``python -m pytest -q`` ends with its "N passed" line (CI reads that line).

A ``-q`` in the project's pytest ``addopts`` plus the ``-q`` people and CI type
makes ``-qq``, which drops the closing summary line of a passing run.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

PYPROJECT = Path(__file__).resolve().parents[1] / "pyproject.toml"


def test_quiet_run_ends_with_the_summary_line(tmp_path):
    (tmp_path / "test_one.py").write_text("def test_one():\n    assert 1 + 1 == 2\n")
    done = subprocess.run(
        [
            sys.executable,
            "-m",
            "pytest",
            "-q",
            "-c",
            str(PYPROJECT),
            "--rootdir",
            str(tmp_path),
            "-p",
            "no:cacheprovider",
            str(tmp_path / "test_one.py"),
        ],
        capture_output=True,
        text=True,
        check=False,
    )
    assert done.returncode == 0, done.stdout + done.stderr
    assert done.stdout.strip().splitlines()[-1].startswith("1 passed")
