"""Making (closing) current of DC contacts against their making capacity."""

from __future__ import annotations

import math
from collections.abc import Iterator

from netcheck.analysis.making import Charge, Inrush, closing_inrush
from netcheck.analysis.switched import ElementAnalysis
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding, Severity
from netcheck.kinds import MECHANICAL_KINDS
from netcheck.units import Q_

__all__ = ["making_over_rating", "MAKING_MULTIPLES", "MOTOR_START_MULTIPLE"]

# Making current over Ie in the making-capacity tests: IEC 60947-4-1 Table 7
# (DC-1 1.5, DC-3 4, DC-5 4, DC-6 1.5) and IEC 60947-5-1 Table 4 (DC-12 1,
# DC-13 1, DC-14 10); IEC 60947-3 Table 3 mirrors DC-1/3/5 as DC-21/22/23
# (from memory, medium-high confidence; domain facts 1-3).
MAKING_MULTIPLES = {
    "DC-1": 1.5, "DC-3": 4.0, "DC-5": 4.0, "DC-6": 1.5,
    "DC-12": 1.0, "DC-13": 1.0, "DC-14": 10.0,
    "DC-21A": 1.5, "DC-21B": 1.5, "DC-22A": 4.0, "DC-22B": 4.0,
    "DC-23A": 4.0, "DC-23B": 4.0,
}  # fmt: skip
# A DC motor's starting current taken as the DC-3/DC-5 making condition, 4 x Ie
# (IEC 60947-4-1 Table 7): the category's own assumption, not the motor's data.
MOTOR_START_MULTIPLE = 4.0


# The categories whose making test speaks for a lamp or a motor.
_MAKING_CATEGORIES = {
    "lamp": {"DC-6"},
    "motor": {"DC-3", "DC-5", "DC-22A", "DC-22B", "DC-23A", "DC-23B"},
}


def _allowed(element: ElementAnalysis, kind: str) -> tuple[object, str, bool] | None:
    """The making capacity, its basis, and whether the part states it.

    Without a stated ``making_current``, a lamp or motor is judged on the
    making condition of a rating of its own category (DC-6; DC-3/DC-5).
    """
    stated = element.component.value("contacts", "making_current")
    if stated is not None:
        return stated, "making_current of the part", True
    speaking = _MAKING_CATEGORIES.get(kind, ())
    if not speaking:
        return None  # no category speaks for this kind of load
    best = None
    for rating in element.component.value("contacts", "ratings", default=()) or ():
        category = str(rating.get("category"))
        if category not in speaking:
            continue
        multiple = MAKING_MULTIPLES.get(category)
        voltage, current = rating.get("voltage"), rating.get("current")
        if multiple is None or voltage is None or current is None:
            continue
        if element.voltage is not None and voltage < element.voltage:
            continue
        value = current * multiple
        if best is None or value > best[0]:
            volts, amps = voltage.to("V").magnitude, current.to("A").magnitude
            basis = f"{multiple:g} × Ie of its {category} {volts:g} V {amps:g} A rating"
            best = (value, basis, False)
    return best


def _extra(
    ctx: CheckContext, element: ElementAnalysis
) -> tuple[str, object, float, float]:
    """The largest lamp or motor inrush above the steady current: kind, load, k, I."""
    best = ("", None, 1.0, 0.0)
    for load in element.loads:
        kind = load.facts.type
        if kind == "lamp":
            multiple = ctx.option("lamp-cold-multiple")
        elif kind == "motor":
            multiple = MOTOR_START_MULTIPLE
        else:
            continue
        hot = float(load.current.to("A").magnitude)
        if (multiple - 1) * hot > (best[2] - 1) * best[3]:
            best = (kind, load.facts.ref, multiple, hot)
    return best


def _precharge(
    ctx: CheckContext, charge: Charge, limit: float, other: float
) -> dict[str, object]:
    """The resistance to add so the making current stays within ``limit``.

    ``other``: the current through the contact at closing besides this
    capacitor's (a load on the contact's far side), which the resistor
    does not limit.
    """
    step, loop = abs(charge.step), charge.loop or 0.0
    if limit - other <= 0:
        return {
            "resistor": None, "tau": None, "t95": None, "pulse_power": None,
            "pulse": Q_(0.5 * charge.capacitance * step**2, "J"),
        }  # fmt: skip
    added = max(step / (limit - other) - loop, 0.0)
    tau = (added + loop) * charge.capacitance
    return {
        "resistor": Q_(added, "ohm"),
        "pulse": Q_(0.5 * charge.capacitance * step**2, "J"),
        "tau": Q_(tau, "s"),
        "t95": Q_(tau * math.log(20), "s"),
        "pulse_power": Q_((step / (added + loop)) ** 2 * added, "W")
        if added > 0
        else None,
    }


def _capacitive(ctx, element, inrush: Inrush, allowed, basis, severity) -> Finding:  # type: ignore[no-untyped-def]
    charge = max(inrush.charges, key=lambda c: abs(c.step) / (c.loop or 1e-9))
    limit = float(allowed.to("A").magnitude) / ctx.option("making-current")
    making = Q_(inrush.peak, "A")
    variant = "discharge" if charge.step < 0 else "capacitive"
    own = abs(charge.step) / charge.loop if charge.loop else 0.0
    other = max(inrush.peak - own, 0.0)
    return ctx.finding(
        element, message=variant, fix=variant, severity=severity,
        capacitor=charge.ref, capacitance=Q_(charge.capacitance, "F"),
        step=Q_(abs(charge.step), "V"),
        loop=Q_(charge.loop or 0.0, "ohm"),
        making=making, allowed=allowed, basis=basis,
        making_needed=making * ctx.option("making-current"),
        **_precharge(ctx, charge, limit, other),
    )  # fmt: skip


@check("making-over-rating")
def making_over_rating(ctx: CheckContext) -> Iterator[Finding]:
    """Flag DC contacts whose closing current exceeds their making capacity."""
    for element in ctx.switching_elements(supply="dc", kinds=MECHANICAL_KINDS):
        # What there is to judge is known before any network is solved: a
        # contact with no making data that speaks for its loads is skipped.
        kind, load, multiple, hot = _extra(ctx, element)
        found = _allowed(element, kind)
        if kind == "" and (found is None or not found[2]):
            continue  # a capacitor step is judged on a stated making current only
        if found is None:
            continue  # no making data of a category that speaks for the load
        inrush = closing_inrush(ctx.analysis, element)
        if inrush is None or inrush.peak is None:
            continue  # no resistance in the loop: no number (give the supply's r_int)
        if kind == "" and not inrush.charges:
            continue
        peak = inrush.peak + (multiple - 1) * hot
        if peak <= 1.01 * inrush.steady + 1e-9:
            continue  # nothing on closing beyond the current it breaks
        allowed, basis, stated = found
        margin = ctx.option("making-current")
        if peak * margin <= float(allowed.to("A").magnitude):
            continue
        severity = None if stated else Severity.WARNING
        if inrush.charges and (
            peak is None or kind == "" or inrush.peak >= (multiple - 1) * hot
        ):
            yield _capacitive(ctx, element, inrush, allowed, basis, severity)
            continue
        making = Q_(peak, "A")
        yield ctx.finding(
            element, message=kind, fix=kind, severity=severity, load=load,
            making=making, multiple=Q_(multiple, ""), hot=Q_(hot, "A"),
            allowed=allowed, basis=basis, voltage=element.voltage,
            making_needed=making * margin,
        )  # fmt: skip
