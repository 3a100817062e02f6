"""Value ranges, ``LOW..HIGH``: a supply's voltage band around its nominal.

A battery float- or boost-charged, or a supply with a stated tolerance, does
not sit at its nominal voltage: a 110 V station battery is commonly charged at
up to about 125 V and may discharge to about 88 V (common practice; the
charger's and battery's data give the real band). A supply states that band as
``range=88V..125V`` beside its nominal ``dc=110V``. The checks that a higher
voltage makes harder (breaking voltage, suppressor ratings, peak voltages,
making and fault currents) are run at the top of the band, which is what
``highest_voltage`` returns.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

import pint

from netcheck.errors import QuantityError
from netcheck.quantity_hints import parse_with_hint
from netcheck.source import Span
from netcheck.units import check_sign, format_quantity

__all__ = [
    "RANGE_KEYS",
    "ValueRange",
    "parse_range",
    "check_nominal",
    "highest_voltage",
    "supply_range",
]

# Range-valued keys and the dimension of their two ends.
RANGE_KEYS: dict[str, str] = {"range": "voltage"}
_SEPARATOR = ".."


@dataclass(frozen=True)
class ValueRange:
    """A closed range ``low..high`` of one dimension (low <= high)."""

    low: pint.Quantity
    high: pint.Quantity

    def __str__(self) -> str:
        return f"{format_quantity(self.low)}..{format_quantity(self.high)}"

    def contains(self, value: pint.Quantity) -> bool:
        """Whether ``value`` lies within the range, ends included."""
        return bool(self.low <= value <= self.high)


def _shifted(span: Span | None, offset: int, length: int) -> Span | None:
    """The part of a one-line value span from ``offset`` for ``length`` chars."""
    if span is None or span.end_line not in (0, span.line):
        return span
    column = span.column + offset
    return replace(span, column=column, end_line=span.line, end_column=column + length)


def parse_range(
    key: str, text: str, span: Span | None = None, dimension: str | None = None
) -> ValueRange:
    """``LOW..HIGH`` for a range key; each end a quantity of the key's dimension.

    Errors are located on the end at fault (``span`` is the value's span).
    ``dimension`` serves a key that is not a netlist attribute (an option).
    """
    dimension = dimension or RANGE_KEYS[key.rsplit(".", 1)[-1]]
    example = f"write {key}=LOW..HIGH, e.g. {key}=88V..125V"
    low_text, sep, high_text = text.partition(_SEPARATOR)
    if not sep or not low_text or not high_text or _SEPARATOR in high_text:
        raise QuantityError(f"{key}={text} is not a range: {example}", span)
    ends = []
    for offset, part in ((0, low_text), (len(low_text) + 2, high_text)):
        where = _shifted(span, offset, len(part))
        quantity = parse_with_hint(part, dimension, where)
        check_sign(key, quantity, where)
        ends.append(quantity)
    low, high = ends
    if low > high:
        raise QuantityError(
            f"{key}={text} runs backwards: its low end {format_quantity(low)} is "
            f"above its high end {format_quantity(high)}; write "
            f"{key}={high_text}..{low_text}",
            span,
        )
    return ValueRange(low, high)


def check_nominal(values: dict[str, Any], span: Span) -> None:
    """Refuse a supply whose nominal voltage lies outside its stated range."""
    band = values.get("range")
    if not isinstance(band, ValueRange):
        return
    key = "ac" if values.get("ac") is not None else "dc"
    nominal = values.get(key)
    if nominal is None:
        raise QuantityError(
            f"range={band} needs the nominal voltage beside it (dc= or ac=)", span
        )
    if not band.contains(nominal):
        raise QuantityError(
            f"the nominal {key}={format_quantity(nominal)} lies outside "
            f"range={band}: the range must include the nominal voltage",
            span,
        )


def supply_range(supply: Any) -> ValueRange | None:
    """A supply component's stated voltage range, or None."""
    band = supply.value("range")
    return band if isinstance(band, ValueRange) else None


def highest_voltage(supply: Any, key: str = "dc") -> pint.Quantity | None:
    """A supply's highest voltage: the top of its range, else its nominal."""
    band = supply_range(supply)
    if band is not None and supply.value(key) is not None:
        return band.high
    return supply.value(key)
