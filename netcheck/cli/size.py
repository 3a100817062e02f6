"""``netcheck size``: suppression options for one inductive DC load (cli.md)."""

from __future__ import annotations

import argparse
import io
from collections.abc import Mapping
from typing import TYPE_CHECKING, NamedTuple

from netcheck.cli import options
from netcheck.cli.output import Output, Terminal

if TYPE_CHECKING:
    from netcheck.units import Quantity

__all__ = ["SizeSettings", "add_options", "run", "settings_of", "size_text"]

DESCRIPTION = (
    "Diode, diode-zener, varistor, TVS and RC options for one load: peak voltage "
    "at the contact, release time, suppressor energy, ratings."
)
# option -> (dimension, required, help) for the quantities the command reads.
QUANTITIES = {
    "voltage": (
        "voltage",
        True,
        "supply voltage, e.g. 110V, or its range LOW..HIGH, e.g. 88V..125V "
        "(sized at the highest)",
    ),
    "resistance": ("resistance", True, "coil resistance, e.g. 440ohm"),
    "inductance": ("inductance", True, "coil inductance, e.g. 2.1H"),
    "release_current": (
        "current",
        False,
        "current at which the load releases (default 10 %% of V/R)",
    ),
    "clamp": (
        "voltage",
        False,
        "zener/varistor/TVS clamp voltage (default: the supply voltage)",
    ),
    "vf": ("voltage", False, "diode forward drop (default 0.9V)"),
}


class SizeSettings(NamedTuple):
    """One ``size`` run: the load, the sizing choices and the margins."""

    voltage: Quantity
    resistance: Quantity
    inductance: Quantity
    release_current: Quantity | None = None
    clamp: Quantity | None = None
    vf: Quantity | None = None  # None: the default forward drop
    margins: Mapping[str, float] | None = None  # None: the catalogue's
    format: str = "text"
    voltage_range: str | None = None  # "88 V..125 V" where --voltage gave a range


def add_options(parser: argparse.ArgumentParser) -> None:
    """The load's quantities, --config for margins, and the output options."""
    for name, (_, required, text) in QUANTITIES.items():
        parser.add_argument(
            f"--{name.replace('_', '-')}",
            dest=name,
            required=required,
            metavar="QUANTITY",
            help=text,
        )
    parser.add_argument(
        "--config",
        type=options.path,
        metavar="FILE",
        help="take the margins from this netcheck.yaml (its margins: key)",
    )
    options.add_output_options(parser, ("text", "json"))


def _quantity(args: argparse.Namespace, name: str) -> Quantity | None:
    """Parse one option; an error names the option."""
    from netcheck.errors import QuantityError
    from netcheck.units import parse_quantity

    text = getattr(args, name, None)
    if text is None:
        return None
    try:
        if name == "voltage" and ".." in text:
            return _range(text).high
        return parse_quantity(text, QUANTITIES[name][0])
    except QuantityError as error:
        option = f"--{name.replace('_', '-')}"
        if error.message.startswith(option):
            raise
        raise QuantityError(f"{option}: {error.message}") from None


def _range(text: str):  # type: ignore[no-untyped-def]
    from netcheck.ranges import parse_range

    return parse_range("--voltage", text, dimension="voltage")


def settings_of(args: argparse.Namespace) -> SizeSettings:
    """Parse the command line into settings; InputError for a bad quantity."""
    from netcheck.catalogue import load_catalogue
    from netcheck.session import configured_margins

    values = {name: _quantity(args, name) for name in QUANTITIES}
    return SizeSettings(
        **values,  # type: ignore[arg-type]  # required ones are never None
        margins=configured_margins(args.config, load_catalogue()),
        format=args.format,
        voltage_range=str(_range(args.voltage)) if ".." in args.voltage else None,
    )


def size_text(settings: SizeSettings, view: Terminal) -> str:
    """Size the load and render it as JSON or as the text table."""
    from rich.console import Console

    from netcheck.report.size import render_size_text, size_to_json
    from netcheck.sizing import DEFAULT_FORWARD_VOLTAGE, size_load

    result = size_load(
        settings.voltage,
        settings.resistance,
        settings.inductance,
        release_current=settings.release_current,
        clamp=settings.clamp,
        vf=settings.vf if settings.vf is not None else DEFAULT_FORWARD_VOLTAGE,
        margins=settings.margins,
    )
    if settings.format == "json":
        return size_to_json(result) + "\n"
    buffer = io.StringIO()
    if settings.voltage_range is not None:
        top = settings.voltage_range
        buffer.write(f"Sized at the highest voltage of the supply's range {top}.\n")
    console = Console(
        file=buffer,
        width=view.width,
        force_terminal=view.color,
        no_color=not view.color,
        highlight=False,
    )
    render_size_text(result, console)
    return buffer.getvalue()


def run(args: argparse.Namespace, out: Output) -> int:
    """0, or 2 on an input error (raised to the command line's handler)."""
    out.write(size_text(settings_of(args), out.terminal))
    return 0
