"""The design model: frozen objects built from the netlist and the part libraries.

Every object built from text carries the ``span`` of the text it came from.

The classes made once per token of a design (``Attribute``, ``Connection``,
``SwitchingElement``, ``Component``) have their own ``__init__`` that writes the
fields into the instance's ``__dict__``: a frozen dataclass's generated one
calls ``object.__setattr__`` once a field, which was a fifth of a large
design's build. The objects are the same frozen dataclasses (fields, equality,
hash, repr, ``dataclasses.replace``); ``tests/test_model_init.py`` holds each
equal to what the generated ``__init__`` makes.

A ``Connection`` or ``Attribute`` read from a plain line (``terminal:net``,
``key=value`` unquoted, on one line) may hold where it starts instead of its
span (``token_span``): nearly all spans of a large design are never read
(errors and findings read them). On the 100 000-component bench designs the
spans left out saved about 55 MiB of the load's peak of about 320.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from typing import Any, Generic, TypeVar, overload

from netcheck.source import Span

__all__ = [
    "once",
    "token_span",
    "Attribute",
    "Connection",
    "Part",
    "Pole",
    "SwitchingElement",
    "Component",
    "Waiver",
    "Supply",
    "Netlist",
]


# The default of ``Component.values``: a new dict each time, as the dataclass's
# ``default_factory=dict`` gives.
_NEW_DICT: Any = object()
# What ``Component.value`` finds where a key is not there (None is a value).
_ABSENT: Any = object()
T = TypeVar("T")


class once(Generic[T]):  # noqa: N801 - used like ``property``
    """A read-only property of a frozen object, worked out on its first read.

    The value goes into the instance's ``__dict__``, which later reads find
    before this (non-data) descriptor: a plain attribute read from then on.
    ``functools.cached_property`` does the same behind a lock that costs more
    than the small values these are.
    """

    def __init__(self, function: Callable[[Any], T]) -> None:
        self.function = function
        self.name = function.__name__
        self.__doc__ = function.__doc__

    @overload
    def __get__(self, instance: None, owner: type | None = None) -> once[T]: ...
    @overload
    def __get__(self, instance: object, owner: type | None = None) -> T: ...
    def __get__(self, instance: object, owner: type | None = None) -> T | once[T]:
        if instance is None:
            return self
        value = instance.__dict__[self.name] = self.function(instance)
        return value


class token_span:  # noqa: N801 - used like ``property``
    """The ``span`` of a token that holds where it starts, worked out when read.

    The fast reader leaves ``_file``, ``_line`` and ``_column`` (1-based) in the
    instance's ``__dict__`` in place of ``span`` for a token of one line whose
    text is ``first`` + one separator + ``second`` (the fields named), as a
    plain ``terminal:net`` or unquoted ``key=value`` is; the span is then from
    that column to the token's end, on that line. It goes into ``__dict__`` on
    the first read, so this (non-data) descriptor is asked once; an instance
    made with a span (by ``__init__``) never asks it.
    """

    def __init__(self, first: str, second: str) -> None:
        self.first = first
        self.second = second

    @overload
    def __get__(self, instance: None, owner: type | None = None) -> token_span: ...
    @overload
    def __get__(self, instance: object, owner: type | None = None) -> Span: ...
    def __get__(self, instance: object, owner: type | None = None) -> Span | token_span:
        if instance is None:
            return self
        fields = instance.__dict__
        line, column = fields["_line"], fields["_column"]
        end = column + len(fields[self.first]) + 1 + len(fields[self.second])
        span = fields["span"] = Span(fields["_file"], line, column, line, end)
        return span


@dataclass(frozen=True)
class Attribute:
    """One ``key=value`` as written; ``value`` is parsed (quantity, str, bool, list)."""

    key: str
    value: Any
    text: str
    span: Span

    def __init__(self, key: str, value: Any, text: str, span: Span) -> None:
        fields = self.__dict__
        fields["key"] = key
        fields["value"] = value
        fields["text"] = text
        fields["span"] = span


# After the dataclass is made: a class attribute named like a field before
# would be taken for the field's default.
Attribute.span = token_span("key", "text")  # type: ignore[assignment]


@dataclass(frozen=True)
class Connection:
    """One ``terminal:net`` of a component."""

    terminal: str
    net: str
    span: Span

    def __init__(self, terminal: str, net: str, span: Span) -> None:
        fields = self.__dict__
        fields["terminal"] = terminal
        fields["net"] = net
        fields["span"] = span


Connection.span = token_span("terminal", "net")  # type: ignore[assignment]


@dataclass(frozen=True)
class Part:
    """A part from a library: its kind and data (quantities already parsed)."""

    name: str
    kind: str
    data: Mapping[str, Any]
    span: Span
    library: str = ""


@dataclass(frozen=True)
class Pole:
    """One pole of a device as the part or the marking convention defines it."""

    common: str
    no: str | None = None
    nc: str | None = None


@dataclass(frozen=True)
class SwitchingElement:
    """One conducting path that a device makes and breaks, named ``REF:T1-T2``.

    ``a`` is the common (or '+', or line) terminal, ``b`` the other one; for a
    polarized pole the current must enter at ``a``.
    """

    device: str
    a: str
    b: str
    form: str  # "no", "nc", or "output"
    span: Span

    def __init__(self, device: str, a: str, b: str, form: str, span: Span) -> None:
        fields = self.__dict__
        fields["device"] = device
        fields["a"] = a
        fields["b"] = b
        fields["form"] = form
        fields["span"] = span

    @once  # read many times per element; the fields are frozen
    def name(self) -> str:
        """The element's name, ``K1:13-14``.

        A semiconductor output with ``+``/``-`` (or ``Q``/``M``) terminals is
        named by its reference alone: ``Q3:+--`` would read badly.
        """
        if self.form == "output" and not self.a.isdigit():
            return self.device
        return f"{self.device}:{self.a}-{self.b}"


@dataclass(frozen=True)
class Component:
    """A component statement with its part merged and inline overrides applied.

    ``values`` holds the merged attributes: part data first, then the
    component's own attributes (which win). Nested part data stay nested
    (``values["coil"]["resistance"]``).
    """

    kind: str
    ref: str
    span: Span
    connections: tuple[Connection, ...]
    attributes: tuple[Attribute, ...] = ()
    part: Part | None = None
    values: Mapping[str, Any] = field(default_factory=dict)
    tags: frozenset[str] = frozenset()
    poles: tuple[Pole, ...] = ()
    elements: tuple[SwitchingElement, ...] = ()

    def __init__(
        self,
        kind: str,
        ref: str,
        span: Span,
        connections: tuple[Connection, ...],
        attributes: tuple[Attribute, ...] = (),
        part: Part | None = None,
        values: Mapping[str, Any] = _NEW_DICT,
        tags: frozenset[str] = frozenset(),
        poles: tuple[Pole, ...] = (),
        elements: tuple[SwitchingElement, ...] = (),
    ) -> None:
        fields = self.__dict__
        fields["kind"] = kind
        fields["ref"] = ref
        fields["span"] = span
        fields["connections"] = connections
        fields["attributes"] = attributes
        fields["part"] = part
        fields["values"] = {} if values is _NEW_DICT else values
        fields["tags"] = tags
        fields["poles"] = poles
        fields["elements"] = elements

    def net_of(self, terminal: str) -> str | None:
        """Return the net on ``terminal``, or None if unconnected."""
        for connection in self.connections:
            if connection.terminal == terminal:
                return connection.net
        return None

    def value(self, *path: str, default: Any = None) -> Any:
        """Return a merged value by key path (``value("coil", "resistance")``)."""
        node: Any = self.values
        for key in path:
            # A plain dict first: the ABC check costs more than the look-up.
            if type(node) is not dict and not isinstance(node, Mapping):
                return default
            node = node.get(key, _ABSENT)
            if node is _ABSENT:
                return default
        return node

    def attribute_span(self, key: str) -> Span:
        """Return the span of an inline attribute, or the statement's span."""
        for attribute in self.attributes:
            if attribute.key == key:
                return attribute.span
        return self.span


@dataclass(frozen=True)
class Waiver:
    """A ``waive rule target "reason"`` statement."""

    rule: str
    target: str
    reason: str
    span: Span
    target_span: Span | None = None


@dataclass(frozen=True)
class Supply:
    """A supply's domain facts, read from its component."""

    ref: str
    kind: str  # "dc" or "ac"
    voltage: Any  # Quantity
    span: Span


@dataclass(frozen=True)
class Netlist:
    """A whole design: the top file and everything it includes."""

    file: str
    title: str | None
    components: tuple[Component, ...]
    waivers: tuple[Waiver, ...]
    files: tuple[str, ...]
    parts: Mapping[str, Part] = field(default_factory=dict)

    def component(self, ref: str) -> Component | None:
        """Return the component with reference ``ref``."""
        index = self.__dict__.get("_by_ref")
        if index is None:
            index = {c.ref: c for c in self.components}
            # A frozen dataclass: the index is written around __setattr__.
            object.__setattr__(self, "_by_ref", index)
        return index.get(ref)
