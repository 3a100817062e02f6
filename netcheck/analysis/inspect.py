"""What ``netcheck inspect`` shows: the analysis of every switching element as data."""

from __future__ import annotations

from typing import Any

from netcheck.analysis.elements import Analysis
from netcheck.analysis.ratings import Assessment
from netcheck.analysis.switched import ElementAnalysis
from netcheck.findings import quantity_dict

__all__ = ["inspect_elements"]

_SI = {"voltage": "V", "current": "A", "time_constant": "s", "t95": "s", "energy": "J"}


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


def _entry(element: ElementAnalysis, verdict: Assessment | None) -> dict[str, Any]:
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
    entry["rating"] = _rating_dict(verdict)
    return entry


def inspect_elements(analysis: Analysis) -> list[dict[str, Any]]:
    """One entry per switching element, sorted by name (cli.md, inspect JSON)."""
    return [_entry(e, analysis.verdict(e)) for e in analysis.sorted_elements()]
