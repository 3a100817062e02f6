"""One project root for shown paths, SARIF URIs and fingerprints (cli.md, baselines).

A baseline made in one working directory must match from another: paths are
relative to the folder of the netcheck.yaml in use, else the git top level,
else the checked path, never to the working directory.
"""

from __future__ import annotations

import json

from netcheck.session import project_root

ERROR = "# fake: dc-break-over-rating K1:13-14"
WARNING = "# fake: inductive-load-unsuppressed K1:23-24"


def _drawings(project):
    project.write("drawings/a.cnet", ERROR + "\n" + WARNING + "\n")
    project.write("drawings/sub/b.cnet", ERROR + "\n")


def test_baseline_made_at_top_matches_from_a_subfolder(project, capsys, monkeypatch):
    _drawings(project)
    assert project.run("baseline", "drawings", "-o", "base.json") == 0
    capsys.readouterr()
    files = [
        e["file"]
        for e in json.loads(project.root.joinpath("base.json").read_text())[
            "fingerprints"
        ]
    ]
    assert sorted(set(files)) == ["drawings/a.cnet", "drawings/sub/b.cnet"]
    monkeypatch.chdir(project.root / "drawings")
    assert (
        project.run("check", ".", "--baseline", "../base.json", "--format", "json") == 0
    )
    document = json.loads(capsys.readouterr().out)
    assert document["findings"] == []
    assert document["summary"]["baseline_suppressed"] == 3
    assert document["stale_baseline"] == []
    assert document["files"] == ["drawings/a.cnet", "drawings/sub/b.cnet"]


def test_baseline_made_in_a_subfolder_matches_from_the_top(
    project, capsys, monkeypatch
):
    _drawings(project)
    monkeypatch.chdir(project.root / "drawings" / "sub")
    assert project.run("baseline", "..", "-o", "../../base.json") == 0
    monkeypatch.chdir(project.root)
    capsys.readouterr()
    assert project.run("check", "drawings", "--baseline", "base.json") == 0
    out = capsys.readouterr().out.splitlines()
    assert out[0] == "no findings (2 files read, 3 in the baseline)"


def test_sarif_uris_relative_to_config_folder(project, capsys, monkeypatch):
    _drawings(project)
    project.write("drawings/netcheck.yaml", "fail-on: never\n")
    monkeypatch.chdir(project.root / "drawings" / "sub")
    assert project.run("check", "b.cnet", "--format", "sarif") == 0
    sarif = json.loads(capsys.readouterr().out)
    (result,) = sarif["runs"][0]["results"]
    location = result["locations"][0]["physicalLocation"]["artifactLocation"]
    assert location["uri"] == "sub/b.cnet"


def test_stale_entries_reported(project, capsys):
    _drawings(project)
    assert project.run("baseline", "drawings", "-o", "base.json") == 0
    # The warning is fixed: its baseline entry no longer matches anything.
    project.write("drawings/a.cnet", ERROR + "\n")
    capsys.readouterr()
    assert project.run("check", "drawings", "--baseline", "base.json") == 0
    out = capsys.readouterr().out.splitlines()
    assert out[0].startswith(
        "drawings/a.cnet: note: baseline entry matches no current finding: "
        "inductive-load-unsuppressed K1:23-24 ["
    )
    assert (
        out[1]
        == "no findings (2 files read, 2 in the baseline, 1 stale in the baseline)"
    )
    assert (
        project.run("check", "drawings", "--baseline", "base.json", "--format", "json")
        == 0
    )
    document = json.loads(capsys.readouterr().out)
    (stale,) = document["stale_baseline"]
    assert (stale["rule"], stale["element"], stale["file"]) == (
        "inductive-load-unsuppressed",
        "K1:23-24",
        "drawings/a.cnet",
    )
    assert document["summary"]["baseline_stale"] == 1


def test_project_root_order(tmp_path):
    (tmp_path / "top" / ".git").mkdir(parents=True)
    design = tmp_path / "top" / "a" / "b" / "x.cnet"
    design.parent.mkdir(parents=True)
    design.write_text("\n")
    # No netcheck.yaml: the git top level.
    assert project_root([design]) == (tmp_path / "top").resolve()
    # The nearest netcheck.yaml wins over the git top level.
    (tmp_path / "top" / "a" / "netcheck.yaml").write_text("\n")
    assert project_root([design]) == (tmp_path / "top" / "a").resolve()
    # An explicit config: its folder.
    assert project_root([design], tmp_path / "c.yaml") == tmp_path.resolve()


def test_project_root_without_config_or_git(tmp_path):
    design = tmp_path / "x.cnet"
    design.write_text("\n")
    # tmp_path is not inside a repository here only if no .git is above it.
    if not any((p / ".git").exists() for p in (tmp_path, *tmp_path.parents)):
        assert project_root([design]) == tmp_path.resolve()
        assert project_root([tmp_path]) == tmp_path.resolve()


def test_rerunning_baseline_refreshes_it(project, capsys):
    # Refreshing a baseline is writing it again: only current findings remain.
    _drawings(project)
    assert project.run("baseline", "drawings", "-o", "base.json") == 0
    project.write("drawings/a.cnet", ERROR + "\n")
    assert project.run("baseline", "drawings", "-o", "base.json") == 0
    capsys.readouterr()
    assert project.run("check", "drawings", "--baseline", "base.json") == 0
    out = capsys.readouterr().out.splitlines()
    assert out[0] == "no findings (2 files read, 2 in the baseline)"
