"""``netcheck fix``: the diff applies, --write fixes the files, check agrees.

End to end on copies of the samples: the printed diff applies with ``patch``
(where installed) and gives the same files as ``--write``; after ``--write``,
``netcheck check`` reports none of the findings the fix command fixed.
"""

from __future__ import annotations

import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from netcheck import cli
from netcheck.fixes.diff import MARK

SAMPLES = Path(__file__).parents[2] / "sample_nets"
NAMES = sorted(p.name for p in SAMPLES.iterdir() if p.is_dir())


def _copy(name: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    work = tmp_path / name
    shutil.copytree(SAMPLES / name, work)
    monkeypatch.chdir(work)
    return work


def _findings(capsys: pytest.CaptureFixture[str]) -> dict[tuple[str, str], dict]:
    cli.main(["check", ".", "--format", "json"])
    data = json.loads(capsys.readouterr().out)
    return {
        (f["rule"], f["element"]): f for f in data["findings"] if f["waived"] is None
    }


FIXED = re.compile(r"^netcheck fix: fixed (\S+) at (\S+)$", re.MULTILINE)


@pytest.mark.parametrize("name", NAMES)
def test_write_then_check_leaves_none_of_the_fixed_findings(
    name: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys
) -> None:  # type: ignore[no-untyped-def]
    _copy(name, tmp_path, monkeypatch)
    before = _findings(capsys)
    verified = {k for k, f in before.items() if f["fix"] and f["fix"]["verified"]}
    status = cli.main(["fix", "--write", "."])
    fixed = set(FIXED.findall(capsys.readouterr().err))
    after = _findings(capsys)
    assert status in (0, 1)
    assert fixed <= verified  # only verified fixes are written
    assert bool(fixed) == bool(verified)  # and at least one is, where any exists
    assert not fixed & set(after), fixed & set(after)
    new_errors = {
        k for k, f in after.items() if f["severity"] == "error" and k not in before
    }
    assert not new_errors


def test_diff_applies_with_patch_and_matches_write(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys
) -> None:  # type: ignore[no-untyped-def]
    work = _copy("machine-24v", tmp_path / "a", monkeypatch)
    assert cli.main(["fix", "."]) == 0
    diff = capsys.readouterr().out
    assert diff.startswith("--- a/") and f"+{MARK}: " in diff
    files = {p.name: p.read_text() for p in work.glob("*.cnet")}
    assert cli.main(["fix", "--write", "."]) == 0
    written = {p.name: p.read_text() for p in work.glob("*.cnet")}
    assert written != files
    if shutil.which("patch") is None:
        pytest.skip("patch is not installed; --write was compared above")
    other = _copy("machine-24v", tmp_path / "b", monkeypatch)
    subprocess.run(["patch", "-p1", "-s"], input=diff, text=True, cwd=other, check=True)
    assert {p.name: p.read_text() for p in other.glob("*.cnet")} == written


def test_fix_input_error_exits_2(tmp_path: Path, monkeypatch, capsys) -> None:  # type: ignore[no-untyped-def]
    monkeypatch.chdir(tmp_path)
    (tmp_path / "bad.cnet").write_text("supply G1 dc=24 +:L+ -:M\n")
    assert cli.main(["fix", "bad.cnet"]) == 2
    assert "bad.cnet:1:" in capsys.readouterr().err


def test_fix_exit_1_when_errors_remain(tmp_path: Path, monkeypatch, capsys) -> None:  # type: ignore[no-untyped-def]
    """A net name typo has no machine fix; a fail-on of info keeps it failing."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "d.cnet").write_text(
        'title "illustrative"\nsupply G1 dc=24V +:L+ -:M\n'
        "load H1 type=lamp R=480ohm 1:L+ 2:m\n"
    )
    assert cli.main(["fix", "d.cnet", "--fail-on", "info"]) == 1
    assert capsys.readouterr().out == ""  # nothing to apply: an empty diff
