"""Baselines: accepted findings by fingerprint, so CI reports only new ones.

The file (``netcheck baseline PATH... -o FILE``)::

    {"format": "netcheck-baseline/1",
     "fingerprints": [{"fingerprint": "...", "rule": "...", "element": "...",
                       "file": "..."}, ...]}

sorted by file, rule, element and fingerprint. Only the fingerprint is matched;
rule, element and file are there for the reader of a diff. Fingerprints do not
depend on line numbers, so moving or reformatting statements keeps them.
"""

from __future__ import annotations

import json
from collections.abc import Collection, Iterable
from pathlib import Path
from typing import Any

from netcheck.errors import InputError
from netcheck.findings import Finding
from netcheck.report import display_path
from netcheck.report.json import dump
from netcheck.source import Span, register_text
from netcheck.yamlsafe import load_located_yaml

__all__ = [
    "FORMAT",
    "BaselineError",
    "render_baseline",
    "load_baseline",
    "load_baseline_entries",
    "apply_baseline",
]

FORMAT = "netcheck-baseline/1"


class BaselineError(InputError):
    """A baseline file that cannot be read or does not have the baseline format."""


def render_baseline(findings: Iterable[Finding]) -> str:
    """Return the baseline JSON of prepared findings, leaving waived ones out."""
    entries = {
        f.fingerprint: {
            "fingerprint": f.fingerprint,
            "rule": f.rule,
            "element": f.element,
            "file": f.span.file,
        }
        for f in findings
        if f.waived is None
    }
    ordered = sorted(
        entries.values(),
        key=lambda e: (e["file"], e["rule"], e["element"], e["fingerprint"]),
    )
    return dump({"format": FORMAT, "fingerprints": ordered})


def apply_baseline(
    findings: Iterable[Finding], fingerprints: Collection[str]
) -> tuple[list[Finding], int]:
    """Return the findings not in the baseline and how many active ones it hid."""
    kept: list[Finding] = []
    suppressed = 0
    for finding in findings:
        if finding.fingerprint in fingerprints:
            suppressed += finding.waived is None
        else:
            kept.append(finding)
    return kept, suppressed


def load_baseline(path: Path) -> frozenset[str]:
    """Read a baseline file's fingerprints; BaselineError (located) if it is broken."""
    return frozenset(load_baseline_entries(path))


def load_baseline_entries(path: Path) -> dict[str, dict[str, str]]:
    """Read a baseline file's entries by fingerprint; BaselineError if broken.

    Each entry keeps the file's ``fingerprint`` and whichever of ``rule``,
    ``element`` and ``file`` are strings, so stale entries can be named.
    """
    shown = display_path(path)
    try:
        text = Path(path).read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as err:
        reason = getattr(err, "strerror", None) or str(err)
        raise BaselineError(f"cannot read baseline {shown}: {reason}") from None
    register_text(shown, text)
    try:
        data = json.loads(text)
    except json.JSONDecodeError as err:
        span = Span(shown, err.lineno, err.colno)
        raise BaselineError(f"baseline is not valid JSON: {err.msg}", span) from None
    problem = _problem(data)
    if problem is not None:
        where, message = problem
        raise BaselineError(message, _span_at(shown, text, where))
    return {
        entry["fingerprint"]: {
            key: value
            for key in ("fingerprint", "rule", "element", "file")
            if isinstance(value := entry.get(key), str)
        }
        for entry in data["fingerprints"]
    }


def _problem(data: Any) -> tuple[tuple[str | int, ...], str] | None:
    """Return where the data departs from the format (a key path) and how."""
    if not isinstance(data, dict):
        return (), "a baseline must be a JSON object"
    if data.get("format") != FORMAT:
        return ("format",), f"not a baseline: 'format' must be \"{FORMAT}\""
    entries = data.get("fingerprints")
    if not isinstance(entries, list):
        return ("fingerprints",), "'fingerprints' must be a list"
    for i, entry in enumerate(entries):
        if not isinstance(entry, dict) or not isinstance(entry.get("fingerprint"), str):
            return ("fingerprints", i), "each entry needs a string 'fingerprint'"
    return None


def _span_at(shown: str, text: str, where: tuple[str | int, ...]) -> Span:
    """Locate the value at ``where`` by reading the JSON as YAML."""
    try:
        return load_located_yaml(text, shown, BaselineError).span(where)
    except BaselineError:  # JSON that YAML 1.1 does not read: point at the start
        return Span(shown, 1, 1)
