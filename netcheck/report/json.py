"""The JSON report: ``netcheck-findings/1``, byte-identical for the same input.

Shape (cli.md, "JSON output")::

    {"format": "netcheck-findings/1",
     "tool": {"name": "netcheck", "version": "0.1.0", "caution": "..."},
     "files": ["design/top.cnet", ...],          # every file read, sorted
     "findings": [ {finding}, ... ],             # sorted by file, line, column, rule
     "errors": [{"file", "line", "column", "message"}, ...],   # input errors
     "unverified": [{"element", "file", "line", "column", "reason"}, ...],
     "summary": {"error": n, "warning": n, "info": n, "total": n,
                 "waived": n, "baseline_suppressed": n, "baseline_stale": n,
                 "by_rule": {rule: n}, "switching_elements": n, "verified": n,
                 "unverified": n, "input_errors": n},
     "stale_baseline": [{"fingerprint", "rule", "element", "file"}, ...]}

Each finding has ``rule``, ``severity``, ``message``, ``file``, ``line``,
``column``, ``element``, ``values`` (name -> ``{"value", "unit", "text"}``),
``fix`` (``{"text", "values"}`` or null), ``references``, ``fingerprint`` and
``waived``: null, or the reason of the ``waive`` statement that accepted it.
Waived findings are listed so that a review can see them, but the counts of
the summary (except ``waived``) and ``--fail-on`` leave them out.
``stale_baseline`` lists the baseline entries that matched no current finding
(empty without a baseline), as the baseline file has them. ``errors`` are the
input errors of files that could not be checked (the other files' findings are
all there; the run exits 2); ``unverified`` the switching elements that no
check could verify, ``reason`` ``rating-data-missing`` or ``not-analysed``
(see ``netcheck.coverage``).
"""

from __future__ import annotations

import json
import math
from collections.abc import Callable, Mapping
from typing import Any

from netcheck import __version__
from netcheck.alloc import collector_paused
from netcheck.catalogue import RuleMeta
from netcheck.coverage import ElementStatus
from netcheck.error_records import ErrorRecord
from netcheck.findings import Finding
from netcheck.report import CAUTION, Report, fix_dict, references, value_dicts
from netcheck.report.json_findings import write_findings

__all__ = [
    "FORMAT",
    "render_json",
    "write_json",
    "finding_dict",
    "error_dict",
    "unverified_dict",
    "dump",
    "dump_to",
    "write",
    "Raw",
    "Pieces",
    "Spill",
    "LazyList",
]

FORMAT = "netcheck-findings/1"


def finding_dict(finding: Finding, meta: RuleMeta | None) -> dict[str, Any]:
    """One finding as the JSON object of the format."""
    values = value_dicts(finding.values)
    return {
        "rule": finding.rule,
        "severity": finding.severity.label,
        "message": finding.message,
        "file": finding.span.file,
        "line": finding.span.line,
        "column": finding.span.column,
        "element": finding.element,
        "values": values,
        "fix": fix_dict(finding, meta, values),
        "references": references(finding, meta),
        "fingerprint": finding.fingerprint,
        "waived": finding.waived,
    }


def render_json(report: Report, catalogue: Mapping[str, RuleMeta]) -> str:
    """Render the report as ``netcheck-findings/1`` JSON text."""
    with collector_paused():  # strings and dicts: nothing the collector frees
        return dump(_document(report, catalogue))


def write_json(
    report: Report, catalogue: Mapping[str, RuleMeta], sink: Callable[[str], object]
) -> None:
    """Write ``render_json(report, catalogue)`` to ``sink`` in pieces, in order.

    The text of a heavy report (130 MB for 58,000 findings) is never held
    whole: ``sink`` gets it in chunks of about ``Spill.LIMIT`` pieces.
    """
    with collector_paused():
        dump_to(_document(report, catalogue), sink)


def _document(report: Report, catalogue: Mapping[str, RuleMeta]) -> dict[str, Any]:
    return {
        "format": FORMAT,
        "tool": {"name": "netcheck", "version": __version__, "caution": CAUTION},
        "files": list(report.files),
        # Written straight to text: the same as the finding_dicts, dumped.
        "findings": Pieces(
            lambda pad, out: write_findings(report.findings, catalogue, pad, out)
        ),
        "errors": [error_dict(e) for e in report.errors],
        "unverified": [unverified_dict(e) for e in report.unverified],
        "summary": report.summary(),
        "stale_baseline": [dict(entry) for entry in report.stale_baseline],
    }


def error_dict(error: ErrorRecord) -> dict[str, Any]:
    """One input error: file, line and column (0: not located), message."""
    return {
        "file": error.file,
        "line": error.line,
        "column": error.column,
        "message": error.message,
    }


