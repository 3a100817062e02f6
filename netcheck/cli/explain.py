"""``netcheck explain NAME``: one rule's rationale, references, fix and margins."""

from __future__ import annotations

import argparse

from netcheck.cli import options
from netcheck.cli.output import Output

__all__ = ["add_options", "run"]


def add_options(parser: argparse.ArgumentParser) -> None:
    """The rule name and the output options."""
    parser.add_argument("name", metavar="NAME", help="a rule name (or an alias)")
    options.add_output_options(parser)


def run(args: argparse.Namespace, out: Output) -> int:
    """0, or 2 for an unknown rule (with the closest name)."""
    from netcheck.catalogue import load_catalogue
    from netcheck.config import did_you_mean
    from netcheck.report.text import render_explain

    catalogue = load_catalogue()
    meta = catalogue.get(args.name)
    if meta is None:
        out.error(
            f"netcheck explain: error: unknown rule '{args.name}'"
            f"{did_you_mean(args.name, catalogue)}"
        )
        return 2
    out.write(render_explain(meta, args.name))
    return 0
