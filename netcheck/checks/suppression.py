"""Suppression rules: inductive loads at opening and the suppressors fitted."""

from __future__ import annotations

from collections.abc import Iterator

from netcheck.analysis.fitted import effective
from netcheck.analysis.opening import load_transient, zener_release
from netcheck.analysis.si import quantity_like, total
from netcheck.analysis.switched import ElementAnalysis, Suppressor
from netcheck.analysis.verdicts import arrangement_lead
from netcheck.checks.context import CheckContext
from netcheck.checks.registry import check
from netcheck.findings import Finding, Severity
from netcheck.kinds import POLARIZED_SUPPRESSORS, SEMICONDUCTOR_KINDS

__all__ = [
    "inductive_load_unsuppressed",
    "freewheel_diode_reversed",
    "diode_on_ac_load",
    "slow_release_suppression",
]


def _clamp_case(ctx: CheckContext, element: ElementAnalysis) -> tuple[str, dict] | None:
    """For a semiconductor output: ("ok"|"output", values) from its clamp data."""
    if element.component.kind not in SEMICONDUCTOR_KINDS:
        return None
    rating = element.component.value("clamp_energy")
    # element_transient(element, None): with an unsuppressed load (the caller
    # has one) that is the element's own peak, memoised for the other rules.
    model = ctx.element_peak(element)
    needed = element.energy
    if model is not None and model.suppressor_energy.magnitude > 0:
        needed = model.suppressor_energy
    values = {"clamp_energy": rating, "clamp_needed": needed}
    if rating is not None and needed is not None and rating >= needed:
        return "ok", values
    return "output", values


# IEC 60947-4-1: DC-3 (shunt motors) and DC-5 (series motors) are tested
# breaking the motor's own inductance, including plugging and inching; a
# freewheel diode across an armature would short it when the motor is reversed
# or plugged (common practice), so a motor pole rated for its category needs
# no suppression.
_MOTOR_CATEGORIES = frozenset({"DC-3", "DC-5"})


def _motor_pole_rated(ctx: CheckContext, element: ElementAnalysis) -> bool:
    if element.load_category not in _MOTOR_CATEGORIES:
        return False
    verdict = ctx.verdict(element)
    return (
        verdict is not None
        and verdict.status != "no-data"
        and (not verdict.category_mismatch)
    )


@check("inductive-load-unsuppressed")
def inductive_load_unsuppressed(ctx: CheckContext) -> Iterator[Finding]:
    """Flag DC elements that break inductive loads with no suppression anywhere."""
    # ctx.scaled(value, margin), the margins read once for the whole loop.
    diode_voltage = ctx.option("diode-reverse-voltage")
    diode_current = ctx.option("diode-current")
    for element in ctx.switching_elements(supply="dc"):
        # Behind a short (a reversed freewheel diode) the short is the one
        # finding; turning the part round also suppresses the load again.
        if element.voltage is None or element.short_circuit:
            continue
        loads = ctx.unsuppressed_loads(element)
        if not loads:
            continue
        # Series poles break one load together: one finding, at the lead pole.
        if not arrangement_lead(element) or _motor_pole_rated(ctx, element):
            continue
        case = _clamp_case(ctx, element)
        # An inductive type with no L or tau given leaves the energy unknown;
        # then ``energy_known`` carries the part that is known, if any.
        known = [ld.energy for ld in loads if ld.energy is not None]
        energy = total(known, "J") if len(known) == len(loads) else None
        if len(loads) == 1:
            current = loads[0].current
            names = loads[0].facts.ref
        else:
            current = max(ld.current for ld in loads)
            names = ", ".join([ld.facts.ref for ld in loads])
        voltage = element.voltage
        values = {
            "loads": names,
            "energy": energy,
            "current": current,
            "voltage": voltage,
            "diode_voltage": quantity_like(voltage, voltage._magnitude * diode_voltage),
            "diode_current": quantity_like(current, current._magnitude * diode_current),
        }
        if energy is None and known:
            values["energy_known"] = total(known, "J")
        if element.load_category in _MOTOR_CATEGORIES:
            values.update(fix="motor", category=element.load_category)
        if case is None:
            yield ctx.finding(element, **values)
        else:
            # A clamp big enough leaves the catalogue's warning; else an error.
            severity = Severity.WARNING if case[0] == "ok" else Severity.ERROR
            yield ctx.finding(
                element, message="output", severity=severity, **values, **case[1]
            )


def _polarized(suppressor: Suppressor) -> bool:
    return suppressor.kind in POLARIZED_SUPPRESSORS or (
        suppressor.kind == "tvs"
        and suppressor.chain is not None
        and bool(suppressor.chain.polarity)
    )


@check("freewheel-diode-reversed")
def freewheel_diode_reversed(ctx: CheckContext) -> Iterator[Finding]:
    """Flag diodes across DC loads that conduct when the load is energised."""
    for rev in ctx.reversed_diodes():
        if not _polarized(rev.suppressor):
            continue
        chain = rev.suppressor.chain
        assert chain is not None
        yield ctx.finding(
            rev.diode,
            fix="chain" if len(chain.branches) > 1 else "default",
            parts=", ".join(chain.refs),
            load=rev.load.branch.ref,
            current=rev.current,
            voltage=rev.load.voltage,
            positive=rev.positive,
            negative=rev.negative,
            key=rev.load.branch.ref,
        )


@check("diode-on-ac-load")
def diode_on_ac_load(ctx: CheckContext) -> Iterator[Finding]:
    """Flag diodes and other polarized suppressors across loads on AC circuits."""
    for info in ctx.loads():
        if info.supply != "ac":
            continue
        for suppressor in info.suppressors:
            if suppressor.placement == "built-in" or not _polarized(suppressor):
                continue
            assert suppressor.chain is not None
            component = suppressor.chain.branches[0].component
            supply = ctx.graph.domain_of[info.branch.a].supplies[0]
            voltage = supply.value("ac")
            yield ctx.finding(
                component,
                load=info.branch.ref,
                kind=suppressor.kind,
                voltage=voltage,
                peak=voltage * 2**0.5,
                varistor_voltage=voltage * 2**0.5 * ctx.option("varistor-voltage"),
                key=info.branch.ref,
            )


FAST = ("fast-release", "safety")
_FAST = frozenset(FAST)


@check("slow-release-suppression")
def slow_release_suppression(ctx: CheckContext) -> Iterator[Finding]:
    """Flag fast-release or safety loads suppressed by a diode alone."""
    seen: set[str] = set()
    for element in ctx.switching_elements(supply="dc"):
        for load in element.inductive_loads:
            if load.facts.key in seen:
                continue
            component = ctx.netlist.component(load.facts.ref)
            if component is None or not (component.tags & _FAST):
                continue
            active = effective(load.suppressors)
            if not active or any(s.kind != "diode" for s in active):
                continue
            seen.add(load.facts.key)
            with_diode = load_transient(load, load.voltage, active[0])
            faster = zener_release(load)
            if with_diode is None or faster is None:
                continue
            yield ctx.finding(
                component,
                tag=", ".join(sorted(component.tags & _FAST)),
                diode=", ".join(active[0].refs),
                release_diode=with_diode.release_time,
                release_zener=faster.release_time,
                zener_voltage=load.voltage,
                peak_zener=faster.peak_voltage,
                key=load.facts.key,
            )
