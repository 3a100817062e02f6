"""``netcheck baseline PATH... -o FILE``: write the active findings' fingerprints."""

from __future__ import annotations

import argparse

from netcheck.cli import options
from netcheck.cli.check import request_of
from netcheck.cli.output import Output

__all__ = ["add_options", "run"]


def add_options(parser: argparse.ArgumentParser) -> None:
    """The designs, how to read them, and the baseline file to write."""
    options.add_selection_options(parser)
    options.add_input_options(parser)
    parser.add_argument(
        "-o",
        "--output",
        type=options.path,
        metavar="FILE",
        required=True,
        help="the baseline file to write (atomically)",
    )
    options.add_color_option(parser)


def run(args: argparse.Namespace, out: Output) -> int:
    """0: a baseline records findings, it does not judge them; 2 on input errors."""
    from netcheck.baseline import render_baseline
    from netcheck.catalogue import load_catalogue
    from netcheck.report import display_path, display_root
    from netcheck.session import check_designs, project_root

    request = request_of(args, use_baseline=False)
    with display_root(project_root(request.paths, request.config)):
        outcome = check_designs(request, load_catalogue())
    if outcome.report.errors:
        # A baseline of the files that could be read would drop the others' entries.
        out.error("\n".join(e.rendered for e in outcome.report.errors))
        out.error("netcheck: error: baseline not written (input errors)")
        return 2
    out.write(render_baseline(outcome.report.findings))
    count = len({f.fingerprint for f in outcome.report.active})
    out.say(f"netcheck: wrote {count} fingerprints to {display_path(args.output)}")
    return 0
