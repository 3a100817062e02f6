"""Build the model from a .cnet design's statements: attributes, parts, poles."""

from __future__ import annotations

import difflib
from collections.abc import Hashable, Mapping, Sequence
from functools import cache, lru_cache
from pathlib import Path
from typing import Any

from netcheck.attributes import QUANTITY_KEYS, choices
from netcheck.errors import (
    IncludeError,
    InputError,
    InputErrors,
    PartsError,
    QuantityError,
    UnknownKindError,
)
from netcheck.input.cnet.parse import ComponentStatement, RawAttribute
from netcheck.input.cnet.read import Reader, read_libraries
from netcheck.input.cnet.template import Template, shape_of
from netcheck.input.poles import (
    check_terminals,
    elements_of,
    infer_poles,
    poles_from_part,
)
from netcheck.input.waivers import check_waiver_targets
from netcheck.kinds import (
    COIL_KEYS,
    COIL_KINDS,
    CONTACT_KEYS,
    KIND_ATTRIBUTES,
    KIND_TERMINALS,
    KINDS,
    OUTPUT_TERMINALS,
    POLE_KINDS,
    PROTECTIVE_KINDS,
    SEMICONDUCTOR_KINDS,
)
from netcheck.model import (
    Attribute,
    Component,
    Connection,
    Netlist,
    Part,
    Pole,
    SwitchingElement,
)
from netcheck.quantity_hints import parse_with_hint
from netcheck.ranges import RANGE_KEYS, check_nominal, parse_range
from netcheck.source import Span
from netcheck.units import check_sign

__all__ = ["load_cnet"]

# Statement shapes remembered a design (template.py): a design of unique values
# gains nothing from more.
MAX_TEMPLATES = 4096


def _close(word: str, options: Sequence[str]) -> str:
    near = difflib.get_close_matches(word, options, n=1)
    return f"; did you mean {near[0]!r}?" if near else ""


def _parse_value(raw: RawAttribute) -> Any:
    try:
        return _value_of(raw.key, raw.text)
    except InputError:  # again, to raise the error located (where the value is)
        return _value_at(raw.key, raw.text, raw.value_span)


@lru_cache(maxsize=4096)
def _value_of(key: str, text: str) -> Any:
    """The parsed value of ``key=text``, remembered: designs repeat their values.

    Quantities are shared between components that way; nothing mutates them.
    """
    return _value_at(key, text, None)


def _value_at(key: str, text: str, span: Span | None) -> Any:
    base = key.rsplit(".", 1)[-1]
    if base in RANGE_KEYS:
        return parse_range(key, text, span)
    dimension = QUANTITY_KEYS.get(base)
    if dimension is not None:
        quantity = parse_with_hint(text, dimension, span)
        check_sign(key, quantity, span)
        return quantity
    allowed = choices(base)
    if allowed == "tags":
        return tuple(t for t in text.split(",") if t)
    if allowed == "text" or allowed is None:
        return text
    assert isinstance(allowed, tuple)
    if text not in allowed:
        raise QuantityError(
            f"{key}={text} is not one of {', '.join(allowed)}{_close(text, allowed)}",
            span,
        )
    if allowed == ("yes", "no"):
        return text == "yes"
    return text


@cache
def _allowed_keys(kind: str) -> tuple[str, ...]:
    keys = list(KIND_ATTRIBUTES[kind])
    if kind in POLE_KINDS:
        keys += [f"contacts.{k}" for k in CONTACT_KEYS]
        if kind in COIL_KINDS:
            keys += [f"coil.{k}" for k in COIL_KEYS]
    return tuple(keys)


def _merge(base: Mapping[str, Any], attributes: Sequence[Attribute]) -> dict[str, Any]:
    """The part's values (``base``) with the inline attributes written over them."""
    values = dict(base)
    copied: set[str] = set()
    for attribute in attributes:
        if "." in attribute.key:
            group, key = attribute.key.split(".", 1)
            if group not in copied:  # copy a group of the part's before writing it
                values[group] = dict(values.get(group, {}))
                copied.add(group)
            values[group][key] = attribute.value
        else:
            values[attribute.key] = attribute.value
    return values


@lru_cache(maxsize=1024)
def _inferred(
    terminals: tuple[str, ...], has_coil: bool
) -> tuple[tuple[Pole, ...], tuple[str, ...]]:
    """``infer_poles``, remembered: a design uses a few terminal sets many times."""
    poles, unexplained = infer_poles(terminals, has_coil)
    return tuple(poles), tuple(unexplained)


