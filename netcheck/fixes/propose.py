"""Candidate edits for a finding, most preferred first.

Each candidate is a list of edits with concrete values: a freewheel diode's
reverse voltage and current, a zener's breakdown voltage, a part of the loaded
library, a rating. The values come from the finding's own numbers and the
margins the checks apply, rounded up, so that the suggested part passes the
check that asked for it; ``verify`` then proves it by re-checking the design.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

import pint

from netcheck.analysis.result import Analysis
from netcheck.analysis.si import quantity_like, si
from netcheck.catalogue import Margin, all_margins, load_catalogue
from netcheck.findings import Finding
from netcheck.fixes import propose_making
from netcheck.fixes.clamp_fixes import lower_clamp
from netcheck.fixes.edits import AddComponent, Edit, Reconnect, SetValues, UsePart
from netcheck.fixes.propose_more import more_candidates
from netcheck.model import Component, Netlist
from netcheck.units import Q_

__all__ = ["Proposer", "quantity_text", "rating_attribute"]

# A suppressor-underrated rating and the attribute that holds it.
_RATING_KEYS = {
    "reverse voltage": "voltage_rating",
    "forward current": "current_rating",
    "energy per opening": "energy",
    "voltage rating": "voltage_rating",
    "pulse power (Vz·I0)": "power",
}
_RATING_UNITS = ("V", "A", "J", "W")
# Rules whose fix is suppression across the element's inductive loads.
_SUPPRESS = {
    "inductive-load-unsuppressed",
    "time-constant-over-rating",
    "category-mismatch",
    "dc-break-over-rating",
}
# Rules about the rating of the anchored part: another part of the library may do.
_PART_RULES = {
    "dc-break-over-rating",
    "dc-voltage-over-rating",
    "time-constant-over-rating",
    "category-mismatch",
    "series-poles-underrated",
    "suppressor-underrated",
    "suppressor-conducts-normally",
    "peak-voltage-over-rating",
    "internal-clamp-overloaded",
    "coil-voltage-out-of-range",
    "coil-supply-mismatch",
    "dc-break-ac-only",
    "ac-output-on-dc",
    "polarized-pole-bidirectional",
}
MAX_PARTS = 8  # library parts tried per finding: enough for any shipped library


def quantity_text(value: pint.Quantity, unit: str) -> str:
    """``value`` in ``unit`` rounded up to two significant digits, as .cnet text."""
    magnitude = si(value, unit)  # float(value.to(unit).magnitude), bit for bit
    if magnitude <= 0:
        return f"0{unit}"
    step = 10 ** (math.floor(math.log10(magnitude)) - 1)
    rounded = math.ceil(round(magnitude / step, 9)) * step
    return f"{float(f'{rounded:.2g}'):g}{unit}"


def rating_attribute(what: object, needed: object) -> tuple[str, str] | None:
    """The attribute and its text that give a suppressor the rating a check needs."""
    key = _RATING_KEYS.get(str(what))
    if key is None or not isinstance(needed, pint.Quantity):
        return None
    for unit in _RATING_UNITS:
        if needed.dimensionality == Q_(1, unit).dimensionality:
            return key, quantity_text(needed, unit)
    return None


def _margin(name: str, margins: dict[str, float]) -> float:
    if name in margins:
        return float(margins[name])
    return _default_margins()[name].default


# The catalogue's margins, kept with the catalogue object they were read from:
# every proposal asks for two, and building the table per ask was a tenth of
# proposing a fix.
_DEFAULTS: list[tuple[object, dict[str, Margin]]] = []


def _default_margins() -> dict[str, Margin]:
    """``all_margins(load_catalogue())``, worked out once per catalogue object."""
    catalogue = load_catalogue()
    if not _DEFAULTS or _DEFAULTS[0][0] is not catalogue:
        _DEFAULTS[:] = [(catalogue, all_margins(catalogue))]
    return _DEFAULTS[0][1]


def _times(value: pint.Quantity, factor: float) -> pint.Quantity:
    """``value * factor`` as pint builds it (the magnitudes multiplied, units kept)."""
    magnitude = value._magnitude
    if type(magnitude) is float and type(factor) is float:
        return quantity_like(value, magnitude * factor)
    return value * factor


@dataclass
class Proposer:
    """Proposes edits for the findings of one analysed design."""

    netlist: Netlist
    analysis: Analysis
    margins: dict[str, float]

    def candidates(self, finding: Finding) -> Iterator[list[Edit]]:
        """Every candidate fix of ``finding``, most preferred first."""
        if finding.rule in _SUPPRESS:
            yield from self._suppress(finding)
        if finding.rule == "freewheel-diode-reversed":
            yield from self._turn_round(finding)
        if finding.rule == "polarized-pole-reversed":
            yield from self._swap_pole(finding)
        if finding.rule == "suppressor-underrated":
            yield from self._rerate(finding)
        if finding.rule == "snubber-without-resistor":
            yield from self._series_resistor(finding)
        if finding.rule == "slow-release-suppression":
            yield from self._add_zener(finding)
        if finding.rule in ("series-poles-underrated", "dc-break-over-rating"):
            yield from self._more_poles(finding)
        if finding.rule in ("internal-clamp-overloaded", "peak-voltage-over-rating"):
            yield from lower_clamp(self.netlist, finding)
        if finding.rule in _PART_RULES:
            yield from self._other_parts(finding)
        yield from more_candidates(self, finding)
        if finding.rule in propose_making.RULES:
            yield from propose_making.candidates(self, finding)

    # -- suppression across the loads ------------------------------------
    def _suppress(self, finding: Finding) -> Iterator[list[Edit]]:
        element = self.analysis.elements.get(finding.element)
        if element is None or element.supply != "dc" or element.voltage is None:
            return
        loads = [ld for ld in element.inductive_loads if not _suppressed(ld)]
        if not loads:
            return
        fast = any("fast-release" in self._component(ld.facts.ref).tags for ld in loads)
        plain = self._diodes(loads, element.voltage, zener=False)
        if fast:
            chain = self._diodes(loads, element.voltage, zener=True)
            if chain:
                yield chain
        if plain:
            yield plain

    def _diodes(self, loads, voltage, zener: bool) -> list[Edit]:  # type: ignore[no-untyped-def]
        edits: list[Edit] = []
        for load in loads:
            sides = self._sides(load.facts.key)
            if sides is None:
                return []
            plus, minus = sides
            after = load.facts.ref
            ratings = (
                (
                    "voltage_rating",
                    quantity_text(
                        _times(voltage, _margin("diode-reverse-voltage", self.margins)),
                        "V",
                    ),
                ),
                (
                    "current_rating",
                    quantity_text(
                        _times(load.current, _margin("diode-current", self.margins)),
                        "A",
                    ),
                ),
            )
            diode = self._fresh_ref("V", load.facts.ref)
            if not zener:
                edits.append(
                    AddComponent(
                        "diode", diode, ratings, (("A", minus), ("K", plus)), after
                    )
                )
                continue
            # Diode + zener in series: the zener (cathode to the - side) breaks
            # down at about the supply voltage, so the peak at the contact is
            # about twice the supply (common practice for fast release).
            middle = f"{diode}_fw"
            vz = quantity_text(voltage, "V")
            zener_ref = self._fresh_ref("VZ", load.facts.ref)
            edits.append(
                AddComponent(
                    "diode", diode, ratings, (("A", middle), ("K", plus)), after
                )
            )
            edits.append(
                AddComponent(
                    "zener",
                    zener_ref,
                    (("vz", vz),),
                    (("A", middle), ("K", minus)),
                    after,
                )
            )
        return edits

    def _sides(self, key: str) -> tuple[str, str] | None:
        """The load's (+ side, - side) nets in the closed state."""
        info = self.analysis.loads.get(key)
        if info is None or info.domain is None:
            return None
        branch = info.branch
        state = self.analysis.states.get(info.domain)
        if state is None:
            return None
        va = state.potentials.get(state.group.get(branch.a, ""), 0.0)
        vb = state.potentials.get(state.group.get(branch.b, ""), 0.0)
        if math.isclose(va, vb, abs_tol=1e-9):
            return None
        return (branch.a, branch.b) if va > vb else (branch.b, branch.a)

    def _fresh_ref(self, prefix: str, load: str) -> str:
        """A reference named after the load (``V_Y1``), the same for every finding."""
        ref, number = f"{prefix}_{load}", 1
        while self.netlist.component(ref) is not None:  # the design's index
            number += 1
            ref = f"{prefix}_{load}_{number}"
        return ref

    def _component(self, ref: str) -> Component:
        component = self.netlist.component(ref)
        assert component is not None
        return component

    # -- polarity --------------------------------------------------------
    def _turn_round(self, finding: Finding) -> Iterator[list[Edit]]:
        refs = str(finding.values.get("parts") or finding.element).split(", ")
        edits: list[Edit] = []
        for ref in refs:
            component = self.netlist.component(ref)
            if component is None or len(component.connections) != 2:
                return
            first, second = component.connections
            edits.append(
                Reconnect(
                    ref, ((first.terminal, second.net), (second.terminal, first.net))
                )
            )
        yield edits

    def _swap_pole(self, finding: Finding) -> Iterator[list[Edit]]:
        element = self.analysis.elements.get(finding.element)
        if element is None:
            return
        component = element.component
        a, b = element.element.a, element.element.b
        net_a, net_b = component.net_of(a), component.net_of(b)
        if net_a is None or net_b is None:
            return
        yield [Reconnect(component.ref, ((a, net_b), (b, net_a)))]

    # -- chains --------------------------------------------------------
    def _series_resistor(self, finding: Finding) -> Iterator[list[Edit]]:
        """An R inside [low, high] between the capacitor and one of its nets."""
        low, high = finding.values.get("low"), finding.values.get("high")
        capacitor = self.netlist.component(finding.element)
        if capacitor is None or len(capacitor.connections) != 2 or low is None:
            return
        if high is None or high < low:
            return
        middle = (low * high) ** 0.5 if low.magnitude > 0 else high / 2
        text = quantity_text(middle, "ohm")
        if Q_(text) > high:
            text = quantity_text(low, "ohm")
        first = capacitor.connections[0]
        inner = f"{capacitor.ref}_r"
        ref = self._fresh_ref("R", capacitor.ref)
        yield [
            Reconnect(capacitor.ref, ((first.terminal, inner),)),
            AddComponent(
                "resistor",
                ref,
                (("R", text),),
                (("1", first.net), ("2", inner)),
                capacitor.ref,
            ),
        ]

    def _add_zener(self, finding: Finding) -> Iterator[list[Edit]]:
        """A zener in series with the freewheel diode, cathode to the - side."""
        diode = self.netlist.component(str(finding.values.get("diode")))
        vz = finding.values.get("zener_voltage")
        if diode is None or diode.kind != "diode" or not isinstance(vz, pint.Quantity):
            return
        anode = diode.net_of("A")
        if anode is None:
            return
        middle = f"{diode.ref}_fw"
        ref = self._fresh_ref("VZ", diode.ref)
        yield [
            Reconnect(diode.ref, (("A", middle),)),
            AddComponent(
                "zener",
                ref,
                (("vz", quantity_text(vz, "V")),),
                (("A", middle), ("K", anode)),
                diode.ref,
            ),
        ]

    # -- series poles --------------------------------------------------
    def _more_poles(self, finding: Finding) -> Iterator[list[Edit]]:
        """Wire 1, 2, ... spare poles of the device in series at the chain's end."""
        element = self.analysis.elements.get(finding.element)
        if element is None:
            return
        component = element.component
        spare = _spare_poles(component)
        end = _chain_end(component, element.series_elements or (element.name,))
        if end is None:
            return
        terminal, net = end
        wiring: list[tuple[str, str]] = []
        for count, (common, other) in enumerate(spare, start=1):
            inner = f"{component.ref}_s{count}"
            wiring = [(t, inner if (t, n) == (terminal, net) else n) for t, n in wiring]
            if count == 1:
                wiring.append((terminal, inner))
            wiring += [(common, inner), (other, net)]
            terminal = other
            yield [Reconnect(component.ref, tuple(wiring))]

    # -- ratings ---------------------------------------------------------
    def _rerate(self, finding: Finding) -> Iterator[list[Edit]]:
        rating = rating_attribute(
            finding.values.get("what"), finding.values.get("needed")
        )
        if rating is not None:
            ref = finding.element.split(":", 1)[0]
            yield [SetValues(ref, (rating,))]

    def _other_parts(self, finding: Finding) -> Iterator[list[Edit]]:
        component = self.netlist.component(finding.element.split(":", 1)[0])
        if component is None:
            return
        current = component.part.name if component.part is not None else None
        tried = 0
        for name in sorted(self.netlist.parts):
            part = self.netlist.parts[name]
            if part.kind != component.kind or name == current or tried >= MAX_PARTS:
                continue
            tried += 1
            drop = tuple(
                a.key
                for a in component.attributes
                if a.key.split(".", 1)[0] in part.data
            )
            yield [UsePart(component.ref, name, drop)]


