"""The text report's ``--details`` names each machine edit of a fix.

A fix marked verified was applied to a copy of the design and re-checked; the
terminal view says what was applied, one line per edit, as the JSON's
``fix.edits`` does in data.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

from netcheck.fixes.edits import AddComponent, Reconnect, Remove, SetValues, UsePart
from netcheck.report.edit_words import edit_lines, edit_words

ROOT = Path(__file__).resolve().parents[2]


def test_each_edit_kind_in_words() -> None:
    add = AddComponent(
        "diode", "D9", (("part", "fw-1a"),), (("A", "N1"), ("K", "N2")), "K1"
    )
    assert edit_words(add) == "add diode D9 (part=fw-1a): A to N1, K to N2"
    turn = Reconnect("D1", (("A", "0V"), ("K", "N3")))
    assert edit_words(turn) == "reconnect D1: A to 0V, K to N3"
    assert edit_words(UsePart("F2", "fuse-b")) == "use part fuse-b for F2"
    values = SetValues("F2", (("dc_breaking_capacity", "10kA"),))
    assert edit_words(values) == "give F2 the ratings dc_breaking_capacity=10kA"
    assert edit_words(Remove("D3")) == "remove D3"
    assert edit_lines((Remove("D3"),)) == ["    edit: remove D3"]


def test_details_show_the_verified_edits_of_the_battery_sample() -> None:
    # The illustrative 400 V sample: the fuse that cannot break the pack's fault
    # current is given the library's 10 kA fuse, and the fix says it was re-checked.
    run = subprocess.run(
        [
            sys.executable,
            "-m",
            "netcheck",
            "check",
            "sample_nets/battery-400v",
            "--details",
        ],
        cwd=ROOT,
        capture_output=True,
        text=True,
        check=False,
    )
    assert run.returncode == 1, run.stderr
    lines = run.stdout.splitlines()
    fuse = next(i for i, line in enumerate(lines) if "F2: DC breaking capacity" in line)
    fix = next(line for line in lines[fuse:] if line.startswith("    fix: "))
    assert "(verified: applied to a copy of the design, it clears the finding)" in fix
    assert "    edit: use part fuse-hv-16a-10k for F2" in lines[fuse:]
