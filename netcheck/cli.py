"""The command line: options, configuration and exit codes (cli.md).

Exit status: 0 no finding at or above ``--fail-on``; 1 such findings; 2 an
input error (printed as ``file:line:col: error: ...``) or a usage error.
"""

from __future__ import annotations

import argparse
import importlib
import os
import shutil
import sys
from collections.abc import Mapping, Sequence
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

from netcheck import __version__, pipeline
from netcheck.atomic import write_text_atomic
from netcheck.baseline import apply_baseline, load_baseline_entries, render_baseline
from netcheck.catalogue import RuleMeta, load_catalogue
from netcheck.config import (
    FAIL_ON,
    Config,
    canonical_rule,
    did_you_mean,
    find_config,
    load_config,
)
from netcheck.errors import InputError
from netcheck.findings import Finding, Severity, fingerprint
from netcheck.pipeline import CheckOptions, CheckResult
from netcheck.report import Report, display_path, display_root
from netcheck.report.json import render_json
from netcheck.report.sarif import render_sarif
from netcheck.report.text import render_explain, render_plain, render_rich, render_rules
from netcheck.session import included_files, project_root

__all__ = ["main", "build_parser"]


class UsageError(Exception):
    """A command line that cannot be carried out: reported with usage, exit 2."""


def _split_names(values: Sequence[str] | None) -> list[str] | None:
    """``--select a,b --select c`` -> ``[a, b, c]`` (None when not given)."""
    if values is None:
        return None
    return [
        name.strip() for value in values for name in value.split(",") if name.strip()
    ]


