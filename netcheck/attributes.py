"""What each component kind and part key means: dimensions, choices, terminals."""

from __future__ import annotations

__all__ = [
    "QUANTITY_KEYS",
    "KIND_ATTRIBUTES",
    "KIND_TERMINALS",
    "COIL_KEYS",
    "CONTACT_KEYS",
    "LOAD_TYPES",
    "SUPPRESSION_KINDS",
]

# The dimension of every quantity-valued key, in netlists and part libraries alike.
QUANTITY_KEYS: dict[str, str] = {
    "dc": "voltage",
    "ac": "voltage",
    "freq": "frequency",
    "r_int": "resistance",
    "isc": "current",
    "voltage_max": "voltage",
    "current_max": "current",
    "clamp_voltage": "voltage",
    "clamp_energy": "energy",
    "R": "resistance",
    "L": "inductance",
    "tau": "time",
    "P": "power",
    "V": "voltage",
    "I": "current",
    "C": "capacitance",
    "voltage_rating": "voltage",
    "current_rating": "current",
    "vf": "voltage",
    "vz": "voltage",
    "power": "power",
    "standoff": "voltage",
    "vclamp": "voltage",
    "energy": "energy",
    "vdc_max": "voltage",
    "dc_voltage_rating": "voltage",
    "breaking_capacity": "current",
    "release_current": "current",
    "voltage": "voltage",
    "current": "current",
    "resistance": "resistance",
    "inductance": "inductance",
    "time_constant": "time",
    "gap": "length",
    "making_current": "current",
    "operating_range": "ratio",
    "alpha": "ratio",
}

LOAD_TYPES = (
    "resistive",
    "solenoid",
    "valve",
    "brake",
    "clutch",
    "motor",
    "lamp",
    "heater",
    "capacitive",
    "electronic",
    "coil",
)
SUPPRESSION_KINDS = ("none", "diode", "zener", "varistor", "rc", "tvs")
_YES_NO = ("yes", "no")

# Non-quantity attributes: their choices (a tuple), or "text"/"tags".
_CHOICES: dict[str, object] = {
    "part": "text",
    "tags": "tags",
    "earth": ("minus", "plus", "none", "mid"),
    "bidirectional": _YES_NO,
    "output": ("ac", "dc"),
    "type": LOAD_TYPES,
    "suppression": SUPPRESSION_KINDS,
    "polarized": _YES_NO,
    "form": ("single-break", "double-break"),
    "supply": ("dc", "ac", "ac/dc"),
    "economy": _YES_NO,
    "blowout": ("none", "permanent-magnet", "series-coil"),
}

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
KIND_ATTRIBUTES: dict[str, tuple[str, ...]] = {
    "supply": ("dc", "ac", "freq", "earth", "r_int", "isc", "bidirectional"),
    "relay": (),
    "contactor": (),
    "switch": (),
    "ssr": ("output", "voltage_max", "current_max", "clamp_voltage", "clamp_energy"),
    "output": ("voltage_max", "current_max", "clamp_voltage", "clamp_energy"),
    "load": ("type", "R", "L", "tau", "P", "V", "I", "suppression", "release_current"),
    "resistor": ("R", "P"),
    "capacitor": ("C", "voltage_rating"),
    "diode": ("voltage_rating", "current_rating", "vf"),
    "zener": ("vz", "power"),
    "tvs": ("standoff", "vclamp", "energy", "bidirectional"),
    "varistor": ("vdc_max", "vclamp", "energy", "alpha"),
    "rc": ("R", "C", "voltage_rating"),
    "fuse": ("dc_voltage_rating", "breaking_capacity"),
    "breaker": ("dc_voltage_rating", "breaking_capacity"),
}
KIND_ATTRIBUTES = {kind: (*keys, *_COMMON) for kind, keys in KIND_ATTRIBUTES.items()}

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


def choices(key: str) -> object:
    """The choices of a non-quantity key, 'text', 'tags', or None if unknown."""
    return _CHOICES.get(key)
