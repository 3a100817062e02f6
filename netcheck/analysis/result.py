"""The analysis of a design, as the checks, inspect and size read it."""

from __future__ import annotations

from dataclasses import dataclass, field

import pint

from netcheck.analysis.domain import DomainState
from netcheck.analysis.loads import LoadFacts
from netcheck.analysis.ratings import Assessment
from netcheck.analysis.si import si
from netcheck.analysis.suppression import Chain
from netcheck.analysis.switched import ElementAnalysis, Suppressor
from netcheck.analysis.verdicts import element_rating
from netcheck.graph import Branch, Graph

__all__ = ["Analysis", "LoadInfo"]


@dataclass(frozen=True)
class LoadInfo:
    """A load or coil with its domain, operating point and suppressors."""

    branch: Branch
    facts: LoadFacts
    domain: str | None
    supply: str | None  # dc, ac or None
    current: pint.Quantity | None
    voltage: pint.Quantity | None
    suppressors: tuple[Suppressor, ...]


@dataclass
class Analysis:
    """The analysis of a design: per element, per domain, and the suppressors."""

    graph: Graph
    elements: dict[str, ElementAnalysis]
    states: dict[str, DomainState] = field(default_factory=dict)  # domain name -> state
    chains: dict[str, dict[frozenset[str], list[Chain]]] = field(default_factory=dict)
    wires: dict[str, dict[str, str]] = field(default_factory=dict)
    loads: dict[str, LoadInfo] = field(default_factory=dict)  # by branch key
    # The state with changeover NC sides closed (NO sides open), where one exists.
    alternate_states: dict[str, DomainState] = field(default_factory=dict)

    verdicts: dict[str, Assessment | None] = field(default_factory=dict)
    _shared: dict[tuple, Assessment | None] = field(default_factory=dict, repr=False)

    def verdict(self, element: ElementAnalysis) -> Assessment | None:
        """The element's rating verdict, computed once (rules and inspect share it).

        Elements of the same part breaking the same circuit get the same verdict,
        which keeps large designs of repeated rungs fast.
        """
        if element.name not in self.verdicts:
            key = _verdict_key(element)
            if key not in self._shared:
                self._shared[key] = element_rating(element)
            self.verdicts[element.name] = self._shared[key]
        return self.verdicts[element.name]

    @property
    def reversed_suppressors(self) -> set[str]:
        """References of suppressors across a load that conduct in normal operation."""
        return {
            ref
            for info in self.loads.values()
            for s in info.suppressors
            if s.conducts
            for ref in s.refs
        }

    def sorted_elements(self) -> list[ElementAnalysis]:
        """Elements sorted by name."""
        return [self.elements[k] for k in sorted(self.elements)]


def _magnitude(value: pint.Quantity | None, unit: str) -> float | None:
    return None if value is None else float(f"{si(value, unit):.9g}")


def _verdict_key(element: ElementAnalysis) -> tuple:
    """What a rating verdict depends on: the part's contact data and the break."""
    component = element.component
    inline = tuple(
        sorted(
            (a.key, a.text)
            for a in component.attributes
            if a.key.startswith("contacts.")
        )
    )
    part = component.part.name if component.part is not None else None
    return (
        component.kind if part else component.ref,
        part,
        inline,
        element.supply,
        bool(element.loads),
        element.load_category,
        tuple(sorted({ld.category for ld in element.loads})),
        element.series_poles,
        _magnitude(element.voltage, "V"),
        _magnitude(element.current, "A"),
        _magnitude(element.time_constant, "s"),
    )
