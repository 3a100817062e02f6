"""The output funnel: encoding, colour and ``-o FILE`` the same for every command."""

from __future__ import annotations

import io
import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from netcheck import cli
from netcheck.cli import output
from netcheck.cli.output import encodable
from netcheck.schema import load_schema, schema_names

CASE = Path(__file__).parents[1] / "cases" / "inductive-load-unsuppressed"
DESIGN = CASE / "bad-coil-no-suppression.cnet"  # 640 ohm coil: prints Ω and µJ
SIZE = ["size", "--voltage", "110V", "--resistance", "440ohm", "--inductance", "2.1H"]

# Every command that prints something, with arguments that make it print.
PRINTING = {
    "check": ["check", str(DESIGN), "--fail-on", "never"],
    "inspect": ["inspect", str(DESIGN)],
    "size": SIZE,
    "rules": ["rules"],
    "explain": ["explain", "inductive-load-unsuppressed"],
    "schema": ["schema", "config"],
    "fix": ["fix", str(DESIGN)],
}


def test_every_printing_command_is_covered():
    assert set(PRINTING) | {"baseline"} == {c.name for c in cli.COMMANDS}


def _run(argv, encoding, **env):
    return subprocess.run(
        [sys.executable, "-m", "netcheck", *argv],
        capture_output=True,
        env={**os.environ, "PYTHONIOENCODING": encoding, **env},
        check=False,
    )


class NarrowStream(io.TextIOWrapper):
    """A standard stream whose encoding is ``encoding`` (strict, like a console)."""

    def __init__(self, encoding: str) -> None:
        super().__init__(io.BytesIO(), encoding=encoding, errors="strict")

    def text(self) -> str:
        self.flush()
        return self.buffer.getvalue().decode(self.encoding)


@pytest.mark.parametrize("encoding", ["ascii", "cp1252"])
@pytest.mark.parametrize("command", ["inspect", "size", "check"])
def test_narrow_stdout_never_crashes(command, encoding, monkeypatch):
    stdout, stderr = NarrowStream(encoding), NarrowStream(encoding)
    monkeypatch.setattr(sys, "stdout", stdout)
    monkeypatch.setattr(sys, "stderr", stderr)
    assert cli.main(PRINTING[command]) in (0, 1)
    text = stdout.text()
    assert text.strip() and stderr.text() == ""
    if encoding == "ascii" and command != "check":
        assert "uJ" in text or "ohm" in text  # spelled, not dropped


def test_ascii_console_end_to_end():
    # The real interpreter with an ASCII stdout (PYTHONIOENCODING), as on an old
    # console: Ω is spelled, nothing crashes.
    done = _run(SIZE, "ascii")
    assert done.returncode == 0 and done.stderr == b""
    assert "440 ohm" in done.stdout.decode("ascii")


def test_spellings_only_where_needed():
    # cp1252 holds µ (0xB5) but not Ω: only Ω is spelled out.
    assert encodable("440 Ω, 2 µH, 30 °C", "cp1252") == "440 ohm, 2 µH, 30 °C"
    assert encodable("440 Ω, 2 µH, 30 °C", "ascii") == "440 ohm, 2 uH, 30 degC"
    assert encodable("½·L·I² ≥ 5 J", "ascii") == "1/2*L*I^2 >= 5 J"
    assert encodable("┏━┳┓ ┃", "ascii") == "+-++ |"
    assert encodable("日本", "ascii") == "??"
    assert encodable("440 Ω", "utf-8") == "440 Ω"


def test_input_error_on_a_narrow_stderr(tmp_path):
    # An error excerpt quoting a line with Ω must not crash stderr either.
    bad = tmp_path / "bad.cnet"
    bad.write_text("supply G1 dc=24V +:L+ -:M\nresistor R1 r=48Ω 1:L+ 2:\n")
    stderr = NarrowStream("ascii")
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(sys, "stderr", stderr)
        assert cli.main(["check", str(bad)]) == 2
    err = stderr.text()
    assert "error:" in err and "48ohm" in err


@pytest.mark.parametrize("command", sorted(PRINTING))
def test_dash_o_writes_what_stdout_shows(command, tmp_path, monkeypatch, capsys):
    monkeypatch.delenv("NO_COLOR", raising=False)
    assert cli.main(PRINTING[command]) in (0, 1)
    shown = capsys.readouterr().out
    target = tmp_path / "out.txt"
    assert cli.main([*PRINTING[command], "-o", str(target)]) in (0, 1)
    assert capsys.readouterr().out == ""
    assert target.read_text(encoding="utf-8") == shown
    assert [p.name for p in tmp_path.iterdir()] == ["out.txt"]  # no temporary left


@pytest.mark.parametrize("command", ["inspect", "size", "rules"])
def test_colour_on_a_terminal_unless_refused(command, monkeypatch, capsys, tmp_path):
    monkeypatch.setattr(output, "stdout_is_terminal", lambda: True)
    monkeypatch.delenv("NO_COLOR", raising=False)
    cli.main(PRINTING[command])
    assert "\x1b[" in capsys.readouterr().out
    cli.main([*PRINTING[command], "--no-color"])
    assert "\x1b[" not in capsys.readouterr().out
    monkeypatch.setenv("NO_COLOR", "1")
    cli.main(PRINTING[command])
    assert "\x1b[" not in capsys.readouterr().out
    cli.main([*PRINTING[command], "-o", str(tmp_path / "x")])
    assert "\x1b[" not in (tmp_path / "x").read_text(encoding="utf-8")


# --- netcheck schema


def test_schema_lists_every_shipped_schema(capsys):
    assert cli.main(["schema"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert [line.split()[0] for line in lines] == list(schema_names())
    for line, name in zip(lines, schema_names(), strict=True):
        assert load_schema(name)["$id"] in line


@pytest.mark.parametrize("name", schema_names())
def test_schema_prints_the_shipped_text(name, capsys):
    assert cli.main(["schema", name]) == 0
    assert json.loads(capsys.readouterr().out) == load_schema(name)


def test_schema_unknown_name_suggests(capsys):
    assert cli.main(["schema", "confg"]) == 2
    captured = capsys.readouterr()
    assert captured.out == ""
    assert "no schema 'confg'; did you mean 'config'?" in captured.err
