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
from netcheck.findings import Finding, quantity_dict
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
    entries = _entries(finding.values, p, write)
    return (
        f'{{{p}"rule": {_scalar(finding.rule, p, write)}'
        f',{p}"severity": {_escape(finding.severity.label)}'
        f',{p}"message": {_scalar(finding.message, p, write)}'
        f',{p}"file": {_scalar(span.file, p, write)}'
        f',{p}"line": {_scalar(span.line, p, write)}'
        f',{p}"column": {_scalar(span.column, p, write)}'
        f',{p}"element": {_scalar(finding.element, p, write)}'
        f',{p}"values": {_object(entries, p)}'
        f',{p}"fix": {_fix(finding, meta, p, write)}'
        f',{p}"references": {_references(finding, meta, p, write)}'
        f',{p}"fingerprint": {_scalar(finding.fingerprint, p, write)}'
        f',{p}"waived": {_scalar(finding.waived, p, write)}'
        f"{pad}}}"
    )


def _object(entries: list[tuple[str, str]], pad: str) -> str:
    """A dict of already written values, as ``dump`` writes it at ``pad``."""
    if not entries:
        return "{}"
    inner = pad + "  "
    body = ("," + inner).join(
        f"{_escape(name if type(name) is str else json.dumps(name))}: {text}"
        for name, text in entries
    )
    return "{" + inner + body + pad + "}"


def _entries(values: Mapping[str, Any], pad: str, write: Any) -> list[tuple[str, str]]:
    """(name, written entry) of ``value_dicts(values)`` in its (sorted) order."""
    entry_pad = pad + "  "
    return [(name, _entry(values[name], entry_pad, write)) for name in sorted(values)]


# Written value entries by (pad, units, magnitude type, magnitude): a heavy
# report writes the same few quantities thousands of times. These are all the
# entry reads of a quantity with a float or int magnitude (quantity_dict looks
# at its units and magnitude only). Zero is left out: 0.0 and -0.0 are one key
# but write differently.
_WRITTEN: dict[tuple[str, Any, type, Any], str] = {}


def _entry(value: Any, pad: str, write: Any) -> str:
    """``value_dicts``'s entry of ``value`` as ``dump`` writes it at ``pad``."""
    if type(value) is str:
        # quantity_dict of a string: no value, no unit, the string as text.
        inner = pad + "  "
        return (
            f'{{{inner}"value": null,{inner}"unit": "",{inner}"text": '
            f"{_escape(value)}{pad}}}"
        )
    if isinstance(value, pint.Quantity):
        magnitude = value._magnitude
        if type(magnitude) in (float, int) and magnitude:
            key = (pad, value._units, type(magnitude), magnitude)
            text = _WRITTEN.get(key)
            if text is None:
                if len(_WRITTEN) > 100_000:
                    _WRITTEN.clear()
                text = _WRITTEN[key] = _written_entry(value, pad, write)
            return text
    return _written_entry(value, pad, write)


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
    entries = _entries({k: values[k] for k in values if k in used}, p, write)
    edits = [edit_dict(edit) for edit in finding.edits]
    return (
        f'{{{p}"text": {_scalar(finding.fix, p, write)}'
        f',{p}"values": {_object(entries, p)}'
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
