"""What the components of one statement shape share, worked out once a design.

Components whose statements have the same kind, the same attribute texts and
the same terminals get the same parsed values, part, poles, merged values and
tags, and the same errors; only the reference, the nets and the spans differ.
The builder makes the first component of a shape in full; if that raised no
error, the shape's template makes the others: the same (immutable, shared)
objects for what is alike, new attributes, switching elements and component
for what is not. A large design repeats a few dozen shapes, so this does the
part lookups, value merges and pole inference once a shape, not once a
component.
"""

from __future__ import annotations

from collections.abc import Hashable, Mapping
from dataclasses import dataclass
from typing import Any

from netcheck.input.cnet.statements import ComponentStatement
from netcheck.model import Attribute, Component, Part, Pole, SwitchingElement

__all__ = ["Template", "shape_of"]


def shape_of(statement: ComponentStatement) -> Hashable:
    """What decides everything but a component's reference, nets and spans.

    Whether a value was quoted is left out: the builder reads the text alone.
    A statement the fast reader read from plain lines brings its own key
    (``_shape``: the kind, then the ``key=value`` words and terminals in the
    order written), which tells its kind, attribute texts and terminals as
    the key made here does; the two kinds of key never meet (this one's
    second item is a tuple), so at worst a shape is worked out once per kind
    of key, the same either way.
    """
    shape = statement.__dict__.get("_shape")
    if shape is not None:
        return shape
    return (
        statement.kind,
        tuple([(a.key, a.text) for a in statement.attributes]),
        tuple([c.terminal for c in statement.connections]),
    )


@dataclass(frozen=True, slots=True)
class Template:
    """The parts of a component that every component of its shape shares."""

    values: tuple[Any, ...]  # each attribute's parsed value, in order
    part: Part | None
    merged: Mapping[str, Any]  # Component.values (nothing mutates it)
    tags: frozenset[str]
    poles: tuple[Pole, ...]
    elements: tuple[tuple[str, str, str], ...]  # (a, b, form) of each element

    @classmethod
    def of(cls, component: Component) -> Template:
        """The template of the shape of ``component`` (built without errors)."""
        return cls(
            tuple(a.value for a in component.attributes),
            component.part,
            component.values,
            component.tags,
            component.poles,
            tuple((e.a, e.b, e.form) for e in component.elements),
        )

    def component(self, statement: ComponentStatement) -> Component:
        """The component of ``statement``, a statement of this template's shape.

        The same objects as ``Component(kind, ref, span, connections,
        (Attribute(...), ...), part, merged, tags, poles, (SwitchingElement(...),
        ...))``, their fields written out (an attribute whose raw attribute
        holds where it starts instead of its span holds the same:
        ``model.token_span``) (``tests/test_model_init.py`` holds
        the model's own ``__init__`` to the same): three constructor calls a
        component were a third of the build of a large design.
        """
        ref, span = statement.ref, statement.span
        attributes = []
        for raw, value in zip(statement.attributes, self.values, strict=True):
            attribute = _NEW(Attribute)
            fields = attribute.__dict__
            known = raw.__dict__
            fields["key"] = known["key"]
            fields["value"] = value
            fields["text"] = known["text"]
            at = known.get("span")
            if at is None:  # where it starts, the span worked out when read
                fields["_file"] = known["_file"]
                fields["_line"] = known["_line"]
                fields["_column"] = known["_column"]
            else:
                fields["span"] = at
            attributes.append(attribute)
        elements = []
        for a, b, form in self.elements:
            element = _NEW(SwitchingElement)
            fields = element.__dict__
            fields["device"] = ref
            fields["a"] = a
            fields["b"] = b
            fields["form"] = form
            fields["span"] = span
            elements.append(element)
        component = _NEW(Component)
        fields = component.__dict__
        fields["kind"] = statement.kind
        fields["ref"] = ref
        fields["span"] = span
        fields["connections"] = statement.connections
        fields["attributes"] = tuple(attributes)
        fields["part"] = self.part
        fields["values"] = self.merged
        fields["tags"] = self.tags
        fields["poles"] = self.poles
        fields["elements"] = tuple(elements)
        return component


_NEW = object.__new__
