"""Part libraries: safe YAML, validated against the shipped JSON Schema."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import jsonschema

from netcheck import schema
from netcheck.attributes import QUANTITY_KEYS
from netcheck.errors import InputError, InputErrors, PartsError, QuantityError
from netcheck.model import Part
from netcheck.schema import DIMENSION_KEYWORD
from netcheck.units import check_sign, parse_quantity
from netcheck.yamlsafe import LocatedYaml, load_located_yaml

__all__ = ["load_library", "parse_library", "MAX_LIBRARY_BYTES"]

MAX_LIBRARY_BYTES = 8 * 1024 * 1024
_NON_QUANTITY = {"category", "material", "form", "supply", "suppression", "kind"}


def _validator() -> jsonschema.protocols.Validator:
    # The shipped schema checks each quantity's dimension (netcheckDimension).
    return schema.validator("parts")


def _path_text(path: tuple[Any, ...]) -> str:
    out = ""
    for key in path:
        out += f"[{key}]" if isinstance(key, int) else (f".{key}" if out else str(key))
    return out


def _known(keys: Any) -> str:
    return ", ".join(sorted(str(k) for k in keys))


def _schema_message(error: jsonschema.ValidationError) -> tuple[tuple[Any, ...], str]:
    """Return the key path an error is about and a message for it."""
    path = tuple(error.absolute_path)
    if error.validator == DIMENSION_KEYWORD and isinstance(error.cause, QuantityError):
        return path, error.cause.message
    if error.validator == "additionalProperties":
        extra = sorted(set(error.instance) - set(error.schema.get("properties", {})))
        known = _known(error.schema.get("properties", {}))
        return (*path, extra[0]), f"unknown key {extra[0]!r} (known keys: {known})"
    if "propertyNames" in error.schema_path and error.validator == "enum":
        allowed = _known(error.validator_value)
        return (*path, error.instance), (
            f"unknown key {error.instance!r} for this kind of part "
            f"(known keys: {allowed})"
        )
    if error.validator == "enum":
        return path, f"{error.instance!r} is not one of {_known(error.validator_value)}"
    if error.validator == "type" and DIMENSION_KEYWORD in error.schema:
        return path, (
            f"expected a {error.schema[DIMENSION_KEYWORD]} with its unit "
            f"(e.g. '24 V'), got {error.instance!r}"
        )
    if error.validator == "type":
        return path, f"expected {error.validator_value}, got {error.instance!r}"
    return path, error.message


def _leaf_errors(error: jsonschema.ValidationError) -> list[jsonschema.ValidationError]:
    if error.context:
        out = []
        for sub in error.context:
            out.extend(_leaf_errors(sub))
        return out
    return [error]


def _validate(doc: LocatedYaml) -> list[InputError]:
    found: dict[tuple[str, ...], InputError] = {}
    for top in _validator().iter_errors(doc.data):
        for error in _leaf_errors(top):
            if error.validator == "pattern" and DIMENSION_KEYWORD in error.schema:
                continue  # the pattern is for editors; the dimension check says more
            path, message = _schema_message(error)
            where = _path_text(path)
            key = tuple(map(str, path))
            specific = "propertyNames" in error.schema_path
            if key in found and not specific:
                continue
            found[key] = PartsError(
                f"{where}: {message}" if where else message, doc.span(path)
            )
    return list(found.values())


def _convert(
    value: Any,
    key: str | None,
    doc: LocatedYaml,
    path: tuple[Any, ...],
    errors: list[InputError],
) -> Any:
    if isinstance(value, dict):
        return {k: _convert(v, k, doc, (*path, k), errors) for k, v in value.items()}
    if isinstance(value, list):
        return tuple(
            _convert(v, key, doc, (*path, i), errors) for i, v in enumerate(value)
        )
    if (
        key in QUANTITY_KEYS
        and key not in _NON_QUANTITY
        and isinstance(value, (str, int, float))
    ):
        quantity = parse_quantity(str(value), QUANTITY_KEYS[key])
        if key != "operating_range":
            try:
                check_sign(key, quantity, doc.span(path))
            except InputError as error:
                error.message = f"{_path_text(path)}: {error.message}"
                errors.append(error)
        return quantity
    if key in ("polarized", "economy", "bidirectional") and isinstance(value, str):
        return value == "yes"
    return value


def parse_library(text: str, file: str) -> dict[str, Part]:
    """Parse and validate a part library's text; raise InputErrors on problems."""
    doc = load_located_yaml(text, file, PartsError)
    if not isinstance(doc.data, dict):
        raise PartsError(
            "a part library is a mapping with 'format' and 'parts'", doc.span(())
        )
    errors = _validate(doc)
    if errors:
        raise InputErrors(errors)
    parts = {}
    for name, data in doc.data["parts"].items():
        converted = _convert(data, None, doc, ("parts", name), errors)
        parts[name] = Part(
            name, converted["kind"], converted, doc.span(("parts", name)), file
        )
    if errors:
        raise InputErrors(errors)
    return parts


def load_library(path: Path, display: str) -> dict[str, Part]:
    """Read a part library file (``display`` is the name used in messages)."""
    size = path.stat().st_size
    if size > MAX_LIBRARY_BYTES:
        raise PartsError(
            f"part library is {size} bytes; the limit is {MAX_LIBRARY_BYTES}"
        )
    data = path.read_bytes()
    try:
        text = data.decode("utf-8").removeprefix("\ufeff")
    except UnicodeDecodeError as error:
        raise PartsError(f"{display}: not UTF-8 text at byte {error.start}") from None
    return parse_library(text, display)
