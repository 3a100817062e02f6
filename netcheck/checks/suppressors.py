"""Suppressor rules: ratings of the parts fitted, and what they see in service."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass, replace

import pint

from netcheck.analysis.opening import OpeningFacts, element_transient, load_transient
from netcheck.analysis.switched import ElementAnalysis, Suppressor
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.checks.suppression import effective
from netcheck.findings import Finding
from netcheck.kinds import SEMICONDUCTOR_KINDS
from netcheck.model import Component
from netcheck.units import Q_

__all__ = [
    "suppressor_underrated",
    "suppressor_conducts_normally",
    "snubber_without_resistor",
    "peak_voltage_over_rating",
    "fitted_suppressors",
]


@dataclass(frozen=True)
class Fitted:
    """A suppressor as fitted: where, across what, and its transient at opening."""

    suppressor: Suppressor
    voltage: pint.Quantity  # across it in normal operation (or across the open element)
    current: pint.Quantity  # the load current it takes over at opening
    opening: OpeningFacts | None
    about: str  # the load or element it protects


def fitted_suppressors(ctx: CheckContext) -> list[Fitted]:
    """Every effective suppressor of a DC element's circuit, once each."""
    if "fitted" not in ctx.memo:
        ctx.memo["fitted"] = _fitted(ctx)
    return ctx.memo["fitted"]  # type: ignore[no-any-return]


def _fitted(ctx: CheckContext) -> list[Fitted]:
    out: dict[tuple[str, ...], Fitted] = {}
    for element in ctx.switching_elements(supply="dc"):
        if element.voltage is None:
            continue
        for load in element.inductive_loads:
            for s in effective(load.suppressors):
                if s.placement != "built-in" and s.refs not in out:
                    out[s.refs] = Fitted(
                        s,
                        load.voltage,
                        load.current,
                        load_transient(load, element.voltage, s),
                        load.facts.ref,
                    )
        for s in element.suppression:
            if (
                s.placement == "across-element"
                and s in effective(element.suppression)
                and s.refs not in out
            ):
                current = sum((ld.current for ld in element.loads), Q_(0.0, "A"))
                opening = _with_load_clamp(element, element_transient(element, s))
                out[s.refs] = Fitted(s, element.voltage, current, opening, element.name)
    return [out[k] for k in sorted(out)]


def _load_clamp(element: ElementAnalysis) -> OpeningFacts | None:
    """The opening as the loads' own clamps shape it, if every inductive load has one.

    A freewheel diode (or zener, TVS, varistor) across the load takes the load's
    current at opening; the element then sees the supply plus that clamp (KVL)
    and a snubber across the element no longer rings with the load.
    """
    loads = element.inductive_loads
    clamps = [
        s
        for ld in loads
        for s in effective(ld.suppressors)
        if s.placement != "built-in" and s.kind not in ("rc", "capacitor")
    ]
    if not loads or len(clamps) < len(loads):
        return None
    peaks = [element_transient(element, s) for s in clamps]
    known = [p for p in peaks if p is not None]
    return max(known, key=lambda p: p.peak_voltage) if known else None


def _with_load_clamp(
    element: ElementAnalysis, own: OpeningFacts | None
) -> OpeningFacts | None:
    """An across-element snubber's stress when the loads clamp themselves first."""
    clamped = _load_clamp(element)
    if clamped is None or (
        own is not None and own.peak_voltage <= clamped.peak_voltage
    ):
        return own
    return replace(
        clamped,
        suppressor_energy=Q_(0.0, "J"),
        suppressor_peak_voltage=clamped.peak_voltage,
    )


def _parts(fitted: Fitted) -> list[Component]:
    chain = fitted.suppressor.chain
    return [b.component for b in chain.branches] if chain is not None else []


def _needs(ctx: CheckContext, fitted: Fitted, part: Component):  # type: ignore[no-untyped-def]
    """(what, needed, rated, margin-name) for each rating of one part."""
    v, i, opening = fitted.voltage, fitted.current, fitted.opening
    energy = opening.suppressor_energy if opening is not None else None
    if part.kind == "diode":
        yield (
            "reverse voltage",
            v * ctx.option("diode-reverse-voltage"),
            part.value("voltage_rating"),
        )
        yield (
            "forward current",
            i * ctx.option("diode-current"),
            part.value("current_rating"),
        )
    elif part.kind == "zener":
        clamp = part.value("vz")
        if clamp is not None:
            yield "pulse power (Vz·I0)", (clamp * i).to("W"), part.value("power")
    elif part.kind in ("varistor", "tvs") and energy is not None:
        margin = "varistor-energy" if part.kind == "varistor" else "tvs-energy"
        yield "energy per opening", energy * ctx.option(margin), part.value("energy")
    elif part.kind in ("capacitor", "rc") and opening is not None:
        peak = opening.suppressor_peak_voltage
        rated = part.value("voltage_rating")
        if rated is None or rated >= peak:  # above the rating: peak-voltage-over-rating
            yield "voltage rating", peak * ctx.option("capacitor-voltage"), rated


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
    for fitted in fitted_suppressors(ctx):
        for part in _parts(fitted):
            for what, needed, rated in _needs(ctx, fitted, part):
                if rated is None:
                    yield _missing(ctx, part, what, needed, f"{part.ref}:{what}")
                elif rated < needed:
                    yield ctx.finding(
                        part,
                        what=what,
                        needed=needed,
                        rated=rated,
                        about=fitted.about,
                        key=what,
                    )


