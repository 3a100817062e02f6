"""``netcheck check PATH...``: check designs and report findings (cli.md).

Options of ``check`` go in ``add_options`` here; ``request_of`` carries them to
the session (``netcheck.session.Request``).
"""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from netcheck.cli import options
from netcheck.cli.formats import FORMATS
from netcheck.cli.output import Output

if TYPE_CHECKING:
    from collections.abc import Mapping

    from netcheck.catalogue import RuleMeta
    from netcheck.session import Outcome, Request

__all__ = ["add_options", "request_of", "run", "outcome_or_errors"]


def add_options(parser: argparse.ArgumentParser) -> None:
    """The designs, how to read them, the report format and --fail-on."""
    options.add_selection_options(parser)
    options.add_input_options(parser)
    options.add_output_options(parser, tuple(FORMATS))
    parser.add_argument(
        "--fail-on",
        choices=options.FAIL_ON,
        help="lowest severity that makes the exit status 1 (default: error)",
    )
    parser.add_argument(
        "--baseline",
        type=options.path,
        metavar="FILE",
        help="report only findings not in this baseline",
    )
    parser.add_argument(
        "--details",
        action="store_true",
        help="in one-line text output, print each finding's values and fix under it",
    )
    parser.add_argument(
        "-q",
        "--quiet",
        action="store_true",
        help="text output: only the summary (input errors still go to stderr)",
    )
    parser.add_argument(
        "--fail-on-unverified",
        action="store_true",
        help="exit 1 when any switching element could not be verified",
    )


def request_of(args: argparse.Namespace, *, use_baseline: bool) -> Request:
    """The session request of a ``check`` or ``baseline`` command line."""
    from netcheck.session import Request

    return Request(
        paths=tuple(args.paths),
        config=args.config,
        parts=tuple(args.parts),
        allow_outside=args.allow_outside,
        select=options.split_names(args.select),
        ignore=options.split_names(args.ignore),
        fail_on=getattr(args, "fail_on", None),
        baseline=getattr(args, "baseline", None),
        use_baseline=use_baseline,
        jobs=args.jobs,
    )


def run(args: argparse.Namespace, out: Output) -> int:
    """2 on input errors, 1 if --fail-on is reached, else 0.

    Every file that could be read is reported; input errors go to standard
    error and into the report, and the output file is written all the same.
    """
    from netcheck.catalogue import load_catalogue
    from netcheck.report import display_root
    from netcheck.session import project_root

    request = request_of(args, use_baseline=True)
    catalogue = load_catalogue()
    with display_root(project_root(request.paths, request.config)):
        outcome = outcome_or_errors(request, catalogue)
        for error in outcome.report.errors:
            out.error(error.rendered)
        view = out.terminal
        # Rendered as it is written: a heavy report is never one whole string.
        out.stream(
            lambda sink: FORMATS[args.format].write(
                outcome.report,
                catalogue,
                view,
                sink,
                details=bool(args.details),
                quiet=bool(args.quiet),
            )
        )
    if outcome.report.errors:
        return 2
    unverified = args.fail_on_unverified and bool(outcome.report.unverified)
    return 1 if outcome.failing or unverified else 0


def outcome_or_errors(request: Request, catalogue: Mapping[str, RuleMeta]) -> Outcome:
    """Check the designs; a run-wide input error empties the report.

    A broken configuration or baseline leaves a report that carries only the
    error, so that the requested output is still written and says why.
    """
    from netcheck.error_records import records_of
    from netcheck.errors import InputError
    from netcheck.report import Report
    from netcheck.session import Outcome, check_designs

    try:
        return check_designs(request, catalogue)
    except InputError as err:
        return Outcome(Report.build([], errors=records_of(err, "")), False)
