"""Candidate edits for the making, protective-device and arc-estimate findings.

- ``protection-dc-capacity``: a part of the loaded library with the DC voltage
  and DC breaking capacity the finding asks for (closest first), else the
  device rated at those values; a polarized device against its marked
  direction is turned round.
- ``making-over-rating`` on a capacitor: a precharge path (a second contact of
  the same device and a resistor of the computed value, the flagged contact
  bypassing them once the capacitor is charged), a larger existing precharge
  or series resistor, else a contact whose making capacity covers the inrush
  (library part, or the making current to ask for); lamps and motors get the
  contact with the making capacity, never suppression.
- ``arc-sustain-risk``: a DC-rated part of the library, or spare poles in
  series (each break adds its minimum arc voltage).

Resistor values are taken from the E12 series upward (IEC 60063 preferred
numbers), the smallest first; the verifier re-checks each in turn.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from typing import TYPE_CHECKING

import pint

from netcheck.analysis.ratings_tables import has_dc_data
from netcheck.checks.making import _MAKING_CATEGORIES
from netcheck.findings import Finding
from netcheck.fixes.edits import AddComponent, Edit, Reconnect, SetValues, UsePart
from netcheck.model import Component, Netlist, Part
from netcheck.units import Q_

if TYPE_CHECKING:  # propose imports this module
    from netcheck.analysis.switched import ElementAnalysis
    from netcheck.fixes.propose import Proposer

__all__ = ["RULES", "candidates", "e12_up"]

RULES = frozenset({"protection-dc-capacity", "making-over-rating", "arc-sustain-risk"})
# IEC 60063 E12 preferred numbers, one decade.
E12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)
STEPS = 3  # E12 values tried above the computed resistance
MAX_PARTS = 8  # library parts tried per finding


def e12_up(ohms: float, steps: int = STEPS) -> list[float]:
    """The smallest E12 values at or above ``ohms``, ``steps`` of them."""
    if ohms <= 0:
        return []
    decade = math.floor(math.log10(ohms))
    out: list[float] = []
    while len(out) < steps:
        for mantissa in E12:
            value = float(f"{mantissa * 10.0**decade:.3g}")
            if value >= ohms * (1 - 1e-9) and len(out) < steps:
                out.append(value)
        decade += 1
    return out


def _ohm_text(ohms: float) -> str:
    return f"{ohms:g}ohm"


def candidates(proposer: Proposer, finding: Finding) -> Iterator[list[Edit]]:
    """Every candidate fix of ``finding``, most preferred first."""
    if finding.rule == "protection-dc-capacity":
        yield from _protection(proposer.netlist, finding)
    elif finding.rule == "making-over-rating":
        yield from _making(proposer, finding)
    elif finding.rule == "arc-sustain-risk":
        yield from _arc(proposer, finding)


def _library(netlist: Netlist, component: Component) -> list[Part]:
    current = component.part.name if component.part is not None else None
    return [
        netlist.parts[name]
        for name in sorted(netlist.parts)
        if netlist.parts[name].kind == component.kind and name != current
    ]


def _use(component: Component, part: Part) -> UsePart:
    """Use ``part``; the inline attributes its data replace go."""
    drop = tuple(
        a.key for a in component.attributes if a.key.split(".", 1)[0] in part.data
    )
    return UsePart(component.ref, part.name, drop)


def _text(value: pint.Quantity, unit: str) -> str:
    from netcheck.fixes.propose import quantity_text  # propose imports this module

    return quantity_text(value, unit)


def _at_least(value: object, needed: object) -> bool:
    if needed is None:
        return True
    return isinstance(value, pint.Quantity) and value >= needed


# -- protective devices --------------------------------------------------
def _protection(netlist: Netlist, finding: Finding) -> Iterator[list[Edit]]:
    ref, _, pole = finding.element.partition(":")
    component = netlist.component(ref)
    if component is None:
        return
    if finding.variant == "reversed":
        common, _, other = pole.partition("-")
        net_a, net_b = component.net_of(common), component.net_of(other)
        if net_a is not None and net_b is not None:
            yield [Reconnect(ref, ((common, net_b), (other, net_a)))]
        return
    volts = finding.values.get("voltage_needed")
    amps = finding.values.get("capacity_needed")
    fitting = [
        p
        for p in _library(netlist, component)
        if _same_current(component, p)
        and _at_least(p.data.get("dc_voltage_rating"), volts)
        and _at_least(p.data.get("breaking_capacity"), amps)
    ]
    fitting.sort(key=_closest)
    for part in fitting[:MAX_PARTS]:
        yield [_use(component, part)]
    ratings: list[tuple[str, str]] = []
    if finding.variant in ("ac-only", "voltage") and volts is not None:
        ratings.append(("dc_voltage_rating", _text(volts, "V")))
    if finding.variant in ("ac-only", "capacity") and amps is not None:
        unit = "kA" if amps >= Q_(1, "kA") else "A"
        ratings.append(("breaking_capacity", _text(amps, unit)))
    if ratings:
        yield [SetValues(ref, tuple(ratings))]


def _same_current(component: Component, part: Part) -> bool:
    """Whether ``part`` has the rated current of the device it would replace.

    A fuse of another rated current no longer protects the wiring behind it
    (a 40 A fuse for a 4 A control circuit); without a stated rated current
    the library offers nothing and the fix names the ratings instead.
    """
    rated, other = component.value("current_rating"), part.data.get("current_rating")
    if not isinstance(rated, pint.Quantity) or not isinstance(other, pint.Quantity):
        return False
    return math.isclose(
        float(rated.to("A").magnitude), float(other.to("A").magnitude), rel_tol=1e-9
    )


def _closest(part: Part) -> tuple[float, float]:
    """Breaking capacity, then DC voltage (unknown last), for sorting."""

    def base(key: str) -> float:
        value = part.data.get(key)
        if isinstance(value, pint.Quantity):
            return float(value.to_base_units().magnitude)
        return math.inf

    return base("breaking_capacity"), base("dc_voltage_rating")


# -- making ----------------------------------------------------------------
def _making(proposer: Proposer, finding: Finding) -> Iterator[list[Edit]]:
    element = proposer.analysis.elements.get(finding.element)
    if element is None:
        return
    if finding.variant in ("capacitive", "discharge"):
        yield from _limit_inrush(proposer, element, finding)
    needed = finding.values.get("making_needed")
    if not isinstance(needed, pint.Quantity):
        return
    component = element.component
    load = proposer.netlist.component(str(finding.values.get("load")))
    fitting = [
        p
        for p in _library(proposer.netlist, component)
        if _at_least((p.data.get("contacts") or {}).get("making_current"), needed)
        and _serves(p, load)
    ]
    fitting.sort(key=lambda p: p.data["contacts"]["making_current"])
    for part in fitting[:MAX_PARTS]:
        yield [_use(component, part)]
    yield [SetValues(component.ref, (("contacts.making_current", _text(needed, "A")),))]


def _serves(part: Part, load: Component | None) -> bool:
    """Whether a part has a rating of the category a lamp or motor needs.

    A contact that makes a motor's starting current but has only a DC-1
    rating would trade the welding for a category mismatch.
    """
    kind = load.value("type") if load is not None else None
    wanted = _MAKING_CATEGORIES.get(str(kind))
    if wanted is None:
        return True
    rows = (part.data.get("contacts") or {}).get("ratings") or ()
    return any(str(r.get("category")) in wanted for r in rows if isinstance(r, dict))


def _limit_inrush(
    proposer: Proposer, element: ElementAnalysis, finding: Finding
) -> Iterator[list[Edit]]:
    """More resistance in the capacitor's loop, bypassed in service."""
    added = finding.values.get("resistor")
    netlist: Netlist = proposer.netlist
    capacitor = netlist.component(str(finding.values.get("capacitor")))
    if not isinstance(added, pint.Quantity) or capacitor is None:
        return
    ohms = float(added.to("ohm").magnitude)
    if finding.variant == "discharge":
        yield from _discharge_resistor(proposer, capacitor, ohms)
        return
    series = _series_resistor(netlist, element)
    if series is not None:
        yield from _larger_resistor(netlist, series, ohms)
    else:
        yield from _precharge_path(proposer, element, ohms)


