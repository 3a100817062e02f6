"""The opening transient of a switched inductive load with the suppression found.

Bridges the circuit analysis (what is switched, what suppresses it) and the
transient models of ``transients``: builds the model load and suppression from
part data, and answers peak voltage, release time and suppressor energy.
"""

from __future__ import annotations

import math
from dataclasses import replace
from functools import lru_cache

import pint

from netcheck.analysis.constants import SILICON_RECTIFIER_VF, STRAY_CAPACITANCE
from netcheck.analysis.si import si
from netcheck.analysis.suppression import Chain
from netcheck.analysis.switched import ElementAnalysis, Suppressor, SwitchedLoad
from netcheck.analysis.transients import (
    ACROSS_ELEMENT,
    ACROSS_LOAD,
    Load,
    OpeningTransient,
    Suppression,
    transient,
)
from netcheck.model import Component
from netcheck.units import Q_

__all__ = [
    "OpeningTransient",
    "model_load",
    "model_suppression",
    "load_transient",
    "element_load",
    "element_transient",
    "zener_release",
]


def _si(
    value: pint.Quantity | None, unit: str, default: float | None = None
) -> float | None:
    return si(value, unit) if value is not None else default


def model_load(load: SwitchedLoad, supply: pint.Quantity) -> Load | None:
    """The transient model of one switched load (None without R and L)."""
    r, l_h = load.facts.resistance, load.facts.inductance
    if r is None or l_h is None or l_h.magnitude <= 0 or load.current.magnitude <= 0:
        return None
    return Load(_si(supply, "V"), _si(r, "ohm"), _si(l_h, "H"), _si(load.current, "A"))


def _parts(suppressor: Suppressor) -> dict[str, Component]:
    if suppressor.chain is None:
        return {}
    return {b.kind: b.component for b in suppressor.chain.branches}


def model_suppression(
    suppressor: Suppressor | None, element: Component | None = None
) -> Suppression:
    """The transient model of a suppressor found by the analysis (or none)."""
    if suppressor is None:
        clamp = element.value("clamp_voltage") if element is not None else None
        if clamp is not None:
            return Suppression("tvs", ACROSS_ELEMENT, clamp_voltage=_si(clamp, "V"))
        return Suppression("none", ACROSS_ELEMENT)
    parts = _parts(suppressor)
    placement = (
        ACROSS_ELEMENT if suppressor.placement == "across-element" else ACROSS_LOAD
    )
    vf = _si(
        next(
            (p.value("vf") for p in parts.values() if p.value("vf") is not None), None
        ),
        "V",
        SILICON_RECTIFIER_VF,
    )
    kind = suppressor.kind
    if kind == "diode-zener":
        zener = parts.get("zener") or parts.get("tvs")
        vz = (zener.value("vz") or zener.value("vclamp")) if zener else None
        return Suppression(
            "diode-zener",
            placement,
            forward_voltage=vf,
            clamp_voltage=_si(vz, "V", 0.0),
        )
    if kind in ("tvs", "varistor", "zener"):
        part = next(iter(parts.values()), None)
        clamp = None
        if part is not None:
            clamp = part.value("vclamp") or part.value("vz") or part.value("vdc_max")
        model = "varistor" if kind == "varistor" else "tvs"
        return Suppression(model, placement, clamp_voltage=_si(clamp, "V", 0.0) or 0.0)
    if kind in ("rc", "capacitor"):
        part = parts.get("rc") or parts.get("capacitor")
        r_part = parts.get("resistor") or parts.get("rc")
        c = part.value("C") if part else None
        r = r_part.value("R") if r_part and kind == "rc" else None
        return Suppression(
            kind,
            placement,
            resistance=_si(r, "ohm", 0.0) or 0.0,
            capacitance=_si(c, "F", STRAY_CAPACITANCE) or STRAY_CAPACITANCE,
        )
    if kind == "resistor":
        r = parts["resistor"].value("R")
        return Suppression(
            "resistor", ACROSS_LOAD, resistance=_si(r, "ohm", 0.0) or 0.0
        )
    if kind in ("diode", "diode-resistor"):
        return Suppression("diode", ACROSS_LOAD, forward_voltage=vf)
    return Suppression("none", ACROSS_ELEMENT)


