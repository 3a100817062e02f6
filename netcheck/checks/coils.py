"""Coil rules: AC coils on DC and DC coils on AC, coil voltage in range."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.si import ratio as si_ratio
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding
from netcheck.graph import COIL
from netcheck.ranges import highest_voltage, supply_range
from netcheck.units import Q_

__all__ = ["coil_supply_mismatch", "coil_voltage_out_of_range"]

# IEC 60947-4-1 clause 8.2.1.2 (also applied to contactor relays by IEC 60947-5-1):
# close anywhere between 85 % and 110 % of the rated control voltage (from memory).
DEFAULT_RANGE = (0.85, 1.10)


def _coils(ctx: CheckContext):  # type: ignore[no-untyped-def]
    for info in ctx.loads():
        if info.branch.role == COIL and info.supply in ("ac", "dc"):
            yield info


@check("coil-supply-mismatch")
def coil_supply_mismatch(ctx: CheckContext) -> Iterator[Finding]:
    """Flag AC-only coils on DC supplies and DC-only coils on AC supplies."""
    for info in _coils(ctx):
        coil = info.facts.coil_supply
        if coil is None or coil == "ac/dc" or coil == info.supply:
            continue
        component = info.branch.component
        supply = ctx.graph.domain_of[info.branch.a].supplies[0]
        voltage = supply.value(info.supply)
        if info.supply == "dc":
            resistance = info.facts.resistance
            if resistance is None:
                yield ctx.finding(
                    component, message="ac-on-dc-no-r", voltage=voltage, fix="ac-on-dc"
                )
                continue
            yield ctx.finding(
                component,
                message="ac-on-dc",
                fix="ac-on-dc",
                voltage=voltage,
                resistance=resistance,
                current=(voltage / resistance).to("A"),
                power=(voltage**2 / resistance).to("W"),
            )
        else:
            yield ctx.finding(
                component, message="dc-on-ac", fix="dc-on-ac", voltage=voltage
            )


def _range(info) -> tuple[float, float]:  # type: ignore[no-untyped-def]
    coil = info.branch.component.value("coil", default={}) or {}
    given = coil.get("operating_range")
    if given and len(given) == 2:
        return float(given[0].to("").magnitude), float(given[1].to("").magnitude)
    return DEFAULT_RANGE


@check("coil-voltage-out-of-range")
def coil_voltage_out_of_range(ctx: CheckContext) -> Iterator[Finding]:
    """Flag coils whose supply voltage is outside their operating range."""
    for info in _coils(ctx):
        rated = info.facts.rated_voltage
        if rated is None or rated.magnitude <= 0:
            continue
        low, high = _range(info)
        for applied, end in _applied(ctx, info):
            ratio = float(si_ratio(applied, rated, "").magnitude)
            if low <= ratio <= high:
                continue
            yield ctx.finding(
                info.branch.component,
                key="" if end == "highest" else end,
                supply_end=end,
                applied=applied,
                rated=rated,
                percent=Q_(round(ratio * 100, 1), ""),
                low=Q_(low * 100, ""),
                high=Q_(high * 100, ""),
                low_voltage=rated * low,
                high_voltage=rated * high,
            )


def _applied(ctx: CheckContext, info) -> list[tuple[Q_, str]]:  # type: ignore[no-untyped-def]
    """The coil's voltage at the supply's highest voltage and, with a range, lowest.

    The analysis solves a DC domain at the top of the supply's range, so the
    low end is that coil voltage scaled by low/high (a linear network: exact
    for resistive circuits, slightly high where a diode drop is in series).
    """
    supply = ctx.graph.domain_of[info.branch.a].supplies[0]
    top = info.voltage if info.supply == "dc" else highest_voltage(supply, "ac")
    if top is None:
        return []
    if info.supply == "dc":
        ranged = ctx.ranged_supply(info.branch.component)
        band = ranged[1] if ranged is not None else None
    else:
        band = supply_range(supply)
    if band is None:
        return [(top, "highest")]
    return [(top, "highest"), (top * (band.low / band.high).to("").magnitude, "lowest")]
