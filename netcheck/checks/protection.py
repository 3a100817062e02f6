"""Protective devices on DC: voltage rating, breaking capacity, polarity."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.fault import Protective, inlet_of, protective_devices
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding

__all__ = ["protection_dc_capacity"]


def _needed(ctx: CheckContext, device: Protective) -> dict[str, object]:
    prospective = device.prospective
    return {
        "voltage": device.voltage,
        "supplies": ", ".join(device.supplies),
        "prospective": prospective,
        "voltage_needed": device.voltage * ctx.option("protection-dc-voltage"),
        "capacity_needed": None
        if prospective is None
        else prospective * ctx.option("protection-breaking-capacity"),
    }


def _missing(ctx: CheckContext, device: Protective, what: str) -> Finding:
    return ctx.finding(
        device.component,
        rule="rating-data-missing",
        message="circuit",
        fix="circuit",
        key=what,
        what=what,
    )


def _ratings(ctx: CheckContext, device: Protective) -> Iterator[Finding]:
    component, values = device.component, _needed(ctx, device)
    dc_rating = component.value("dc_voltage_rating")
    ac_rating = component.value("ac_voltage_rating")
    if dc_rating is None and ac_rating is not None:
        yield ctx.finding(
            component, message="ac-only", fix="ac-only", ac_rating=ac_rating, **values
        )
        return
    if dc_rating is None:
        yield _missing(ctx, device, "DC voltage rating")
    elif dc_rating < values["voltage_needed"]:
        yield ctx.finding(
            component,
            message="voltage",
            fix="voltage",
            key="voltage",
            dc_rating=dc_rating,
            **values,
        )
    capacity = component.value("breaking_capacity")
    needed = values["capacity_needed"]
    if capacity is None:
        yield _missing(ctx, device, "DC breaking capacity")
    elif needed is not None and capacity < needed:
        yield ctx.finding(
            component,
            message="capacity",
            fix="capacity",
            key="capacity",
            capacity=capacity,
            **values,
        )


def _polarity(ctx: CheckContext, device: Protective) -> Iterator[Finding]:
    component = device.component
    if component.value("polarized") not in (True, "yes"):
        return
    for pole in component.poles:
        inlet = inlet_of(ctx.graph, component, pole, ctx.feeds())
        if inlet is not None and inlet != pole.common:
            yield ctx.finding(
                (component, f"{component.ref}:{pole.common}-{pole.no}"),
                message="reversed",
                fix="reversed",
                key=f"reversed:{pole.common}",
                inlet=inlet,
                marked=pole.common,
            )


@check("protection-dc-capacity")
def protection_dc_capacity(ctx: CheckContext) -> Iterator[Finding]:
    """Flag DC fuses and breakers that cannot break the prospective fault."""
    for device in protective_devices(ctx.graph):
        yield from _ratings(ctx, device)
        yield from _polarity(ctx, device)
