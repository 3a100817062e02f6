"""What a check sees: the design, its analysis, options, and a finding factory.

Physics that several checks share (the suppressors fitted, the shorts of the
solved states) lives in ``netcheck.analysis``; the context computes each once
per design and hands it out through an accessor, so checks neither read
solver state nor import one another.
"""

from __future__ import annotations

from collections.abc import Callable, Hashable, Iterator, Mapping
from dataclasses import dataclass, field
from typing import Any

import pint

from netcheck.analysis import fault
from netcheck.analysis import fitted as fitting
from netcheck.analysis import shorts as short_circuits
from netcheck.analysis.clamp_order import InternalClamp, internal_clamp_takes
from netcheck.analysis.elements import Analysis
from netcheck.analysis.ratings import Assessment
from netcheck.analysis.result import LoadInfo
from netcheck.analysis.si import quantity_like
from netcheck.analysis.supplies import SUPPLY_NOTES, ranged_supply
from netcheck.analysis.switched import ElementAnalysis, SwitchedLoad
from netcheck.analysis.transients import OpeningTransient
from netcheck.analysis.verdicts import breaks_something
from netcheck.catalogue import RuleMeta, all_margins
from netcheck.findings import Finding, Severity
from netcheck.graph import Branch, Domain, Graph
from netcheck.model import Component, Netlist
from netcheck.ranges import ValueRange, supply_range
from netcheck.units import Q_

__all__ = ["CheckContext", "Anchor"]

Anchor = ElementAnalysis | Component | tuple[Component, str]

_UNSET: Any = object()  # not computed yet (None is a result)
_NONE_YET: dict[int, Any] = {}  # no result of a kind yet (never written)


