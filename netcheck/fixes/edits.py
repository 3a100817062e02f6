"""Machine-applicable changes of a design, applied to a copy of the model.

An edit is what a fix asks the designer to change, precise enough for the tool
to apply: add a component across two nets (a suppressor with its ratings),
connect a component's terminals to other nets (turn a diode round), or use
another part of the loaded library. Every edit is also written as ``.cnet``
text (``statement``), and the model is changed by building that very text with
the ``.cnet`` builder, so what is verified is what ``netcheck fix`` writes.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, replace
from typing import Any

from netcheck.input.cnet.build import build_component
from netcheck.input.cnet.parse import ComponentStatement, parse_text
from netcheck.model import Component, Netlist

__all__ = [
    "AddComponent",
    "Reconnect",
    "UsePart",
    "SetValues",
    "Remove",
    "Edit",
    "apply_edits",
    "statement_text",
    "edit_dict",
]

_BARE = re.compile(r"^[A-Za-z0-9_+\-./~!*]+$")


@dataclass(frozen=True)
class AddComponent:
    """Add ``kind ref attributes connections``, written after ``after``'s statement."""

    kind: str
    ref: str
    attributes: tuple[tuple[str, str], ...]  # (key, value text)
    connections: tuple[tuple[str, str], ...]  # (terminal, net)
    after: str  # the reference whose statement the new one follows

    action = "add"


@dataclass(frozen=True)
class Reconnect:
    """Connect terminals of ``ref`` to other nets (``terminal -> net``).

    A terminal not yet connected is added: wiring a spare pole in series.
    """

    ref: str
    connections: tuple[tuple[str, str], ...]

    action = "reconnect"


@dataclass(frozen=True)
class UsePart:
    """Give ``ref`` the library part ``part`` (inline overrides of its keys go)."""

    ref: str
    part: str
    drop: tuple[str, ...] = ()  # inline attributes the part's data replace

    action = "use-part"


@dataclass(frozen=True)
class SetValues:
    """Replace ``ref`` by a part whose ratings are ``attributes`` (written inline)."""

    ref: str
    attributes: tuple[tuple[str, str], ...]

    action = "set-values"


@dataclass(frozen=True)
class Remove:
    """Take ``ref`` out of the design: a part that must go (a diode on AC)."""

    ref: str

    action = "remove"


Edit = AddComponent | Reconnect | UsePart | SetValues | Remove


def _word(text: str) -> str:
    if _BARE.match(text):
        return text
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _line(
    kind: str,
    ref: str,
    attributes: Iterable[tuple[str, str]],
    connections: Iterable[tuple[str, str]],
) -> str:
    words = [kind, ref]
    words += [f"{key}={_word(text)}" for key, text in attributes]
    words += [f"{terminal}:{net}" for terminal, net in connections]
    return " ".join(words)


def _as_written(
    component: Component,
) -> tuple[list[tuple[str, str]], list[tuple[str, str]]]:
    attributes = [(a.key, a.text) for a in component.attributes]
    connections = [(c.terminal, c.net) for c in component.connections]
    return attributes, connections


def statement_text(edit: Edit, netlist: Netlist) -> str:
    """The ``.cnet`` statement the edit leaves: the new or the changed component."""
    if isinstance(edit, AddComponent):
        return _line(edit.kind, edit.ref, edit.attributes, edit.connections)
    component = netlist.component(edit.ref)
    if component is None:
        raise KeyError(edit.ref)
    attributes, connections = _as_written(component)
    if isinstance(edit, Remove):
        return ""
    if isinstance(edit, Reconnect):
        nets = dict(edit.connections)
        present = {t for t, _ in connections}
        connections = [(t, nets.get(t, n)) for t, n in connections]
        connections += [(t, n) for t, n in edit.connections if t not in present]
    elif isinstance(edit, SetValues):
        new = dict(edit.attributes)
        attributes = [(k, v) for k, v in attributes if k not in new]
        attributes += list(edit.attributes)
    else:
        kept = [(k, v) for k, v in attributes if k != "part" and k not in edit.drop]
        attributes = [("part", edit.part), *kept]
    return _line(component.kind, component.ref, attributes, connections)


def _build(text: str, netlist: Netlist) -> Component:
    source = parse_text(text + "\n", "<fix>")
    statement = source.statements[0]
    assert isinstance(statement, ComponentStatement)
    return build_component(statement, netlist.parts)


def _apply_one(
    netlist: Netlist, edit: Edit, outside: Callable[[str], Component | None]
) -> Netlist:
    if isinstance(edit, Remove):
        if netlist.component(edit.ref) is None:
            raise KeyError(edit.ref)
        kept = tuple(c for c in netlist.components if c.ref != edit.ref)
        return replace(netlist, components=kept)
    built = _build(statement_text(edit, netlist), netlist)
    if isinstance(edit, AddComponent):
        if netlist.component(edit.ref) is not None or outside(edit.ref) is not None:
            raise ValueError(f"reference {edit.ref} exists already")
        anchor = netlist.component(edit.after) or outside(edit.after)
        span = anchor.span if anchor is not None else built.span
        added = replace(built, span=span)
        return replace(netlist, components=(*netlist.components, added))
    old = netlist.component(edit.ref)
    assert old is not None
    changed = replace(
        built,
        span=old.span,
        elements=tuple(replace(e, span=old.span) for e in built.elements),
    )
    components = tuple(changed if c.ref == edit.ref else c for c in netlist.components)
    return replace(netlist, components=components)


def apply_edits(
    netlist: Netlist, edits: Sequence[Edit], context: Netlist | None = None
) -> Netlist:
    """A copy of the design with ``edits`` applied in order (the input is untouched).

    Raises InputErrors if an edit does not build (a part of the wrong kind, say)
    and ValueError if it adds a reference that exists. ``context``, where
    ``netlist`` is a slice of a design (``netcheck.fixes.slices``), is that
    design: a reference it holds exists, and an added component's statement
    may follow one of its components (the span the new one is given).
    """
    sliced = netlist

    def outside(ref: str) -> Component | None:
        if context is None or sliced.component(ref) is not None:
            return None
        return context.component(ref)

    for edit in edits:
        netlist = _apply_one(netlist, edit, outside)
    return netlist


def edit_dict(edit: Edit) -> dict[str, Any]:
    """The edit as JSON: its action and its fields."""
    if isinstance(edit, AddComponent):
        return {
            "action": edit.action,
            "kind": edit.kind,
            "ref": edit.ref,
            "attributes": dict(edit.attributes),
            "connections": dict(edit.connections),
            "after": edit.after,
        }
    if isinstance(edit, Reconnect):
        return {
            "action": edit.action,
            "ref": edit.ref,
            "connections": dict(edit.connections),
        }
    if isinstance(edit, SetValues):
        return {
            "action": edit.action,
            "ref": edit.ref,
            "attributes": dict(edit.attributes),
        }
    if isinstance(edit, Remove):
        return {"action": edit.action, "ref": edit.ref}
    return {"action": edit.action, "ref": edit.ref, "part": edit.part}
