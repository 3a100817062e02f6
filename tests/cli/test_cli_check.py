"""``netcheck check``: exit codes, formats, selection, discovery (spec cli.md)."""

from __future__ import annotations

import json
import re
import subprocess
import sys

import jsonschema
import pytest

from netcheck import pipeline
from netcheck.cli import inspect as cli_inspect
from netcheck.cli import output
from netcheck.report import CAUTION

ERROR = "# fake: dc-break-over-rating K1:13-14"
WARNING = "# fake: inductive-load-unsuppressed K1:23-24"
INFO = "# fake: single-connection-net N9"


def design(*lines: str) -> str:
    return "\n".join(["supply G1 dc=24V +:L+ -:M", *lines, ""])


# --- exit codes (cli.md: 0 none at/above --fail-on, 1 some, 2 input/usage error)


def test_exit_0_without_findings_at_fail_on(project, capsys):
    project.write("a.cnet", design(WARNING, INFO))
    assert project.run("check", "a.cnet") == 0


def test_exit_1_with_an_error(project):
    project.write("a.cnet", design(ERROR))
    assert project.run("check", "a.cnet") == 1


@pytest.mark.parametrize(
    ("fail_on", "lines", "status"),
    [
        ("warning", (WARNING,), 1),
        ("warning", (INFO,), 0),
        ("info", (INFO,), 1),
        ("never", (ERROR,), 0),
        ("error", (WARNING,), 0),
    ],
)
def test_fail_on(project, fail_on, lines, status):
    project.write("a.cnet", design(*lines))
    assert project.run("check", "a.cnet", "--fail-on", fail_on) == status


def test_waived_finding_does_not_fail(project, capsys):
    project.write("a.cnet", design(ERROR + " waived=rated by test report 17"))
    assert project.run("check", "a.cnet") == 0
    assert "(1 file read, 1 waived)" in capsys.readouterr().out


def test_exit_2_input_error_located_without_traceback(project, capsys):
    project.write("a.cnet", design("BROKEN"))
    assert project.run("check", "a.cnet") == 2
    err = capsys.readouterr().err
    assert err.splitlines()[0] == "a.cnet:2:1: error: expected a statement"
    assert err.splitlines()[1:3] == ["BROKEN", "^"]  # the line and a caret
    assert "Traceback" not in err


def test_input_errors_of_all_files_reported(project, capsys):
    project.write("a.cnet", design("BROKEN"))
    project.write("b.cnet", design(ERROR, "BROKEN"))
    assert project.run("check", ".") == 2
    err = capsys.readouterr().err
    assert "a.cnet:2:1: error" in err and "b.cnet:3:1: error" in err


def test_exit_2_missing_path_named(project, capsys):
    assert project.run("check", "nowhere.cnet") == 2
    assert "nowhere.cnet: error: No such file or directory" in capsys.readouterr().err


def test_exit_2_missing_parts_file_named(project, capsys):
    project.write("a.cnet", design())
    assert project.run("check", "a.cnet", "--parts", "lib.parts.yaml") == 2
    assert "lib.parts.yaml: error: part library not found" in capsys.readouterr().err


def test_exit_2_usage_errors(project, capsys):
    project.write("a.cnet", design())
    assert project.run("check", "a.cnet", "--format", "xml") == 2
    assert project.run("check", "a.cnet", "--bogus") == 2
    assert project.run("check") == 2
    assert project.run("check", "a.cnet", "--jobs", "two") == 2


def test_exit_2_unknown_rule_in_select_with_suggestion(project, capsys):
    project.write("a.cnet", design(ERROR))
    assert project.run("check", "a.cnet", "--select", "dc-break-over-ratin") == 2
    err = capsys.readouterr().err
    assert "unknown rule 'dc-break-over-ratin'" in err
    assert "did you mean 'dc-break-over-rating'" in err
    assert project.run("check", "a.cnet", "--ignore", "nonsense") == 2


def test_empty_directory_is_an_error(project, capsys):
    (project.root / "empty").mkdir()
    assert project.run("check", "empty") == 2
    assert "no .cnet files" in capsys.readouterr().err


def test_os_error_from_pipeline_is_exit_2(project, monkeypatch, capsys):
    project.write("a.cnet", design())

    def unreadable(path, options):
        raise PermissionError(13, "Permission denied", str(path))

    monkeypatch.setattr(pipeline, "check_path", unreadable)
    assert project.run("check", "a.cnet") == 2
    assert capsys.readouterr().err.strip() == "a.cnet: error: Permission denied"


