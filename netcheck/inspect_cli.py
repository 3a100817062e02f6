"""``netcheck inspect FILE``: what the analysis sees for every switching element."""

from __future__ import annotations

import argparse
import sys

from netcheck.analysis.inspect import inspect_elements
from netcheck.atomic import write_text_atomic
from netcheck.pipeline import CheckOptions, analyse_path
from netcheck.report import display_path
from netcheck.report.inspect import render_inspect_json, render_inspect_text

__all__ = ["run_inspect"]


def run_inspect(args: argparse.Namespace) -> int:
    """Analyse one design and print its elements; InputError propagates (exit 2)."""
    options = getattr(args, "options", None) or CheckOptions()
    netlist, analysis = analyse_path(args.file, options)
    entries = inspect_elements(analysis)
    if args.format == "json":
        text = render_inspect_json(entries)
    else:
        text = render_inspect_text(
            display_path(args.file), entries, color=bool(getattr(args, "color", False))
        )
    if args.output:
        write_text_atomic(args.output, text)
    else:
        sys.stdout.write(text)
    return 0