def _normal_voltage(ctx: CheckContext, component: Component) -> pint.Quantity | None:
    """The largest voltage on a part in service: energised or across an open element."""
    if "worst" not in ctx.memo:
        worst: dict[str, pint.Quantity] = {}
        for fitted in fitted_suppressors(ctx):
            for ref in fitted.suppressor.refs:
                if ref not in worst or fitted.voltage > worst[ref]:
                    worst[ref] = fitted.voltage
        ctx.memo["worst"] = worst
    fitted = ctx.memo["worst"].get(component.ref)
    # Wherever it sits (straight across the rails, say), it sees its closed-state
    # voltage at least.
    standing = _standing_voltage(ctx, component)
    if fitted is None or (standing is not None and standing > fitted):
        return standing
    return fitted  # type: ignore[no-any-return]


def _standing_voltage(ctx: CheckContext, component: Component) -> pint.Quantity | None:
    a, b = (
        (c.net for c in component.connections[:2])
        if len(component.connections) == 2
        else (None, None)
    )
    domain = ctx.graph.domain_of.get(a) if a else None
    state = ctx.analysis.states.get(domain.name) if domain is not None else None
    if state is None or a not in state.group or b not in state.group:
        return None
    return Q_(abs(state.net_potential(a) - state.net_potential(b)), "V")


@check("suppressor-conducts-normally")
def suppressor_conducts_normally(ctx: CheckContext) -> Iterator[Finding]:
    """Flag varistors and TVS whose continuous or stand-off voltage is too low."""
    for component in ctx.components("varistor", "tvs"):
        voltage = _normal_voltage(ctx, component)
        if voltage is None:
            continue
        key = "vdc_max" if component.kind == "varistor" else "standoff"
        rated = component.value(key)
        if rated is None:
            yield _missing(ctx, component, key, voltage, key)
        elif rated < voltage:
            yield ctx.finding(component, what=key, rated=rated, voltage=voltage)


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


def _element_peak(element: ElementAnalysis) -> OpeningFacts | None:
    across = [
        s
        for s in element.suppression
        if s.placement == "across-element" and s.functional and not s.conducts
    ]
    if across:
        return _with_load_clamp(element, element_transient(element, across[0]))
    loads = element.inductive_loads
    if len(loads) == 1 and effective(loads[0].suppressors):
        s = effective(loads[0].suppressors)[0]
        if s.placement != "built-in":
            return element_transient(element, s)
        return None
    return element_transient(element, None)


@check("peak-voltage-over-rating")
def peak_voltage_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag opening peaks above an output's or a snubber capacitor's rating."""
    for element in ctx.switching_elements(supply="dc"):
        rated = element.component.value("voltage_max")
        if element.component.kind not in SEMICONDUCTOR_KINDS or rated is None:
            continue
        opening = _element_peak(element)
        peak = opening.peak_voltage if opening is not None else element.voltage
        if peak is not None and peak > rated:
            yield ctx.finding(
                element,
                message="output",
                fix="output",
                peak=peak,
                rated=rated,
                assumptions=_assumed(opening),
            )
    for fitted in fitted_suppressors(ctx):
        for part in _parts(fitted):
            rated = part.value("voltage_rating")
            if (
                part.kind not in ("capacitor", "rc")
                or rated is None
                or not fitted.opening
            ):
                continue
            peak = fitted.opening.suppressor_peak_voltage
            if peak > rated:
                yield ctx.finding(
                    part,
                    message="capacitor",
                    fix="capacitor",
                    peak=peak,
                    rated=rated,
                    assumptions="",
                    about=fitted.about,
                )


def _assumed(opening: OpeningFacts | None) -> str:
    if opening is None or not opening.assumptions:
        return ""
    return " (" + "; ".join(opening.assumptions) + ")"
