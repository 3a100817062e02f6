"""Fixes for two clamps in one loop: bring the external clamp below the internal one.

The limit comes from the finding (``zener_max``: Vz with Vs + Vz + Vf below the
output's internal clamp, less the zener tolerance), so the value proposed is
rounded down, never up: a zener even slightly above the limit would leave the
internal clamp conducting first again (``analysis/clamp_order.py``).
"""

from __future__ import annotations

import math
from collections.abc import Iterator

import pint

from netcheck.findings import Finding
from netcheck.fixes.edits import Edit, SetValues
from netcheck.model import Netlist

__all__ = ["lower_clamp", "round_down"]


def round_down(value: pint.Quantity, unit: str) -> str | None:
    """``value`` in ``unit`` rounded down to two significant digits, as .cnet text."""
    magnitude = float(value.to(unit).magnitude)
    if magnitude <= 0:
        return None
    step = 10 ** (math.floor(math.log10(magnitude)) - 1)
    rounded = math.floor(round(magnitude / step, 9)) * step
    return f"{float(f'{rounded:.2g}'):g}{unit}"


def lower_clamp(netlist: Netlist, finding: Finding) -> Iterator[list[Edit]]:
    """Set the external chain's zener to the highest voltage below the limit."""
    limit = finding.values.get("zener_max")
    if not isinstance(limit, pint.Quantity):
        return
    refs = str(finding.values.get("external") or "").split(", ")
    zeners = [
        c
        for ref in refs
        if (c := netlist.component(ref)) is not None and c.kind == "zener"
    ]
    text = round_down(limit, "V")
    if len(zeners) == 1 and text is not None:
        yield [SetValues(zeners[0].ref, (("vz", text),))]
