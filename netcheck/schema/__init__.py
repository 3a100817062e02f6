"""The JSON Schemas of every file netcheck reads or writes, and validation by them.

Each schema is draft 2020-12 with a stable ``urn:netcheck:schema:NAME:VERSION``
``$id`` (resolved here, from the package, never over the network) and a
``version``. Part-library quantities carry our own keyword ``netcheckDimension``
(the dimension ``parse_quantity`` checks); editors ignore it and see a pattern.
"""

from __future__ import annotations

import copy
import json
from collections.abc import Iterator
from functools import cache, lru_cache
from pathlib import Path
from typing import Any

import jsonschema
import referencing

from netcheck.errors import QuantityError
from netcheck.quantity_hints import parse_with_hint

__all__ = [
    "DIMENSION_KEYWORD",
    "schema_names",
    "describe",
    "schema_path",
    "schema_text",
    "load_schema",
    "validator",
    "iter_errors",
    "validate",
]

DIMENSION_KEYWORD = "netcheckDimension"
_FOLDER = Path(__file__).resolve().parent
# What each schema describes (for the command that prints them and the docs).
_ABOUT = {
    "findings": "check --format json output",
    "inspect": "inspect --format json output",
    "size": "size --format json output",
    "baseline": "baseline files",
    "config": "netcheck.yaml",
    "parts": "part libraries (*.parts.yaml)",
}


def schema_names() -> tuple[str, ...]:
    """The names of the shipped schemas, sorted (``findings``, ``parts``, ...)."""
    return tuple(sorted(_ABOUT))


def describe(name: str) -> str:
    """What the schema ``name`` describes, in a few words."""
    return _ABOUT[_known(name)]


def _known(name: str) -> str:
    if name not in _ABOUT:
        raise KeyError(f"no schema {name!r} (known: {', '.join(schema_names())})")
    return name


def schema_path(name: str) -> Path:
    """The file of schema ``name`` inside the installed package."""
    return _FOLDER / f"{_known(name)}.schema.json"


def schema_text(name: str) -> str:
    """The schema ``name`` as shipped (JSON text), e.g. for printing."""
    return schema_path(name).read_text(encoding="utf-8")


@cache
def _loaded(name: str) -> dict[str, Any]:
    return json.loads(schema_text(name))


def load_schema(name: str) -> dict[str, Any]:
    """Return schema ``name`` as a dict (a copy: change it freely)."""
    return copy.deepcopy(_loaded(name))


def _dimension(
    validator: Any, dimension: str, instance: Any, schema: dict[str, Any]
) -> Iterator[jsonschema.ValidationError]:
    """``netcheckDimension``: a string must parse as a quantity of that dimension."""
    if isinstance(instance, (int, float)) and dimension == "ratio":
        return
    if not isinstance(instance, str):
        return  # the "type" keyword reports it
    try:
        parse_with_hint(instance, dimension)
    except QuantityError as error:
        yield jsonschema.ValidationError(error.message, cause=error)


@lru_cache(maxsize=1)
def _registry() -> referencing.Registry:
    resources = [
        (
            _loaded(name)["$id"],
            referencing.Resource.from_contents(_loaded(name)),
        )
        for name in schema_names()
    ]
    return referencing.Registry().with_resources(resources)


@cache
def validator(name: str) -> jsonschema.protocols.Validator:
    """A validator of schema ``name``: formats checked, ``netcheckDimension`` too."""
    schema = _loaded(name)
    base = jsonschema.validators.validator_for(schema)
    # The schemas are the package's own files, not input: each is checked
    # against its metaschema by tests/schema/test_schemas.py rather than on
    # every run (about 70 ms of a cold `netcheck check`).
    cls = jsonschema.validators.extend(base, {DIMENSION_KEYWORD: _dimension})
    return cls(
        schema,
        format_checker=base.FORMAT_CHECKER,
        registry=_registry(),
    )


def iter_errors(name: str, data: Any) -> Iterator[jsonschema.ValidationError]:
    """Every departure of ``data`` from schema ``name``, in document order."""
    return iter(
        sorted(validator(name).iter_errors(data), key=lambda e: list(map(str, e.path)))
    )


def validate(name: str, data: Any) -> None:
    """Raise ``jsonschema.ValidationError`` (the most relevant one) if invalid.

    Example: ``validate("config", yaml.safe_load(text))``.
    """
    error = jsonschema.exceptions.best_match(validator(name).iter_errors(data))
    if error is not None:
        raise error
