"""Findings: what a check reports, with its values, fix and stable fingerprint."""

from __future__ import annotations

import enum
import hashlib
import math
import string
from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any

import pint

from netcheck.source import Span
from netcheck.units import Q_, format_quantity, unit_symbol

__all__ = [
    "Severity",
    "Finding",
    "evolve",
    "negative_zero",
    "fill_template",
    "fingerprint",
    "stamp_fingerprint",
    "quantity_dict",
]


class Severity(enum.IntEnum):
    """Finding severities, ordered so that a larger value is more severe."""

    INFO = 1
    WARNING = 2
    ERROR = 3

    @property
    def label(self) -> str:
        """The lower-case name used in output and configuration."""
        return self.name.lower()

    @classmethod
    def parse(cls, text: str) -> Severity:
        """Parse ``error``/``warning``/``info``."""
        return cls[text.upper()]


# Formatted quantities by (units, magnitude type, magnitude, sign of zero): a
# heavy report words the same few values thousands of times. 0.0 and -0.0 are
# one dict key but print differently, so a zero's key holds its sign too.
_FORMATTED: dict[tuple[Any, type, Any, bool], str] = {}


# The same texts for non-zero float magnitudes by (magnitude, identity of the
# units): no units hash, no sign of zero to ask. The units are kept beside the
# text, so an identity met again is the same object.
_FORMATTED_FLOATS: dict[tuple[float, int], tuple[Any, str]] = {}


def _quantity_text(value: pint.Quantity) -> str:
    magnitude = value._magnitude
    if type(magnitude) is float and magnitude:
        units = value._units
        found = _FORMATTED_FLOATS.get((magnitude, id(units)))
        if found is not None and found[0] is units:
            return found[1]
        if len(_FORMATTED_FLOATS) > 100_000:
            _FORMATTED_FLOATS.clear()
        text = _quantity_text_keyed(value, magnitude)
        _FORMATTED_FLOATS[(magnitude, id(units))] = (units, text)
        return text
    return _quantity_text_keyed(value, magnitude)


def _quantity_text_keyed(value: pint.Quantity, magnitude: Any) -> str:
    if type(magnitude) not in (float, int):
        return format_quantity(value)
    key = (value._units, type(magnitude), magnitude, negative_zero(magnitude))
    text = _FORMATTED.get(key)
    if text is None:
        if len(_FORMATTED) > 100_000:
            _FORMATTED.clear()
        text = _FORMATTED[key] = format_quantity(value)
    return text


def negative_zero(magnitude: float | int) -> bool:
    """Whether ``magnitude`` is -0.0 (equal to 0.0 as a key, printed apart)."""
    return not magnitude and math.copysign(1.0, magnitude) < 0


# The default of Finding.values: a fresh dict per finding, as field(default_factory).
_NEW_DICT: Any = object()


def _text(value: Any) -> str:
    if isinstance(value, pint.Quantity):
        return _quantity_text(value)
    if isinstance(value, float):
        return f"{value:.4g}"
    if isinstance(value, (list, tuple, frozenset, set)):
        return ", ".join(str(v) for v in value)
    return str(value)


def fill_template(
    template: str,
    values: Mapping[str, Any],
    absent: Mapping[str, tuple[str, ...]] | None = None,
) -> str:
    """Fill ``{name}`` placeholders with formatted values (KeyError if missing).

    A value of None is written as the first of ``absent[name]`` whose own
    placeholders are all known (the rule's YAML words what is missing), else
    as ``none``. Findings keep None; the wording stays in the templates.
    """
    form, names = _compiled(template)
    texts = []
    for name in names:
        value = values.get(name, _MISSING)
        kind = type(value)
        if kind is str:
            texts.append(value)  # what _text writes of a string: itself
        elif kind is Q_ or isinstance(value, pint.Quantity):
            texts.append(_quantity_text(value))  # what _text writes of one
        elif value is None:
            texts.append(_absent(name, values, absent or {}))
        elif value is _MISSING:
            raise KeyError(name)
        else:
            texts.append(_text(value))
    return form.format(*texts)


_MISSING: Any = object()


@lru_cache(maxsize=1024)
def _compiled(template: str) -> tuple[str, tuple[str, ...]]:
    """The template as a positional format string and its placeholder names.

    The literal text has its braces doubled again; format specs and
    conversions are dropped, as the pieces of ``_parsed`` leave them out.
    """
    form, names = [], []
    for literal, name in _parsed(template):
        form.append(literal.replace("{", "{{").replace("}", "}}"))
        if name is not None:
            form.append("{}")
            names.append(name)
    return "".join(form), tuple(names)


@lru_cache(maxsize=1024)
def _parsed(template: str) -> tuple[tuple[str, str | None], ...]:
    """A template's (literal, placeholder name) pieces, parsed once per text."""
    return tuple((lit, name) for lit, name, _, _ in string.Formatter().parse(template))