@lru_cache(maxsize=512)
def _opening(
    model: Load, suppression: Suppression, release: float | None
) -> OpeningTransient:
    """One transient per distinct circuit: repeated rungs share it.

    A pure function of its (frozen, SI-float) arguments, so the memo returns
    exactly what a fresh solve would; 512 entries of a few hundred samples
    each bound its memory.
    """
    return OpeningTransient.of(transient(model, suppression, release))


def _release(load: SwitchedLoad) -> float | None:
    value = load.facts.release_current
    return _si(value, "A") if value is not None else None


# What ``model_suppression`` reads of each part of a suppressor's chain.
_PART_KEYS = ("vf", "vz", "vclamp", "vdc_max", "C", "R")
_ABSENT = object()  # a key not there (None may be a value)
# Transients by ``_transient_key``: (the objects the key names, the transient).
_TRANSIENTS: dict[tuple, tuple[tuple, OpeningTransient | None]] = {}
_TRANSIENTS_LIMIT = 1024  # each holds waveforms of a few hundred samples
# Chains' parts by the chain's identity: (the chain, its key part and values).
_CHAINS: dict[int, tuple[Chain, tuple[tuple, tuple]]] = {}
# Entries are small (a few hundred bytes); the bound is above the chain count of
# a 100 000-component design (about 33 000), so a design's chains are each
# worked out once rather than again after every clearing.
_CHAINS_LIMIT = 1 << 17


def _chain_parts(chain: Chain | None) -> tuple[tuple, tuple] | None:
    """A chain's parts as ``_transient_key`` names them, once per chain.

    Each part's kind and the identities of its values read (``_PART_KEYS``),
    in chain order, and those values themselves (to keep alive). Chains are
    found once per design and shared by every suppressor of theirs; the
    chain is kept beside its entry, so an identity met again is that chain.
    None where a part's values are not a plain dict.
    """
    if chain is None:
        return (), ()
    found = _CHAINS.get(id(chain))
    if found is not None and found[0] is chain:
        return found[1]
    parts, kept = [], []
    for branch in chain.branches:
        values = branch.component.values
        if type(values) is not dict:
            return None
        leaves = [values.get(k, _ABSENT) for k in _PART_KEYS]
        kept += leaves
        parts.append((branch.kind, *map(id, leaves)))
    if len(_CHAINS) >= _CHAINS_LIMIT:
        _CHAINS.clear()
    made = (tuple(parts), tuple(kept))
    _CHAINS[id(chain)] = (chain, made)
    return made


def _transient_key(
    load: SwitchedLoad,
    supply: pint.Quantity,
    suppressor: Suppressor | None,
    element: Component | None,
) -> tuple[tuple, tuple] | None:
    """Everything ``load_transient`` reads, and the objects it names by identity.

    The load's facts (resistance, inductance, release current) and the parts'
    values are shared parsed objects: they are named by identity and kept
    alive beside the memo entry, so an identity met again is the same object.
    The current and the supply voltage are made per element: their float
    magnitudes (with the sign of zero) and their units' identity. The
    suppressor: its kind, placement and its chain's parts (``_chain_parts``);
    without one, the element's clamp. None (work it out afresh) where a
    magnitude is not a float or a part's values are not a plain dict.
    """
    facts, current = load.facts, load.current
    amps, volts = current._magnitude, supply._magnitude
    if type(amps) is not float or type(volts) is not float:
        return None
    if suppressor is None:
        clamp = element.value("clamp_voltage") if element is not None else None
        parts: tuple = (None, id(clamp))
        held: tuple = (clamp,)
    else:
        chain = suppressor.chain
        made = _chain_parts(chain)
        if made is None:
            return None
        parts = (suppressor.kind, suppressor.placement, chain is None, made[0])
        held = made[1]
    kept = (
        facts.resistance,
        facts.inductance,
        facts.release_current,
        current._units,
        supply._units,
        held,
    )
    key = (
        id(kept[0]),
        id(kept[1]),
        id(kept[2]),
        # The sign of a zero magnitude: 0.0 == -0.0, their transients may differ.
        amps,
        amps == 0.0 and math.copysign(1.0, amps),
        id(kept[3]),
        volts,
        volts == 0.0 and math.copysign(1.0, volts),
        id(kept[4]),
        parts,
    )
    return key, kept


