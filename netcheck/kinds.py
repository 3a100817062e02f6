"""Everything the tool knows about component kinds: names, families, terminals.

The one home for kind knowledge (language.md, "Component kinds"): input
reading, the graph, the analysis and the checks all ask here, so a new kind or
a change of family is one edit. It sits left of the model in the pipeline and
imports nothing of netcheck.
"""

from __future__ import annotations

__all__ = [
    "KINDS",
    "POLE_KINDS",
    "MECHANICAL_KINDS",
    "COIL_KINDS",
    "SEMICONDUCTOR_KINDS",
    "SWITCHING_KINDS",
    "PROTECTIVE_KINDS",
    "SUPPRESSOR_KINDS",
    "NON_CONDUCTING_KINDS",
    "RECTIFYING_KINDS",
    "POLARIZED_SUPPRESSORS",
    "SUPPRESSION_CHOICES",
    "KIND_ATTRIBUTES",
    "KIND_TERMINALS",
    "OUTPUT_TERMINALS",
    "COIL_KEYS",
    "CONTACT_KEYS",
    "conducts_one_way",
]

# The component kinds of the language, in the spec's order.
KINDS: tuple[str, ...] = (
    "supply",
    "relay",
    "contactor",
    "switch",
    "ssr",
    "output",
    "load",
    "resistor",
    "capacitor",
    "diode",
    "zener",
    "tvs",
    "varistor",
    "rc",
    "fuse",
    "breaker",
)
# Kinds whose contacts are poles, found from part data or terminal markings.
POLE_KINDS = frozenset({"relay", "contactor", "switch"})
# Kinds that break a current by separating metal contacts (an arc can form).
MECHANICAL_KINDS = POLE_KINDS
# Kinds with a coil between A1 and A2.
COIL_KINDS = frozenset({"relay", "contactor"})
# Kinds that switch with a semiconductor output (no contact arc).
SEMICONDUCTOR_KINDS = frozenset({"ssr", "output"})
SWITCHING_KINDS = POLE_KINDS | SEMICONDUCTOR_KINDS
# Fuses and breakers: poles 1-2 (3-4, 5-6) that conduct until they trip.
PROTECTIVE_KINDS = frozenset({"fuse", "breaker"})
# Two-terminal parts that may suppress a switching transient.
SUPPRESSOR_KINDS = frozenset(
    {"diode", "zener", "tvs", "varistor", "rc", "capacitor", "resistor"}
)
# Branches that carry no current in a DC steady state and do not join domains.
NON_CONDUCTING_KINDS = frozenset({"capacitor", "rc", "varistor", "tvs"})
# Kinds solved as diodes (one conducting direction) in the DC operating point.
RECTIFYING_KINDS = frozenset({"diode", "zener", "tvs"})
# Suppression arrangements that only work one way round (their chain names,
# as analysis/suppression.py builds them).
POLARIZED_SUPPRESSORS = frozenset({"diode", "diode-zener", "zener", "diode-resistor"})
# The values of a load's or coil's ``suppression=`` (a built-in suppressor).
SUPPRESSION_CHOICES = ("none", "diode", "zener", "varistor", "rc", "tvs")

COIL_KEYS = (
    "supply",
    "voltage",
    "resistance",
    "inductance",
    "time_constant",
    "suppression",
    "economy",
    "release_current",
)
CONTACT_KEYS = ("form", "voltage_max", "polarized", "making_current", "blowout")

_COMMON = ("part", "tags")
_OWN_ATTRIBUTES: dict[str, tuple[str, ...]] = {
    "supply": (
        "dc",
        "ac",
        "range",
        "freq",
        "earth",
        "r_int",
        "isc",
        "bidirectional",
    ),
    "relay": (),
    "contactor": (),
    "switch": (),
    "ssr": ("output", "voltage_max", "current_max", "clamp_voltage", "clamp_energy"),
    "output": ("voltage_max", "current_max", "clamp_voltage", "clamp_energy"),
    "load": ("type", "R", "L", "tau", "P", "V", "I", "suppression", "release_current"),
    "resistor": ("R", "P"),
    "capacitor": ("C", "voltage_rating"),
    "diode": ("voltage_rating", "current_rating", "vf"),
    "zener": ("vz", "power", "energy"),
    "tvs": ("standoff", "vclamp", "energy", "bidirectional"),
    "varistor": ("vdc_max", "vclamp", "energy", "alpha"),
    "rc": ("R", "C", "voltage_rating"),
    "fuse": (
        "dc_voltage_rating",
        "ac_voltage_rating",
        "breaking_capacity",
        "current_rating",
    ),
    "breaker": (
        "dc_voltage_rating",
        "ac_voltage_rating",
        "breaking_capacity",
        "polarized",
        "current_rating",
    ),
}
# The attributes each kind takes inline (``contacts.*``/``coil.*`` come on top
# for pole kinds; see input/cnet/build.py).
KIND_ATTRIBUTES: dict[str, tuple[str, ...]] = {
    kind: (*keys, *_COMMON) for kind, keys in _OWN_ATTRIBUTES.items()
}

# Fixed terminal sets; None means poles decide (relay, contactor, switch, fuse).
KIND_TERMINALS: dict[str, tuple[tuple[str, ...], ...] | None] = {
    "supply": (("+", "-"), ("L", "N")),
    "ssr": (("+", "-"), ("1", "2")),
    "output": (("+", "-"), ("Q", "M")),
    "load": (("1", "2"), ("+", "-")),
    "resistor": (("1", "2"),),
    "capacitor": (("1", "2"), ("+", "-")),
    "diode": (("A", "K"),),
    "zener": (("A", "K"),),
    "tvs": (("A", "K"), ("1", "2")),
    "varistor": (("1", "2"),),
    "rc": (("1", "2"),),
    "relay": None,
    "contactor": None,
    "switch": None,
    "fuse": None,
    "breaker": None,
}
# The output terminal pairs of a semiconductor switch, first to second.
OUTPUT_TERMINALS = (("+", "-"), ("1", "2"), ("Q", "M"))


def conducts_one_way(kind: str, bidirectional: object, terminals: set[str]) -> bool:
    """Whether a part conducts one way only (a diode in the operating point).

    A TVS is unidirectional by its ``bidirectional`` value where given, else by
    its terminals: A/K marks a polarized part, 1/2 a bidirectional one
    (language.md, component kinds).
    """
    if kind not in RECTIFYING_KINDS:
        return False
    if bidirectional is not None:
        return not bidirectional
    return kind != "tvs" or bool(terminals & {"A", "K"})
