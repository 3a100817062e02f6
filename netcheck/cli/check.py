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
    from netcheck.session import Request

__all__ = ["add_options", "request_of", "run"]


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
    """1 if a finding reaches --fail-on, else 0."""
    from netcheck.catalogue import load_catalogue
    from netcheck.report import display_root
    from netcheck.session import check_designs, project_root

    request = request_of(args, use_baseline=True)
    catalogue = load_catalogue()
    with display_root(project_root(request.paths, request.config)):
        outcome = check_designs(request, catalogue)
        text = FORMATS[args.format].render(outcome.report, catalogue, out.terminal)
    out.write(text)
    return 1 if outcome.failing else 0
