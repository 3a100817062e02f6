"""Reading a contact's DC rating data at one voltage, and the tests behind them.

Time-constant limits per category (parts.md "Time constant"), the DC-13 T0.95 = 6·P
rule, the log-log ``dc_breaking_curve`` and what each source allows at a voltage.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass, replace
from typing import Any

from netcheck.analysis.constants import T95_PER_TAU
from netcheck.units import Q_, Quantity, format_quantity

__all__ = [
    "T95_PER_TAU",
    "DC13_T95_CAP",
    "CURVE_COVERS",
    "CURVE_TAU_LIMIT",
    "is_ac_category",
    "is_dc_category",
    "category_tau_limit",
    "dc13_t95_limit",
    "rating_time_limits",
    "t95_of",
    "interpolate_curve",
    "RatingUse",
    "dc_rows",
    "has_rating_data",
    "has_dc_data",
    "usable_ratings",
    "max_rated_voltage",
    "at_most",
]
# IEC 60947-5-1 Table 4 note: the DC-13 test circuit has T0.95 = 6·P ms with
# P = Ue·Ie in W, an empirical relation for magnets up to 50 W, so 300 ms at most.
DC13_MS_PER_WATT = 6.0
DC13_T95_CAP = Q_(300.0, "ms")
# L/R of the test circuit behind a rating of each category, in ms.
_TAU_LIMIT_MS: dict[str, float] = {
    # IEC 60947-4-1, conventional operational performance (as parts.md gives them).
    "DC-1": 1.0,
    "DC-3": 2.0,
    "DC-5": 7.5,
    # IEC 60947-5-1 Table 4: DC-12 breaks at L/R 1 ms.
    "DC-12": 1.0,
    # IEC 60947-3 operational performance, mirroring DC-1/3/5 (from memory).
    "DC-21": 1.0,
    "DC-22": 2.0,
    "DC-23": 7.5,
    # IEC 60947-3 Annex D PV categories at L/R 1 ms (from memory, LOW confidence).
    "DC-PV1": 1.0,
    "DC-PV2": 1.0,
}
# IEC 60947-5-1 Table 4: DC-14 makes and breaks at T0.95 = 15 ms.
_T95_LIMIT_MS: dict[str, float] = {"DC-14": 15.0}
# A dc_breaking_curve is measured on a resistive load with one pole (parts.md), so
# it stands for resistive categories only: DC-1 (IEC 60947-4-1, L/R 1 ms) and DC-12
# (IEC 60947-5-1 Table 4, L/R 1 ms).
CURVE_COVERS = frozenset({"DC-1", "DC-12"})
CURVE_TAU_LIMIT = Q_(1.0, "ms")


def _base(category: str) -> str:
    """``DC-21A`` -> ``DC-21``: the A/B duty suffix of IEC 60947-3 keeps the limits."""
    text = category.strip().upper()
    return text[:-1] if text[-1:] in ("A", "B") and text.startswith("DC-2") else text


def is_ac_category(category: str) -> bool:
    """Whether ``category`` is an AC utilization category (AC-1 … AC-15, AC-2x)."""
    return category.strip().upper().startswith("AC-")


def is_dc_category(category: str) -> bool:
    """Whether ``category`` is a DC utilization category (DC-1 … DC-14, DC-2x)."""
    return category.strip().upper().startswith("DC-")


def category_tau_limit(category: str) -> Quantity | None:
    """L/R of the test circuit a rating of ``category`` covers, or None.

    None for AC categories, for DC-6 (tested with lamps, no L/R) and for DC-13,
    whose limit depends on the rated power: use ``dc13_t95_limit`` for it.
    DC-14's T0.95 of 15 ms (IEC 60947-5-1 Table 4) is returned as L/R 15 ms / ln 20.
    """
    base = _base(category)
    if base in _TAU_LIMIT_MS:
        return Q_(_TAU_LIMIT_MS[base], "ms")
    if base in _T95_LIMIT_MS:
        return Q_(_T95_LIMIT_MS[base] / T95_PER_TAU, "ms")
    return None


def dc13_t95_limit(voltage: Quantity, current: Quantity) -> Quantity:
    """T0.95 a DC-13 rating at ``voltage``/``current`` covers: 6·P ms, at most 300 ms.

    IEC 60947-5-1 Table 4 note (P = Ue·Ie in W). Example: 24 V 0.5 A -> 72 ms;
    110 V 0.5 A -> 330 ms capped to 300 ms.
    """
    power = abs((voltage * current).to("W").magnitude)
    return min(Q_(DC13_MS_PER_WATT * power, "ms"), DC13_T95_CAP)


def rating_time_limits(
    category: str, voltage: Quantity, current: Quantity
) -> tuple[Quantity | None, Quantity | None]:
    """(L/R, T0.95) limits a rating row covers; (None, None) if its test has none."""
    if _base(category) == "DC-13":
        t95 = dc13_t95_limit(voltage, current)
        return (t95 / T95_PER_TAU).to("ms"), t95
    tau = category_tau_limit(category)
    if tau is None:
        return None, None
    return tau, (tau * T95_PER_TAU).to("ms")


def t95_of(time_constant: Quantity) -> Quantity:
    """T0.95 = L/R·ln 20 of an RL load (first-order rise to 95 %)."""
    return (time_constant * T95_PER_TAU).to("ms")


def _curve_points(points: Iterable[Mapping[str, Any]]) -> list[tuple[float, float]]:
    return sorted(
        (float(p["voltage"].to("V").magnitude), float(p["current"].to("A").magnitude))
        for p in points
    )


def interpolate_curve(
    points: Iterable[Mapping[str, Any]], voltage: Quantity
) -> Quantity | None:
    """Read the current a ``dc_breaking_curve`` allows at ``voltage`` (None above it).

    parts.md: log-log between neighbouring points, i.e. a power law
    I = I1·(V/V1)^(ln(I2/I1)/ln(V2/V1)); below the lowest point its current;
    above the highest point no rating. A segment with a non-positive value
    cannot be read on log axes and gives its upper point's current (the
    next-higher rated point, as for table rows).
    """
    pts = _curve_points(points)
    v = abs(float(voltage.to("V").magnitude))
    if not pts or v > pts[-1][0]:
        return None
    if v <= pts[0][0]:
        return Q_(pts[0][1], "A")
    for (v1, i1), (v2, i2) in zip(pts, pts[1:], strict=False):
        if not v1 < v <= v2:
            continue
        if v == v2 or min(v1, i1, i2) <= 0.0:
            return Q_(i2, "A")
        exponent = math.log(i2 / i1) / math.log(v2 / v1)
        return Q_(i1 * (v / v1) ** exponent, "A")
    return Q_(pts[-1][1], "A")  # not reached: the segments cover (V_low, V_high]


def at_most(value: Quantity, limit: Quantity) -> bool:
    """``value <= limit``, exactly: a rating holds for values not exceeding it.

    At the rated value the rating holds; one ulp above it does not (tests pin
    both sides, tests/analysis/test_rating_limits.py).
    """
    return bool(value <= limit)


def _fmt(quantity: Quantity | None) -> str:
    return "?" if quantity is None else format_quantity(quantity)


@dataclass(frozen=True)
class RatingUse:
    """One rating read at the circuit voltage: what it allows and under which test.

    ``source``: "ratings", "dc_breaking_curve", "breaking_power", "series", or
    "per-pole" (the V/n assumption), in which case ``basis`` names the per-pole data
    it rests on; otherwise ``basis == source``. ``category`` is None for a curve or
    a breaking power. ``rated_voltage``: the rated point used (next higher row or
    curve point, or a power rating's voltage_max). ``pole_voltage``: the voltage it
    is judged at (V, or V/n). ``tau_limit``/``t95_limit``: L/R and T0.95 of the
    rating's test condition (None: the test has none). ``label`` names it for notes.
    """

    source: str
    basis: str
    category: str | None
    rated_voltage: Quantity | None
    pole_voltage: Quantity
    allowed_current: Quantity
    tau_limit: Quantity | None
    t95_limit: Quantity | None
    poles: int
    power: Quantity | None
    label: str


def _rows(contacts: Mapping[str, Any], key: str) -> tuple[Mapping[str, Any], ...]:
    return tuple(contacts.get(key) or ())


def dc_rows(contacts: Mapping[str, Any], poles: int) -> list[Mapping[str, Any]]:
    """DC table rows for ``poles`` in series (a row without ``poles`` is for one).

    For two or more poles these are the ``series`` rows and any ``ratings`` row
    that names that number of ``poles``.
    """
    rows = [
        r
        for r in _rows(contacts, "ratings")
        if is_dc_category(str(r["category"])) and int(r.get("poles", 1)) == poles
    ]
    if poles > 1:
        rows += [r for r in _rows(contacts, "series") if int(r["poles"]) == poles]
    return rows


def has_rating_data(contacts: Mapping[str, Any] | None) -> bool:
    """Whether the contact data hold any rating at all (AC or DC)."""
    keys = ("ratings", "dc_breaking_curve", "breaking_power", "series")
    return bool(contacts) and any(_rows(contacts or {}, key) for key in keys)


def has_dc_data(contacts: Mapping[str, Any] | None) -> bool:
    """Whether the contact data hold any DC rating (row, curve, power or series)."""
    if not contacts:
        return False
    rows = _rows(contacts, "ratings")
    dc_row = any(is_dc_category(str(r["category"])) for r in rows)
    others = ("dc_breaking_curve", "breaking_power", "series")
    return dc_row or any(_rows(contacts, key) for key in others)


def _row_use(
    row: Mapping[str, Any], voltage: Quantity, source: str, poles: int
) -> RatingUse:
    category = str(row["category"])
    tau, t95 = rating_time_limits(category, row["voltage"], row["current"])
    where = f"{poles} poles in series, " if poles > 1 else ""
    label = f"{where}{category} {_fmt(row['voltage'])} {_fmt(row['current'])}"
    current = row["current"].to("A")
    return RatingUse(
        source=source,
        basis=source,
        category=category,
        rated_voltage=row["voltage"],
        pole_voltage=voltage,
        allowed_current=current,
        tau_limit=tau,
        t95_limit=t95,
        poles=poles,
        power=None,
        label=label,
    )


def _row_uses(
    rows: Sequence[Mapping[str, Any]], voltage: Quantity, source: str, poles: int
) -> list[RatingUse]:
    """Per category, the row at the next higher rated voltage (parts.md: conservative).

    Two rows of one category at one voltage: the lower current (conservative).
    """
    uses = []
    for category in dict.fromkeys(str(r["category"]) for r in rows):
        above = [
            r
            for r in rows
            if r["category"] == category and at_most(voltage, r["voltage"])
        ]
        if above:
            row = min(above, key=lambda r: (r["voltage"], r["current"]))
            uses.append(_row_use(row, voltage, source, poles))
    return uses


def _curve_use(
    points: Sequence[Mapping[str, Any]], voltage: Quantity
) -> RatingUse | None:
    allowed = interpolate_curve(points, voltage)
    if allowed is None:
        return None
    upper = min(p["voltage"] for p in points if at_most(voltage, p["voltage"]))
    label = f"dc_breaking_curve ({_fmt(allowed)} at {_fmt(voltage)}, resistive)"
    t95 = t95_of(CURVE_TAU_LIMIT)
    return RatingUse(
        source="dc_breaking_curve",
        basis="dc_breaking_curve",
        category=None,
        rated_voltage=upper,
        pole_voltage=voltage,
        allowed_current=allowed,
        tau_limit=CURVE_TAU_LIMIT,
        t95_limit=t95,
        poles=1,
        power=None,
        label=label,
    )


def _power_uses(
    rows: Sequence[Mapping[str, Any]], voltage: Quantity, contact_max: Quantity | None
) -> list[RatingUse]:
    """``breaking_power`` rows within their voltage_max: current = power / voltage."""
    uses = []
    for row in rows:
        limit = row.get("voltage_max", contact_max)
        if limit is not None and not at_most(voltage, limit):
            continue
        tau = row["time_constant"].to("ms")
        volts = float(voltage.to("V").magnitude)
        watts = float(row["power"].to("W").magnitude)
        allowed = Q_(watts / volts if volts > 0 else math.inf, "A")
        label = f"{_fmt(row['power'])} at L/R {_fmt(tau)}"
        uses.append(
            RatingUse(
                source="breaking_power",
                basis="breaking_power",
                category=None,
                rated_voltage=limit,
                pole_voltage=voltage,
                allowed_current=allowed,
                tau_limit=tau,
                t95_limit=t95_of(tau),
                poles=1,
                power=row["power"],
                label=label,
            )
        )
    return uses


def _pole_uses(contacts: Mapping[str, Any], voltage: Quantity) -> list[RatingUse]:
    """Everything one pole is rated for at ``voltage``, capped by ``voltage_max``."""
    contact_max = contacts.get("voltage_max")
    if contact_max is not None and not at_most(voltage, contact_max):
        return []
    uses = _row_uses(dc_rows(contacts, 1), voltage, "ratings", 1)
    curve = _curve_use(_rows(contacts, "dc_breaking_curve"), voltage)
    uses += [curve] if curve is not None else []
    return uses + _power_uses(_rows(contacts, "breaking_power"), voltage, contact_max)


def usable_ratings(
    contacts: Mapping[str, Any], voltage: Quantity, poles: int
) -> tuple[list[RatingUse], bool]:
    """Ratings usable at ``voltage`` for ``poles`` in series; True if V/n is assumed.

    parts.md: use the ``series`` row for n where one exists; without one, each
    pole is assumed to see V/n (first-order) and the per-pole data are read there.
    """
    if poles == 1:
        return _pole_uses(contacts, voltage), False
    rows = dc_rows(contacts, poles)
    if rows:
        return _row_uses(rows, voltage, "series", poles), False
    per_pole = _pole_uses(contacts, voltage / poles)
    label = f", per pole at V/{poles}"
    assumed = [
        replace(u, source="per-pole", poles=poles, label=u.label + label)
        for u in per_pole
    ]
    return assumed, True


def max_rated_voltage(contacts: Mapping[str, Any], poles: int) -> Quantity | None:
    """Highest circuit voltage the arrangement has a DC rating for.

    None if it has none, or if a breaking power has no voltage limit at all.
    Under the V/n assumption: n times the per-pole maximum.
    """
    rows = dc_rows(contacts, poles) if poles > 1 else []
    if rows:
        return max(r["voltage"] for r in rows)
    contact_max = contacts.get("voltage_max")
    tops = [r["voltage"] for r in dc_rows(contacts, 1)]
    tops += [p["voltage"] for p in _rows(contacts, "dc_breaking_curve")]
    for row in _rows(contacts, "breaking_power"):
        limit = row.get("voltage_max", contact_max)
        if limit is None:
            return None
        tops.append(limit)
    if not tops:
        return None
    top = max(tops) if contact_max is None else min(max(tops), contact_max)
    return Q_(float(top.to("V").magnitude) * poles, "V")
