"""``netcheck size``: options and exit codes for sizing one load's suppression."""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path
from typing import Any

from rich.console import Console

from netcheck.errors import InputError, QuantityError
from netcheck.report.size import render_size_text, size_to_json
from netcheck.sizing import DEFAULT_FORWARD_VOLTAGE, size_load
from netcheck.units import Quantity, parse_quantity

__all__ = ["register", "run_size"]

# (option, dimension, required) for the quantities the command reads.
_QUANTITIES = (
    ("voltage", "voltage", True),
    ("resistance", "resistance", True),
    ("inductance", "inductance", True),
    ("release_current", "current", False),
    ("clamp", "voltage", False),
    ("vf", "voltage", False),
)
_HELP = {
    "voltage": "supply voltage, e.g. 110V",
    "resistance": "coil resistance, e.g. 440ohm",
    "inductance": "coil inductance, e.g. 2.1H",
    "release_current": "current at which the load releases (default 10 %% of V/R)",
    "clamp": "zener/varistor/TVS clamp voltage (default: the supply voltage)",
    "vf": "diode forward drop (default 0.9V)",
}


def register(subparsers: Any) -> argparse.ArgumentParser:
    """Add the ``size`` subcommand to ``subparsers``; it runs ``run_size``."""
    parser = subparsers.add_parser(
        "size",
        help="size suppression for one inductive DC load",
        description="Diode, diode-zener, varistor, TVS and RC options for one load: "
        "peak voltage at the contact, release time, suppressor energy, ratings.",
    )
    for name, _, required in _QUANTITIES:
        parser.add_argument(
            f"--{name.replace('_', '-')}",
            dest=name,
            required=required,
            metavar="QUANTITY",
            help=_HELP[name],
        )
    parser.add_argument("--format", choices=("text", "json"), default="text")
    parser.add_argument(
        "--config",
        type=Path,
        metavar="FILE",
        help="take the margins from this netcheck.yaml (its margins: key)",
    )
    parser.add_argument(
        "--no-color", action="store_true", help="no colour (also when NO_COLOR is set)"
    )
    parser.set_defaults(func=run_size)
    return parser


def _quantities(args: argparse.Namespace) -> dict[str, Quantity]:
    """Parse each given option; errors name the option."""
    values = {}
    for name, dimension, _ in _QUANTITIES:
        text = getattr(args, name, None)
        if text is None:
            continue
        try:
            values[name] = parse_quantity(text, dimension)
        except QuantityError as error:
            option = f"--{name.replace('_', '-')}"
            raise QuantityError(f"{option}: {error.message}") from None
    return values


def _configured_margins(config: Path | None) -> dict[str, float] | None:
    """The margins of a netcheck.yaml given with --config (None without one)."""
    if config is None:
        return None
    from netcheck.catalogue import load_catalogue
    from netcheck.config import load_config

    if not config.is_file():
        raise InputError(f"--config: {config}: no such file")
    return dict(load_config(config, load_catalogue()).margins)


def run_size(args: argparse.Namespace) -> int:
    """Run ``netcheck size``; return 0, or 2 on an input error."""
    try:
        values = _quantities(args)
        result = size_load(
            values["voltage"],
            values["resistance"],
            values["inductance"],
            release_current=values.get("release_current"),
            clamp=values.get("clamp"),
            vf=values.get("vf", DEFAULT_FORWARD_VOLTAGE),
            margins=_configured_margins(getattr(args, "config", None)),
        )
    except InputError as error:
        print(error.render(), file=sys.stderr)
        return 2
    if args.format == "json":
        sys.stdout.write(size_to_json(result) + "\n")
        return 0
    refused = getattr(args, "no_color", False) or bool(os.environ.get("NO_COLOR"))
    render_size_text(result, Console(no_color=refused, highlight=False))
    return 0
