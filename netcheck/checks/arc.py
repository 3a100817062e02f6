"""An arc-sustain estimate for DC contacts that have no DC rating at all."""

from __future__ import annotations

import math
from collections.abc import Iterator

from netcheck.analysis.arc import ayrton_margin, estimate
from netcheck.analysis.ratings_tables import has_dc_data
from netcheck.analysis.switched import ElementAnalysis
from netcheck.analysis.verdicts import arrangement_lead, breaks_something
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding, Severity
from netcheck.kinds import MECHANICAL_KINDS
from netcheck.model import Component
from netcheck.units import Q_

__all__ = ["arc_sustain_risk", "ASSUMED_GAP_MM"]

# Contact gap for the Ayrton comparison: a miniature relay's clearance is about
# 0.4 mm (facts sheet S, an audio-electronics article; common practice).
ASSUMED_GAP_MM = 0.4


def _capacitor(ctx: CheckContext, element: ElementAnalysis) -> Component | None:
    """A capacitor or RC straight across the element, if any."""
    for suppressor in element.suppression:
        if suppressor.placement == "across-element" and suppressor.kind in (
            "rc",
            "capacitor",
        ):
            part = ctx.component(suppressor.refs[0])
            if part is not None and part.value("C") is not None:
                return part
    return None


def _capacitor_values(element: ElementAnalysis, part: Component, um: float) -> dict:
    current = float(element.current.to("A").magnitude)
    farads = float(part.value("C").to("F").magnitude)
    series = part.value("R")
    volts = element.voltage
    return {
        "capacitor": part.ref,
        "dvdt": Q_(current / farads / 1e6, "V/us"),
        "t_um": Q_(um * farads / current, "s"),
        "discharge": None if series is None else (volts / series).to("A"),
        "c_needed": Q_(current * 1e-6, "F"),
    }


def _seen(
    ctx: CheckContext, element: ElementAnalysis
) -> tuple[float, bool, str | None]:
    """The voltage the opening contact sees, whether a kick drives it, a note.

    An unclamped inductive load's kick exceeds any Um, so only Im counts.
    Where every inductive load is clamped (or a suppressor sits across the
    contact), the contact sees the opening peak instead: the supply plus the
    clamp voltage (KVL; facts sheet WE-14, e.g. 5 V + 0.7 V with a diode).
    """
    voltage = float(element.voltage.to("V").magnitude)
    if not element.inductive_loads:
        return voltage, False, None
    unsuppressed = ctx.unsuppressed_loads(element)
    transient = None if unsuppressed else ctx.element_peak(element)
    if transient is None:
        return voltage, True, "an inductive kick exceeds Um, so only Im counts"
    peak = float(transient.peak_voltage.to("V").magnitude)
    note = f"with the clamps fitted the contact sees about {peak:.3g} V at opening"
    return peak, False, note


def _values(ctx: CheckContext, element: ElementAnalysis, breaks: int, material) -> dict:  # type: ignore[no-untyped-def]
    voltage, kick, seen_note = _seen(ctx, element)
    result = estimate(
        voltage, float(element.current.to("A").magnitude), breaks, material, kick
    )
    notes = ["first-order screening, not a rating"]
    if result.assumed_material:
        notes.append(f"material {material or 'not stated'} taken as silver")
    if seen_note is not None:
        notes.append(seen_note)
    ayrton = _ayrton(element, breaks)
    if ayrton is not None:
        notes.append(_ayrton_note(ayrton))
    # n breaks hold an arc only above n·Um, so ceil(V / Um) breaks suffice.
    needed = max(math.ceil(voltage / result.um - 1e-9), 1)
    return {
        "estimate": result,
        "kick": kick,
        "voltage": element.voltage,
        "contact_voltage": None if kick else Q_(voltage, "V"),
        "current": element.current,
        "breaks": Q_(breaks, ""),
        "material": material or "Ag",
        "um": Q_(result.um, "V"),
        "im": Q_(result.im, "A"),
        "assumptions": "; ".join(notes),
        "breaks_needed": None if kick else Q_(needed, ""),
        "ayrton_margin": None if ayrton is None else Q_(ayrton, "V"),
    }


def _ayrton(element: ElementAnalysis, breaks: int) -> float | None:
    """The Ayrton load-line margin (V) of a resistive break, carbon constants.

    A resistive circuit only: an inductive load drives its current through
    the arc whatever the load line says. The gap is an assumption (a
    miniature relay's clearance, about 0.4 mm: facts sheet S, common practice).
    """
    if element.inductive_loads or element.current is None:
        return None
    volts = float(element.voltage.to("V").magnitude)
    amps = float(element.current.to("A").magnitude)
    if volts <= 0 or amps <= 0:
        return None
    return ayrton_margin(volts, volts / amps, breaks, ASSUMED_GAP_MM)


def _ayrton_note(margin: float) -> str:
    if margin > 0:
        says = (
            f"clears the load line by {margin:.1f} V, so it would say the arc goes out"
        )
    else:
        says = f"crosses the load line ({-margin:.1f} V below), so the arc could burn"
    return (
        f"for comparison only: Ayrton's carbon-arc characteristic at an assumed "
        f"{ASSUMED_GAP_MM:g} mm gap {says}; not used, because its constants are "
        "for carbon electrodes (an electrode fall of about 39 V, far above a "
        "metal contact's Um)"
    )


@check("arc-sustain-risk")
def arc_sustain_risk(ctx: CheckContext) -> Iterator[Finding]:
    """Estimate the arc of DC contacts with no DC rating (warning or info)."""
    for element in ctx.switching_elements(supply="dc", kinds=MECHANICAL_KINDS):
        component = element.component
        if not breaks_something(element):
            continue
        if not arrangement_lead(element):
            continue  # series poles of one device: one estimate, on the first
        if has_dc_data(component.value("contacts")) or element.current is None:
            continue
        if element.voltage is None:
            continue
        form = component.value("contacts", "form", default="single-break")
        breaks = (2 if form == "double-break" else 1) * max(element.series_poles, 1)
        values = _values(ctx, element, breaks, component.value("contacts", "material"))
        result, kick = values.pop("estimate"), values.pop("kick")
        variant = "likely" if result.sustained else "unlikely"
        fix = "unlikely"
        if result.sustained:
            fix = "inductive" if kick else "breaks"
        severity = None if result.sustained else Severity.INFO
        part = _capacitor(ctx, element)
        if part is not None:
            values.update(_capacitor_values(element, part, result.um))
            variant += "-capacitor"
        # The key names the verdict: more breaks that make an arc unlikely
        # clear the "likely" warning and leave the "unlikely" note.
        yield ctx.finding(
            element, message=variant, fix=fix, severity=severity,
            key=variant.split("-")[0], **values,
        )  # fmt: skip