def unverified_dict(element: ElementStatus) -> dict[str, Any]:
    """One switching element no check could verify, and why."""
    return {
        "element": element.element,
        "file": element.file,
        "line": element.line,
        "column": element.column,
        "reason": element.reason,
    }


def dump(document: Any) -> str:
    """Serialise deterministically: fixed key order, two-space indent, final newline.

    The text is exactly ``json.dumps(document, indent=2, ensure_ascii=False,
    allow_nan=False)``; with an indent the standard library falls back to its
    pure-Python encoder, and this writer is twice as fast on a report of
    thousands of findings (strings still go through the C escaper).
    """
    out: list[str] = []
    write(document, "\n", out)
    out.append("\n")
    return "".join(out)


def dump_to(document: Any, sink: Callable[[str], object]) -> None:
    """Write ``dump(document)`` to ``sink`` in chunks (``Spill``), in order."""
    out = Spill(sink)
    write(document, "\n", out)
    out.append("\n")
    out.spill()


class Spill(list):  # type: ignore[type-arg]
    """The pieces list of ``dump_to``: long writers empty it into ``sink`` as they go.

    A writer of many items (``write_findings``, ``LazyList``) calls
    ``spill_if_long`` between items, so that only one chunk of text is held at
    a time; everything else treats it as the plain list of pieces it is.
    """

    LIMIT = 16_384  # pieces, a few hundred kB of text

    def __init__(self, sink: Callable[[str], object]) -> None:
        super().__init__()
        self.sink = sink

    def spill(self) -> None:
        """Join the pieces so far, hand them to the sink and start afresh."""
        if self:
            self.sink("".join(self))
            self.clear()

    def spill_if_long(self) -> None:
        """``spill`` once ``LIMIT`` pieces have gathered."""
        if len(self) >= self.LIMIT:
            self.spill()


def spiller(out: list[str]) -> Callable[[], None] | None:
    """``out.spill_if_long`` where ``out`` is a ``Spill``, else None."""
    return out.spill_if_long if type(out) is Spill else None


class LazyList:
    """A JSON list whose items are made one at a time as it is written.

    ``items()`` gives the items; each is written and dropped before the next
    is made (and, writing to a ``Spill``, its text handed on), so a long list
    of dicts is never held whole. The text is that of the list itself.
    """

    __slots__ = ("items",)

    def __init__(self, items: Callable[[], Any]) -> None:
        self.items = items

    def write_to(self, pad: str, out: list[str]) -> None:
        """Append the list written at ``pad``, spilling between items."""
        spill = spiller(out)
        inner = pad + "  "
        separator = "[" + inner
        for item in self.items():
            out.append(separator)
            write(item, inner, out)
            separator = "," + inner
            if spill is not None:
                spill()
        out.append("[]" if separator[0] == "[" else pad + "]")


_escape = json.encoder.encode_basestring  # the ensure_ascii=False escaper


class Raw:
    """JSON text already written at the place it goes (``dump`` copies it)."""

    __slots__ = ("text",)

    def __init__(self, text: str) -> None:
        self.text = text


class Pieces:
    """JSON text that ``write_to(pad, out)`` appends to ``dump``'s pieces.

    For a long part of a document: its pieces go straight into the one list
    the document is joined from, not into a string of their own first.
    """

    __slots__ = ("write_to",)

    def __init__(self, write_to: Callable[[str, list[str]], None]) -> None:
        self.write_to = write_to


def write(value: Any, pad: str, out: list[str]) -> None:
    """Append ``value`` written at indentation ``pad`` (newline and spaces)."""
    if type(value) is Raw:
        out.append(value.text)
    elif type(value) is Pieces or type(value) is LazyList:
        value.write_to(pad, out)
    elif isinstance(value, str):
        out.append(_escape(value))
    elif value is None or value is True or value is False:
        out.append("null" if value is None else "true" if value else "false")
    elif isinstance(value, int):
        out.append(int.__repr__(value))
    elif isinstance(value, float):
        if not math.isfinite(value):
            raise ValueError(
                f"Out of range float values are not JSON compliant: {value!r}"
            )
        out.append(float.__repr__(value))
    elif isinstance(value, dict):
        if not value:
            out.append("{}")
            return
        inner, separator = pad + "  ", "{" + pad + "  "
        for key, item in value.items():
            name = key if isinstance(key, str) else json.dumps(key)
            out.append(separator + _escape(name) + ": ")
            write(item, inner, out)
            separator = "," + inner
        out.append(pad + "}")
    elif isinstance(value, (list, tuple)):
        if not value:
            out.append("[]")
            return
        inner, separator = pad + "  ", "[" + pad + "  "
        for item in value:
            out.append(separator)
            write(item, inner, out)
            separator = "," + inner
        out.append(pad + "]")
    else:
        raise TypeError(f"{type(value).__name__} is not JSON serializable")
