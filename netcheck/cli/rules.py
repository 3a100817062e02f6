"""``netcheck rules``: the rule list (a table on a terminal, columns when piped)."""

from __future__ import annotations

import argparse

from netcheck.cli import options
from netcheck.cli.output import Output

__all__ = ["add_options", "run"]


def add_options(parser: argparse.ArgumentParser) -> None:
    """Only the output options."""
    options.add_output_options(parser)


def run(args: argparse.Namespace, out: Output) -> int:
    """Always 0."""
    from netcheck.catalogue import load_catalogue
    from netcheck.report.text import render_rules

    view = out.terminal
    text = render_rules(
        load_catalogue(), terminal=view.is_terminal, color=view.color, width=view.width
    )
    out.write(text)
    return 0
