"""An arc-sustain estimate for DC contacts that have no DC rating at all."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.arc import estimate
from netcheck.analysis.ratings_tables import has_dc_data
from netcheck.analysis.switched import ElementAnalysis
from netcheck.analysis.verdicts import breaks_something
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding, Severity
from netcheck.kinds import MECHANICAL_KINDS
from netcheck.model import Component
from netcheck.units import Q_

__all__ = ["arc_sustain_risk"]


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


def _values(element: ElementAnalysis, breaks: int, material) -> dict:  # type: ignore[no-untyped-def]
    voltage = float(element.voltage.to("V").magnitude)
    result = estimate(
        voltage, float(element.current.to("A").magnitude), breaks, material,
        bool(element.inductive_loads),
    )  # fmt: skip
    notes = ["first-order screening, not a rating"]
    if result.assumed_material:
        notes.append(f"material {material or 'not stated'} taken as silver")
    if element.inductive_loads:
        notes.append("an inductive kick exceeds Um, so only Im counts")
    return {
        "estimate": result,
        "voltage": element.voltage,
        "current": element.current,
        "breaks": Q_(breaks, ""),
        "material": material or "Ag",
        "um": Q_(result.um, "V"),
        "im": Q_(result.im, "A"),
        "assumptions": "; ".join(notes),
        "breaks_needed": Q_(int(voltage // result.um) + 1, ""),
    }


@check("arc-sustain-risk")
def arc_sustain_risk(ctx: CheckContext) -> Iterator[Finding]:
    """Estimate the arc of DC contacts with no DC rating (warning or info)."""
    for element in ctx.switching_elements(supply="dc"):
        component = element.component
        if component.kind not in MECHANICAL_KINDS or not breaks_something(element):
            continue
        if has_dc_data(component.value("contacts")) or element.current is None:
            continue
        if element.voltage is None:
            continue
        form = component.value("contacts", "form", default="single-break")
        breaks = (2 if form == "double-break" else 1) * max(element.series_poles, 1)
        values = _values(element, breaks, component.value("contacts", "material"))
        result = values.pop("estimate")
        variant = "likely" if result.sustained else "unlikely"
        severity = None if result.sustained else Severity.INFO
        part = _capacitor(ctx, element)
        if part is not None:
            values.update(_capacitor_values(element, part, result.um))
            variant += "-capacitor"
        yield ctx.finding(
            element, message=variant, fix=variant.split("-")[0], severity=severity,
            **values,
        )  # fmt: skip
