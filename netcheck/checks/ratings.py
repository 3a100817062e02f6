"""Rating rules: whether each DC switching element can break what it must."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.contact_loop import contact_time_constant
from netcheck.analysis.ratings import Assessment
from netcheck.analysis.ratings_tables import at_most, t95_of
from netcheck.analysis.si import exceeds
from netcheck.analysis.switched import ElementAnalysis
from netcheck.analysis.verdicts import (
    arrangement_lead,
    breaks_something,
    fits_device,
    rating_values,
)
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding
from netcheck.kinds import MECHANICAL_KINDS, SEMICONDUCTOR_KINDS

__all__ = [
    "dc_break_ac_only",
    "dc_break_over_rating",
    "dc_voltage_over_rating",
    "category_mismatch",
    "time_constant_over_rating",
    "rating_data_missing",
    "ac_output_on_dc",
]


def _judged(ctx: CheckContext) -> Iterator[tuple[ElementAnalysis, Assessment]]:
    """DC elements judged on their ratings, with the verdict (series poles once).

    Five rules read the same list: it is made once per design.
    """
    return iter(ctx.shared("ratings:judged", lambda: list(_judge(ctx))))


def _judge(ctx: CheckContext) -> Iterator[tuple[ElementAnalysis, Assessment]]:
    # Only mechanical elements get a rating verdict (verdicts.element_rating).
    for element in ctx.switching_elements(supply="dc", kinds=MECHANICAL_KINDS):
        if element.missing or not arrangement_lead(element):
            continue
        verdict = ctx.verdict(element)
        if verdict is not None:
            yield element, verdict


@check("dc-break-ac-only")
def dc_break_ac_only(ctx: CheckContext) -> Iterator[Finding]:
    """Flag DC-breaking elements whose part lists only AC ratings."""
    for element, verdict in _judged(ctx):
        if verdict.status == "ac-only":
            rows = element.component.value("contacts", "ratings", default=()) or ()
            rated = ", ".join(sorted({str(r["category"]) for r in rows})) or "AC"
            yield ctx.finding(
                element,
                voltage=element.voltage,
                current=element.current,
                category=element.load_category,
                rated=rated,
            )


def _outputs_over(
    ctx: CheckContext, limit_key: str, attribute: str
) -> Iterator[tuple[ElementAnalysis, object]]:
    """Semiconductor outputs whose breaking ``attribute`` exceeds ``limit_key``."""
    for element in ctx.switching_elements(supply="dc", kinds=SEMICONDUCTOR_KINDS):
        limit = element.component.value(limit_key)
        value = getattr(element, attribute)
        if limit is not None and value is not None and exceeds(value, limit):
            yield element, limit


@check("dc-break-over-rating")
def dc_break_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag elements whose breaking current exceeds the applicable DC rating."""
    for element, verdict in _judged(ctx):
        if element.short_circuit:
            # The current is a fault current: the short is the one finding
            # (supply-short-circuit or freewheel-diode-reversed), not the contact.
            continue
        if verdict.status == "current-over" and verdict.poles == 1:
            fix = "poles" if fits_device(element, verdict.poles_needed) else "default"
            yield ctx.finding(element, fix=fix, **rating_values(element, verdict))
    for element, limit in _outputs_over(ctx, "current_max", "current"):
        yield ctx.finding(
            element,
            message="output",
            fix="output",
            current=element.current,
            allowed=limit,
        )


@check("dc-voltage-over-rating")
def dc_voltage_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag elements breaking a voltage above every DC voltage they are rated for."""
    for element, verdict in _judged(ctx):
        if verdict.status == "voltage-over" and verdict.poles == 1:
            fix = "poles" if fits_device(element, verdict.poles_needed) else "default"
            top = verdict.max_dc_voltage
            yield ctx.finding(
                element, fix=fix, top=top, **rating_values(element, verdict)
            )
    for element, limit in _outputs_over(ctx, "voltage_max", "voltage"):
        yield ctx.finding(
            element, message="output", fix="output", top=limit, voltage=element.voltage
        )


@check("category-mismatch")
def category_mismatch(ctx: CheckContext) -> Iterator[Finding]:
    """Flag loads that need a more demanding category than any DC rating of the pole."""
    for element, verdict in _judged(ctx):
        if verdict.category_mismatch and verdict.status not in ("ac-only", "no-data"):
            rated = (
                ", ".join(verdict.rated_categories) or "a resistive breaking curve only"
            )
            yield ctx.finding(
                element,
                fix="default" if element.inductive_loads else "not-inductive",
                category=verdict.needed,
                rated=rated,
                rating=verdict.used.label if verdict.used else None,
            )


@check("time-constant-over-rating")
def time_constant_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag loads whose L/R or T0.95 exceeds the test condition of the rating used."""
    for element, verdict in _judged(ctx):
        used = verdict.used
        if not verdict.time_constant_over or used is None or element.short_circuit:
            continue
        limit = used.tau_limit
        # A load suppressed across itself keeps its inductance off the contact.
        tau = contact_time_constant(element)
        if tau is None or limit is None or at_most(tau.to("ms"), limit):
            continue
        yield ctx.finding(
            element,
            tau=tau,
            t95=t95_of(tau),
            tau_limit=limit,
            t95_limit=used.t95_limit,
            rating=used.label,
        )


@check("rating-data-missing")
def rating_data_missing(ctx: CheckContext) -> Iterator[Finding]:
    """Flag DC switching elements that cannot be verified for lack of data."""
    for element in ctx.switching_elements(supply="dc"):
        if (
            element.short_circuit
            or not arrangement_lead(element)
            or not breaks_something(element)
            and not element.missing
        ):
            continue
        if element.missing:
            yield ctx.finding(
                element,
                message="circuit",
                fix="circuit",
                what="; ".join(element.missing),
            )
            continue
        verdict = ctx.verdict(element)
        if verdict is not None and verdict.status == "no-data":
            what = ", ".join(verdict.missing) or "DC breaking ratings"
            yield ctx.finding(
                element,
                what=what,
                voltage=element.voltage,
                current=element.current,
                category=element.load_category,
            )
        elif (
            element.component.kind == "ssr"
            and element.component.value("output") is None
        ):
            yield ctx.finding(
                element,
                fix="output",
                what="output (ac or dc)",
                voltage=element.voltage,
                current=element.current,
                category=element.load_category,
            )


@check("ac-output-on-dc")
def ac_output_on_dc(ctx: CheckContext) -> Iterator[Finding]:
    """Flag AC-only (thyristor or triac) solid-state outputs in a DC circuit."""
    for element in ctx.switching_elements(supply="dc"):
        if (
            element.component.kind == "ssr"
            and element.component.value("output") == "ac"
        ):
            yield ctx.finding(element, voltage=element.voltage, current=element.current)
