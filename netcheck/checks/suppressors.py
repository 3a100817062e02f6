"""Suppressor rules: ratings of the parts fitted, and what they see in service."""

from __future__ import annotations

from collections.abc import Iterator

import pint

from netcheck.analysis.clamp_order import (
    external_suppressors,
    zener_below,
)
from netcheck.analysis.fitted import Fitted, unsuppressed_loads
from netcheck.analysis.si import exceeds, quantity_like
from netcheck.analysis.switched import ElementAnalysis
from netcheck.analysis.transients import OpeningTransient
from netcheck.analysis.verdicts import arrangement_lead
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding
from netcheck.kinds import MECHANICAL_KINDS, SEMICONDUCTOR_KINDS
from netcheck.model import Component
from netcheck.units import Q_

__all__ = [
    "suppressor_underrated",
    "suppressor_conducts_normally",
    "snubber_without_resistor",
    "peak_voltage_over_rating",
    "opens_unclamped",
]


def _needs(ctx: CheckContext, fitted: Fitted, part: Component):  # type: ignore[no-untyped-def]
    """(what, needed, rated, margin-name) for each rating of one part."""
    v, i, opening = fitted.voltage, fitted.current, fitted.opening
    energy = opening.suppressor_energy if opening is not None else None
    if part.kind == "diode":
        yield (
            "reverse voltage",
            ctx.scaled(v, "diode-reverse-voltage"),
            part.value("voltage_rating"),
        )
        yield (
            "forward current",
            ctx.scaled(i, "diode-current"),
            part.value("current_rating"),
        )
    elif part.kind == "zener" and opening is not None:
        # A clamp at constant Vz absorbs ∫Vz·i dt = Vz·Q of each opening (first
        # principles); in a diode + zener chain that is the zener's share.
        clamp = part.value("vz")
        if clamp is not None:
            share = (clamp * opening.suppressor_charge).to("J")
            needed = share * ctx.option("zener-energy")
            yield "energy per opening", needed, part.value("energy")
    elif part.kind in ("varistor", "tvs") and energy is not None:
        margin = "varistor-energy" if part.kind == "varistor" else "tvs-energy"
        yield "energy per opening", ctx.scaled(energy, margin), part.value("energy")
    elif part.kind in ("capacitor", "rc") and opening is not None:
        peak = opening.suppressor_peak_voltage
        rated = part.value("voltage_rating")
        if rated is None or rated >= peak:  # above the rating: peak-voltage-over-rating
            yield "voltage rating", ctx.scaled(peak, "capacitor-voltage"), rated


def _missing(
    ctx: CheckContext, part: Component, what: str, needed: object, key: str
) -> Finding:
    """The rating-data-missing finding for a suppressor rating not given."""
    return ctx.finding(
        part,
        rule="rating-data-missing",
        message="suppressor",
        fix="suppressor",
        what=what,
        needed=needed,
        key=key,
    )


@check("suppressor-underrated")
def suppressor_underrated(ctx: CheckContext) -> Iterator[Finding]:
    """Flag suppressors whose ratings fall short of what the circuit puts on them."""
    for fitted in ctx.fitted_suppressors():
        for part in fitted.parts():
            for what, needed, rated in _needs(ctx, fitted, part):
                if rated is None:
                    yield _missing(ctx, part, what, needed, f"{part.ref}:{what}")
                elif exceeds(needed, rated):
                    yield ctx.finding(
                        part,
                        what=what,
                        needed=needed,
                        rated=rated,
                        about=fitted.about,
                        key=what,
                    )


@check("suppressor-conducts-normally")
def suppressor_conducts_normally(ctx: CheckContext) -> Iterator[Finding]:
    """Flag suppressors that conduct at the working voltage (ratings too low)."""
    yield from _zeners_conducting(ctx)
    for component in ctx.components("varistor", "tvs"):
        voltage = ctx.service_voltage(component)
        if voltage is None:
            continue
        key = "vdc_max" if component.kind == "varistor" else "standoff"
        rated = component.value(key)
        if rated is None:
            yield _missing(ctx, component, key, voltage, key)
        elif rated < voltage:
            yield ctx.finding(component, what=key, rated=rated, voltage=voltage)


def _zeners_conducting(ctx: CheckContext) -> Iterator[Finding]:
    """Zeners in breakdown in the solved closed state (vz below the working voltage).

    A zener with no vz cannot be judged at all: rating-data-missing.
    """
    # In a chain with a diode conducting forward, the reversed diode is the
    # fault (freewheel-diode-reversed); the zener's breakdown follows from it.
    reversed_chains = {r for rev in ctx.reversed_diodes() for r in rev.suppressor.refs}
    breakdown = ctx.in_breakdown() - reversed_chains
    alone = {
        f.suppressor.refs[0]
        for f in ctx.fitted_suppressors()
        if f.suppressor.kind == "zener" and f.suppressor.refs
    }
    for component in ctx.components("zener"):
        voltage = ctx.service_voltage(component)
        rated = component.value("vz")
        if rated is None and component.ref in alone:
            # Alone across a load its vz must clear the working voltage.
            yield _missing(ctx, component, "vz", voltage, "vz")
        elif rated is None:
            yield ctx.finding(
                component,
                rule="rating-data-missing",
                message="suppressor-unjudged",
                fix="suppressor",
                what="vz",
                key="vz",
            )
        elif component.ref in breakdown:
            yield ctx.finding(component, what="vz", rated=rated, voltage=voltage)


