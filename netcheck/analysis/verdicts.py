"""The rating verdict of one switching element, as the rules and inspect read it."""

from __future__ import annotations

from netcheck.analysis.ratings import Assessment, assess_breaking
from netcheck.analysis.switched import ElementAnalysis
from netcheck.kinds import MECHANICAL_KINDS

__all__ = [
    "element_rating",
    "breaks_something",
    "arrangement_lead",
    "fits_device",
    "device_poles",
    "rating_values",
]


def element_rating(element: ElementAnalysis) -> Assessment | None:
    """The verdict on a mechanical DC element's break, or None where none applies."""
    if element.component.kind not in MECHANICAL_KINDS or element.supply != "dc":
        return None
    if not element.loads or element.voltage is None or element.load_category is None:
        return None

    def judged(needed: str) -> Assessment:
        return assess_breaking(
            element.component.value("contacts"),
            voltage=element.voltage,  # type: ignore[arg-type]
            current=element.current,
            needed=needed,
            time_constant=element.time_constant,
            poles=max(1, element.series_poles),
        )

    verdict = judged(element.load_category)
    # Categories of several loads need not nest (DC-14 does not cover DC-13, nor
    # DC-13 DC-14): the rating must cover each, so the first one it does not
    # cover is the verdict (its ``needed`` names that load's category).
    for other in sorted({ld.category for ld in element.loads} - {verdict.needed}):
        if verdict.category_mismatch or verdict.status in ("ac-only", "no-data"):
            break
        alternative = judged(other)
        if alternative.category_mismatch:
            return alternative
    return verdict


def breaks_something(element: ElementAnalysis) -> bool:
    """Whether the element carries current that it must break."""
    return (
        bool(element.loads)
        and element.current is not None
        and element.current.magnitude > 1e-9
    )


def arrangement_lead(element: ElementAnalysis) -> bool:
    """Series poles of one device are judged once, on the first of them."""
    return not element.series_elements or element.name == element.series_elements[0]


def device_poles(element: ElementAnalysis) -> int:
    """How many poles the device is known to have.

    The part's pole list, else the largest ``series`` row (a row for n poles says
    the device has n), else the poles the design itself wires; at least one.
    """
    component = element.component
    listed = component.part.data.get("poles") if component.part else None
    if listed:
        return len(listed)
    rows = component.value("contacts", "series", default=None) or []
    rated = max(
        (int(r.get("poles", 0)) for r in rows if isinstance(r, dict)), default=0
    )
    return max(1, rated, len(component.poles))


def fits_device(element: ElementAnalysis, poles_needed: int | None) -> bool:
    """Whether the device is known to have the poles a series-pole fix asks for.

    A device with one known pole (a protection relay's output contact rated in W
    at L/R, a single-output device) is never told to wire poles it has not got.
    """
    return bool(poles_needed) and poles_needed <= device_poles(element)


def rating_values(element: ElementAnalysis, verdict: Assessment) -> dict:
    """The values every rating message and fix template may use."""
    used = verdict.used
    return {
        "voltage": element.voltage,
        "current": element.current,
        "category": element.load_category,
        "allowed": verdict.allowed_current,
        "rating": used.label if used is not None else None,
        "poles": verdict.poles,
        "poles_needed": verdict.poles_needed or None,
        "assumed": " (series rating assumed: V/n per pole, not rated)"
        if verdict.assumed_series
        else "",
    }