def _spare_poles(component: Component) -> list[tuple[str, str]]:
    """Unused poles: the part's list, else main poles 1-2, 3-4, ...

    Without a pole list, the device has as many main poles as the part's largest
    series row says (terminal-marking convention, parts.md).
    """
    used = {c.terminal for c in component.connections}
    if component.part is not None and component.part.data.get("poles"):
        poles = [(p.common, p.no) for p in component.poles if p.no]
    else:
        rows = component.value("contacts", "series", default=None) or []
        count = max(
            (int(r.get("poles", 0)) for r in rows if isinstance(r, dict)), default=0
        )
        poles = [(str(2 * k - 1), str(2 * k)) for k in range(1, min(count, 4) + 1)]
    return [
        (a, b) for a, b in poles if b is not None and a not in used and b not in used
    ]


def _chain_end(component: Component, names: tuple[str, ...]) -> tuple[str, str] | None:
    """(terminal, net) at one end of a chain of series poles: a net used once."""
    terminals = [t for name in names for t in name.split(":", 1)[-1].split("-")]
    nets = [component.net_of(t) for t in terminals]
    for terminal, net in reversed(list(zip(terminals, nets, strict=True))):
        if net is not None and nets.count(net) == 1:
            return terminal, net
    return None


def _suppressed(load) -> bool:  # type: ignore[no-untyped-def]
    return any(s.functional and not s.conducts for s in load.suppressors)
