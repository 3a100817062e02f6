"""The COMMANDS table and the entry point: one module plus one row is a command."""

from __future__ import annotations

import json
import os
import subprocess
import sys
import types

from netcheck import cli
from netcheck.cli import commands
from netcheck.cli.formats import FORMATS, Format

ERROR = "# fake: dc-break-over-rating K1:13-14"
WARNING = "# fake: inductive-load-unsuppressed K1:23-24"


def test_a_toy_command_is_one_module_and_one_row(monkeypatch, capsys, tmp_path):
    module = types.ModuleType("netcheck.cli.toy")

    def add_options(parser):
        parser.add_argument("word")
        parser.add_argument("-o", "--output")

    def greet(args, out):
        out.write(f"hello {args.word} Ω\n")
        return 0

    module.add_options, module.greet = add_options, greet
    monkeypatch.setitem(sys.modules, "netcheck.cli.toy", module)
    row = commands.Command("toy", "toy", "greet", "say hello")
    monkeypatch.setattr(cli, "COMMANDS", (*cli.COMMANDS, row))
    assert cli.main(["toy", "world"]) == 0
    assert capsys.readouterr().out == "hello world Ω\n"
    # The funnel's -o comes with it.
    assert cli.main(["toy", "x", "-o", str(tmp_path / "t.txt")]) == 0
    assert (tmp_path / "t.txt").read_text(encoding="utf-8") == "hello x Ω\n"


def test_a_toy_format_is_one_row(project, monkeypatch, capsys):
    module = types.ModuleType("toyformat")
    module.render = lambda report, catalogue: f"{len(report.findings)} findings\n"
    monkeypatch.setitem(sys.modules, "toyformat", module)
    monkeypatch.setitem(FORMATS, "toy", Format("toyformat", "render"))
    # --format's choices are read from FORMATS when the parser is built.
    project.write("a.cnet", "\n".join(["supply G1 dc=24V +:L+ -:M", ERROR, ""]))
    assert project.run("check", "a.cnet", "--format", "toy") == 1
    assert capsys.readouterr().out == "1 findings\n"


def test_every_row_names_a_real_function():
    for row in cli.COMMANDS:
        module = row.load()
        assert callable(getattr(module, row.function)), row
        assert callable(module.add_options), row


def test_stale_entries_are_judged_before_select(project, capsys):
    # A baseline of two findings, then a run narrowed to one rule: the other
    # entry is not stale (its finding is still there, only not selected).
    project.write("a.cnet", "\n".join(["supply G1 dc=24V +:L+ -:M", ERROR, WARNING]))
    assert project.run("baseline", "a.cnet", "-o", "base.json") == 0
    capsys.readouterr()
    argv = ["check", "a.cnet", "--baseline", "base.json", "--format", "json"]
    assert project.run(*argv, "--select", "dc-break-over-rating") == 0
    document = json.loads(capsys.readouterr().out)
    assert document["stale_baseline"] == []
    assert document["summary"]["baseline_suppressed"] == 1
    # Once the finding is gone from the design, its entry is stale.
    project.write("a.cnet", "\n".join(["supply G1 dc=24V +:L+ -:M", ERROR]))
    assert project.run(*argv, "--select", "dc-break-over-rating") == 0
    stale = json.loads(capsys.readouterr().out)["stale_baseline"]
    assert [e["rule"] for e in stale] == ["inductive-load-unsuppressed"]


class ClosedPipe:
    """A stdout whose reader has gone away."""

    encoding = "utf-8"

    def write(self, text):
        raise BrokenPipeError(32, "Broken pipe")

    def flush(self):
        pass


def test_broken_pipe_in_process_leaves_fd_1_alone(project, monkeypatch):
    # Called with argv (tests, embedding), a closed pipe is exit 1 and the
    # process's real standard output is not replaced by the null device.
    before = os.fstat(1)
    monkeypatch.setattr(sys, "stdout", ClosedPipe())
    assert cli.main(["rules"]) == 1
    after = os.fstat(1)
    assert (after.st_dev, after.st_ino) == (before.st_dev, before.st_ino)


def test_broken_pipe_at_the_real_entry_point_is_quiet():
    # `netcheck rules | head -1`: the reader closes early; no traceback and no
    # "Exception ignored" from the interpreter's final flush.
    code = (
        "import sys\n"
        "from netcheck.cli import main\n"
        "sys.argv = ['netcheck', 'rules']\n"
        "raise SystemExit(main())\n"
    )
    reader, writer = os.pipe()
    os.close(reader)
    done = subprocess.run(
        [sys.executable, "-c", code],
        stdout=writer,
        stderr=subprocess.PIPE,
        check=False,
    )
    os.close(writer)
    assert done.returncode == 1
    assert done.stderr == b""
