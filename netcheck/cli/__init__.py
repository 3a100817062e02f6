"""The command line: the parser built from ``COMMANDS``, errors and exit codes.

Exit status: 0 no finding at or above ``--fail-on``; 1 such findings; 2 an
input error (printed as ``file:line:col: error: ...``) or a usage error.

Only ``argparse`` and the command modules' option definitions load before a
command runs: ``netcheck --help`` and ``--version`` import no pint, numpy,
networkx, lark or pipeline (``tests/cli/test_cli_lazy.py``).
"""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Sequence
from typing import NoReturn

from netcheck import __version__
from netcheck.cli.commands import COMMANDS
from netcheck.cli.output import Output

__all__ = ["COMMANDS", "build_parser", "entry", "main"]


def build_parser(only: str | None = None) -> argparse.ArgumentParser:
    """Build the argument parser with every subcommand of ``COMMANDS``.

    With ``only``, just that command gets its options (and its module loaded);
    the others are listed by name and help, which is all ``--help`` shows.
    """
    parser = argparse.ArgumentParser(
        prog="netcheck",
        description="Lint control-circuit netlists for DC switching hazards.",
    )
    parser.add_argument(
        "--version", action="version", version=f"netcheck {__version__}"
    )
    commands = parser.add_subparsers(dest="command", metavar="COMMAND", required=True)
    for command in COMMANDS:
        if only is not None and command.name != only:
            commands.add_parser(command.name, help=command.help)
            continue
        module = command.load()
        sub = commands.add_parser(
            command.name,
            help=command.help,
            description=getattr(module, "DESCRIPTION", None) or command.help,
        )
        module.add_options(sub)
        sub.set_defaults(run=getattr(module, command.function), parser=sub)
    return parser


def _command_named(argv: Sequence[str]) -> str:
    """The command an argument list names: its first word not starting with ``-``.

    The top-level options (``--help``, ``--version``) take no value, so that word
    is the command, or a usage error argparse reports. "" when there is none.
    """
    return next((word for word in argv if not word.startswith("-")), "")


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


def _output(args: argparse.Namespace) -> Output:
    return Output(
        getattr(args, "output", None), no_color=bool(getattr(args, "no_color", False))
    )


def _run(args: argparse.Namespace, out: Output) -> int:
    """Run the command; usage and input errors become messages and exit 2."""
    from netcheck.errors import InputError
    from netcheck.session import UsageError, os_error_line

    try:
        return int(args.run(args, out))
    except UsageError as err:
        args.parser.print_usage(sys.stderr)
        out.error(f"{args.parser.prog}: error: {err}")
    except InputError as err:
        out.error(err.render())
    except BrokenPipeError:
        raise
    except OSError as err:
        out.error(os_error_line(err))
    return 2


def main(argv: Sequence[str] | None = None) -> int:
    """Run netcheck with ``argv`` (default ``sys.argv[1:]``); return the exit status.

    Called without ``argv`` (the console script, ``python -m netcheck``), a
    closed pipe (``netcheck check . | head``) ends the run quietly: standard
    output is pointed at the null device so that the interpreter's last flush
    cannot fail. Called with ``argv`` (tests, embedding), the process's
    standard output is left alone and the status is just 1.
    """
    words = sys.argv[1:] if argv is None else list(argv)
    parser = build_parser(only=_command_named(words))
    try:
        args = parser.parse_args(words)
    except SystemExit as stop:  # --help, --version, or a usage error (status 2)
        return int(stop.code or 0)
    out = _output(args)
    missing = _missing_paths(args)
    if missing:
        out.error("\n".join(missing))
        return 2
    try:
        return _run(args, out)
    except BrokenPipeError:
        if argv is None:
            devnull = os.open(os.devnull, os.O_WRONLY)
            os.dup2(devnull, sys.stdout.fileno())
        return 1


def entry() -> NoReturn:
    """The console script and ``python -m netcheck``: ``main()``, then exit at once.

    A command that checked a large design ends holding its model (hundreds of
    MB in millions of objects, kept on purpose: ``pipeline._last_design``);
    the interpreter's teardown would free them one by one, 0.4 s at 100,000
    components, after the output is complete. So once the exit handlers have
    run and standard output and error are flushed, the process ends without
    that teardown (``os._exit``). Under a profiler or tracer, or with another
    thread still running, it exits the ordinary way.
    """
    status = main()
    threading = sys.modules.get("threading")
    others = threading is not None and threading.active_count() > 1
    if others or sys.getprofile() is not None or sys.gettrace() is not None:
        raise SystemExit(status)
    import atexit

    atexit._run_exitfuncs()
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except (OSError, ValueError):  # a closed pipe: as main() says, status 1
            status = status or 1
    os._exit(status)
