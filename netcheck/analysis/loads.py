"""Electrical facts of loads and coils: resistance, inductance, load category."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import pint

from netcheck.analysis.si import converted, ratio
from netcheck.graph import COIL, Branch
from netcheck.units import Q_

__all__ = [
    "LoadFacts",
    "load_facts",
    "category_for",
    "rated_as_power_device",
    "CONTROL_CATEGORY",
    "POWER_CATEGORY",
    "covers",
    "is_inductive",
]

# Load type -> utilization category needed (parts.md, after IEC 60947-5-1
# for control devices and IEC 60947-4-1 for power devices).
CONTROL_CATEGORY = {
    "resistive": "DC-12",
    "heater": "DC-12",
    "electronic": "DC-12",
    "capacitive": "DC-12",
    "lamp": "DC-6",
    "solenoid": "DC-13",
    "valve": "DC-13",
    "brake": "DC-13",
    "clutch": "DC-13",
    "coil": "DC-13",
    "motor": "DC-13",
    "series-motor": "DC-13",
    "economy-coil": "DC-14",
}
POWER_CATEGORY = {
    "resistive": "DC-1",
    "heater": "DC-1",
    "electronic": "DC-1",
    "capacitive": "DC-1",
    "lamp": "DC-6",
    "motor": "DC-3",
    # IEC 60947-4-1: DC-5 is the category of series motors (domain-facts §1).
    "series-motor": "DC-5",
    "solenoid": "DC-13",
    "valve": "DC-13",
    "brake": "DC-13",
    "clutch": "DC-13",
    "coil": "DC-13",
    "economy-coil": "DC-14",
}
# What a rating of each category also covers (parts.md: DC-13 covers DC-12;
# DC-5 covers DC-3 covers DC-1).
#
# IEC 60947-3 (switch-disconnectors) categories, by their definitions
# (domain-facts §3): DC-21 resistive loads with moderate overloads, DC-22 mixed
# resistive and inductive loads (shunt motors), DC-23 highly inductive loads
# (series motors). Their test circuits mirror DC-1/DC-3/DC-5 (I/Ie 1.5/4/4,
# L/R 1/2.5/15 ms; from memory, medium-high confidence), so each covers what
# its mirror covers; the A/B suffix (frequent/infrequent operation) changes
# no load. DC-23 is not taken to cover DC-13 electromagnets: the DC-13 test
# reaches T0.95 = 6·P ms up to 300 ms, beyond DC-23's 15 ms L/R. The PV
# categories (IEC 60947-3 Annex D) switch PV strings, a resistive source at
# L/R 1 ms (test values from memory, LOW confidence): read as resistive.
_SWITCH_DISCONNECTOR = {
    "DC-21": {"DC-21", "DC-1", "DC-12"},
    "DC-22": {"DC-22", "DC-21", "DC-3", "DC-1", "DC-12"},
    "DC-23": {"DC-23", "DC-22", "DC-21", "DC-5", "DC-3", "DC-1", "DC-12"},
    "DC-PV1": {"DC-PV1", "DC-1", "DC-12"},
    "DC-PV2": {"DC-PV2", "DC-PV1", "DC-1", "DC-12"},
}
_COVERS = {
    **_SWITCH_DISCONNECTOR,
    "DC-13": {"DC-13", "DC-12"},
    "DC-12": {"DC-12"},
    # DC-14 is tested at T0.95 15 ms (IEC 60947-5-1 Table 4): milder than DC-13's
    # up to 300 ms, so it does not cover a DC-13 electromagnet.
    "DC-14": {"DC-14", "DC-12"},
    "DC-5": {"DC-5", "DC-3", "DC-1"},
    "DC-3": {"DC-3", "DC-1"},
    "DC-1": {"DC-1"},
    "DC-6": {"DC-6"},
}
# Ordering used to pick the most demanding category among several loads.
_DEMAND = ["DC-1", "DC-12", "DC-6", "DC-3", "DC-5", "DC-13", "DC-14"]
_INDUCTIVE = {
    "solenoid",
    "valve",
    "brake",
    "clutch",
    "coil",
    "motor",
    "series-motor",
    "economy-coil",
}


def _base(category: str) -> str:
    """``DC-21B`` -> ``DC-21``: the A/B duty suffix of IEC 60947-3 keeps the loads."""
    text = category.strip().upper()
    return text[:-1] if text[-1:] in ("A", "B") and text.startswith("DC-2") else text


def covers(rated: str, needed: str) -> bool:
    """Whether a rating of category ``rated`` covers a load needing ``needed``."""
    base = _base(rated)
    return _base(needed) in _COVERS.get(base, {base})


def most_demanding(categories: list[str]) -> str | None:
    """The most demanding of several categories."""
    if len(categories) == 1:  # most elements switch one load
        return categories[0] if categories[0] in _DEMAND else None
    known = [c for c in categories if c in _DEMAND]
    return max(known, key=_DEMAND.index) if known else None


@dataclass(frozen=True)
class LoadFacts:
    """What the analysis knows of one load (a ``load`` or a coil)."""

    key: str
    ref: str
    type: str
    resistance: pint.Quantity | None
    inductance: pint.Quantity | None
    time_constant: pint.Quantity | None
    release_current: pint.Quantity | None
    suppression: str  # built-in: none, diode, zener, varistor, rc, tvs
    coil_supply: str | None  # for coils: dc, ac or ac/dc
    rated_voltage: pint.Quantity | None
    missing: tuple[str, ...]

    def __init__(
        self,
        key: str,
        ref: str,
        type: str,  # noqa: A002 - the field's name
        resistance: pint.Quantity | None,
        inductance: pint.Quantity | None,
        time_constant: pint.Quantity | None,
        release_current: pint.Quantity | None,
        suppression: str,
        coil_supply: str | None,
        rated_voltage: pint.Quantity | None,
        missing: tuple[str, ...],
    ) -> None:
        # One per load and state: written straight into the instance's
        # ``__dict__`` as ``model.Component`` is (tests/test_model_init.py).
        fields = self.__dict__
        fields["key"] = key
        fields["ref"] = ref
        fields["type"] = type
        fields["resistance"] = resistance
        fields["inductance"] = inductance
        fields["time_constant"] = time_constant
        fields["release_current"] = release_current
        fields["suppression"] = suppression
        fields["coil_supply"] = coil_supply
        fields["rated_voltage"] = rated_voltage
        fields["missing"] = missing


def is_inductive(facts: LoadFacts) -> bool:
    """Inductive by type or by a given inductance."""
    has_l = facts.inductance is not None and facts.inductance.magnitude > 0
    return facts.type in _INDUCTIVE or has_l


def _resistance_of(values: dict) -> pint.Quantity | None:
    r, p, v, i = (values.get(k) for k in ("R", "P", "V", "I"))
    if r is not None:
        return r
    if p is not None and v is not None and p.magnitude > 0:
        return (v**2 / p).to("ohm")
    if v is not None and i is not None and i.magnitude > 0:
        return ratio(v, i, "ohm")
    return None


def _inductance(r: pint.Quantity | None, l_value, tau) -> tuple:
    if l_value is not None:
        tau_out = ratio(l_value, r, "s") if r is not None and r.magnitude > 0 else None
        return converted(l_value, "H"), tau_out
    if tau is not None:
        return ((tau * r).to("H") if r is not None else None), converted(tau, "s")
    return None, None


# The keys ``load_facts`` reads, of a coil's ``coil`` group and of a load's values.
_COIL_KEYS = (
    "resistance",
    "voltage",
    "current",
    "inductance",
    "time_constant",
    "economy",
    "release_current",
    "suppression",
    "supply",
)
_LOAD_KEYS = ("R", "P", "V", "I", "L", "tau", "type", "release_current", "suppression")
# Facts by the identities of the values they are read from (see ``load_facts``).
_FACTS: dict[tuple[int, ...], tuple[tuple[Any, ...], tuple[Any, ...]]] = {}
_FACTS_LIMIT = 8192
# The shared facts by the identity of the dict they were read from (kept
# beside them): components of one part without overrides share that dict.
_BY_SOURCE: dict[tuple[bool, int], tuple[dict, tuple[Any, ...]]] = {}
_ABSENT = object()  # a key not there (None may be a value)


def load_facts(branch: Branch) -> LoadFacts:
    """Read a load's or coil's electrical facts from its merged values.

    Repeated rungs repeat their parts, and a part's parsed values are shared
    objects (``input/cnet/build.py``), so the facts are remembered by the
    role and the *identities* of the values read (``_COIL_KEYS`` of the coil
    group, or ``_LOAD_KEYS`` of the values): those objects are kept in the
    memo beside the facts, so an identity met again is the same object, and
    the facts, a pure function of them, are the same. Only the branch's key
    and reference differ between such loads; they are filled in per call.
    Before that, the dict read (a part's values, shared by its components
    without overrides, or its coil group) is looked up by identity, kept
    beside its facts: a dict met again holds the same value objects, as
    nothing changes a model's values in place once built.
    """
    component = branch.component
    coil = branch.role == COIL
    source = (component.value("coil", default={}) or {}) if coil else component.values
    if type(source) is not dict:
        return LoadFacts(branch.key, component.ref, *_shared_facts(coil, source))
    held = _BY_SOURCE.get((coil, id(source)))
    if held is not None and held[0] is source:
        return LoadFacts(branch.key, component.ref, *held[1])
    get = source.get
    leaves = tuple([get(k, _ABSENT) for k in (_COIL_KEYS if coil else _LOAD_KEYS)])
    key = (coil, *map(id, leaves))
    found = _FACTS.get(key)
    if found is None:
        if len(_FACTS) >= _FACTS_LIMIT:
            _FACTS.clear()
        found = _FACTS[key] = (leaves, _shared_facts(coil, source))
    if len(_BY_SOURCE) >= _FACTS_LIMIT:
        _BY_SOURCE.clear()
    _BY_SOURCE[(coil, id(source))] = (source, found[1])
    return LoadFacts(branch.key, component.ref, *found[1])


def _shared_facts(coil: bool, source: Mapping[str, Any]) -> tuple[Any, ...]:
    """Every field of ``LoadFacts`` after its key and ref, from the values read."""
    if coil:
        return _coil_facts(dict(source))
    values = dict(source)
    r = _resistance_of(values)
    inductance, tau = _inductance(r, values.get("L"), values.get("tau"))
    missing = tuple(k for k, v in (("R (or P and V, or I and V)", r),) if v is None)
    return (
        str(values.get("type", "resistive")),
        r,
        inductance,
        tau,
        values.get("release_current"),
        str(values.get("suppression", "none")),
        None,
        values.get("V"),
        missing,
    )


def _coil_facts(coil: dict[str, Any]) -> tuple[Any, ...]:
    r = coil.get("resistance")
    if (
        r is None
        and coil.get("voltage") is not None
        and coil.get("current") is not None
    ):
        r = (coil["voltage"] / coil["current"]).to("ohm")
    inductance, tau = _inductance(r, coil.get("inductance"), coil.get("time_constant"))
    economy = bool(coil.get("economy"))
    missing = tuple(k for k, v in (("coil.resistance", r),) if v is None)
    return (
        "economy-coil" if economy else "coil",
        r,
        inductance,
        tau,
        coil.get("release_current"),
        str(coil.get("suppression", "none")),
        # Unknown where not given: a relay with no part data is neither
        # a DC nor an AC coil.
        str(coil["supply"]) if coil.get("supply") is not None else None,
        coil.get("voltage"),
        missing,
    )


# Verdicts by the identity of the ratings read (kept alive beside each).
_POWER_DEVICE: dict[int, tuple[object, bool]] = {}


def rated_as_power_device(component) -> bool:  # type: ignore[no-untyped-def]
    """Whether a pole's ratings are IEC 60947-3 switch-disconnector categories.

    DC-21/22/23 and DC-PV rate power switching (IEC 60947-3), so its loads need
    the power categories (a motor DC-3, not the control DC-13).

    Remembered by the identity of the ratings list: the components of a part
    share its parsed ``contacts`` group, which nothing changes once read; the
    list is kept beside its verdict, so an identity met again is that list.
    """
    rows = component.value("contacts", "ratings", default=()) or ()
    found = _POWER_DEVICE.get(id(rows))
    if found is None or found[0] is not rows:
        if len(_POWER_DEVICE) >= _FACTS_LIMIT:
            _POWER_DEVICE.clear()
        found = _POWER_DEVICE[id(rows)] = (rows, _power_rows(rows))
    return found[1]


def _power_rows(rows) -> bool:  # type: ignore[no-untyped-def]
    return any(
        str(row.get("category", "")).upper().startswith(("DC-2", "DC-PV"))
        for row in rows
        if isinstance(row, dict)
    )


def category_for(load_type: str, power_device: bool) -> str:
    """The utilization category a load type needs on a control or power device."""
    table = POWER_CATEGORY if power_device else CONTROL_CATEGORY
    return table.get(load_type, "DC-12" if not power_device else "DC-1")


def zero(unit: str) -> pint.Quantity:
    """A zero quantity of ``unit``."""
    return Q_(0.0, unit)
