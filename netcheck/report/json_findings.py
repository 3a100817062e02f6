"""The findings of the JSON report written straight to text, without dicts.

``write_findings(findings, catalogue, pad, out)`` appends to ``out`` the
pieces of exactly what the generic writer (``netcheck.report.json.dump``)
makes of the list ``[finding_dict(f, catalogue.get(f.rule)) for f in
findings]`` written at ``pad``: the same keys in the same order, the same
escaping, the same float reprs. A heavy report holds tens of thousands of
findings of one shape, and building a dict per finding and per value, then
walking them generically, costs more than the rest of the run's reporting
together.

The pieces are mostly shared: the constant punctuation and keys, the written
members of values (cached), and the findings' own strings where JSON needs no
escape in them. Only the one final join copies the text, so a heavy report
holds its text about once, not once per level of nesting.
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
from netcheck.units import Q_

__all__ = ["findings_text", "write_findings"]

_escape = json.encoder.encode_basestring  # the ensure_ascii=False escaper


def findings_text(
    findings: Iterable[Finding], catalogue: Mapping[str, RuleMeta], pad: str
) -> str:
    """The JSON list of ``findings`` as ``dump`` writes it at ``pad``."""
    out: list[str] = []
    write_findings(findings, catalogue, pad, out)
    return "".join(out)


def write_findings(
    findings: Iterable[Finding],
    catalogue: Mapping[str, RuleMeta],
    pad: str,
    out: list[str],
) -> None:
    """Append the pieces of the JSON list of ``findings`` written at ``pad``."""
    from netcheck.report.json import spiller, write  # the generic writer

    spill = spiller(out)  # writing to a file: hand on the text as it grows

    inner, p = pad + "  ", pad + "    "
    separator = "[" + inner
    # Within one call the catalogue is fixed: each rule's entry, the names
    # its fix templates use and each object's opening are looked up once.
    rules: dict[str, tuple[RuleMeta | None, frozenset[str]]] = {}
    heads: dict[tuple[str, Any], str] = {}
    for finding in findings:
        out.append(separator)
        rule = finding.rule
        known = rules.get(rule)
        if known is None:
            meta = catalogue.get(rule)
            known = rules[rule] = (meta, fix_names(meta))
        head = heads.get((rule, finding.severity))
        if head is None:
            head = heads[(rule, finding.severity)] = _head(finding, p, write)
        _finding(finding, known, head, inner, write, out)
        separator = "," + inner
        if spill is not None:
            spill()
    out.append("[]" if separator[0] == "[" else pad + "]")


def _string(text: str, out: list[str]) -> None:
    """Append ``text`` as a JSON string, the object itself where it needs no escape.

    ``encode_basestring`` escapes only quotes, backslashes and control
    characters (below U+0020), none of which a printable string holds but
    the first two.
    """
    if text.isprintable() and '"' not in text and "\\" not in text:
        out += ('"', text, '"')
    else:
        out.append(_escape(text))


def _nullable(value: Any, pad: str, write: Any, out: list[str]) -> None:
    """Append ``value`` as ``_scalar`` writes it, a string as ``_string`` does."""
    if type(value) is str:
        _string(value, out)
    else:
        out.append(_scalar(value, pad, write))


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


# Numbers as text: line and column numbers repeat across a report.
_NUMBERS: dict[int, str] = {}


def _number(value: int, pad: str, write: Any) -> str:
    if type(value) is not int:
        return _scalar(value, pad, write)
    text = _NUMBERS.get(value)
    if text is None:
        if len(_NUMBERS) > 100_000:
            _NUMBERS.clear()
        text = _NUMBERS[value] = int.__repr__(value)
    return text


# The constant keys between a finding's members, by pad.
_KEYS: dict[str, tuple[str, ...]] = {}


def _keys(pad: str) -> tuple[str, ...]:
    keys = _KEYS.get(pad)
    if keys is None:
        p = pad + "  "
        names = ("file", "line", "column", "element", "values", "fix")
        names += ("references", "fingerprint", "waived")
        keys = tuple(f',{p}"{name}": ' for name in names) + (pad + "}",)
        keys = _KEYS[pad] = keys
    return keys


def _finding(
    finding: Finding,
    rule: tuple[RuleMeta | None, frozenset[str]],
    head: str,
    pad: str,
    write: Any,
    out: list[str],
) -> None:
    """Append ``finding_dict(finding, meta)`` as ``dump`` writes it at ``pad``.

    ``rule`` is the finding's catalogue entry and ``fix_names`` of it;
    ``head`` its object's opening (``_head``).
    """
    p = pad + "  "
    span = finding.span
    meta, used = rule
    (file, line, column, element, values, fix, refs, mark, waived, end) = _keys(pad)
    out.append(head)
    _nullable(finding.message, p, write, out)
    out.append(file)
    _nullable(span.file, p, write, out)
    out += (line, _number(span.line, p, write), column)
    out += (_number(span.column, p, write), element)
    _nullable(finding.element, p, write, out)
    names = sorted(finding.values)
    out.append(values)
    _values(finding.values, names, p, write, out)
    out.append(fix)
    _fix(finding, used, names, p, write, out)
    out += (refs, _references(finding, meta, p, write), mark)
    _nullable(finding.fingerprint, p, write, out)
    out.append(waived)
    _nullable(finding.waived, p, write, out)
    out.append(end)


# The opening of a finding's object, up to its message, by (pad, rule, severity).
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
            f',{pad}"message": '
        )
    return text


def _values(
    values: Mapping[str, Any],
    names: list[str],
    pad: str,
    write: Any,
    out: list[str],
) -> None:
    """Append ``value_dicts`` of ``names`` (sorted) of ``values`` written at ``pad``."""
    if not names:
        out.append("{}")
        return
    inner = pad + "  "
    separator, comma = "{" + inner, "," + inner
    written = _WRITTEN
    for name in names:
        out.append(separator)
        separator = comma
        value = values[name]
        if type(value) is Q_:
            # The common case, a non-zero float, looked up as _member does.
            magnitude = value._magnitude
            if type(magnitude) is float and magnitude:
                key = (inner, name, value._units, float, magnitude, False)
                text = written.get(key)
                if text is not None:
                    out.append(text)
                    continue
        _member(name, value, inner, write, out)
    out.append(pad + "}")


# Written members ("name": entry) by (pad, name, units, magnitude type,
# magnitude): a heavy report writes the same few quantities thousands of
# times. These are all a quantity's entry reads (quantity_dict looks at its
# units and float or int magnitude only). 0.0 and -0.0 are one dict key but
# write differently, so a zero's key holds its sign too.
_WRITTEN: dict[tuple[str, str, Any, type, Any, bool], str] = {}
# The text of a string member around its string, by (pad, name).
_STRING_MEMBERS: dict[tuple[str, str], tuple[str, str]] = {}


def _member(name: Any, value: Any, pad: str, write: Any, out: list[str]) -> None:
    """Append one member of ``value_dicts``, name and entry, as ``dump`` writes it."""
    if type(value) is str and type(name) is str:
        # quantity_dict of a string: no value, no unit, the string as text.
        around = _STRING_MEMBERS.get((pad, name))
        if around is None:
            inner = pad + "  "
            if len(_STRING_MEMBERS) > 10_000:
                _STRING_MEMBERS.clear()
            around = _STRING_MEMBERS[(pad, name)] = (
                f'{_escape(name)}: {{{inner}"value": null,{inner}"unit": "",'
                f'{inner}"text": ',
                pad + "}",
            )
        out.append(around[0])
        _string(value, out)
        out.append(around[1])
        return
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
            out.append(text)
            return
    shown = name if isinstance(name, str) else json.dumps(name)
    out.append(f"{_escape(shown)}: {_written_entry(value, pad, write)}")


def _written_entry(value: Any, pad: str, write: Any) -> str:
    entry = quantity_dict(value)
    number = entry["value"]
    if isinstance(number, float) and not math.isfinite(number):
        entry = {**entry, "value": None}  # as value_dicts: JSON has no NaN
    out: list[str] = []
    write(entry, pad, out)
    return "".join(out)


# The constant keys of a fix object, by pad.
_FIX_KEYS: dict[str, tuple[str, ...]] = {}


def _fix(
    finding: Finding,
    used: frozenset[str],
    names: list[str],
    pad: str,
    write: Any,
    out: list[str],
) -> None:
    """Append ``fix_dict(finding, meta)`` as ``dump`` writes it at ``pad``.

    ``used`` is ``fix_names(meta)``; ``names`` the finding's value names, sorted.
    """
    if finding.fix is None:
        out.append("null")
        return
    keys = _FIX_KEYS.get(pad)
    if keys is None:
        p = pad + "  "
        keys = _FIX_KEYS[pad] = (
            f'{{{p}"text": ',
            f',{p}"values": ',
            f',{p}"edits": ',
            f',{p}"verified": ',
            pad + "}",
        )
    p = pad + "  "
    out.append(keys[0])
    _nullable(finding.fix, p, write, out)
    out.append(keys[1])
    shown = [name for name in names if name in used]
    _values(finding.values, shown, p, write, out)
    out.append(keys[2])
    if finding.edits:
        write([edit_dict(edit) for edit in finding.edits], p, out)
    else:
        out.append("[]")
    verified = finding.verified
    shown = _FLAGS.get(verified) if type(verified) is bool or verified is None else None
    out += (keys[3], shown or _scalar(verified, p, write), keys[4])


_FLAGS = {None: "null", True: "true", False: "false"}


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
