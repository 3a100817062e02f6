"""``python -m netcheck`` and the console script end through ``cli.entry``.

It exits without the interpreter's teardown (``os._exit``) once the exit
handlers ran and the standard streams are flushed: the status, the report
file and everything printed must be what ``main`` gives, and a closed pipe
stays quiet.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

from netcheck import cli

ROOT = Path(__file__).resolve().parents[2]
SAMPLE = ROOT / "sample_nets" / "battery-48v"


def _netcheck(*argv: str, **run) -> subprocess.CompletedProcess[bytes]:
    return subprocess.run(
        [sys.executable, "-m", "netcheck", *argv], check=False, cwd=ROOT, **run
    )


def test_exit_status_and_report_file_are_mains(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(ROOT)
    out = tmp_path / "by-entry.json"
    done = _netcheck("check", str(SAMPLE), "--format", "json", "-o", str(out))
    status = cli.main(
        ["check", str(SAMPLE), "--format", "json", "-o", str(tmp_path / "m.json")]
    )
    assert done.returncode == status == 1  # the sample has error findings
    assert out.read_bytes() == (tmp_path / "m.json").read_bytes()


def test_printed_output_is_complete(monkeypatch, capsys):
    monkeypatch.chdir(ROOT)
    done = _netcheck("check", str(SAMPLE), "--format", "sarif", capture_output=True)
    assert cli.main(["check", str(SAMPLE), "--format", "sarif"]) == done.returncode
    assert done.stdout.decode() == capsys.readouterr().out
    assert done.stderr == b""


def test_a_closed_pipe_is_quiet_at_the_module_entry_point():
    reader, writer = os.pipe()
    os.close(reader)
    done = _netcheck("rules", stdout=writer, stderr=subprocess.PIPE)
    os.close(writer)
    assert done.returncode == 1
    assert done.stderr == b""


def test_under_a_profiler_it_exits_the_ordinary_way(tmp_path):
    # cProfile writes its file after the program returns: os._exit would lose it.
    stats = tmp_path / "run.prof"
    done = subprocess.run(
        [
            sys.executable,
            "-m",
            "cProfile",
            "-o",
            str(stats),
            "-m",
            "netcheck",
            "--version",
        ],
        check=False,
        capture_output=True,
        cwd=ROOT,
    )
    assert done.returncode == 0 and stats.stat().st_size > 0
