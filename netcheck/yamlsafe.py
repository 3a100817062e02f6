"""Safe YAML reading with positions: no code, no alias bombs, no duplicate keys."""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import yaml

from netcheck.errors import InputError
from netcheck.source import Span, register_text

__all__ = ["LocatedYaml", "load_located_yaml", "MAX_NODES", "MAX_DEPTH"]

MAX_NODES = 200_000
_PLAIN_TAGS = ("tag:yaml.org,2002:map", "tag:yaml.org,2002:seq")
MAX_DEPTH = 64


class LocatedYaml:
    """Plain Python data from YAML plus the span of every key path."""

    def __init__(self, data: Any, spans: Mapping[tuple[Any, ...], Span], file: str):
        self.data = data
        self.spans = spans
        self.file = file

    def span(self, path: tuple[Any, ...]) -> Span:
        """The span of ``path``, or of its nearest located parent."""
        while path not in self.spans and path:
            path = path[:-1]
        return self.spans.get(path, Span(self.file, 1, 1))


def _mark_span(file: str, node: yaml.Node) -> Span:
    start, end = node.start_mark, node.end_mark
    return Span(file, start.line + 1, start.column + 1, end.line + 1, end.column + 1)


class _Builder:
    def __init__(self, file: str, error: type[InputError]) -> None:
        self.file = file
        self.error = error
        self.count = 0
        self.spans: dict[tuple[Any, ...], Span] = {}

    def build(self, node: yaml.Node, path: tuple[Any, ...], depth: int) -> Any:
        self.count += 1
        if self.count > MAX_NODES:
            raise self.error(
                f"YAML too large or too deeply aliased (over {MAX_NODES} nodes)",
                _mark_span(self.file, node),
            )
        if depth > MAX_DEPTH:
            raise self.error(
                f"YAML nested more than {MAX_DEPTH} levels", _mark_span(self.file, node)
            )
        self.spans.setdefault(path, _mark_span(self.file, node))
        if node.tag not in _PLAIN_TAGS and not isinstance(node, yaml.ScalarNode):
            raise self.error(
                f"YAML tag {node.tag!r} is not allowed here",
                _mark_span(self.file, node),
            )
        if isinstance(node, yaml.MappingNode):
            return self._mapping(node, path, depth)
        if isinstance(node, yaml.SequenceNode):
            return [
                self.build(item, (*path, i), depth + 1)
                for i, item in enumerate(node.value)
            ]
        return yaml.SafeLoader.construct_object(_LOADER, node)  # type: ignore[arg-type]

    def _mapping(
        self, node: yaml.MappingNode, path: tuple[Any, ...], depth: int
    ) -> dict:
        out: dict[Any, Any] = {}
        for key_node, value_node in node.value:
            if key_node.tag == "tag:yaml.org,2002:merge":
                raise self.error(
                    "YAML merge keys ('<<') are not supported",
                    _mark_span(self.file, key_node),
                )
            if not isinstance(key_node, yaml.ScalarNode):
                raise self.error(
                    "a mapping key must be a plain value",
                    _mark_span(self.file, key_node),
                )
            # The key as written: YAML 1.1 would read 'no:' as False.
            key = key_node.value
            if key in out:
                raise self.error(
                    f"duplicate key {key!r}", _mark_span(self.file, key_node)
                )
            self.spans[(*path, key)] = _mark_span(self.file, key_node)
            out[key] = self.build(value_node, (*path, key), depth + 1)
        return out


class _Loader(yaml.SafeLoader):
    pass


_LOADER = _Loader("")


def load_located_yaml(text: str, file: str, error: type[InputError]) -> LocatedYaml:
    """Parse YAML safely; raise ``error`` with a span on any problem."""
    register_text(file, text)
    try:
        root = yaml.compose(text, Loader=yaml.SafeLoader)
    except yaml.reader.ReaderError as exc:
        # Control characters: PyYAML gives a position in the text, not a mark.
        before = text[: exc.position]
        line = before.count("\n") + 1
        column = exc.position - (before.rfind("\n") + 1) + 1
        raise error(
            f"invalid YAML: {exc.reason} (character {exc.character!r})",
            Span(file, line, column),
        ) from None
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        span = Span(file, mark.line + 1, mark.column + 1) if mark else Span(file, 1, 1)
        raise error(f"invalid YAML: {exc.problem or exc.context}", span) from None
    except yaml.YAMLError as exc:
        raise error(f"invalid YAML: {exc}", Span(file, 1, 1)) from None
    except RecursionError:
        raise error("YAML nested too deeply", Span(file, 1, 1)) from None
    if root is None:
        return LocatedYaml(None, {(): Span(file, 1, 1)}, file)
    builder = _Builder(file, error)
    try:
        data = builder.build(root, (), 0)
    except yaml.constructor.ConstructorError as exc:
        mark = exc.problem_mark
        span = Span(file, mark.line + 1, mark.column + 1) if mark else Span(file, 1, 1)
        raise error(f"invalid YAML value: {exc.problem}", span) from None
    return LocatedYaml(data, builder.spans, file)