class _Builder:
    def __init__(self, parts: Mapping[str, Part], errors: list[InputError]) -> None:
        self.parts = parts
        self.errors = errors
        self.part_values: dict[str, dict[str, Any]] = {}
        self.templates: dict[Hashable, Template] = {}

    def values_of(self, part: Part | None) -> Mapping[str, Any]:
        """A part's data with its groups as dicts, made once per part.

        Components of one part share its groups until an inline ``group.key``
        attribute overrides one (``_merge`` copies that group first).
        """
        if part is None:
            return {}
        values = self.part_values.get(part.name)
        if values is None:
            values = self.part_values[part.name] = {
                k: (dict(v) if isinstance(v, Mapping) else v)
                for k, v in part.data.items()
            }
        return values

    def attributes(self, statement: ComponentStatement) -> list[Attribute]:
        allowed = _allowed_keys(statement.kind)
        out = []
        for raw in statement.attributes:
            if raw.key not in allowed:
                self.errors.append(
                    InputError(
                        f"{statement.kind} has no attribute {raw.key!r}"
                        f"{_close(raw.key, allowed)} (known: {', '.join(allowed)})",
                        raw.span,
                    )
                )
                continue
            try:
                value = _parse_value(raw)
            except InputError as error:
                self.errors.append(error)
                continue
            out.append(Attribute(raw.key, value, raw.text, raw.span))
        return out

    def part(
        self, statement: ComponentStatement, attributes: list[Attribute]
    ) -> Part | None:
        for attribute in attributes:
            if attribute.key == "part":
                name, span = attribute.value, attribute.span
                break
        else:
            return None
        part = self.parts.get(name)
        if part is None:
            self.errors.append(
                PartsError(
                    f"unknown part {name!r}{_close(name, sorted(self.parts))}", span
                )
            )
            return None
        if part.kind != statement.kind:
            self.errors.append(
                PartsError(
                    f"part {name!r} is a {part.kind}, not a {statement.kind}", span
                )
            )
            return None
        return part

    def connections(self, statement: ComponentStatement) -> tuple[Connection, ...]:
        connections = statement.connections
        if len({c.terminal for c in connections}) == len(connections):
            return connections
        seen: dict[str, Span] = {}
        out = []
        for connection in connections:
            terminal = connection.terminal
            if terminal in seen:
                self.errors.append(
                    InputError(
                        f"terminal {terminal!r} of {statement.ref} is connected twice "
                        f"(first at {seen[terminal]})",
                        connection.span,
                    )
                )
                continue
            seen[terminal] = connection.span
            out.append(connection)
        return tuple(out)

    def check_fixed_terminals(
        self, statement: ComponentStatement, connections: Sequence[Connection]
    ) -> None:
        sets = KIND_TERMINALS[statement.kind]
        if sets is None:
            return
        used = {c.terminal for c in connections}
        if any(used <= set(s) for s in sets):
            return
        names = " or ".join(" ".join(s) for s in sets)
        for connection in connections:
            if not any(connection.terminal in s and used <= set(s) for s in sets):
                self.errors.append(
                    InputError(
                        f"{statement.kind} {statement.ref} has terminals {names}; "
                        f"{connection.terminal!r} is not one of them",
                        connection.span,
                    )
                )
                return

    def poles(
        self,
        statement: ComponentStatement,
        part: Part | None,
        connections: Sequence[Connection],
    ) -> tuple[tuple, tuple]:
        kind = statement.kind
        if kind in PROTECTIVE_KINDS:
            return self.protective_poles(statement, connections)
        if kind not in POLE_KINDS:
            return (), self.output_elements(statement, connections)
        used = [c.terminal for c in connections]
        has_coil = kind in COIL_KINDS
        if part is not None and part.data.get("poles"):
            poles = poles_from_part(part.data["poles"])
            spans = {c.terminal: c.span for c in connections}
            self.errors.extend(
                check_terminals(statement.ref, poles, used, has_coil, spans)
            )
        else:
            poles, unexplained = _inferred(tuple(used), has_coil)
            spans = {c.terminal: c.span for c in connections} if unexplained else {}
            for terminal in unexplained:
                self.errors.append(
                    InputError(
                        f"terminal {terminal!r} of {statement.ref} fits no pole of the "
                        "terminal-marking convention (A1/A2 coil; 11-12 NC, 13-14 NO, "
                        "11/12/14 changeover; 1-2, 3-4, 5-6 main poles); give the "
                        "part's poles",
                        spans[terminal],
                    )
                )
        elements = elements_of(statement.ref, poles, set(used), statement.span)
        return tuple(poles), tuple(elements)

    def protective_poles(
        self, statement: ComponentStatement, connections: Sequence[Connection]
    ) -> tuple[tuple, tuple]:
        terminals = tuple(c.terminal for c in connections)
        poles, unexplained = _inferred(terminals, False)
        spans = {c.terminal: c.span for c in connections}
        for terminal in unexplained:
            self.errors.append(
                InputError(
                    f"terminal {terminal!r} of {statement.ref}: a {statement.kind} has "
                    "terminals 1 2 per pole (3 4, 5 6 for more poles)",
                    spans[terminal],
                )
            )
        return tuple(poles), ()

    def output_elements(
        self, statement: ComponentStatement, connections: Sequence[Connection]
    ) -> tuple:
        if statement.kind not in SEMICONDUCTOR_KINDS or len(connections) != 2:
            return ()
        terminals = [c.terminal for c in connections]
        for first, second in OUTPUT_TERMINALS:
            if set(terminals) == {first, second}:
                return (
                    SwitchingElement(
                        statement.ref, first, second, "output", statement.span
                    ),
                )
        return ()

    def check_range(
        self, values: dict[str, Any], attributes: list[Attribute], span: Span
    ) -> None:
        at = next((a.span for a in attributes if a.key == "range"), span)
        try:
            check_nominal(values, at)
        except InputError as error:
            self.errors.append(error)

    def component(self, statement: ComponentStatement) -> Component | None:
        """The component of ``statement``, by its shape's template if there is one."""
        shape = shape_of(statement)
        template = self.templates.get(shape)
        if template is not None:
            return template.component(statement)
        errors = len(self.errors)
        component = self.build(statement)
        if component is not None and len(self.errors) == errors:
            if len(self.templates) < MAX_TEMPLATES:
                self.templates[shape] = Template.of(component)
        return component

    def build(self, statement: ComponentStatement) -> Component | None:
        """The component of ``statement``, every attribute, part and pole read."""
        if statement.kind not in KINDS:
            self.errors.append(
                UnknownKindError(
                    f"unknown kind {statement.kind!r}{_close(statement.kind, KINDS)} "
                    f"(known kinds: {', '.join(KINDS)})",
                    statement.kind_span,
                )
            )
            return None
        attributes = self.attributes(statement)
        part = self.part(statement, attributes)
        connections = self.connections(statement)
        self.check_fixed_terminals(statement, connections)
        poles, elements = self.poles(statement, part, connections)
        values = _merge(self.values_of(part), attributes)
        if statement.kind == "supply":
            self.check_range(values, attributes, statement.span)
        tags = frozenset(values.get("tags", ()))
        return Component(
            statement.kind,
            statement.ref,
            statement.span,
            connections,
            tuple(attributes),
            part,
            values,
            tags,
            poles,
            elements,
        )


