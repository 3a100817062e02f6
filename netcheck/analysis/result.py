"""The analysis of a design, as the checks, inspect and size read it."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

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

_UNSET: Any = object()  # not computed yet (None is a verdict)


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
        name = element.name
        verdicts = self.verdicts
        found = verdicts.get(name, _UNSET)
        if found is _UNSET:
            key = _verdict_key(element)
            shared = self._shared
            found = shared.get(key, _UNSET)
            if found is _UNSET:
                found = shared[key] = element_rating(element)
            verdicts[name] = found
        return found

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


# ``_magnitude`` by (magnitude, identity of the units, unit): the few values a
# design's elements break, met as new quantity objects per element. The units
# are kept beside the entry, so an identity met again is the same object;
# only non-zero floats (no sign of zero, NaN never found again).
_MAGNITUDES: dict[tuple[float, int, str], tuple[object, float | None]] = {}
_MAGNITUDES_LIMIT = 4096


def _magnitude_of(value: pint.Quantity | None, unit: str) -> float | None:
    """``_magnitude(value, unit)``, remembered for float magnitudes."""
    if value is None:
        return None
    magnitude = value._magnitude
    if type(magnitude) is not float or not magnitude:
        return _magnitude(value, unit)
    units = value._units
    key = (magnitude, id(units), unit)
    found = _MAGNITUDES.get(key)
    if found is not None and found[0] is units:
        return found[1]
    if len(_MAGNITUDES) >= _MAGNITUDES_LIMIT:
        _MAGNITUDES.clear()
    made = _magnitude(value, unit)
    _MAGNITUDES[key] = (units, made)
    return made


def _verdict_key(element: ElementAnalysis) -> tuple:
    """What a rating verdict depends on: the part's contact data and the break.

    tests/test_check_shortcuts.py holds it to the key as first written
    (plain sorts, no remembered roundings).
    """
    component = element.component
    inline = [
        (a.key, a.text) for a in component.attributes if a.key.startswith("contacts.")
    ]
    if len(inline) > 1:
        inline.sort()
    part = component.part.name if component.part is not None else None
    loads = element.loads
    if len(loads) == 1:
        categories: tuple = (loads[0].category,)
    else:
        categories = tuple(sorted({ld.category for ld in loads}))
    return (
        component.kind if part else component.ref,
        part,
        tuple(inline),
        element.supply,
        bool(loads),
        element.load_category,
        categories,
        element.series_poles,
        _magnitude_of(element.voltage, "V"),
        _magnitude_of(element.current, "A"),
        _magnitude_of(element.time_constant, "s"),
    )
