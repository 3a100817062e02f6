"""Render ``netcheck inspect``: a rich table, or the inspect JSON of cli.md."""

from __future__ import annotations

import io
import json
from collections.abc import Sequence
from typing import Any

from rich.console import Console
from rich.table import Table

from netcheck.report import CAUTION

__all__ = ["render_inspect_json", "render_inspect_text"]


def render_inspect_json(entries: Sequence[dict[str, Any]]) -> str:
    """The inspect JSON, deterministic."""
    return (
        json.dumps(
            {"format": "netcheck-inspect/1", "elements": list(entries)},
            indent=2,
            ensure_ascii=False,
            allow_nan=False,
        )
        + "\n"
    )


def _text(entry: dict[str, Any], key: str) -> str:
    value = entry.get(key)
    return (
        value["text"]
        if isinstance(value, dict)
        else ("" if value is None else str(value))
    )


def _suppression(entry: dict[str, Any]) -> str:
    found = entry.get("suppression") or []
    if not found:
        return "none" if entry.get("supply") == "dc" and entry.get("loads") else ""
    return "; ".join(
        f"{s['kind']} {'+'.join(s['parts'])} ({s['placement']})"
        + (" CONDUCTS" if s["conducts_normally"] else "")
        for s in found
    )


def _rating(entry: dict[str, Any]) -> str:
    rating = entry.get("rating")
    if not rating:
        return ""
    margin = f" ×{rating['margin']:.2g}" if rating.get("margin") is not None else ""
    return f"{rating['label']}: {rating['status']}{margin}"


def render_inspect_text(
    file: str, entries: Sequence[dict[str, Any]], *, color: bool, width: int = 160
) -> str:
    """A table of every switching element and what it must break."""
    table = Table(title=f"{file}: switching elements", show_lines=False)
    for name in (
        "element",
        "domain",
        "V break",
        "I break",
        "loads",
        "category",
        "L/R",
        "T0.95",
        "½LI²",
        "poles",
        "suppression",
        "rating",
    ):
        table.add_column(name, overflow="fold")
    for entry in entries:
        table.add_row(
            entry["element"],
            f"{entry['domain'] or '-'} ({entry['supply'] or 'none'})",
            _text(entry, "voltage"),
            _text(entry, "current"),
            ", ".join(entry.get("loads") or []),
            entry.get("load_category") or "",
            _text(entry, "time_constant"),
            _text(entry, "t95"),
            _text(entry, "energy"),
            str(entry.get("series_poles", "")),
            _suppression(entry),
            _rating(entry),
        )
    buffer = io.StringIO()
    console = Console(
        file=buffer,
        force_terminal=color,
        no_color=not color,
        width=width,
        highlight=False,
    )
    console.print(table)
    console.print(f"note: {CAUTION}")
    return buffer.getvalue()
