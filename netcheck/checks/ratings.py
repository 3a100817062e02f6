"""Rating rules: whether each DC switching element can break what it must."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.ratings import Assessment
from netcheck.analysis.switched import ElementAnalysis
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding
from netcheck.kinds import SEMICONDUCTOR_KINDS

__all__ = [
    "assessment",
    "arrangement_lead",
    "fits_device",
    "rating_values",
    "dc_break_ac_only",
    "dc_break_over_rating",
    "dc_voltage_over_rating",
    "category_mismatch",
    "time_constant_over_rating",
    "rating_data_missing",
    "ac_output_on_dc",
]


def breaks_something(element: ElementAnalysis) -> bool:
    """Whether the element carries current that it must break."""
    return (
        bool(element.loads)
        and element.current is not None
        and element.current.magnitude > 1e-9
    )


def arrangement_lead(element: ElementAnalysis) -> bool:
    """Series poles of one device are judged once, on the first of them."""
    return not element.series_elements or element.name == element.series_elements[0]


def assessment(ctx: CheckContext, element: ElementAnalysis) -> Assessment | None:
    """The rating verdict for a mechanical element (its series arrangement if any)."""
    if not breaks_something(element):
        return None
    return ctx.analysis.verdict(element)


def _judged(ctx: CheckContext) -> Iterator[tuple[ElementAnalysis, Assessment]]:
    for element in ctx.switching_elements(supply="dc"):
        if element.missing or not arrangement_lead(element):
            continue
        verdict = assessment(ctx, element)
        if verdict is not None:
            yield element, verdict


def fits_device(element: ElementAnalysis, poles_needed: int | None) -> bool:
    """Whether the device has the poles a series-pole fix asks for.

    Only a part that lists its poles says how many there are; without that list
    the fix is offered as it is computed.
    """
    if not poles_needed:
        return False
    listed = (
        element.component.part.data.get("poles") if element.component.part else None
    )
    return not listed or poles_needed <= len(listed)


def rating_values(element: ElementAnalysis, verdict: Assessment) -> dict:
    """The values every rating message and fix template may use."""
    used = verdict.used
    return {
        "voltage": element.voltage,
        "current": element.current,
        "category": element.load_category,
        "allowed": verdict.allowed_current
        if verdict.allowed_current is not None
        else "none",
        "rating": used.label if used is not None else "none",
        "poles": verdict.poles,
        "poles_needed": verdict.poles_needed or "no number of these",
        "assumed": " (series rating assumed: V/n per pole, not rated)"
        if verdict.assumed_series
        else "",
    }


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
    for element in ctx.switching_elements(supply="dc"):
        limit = element.component.value(limit_key)
        value = getattr(element, attribute)
        if (
            element.component.kind in SEMICONDUCTOR_KINDS
            and limit is not None
            and (value is not None and value > limit)
        ):
            yield element, limit


@check("dc-break-over-rating")
def dc_break_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag elements whose breaking current exceeds the applicable DC rating."""
    for element, verdict in _judged(ctx):
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
            top = (
                verdict.max_dc_voltage if verdict.max_dc_voltage is not None else "none"
            )
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
                category=element.load_category,
                rated=rated,
                rating=verdict.used.label if verdict.used else "none",
            )


@check("time-constant-over-rating")
def time_constant_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag loads whose L/R or T0.95 exceeds the test condition of the rating used."""
    for element, verdict in _judged(ctx):
        used = verdict.used
        if not verdict.time_constant_over or used is None:
            continue
        limit = used.tau_limit if used.tau_limit is not None else "none"
        yield ctx.finding(
            element,
            tau=element.time_constant,
            t95=element.t95,
            tau_limit=limit,
            t95_limit=used.t95_limit if used.t95_limit is not None else "none",
            rating=used.label,
        )


@check("rating-data-missing")
def rating_data_missing(ctx: CheckContext) -> Iterator[Finding]:
    """Flag DC switching elements that cannot be verified for lack of data."""
    for element in ctx.switching_elements(supply="dc"):
        if (
            not arrangement_lead(element)
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
        verdict = assessment(ctx, element)
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