def test_module_entry_point_no_traceback(tmp_path):
    # `python -m netcheck` with a path that does not exist: exit 2, one line.
    done = subprocess.run(
        [sys.executable, "-m", "netcheck", "check", "missing.cnet"],
        cwd=tmp_path,
        capture_output=True,
        text=True,
        check=False,
    )
    assert done.returncode == 2
    assert done.stderr.strip() == "missing.cnet: error: No such file or directory"
    version = subprocess.run(
        [sys.executable, "-m", "netcheck", "--version"],
        capture_output=True,
        text=True,
        check=False,
    )
    assert version.returncode == 0 and version.stdout.startswith("netcheck ")


# --- text output when piped (cli.md: one finding a line)


def test_piped_text_format(project, capsys):
    project.write("a.cnet", design(INFO, ERROR, "# element: K1:13-14 verified"))
    project.run("check", "a.cnet")
    lines = capsys.readouterr().out.splitlines()
    assert re.fullmatch(r"a\.cnet:2:1: info: .+ \[single-connection-net\]", lines[0])
    assert re.fullmatch(r"a\.cnet:3:1: error: .+ \[dc-break-over-rating\]", lines[1])
    assert lines[2] == "2 findings: 1 error, 0 warnings, 1 info (1 file read)"
    assert lines[3] == "by rule: dc-break-over-rating 1, single-connection-net 1"
    assert lines[4] == "switching elements: 1 verified"
    assert lines[5] == f"note: {CAUTION}"
    assert len(lines) == 6


def test_paths_relative_to_cwd_with_posix_separators(project, capsys):
    project.write("sub/dir/a.cnet", design(ERROR))
    project.run("check", str(project.root / "sub"))
    assert capsys.readouterr().out.startswith("sub/dir/a.cnet:2:1: error:")


# --- terminal view and colour (cli.md: --no-color and NO_COLOR)


@pytest.fixture
def tty(monkeypatch):
    monkeypatch.setattr(output, "stdout_is_terminal", lambda: True)
    monkeypatch.setenv("COLUMNS", "100")


def test_terminal_view_in_colour(project, capsys, tty):
    project.write("a.cnet", design(ERROR))
    project.run("check", "a.cnet")
    out = capsys.readouterr().out
    assert "\x1b[" in out
    assert "fix: " in out and "K1:13-14" in out


def test_no_color_env(project, capsys, tty, monkeypatch):
    project.write("a.cnet", design(ERROR))
    monkeypatch.setenv("NO_COLOR", "1")
    project.run("check", "a.cnet")
    out = capsys.readouterr().out
    assert "\x1b[" not in out
    assert "values: current = 2.5 A" in out  # still the grouped terminal view


def test_no_color_option(project, capsys, tty):
    project.write("a.cnet", design(ERROR))
    project.run("check", "a.cnet", "--no-color")
    assert "\x1b[" not in capsys.readouterr().out


def test_output_file_is_never_the_terminal_view(project, tty):
    project.write("a.cnet", design(ERROR))
    project.run("check", "a.cnet", "-o", "report.txt")
    text = (project.root / "report.txt").read_text()
    assert text.startswith("a.cnet:2:1: error:") and "\x1b[" not in text


# --- JSON and SARIF through the command line


def test_json_byte_identical_between_runs_and_jobs(project):
    project.write("b.cnet", design(ERROR, INFO))
    project.write("a/x.cnet", design(WARNING))
    project.write("a/y.cnet", design(ERROR + " waived=accepted"))
    project.run("check", ".", "--format", "json", "-o", "one.json")
    project.run("check", ".", "--format", "json", "-o", "two.json")
    project.run("check", ".", "--format", "json", "-o", "par.json", "--jobs", "3")
    one = (project.root / "one.json").read_bytes()
    assert one == (project.root / "two.json").read_bytes()
    assert one == (project.root / "par.json").read_bytes()
    document = json.loads(one)
    assert [f["file"] for f in document["findings"]] == [
        "a/x.cnet",
        "a/y.cnet",
        "b.cnet",
        "b.cnet",
    ]
    assert str(project.root) not in one.decode()  # no absolute paths


def test_json_to_stdout(project, capsys):
    project.write("a.cnet", design(ERROR))
    assert project.run("check", "a.cnet", "--format", "json") == 1
    document = json.loads(capsys.readouterr().out)
    assert document["format"] == "netcheck-findings/1"
    assert document["files"] == ["a.cnet"]


def test_sarif_valid(project, capsys, sarif_schema):
    project.write("a.cnet", design(ERROR, WARNING, INFO + " waived=spare terminal"))
    project.run("check", "a.cnet", "--format", "sarif")
    document = json.loads(capsys.readouterr().out)
    validator = jsonschema.validators.validator_for(sarif_schema)
    validator(sarif_schema).validate(document)
    results = document["runs"][0]["results"]
    assert [r["ruleId"] for r in results] == [
        "dc-break-over-rating",
        "inductive-load-unsuppressed",
        "single-connection-net",
    ]


