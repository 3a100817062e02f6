"""Which DC rating of a contact applies to a break, and whether it holds.

Built to the "Rules for reading ratings" of the part-library spec (parts.md):
category coverage, voltage between rated points, time constant, series poles.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, replace
from typing import Any

from netcheck.analysis.loads import covers
from netcheck.analysis.ratings_tables import (
    CURVE_COVERS,
    T95_PER_TAU,
    RatingUse,
    at_most,
    category_tau_limit,
    dc13_t95_limit,
    has_dc_data,
    has_rating_data,
    interpolate_curve,
    is_ac_category,
    is_dc_category,
    max_rated_voltage,
    rating_time_limits,
    t95_of,
    usable_ratings,
)
from netcheck.units import Q_, Quantity, format_quantity

__all__ = [
    "STATUSES",
    "SOURCES",
    "MAX_POLES",
    "T95_PER_TAU",
    "RatingUse",
    "Assessment",
    "assess_breaking",
    "poles_needed",
    "has_dc_data",
    "has_rating_data",
    "is_ac_category",
    "is_dc_category",
    "category_tau_limit",
    "dc13_t95_limit",
    "rating_time_limits",
    "interpolate_curve",
    "t95_of",
]

STATUSES = ("ok", "no-data", "ac-only", "voltage-over", "current-over")
SOURCES = ("ratings", "dc_breaking_curve", "breaking_power", "series", "per-pole")
MAX_POLES = 6  # poles_needed tries 1 … MAX_POLES poles of the device in series
_ZERO_V = Q_(0.0, "V")


@dataclass(frozen=True)
class Assessment:
    """The verdict on one break by one pole, or by n poles of one device in series.

    ``status``: one of ``STATUSES``. ``category_mismatch``: no DC rating usable at
    this voltage covers ``needed``; the weaker one was used (``notes`` say so).
    ``time_constant_over``: the load's L/R exceeds the test condition of ``used``.
    ``allowed_current``: what ``used`` allows at the circuit voltage; ``margin`` =
    allowed / breaking current. ``assumed_series``: no ``series`` row for n, so
    each pole was assumed to see V/n. ``max_dc_voltage``: the highest circuit
    voltage the arrangement has a DC rating for (None: none, or unbounded).
    ``poles_needed``: fewest poles in series reaching "ok" (None: none up to
    ``MAX_POLES``). ``rated_categories``: DC categories rated for the arrangement.
    ``missing``: values absent from the data or the call.
    """

    status: str
    needed: str
    poles: int
    category_mismatch: bool = False
    time_constant_over: bool = False
    used: RatingUse | None = None
    allowed_current: Quantity | None = None
    margin: float | None = None
    assumed_series: bool = False
    max_dc_voltage: Quantity | None = None
    poles_needed: int | None = None
    rated_categories: tuple[str, ...] = ()
    missing: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()

    @property
    def is_ok(self) -> bool:
        """Status "ok" (the category and time-constant flags may still be set)."""
        return self.status == "ok"


def _fmt(quantity: Quantity | None) -> str:
    return "?" if quantity is None else format_quantity(quantity)


def _magnitude(quantity: Quantity, unit: str) -> Quantity:
    """``|quantity|`` in ``unit``: a break is judged by magnitudes."""
    return Q_(abs(float(quantity.to(unit).magnitude)), unit)


def _covers(use: RatingUse, needed: str) -> bool:
    """Whether ``use`` covers a load needing ``needed`` (parts.md categories).

    Rows by ``loads.covers``; the resistive curve covers DC-1/DC-12 only; a
    breaking power ("W at L/R") any DC load, its L/R deciding the rest.
    """
    if use.basis == "breaking_power":
        return is_dc_category(needed)
    if use.basis == "dc_breaking_curve":
        return needed in CURVE_COVERS
    return use.category is not None and covers(use.category, needed)


def _tau_ok(use: RatingUse, tau: Quantity | None) -> bool:
    return tau is None or use.tau_limit is None or at_most(tau, use.tau_limit)


def _choose(
    uses: list[RatingUse], needed: str, tau: Quantity | None
) -> tuple[RatingUse, bool]:
    """Pick the most favourable applicable rating; True if of a weaker category.

    Applicable first by category, then by time constant; among equals the highest
    allowed current (the first listed on a tie).
    """
    covering = [u for u in uses if _covers(u, needed)]
    pool = covering or uses
    best = max(pool, key=lambda u: (_tau_ok(u, tau), u.allowed_current.magnitude))
    return best, not covering


def _time_notes(use: RatingUse, tau: Quantity | None) -> tuple[list[str], list[str]]:
    """Say how the load's time constant compares with ``use``: (notes, missing)."""
    if use.tau_limit is None:
        return [], []
    limit = f"L/R {_fmt(use.tau_limit)}, T0.95 {_fmt(use.t95_limit)}"
    if tau is None:
        note = f"load L/R unknown: the limit of {use.label} ({limit}) was not checked"
        return [note], ["load time constant"]
    if _tau_ok(use, tau):
        return [], []
    load = f"L/R {_fmt(tau)} (T0.95 {_fmt(t95_of(tau))})"
    return [f"load {load} exceeds the test condition of {use.label} ({limit})"], []