def _jobs(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a whole number: {text!r}") from None
    if value < 0:
        raise argparse.ArgumentTypeError("must be 0 (one per CPU) or more")
    return value or (os.cpu_count() or 1)


def _input_options() -> argparse.ArgumentParser:
    """Options shared by the commands that read designs."""
    shared = argparse.ArgumentParser(add_help=False)
    shared.add_argument(
        "--config",
        type=Path,
        metavar="FILE",
        help="configuration file (default: the nearest netcheck.yaml)",
    )
    shared.add_argument(
        "--parts",
        type=Path,
        action="append",
        default=[],
        metavar="FILE",
        help="an extra part library (repeatable)",
    )
    shared.add_argument(
        "--allow-outside",
        action="store_true",
        help="let includes and part libraries leave the top file's directory",
    )
    shared.add_argument(
        "--no-color", action="store_true", help="no colour (also when NO_COLOR is set)"
    )
    return shared


def _run_options() -> argparse.ArgumentParser:
    shared = argparse.ArgumentParser(add_help=False)
    shared.add_argument(
        "--select",
        action="append",
        metavar="RULES",
        help="only these rules (comma-separated or repeated)",
    )
    shared.add_argument(
        "--ignore",
        action="append",
        metavar="RULES",
        help="leave out these rules (comma-separated or repeated)",
    )
    shared.add_argument(
        "--jobs",
        "-j",
        type=_jobs,
        default=1,
        metavar="N",
        help="check N files in parallel (0: one per CPU)",
    )
    return shared


def build_parser() -> argparse.ArgumentParser:
    """Build the argument parser with every subcommand."""
    parser = argparse.ArgumentParser(
        prog="netcheck",
        description="Lint control-circuit netlists for DC switching hazards.",
    )
    parser.add_argument(
        "--version", action="version", version=f"netcheck {__version__}"
    )
    commands = parser.add_subparsers(dest="command", metavar="COMMAND", required=True)
    inputs, selection = _input_options(), _run_options()

    check = commands.add_parser(
        "check",
        parents=[inputs, selection],
        help="check .cnet files and report findings",
    )
    check.add_argument("paths", nargs="+", type=Path, metavar="PATH")
    check.add_argument("--format", choices=("text", "json", "sarif"), default="text")
    check.add_argument(
        "-o",
        "--output",
        type=Path,
        metavar="FILE",
        help="write the report to FILE (atomically)",
    )
    check.add_argument(
        "--fail-on",
        choices=FAIL_ON,
        help="lowest severity that makes the exit status 1 (default: error)",
    )
    check.add_argument(
        "--baseline",
        type=Path,
        metavar="FILE",
        help="report only findings not in this baseline",
    )
    check.set_defaults(handler="check", parser=check)

    baseline = commands.add_parser(
        "baseline",
        parents=[inputs, selection],
        help="write the current findings as a baseline",
    )
    baseline.add_argument("paths", nargs="+", type=Path, metavar="PATH")
    baseline.add_argument("-o", "--output", type=Path, metavar="FILE", required=True)
    baseline.set_defaults(handler="baseline", parser=baseline)

    inspect = commands.add_parser(
        "inspect",
        parents=[inputs],
        help="show what the analysis sees for each switching element",
    )
    inspect.add_argument("file", type=Path, metavar="FILE")
    inspect.add_argument("--format", choices=("text", "json"), default="text")
    inspect.add_argument("-o", "--output", type=Path, metavar="FILE")
    inspect.set_defaults(handler="inspect", parser=inspect)

    rules = commands.add_parser("rules", help="list the rules")
    rules.add_argument("--no-color", action="store_true")
    rules.set_defaults(handler="rules", parser=rules)

    explain = commands.add_parser("explain", help="explain one rule")
    explain.add_argument("name", metavar="NAME")
    explain.set_defaults(handler="explain", parser=explain)

    _register_size(commands)
    return parser


def _register_size(commands: Any) -> None:
    """``netcheck size`` comes from ``netcheck.size_cli``; stand in if it is absent."""
    try:
        size_cli = importlib.import_module("netcheck.size_cli")
    except ModuleNotFoundError as err:
        if err.name != "netcheck.size_cli":
            raise
        # Accept any arguments ("--voltage ..." included) so the message below is
        # what the user sees, not a complaint about options this stand-in lacks.
        size = commands.add_parser(
            "size",
            help="size suppression for one load",
            prefix_chars="\0",
            add_help=False,
        )
        size.add_argument("rest", nargs="*")
        size.set_defaults(
            handler="unavailable", feature="size", module="netcheck.size_cli"
        )
        return
    size_cli.register(commands)


@dataclass(frozen=True)
class Terminal:
    """Where output goes and how it may look."""

    is_terminal: bool
    color: bool
    width: int


def terminal_of(args: argparse.Namespace) -> Terminal:
    """Decide the view: terminal only on a tty with no ``-o``; colour unless refused."""
    to_file = getattr(args, "output", None) is not None
    is_tty = not to_file and stdout_is_terminal()
    refused = getattr(args, "no_color", False) or bool(os.environ.get("NO_COLOR"))
    width = shutil.get_terminal_size((100, 24)).columns if is_tty else 100
    return Terminal(is_tty, is_tty and not refused, width)


def stdout_is_terminal() -> bool:
    """Tell whether standard output is a terminal (tests replace this)."""
    isatty = getattr(sys.stdout, "isatty", None)
    return bool(isatty and isatty())


def emit(text: str) -> None:
    """Write to standard output, as UTF-8 bytes if its encoding cannot hold the text."""
    try:
        sys.stdout.write(text)
    except UnicodeEncodeError:
        sys.stdout.flush()
        sys.stdout.buffer.write(text.encode("utf-8"))
    sys.stdout.flush()


def resolve_rules(
    names: list[str] | None, option: str, catalogue: dict[str, RuleMeta]
) -> list[str] | None:
    """Canonical rule names of an option; UsageError for an unknown one."""
    if names is None:
        return None
    try:
        return [canonical_rule(name, catalogue) for name in names]
    except ValueError as err:
        raise UsageError(f"{option}: {err}") from None


def _cnet_files(directory: Path) -> list[Path]:
    """List every ``.cnet`` below ``directory``, skipping hidden directories."""
    found = []
    for root, dirs, files in os.walk(directory):
        dirs[:] = sorted(d for d in dirs if not d.startswith("."))
        found += [Path(root) / f for f in sorted(files) if f.endswith(".cnet")]
    return found


def _reach(starts: list[Path], graph: dict[Path, list[Path]]) -> set[Path]:
    seen: set[Path] = set()
    todo = list(starts)
    while todo:
        node = todo.pop()
        if node not in seen:
            seen.add(node)
            todo += graph.get(node, [])
    return seen


def discover_designs(paths: Sequence[Path]) -> list[Path]:
    """Return the top-level designs among ``paths``, sorted by display path.

    A directory stands for every ``.cnet`` below it. A file that another of the
    files includes is checked as part of that file, not on its own; files that
    are only reachable inside an include cycle are checked once so that the cycle
    is reported.
    """
    candidates: dict[Path, Path] = {}
    for path in paths:
        found = _cnet_files(path) if path.is_dir() else [path]
        if not found:
            raise UsageError(f"{path}: no .cnet files found below it")
        for file in found:
            candidates.setdefault(file.resolve(), Path(os.path.normpath(file)))
    graph = {
        key: [t for t in included_files(key) if t in candidates] for key in candidates
    }
    included = {target for targets in graph.values() for target in targets}
    order = sorted(candidates, key=lambda key: display_path(candidates[key]))
    tops = [key for key in order if key not in included]
    covered = _reach(tops, graph)
    for key in order:
        if key not in covered:
            tops.append(key)
            covered |= _reach([key], graph)
    return sorted((candidates[key] for key in tops), key=display_path)


@dataclass(frozen=True)
class Settings:
    """What applies to one design: its configuration merged with the command line."""

    fail_on: Severity | None  # None: never fail
    select: frozenset[str] | None
    ignore: frozenset[str]
    severity: Mapping[str, Severity]
    options: CheckOptions
    baseline: Mapping[str, Mapping[str, str]] | None  # entries by fingerprint


def settings_for(
    file: Path,
    args: argparse.Namespace,
    catalogue: dict[str, RuleMeta],
    cache: dict[Path | None, Settings],
) -> Settings:
    """Return the settings of ``file``: ``--config`` or its nearest netcheck.yaml."""
    path = getattr(args, "config", None) or find_config(file)
    key = path.resolve() if path is not None else None
    if key not in cache:
        config = load_config(path, catalogue) if path is not None else Config()
        cache[key] = _merge(config, args, catalogue)
    return cache[key]


def _merge(
    config: Config, args: argparse.Namespace, catalogue: dict[str, RuleMeta]
) -> Settings:
    """Command line over configuration: --select replaces, --ignore and --parts add."""
    select = resolve_rules(
        _split_names(getattr(args, "select", None)), "--select", catalogue
    )
    ignore = resolve_rules(
        _split_names(getattr(args, "ignore", None)), "--ignore", catalogue
    )
    chosen = select if select is not None else config.select
    fail_on = getattr(args, "fail_on", None) or config.fail_on or "error"
    baseline_file = None
    if getattr(args, "handler", "") == "check":
        baseline_file = getattr(args, "baseline", None) or config.baseline
    options = CheckOptions(
        extra_parts=(*config.parts, *getattr(args, "parts", [])),
        allow_outside=bool(getattr(args, "allow_outside", False)),
        margins=dict(config.margins),
    )
    return Settings(
        fail_on=None if fail_on == "never" else Severity.parse(fail_on),
        select=frozenset(chosen) if chosen is not None else None,
        ignore=frozenset((*config.ignore, *(ignore or []))),
        severity=dict(config.severity),
        options=options,
        baseline=(
            load_baseline_entries(baseline_file) if baseline_file is not None else None
        ),
    )


class _CheckErrors(InputError):
    """Input errors of one or more designs, already rendered in the worker."""

    def __init__(self, rendered: list[str]) -> None:
        super().__init__(rendered[0])
        self.rendered = rendered

    def render(self) -> str:
        return "\n".join(self.rendered)


def _os_error(err: OSError) -> str:
    if err.filename is None:
        return f"netcheck: error: {err.strerror or err}"
    return f"{display_path(err.filename)}: error: {err.strerror or err}"


def _check_one(path: Path, options: CheckOptions) -> CheckResult | str:
    """Check one design; an input error comes back rendered.

    Rendering here keeps the error's span and excerpt: InputError does not
    survive pickling from a worker process with its span intact.
    """
    try:
        return pipeline.check_path(path, options)
    except InputError as err:
        return err.render()
    except OSError as err:
        return _os_error(err)


def _check_all(designs: list[Path], settings: list[Settings], jobs: int) -> list[Any]:
    """Results in the order of ``designs``, whatever order the workers finish in."""
    options = [s.options for s in settings]
    if jobs <= 1 or len(designs) <= 1:
        return [_check_one(p, o) for p, o in zip(designs, options, strict=True)]
    with ProcessPoolExecutor(max_workers=min(jobs, len(designs))) as pool:
        return list(pool.map(_check_one, designs, options))


def _apply(findings: Sequence[Finding], settings: Settings) -> list[Finding]:
    """Select/ignore, then severity overrides, then display path and fingerprint."""
    out = []
    for finding in findings:
        if settings.select is not None and finding.rule not in settings.select:
            continue
        if finding.rule in settings.ignore:
            continue
        severity = settings.severity.get(finding.rule, finding.severity)
        # The fingerprint is made again from the project-root display path; the
        # span keeps its working path until Report.build shows it.
        shown = display_path(finding.span.file) if finding.span.file else ""
        mark = fingerprint(finding.rule, shown, finding.element, finding.key)
        out.append(replace(finding, severity=severity, fingerprint=mark))
    return out


def collect(
    args: argparse.Namespace, catalogue: dict[str, RuleMeta]
) -> tuple[Report, bool]:
    """Check every design of ``args.paths``; the report and whether --fail-on is hit."""
    designs = discover_designs(args.paths)
    cache: dict[Path | None, Settings] = {}
    settings = [settings_for(path, args, catalogue, cache) for path in designs]
    results = _check_all(designs, settings, getattr(args, "jobs", 1))
    errors = [r for r in results if isinstance(r, str)]
    if errors:
        raise _CheckErrors(errors)
    findings: list[Finding] = []
    files: set[str] = set()
    seen: set[str] = set()
    suppressed, failing = 0, False
    for path, setting, result in zip(designs, settings, results, strict=True):
        kept = _apply(result.findings, setting)
        seen |= {f.fingerprint for f in kept if f.fingerprint}
        if setting.baseline is not None:
            kept, count = apply_baseline(kept, setting.baseline)
            suppressed += count
        threshold = setting.fail_on
        failing |= threshold is not None and any(
            f.waived is None and f.severity >= threshold for f in kept
        )
        findings += kept
        files |= {str(path), *(str(f) for f in result.files)}
    stale = _stale_entries(settings, seen)
    return Report.build(findings, files, suppressed, stale), failing


def _stale_entries(
    settings: Sequence[Settings], seen: set[str]
) -> list[Mapping[str, str]]:
    """Baseline entries that match no current finding, in baseline order."""
    entries: dict[str, Mapping[str, str]] = {}
    for setting in settings:
        entries.update(setting.baseline or {})
    return [entry for mark, entry in entries.items() if mark not in seen]


def run_root(args: argparse.Namespace) -> Path:
    """The project root of a run: see :func:`netcheck.session.project_root`."""
    paths = getattr(args, "paths", None) or [getattr(args, "file", Path("."))]
    return project_root(paths, getattr(args, "config", None))


def _render(
    kind: str, report: Report, catalogue: dict[str, RuleMeta], term: Terminal
) -> str:
    if kind == "json":
        return render_json(report, catalogue)
    if kind == "sarif":
        return render_sarif(report, catalogue)
    if term.is_terminal:
        return render_rich(report, color=term.color, width=term.width)
    return render_plain(report)


def run_check(args: argparse.Namespace, catalogue: dict[str, RuleMeta]) -> int:
    """``netcheck check``: 1 if a finding reaches --fail-on, else 0."""
    with display_root(run_root(args)):
        report, failing = collect(args, catalogue)
        text = _render(args.format, report, catalogue, terminal_of(args))
    if args.output is not None:
        write_text_atomic(args.output, text)
    else:
        emit(text)
    return 1 if failing else 0


def run_baseline(args: argparse.Namespace, catalogue: dict[str, RuleMeta]) -> int:
    """``netcheck baseline``: write the active findings' fingerprints to -o FILE."""
    with display_root(run_root(args)):
        report, _ = collect(args, catalogue)
    write_text_atomic(args.output, render_baseline(report.findings))
    count = len({f.fingerprint for f in report.active})
    print(f"netcheck: wrote {count} fingerprints to {display_path(args.output)}")
    return 0


def _missing_paths(args: argparse.Namespace) -> list[str]:
    """``file: error: ...`` lines for command-line paths that do not exist."""
    problems = []
    for path in getattr(args, "paths", None) or [getattr(args, "file", None)]:
        if path is not None and not path.exists():
            problems.append(f"{path}: error: No such file or directory")
    for option in ("config", "baseline"):
        path = getattr(args, option, None)
        if path is not None and not path.is_file():
            problems.append(f"{path}: error: --{option} file not found")
    for path in getattr(args, "parts", None) or []:
        if not path.is_file():
            problems.append(f"{path}: error: part library not found")
    return problems


def _run_explain(args: argparse.Namespace, catalogue: dict[str, RuleMeta]) -> int:
    meta = catalogue.get(args.name)
    if meta is None:
        print(
            f"netcheck explain: error: unknown rule '{args.name}'"
            f"{did_you_mean(args.name, catalogue)}",
            file=sys.stderr,
        )
        return 2
    emit(render_explain(meta, args.name))
    return 0


def _run_inspect(args: argparse.Namespace, catalogue: dict[str, RuleMeta]) -> int:
    try:
        run_inspect = importlib.import_module("netcheck.inspect_cli").run_inspect
    except ModuleNotFoundError as err:
        if err.name not in ("netcheck.inspect_cli", "netcheck.analysis.inspect"):
            raise
        return _unavailable("inspect", "netcheck.inspect_cli")
    settings = settings_for(args.file, args, catalogue, {})
    terminal = terminal_of(args)
    args.options = settings.options
    args.color = terminal.color
    args.terminal = terminal.is_terminal
    return int(run_inspect(args))


def _unavailable(feature: str, module: str) -> int:
    print(
        f"netcheck: error: '{feature}' is not available in this build "
        f"({module} is missing)",
        file=sys.stderr,
    )
    return 2


def _dispatch(args: argparse.Namespace) -> int:
    handler = getattr(args, "handler", None)
    if handler is None and callable(getattr(args, "func", None)):
        return int(args.func(args))  # a subcommand registered by another module
    if handler == "unavailable":
        return _unavailable(args.feature, args.module)
    catalogue = load_catalogue()
    if handler == "rules":
        terminal = terminal_of(args)
        emit(
            render_rules(
                catalogue,
                terminal=terminal.is_terminal,
                color=terminal.color,
                width=terminal.width,
            )
        )
        return 0
    if handler == "explain":
        return _run_explain(args, catalogue)
    if handler == "inspect":
        return _run_inspect(args, catalogue)
    if handler == "baseline":
        return run_baseline(args, catalogue)
    return run_check(args, catalogue)


def main(argv: Sequence[str] | None = None) -> int:
    """Run netcheck with ``argv`` (default ``sys.argv[1:]``); return the exit status."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as stop:  # --help, --version, or a usage error (status 2)
        return int(stop.code or 0)
    missing = _missing_paths(args)
    if missing:
        print("\n".join(missing), file=sys.stderr)
        return 2
    try:
        return _dispatch(args)
    except UsageError as err:
        args.parser.print_usage(sys.stderr)
        print(f"{args.parser.prog}: error: {err}", file=sys.stderr)
        return 2
    except InputError as err:
        print(err.render(), file=sys.stderr)
        return 2
    except BrokenPipeError:  # e.g. `netcheck check . | head`: stop quietly
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 1
    except OSError as err:
        print(_os_error(err), file=sys.stderr)
        return 2