@dataclass
class CheckContext:
    """The read-only view a check gets; ``rule`` is set by the runner per check."""

    netlist: Netlist
    graph: Graph
    analysis: Analysis
    catalogue: Mapping[str, RuleMeta]
    margins: Mapping[str, float]
    rule: str = ""
    # Results several checks share (e.g. the suppressors fitted), computed once.
    memo: dict[Hashable, Any] = field(default_factory=dict)

    def switching_elements(
        self, supply: str | None = None, kinds: frozenset[str] | None = None
    ) -> Iterator[ElementAnalysis]:
        """Switching elements sorted by name, optionally of one supply and kinds."""
        # Every check walks these; sorted and filtered once per design.
        key = ("elements", supply, kinds)
        return iter(self._memo(key, lambda: self._elements(supply, kinds)))

    def _elements(
        self, supply: str | None, kinds: frozenset[str] | None
    ) -> tuple[ElementAnalysis, ...]:
        ordered = self._memo("sorted-elements", self.analysis.sorted_elements)
        return tuple(
            e
            for e in ordered
            if (supply is None or e.supply == supply)
            and (kinds is None or e.component.kind in kinds)
        )

    def loads(self) -> Iterator[LoadInfo]:
        """Every load and coil the analysis found, sorted by branch key."""
        ordered = self._memo(
            "loads", lambda: [i for _, i in sorted(self.analysis.loads.items())]
        )
        return iter(ordered)

    def components(self, *kinds: str) -> Iterator[Component]:
        """Components of the given kinds (all if none), in file order."""
        for component in self.netlist.components:
            if not kinds or component.kind in kinds:
                yield component

    def component(self, ref: str) -> Component | None:
        """The component of a reference (one index per design), or None."""
        index = self._memo(
            "by-ref", lambda: {c.ref: c for c in self.netlist.components}
        )
        return index.get(ref)  # type: ignore[no-any-return]

    def domains(self) -> Iterator[Domain]:
        """Supply domains."""
        yield from self.graph.domains

    def branches(self, *roles: str) -> Iterator[Branch]:
        """Branches of the given roles (all if none)."""
        for branch in self.graph.branches:
            if not roles or branch.role in roles:
                yield branch

    def nets(self) -> Iterator[tuple[str, list[tuple[Component, str]]]]:
        """Every net with its connections, sorted by name."""
        for net in sorted(self.graph.connections):
            yield net, self.graph.connections[net]

    def ranged_supply(self, component: Component) -> tuple[str, ValueRange] | None:
        """``ranged_supply`` of a component, once per set of domains it touches.

        The answer depends only on the domains of the component's nets, and a
        design has far fewer of those than components.
        """
        if not self._memo("any-range", self._any_range):
            return None  # no supply of any domain states a range
        ranged = self._memo("ranged", dict)
        domain_of = self.graph.domain_of
        key = tuple(id(domain_of.get(c.net)) for c in component.connections)
        if key not in ranged:
            ranged[key] = ranged_supply(self.graph, component)
        return ranged[key]  # type: ignore[no-any-return]

    def _any_range(self) -> bool:
        domains = {id(d): d for d in self.graph.domain_of.values()}.values()
        return any(supply_range(s) for d in domains for s in d.supplies)

    def shared(self, name: str, compute: Callable[[], Any]) -> Any:
        """What ``compute`` returns, computed once per design.

        For a check module's own result that several of its rules read; the
        name is the module's to choose (``"module:what"`` keeps them apart).
        """
        return self._memo(("shared", name), compute)

    def _memo(self, name: Hashable, compute: Callable[[], Any]) -> Any:
        if name not in self.memo:
            self.memo[name] = compute()
        return self.memo[name]

    def _per_element(
        self,
        name: str,
        element: ElementAnalysis,
        compute: Callable[[ElementAnalysis], Any],
    ) -> Any:
        """``compute(element)``, once per element.

        Keyed by identity: the analysis holds every element for as long as the
        context lives.
        """
        results = self.memo.get(name)
        if results is None:
            results = self.memo[name] = {}
        result = results.get(id(element), _UNSET)
        if result is _UNSET:
            result = results[id(element)] = compute(element)
        return result

    def unsuppressed_loads(self, element: ElementAnalysis) -> list[SwitchedLoad]:
        """``fitted.unsuppressed_loads(element)``: do not change the list.

        It reads only the element's ``suppression`` and ``loads`` tuples, and
        the elements of a series chain share theirs (one rung's interlocks
        switch the one coil), so it is computed once per pair of tuples, keyed
        by their identities: the analysis holds them while the context lives.
        tests/test_check_shortcuts.py compares it with the function.
        """
        results = self.memo.get("unsuppressed")
        if results is None:
            results = self.memo["unsuppressed"] = {}
        key = (id(element.suppression), id(element.loads))
        found = results.get(key)
        if found is None:
            found = results[key] = fitting.unsuppressed_loads(element)
        return found  # type: ignore[no-any-return]

    def fitted_suppressors(self) -> list[fitting.Fitted]:
        """Every effective suppressor of a DC element's circuit, once each."""
        return self._memo(  # type: ignore[no-any-return]
            "fitted", lambda: fitting.fitted_suppressors(self.analysis)
        )

    def service_voltage(self, component: Component) -> pint.Quantity | None:
        """The largest voltage on a part in service: energised or open-circuit.

        Wherever it sits (straight across the rails, say), a part sees its
        closed-state voltage at least.
        """
        worst = self._memo(
            "service", lambda: fitting.service_voltages(self.fitted_suppressors())
        ).get(component.ref)
        standing = fitting.standing_voltage(self.analysis, component)
        if worst is None or (standing is not None and standing > worst):
            return standing
        return worst  # type: ignore[no-any-return]

    def shorts(self) -> list[short_circuits.Short]:
        """Every short across a supply in the solved states, each supply once."""
        return self._memo(  # type: ignore[no-any-return]
            "shorts", lambda: short_circuits.supply_shorts(self.analysis)
        )

    def reversed_diodes(self) -> list[short_circuits.ReversedDiode]:
        """Polarized suppressors conducting across energised DC loads."""
        return self._memo(  # type: ignore[no-any-return]
            "reversed", lambda: short_circuits.reversed_diodes(self.analysis)
        )

    def in_breakdown(self) -> set[str]:
        """Zeners and TVS that conduct in reverse (breakdown) in service."""
        return self._memo(  # type: ignore[no-any-return]
            "breakdown", lambda: short_circuits.in_breakdown(self.analysis)
        )

    def feeds(self) -> fault.Feeds:
        """Which nets reach a supply terminal through conductors and contacts."""
        return self._memo("feeds", lambda: fault.Feeds(self.graph))  # type: ignore[no-any-return]

    def verdict(self, element: ElementAnalysis) -> Assessment | None:
        """The rating verdict of an element that breaks a current (series poles too)."""
        found = self.memo.get("verdicts", _NONE_YET).get(id(element), _UNSET)
        if found is _UNSET:  # the rules ask several times per element
            found = self._per_element("verdicts", element, self._verdict)
        return found  # type: ignore[no-any-return]

    def _verdict(self, element: ElementAnalysis) -> Assessment | None:
        if not breaks_something(element):
            return None
        return self.analysis.verdict(element)

    def element_peak(self, element: ElementAnalysis) -> OpeningTransient | None:
        """The opening transient the element itself sees (``fitted.element_peak``)."""
        found = self.memo.get("peaks", _NONE_YET).get(id(element), _UNSET)
        if found is _UNSET:
            found = self._per_element("peaks", element, fitting.element_peak)
        return found  # type: ignore[no-any-return]

    def internal_clamp(self, element: ElementAnalysis) -> InternalClamp | None:
        """An output's internal clamp where it conducts first (``clamp_order``)."""
        return self._per_element("clamps", element, internal_clamp_takes)  # type: ignore[no-any-return]

    def option(self, name: str) -> float:
        """A margin: from configuration, else the rule YAML's default."""
        options = self._memo("options", dict)
        if name not in options:
            if name in self.margins:
                options[name] = float(self.margins[name])
            else:
                options[name] = all_margins(self.catalogue)[name].default
        return options[name]  # type: ignore[no-any-return]

    def scaled(self, value: pint.Quantity, margin: str) -> pint.Quantity:
        """``value * self.option(margin)``, bit for bit, without pint's operator.

        pint multiplies a quantity by a number as magnitude times number in
        the quantity's own units; the rules do this for every rating they
        judge, so it is worth skipping pint's dispatch.
        """
        return quantity_like(value, value._magnitude * self.option(margin))

    def _share_quantities(self, values: dict[str, Any]) -> None:
        """Put one quantity object per float value and units into ``values``.

        A heavy report's tens of thousands of findings hold a few distinct
        quantities (the same supply, current, energy); quantities are never
        changed, and one that reads the same (its units, its magnitude and the
        sign of a zero: all any output reads) stands in for each copy. Zeros
        and units met as different objects are simply not shared.
        """
        shared = self.memo.get("quantities")
        if shared is None:
            shared = self.memo["quantities"] = {}
        keep = shared.setdefault
        for name, value in values.items():
            if type(value) is Q_:
                magnitude = value._magnitude
                # Non-zero (no sign of zero to keep) and not NaN (never equal).
                if type(magnitude) is float and magnitude and magnitude == magnitude:
                    # The units by identity: the quantity kept holds them, so
                    # the identity is not reused while the memo lives.
                    same = keep((magnitude, id(value._units)), value)
                    if same is not value:
                        values[name] = same  # a key already there: no resize

    def finding(
        self,
        anchor: Anchor,
        *,
        message: str = "default",
        fix: str = "default",
        key: str = "",
        severity: Severity | None = None,
        rule: str | None = None,
        supply_end: str = "highest",
        **values: Any,
    ) -> Finding:
        """A finding of the current rule, its templates filled from ``values``.

        ``severity`` raises or lowers the rule's default where the rule's YAML
        says the severity depends on the case; ``rule`` lets a check report
        ``rating-data-missing`` when it cannot decide. A finding with computed
        values in a domain whose supply states a range says which end of the
        range it was judged at: ``supply_end`` "highest" (the analysis runs there)
        or "lowest".
        """
        meta = self.catalogue[rule or self.rule]
        if isinstance(anchor, ElementAnalysis):
            component, element = anchor.component, anchor.name
        elif isinstance(anchor, tuple):
            component, element = anchor
        else:
            component, element = anchor, anchor.ref
        self._share_quantities(values)
        note = ""
        ranged = self.ranged_supply(component)
        if ranged is not None and any(
            isinstance(v, pint.Quantity) for v in values.values()
        ):
            note = SUPPLY_NOTES[supply_end]
            values = {
                **values,
                "range_supply": ranged[0],
                "supply_lowest": ranged[1].low,
                "supply_highest": ranged[1].high,
            }
        return meta.finding(
            component.span,
            element,
            values,
            message=message,
            fix=fix,
            severity=severity,
            key=key,
            ref=component.ref,
            note=note,
            # ``values`` is this call's own keyword dict (or the one made
            # above): no other holder, no copy needed.
            copy_values=False,
        )