def _absent(
    name: str, values: Mapping[str, Any], absent: Mapping[str, tuple[str, ...]]
) -> str:
    for text in absent.get(name, ()):
        if all(values.get(p) is not None for p in placeholders(text)):
            return fill_template(text, values, absent)
    return "none"


def placeholders(template: str) -> set[str]:
    """Return the placeholder names of a template."""
    return {name for _, name, _, _ in string.Formatter().parse(template) if name}


def quantity_dict(value: Any) -> dict[str, Any]:
    """Return ``{"value": float, "unit": "V", "text": "24 V"}`` for a quantity."""
    if isinstance(value, pint.Quantity):
        unit = unit_symbol(value)
        return {
            # 12 significant digits: exact enough, and free of solver round-off.
            "value": float(f"{float(value.magnitude):.12g}"),
            "unit": "ohm" if unit == "Ω" else unit,
            "text": _quantity_text(value),
        }
    if isinstance(value, bool) or value is None:
        return {"value": value, "unit": "", "text": str(value)}
    if isinstance(value, (int, float)):
        return {"value": float(value), "unit": "", "text": f"{value:g}"}
    return {"value": None, "unit": "", "text": _text(value)}


def fingerprint(rule: str, file: str, element: str, key: str = "") -> str:
    """A stable identity for a finding: independent of lines, columns and wording."""
    digest = hashlib.sha256(f"{rule}\x00{file}\x00{element}\x00{key}".encode())
    return digest.hexdigest()[:16]


@dataclass(frozen=True)
class Finding:
    """One reported hazard, anchored on a component statement.

    ``values`` are raw: quantities, numbers, names, or None where a value is
    unknown or does not exist; the rule's templates word them.
    """

    rule: str
    severity: Severity
    message: str  # the rendered text of the message variant ``variant``
    span: Span
    element: str
    values: Mapping[str, Any] = field(default_factory=dict)
    fix: str | None = None
    references: tuple[str, ...] = ()
    key: str = ""
    fingerprint: str = ""
    waived: str | None = None
    variant: str = "default"  # the rule's message variant the text came from
    # Machine-applicable edits of the fix (netcheck.fixes.edits) and whether
    # applying them was verified to clear the finding; None: not verified yet.
    edits: tuple[Any, ...] = ()
    verified: bool | None = None

    def __init__(
        self,
        rule: str,
        severity: Severity,
        message: str,
        span: Span,
        element: str,
        values: Mapping[str, Any] = _NEW_DICT,
        fix: str | None = None,
        references: tuple[str, ...] = (),
        key: str = "",
        fingerprint: str = "",
        waived: str | None = None,
        variant: str = "default",
        edits: tuple[Any, ...] = (),
        verified: bool | None = None,
    ) -> None:
        # What the dataclass's own __init__ does (tests/test_model_init.py),
        # without a frozen-attribute call per field: a heavy report builds
        # each of its thousands of findings twice (made, then fingerprinted).
        fields = self.__dict__
        fields["rule"] = rule
        fields["severity"] = severity
        fields["message"] = message
        fields["span"] = span
        fields["element"] = element
        fields["values"] = {} if values is _NEW_DICT else values
        fields["fix"] = fix
        fields["references"] = references
        fields["key"] = key
        fields["fingerprint"] = fingerprint
        fields["waived"] = waived
        fields["variant"] = variant
        fields["edits"] = edits
        fields["verified"] = verified

    def sort_key(self) -> tuple[Any, ...]:
        """Deterministic order: file, line, column, rule, element."""
        return (
            self.span.file,
            self.span.line,
            self.span.column,
            self.rule,
            self.element,
        )


_FIELDS = frozenset(Finding.__dataclass_fields__)


def evolve(finding: Finding, **changes: Any) -> Finding:
    """``dataclasses.replace(finding, **changes)``, without a call per field.

    Finding's ``__init__`` stores each argument as it is (values given are
    kept, not copied), so a copy of its fields with the changes is the finding
    ``replace`` builds; a heavy report evolves every finding once or twice.
    tests/test_model_init.py compares the two.
    """
    kind = type(finding)
    names = _FIELDS if kind is Finding else kind.__dataclass_fields__.keys()
    unknown = changes.keys() - names
    if unknown:
        raise TypeError(f"{kind.__name__} has no field {sorted(unknown)[0]!r}")
    made = object.__new__(kind)
    fields = made.__dict__
    fields.update(finding.__dict__)
    fields.update(changes)
    return made


def stamp_fingerprint(finding: Finding, mark: str) -> None:
    """Set the fingerprint of a finding that nothing else holds yet.

    ``evolve(finding, fingerprint=mark)`` without the copy, for the pipeline
    that has just made its findings: a heavy report makes tens of thousands,
    and a copy of each would be alive beside it until the last is made.
    Findings are frozen for everyone else; the fingerprint depends only on
    the finding's own rule, element and key, so stamping a finding a check
    yielded twice gives it the one fingerprint either copy would have had.
    """
    finding.__dict__["fingerprint"] = mark
