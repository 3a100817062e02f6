"""Arrangement rules that need no ratings: polarized poles."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.switched import ElementAnalysis
from netcheck.analysis.verdicts import arrangement_lead, fits_device, rating_values
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding
from netcheck.kinds import SEMICONDUCTOR_KINDS

__all__ = [
    "polarized_pole_reversed",
    "polarized_pole_bidirectional",
    "is_polarized",
    "series_poles_underrated",
    "series_poles_not_ganged",
    "series_poles_assumed",
]


def is_polarized(element: ElementAnalysis) -> bool:
    """Whether the element's contacts are marked polarized."""
    return bool(element.component.value("contacts", "polarized", default=False)) or (
        element.component.value("contacts", "blowout") == "permanent-magnet"
    )


@check("polarized-pole-reversed")
def polarized_pole_reversed(ctx: CheckContext) -> Iterator[Finding]:
    """Flag polarized poles whose current flows against their marked direction."""
    for element in ctx.switching_elements(supply="dc"):
        if element.direction < 0 and is_polarized(element):
            yield ctx.finding(
                element,
                current=element.current,
                inlet=element.element.a,
                outlet=element.element.b,
            )


@check("polarized-pole-bidirectional")
def polarized_pole_bidirectional(ctx: CheckContext) -> Iterator[Finding]:
    """Flag polarized poles on a supply whose current can reverse (battery charging)."""
    for element in ctx.switching_elements(supply="dc"):
        if element.bidirectional and is_polarized(element):
            yield ctx.finding(
                element,
                supply=element.supply_ref or element.domain,
                inlet=element.element.a,
            )


def _can_break_alone(ctx: CheckContext, element: ElementAnalysis) -> bool | None:
    """Whether the element's device (its series poles included) can break alone."""
    if element.component.kind in SEMICONDUCTOR_KINDS:
        limit = element.component.value("current_max")
        if limit is None or element.current is None:
            return None
        return bool(element.current <= limit)
    verdict = ctx.verdict(element)
    if verdict is None or verdict.status == "no-data":
        return None
    return verdict.is_ok


@check("series-poles-underrated")
def series_poles_underrated(ctx: CheckContext) -> Iterator[Finding]:
    """Flag series poles of one device that do not reach the voltage or current."""
    for element in ctx.switching_elements(supply="dc"):
        if element.series_poles < 2 or not arrangement_lead(element) or element.missing:
            continue
        if element.short_circuit:  # a fault current: the short is the finding
            continue
        verdict = ctx.verdict(element)
        if verdict is None or verdict.status not in ("current-over", "voltage-over"):
            continue
        fix = "poles" if fits_device(element, verdict.poles_needed) else "default"
        over_voltage = verdict.status == "voltage-over"
        top = verdict.max_dc_voltage
        yield ctx.finding(
            element,
            message="voltage" if over_voltage else "default",
            fix=fix,
            top=top,
            poles_list=", ".join(element.series_elements),
            **rating_values(element, verdict),
        )


@check("series-poles-assumed")
def series_poles_assumed(ctx: CheckContext) -> Iterator[Finding]:
    """Say where series poles pass only by the per-pole V/n assumption."""
    for element in ctx.switching_elements(supply="dc"):
        if element.series_poles < 2 or not arrangement_lead(element) or element.missing:
            continue
        verdict = ctx.verdict(element)
        if verdict is None or not verdict.is_ok or not verdict.assumed_series:
            continue
        used = verdict.used
        yield ctx.finding(
            element,
            pole_voltage=used.pole_voltage if used is not None else None,
            poles_list=", ".join(element.series_elements),
            **rating_values(element, verdict),
        )


@check("series-poles-not-ganged")
def series_poles_not_ganged(ctx: CheckContext) -> Iterator[Finding]:
    """Flag series elements of different devices none of which can break alone."""
    done: set[frozenset[str]] = set()
    for element in ctx.switching_elements(supply="dc"):
        if not element.other_series:
            continue
        # A chain of n contacts has n members that name one group: sorted once.
        members = frozenset(
            (element.name, *element.other_series, *element.series_elements)
        )
        if members in done:
            continue
        done.add(members)
        group = tuple(sorted(members))
        leads = {}
        for name in group:
            member = ctx.analysis.elements[name]
            leads.setdefault(member.element.device, member)
        # One device that can (or may) break alone clears the group: the
        # rest need no verdict.
        verdicts = (_can_break_alone(ctx, m) for m in leads.values())
        if any(v is None or v for v in verdicts):
            continue
        yield ctx.finding(
            ctx.analysis.elements[group[0]],
            members=", ".join(group),
            devices=", ".join(sorted(leads)),
            current=element.current,
            voltage=element.voltage,
            key=",".join(group),
        )
