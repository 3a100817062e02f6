"""netcheck.yaml: keys, types, located errors, merging with options (cli.md)."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from report_samples import make_catalogue

from netcheck.config import Config, find_config, load_config
from netcheck.errors import ConfigError
from netcheck.findings import Severity

WARNING = "# fake: inductive-load-unsuppressed K1:23-24"
ERROR = "# fake: dc-break-over-rating K1:13-14"


def load(tmp_path: Path, text: str, name: str = "netcheck.yaml") -> Config:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return load_config(path, make_catalogue())


def error_of(tmp_path: Path, text: str) -> ConfigError:
    with pytest.raises(ConfigError) as caught:
        load(tmp_path, text)
    return caught.value


def test_every_key(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "parts").mkdir()
    (tmp_path / "parts" / "company.parts.yaml").write_text("parts: []\n")
    (tmp_path / "base.json").write_text("{}")
    config = load(
        tmp_path,
        """\
fail-on: warning
select: [dc-break-over-rating, unsuppressed-inductive-load]
ignore: [single-connection-net]
severity: {inductive-load-unsuppressed: error}
parts: [parts/company.parts.yaml]
margins: {diode-reverse-voltage: 2.5}
baseline: base.json
""",
    )
    assert config.fail_on == "warning"
    assert config.select == ("dc-break-over-rating", "inductive-load-unsuppressed")
    assert config.ignore == ("single-connection-net",)
    assert config.severity == {"inductive-load-unsuppressed": Severity.ERROR}
    assert [p.as_posix() for p in config.parts] == ["parts/company.parts.yaml"]
    assert config.margins == {"diode-reverse-voltage": 2.5}
    assert config.baseline == Path("base.json")


def test_empty_file_is_all_defaults(tmp_path):
    assert load(tmp_path, "# nothing set\n").fail_on is None


def test_unknown_key_named_with_position(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    err = error_of(tmp_path, "fail-on: error\nignroe: [single-connection-net]\n")
    assert (
        "unknown key 'ignroe'" in err.message and "did you mean 'ignore'" in err.message
    )
    assert (err.span.file, err.span.line, err.span.column) == ("netcheck.yaml", 2, 1)
    assert (
        err.render().splitlines()[0].startswith("netcheck.yaml:2:1: error: unknown key")
    )


@pytest.mark.parametrize(
    ("text", "fragment", "line", "column"),
    [
        ("fail-on: sometimes\n", "'fail-on' must be one of", 1, 1),
        ("ignore: {a: b}\n", "'ignore' must be a list", 1, 1),
        (
            "ignore:\n  - single-connection-net\n  - no-such-rule\n",
            "unknown rule 'no-such-rule'",
            3,
            5,
        ),
        ("ignore: [3]\n", "expected a rule name", 1, 10),
        (
            "select: [single-conection-net]\n",
            "did you mean 'single-connection-net'",
            1,
            10,
        ),
        ("severity: [error]\n", "'severity' must be a mapping", 1, 1),
        ("severity:\n  not-a-rule: error\n", "unknown rule 'not-a-rule'", 2, 3),
        (
            "severity:\n  single-connection-net: fatal\n",
            "severity must be one of",
            2,
            3,
        ),
        (
            "margins:\n  diode-reverse-voltag: 2\n",
            "unknown margin 'diode-reverse-voltag'",
            2,
            3,
        ),
        ("margins:\n  diode-reverse-voltage: two\n", "must be a number", 2, 3),
        ("margins:\n  diode-reverse-voltage: -1\n", "positive number", 2, 3),
        ("margins:\n  diode-reverse-voltage: true\n", "must be a number", 2, 3),
        ("parts: [missing.parts.yaml]\n", "part library not found", 1, 9),
        ("parts: 7\n", "'parts' must be a list", 1, 1),
        ("baseline: nowhere.json\n", "baseline not found", 1, 1),
        ("- just\n- a list\n", "must be a mapping of keys", 1, 1),
        ("fail-on: [error\n", "invalid YAML", 2, 1),
        ("ignore: []\nignore: []\n", "duplicate key", 2, 1),
    ],
)
def test_config_errors_are_located(tmp_path, monkeypatch, text, fragment, line, column):
    monkeypatch.chdir(tmp_path)
    err = error_of(tmp_path, text)
    assert fragment in err.message
    assert (err.span.line, err.span.column) == (line, column)


def test_find_config_nearest_parent_stops_at_repository(tmp_path):
    (tmp_path / "netcheck.yaml").write_text("")
    repo = tmp_path / "repo"
    (repo / ".git").mkdir(parents=True)
    (repo / "a" / "b").mkdir(parents=True)
    assert find_config(repo / "a" / "b" / "x.cnet") is None  # outer file not used
    (repo / "netcheck.yaml").write_text("")
    assert (
        find_config(repo / "a" / "b" / "x.cnet") == (repo / "netcheck.yaml").resolve()
    )
    (repo / "a" / "netcheck.yaml").write_text("")
    assert find_config(repo / "a" / "b") == (repo / "a" / "netcheck.yaml").resolve()


# --- through the command line


def test_severity_override_changes_exit_status_and_output(project, capsys):
    project.write("netcheck.yaml", "severity: {inductive-load-unsuppressed: error}\n")
    project.write("a.cnet", WARNING + "\n")
    assert project.run("check", "a.cnet", "--format", "json") == 1
    (found,) = json.loads(capsys.readouterr().out)["findings"]
    assert found["severity"] == "error"


def test_severity_lowered(project):
    project.write("netcheck.yaml", "severity: {dc-break-over-rating: info}\n")
    project.write("a.cnet", ERROR + "\n")
    assert project.run("check", "a.cnet") == 0


def test_config_found_per_file(project, capsys):
    project.write("strict/netcheck.yaml", "fail-on: warning\n")
    project.write("strict/a.cnet", WARNING + "\n")
    project.write("lax/a.cnet", WARNING + "\n")
    assert project.run("check", "lax") == 0
    assert project.run("check", "strict") == 1
    assert project.run("check", "lax", "strict") == 1


def test_command_line_fail_on_wins(project):
    project.write("netcheck.yaml", "fail-on: warning\n")
    project.write("a.cnet", WARNING + "\n")
    assert project.run("check", "a.cnet", "--fail-on", "error") == 0


def test_explicit_config_and_margins_and_parts(project):
    project.write(
        "conf/ci.yaml",
        "margins: {diode-reverse-voltage: 3}\n"
        "parts: [lib/a.parts.yaml]\nignore: [single-connection-net]\n",
    )
    project.write("conf/lib/a.parts.yaml", "parts: []\n")
    project.write("extra.parts.yaml", "parts: []\n")
    project.write("d/a.cnet", "\n")
    assert (
        project.run(
            "check",
            "d/a.cnet",
            "--config",
            "conf/ci.yaml",
            "--parts",
            "extra.parts.yaml",
        )
        == 0
    )
    ((_, options),) = project.calls
    assert options.margins == {"diode-reverse-voltage": 3.0}
    # Config parts are relative to the config file; --parts come after them.
    assert [p.as_posix() for p in options.extra_parts] == [
        "conf/lib/a.parts.yaml",
        "extra.parts.yaml",
    ]


def test_select_from_command_line_replaces_config(project, capsys):
    project.write("netcheck.yaml", "select: [dc-break-over-rating]\n")
    project.write("a.cnet", ERROR + "\n" + WARNING + "\n")
    project.run("check", "a.cnet", "--format", "json")
    rules = [f["rule"] for f in json.loads(capsys.readouterr().out)["findings"]]
    assert rules == ["dc-break-over-rating"]
    project.run(
        "check", "a.cnet", "--format", "json", "--select", "inductive-load-unsuppressed"
    )
    rules = [f["rule"] for f in json.loads(capsys.readouterr().out)["findings"]]
    assert rules == ["inductive-load-unsuppressed"]


def test_bad_config_is_exit_2(project, capsys):
    project.write("netcheck.yaml", "fail_on: error\n")
    project.write("a.cnet", "\n")
    assert project.run("check", "a.cnet") == 2
    err = capsys.readouterr().err
    assert err.startswith("netcheck.yaml:1:1: error: unknown key 'fail_on'")
    assert "Traceback" not in err


def test_missing_config_option_is_exit_2(project, capsys):
    project.write("a.cnet", "\n")
    assert project.run("check", "a.cnet", "--config", "none.yaml") == 2
    assert "none.yaml: error: --config file not found" in capsys.readouterr().err
