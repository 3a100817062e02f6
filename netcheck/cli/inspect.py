"""``netcheck inspect FILE``: what the analysis sees for every switching element."""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING, NamedTuple

from netcheck.cli import options
from netcheck.cli.output import Output

if TYPE_CHECKING:
    from pathlib import Path

    from netcheck.pipeline import CheckOptions

__all__ = ["InspectSettings", "add_options", "inspect_text", "run", "settings_of"]


class InspectSettings(NamedTuple):
    """One ``inspect`` run: the design, how to read it, and how to show it."""

    file: Path
    options: CheckOptions
    format: str = "text"
    color: bool = False


def add_options(parser: argparse.ArgumentParser) -> None:
    """The design, how to read it, and the output options."""
    parser.add_argument("file", type=options.path, metavar="FILE")
    options.add_input_options(parser)
    options.add_output_options(parser, ("text", "json"))


def settings_of(args: argparse.Namespace, out: Output) -> InspectSettings:
    """The design's settings (command line over its netcheck.yaml), for inspect."""
    from netcheck.catalogue import load_catalogue
    from netcheck.session import Request, SettingsCache

    request = Request(
        paths=(args.file,),
        config=args.config,
        parts=tuple(args.parts),
        allow_outside=args.allow_outside,
    )
    merged = SettingsCache(request, load_catalogue()).for_design(args.file)
    return InspectSettings(args.file, merged.options, args.format, out.terminal.color)


def inspect_text(settings: InspectSettings) -> str:
    """Analyse the design and render its elements; InputError propagates."""
    from netcheck.analysis.inspect import inspect_elements
    from netcheck.pipeline import analyse_path
    from netcheck.report import display_path
    from netcheck.report.inspect import render_inspect_json, render_inspect_text

    _, analysis = analyse_path(settings.file, settings.options)
    entries = inspect_elements(analysis)
    if settings.format == "json":
        return render_inspect_json(entries)
    shown = display_path(settings.file)
    return render_inspect_text(shown, entries, color=settings.color)


def run(args: argparse.Namespace, out: Output) -> int:
    """0; an input error propagates to the command line's handler (exit 2)."""
    from netcheck.report import display_root
    from netcheck.session import project_root

    with display_root(project_root([args.file], args.config)):
        out.write(inspect_text(settings_of(args, out)))
    return 0
