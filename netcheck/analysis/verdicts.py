"""The rating verdict of one switching element, as the rules and inspect read it."""

from __future__ import annotations

from netcheck.analysis.ratings import Assessment, assess_breaking
from netcheck.analysis.switched import ElementAnalysis
from netcheck.kinds import MECHANICAL_KINDS

__all__ = ["element_rating"]


def element_rating(element: ElementAnalysis) -> Assessment | None:
    """The verdict on a mechanical DC element's break, or None where none applies."""
    if element.component.kind not in MECHANICAL_KINDS or element.supply != "dc":
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