@check("snubber-without-resistor")
def snubber_without_resistor(ctx: CheckContext) -> Iterator[Finding]:
    """Flag a bare capacitor across a switching element (it discharges into it)."""
    for element in ctx.switching_elements(supply="dc"):
        for s in element.suppression:
            if s.placement != "across-element" or s.kind != "capacitor" or not s.chain:
                continue
            part = s.chain.branches[0].component
            low, high = _resistor_range(element)
            yield ctx.finding(
                part, contact=element.name, low=low, high=high, key=element.name
            )


def _resistor_range(element: ElementAnalysis) -> tuple[pint.Quantity, pint.Quantity]:
    """Series R bounds: at least V/I_making, at most the load resistance.

    The lower bound limits the capacitor's discharge into the closing contact to its
    making current; above the load resistance the R·I step at opening itself becomes
    large (RC-network application notes). Without a making current, 0.5 ohm per volt
    (common practice) stands in for the lower bound.
    """
    voltage = element.voltage or Q_(0.0, "V")
    making = element.component.value("contacts", "making_current")
    low = (
        (voltage / making).to("ohm")
        if making is not None
        else (voltage * Q_(0.5, "ohm/V"))
    )
    current = element.current or Q_(0.0, "A")
    high = (voltage / current).to("ohm") if current.magnitude > 0 else low * 10
    return low.to("ohm"), max(high, low).to("ohm")


@check("peak-voltage-over-rating")
def peak_voltage_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag opening peaks above an output's, a contact's or a snubber's rating."""
    for element in ctx.switching_elements(supply="dc", kinds=SEMICONDUCTOR_KINDS):
        rated = element.component.value("voltage_max")
        if rated is None:
            continue
        internal = ctx.internal_clamp(element)
        if internal is not None:  # the output's own clamp conducts first
            peak = internal.voltage
        else:
            opening = ctx.element_peak(element)
            peak = opening.peak_voltage if opening is not None else element.voltage
        if peak is not None and exceeds(peak, rated):
            yield ctx.finding(
                element,
                message="output",
                fix="output",
                peak=peak,
                rated=rated,
                assumptions=_assumed(ctx.element_peak(element)),
            )
    for fitted in ctx.fitted_suppressors():
        for part in fitted.parts():
            rated = part.value("voltage_rating")
            if (
                part.kind not in ("capacitor", "rc")
                or rated is None
                or not fitted.opening
            ):
                continue
            peak = fitted.opening.suppressor_peak_voltage
            if exceeds(peak, rated):
                yield ctx.finding(
                    part,
                    message="capacitor",
                    fix="capacitor",
                    peak=peak,
                    rated=rated,
                    about=fitted.about,
                )
    for element, peak, rated in _contact_peaks(ctx):
        external = external_suppressors(element)
        yield ctx.finding(
            element,
            message="contact",
            fix="contact",
            peak=peak,
            rated=rated,
            poles=element.series_poles,
            external=", ".join(sorted({r for s in external for r in s.refs})),
            zener_max=zener_below(element, rated * max(element.series_poles, 1)),
        )


def _contact_peaks(
    ctx: CheckContext,
) -> Iterator[tuple[ElementAnalysis, pint.Quantity, pint.Quantity]]:
    """Mechanical contacts whose suppressed opening peak exceeds voltage_max.

    The clamp (diode + zener, varistor, TVS) or RC sets the voltage across the
    open gap (KVL at the instant of opening); series poles of one device are
    taken to share it equally (V/n, as the series ratings are). An unsuppressed
    contact arcs instead (its peak is an artefact of stray capacitance), and a
    supply already above voltage_max is dc-voltage-over-rating's.
    """
    for element in ctx.switching_elements(supply="dc", kinds=MECHANICAL_KINDS):
        rated = element.component.value("contacts", "voltage_max")
        if rated is None or not arrangement_lead(element):
            continue  # series poles: one finding, on the first
        if element.voltage is None or exceeds(element.voltage, rated):
            continue
        if (
            ctx.unsuppressed_loads(element)
            and element.component.value("clamp_voltage") is None
        ):
            continue  # opens_unclamped: no transient solve, its kind would be "none"
        opening = ctx.element_peak(element)
        if opening is None or opening.kind == "none":
            continue
        peak = opening.peak_voltage
        peak = quantity_like(peak, peak._magnitude / max(element.series_poles, 1))
        if exceeds(peak, rated):
            yield element, peak, rated


def opens_unclamped(element: ElementAnalysis) -> bool:
    """Whether ``element_peak(element)`` is None or of kind "none", unsolved.

    An inductive load with no effective suppressor rules out one across the
    element too (``unsuppressed_loads``), so ``element_peak`` takes
    ``element_transient(element, None)``, whose model is the element's own
    clamp voltage, else no suppression at all. Tested against the solve on
    every rule case and bench shape (tests/test_check_shortcuts.py).
    """
    return (
        bool(unsuppressed_loads(element))
        and element.component.value("clamp_voltage") is None
    )


def _assumed(opening: OpeningTransient | None) -> str:
    if opening is None or not opening.assumptions:
        return ""
    return " (" + "; ".join(opening.assumptions) + ")"