def _resistance(component: Component) -> float:
    value = component.value("R")
    return float(value.to("ohm").magnitude) if value is not None else 0.0


def _discharge_resistor(
    proposer: Proposer, capacitor: Component, ohms: float
) -> Iterator[list[Edit]]:
    """An RC's own resistor raised, or a resistor put in series with a bare C."""
    if capacitor.kind == "rc":
        for value in e12_up(_resistance(capacitor) + ohms):
            yield [SetValues(capacitor.ref, (("R", _ohm_text(value)),))]
        return
    if len(capacitor.connections) != 2:
        return
    first = capacitor.connections[0]
    inner = f"{capacitor.ref}_r"
    ref = proposer._fresh_ref("R", capacitor.ref)
    for value in e12_up(ohms):
        yield [
            Reconnect(capacitor.ref, ((first.terminal, inner),)),
            AddComponent(
                "resistor",
                ref,
                (("R", _ohm_text(value)),),
                (("1", first.net), ("2", inner)),
                capacitor.ref,
            ),
        ]


def _series_resistor(netlist: Netlist, element: ElementAnalysis) -> Component | None:
    """A resistor wired in series with the element: they alone share a net."""
    component = element.component
    for terminal in (element.element.a, element.element.b):
        net = component.net_of(terminal)
        users = [
            c
            for c in netlist.components
            if any(x.net == net for x in c.connections) and c is not component
        ]
        if len(users) == 1 and users[0].kind == "resistor":
            return users[0]
    return None