def _source_notes(
    use: RatingUse, assumed: bool, mismatch: bool, needed: str, here: tuple[str, ...]
) -> list[str]:
    """Say which data the verdict rests on and what was assumed."""
    notes = []
    if assumed:
        notes.append(
            f"no series rating for {use.poles} poles: each pole assumed to see "
            f"V/{use.poles} = {_fmt(use.pole_voltage)} (assumed, not rated)"
        )
    if mismatch:
        notes.append(
            f"{needed} needed but no DC rating at {_fmt(use.pole_voltage)} covers it "
            f"(rated there: {', '.join(here)}); proceeding with the weaker {use.label}"
        )
    if use.basis == "dc_breaking_curve":
        notes.append(
            "dc_breaking_curve is for resistive loads: DC-1/DC-12 type, L/R up to "
            "1 ms (IEC 60947-4-1 DC-1; IEC 60947-5-1 Table 4 DC-12)"
        )
    if use.basis == "breaking_power" and use.rated_voltage is None:
        notes.append(
            f"{use.label} has no voltage_max (nor has the contact): applied "
            "without a voltage limit"
        )
    return notes


def _over_voltage(
    base: Assessment, voltage: Quantity, every: list[RatingUse]
) -> Assessment:
    where = f"{base.poles} poles in series" if base.poles > 1 else "one pole"
    note = f"{_fmt(voltage)} is above every DC voltage rated for {where}"
    if base.max_dc_voltage is not None:
        note += f" (highest {_fmt(base.max_dc_voltage)})"
    mismatch = not any(_covers(u, base.needed) for u in every)
    return replace(
        base, status="voltage-over", category_mismatch=mismatch, notes=(note,)
    )


def _verdict(
    base: Assessment,
    uses: list[RatingUse],
    current: Quantity | None,
    tau: Quantity | None,
) -> Assessment:
    """Judge the break against the most favourable usable rating."""
    use, mismatch = _choose(uses, base.needed, tau)
    time_notes, missing = _time_notes(use, tau)
    here = tuple(dict.fromkeys(u.category or u.basis for u in uses))
    notes = _source_notes(use, base.assumed_series, mismatch, base.needed, here)
    allowed = use.allowed_current
    status, margin = "no-data", None
    if current is None:
        missing = ["breaking current", *missing]
    else:
        amps = _magnitude(current, "A")
        status = "ok" if at_most(amps, allowed) else "current-over"
        ratio = allowed.to("A").magnitude / amps.magnitude if amps.magnitude else None
        margin = math.inf if ratio is None else float(ratio)
    return replace(
        base,
        status=status,
        category_mismatch=mismatch,
        used=use,
        time_constant_over=not _tau_ok(use, tau),
        allowed_current=allowed,
        margin=margin,
        missing=tuple(missing),
        notes=tuple(notes + time_notes),
    )


