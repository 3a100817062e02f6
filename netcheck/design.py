"""Read a whole design: includes, part libraries, attributes, poles -> Netlist."""

from __future__ import annotations

import difflib
import os
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from netcheck.attributes import (
    COIL_KEYS,
    CONTACT_KEYS,
    KIND_ATTRIBUTES,
    KIND_TERMINALS,
    QUANTITY_KEYS,
    choices,
)
from netcheck.errors import (
    IncludeError,
    InputError,
    InputErrors,
    PartsError,
    QuantityError,
    UnknownKindError,
)
from netcheck.model import (
    KINDS,
    POLE_KINDS,
    Attribute,
    Component,
    Connection,
    Netlist,
    Part,
    SwitchingElement,
    Waiver,
)
from netcheck.parse import (
    ComponentStatement,
    FileStatement,
    WaiveStatement,
    decode_source,
    parse_text,
)
from netcheck.parts import load_library
from netcheck.poles import check_terminals, elements_of, infer_poles, poles_from_part
from netcheck.source import Span
from netcheck.units import check_sign, parse_quantity

__all__ = ["load_design", "read_design_text", "MAX_FILE_BYTES", "MAX_INCLUDE_DEPTH"]

MAX_FILE_BYTES = 32 * 1024 * 1024
MAX_INCLUDE_DEPTH = 16


@dataclass
class _Reader:
    root: Path
    allow_outside: bool
    display_base: Path
    errors: list[InputError] = field(default_factory=list)
    statements: list[ComponentStatement] = field(default_factory=list)
    waivers: list[Waiver] = field(default_factory=list)
    libraries: list[tuple[Path, Span | None]] = field(default_factory=list)
    files: list[str] = field(default_factory=list)
    title: str | None = None
    title_span: Span | None = None

    def display(self, path: Path) -> str:
        try:
            return Path(os.path.relpath(path, self.display_base)).as_posix()
        except ValueError:
            return path.as_posix()

    def resolve(self, base: Path, text: str, span: Span, what: str) -> Path | None:
        try:
            target = (base.parent / text).resolve()
        except (RuntimeError, OSError) as problem:  # a symbolic-link loop
            self.errors.append(IncludeError(f"{what} {text!r}: {problem}", span))
            return None
        if not self.allow_outside and not target.is_relative_to(self.root):
            self.errors.append(
                IncludeError(
                    f"{what} {text!r} is outside the design's folder "
                    f"({self.display(self.root)}); --allow-outside permits it",
                    span,
                )
            )
            return None
        if not target.is_file():
            self.errors.append(IncludeError(f"{what} {text!r} not found", span))
            return None
        return target

    def read(self, path: Path, chain: tuple[Path, ...], span: Span | None) -> None:
        display = self.display(path)
        if path in chain:
            cycle = " -> ".join(self.display(p) for p in (*chain, path))
            self.errors.append(IncludeError(f"include cycle: {cycle}", span))
            return
        if len(chain) > MAX_INCLUDE_DEPTH:
            self.errors.append(
                IncludeError(f"includes nested deeper than {MAX_INCLUDE_DEPTH}", span)
            )
            return
        if path.stat().st_size > MAX_FILE_BYTES:
            self.errors.append(
                InputError(f"{display} is larger than {MAX_FILE_BYTES} bytes", span)
            )
            return
        self.files.append(display)
        try:
            parsed = parse_text(decode_source(path.read_bytes(), display), display)
        except InputErrors as errors:
            self.errors.extend(errors.errors)
            return
        except InputError as error:
            self.errors.append(error)
            return
        for statement in parsed.statements:
            self.statement(statement, path, (*chain, path))

    def statement(self, statement: object, path: Path, chain: tuple[Path, ...]) -> None:
        if isinstance(statement, ComponentStatement):
            self.statements.append(statement)
        elif isinstance(statement, WaiveStatement):
            if not statement.reason.strip():
                self.errors.append(
                    InputError(
                        "a waiver needs a non-empty reason", statement.reason_span
                    )
                )
            self.waivers.append(
                Waiver(
                    statement.rule, statement.target, statement.reason, statement.span
                )
            )
        elif isinstance(statement, FileStatement):
            self.file_statement(statement, path, chain)

    def file_statement(
        self, statement: FileStatement, path: Path, chain: tuple[Path, ...]
    ) -> None:
        if statement.keyword == "title":
            if self.title_span is not None:
                self.errors.append(
                    InputError(
                        f"a second title (the first is at {self.title_span})",
                        statement.span,
                    )
                )
            self.title, self.title_span = statement.text, statement.span
        elif statement.keyword == "parts":
            target = self.resolve(
                path, statement.text, statement.text_span, "part library"
            )
            if target is not None:
                self.libraries.append((target, statement.text_span))
        else:
            target = self.resolve(path, statement.text, statement.text_span, "include")
            if target is not None:
                self.read(target, chain, statement.text_span)


def _close(word: str, options: Sequence[str]) -> str:
    near = difflib.get_close_matches(word, options, n=1)
    return f"; did you mean {near[0]!r}?" if near else ""


