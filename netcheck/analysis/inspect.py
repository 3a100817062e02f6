"""What ``netcheck inspect`` shows: the analysis of every switching element as data."""

from __future__ import annotations

from typing import Any

from netcheck.analysis.elements import Analysis
from netcheck.analysis.ratings import Assessment, assess_breaking
from netcheck.analysis.switched import ElementAnalysis
from netcheck.findings import quantity_dict

__all__ = ["inspect_elements", "element_rating"]

_MECHANICAL = ("relay", "contactor", "switch")
_SI = {"voltage": "V", "current": "A", "time_constant": "s", "t95": "s", "energy": "J"}


def element_rating(element: ElementAnalysis) -> Assessment | None:
    """The rating verdict the ratings rules use, or None where none applies."""
    if element.component.kind not in _MECHANICAL or element.supply != "dc":
        return None
    if not element.loads or element.voltage is None or element.load_category is None:
        return None
    return assess_breaking(
        element.component.value("contacts"),
        voltage=element.voltage,
        current=element.current,
        needed=element.load_category,
        time_constant=element.time_constant,
        poles=max(1, element.series_poles),
    )


def _rating_dict(verdict: Assessment | None) -> dict[str, Any] | None:
    if verdict is None or verdict.used is None:
        return None
    used = verdict.used
    return {
        "status": verdict.status,
        "source": used.source,
        "label": used.label,
        "category": used.category,
        "rated_voltage": quantity_dict(used.rated_voltage)
        if used.rated_voltage
        else None,
        "allowed_current": quantity_dict(used.allowed_current.to("A")),
        "margin": round(verdict.margin, 6) if verdict.margin is not None else None,
        "poles": verdict.poles,
        "assumed_series": verdict.assumed_series,
    }


def _entry(element: ElementAnalysis) -> dict[str, Any]:
    entry: dict[str, Any] = {
        "element": element.name,
        "device": element.component.ref,
        "domain": element.domain,
        "supply": element.supply,
    }
    if element.supply != "dc":
        return entry
    for key, unit in _SI.items():
        value = getattr(element, key)
        entry[key] = quantity_dict(value.to(unit)) if value is not None else None
    entry["loads"] = [load.facts.ref for load in element.loads]
    entry["load_category"] = element.load_category
    entry["series_poles"] = element.series_poles
    entry["suppression"] = [
        {
            "kind": s.kind,
            "placement": s.placement,
            "parts": list(s.refs),
            "load": s.load,
            "conducts_normally": s.conducts,
        }
        for s in element.suppression
    ]
    entry["rating"] = _rating_dict(element_rating(element))
    return entry


def inspect_elements(analysis: Analysis) -> list[dict[str, Any]]:
    """One entry per switching element, sorted by name (cli.md, inspect JSON)."""
    return [_entry(e) for e in analysis.sorted_elements()]
