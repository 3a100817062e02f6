"""The findings of the JSON report written straight to text, without dicts.

``findings_text(findings, catalogue, pad)`` returns exactly what the generic
writer (``netcheck.report.json.dump``) makes of the list
``[finding_dict(f, catalogue.get(f.rule)) for f in findings]`` written at
``pad``: the same keys in the same order, the same escaping, the same float
reprs. A heavy report holds tens of thousands of findings of one shape, and
building a dict per finding and per value, then walking them generically,
costs more than the rest of the run's reporting together.
tests/report/test_json_findings.py compares the two paths on varied designs.
"""

from __future__ import annotations

import json
import math
from collections.abc import Iterable, Mapping
from typing import Any

import pint

from netcheck.catalogue import RuleMeta
from netcheck.findings import Finding, negative_zero, quantity_dict
from netcheck.fixes.edits import edit_dict
from netcheck.report import fix_names, references

__all__ = ["findings_text"]

_escape = json.encoder.encode_basestring  # the ensure_ascii=False escaper


def findings_text(
    findings: Iterable[Finding], catalogue: Mapping[str, RuleMeta], pad: str
) -> str:
    """The JSON list of ``findings`` as ``dump`` writes it at ``pad``."""
    from netcheck.report.json import write  # the generic writer, for rare values

    inner = pad + "  "
    parts = [_finding(f, catalogue.get(f.rule), inner, write) for f in findings]
    if not parts:
        return "[]"
    return "[" + inner + ("," + inner).join(parts) + pad + "]"


def _scalar(value: Any, pad: str, write: Any) -> str:
    """``value`` as ``dump`` writes it at ``pad`` (lists and dicts too)."""
    kind = type(value)
    if kind is str:
        return _escape(value)
    if kind is int:
        return int.__repr__(value)
    if value is None:
        return "null"
    if kind is list and not value:
        return "[]"
    out: list[str] = []
    write(value, pad, out)
    return "".join(out)


def _finding(finding: Finding, meta: RuleMeta | None, pad: str, write: Any) -> str:
    """One finding as ``dump`` writes ``finding_dict(finding, meta)`` at ``pad``."""
    p = pad + "  "
    span = finding.span
    return (
        f"{_head(finding, p, write)}"
        f',{p}"message": {_scalar(finding.message, p, write)}'
        f',{p}"file": {_scalar(span.file, p, write)}'
        f',{p}"line": {_scalar(span.line, p, write)}'
        f',{p}"column": {_scalar(span.column, p, write)}'
        f',{p}"element": {_scalar(finding.element, p, write)}'
        f',{p}"values": {_values(finding.values, p, write)}'
        f',{p}"fix": {_fix(finding, meta, p, write)}'
        f',{p}"references": {_references(finding, meta, p, write)}'
        f',{p}"fingerprint": {_scalar(finding.fingerprint, p, write)}'
        f',{p}"waived": {_scalar(finding.waived, p, write)}'
        f"{pad}}}"
    )


# The opening of a finding's object by (pad, rule, severity label).
_HEADS: dict[tuple[str, Any, str], str] = {}


def _head(finding: Finding, pad: str, write: Any) -> str:
    label = finding.severity.label
    key = (pad, finding.rule, label)
    text = _HEADS.get(key)
    if text is None:
        if len(_HEADS) > 10_000:
            _HEADS.clear()
        text = _HEADS[key] = (
            f'{{{pad}"rule": {_scalar(finding.rule, pad, write)}'
            f',{pad}"severity": {_scalar(label, pad, write)}'
        )
    return text


def _values(values: Mapping[str, Any], pad: str, write: Any) -> str:
    """``value_dicts(values)`` as ``dump`` writes it at ``pad``."""
    if not values:
        return "{}"
    inner = pad + "  "
    members = [_member(name, values[name], inner, write) for name in sorted(values)]
    return "{" + inner + ("," + inner).join(members) + pad + "}"


# Written members ("name": entry) by (pad, name, units, magnitude type,
# magnitude): a heavy report writes the same few quantities thousands of
# times. These are all a quantity's entry reads (quantity_dict looks at its
# units and float or int magnitude only). 0.0 and -0.0 are one dict key but
# write differently, so a zero's key holds its sign too.
_WRITTEN: dict[tuple[str, str, Any, type, Any, bool], str] = {}


def _member(name: Any, value: Any, pad: str, write: Any) -> str:
    """One member of ``value_dicts``, name and entry, as ``dump`` writes it."""
    if type(value) is str and type(name) is str:
        # quantity_dict of a string: no value, no unit, the string as text.
        inner = pad + "  "
        return (
            f'{_escape(name)}: {{{inner}"value": null,{inner}"unit": "",'
            f'{inner}"text": {_escape(value)}{pad}}}'
        )
    if type(name) is str and isinstance(value, pint.Quantity):
        magnitude = value._magnitude
        if type(magnitude) in (float, int):
            sign = negative_zero(magnitude)
            key = (pad, name, value._units, type(magnitude), magnitude, sign)
            text = _WRITTEN.get(key)
            if text is None:
                if len(_WRITTEN) > 100_000:
                    _WRITTEN.clear()
                entry = _written_entry(value, pad, write)
                text = _WRITTEN[key] = f"{_escape(name)}: {entry}"
            return text
    shown = name if isinstance(name, str) else json.dumps(name)
    return f"{_escape(shown)}: {_written_entry(value, pad, write)}"


def _written_entry(value: Any, pad: str, write: Any) -> str:
    entry = quantity_dict(value)
    number = entry["value"]
    if isinstance(number, float) and not math.isfinite(number):
        entry = {**entry, "value": None}  # as value_dicts: JSON has no NaN
    out: list[str] = []
    write(entry, pad, out)
    return "".join(out)


def _fix(finding: Finding, meta: RuleMeta | None, pad: str, write: Any) -> str:
    """``fix_dict(finding, meta)`` as ``dump`` writes it at ``pad``."""
    if finding.fix is None:
        return "null"
    used = fix_names(meta)
    p = pad + "  "
    values = finding.values
    shown = _values({k: values[k] for k in values if k in used}, p, write)
    edits = [edit_dict(edit) for edit in finding.edits]
    return (
        f'{{{p}"text": {_scalar(finding.fix, p, write)}'
        f',{p}"values": {shown}'
        f',{p}"edits": {_scalar(edits, p, write)}'
        f',{p}"verified": {_scalar(finding.verified, p, write)}'
        f"{pad}}}"
    )


# Written reference lists by (pad, references): a rule's findings share one.
_REFERENCES: dict[tuple[str, tuple[str, ...]], str] = {}


def _references(finding: Finding, meta: RuleMeta | None, pad: str, write: Any) -> str:
    """``references(finding, meta)`` as ``dump`` writes it at ``pad``."""
    shown = tuple(references(finding, meta))
    key = (pad, shown)
    text = _REFERENCES.get(key)
    if text is None:
        text = _scalar(list(shown), pad, write)
        if len(_REFERENCES) > 10_000:
            _REFERENCES.clear()
        _REFERENCES[key] = text
    return text
