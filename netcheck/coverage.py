"""Which switching elements the checks could verify, and which they could not.

"No findings" must never read as "all is well" when nothing could be checked.
Every switching element of a design gets one status:

- ``verified``: in a DC circuit that was analysed, and no check lacked data;
- ``unverified``: a ``rating-data-missing`` finding names it (or the lead pole
  of its series group), or its circuit was not analysed (no supply, or AC and
  DC supplies in one circuit), so no check could judge it;
- ``ac``: on an AC supply, outside the DC switching checks.

The statuses are worked out from every finding of the design, before rule
selection, waivers and baselines: ignoring ``rating-data-missing`` or waiving
it accepts the finding, it does not verify the element.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from netcheck.analysis.result import Analysis
from netcheck.findings import Finding

__all__ = ["ElementStatus", "MISSING_DATA", "NOT_ANALYSED", "element_statuses"]

MISSING_DATA = "rating-data-missing"
NOT_ANALYSED = "not-analysed"


@dataclass(frozen=True, order=True)
class ElementStatus:
    """One switching element: where it is, its status and (if unverified) why."""

    file: str
    line: int
    column: int
    element: str
    status: str  # verified, unverified or ac
    reason: str = ""  # MISSING_DATA or NOT_ANALYSED when unverified


def element_statuses(
    analysis: Analysis, findings: Iterable[Finding]
) -> tuple[ElementStatus, ...]:
    """The status of every switching element of an analysed design, by name."""
    lacking = {f.element for f in findings if f.rule == MISSING_DATA}
    out = []
    for element in analysis.sorted_elements():
        if element.supply is None:
            status, reason = "unverified", NOT_ANALYSED
        elif element.supply == "ac":
            status, reason = "ac", ""
        elif lacking and _lacks(element.name, element.series_elements, lacking):
            status, reason = "unverified", MISSING_DATA
        else:
            status, reason = "verified", ""
        span = element.component.span
        out.append(
            ElementStatus(
                span.file, span.line, span.column, element.name, status, reason
            )
        )
    return tuple(out)


def _lacks(name: str, series: Iterable[str], lacking: set[str]) -> bool:
    """Whether the element or one of its series group has data missing."""
    return name in lacking or any(other in lacking for other in series)
