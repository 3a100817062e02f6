"""The one unit registry of netcheck and the parsing of quantities."""

from __future__ import annotations

import functools
import math
import re

import pint

from netcheck.errors import QuantityError
from netcheck.source import Span

__all__ = [
    "ureg",
    "Q_",
    "Quantity",
    "DIMENSIONS",
    "parse_quantity",
    "format_quantity",
    "unit_symbol",
    "check_sign",
    "MAY_BE_ZERO",
]

ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
# Quantities that cross process boundaries (--jobs) unpickle into this registry.
pint.set_application_registry(ureg)
# pint parses a unit string such as "ms" afresh on every conversion; the
# analysis converts millions of times on large designs, so remember the answers
# (the containers returned are immutable).
_parse_units = ureg.parse_units_as_container
ureg.parse_units_as_container = functools.lru_cache(maxsize=1024)(  # type: ignore
    _parse_units
)
Q_ = ureg.Quantity
Quantity = pint.Quantity

# Attribute dimensions by name, each with the SI unit used for output.
DIMENSIONS: dict[str, str] = {
    "voltage": "V",
    "current": "A",
    "resistance": "ohm",
    "inductance": "H",
    "capacitance": "F",
    "time": "s",
    "energy": "J",
    "power": "W",
    "frequency": "Hz",
    "length": "m",
    "ratio": "",
}
_SYMBOL = {"ohm": "Ω", "": ""}
_NUMBER = re.compile(
    r"\s*([+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?)\s*(.*?)\s*\Z"
)
_UNIT = re.compile(r"\A[A-Za-zΩµμ%°]+\Z")
# Magnitudes beyond these are typing mistakes, not circuits.
_LIMIT = 1e15


def parse_quantity(
    text: str, dimension: str, span: Span | None = None
) -> pint.Quantity:
    """Parse ``24V`` or ``"48 ohm"`` as a ``dimension``; raise QuantityError if not."""
    match = _NUMBER.match(text)
    if match is None:
        raise QuantityError(f"expected a {dimension} such as '24V', got {text!r}", span)
    number, unit = match.groups()
    value = float(number)
    if not math.isfinite(value) or abs(value) > _LIMIT:
        raise QuantityError(f"{text!r} is out of range", span)
    if unit == "":
        if dimension == "ratio":
            return Q_(value, "")
        raise QuantityError(
            f"{text!r} has no unit; expected a {dimension} in {DIMENSIONS[dimension]}",
            span,
        )
    if not _UNIT.match(unit):
        raise QuantityError(f"unknown unit {unit!r} in {text!r}", span)
    try:
        units = ureg.parse_units(unit.replace("μ", "u").replace("µ", "u"))
    except (pint.errors.UndefinedUnitError, ValueError, AttributeError, TypeError):
        raise QuantityError(f"unknown unit {unit!r} in {text!r}", span) from None
    quantity = Q_(value, units)
    want = Q_(1, DIMENSIONS[dimension])
    if quantity.dimensionality != want.dimensionality:
        raise QuantityError(
            f"expected a {dimension}, got {text!r} ({_describe(quantity)})", span
        )
    converted = quantity.to(DIMENSIONS[dimension])
    if abs(float(converted.magnitude)) > _LIMIT:  # the prefix counts: 1e15 kV
        raise QuantityError(f"{text!r} is out of range", span)
    return converted


def _describe(quantity: pint.Quantity) -> str:
    for name, unit in DIMENSIONS.items():
        if unit and quantity.dimensionality == Q_(1, unit).dimensionality:
            return f"a {name}"
    return f"dimension {quantity.dimensionality}"


# Keys whose value may be zero (no internal resistance, no inductance, release at
# zero current); every other quantity must be above zero to mean anything.
MAY_BE_ZERO = frozenset(
    {"r_int", "L", "tau", "inductance", "time_constant", "release_current", "min_load"}
)


def check_sign(key: str, quantity: pint.Quantity, span: Span | None = None) -> None:
    """Refuse negative values, and zero where the key cannot be zero."""
    magnitude = float(quantity.magnitude)
    base = key.rsplit(".", 1)[-1]
    if magnitude < 0 or (magnitude == 0 and base not in MAY_BE_ZERO):
        bound = "at least 0" if base in MAY_BE_ZERO else "above 0"
        raise QuantityError(
            f"{key} must be {bound}, got {format_quantity(quantity)}", span
        )


# SI prefixes by power of ten; a prefix is only ever put on an unprefixed unit.
_PREFIXES = {
    -15: "f",
    -12: "p",
    -9: "n",
    -6: "µ",
    -3: "m",
    0: "",
    3: "k",
    6: "M",
    9: "G",
    12: "T",
}


# Both depend on the unit alone (pint's hashable units container): a report of
# thousands of findings formats a handful of distinct units.
_BASES: dict[object, str | None] = {}
_SYMBOLS: dict[object, str] = {}


def unit_symbol(quantity: pint.Quantity) -> str:
    """The unit's short symbol as pint prints it (``f"{q.units:~}"``), memoised."""
    key = quantity._units
    symbol = _SYMBOLS.get(key)
    if symbol is None:
        symbol = _SYMBOLS[key] = f"{quantity.units:~}"
    return symbol


def _base_unit(quantity: pint.Quantity) -> str | None:
    key = quantity._units
    if key not in _BASES:
        _BASES[key] = _find_base_unit(quantity)
    return _BASES[key]


def _find_base_unit(quantity: pint.Quantity) -> str | None:
    """The unprefixed unit to print ``quantity`` in, or None for no prefix at all.

    A quantity of a known dimension goes to its SI unit (``ms`` -> ``s``); another
    single unit loses its prefix (``kWh`` is left alone: it is not one unit).
    """
    for unit in DIMENSIONS.values():
        if unit and quantity.dimensionality == Q_(1, unit).dimensionality:
            return unit
    items = list(quantity.unit_items())
    if len(items) != 1 or items[0][1] != 1:
        return None
    names = ureg.parse_unit_name(items[0][0])
    if len(names) != 1:
        return None
    prefix, name, _suffix = names[0]
    return name if prefix else None


def format_quantity(quantity: pint.Quantity, digits: int = 4) -> str:
    """Format with one engineering prefix: ``Q_(0.048, 'ms')`` -> ``'48 µs'``.

    The prefix is chosen from the magnitude in the unprefixed unit, so prefixes
    never stack (``0.0005 kV`` prints ``500 mV``, not ``500 µkV``).
    """
    base = _base_unit(quantity)
    if base is not None:
        quantity = quantity.to(base)
    magnitude = float(quantity.magnitude)
    unit = unit_symbol(quantity)
    symbol = _SYMBOL.get(unit, unit)
    if symbol in ("", "dimensionless"):
        return f"{magnitude:.{digits}g}"
    if base is None or magnitude == 0 or not math.isfinite(magnitude):
        return f"{magnitude:.{digits}g} {symbol}"
    exponent = int(math.floor(math.log10(abs(magnitude)) / 3) * 3)
    if exponent not in _PREFIXES:
        return f"{magnitude:.{digits}g} {symbol}"
    scaled = float(f"{magnitude / 10**exponent:.{digits}g}")
    if abs(scaled) >= 1000 and exponent + 3 in _PREFIXES:
        # 999.96 m rounds to 1000 m: print it as 1 of the next prefix instead.
        exponent += 3
        scaled = float(f"{magnitude / 10**exponent:.{digits}g}")
    return f"{scaled:.{digits}g} {_PREFIXES[exponent]}{symbol}"