def _larger_resistor(
    netlist: Netlist, resistor: Component, ohms: float
) -> Iterator[list[Edit]]:
    """A resistor of the library, or the values, at least ``ohms`` more."""
    needed = _resistance(resistor) + ohms
    fitting = [
        p
        for p in _library(netlist, resistor)
        if isinstance(p.data.get("R"), pint.Quantity)
        and p.data["R"].to("ohm").magnitude >= needed
    ]
    fitting.sort(key=lambda p: p.data["R"])
    for part in fitting[:MAX_PARTS]:
        yield [_use(resistor, part)]
    for value in e12_up(needed):
        yield [SetValues(resistor.ref, (("R", _ohm_text(value)),))]


def _precharge_path(
    proposer: Proposer, element: ElementAnalysis, ohms: float
) -> Iterator[list[Edit]]:
    """A second contact of the same device and a resistor, across the element.

    The new contact closes first and charges the capacitor through the
    resistor; the flagged contact closes on the charged capacitor and bypasses
    both in service (the analysis takes the path of higher loop resistance to
    close first, ``analysis.making``).
    """
    component: Component = element.component
    a, b = element.element.a, element.element.b
    net_a, net_b = component.net_of(a), component.net_of(b)
    if net_a is None or net_b is None:
        return
    contact = proposer._fresh_ref("QP", component.ref)
    resistor = proposer._fresh_ref("RP", component.ref)
    middle = f"{component.ref}_pre"
    attributes = tuple((x.key, x.text) for x in component.attributes)
    for value in e12_up(ohms):
        yield [
            AddComponent(
                component.kind,
                contact,
                attributes,
                ((a, net_a), (b, middle)),
                component.ref,
            ),
            AddComponent(
                "resistor",
                resistor,
                (("R", _ohm_text(value)),),
                (("1", middle), ("2", net_b)),
                component.ref,
            ),
        ]


# -- arc estimate ----------------------------------------------------------
def _arc(proposer: Proposer, finding: Finding) -> Iterator[list[Edit]]:
    element = proposer.analysis.elements.get(finding.element)
    if element is None:
        return
    component = element.component
    rated = [
        p
        for p in _library(proposer.netlist, component)
        if has_dc_data(p.data.get("contacts"))
    ]
    for part in rated[:MAX_PARTS]:
        yield [_use(component, part)]
    if finding.variant.startswith("likely"):
        yield from proposer._more_poles(finding)