# --- selection


def test_select_and_ignore_comma_separated_or_repeated(project, capsys):
    project.write("a.cnet", design(ERROR, WARNING, INFO))
    project.run(
        "check",
        "a.cnet",
        "--format",
        "json",
        "--select",
        "dc-break-over-rating,single-connection-net",
    )
    rules = {f["rule"] for f in json.loads(capsys.readouterr().out)["findings"]}
    assert rules == {"dc-break-over-rating", "single-connection-net"}
    project.run(
        "check",
        "a.cnet",
        "--format",
        "json",
        "--ignore",
        "dc-break-over-rating",
        "--ignore",
        "single-connection-net",
    )
    rules = {f["rule"] for f in json.loads(capsys.readouterr().out)["findings"]}
    assert rules == {"inductive-load-unsuppressed"}


def test_ignoring_the_error_changes_the_exit_status(project):
    project.write("a.cnet", design(ERROR))
    assert project.run("check", "a.cnet", "--ignore", "dc-break-over-rating") == 0


def test_alias_accepted_in_select(project, capsys):
    project.write("a.cnet", design(ERROR, WARNING))
    project.run("check", "a.cnet", "--select", "unsuppressed-inductive-load")
    assert "[inductive-load-unsuppressed]" in capsys.readouterr().out


# --- options passed to the pipeline


def test_options_reach_the_pipeline(project):
    project.write("a.cnet", design())
    project.write("lib.parts.yaml", "parts: []\n")
    project.run("check", "a.cnet", "--parts", "lib.parts.yaml", "--allow-outside")
    ((_, options),) = project.calls
    assert [p.as_posix() for p in options.extra_parts] == ["lib.parts.yaml"]
    assert options.allow_outside is True


# --- directories: every .cnet that no other file includes


def test_directory_skips_included_sheets_and_hidden_dirs(project):
    project.write("plant/top.cnet", design('include "sheets/s2.cnet"'))
    project.write("plant/sheets/s2.cnet", design('include "s3.cnet"'))
    project.write("plant/sheets/s3.cnet", design())
    project.write("plant/other.cnet", design())
    project.write("plant/.cache/old.cnet", design())
    project.run("check", "plant")
    assert [c[0] for c in project.calls] == ["plant/other.cnet", "plant/top.cnet"]


def test_included_file_given_explicitly_with_its_includer(project):
    project.write("top.cnet", design('include "s2.cnet"'))
    project.write("s2.cnet", design())
    project.run("check", "s2.cnet", "top.cnet", "top.cnet")
    assert [c[0] for c in project.calls] == ["top.cnet"]


def test_sheet_given_alone_is_checked(project):
    project.write("top.cnet", design('include "s2.cnet"'))
    project.write("s2.cnet", design())
    project.run("check", "s2.cnet")
    assert [c[0] for c in project.calls] == ["s2.cnet"]


def test_include_cycle_is_still_checked_once(project):
    project.write("a.cnet", design('include "b.cnet"'))
    project.write("b.cnet", design('include "a.cnet"'))
    project.run("check", ".")
    assert [c[0] for c in project.calls] == ["a.cnet"]


# --- other commands


def test_rules_and_explain(project, capsys):
    assert project.run("rules") == 0
    assert "suppressor-underrated" in capsys.readouterr().out
    assert project.run("explain", "suppressor-underrated") == 0
    assert "diode-reverse-voltage: 2" in capsys.readouterr().out


def test_explain_unknown_suggests(project, capsys):
    assert project.run("explain", "suppresor-underrated") == 2
    err = capsys.readouterr().err
    assert (
        "unknown rule 'suppresor-underrated'; did you mean 'suppressor-underrated'?"
        in err
    )


def test_inspect_takes_settings_not_args(project, monkeypatch):
    # inspect gets one settings object: the file, the merged netcheck.yaml
    # options, the format and whether to colour (no argparse namespace).
    project.write("a.cnet", design())
    project.write("netcheck.yaml", "margins: {diode-reverse-voltage: 3}\n")
    seen = []
    monkeypatch.setattr(
        cli_inspect, "inspect_text", lambda settings: seen.append(settings) or ""
    )
    assert project.run("inspect", "a.cnet", "--format", "json") == 0
    (settings,) = seen
    assert isinstance(settings, cli_inspect.InspectSettings)
    assert settings.file.as_posix() == "a.cnet" and settings.format == "json"
    assert settings.options.margins == {"diode-reverse-voltage": 3.0}
    assert settings.color is False


def test_help_exits_0(project, capsys):
    assert project.run("--help") == 0
    assert project.run("check", "--help") == 0
