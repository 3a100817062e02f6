"""What each attribute and part key means: dimensions and choices.

Which kind takes which key, and its terminals, live in ``netcheck.kinds``.
"""

from __future__ import annotations

from netcheck.kinds import SUPPRESSION_CHOICES

__all__ = ["QUANTITY_KEYS", "LOAD_TYPES", "choices"]

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
    "ac_voltage_rating": "voltage",
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
    "series-motor",
    "lamp",
    "heater",
    "capacitive",
    "electronic",
    "coil",
)
_YES_NO = ("yes", "no")

# Non-quantity attributes: their choices (a tuple), or "text"/"tags".
_CHOICES: dict[str, object] = {
    "part": "text",
    "tags": "tags",
    "earth": ("minus", "plus", "none", "mid"),
    "bidirectional": _YES_NO,
    "output": ("ac", "dc"),
    "type": LOAD_TYPES,
    "suppression": SUPPRESSION_CHOICES,
    "polarized": _YES_NO,
    "form": ("single-break", "double-break"),
    "supply": ("dc", "ac", "ac/dc"),
    "economy": _YES_NO,
    "blowout": ("none", "permanent-magnet", "series-coil"),
}


def choices(key: str) -> object:
    """The choices of a non-quantity key, 'text', 'tags', or None if unknown."""
    return _CHOICES.get(key)