def _parse_value(key: str, text: str, span: Span, quoted: bool) -> Any:
    base = key.rsplit(".", 1)[-1]
    dimension = QUANTITY_KEYS.get(base)
    if dimension is not None:
        quantity = parse_quantity(text, dimension, span)
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


def _allowed_keys(kind: str) -> list[str]:
    keys = list(KIND_ATTRIBUTES[kind])
    if kind in POLE_KINDS:
        keys += [f"contacts.{k}" for k in CONTACT_KEYS]
        if kind != "switch":
            keys += [f"coil.{k}" for k in COIL_KEYS]
    return keys


def _merge(part: Part | None, attributes: Sequence[Attribute]) -> dict[str, Any]:
    values: dict[str, Any] = {}
    if part is not None:
        values = {
            k: (dict(v) if isinstance(v, Mapping) else v) for k, v in part.data.items()
        }
    for attribute in attributes:
        if "." in attribute.key:
            group, key = attribute.key.split(".", 1)
            values.setdefault(group, {})[key] = attribute.value
        else:
            values[attribute.key] = attribute.value
    return values


class _Builder:
    def __init__(self, parts: Mapping[str, Part], errors: list[InputError]) -> None:
        self.parts = parts
        self.errors = errors

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
                value = _parse_value(raw.key, raw.text, raw.value_span, raw.quoted)
            except InputError as error:
                self.errors.append(error)
                continue
            out.append(Attribute(raw.key, value, raw.text, raw.span))
        return out

    def part(
        self, statement: ComponentStatement, attributes: list[Attribute]
    ) -> Part | None:
        name = next((a.value for a in attributes if a.key == "part"), None)
        if name is None:
            return None
        part = self.parts.get(name)
        span = next(a.span for a in attributes if a.key == "part")
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
        seen: dict[str, Span] = {}
        out = []
        for terminal, net, span in statement.connections:
            if terminal in seen:
                self.errors.append(
                    InputError(
                        f"terminal {terminal!r} of {statement.ref} is connected twice "
                        f"(first at {seen[terminal]})",
                        span,
                    )
                )
                continue
            seen[terminal] = span
            out.append(Connection(terminal, net, span))
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
        used = [c.terminal for c in connections]
        spans = {c.terminal: c.span for c in connections}
        has_coil = kind in ("relay", "contactor")
        if kind in ("fuse", "breaker"):
            return self.protective_poles(statement, connections)
        if kind not in POLE_KINDS:
            return (), self.output_elements(statement, connections)
        if part is not None and part.data.get("poles"):
            poles = poles_from_part(part.data["poles"])
            self.errors.extend(
                check_terminals(statement.ref, poles, used, has_coil, spans)
            )
        else:
            poles, unexplained = infer_poles(used, has_coil)
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
        poles, unexplained = infer_poles([c.terminal for c in connections], False)
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
        if statement.kind not in ("ssr", "output") or len(connections) != 2:
            return ()
        terminals = [c.terminal for c in connections]
        for first, second in (("+", "-"), ("1", "2"), ("Q", "M")):
            if set(terminals) == {first, second}:
                return (
                    SwitchingElement(
                        statement.ref, first, second, "output", statement.span
                    ),
                )
        return ()

    def component(self, statement: ComponentStatement) -> Component | None:
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
        values = _merge(part, attributes)
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


def _libraries(reader: _Reader, extra: Sequence[Path]) -> dict[str, Part]:
    parts: dict[str, Part] = {}
    for path, span in [*reader.libraries, *((p, None) for p in extra)]:
        try:
            parts.update(load_library(path, reader.display(path)))
        except InputErrors as errors:
            reader.errors.extend(errors.errors)
        except InputError as error:
            if error.span is None:
                error.span = span
            reader.errors.append(error)
    return parts


def load_design(
    path: Path,
    extra_parts: Sequence[Path] = (),
    allow_outside: bool = False,
    display_base: Path | None = None,
) -> Netlist:
    """Read the design whose top file is ``path``; raise InputErrors on bad input."""
    top = path.resolve()
    reader = _Reader(top.parent, allow_outside, (display_base or Path.cwd()).resolve())
    if not top.is_file():
        raise IncludeError(f"{reader.display(top)}: no such file")
    for extra in extra_parts:
        if not extra.is_file():
            raise IncludeError(f"part library {extra}: no such file")
    reader.read(top, (), None)
    parts = _libraries(reader, [p.resolve() for p in extra_parts])
    builder = _Builder(parts, reader.errors)
    components: list[Component] = []
    seen: dict[str, Span] = {}
    for statement in reader.statements:
        if statement.ref in seen:
            reader.errors.append(
                InputError(
                    f"reference {statement.ref!r} is defined twice (first at "
                    f"{seen[statement.ref]})",
                    statement.ref_span,
                )
            )
            continue
        seen[statement.ref] = statement.span
        component = builder.component(statement)
        if component is not None:
            components.append(component)
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


def read_design_text(text: str, file: str = "design.cnet") -> Netlist:
    """Build a Netlist from text alone (tests and snippets; no includes or parts)."""
    import tempfile

    with tempfile.TemporaryDirectory() as folder:
        target = Path(folder) / file
        target.write_text(text, encoding="utf-8")
        return load_design(target, display_base=Path(folder))
