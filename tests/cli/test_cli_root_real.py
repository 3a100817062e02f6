"""The project root with the real pipeline: a baseline holds across working dirs."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

from netcheck import cli

CASE = Path(__file__).parents[1] / "cases" / "inductive-load-unsuppressed"


def test_baseline_from_top_matches_inside_drawings(tmp_path, monkeypatch, capsys):
    (tmp_path / ".git").mkdir()
    shutil.copytree(CASE, tmp_path / "drawings")
    monkeypatch.chdir(tmp_path)
    assert cli.main(["baseline", "drawings", "-o", "base.json"]) == 0
    written = json.loads((tmp_path / "base.json").read_text())["fingerprints"]
    assert written  # the case has findings, so the match below means something
    monkeypatch.chdir(tmp_path / "drawings")
    capsys.readouterr()
    args = ["check", ".", "--baseline", "../base.json", "--format", "json"]
    assert cli.main(args) == 0
    document = json.loads(capsys.readouterr().out)
    assert document["findings"] == []
    assert document["summary"]["baseline_suppressed"] == len(written)
    assert document["stale_baseline"] == []
