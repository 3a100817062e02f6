"""Option groups the commands share, and the values they parse to.

Nothing here imports the pipeline: ``netcheck --help`` builds every parser.
"""

from __future__ import annotations

import argparse
import os
from collections.abc import Sequence
from typing import TYPE_CHECKING

from netcheck.levels import FAIL_ON

if TYPE_CHECKING:
    from pathlib import Path

__all__ = [
    "FAIL_ON",
    "add_color_option",
    "add_input_options",
    "add_output_options",
    "add_selection_options",
    "jobs",
    "path",
    "split_names",
]


def split_names(values: Sequence[str] | None) -> tuple[str, ...] | None:
    """``--select a,b --select c`` -> ``(a, b, c)`` (None when not given)."""
    if values is None:
        return None
    return tuple(
        name.strip() for value in values for name in value.split(",") if name.strip()
    )


def path(text: str) -> Path:
    """A path option (pathlib loads when one is given, not for ``--help``)."""
    from pathlib import Path

    return Path(text)


def jobs(text: str) -> int:
    """``--jobs N``: a whole number; 0 means one per CPU."""
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a whole number: {text!r}") from None
    if value < 0:
        raise argparse.ArgumentTypeError("must be 0 (one per CPU) or more")
    return value or (os.cpu_count() or 1)


def add_output_options(
    parser: argparse.ArgumentParser, formats: Sequence[str] = ()
) -> None:
    """``--format`` (when there is a choice), ``-o FILE`` and ``--no-color``."""
    if formats:
        parser.add_argument("--format", choices=tuple(formats), default=formats[0])
    parser.add_argument(
        "-o",
        "--output",
        type=path,
        metavar="FILE",
        help="write to FILE (atomically) instead of standard output",
    )
    add_color_option(parser)


def add_color_option(parser: argparse.ArgumentParser) -> None:
    """``--no-color`` (the NO_COLOR variable is read by the output funnel)."""
    parser.add_argument(
        "--no-color", action="store_true", help="no colour (also when NO_COLOR is set)"
    )


def add_input_options(parser: argparse.ArgumentParser) -> None:
    """Options of the commands that read designs."""
    parser.add_argument(
        "--config",
        type=path,
        metavar="FILE",
        help="configuration file (default: the nearest netcheck.yaml)",
    )
    parser.add_argument(
        "--parts",
        type=path,
        action="append",
        default=[],
        metavar="FILE",
        help="an extra part library (repeatable)",
    )
    parser.add_argument(
        "--allow-outside",
        action="store_true",
        help="let includes and part libraries leave the top file's directory",
    )


def add_selection_options(parser: argparse.ArgumentParser) -> None:
    """Options of the commands that check many designs."""
    parser.add_argument("paths", nargs="+", type=path, metavar="PATH")
    parser.add_argument(
        "--select",
        action="append",
        metavar="RULES",
        help="only these rules (comma-separated or repeated)",
    )
    parser.add_argument(
        "--ignore",
        action="append",
        metavar="RULES",
        help="leave out these rules (comma-separated or repeated)",
    )
    parser.add_argument(
        "--jobs",
        "-j",
        type=jobs,
        default=1,
        metavar="N",
        help="check N files in parallel (0: one per CPU)",
    )