def _components(reader: Reader, builder: _Builder) -> list[Component]:
    components: list[Component] = []
    seen: dict[str, Span] = {}
    templates = builder.templates.get
    for statement in reader.statements:
        ref = statement.ref
        if ref in seen:
            reader.errors.append(
                InputError(
                    f"reference {ref!r} is defined twice (first at {seen[ref]})",
                    statement.ref_span,
                )
            )
            continue
        seen[ref] = statement.span
        # builder.component(statement), its usual case (a known shape) inline,
        # with shape_of's own usual case (a key the fast reader made)
        template = templates(statement.__dict__.get("_shape") or shape_of(statement))
        if template is not None:
            components.append(template.component(statement))
            continue
        component = builder.component(statement)
        if component is not None:
            components.append(component)
    return components


def load_cnet(
    path: Path,
    extra_parts: Sequence[Path] = (),
    allow_outside: bool = False,
    display_base: Path | None = None,
) -> Netlist:
    """Read the design whose top file is ``path``; raise InputErrors on bad input."""
    top = path.resolve()
    reader = Reader(top.parent, allow_outside, (display_base or Path.cwd()).resolve())
    if not top.is_file():
        raise IncludeError(f"{reader.display(top)}: no such file")
    for extra in extra_parts:
        if not extra.is_file():
            raise IncludeError(f"part library {extra}: no such file")
    reader.read(top, (), None)
    parts = read_libraries(reader, [p.resolve() for p in extra_parts])
    components = _components(reader, _Builder(parts, reader.errors))
    reader.errors.extend(check_waiver_targets(reader.waivers, components))
    if reader.errors:
        raise InputErrors(reader.errors)
    return Netlist(
        reader.display(top),
        reader.title,
        tuple(components),
        tuple(reader.waivers),
        tuple(reader.files),
        parts,
    )


def build_component(
    statement: ComponentStatement, parts: Mapping[str, Part]
) -> Component:
    """Build one component statement against loaded parts (design edits use it).

    Raises InputErrors where the statement is not valid on its own.
    """
    errors: list[InputError] = []
    component = _Builder(parts, errors).component(statement)
    if errors or component is None:
        raise InputErrors(errors)
    return component
