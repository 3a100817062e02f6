"""The design shapes the benchmark generates, and the rungs only some shapes use.

A shape says how many supplies and fused buses a design of ``n`` components
has, how many buses go in one included sheet file, and which rungs fill a bus.
Each stresses a different part of the analysis: one rail pair shared by every
rung, thousands of small domains, long series paths, wide parallel groups,
many included files, one card bus per few outputs, or a finding on every load.
Standard library only; illustrative circuits, no real equipment.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

__all__ = ["Plan", "Shape", "SHAPES", "plan_mixed", "spread"]

COMPONENTS_PER_SHEET = 400
SHEETS_PER_SUPPLY = 10
SERIES_CONTACTS = (10, 50)  # interlock contacts per rung, inclusive
PARALLEL_CONTACTS = 20  # start contacts OR-ed in front of each coil
OUTPUTS_PER_CARD = 16
PLC_RUNG = 3  # output, valve, diode


@dataclass(frozen=True)
class Plan:
    """Supplies, components per fused bus (fuse not counted), buses per file."""

    supplies: int
    quotas: list[int]
    buses_per_file: int = 1


def spread(total: int, parts: int) -> list[int]:
    """``total`` split into ``parts`` whole numbers differing by at most one."""
    base, extra = divmod(total, parts)
    return [base + (1 if i < extra else 0) for i in range(parts)]


def plan_mixed(n: int) -> Plan:
    """Ten sheets of about 400 components per supply (the original bench shape)."""
    sheets = max(1, math.ceil(n / COMPONENTS_PER_SHEET))
    supplies = min(sheets, max(2, math.ceil(sheets / SHEETS_PER_SUPPLY)))
    rungs = n - supplies - sheets  # each sheet also has its fuse
    while sheets > 1 and rungs < sheets:
        sheets -= 1
        supplies = min(supplies, sheets)
        rungs = n - supplies - sheets
    rungs = max(rungs, sheets)
    return Plan(supplies, spread(rungs, sheets))


def _plan(supplies: int, buses: int, n: int, per_file: int = 1) -> Plan:
    buses = max(1, min(buses, (n - supplies) // 2))
    return Plan(supplies, spread(max(buses, n - supplies - buses), buses), per_file)


def _one_rail(n: int) -> Plan:
    return Plan(1, [max(1, n - 2)])


def _sheets(n: int) -> Plan:
    sheets = max(1, min(100, n // 20))
    return _plan(max(1, math.ceil(sheets / SHEETS_PER_SUPPLY)), sheets, n)


def _many_supplies(n: int) -> Plan:
    # One supply (its own rail pair and domain) per 25 components, 16 a file.
    count = max(1, n // 25)
    return _plan(count, count, n, per_file=16)


def _one_supply_buses(n: int) -> Plan:
    return _plan(1, math.ceil(n / COMPONENTS_PER_SHEET), n)


def _cards(n: int) -> Plan:
    # One fused card bus per 16 outputs; eight cards to a sheet file.
    per_card = OUTPUTS_PER_CARD * PLC_RUNG
    return _plan(1, math.ceil((n - 1) / (per_card + 1)), n, per_file=8)


def series_rung(sheet: Any) -> int:
    """Interlocks: 10-50 contacts in series from the bus to a relay coil (diode)."""
    low, high = SERIES_CONTACTS
    count = sheet.rng.randint(low, max(low, min(high, sheet.room - 2)))
    net = sheet.bus
    for _ in range(count):
        nxt = sheet.wire()
        sheet.lines.append(f"switch  {sheet.ref('S')}  part=pb-1no  13:{net}  14:{nxt}")
        net = nxt
    sheet.lines.append(
        f"relay   {sheet.ref('K')}  part=relay-24v  A1:{net}  A2:{sheet.supply.minus}"
    )
    if sheet.suppressed():
        sheet.diode(net)
        return count + 2
    return count + 1


def parallel_rung(sheet: Any) -> int:
    """A stop contact, 20 start contacts OR-ed, a relay sealing itself in (diode)."""
    held, coil = sheet.wire(), sheet.wire()
    sheet.lines.append(
        f"switch  {sheet.ref('S')}  part=pb-1no  13:{sheet.bus}  14:{held}"
    )
    for _ in range(PARALLEL_CONTACTS):
        sheet.lines.append(
            f"switch  {sheet.ref('S')}  part=pb-1no  13:{held}  14:{coil}"
        )
    sheet.lines += [
        f"relay   {sheet.ref('K')}  part=relay-24v",
        f"    A1:{coil}  A2:{sheet.supply.minus}",
        f"    13:{held}  14:{coil}",
    ]
    count = PARALLEL_CONTACTS + 2
    if sheet.suppressed():
        sheet.diode(coil)
        count += 1
    return count


def plc_rung(sheet: Any) -> int:
    """One output of a card: output -> valve, freewheel diode across the valve."""
    return sheet.output_rung()


Rung = tuple[int, Callable[[Any], int]]


@dataclass(frozen=True)
class Shape:
    """One benchmark shape: how it is planned and which rungs fill its buses."""

    description: str
    plan: Callable[[int], Plan]
    rungs: tuple[Rung, ...] = ()  # empty: the mixed relay/output rungs
    lamp_rate: float = 0.05  # share of random pilot lamps between rungs
    bare: bool = False  # no suppressor anywhere (every load a finding)


SHAPES: dict[str, Shape] = {
    "mixed": Shape("two or more supplies, ten 400-component sheets each", plan_mixed),
    "one-rail": Shape("one supply, every rung on one rail pair", _one_rail),
    "many-supplies": Shape("one supply per 25 components", _many_supplies),
    "series": Shape(
        "10-50 interlock contacts in series per rung",
        _one_supply_buses,
        ((SERIES_CONTACTS[0] + 2, series_rung),),
        lamp_rate=0.0,
    ),
    "parallel": Shape(
        "20 start contacts in parallel and a seal-in per rung",
        _one_supply_buses,
        ((PARALLEL_CONTACTS + 3, parallel_rung),),
        lamp_rate=0.0,
    ),
    "sheets": Shape("100 sheets by include", _sheets),
    "plc": Shape(
        "PLC output cards of 16 outputs, each a valve and its diode",
        _cards,
        ((PLC_RUNG, plc_rung),),
        lamp_rate=0.0,
    ),
    "unsuppressed": Shape(
        "the mixed shape with no suppressor at all", plan_mixed, bare=True
    ),
}
