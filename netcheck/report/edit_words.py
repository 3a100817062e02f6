"""A fix's machine edits in words, for the text reports' ``--details``.

The JSON carries each edit as data (``fix.edits``) and ``netcheck fix`` prints
them as a diff; this gives a reader of the terminal view the same changes in
one line each, so a verified fix says what was applied to the copy.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from netcheck.fixes.edits import Edit, edit_dict

__all__ = ["edit_words", "edit_lines"]


def _pairs(mapping: Mapping[str, Any], joiner: str) -> str:
    return ", ".join(f"{key}{joiner}{value}" for key, value in mapping.items())


def edit_words(edit: Edit) -> str:
    """One edit as a short sentence naming the component, part or nets."""
    data = edit_dict(edit)
    action, ref = data["action"], data["ref"]
    if action == "add":
        where = _pairs(data["connections"], " to ")
        attributes = " ".join(f"{k}={v}" for k, v in data["attributes"].items())
        spec = f" ({attributes})" if attributes else ""
        return f"add {data['kind']} {ref}{spec}: {where}"
    if action == "reconnect":
        return f"reconnect {ref}: {_pairs(data['connections'], ' to ')}"
    if action == "set-values":
        return f"give {ref} the ratings {_pairs(data['attributes'], '=')}"
    if action == "remove":
        return f"remove {ref}"
    return f"use part {data['part']} for {ref}"


def edit_lines(edits: tuple[Edit, ...], indent: str = "    ") -> list[str]:
    """The ``edit:`` lines of one fix, one per edit."""
    return [f"{indent}edit: {edit_words(edit)}" for edit in edits]
