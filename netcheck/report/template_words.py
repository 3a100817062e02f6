"""Rule templates for people: ``{current}`` shown as ``<breaking current>``.

Help texts (SARIF ``help``, ``netcheck explain``) show a rule's message and fix
templates before any finding fills them; a raw ``{placeholder}`` there reads as
a bug. Every placeholder of the catalogue has words here (a test keeps it so).
"""

from __future__ import annotations

import string

__all__ = ["WORDS", "RULE_WORDS", "describe", "readable"]

# What each placeholder stands for, in words, wherever the rule does not say
# otherwise in RULE_WORDS.
WORDS: dict[str, str] = {
    "about": "what the part protects",
    "um": "minimum arc voltage",
    "t_um": "time to reach Um",
    "material": "contact material",
    "im": "minimum arc current",
    "dvdt": "initial dv/dt",
    "discharge": "discharge current at closing",
    "c_needed": "capacitance for 1 V/µs",
    "breaks_needed": "breaks needed",
    "breaks": "number of breaks",
    "step": "voltage step",
    "resistor": "precharge resistance",
    "pulse_power": "peak power in the resistor",
    "pulse": "pulse energy in the resistor",
    "multiple": "inrush multiple",
    "making_needed": "making capacity needed",
    "making": "making current",
    "loop": "loop resistance",
    "hot": "hot or running current",
    "capacitance": "capacitance",
    "capacitor": "capacitor",
    "basis": "what the making capacity is taken from",
    "voltage_needed": "DC voltage rating needed",
    "supplies": "supplies",
    "prospective": "prospective fault current",
    "marked": "marked entry terminal",
    "dc_rating": "DC voltage rating",
    "capacity_needed": "breaking capacity needed",
    "capacity": "DC breaking capacity",
    "ac_rating": "AC voltage rating",
    "allowed": "allowed current",
    "applied": "applied voltage",
    "assumed": "note on assumed ratings, if any",
    "assumptions": "note on assumptions, if any",
    "category": "utilization category",
    "clamp_energy": "rated clamp energy",
    "clamp_needed": "energy to absorb",
    "contact": "switching element",
    "current": "breaking current",
    "devices": "devices",
    "diode": "diode",
    "diode_current": "diode current",
    "diode_voltage": "diode reverse voltage",
    "element": "element",
    "energy": "stored energy",
    "first": "first supply",
    "high": "upper limit",
    "high_voltage": "highest coil voltage",
    "hint": "hint",
    "inlet": "entry terminal",
    "kind": "suppressor kind",
    "load": "load",
    "loads": "loads",
    "low": "lower limit",
    "low_voltage": "lowest coil voltage",
    "members": "switching elements",
    "needed": "value needed",
    "negative": "negative side",
    "net": "net",
    "others": "other supplies",
    "outlet": "terminal the current enters at",
    "parts": "parts of the chain",
    "path": "conducting parts",
    "peak": "peak voltage",
    "peak_zener": "peak voltage with diode + zener",
    "percent": "percentage",
    "poles": "number of poles",
    "poles_list": "poles",
    "pole_voltage": "voltage per pole",
    "poles_needed": "number of poles needed",
    "positive": "positive side",
    "power": "dissipated power",
    "rated": "rating",
    "rating": "rating used",
    "ref": "device",
    "release_diode": "release time with the diode",
    "release_zener": "release time with diode + zener",
    "resistance": "coil resistance",
    "rule": "rule",
    "second": "second supply",
    "suggestion": "closest rule name",
    "supply": "supply",
    "range_supply": "supply with a voltage range",
    "external": "external suppressor",
    "external_peak": "voltage the external suppressor would hold",
    "internal_clamp": "internal clamp voltage",
    "zener_max": "highest zener voltage below the internal clamp",
    "supply_highest": "highest supply voltage of its range",
    "supply_lowest": "lowest supply voltage of its range",
    "t95": "T0.95",
    "t95_limit": "T0.95 of the rating",
    "tag": "tag",
    "target": "waived element",
    "tau": "L/R",
    "tau_limit": "L/R of the rating",
    "terminal": "terminal",
    "top": "highest rated voltage",
    "varistor_voltage": "varistor voltage",
    "voltage": "breaking voltage",
    "what": "value",
    "why": "reason",
    "zener_voltage": "zener voltage",
}

# Where one rule means something narrower by a name, keyed by (rule, name).
RULE_WORDS: dict[tuple[str, str], str] = {
    ("coil-supply-mismatch", "voltage"): "supply voltage",
    ("coil-supply-mismatch", "current"): "coil current",
    ("coil-voltage-out-of-range", "rated"): "rated coil voltage",
    ("coil-voltage-out-of-range", "low"): "lowest percentage",
    ("coil-voltage-out-of-range", "high"): "highest percentage",
    ("snubber-without-resistor", "low"): "lowest resistance",
    ("snubber-without-resistor", "high"): "highest resistance",
    ("snubber-without-resistor", "element"): "capacitor",
    ("category-mismatch", "rated"): "DC ratings",
    ("dc-break-ac-only", "rated"): "AC ratings",
    ("peak-voltage-over-rating", "rated"): "rated voltage",
    ("suppressor-conducts-normally", "rated"): "rated value",
    ("suppressor-conducts-normally", "voltage"): "voltage in service",
    ("suppressor-underrated", "rated"): "rated value",
    ("suppressor-underrated", "what"): "rating",
    ("rating-data-missing", "what"): "missing value",
    ("diode-on-ac-load", "voltage"): "supply voltage",
    ("freewheel-diode-reversed", "voltage"): "supply voltage",
    ("freewheel-diode-reversed", "current"): "short-circuit current",
    ("supply-short-circuit", "current"): "prospective current",
    ("internal-clamp-overloaded", "energy"): "energy the internal clamp absorbs",
    ("peak-voltage-over-rating", "zener_max"): "highest zener within voltage_max",
    ("supply-short-circuit", "element"): "supply",
    ("polarized-pole-reversed", "current"): "current",
    ("ac-output-on-dc", "current"): "load current",
    ("single-connection-net", "hint"): "hint at a similar net name",
    ("protection-dc-capacity", "voltage"): "highest supply voltage",
    ("protection-dc-capacity", "inlet"): "terminal the current enters at",
    ("making-over-rating", "allowed"): "making capacity",
    ("making-over-rating", "tau"): "charging time constant",
    ("making-over-rating", "t95"): "time to 95 % charge",
    ("making-over-rating", "voltage"): "supply voltage",
    ("unused-waiver", "why"): "why nothing matched",
}


def describe(rule: str, name: str) -> str:
    """The words for placeholder ``name`` of ``rule`` (KeyError if there are none)."""
    return RULE_WORDS.get((rule, name)) or WORDS[name]


def readable(template: str, rule: str) -> str:
    """Return ``template`` with each ``{name}`` written as ``<words>``.

    Example: ``readable("breaks {current}", "dc-break-over-rating")`` returns
    ``"breaks <breaking current>"``. A name without words falls back to the name
    itself with spaces, so help never shows a brace.
    """
    out = []
    for literal, name, _spec, _conversion in string.Formatter().parse(template):
        out.append(literal)
        if name is None:
            continue
        words = RULE_WORDS.get((rule, name)) or WORDS.get(name)
        out.append(f"<{words or name.replace('_', ' ')}>")
    return "".join(out)
