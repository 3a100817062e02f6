"""Clamp rules: an external clamp above an output's internal clamp."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.clamp_order import zener_below
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding

__all__ = ["internal_clamp_overloaded"]


@check("internal-clamp-overloaded")
def internal_clamp_overloaded(ctx: CheckContext) -> Iterator[Finding]:
    """Flag outputs whose internal clamp takes energy meant for an external clamp."""
    for element in ctx.switching_elements(supply="dc"):
        clamp = ctx.internal_clamp(element)
        if clamp is None or not clamp.overloaded:
            continue
        limit = zener_below(element, clamp.voltage)
        refs = sorted({ref for s in clamp.external for ref in s.refs})
        yield ctx.finding(
            element,
            message="no-rating" if clamp.rating is None else "default",
            fix="default" if limit is not None else "diode",
            external=", ".join(refs),
            external_peak=clamp.external_peak,
            internal_clamp=clamp.voltage,
            energy=clamp.energy,
            clamp_energy=clamp.rating,
            zener_max=limit,
        )
