"""The size report: suppression options for one load as JSON or as a rich table.

JSON follows cli.md "Size JSON" (format ``netcheck-size/1``); every quantity is
``{"value", "unit", "text"}`` in SI units, with ``null`` for an unbounded value.
"""

from __future__ import annotations

import json
import math
from typing import Any

from rich import box
from rich.console import Console
from rich.table import Table

from netcheck.findings import quantity_dict
from netcheck.sizing import SizeOption, SizeResult, si_unit
from netcheck.units import Quantity, format_quantity

__all__ = ["FORMAT", "CAUTION", "size_to_json", "size_to_dict", "render_size_text"]

FORMAT = "netcheck-size/1"
# Printed once, after the table (cli.md asks the same of the text report).
CAUTION = (
    "Results depend on the coil data given and on a simple model (constant "
    "inductance, ideal opening, no armature motion: real release times are longer); "
    "they do not replace the manufacturer's data, a qualified person's review, or "
    "local codes."
)
_RELATION = {">=": "≥", "<=": "≤", "=": "="}
_SHORT = {
    "common_practice_capacitance": "I²/10 rule: C",
    "common_practice_resistance": "I²/10 rule: R",
}


def _quantity(value: Quantity) -> dict[str, Any]:
    """``{"value", "unit", "text"}`` in the SI unit of the value's dimension."""
    entry = quantity_dict(value.to(si_unit(value)))
    if not math.isfinite(entry["value"]):
        # JSON has no infinity; the text still says what it was.
        entry = {**entry, "value": None, "text": "unbounded"}
    return entry


def _option(option: SizeOption) -> dict[str, Any]:
    return {
        "kind": option.kind,
        "peak_voltage": _quantity(option.peak_voltage),
        "release_time": _quantity(option.release_time),
        "clamp_energy": _quantity(option.clamp_energy),
        "components": {r.name: _quantity(r.value) for r in option.components},
    }


def size_to_dict(result: SizeResult) -> dict[str, Any]:
    """Return the Size JSON object as plain data, keys in the order of the spec."""
    load = result.load
    return {
        "format": FORMAT,
        "load": {
            "current": _quantity(load.current),
            "time_constant": _quantity(load.time_constant),
            "energy": _quantity(load.energy),
        },
        "options": [_option(option) for option in result.options],
    }


def size_to_json(result: SizeResult) -> str:
    """Return the Size JSON text: deterministic, indented, no NaN or infinity."""
    return json.dumps(
        size_to_dict(result),
        indent=2,
        sort_keys=False,
        ensure_ascii=False,
        allow_nan=False,
    )


def _text(value: Quantity) -> str:
    return str(_quantity(value)["text"])


def _buy(option: SizeOption) -> str:
    lines = []
    for rating in option.components:
        name = _SHORT.get(rating.name, rating.name.replace("_", " "))
        lines.append(f"{name} {_RELATION[rating.relation]} {_text(rating.value)}")
    return "\n".join(lines)


def render_size_text(result: SizeResult, console: Console) -> None:
    """Print a table comparing the options, their notes and the caution."""
    load = result.load
    console.print(
        f"Load: {format_quantity(load.voltage)}, {format_quantity(load.resistance)}, "
        f"{format_quantity(load.inductance)}: current {_text(load.current)}, "
        f"L/R {_text(load.time_constant)}, stored energy {_text(load.energy)}; "
        f"release at {_text(load.release_current)}"
    )
    table = Table(
        box=box.SIMPLE_HEAD,
        show_lines=True,
        pad_edge=False,
        caption="peak: across the opening contact; release: until the "
        "current falls to the release current; energy: absorbed by the "
        "suppressor itself",
    )
    table.add_column("option", no_wrap=True, min_width=11)
    for heading in ("peak", "release", "energy"):
        table.add_column(heading, justify="right", no_wrap=True, min_width=9)
    table.add_column("what to buy", overflow="fold")
    for option in result.options:
        table.add_row(
            option.kind,
            _text(option.peak_voltage),
            _text(option.release_time),
            _text(option.clamp_energy),
            _buy(option),
        )
    console.print(table)
    for option in result.options:
        for note in option.notes:
            console.print(f"{option.kind}: {note}", highlight=False)
    margins = ", ".join(f"{name} {value:.4g}" for name, value in result.margins)
    console.print(f"Margins: {margins}", highlight=False)
    console.print(CAUTION, highlight=False)
