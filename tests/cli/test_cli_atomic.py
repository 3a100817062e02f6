"""Atomic writes: the old file or the complete new one, never a partial file."""

from __future__ import annotations

import os

import pytest

from netcheck import atomic
from netcheck.atomic import write_text_atomic


def leftovers(directory):
    return sorted(p.name for p in directory.iterdir() if p.name.endswith(".tmp"))


def test_writes_and_replaces(tmp_path):
    target = tmp_path / "report.json"
    write_text_atomic(target, "one\n")
    target.chmod(0o640)
    write_text_atomic(target, "two µ\n")
    assert target.read_text(encoding="utf-8") == "two µ\n"
    assert target.stat().st_mode & 0o777 == 0o640  # mode kept
    assert leftovers(tmp_path) == []


def test_failed_rename_keeps_old_file_and_removes_temp(tmp_path, monkeypatch):
    target = tmp_path / "report.json"
    target.write_text("old\n")

    def refuse(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(atomic.os, "replace", refuse)
    with pytest.raises(OSError):
        write_text_atomic(target, "new\n" * 1000)
    assert target.read_text() == "old\n"
    assert leftovers(tmp_path) == []


def test_failed_write_leaves_no_file(tmp_path, monkeypatch):
    target = tmp_path / "new.sarif"

    def broken_sync(fd):
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(atomic.os, "fsync", broken_sync)
    with pytest.raises(OSError):
        write_text_atomic(target, "{}")
    assert not target.exists()
    assert leftovers(tmp_path) == []


def test_cli_output_failure_is_exit_2_without_partial_file(
    project, monkeypatch, capsys
):
    project.write("a.cnet", "# fake: dc-break-over-rating K1:13-14\n")
    monkeypatch.setattr(
        atomic.os,
        "replace",
        lambda s, d: (_ for _ in ()).throw(PermissionError(13, "Permission denied", d)),
    )
    assert project.run("check", "a.cnet", "-o", "out.json", "--format", "json") == 2
    assert "out.json: error: Permission denied" in capsys.readouterr().err
    assert not (project.root / "out.json").exists()
    assert leftovers(project.root) == []


def test_cli_output_into_missing_directory(project, capsys):
    project.write("a.cnet", "\n")
    assert project.run("check", "a.cnet", "-o", "no/such/dir/out.txt") == 2
    assert "error: No such file or directory" in capsys.readouterr().err


def test_relative_name_in_working_directory(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    write_text_atomic("plain.txt", "x")
    assert (tmp_path / "plain.txt").read_text() == "x"
    assert os.listdir(tmp_path) == ["plain.txt"]


def test_pieces_are_written_in_order(tmp_path):
    target = tmp_path / "report.json"
    atomic.write_atomic(target, lambda write: [write(p) for p in ("a", "µ", "\n", "b")])
    assert target.read_bytes() == "aµ\nb".encode()
    assert leftovers(tmp_path) == []


def test_a_producer_failing_midway_leaves_the_old_file_and_no_temp(tmp_path):
    target = tmp_path / "report.json"
    target.write_text("old\n")

    def produce(write):
        write("{\n" * 100_000)  # more than one buffer: some of it reached the disk
        raise RuntimeError("writer broke")

    with pytest.raises(RuntimeError):
        atomic.write_atomic(target, produce)
    assert target.read_text() == "old\n"
    assert leftovers(tmp_path) == []


def test_a_producer_failing_midway_makes_no_new_file(tmp_path):
    target = tmp_path / "new.json"

    def produce(write):
        write("partial")
        raise OSError(28, "No space left on device")

    with pytest.raises(OSError):
        atomic.write_atomic(target, produce)
    assert not target.exists()
    assert leftovers(tmp_path) == []


def test_cli_report_file_is_the_stdout_report(project, capsys):
    project.write("a.cnet", "# fake: dc-break-over-rating K1:13-14\n")
    for form in ("json", "sarif", "text"):
        project.run("check", "a.cnet", "--format", form)
        shown = capsys.readouterr().out
        project.run("check", "a.cnet", "--format", form, "-o", f"out.{form}")
        written = (project.root / f"out.{form}").read_text(encoding="utf-8")
        assert written == shown and shown.endswith("\n")