def _assess(
    contacts: Mapping[str, Any] | None,
    voltage: Quantity,
    current: Quantity | None,
    needed: str,
    tau: Quantity | None,
    poles: int,
) -> Assessment:
    """Assess one arrangement (``poles_needed`` is left unset)."""
    if not contacts:
        return Assessment("no-data", needed, poles, missing=("contacts",))
    if not has_rating_data(contacts):
        what = "contacts.ratings / dc_breaking_curve / breaking_power / series"
        return Assessment("no-data", needed, poles, missing=(what,))
    if not has_dc_data(contacts):
        return Assessment("ac-only", needed, poles)
    every, assumed = usable_ratings(contacts, _ZERO_V, poles)  # one per source
    if not every:
        missing = (f"DC rating for {poles} pole(s)",)
        return Assessment("no-data", needed, poles, missing=missing)
    base = Assessment(
        "no-data",
        needed,
        poles,
        assumed_series=assumed,
        max_dc_voltage=max_rated_voltage(contacts, poles),
        rated_categories=tuple(dict.fromkeys(u.category for u in every if u.category)),
    )
    uses, _ = usable_ratings(contacts, voltage, poles)
    if not uses:
        return _over_voltage(base, voltage, every)
    return _verdict(base, uses, current, tau)


def assess_breaking(
    contacts: Mapping[str, Any] | None,
    *,
    voltage: Quantity,
    current: Quantity | None,
    needed: str,
    time_constant: Quantity | None,
    poles: int = 1,
) -> Assessment:
    """Judge breaking ``current`` at ``voltage`` with ``poles`` of one device in series.

    ``contacts``: a part's converted ``contacts`` mapping. ``needed``: the category
    the load needs (``loads.category_for``). ``time_constant``: the largest L/R of
    the switched loads (0 s resistive, None unknown). Magnitudes are used. Rules:
    parts.md "Rules for reading ratings"; DC-13 T0.95 per IEC 60947-5-1 Table 4,
    DC-1/3/5 L/R per IEC 60947-4-1.

    Example: DC-13 24 V 1 A breaking 24 V 0.5 A at L/R 10 ms -> "ok", margin 2.0
    (T0.95 29.96 ms <= 6 · 24 W = 144 ms).
    """
    if poles < 1:
        raise ValueError(f"poles must be at least 1, got {poles}")
    needed = needed.strip().upper()
    tau = None if time_constant is None else _magnitude(time_constant, "ms")
    volts = _magnitude(voltage, "V")
    result = _assess(contacts, volts, current, needed, tau, poles)
    if current is None or not has_dc_data(contacts) or result.is_ok:
        # An arrangement that breaks it needs no more poles; fixes ask otherwise.
        return result if not result.is_ok else replace(result, poles_needed=poles)
    fewest = poles_needed(contacts, voltage=volts, current=current, needed=needed)
    return replace(result, poles_needed=fewest)


def poles_needed(
    contacts: Mapping[str, Any] | None,
    *,
    voltage: Quantity,
    current: Quantity,
    needed: str,
    max_poles: int = MAX_POLES,
) -> int | None:
    """Fewest poles of the device in series whose arrangement reaches status "ok".

    By the ``series`` row for each n where one exists, else by the per-pole V/n
    assumption (parts.md). The time constant is left out: it does not change with
    the number of poles. None if no number up to ``max_poles`` works.
    """
    volts = _magnitude(voltage, "V")
    category = needed.strip().upper()
    for n in range(1, max_poles + 1):
        if _assess(contacts, volts, current, category, None, n).is_ok:
            return n
    return None