def load_transient(
    load: SwitchedLoad,
    supply: pint.Quantity,
    suppressor: Suppressor | None,
    element: Component | None = None,
) -> OpeningTransient | None:
    """The opening transient of one load with one suppressor (None if not modelled).

    Remembered by ``_transient_key`` (repeated rungs: the same parts at the
    same current); ``tests/analysis/test_core_memos.py`` holds the
    remembered transients to fresh ones.
    """
    made = _transient_key(load, supply, suppressor, element)
    if made is None:
        return _load_transient(load, supply, suppressor, element)
    key, kept = made
    found = _TRANSIENTS.get(key)
    if found is None:
        if len(_TRANSIENTS) >= _TRANSIENTS_LIMIT:
            _TRANSIENTS.clear()
        found = _TRANSIENTS[key] = (
            kept,
            _load_transient(load, supply, suppressor, element),
        )
    return found[1]


def _load_transient(
    load: SwitchedLoad,
    supply: pint.Quantity,
    suppressor: Suppressor | None,
    element: Component | None = None,
) -> OpeningTransient | None:
    """``load_transient`` worked out, nothing remembered here."""
    model = model_load(load, supply)
    if model is None:
        return None
    suppression = model_suppression(suppressor, element)
    if suppression.kind in ("tvs", "varistor") and suppression.clamp_voltage <= 0:
        return None
    try:
        return _opening(model, suppression, _release(load))
    except ValueError:
        return None


def element_load(analysis: ElementAnalysis) -> SwitchedLoad | None:
    """The element's inductive loads as one equivalent load (same I and ½·L·I²)."""
    loads = analysis.inductive_loads
    if not loads:
        return None
    if len(loads) == 1:
        return loads[0]
    current = sum((ld.current for ld in loads), Q_(0.0, "A"))
    energy = sum((ld.energy for ld in loads if ld.energy is not None), Q_(0.0, "J"))
    if current.magnitude <= 0 or analysis.voltage is None:
        return None
    base = max(loads, key=lambda ld: ld.energy or Q_(0.0, "J"))
    resistance = (analysis.voltage / current).to("ohm")
    inductance = (2 * energy / current**2).to("H")
    facts = replace(
        base.facts,
        resistance=resistance,
        inductance=inductance,
        time_constant=(inductance / resistance).to("s"),
    )
    return replace(base, facts=facts, current=current, energy=energy)


def element_transient(
    analysis: ElementAnalysis, suppressor: Suppressor | None
) -> OpeningTransient | None:
    """The transient at the element: its loads with ``suppressor`` or its clamp."""
    load = element_load(analysis)
    if load is None or analysis.voltage is None:
        return None
    return load_transient(load, analysis.voltage, suppressor, analysis.component)


def zener_release(
    load: SwitchedLoad, forward_voltage: float = SILICON_RECTIFIER_VF
) -> OpeningTransient | None:
    """The faster clamp the spec asks for: diode + zener at the supply voltage."""
    model = model_load(load, load.voltage)
    if model is None:
        return None
    suppression = Suppression(
        "diode-zener",
        ACROSS_LOAD,
        forward_voltage=forward_voltage,
        clamp_voltage=model.supply,
    )
    return _opening(model, suppression, _release(load))
