"""What to write instead, for a quantity that does not parse as its dimension.

Two slips account for most bad quantities: a decimal comma (``4,7kohm``) and a
unit in the wrong case (``200mh`` is 200 milli-hours, ``48Ohm`` is no unit at
all). Units are case-sensitive because their prefixes are (m is milli, M is
mega; SI Brochure, 9th edition, 3), so the hint proposes the spelling with the
fewest case changes that has the dimension the attribute needs (a mega or
larger prefix last: in a control circuit 300MS means milliseconds).
"""

from __future__ import annotations

import itertools
import re

import pint

from netcheck.errors import QuantityError
from netcheck.source import Span
from netcheck.units import DIMENSIONS, Q_, parse_quantity, ureg

__all__ = ["quantity_hint", "parse_with_hint"]

_COMMA = re.compile(r"\A([+-]?\d+),(\d+)(.*)\Z")
_SPLIT = re.compile(
    r"\A([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)([ \t]*)([A-Za-z]+)\Z"
)
# Case variants tried; beyond this a unit is not a case slip.
_MAX_LETTERS = 6


def quantity_hint(text: str, dimension: str) -> str | None:
    """A hint saying what to write for ``text`` as a ``dimension``, or None."""
    comma = _COMMA.match(text)
    if comma:
        number, fraction, unit = comma.groups()
        return (
            f"{text!r} has a decimal comma: write {number}.{fraction}{unit} "
            "(the decimal mark is a point)"
        )
    split = _SPLIT.match(text)
    if split is None or dimension not in DIMENSIONS or not DIMENSIONS[dimension]:
        return None
    number, space, unit = split.groups()
    spelling = _case_fix(unit, dimension)
    if spelling is None:
        return None
    number += space
    also = f" (or {number}Ω)" if spelling.endswith("ohm") and len(spelling) < 5 else ""
    # Name the prefix rule only where a prefix letter is in play.
    prefixes = " (m is milli, M is mega)" if unit[0] in "mM" and len(unit) > 1 else ""
    return f"units are case-sensitive{prefixes}: write {number}{spelling}{also}"


def parse_with_hint(
    text: str, dimension: str, span: Span | None = None
) -> pint.Quantity:
    """``units.parse_quantity``, its error saying what to write where it can."""
    try:
        return parse_quantity(text, dimension, span)
    except QuantityError as error:
        hint = quantity_hint(text, dimension)
        if hint is None:
            raise
        message = hint if "," in text else f"{error.message}; {hint}"
        raise QuantityError(message, error.span) from None


def _case_fix(unit: str, dimension: str) -> str | None:
    if len(unit) > _MAX_LETTERS:
        return None
    want = Q_(1, DIMENSIONS[dimension]).dimensionality
    found: list[tuple[bool, int, str]] = []
    for variant in _variants(unit):
        if variant == unit:
            continue
        try:
            units = ureg.parse_units(variant)
        except (pint.errors.UndefinedUnitError, ValueError, AttributeError):
            continue
        if Q_(1, units).dimensionality == want:
            changes = sum(a != b for a, b in zip(unit, variant, strict=True))
            found.append((_large_prefix(variant), changes, variant))
    return min(found)[2] if found else None


def _large_prefix(unit: str) -> bool:
    # Mega and above are rarely meant in a control circuit (300MS means ms).
    return len(unit) > 1 and unit[0] in "MGTP"


def _variants(unit: str) -> list[str]:
    letters = [(c.lower(), c.upper()) for c in unit]
    return ["".join(choice) for choice in itertools.product(*letters)]
