"""``netcheck.yaml``: rule selection, severities, part libraries and margins.

The file is looked up in the checked file's directory, then in each parent up to
the top of the repository (a directory holding ``.git``) or of the file system;
``--config FILE`` names it instead. Keys, all optional::

    fail-on: error                 # error | warning | info | never
    select: [dc-break-over-rating] # only these rules (default: all)
    ignore: [single-connection-net]
    severity: {inductive-load-unsuppressed: error}
    parts: [parts/company.parts.yaml]   # relative to this file
    margins: {diode-reverse-voltage: 2.0}
    baseline: netcheck-baseline.json    # relative to this file

Any other key, a value of the wrong type, an unknown rule or margin, or a
missing file is a ConfigError located at the offending node. The readers below
word the common mistakes; the shipped schema (``netcheck schema config``) then
has the last word, so a file netcheck accepts is one editors' validators accept.
"""

from __future__ import annotations

import difflib
import math
from collections.abc import Callable, Iterable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from netcheck.catalogue import RuleMeta, all_margins
from netcheck.errors import ConfigError
from netcheck.findings import Severity
from netcheck.levels import FAIL_ON, SEVERITIES
from netcheck.report import display_path, working_path
from netcheck.yamlsafe import LocatedYaml, load_located_yaml

__all__ = [
    "CONFIG_NAME",
    "FAIL_ON",
    "Config",
    "find_config",
    "load_config",
    "canonical_rule",
    "did_you_mean",
]

CONFIG_NAME = "netcheck.yaml"


@dataclass(frozen=True)
class Config:
    """A loaded configuration; None/empty means the key was not given."""

    path: Path | None = None
    fail_on: str | None = None
    select: tuple[str, ...] | None = None
    ignore: tuple[str, ...] = ()
    severity: Mapping[str, Severity] = field(default_factory=dict)
    parts: tuple[Path, ...] = ()
    margins: Mapping[str, float] = field(default_factory=dict)
    baseline: Path | None = None


def find_config(start: Path) -> Path | None:
    """Find the nearest ``netcheck.yaml`` at or above ``start`` (file or directory)."""
    directory = Path(start).resolve()
    if not directory.is_dir():
        directory = directory.parent
    for folder in (directory, *directory.parents):
        candidate = folder / CONFIG_NAME
        if candidate.is_file():
            return candidate
        if (folder / ".git").exists():
            return None
    return None


def did_you_mean(name: str, choices: Iterable[str]) -> str:
    """``"; did you mean 'x'?"`` for the closest choice, or ``""``."""
    close = difflib.get_close_matches(name, sorted(set(choices)), n=1, cutoff=0.6)
    return f"; did you mean '{close[0]}'?" if close else ""


def canonical_rule(name: str, catalogue: Mapping[str, RuleMeta]) -> str:
    """Return the rule's canonical name (aliases resolved); ValueError if unknown."""
    meta = catalogue.get(name)
    if meta is None:
        raise ValueError(f"unknown rule '{name}'{did_you_mean(name, catalogue)}")
    return meta.name


def _read(path: Path) -> LocatedYaml:
    """Read ``path`` as located YAML; unreadable or invalid YAML is a ConfigError."""
    shown = display_path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as err:
        reason = getattr(err, "strerror", None) or str(err)
        raise ConfigError(f"cannot read {shown}: {reason}") from None
    return load_located_yaml(text, shown, ConfigError)


def _kind(value: Any) -> str:
    if value is None:
        return "nothing"
    names = {
        bool: "true/false",
        int: "a number",
        float: "a number",
        str: "a string",
        list: "a list",
        dict: "a mapping",
    }
    return names.get(type(value), type(value).__name__)


class _Reader:
    """Validates the values of one configuration file, locating each problem."""

    def __init__(self, path: Path, catalogue: Mapping[str, RuleMeta]) -> None:
        self.base = path.parent
        self.catalogue = catalogue
        self.doc = _read(path)

    def fail(self, message: str, where: tuple[Any, ...]) -> ConfigError:
        return ConfigError(message, self.doc.span(where))

    def string(self, value: Any, where: tuple[Any, ...], what: str) -> str:
        if not isinstance(value, str):
            raise self.fail(f"expected {what}, got {_kind(value)}", where)
        return value

    def items(
        self, value: Any, where: tuple[Any, ...]
    ) -> list[tuple[Any, tuple[Any, ...]]]:
        """Return a list's items with their paths (one value: a list of one)."""
        if value is None:
            return []
        if isinstance(value, list):
            return [(item, (*where, i)) for i, item in enumerate(value)]
        if isinstance(value, str):
            return [(value, where)]
        raise self.fail(f"'{where[0]}' must be a list, got {_kind(value)}", where)

    def pairs(
        self, value: Any, where: tuple[Any, ...]
    ) -> list[tuple[str, Any, tuple[Any, ...]]]:
        if value is None:
            return []
        if not isinstance(value, dict):
            raise self.fail(
                f"'{where[0]}' must be a mapping, got {_kind(value)}", where
            )
        return [(str(k), v, (*where, k)) for k, v in value.items()]

    def rule(self, value: Any, where: tuple[Any, ...]) -> str:
        name = self.string(value, where, "a rule name")
        try:
            return canonical_rule(name, self.catalogue)
        except ValueError as err:
            raise self.fail(str(err), where) from None

    def file(self, value: Any, where: tuple[Any, ...], what: str) -> Path:
        path = self.base / self.string(value, where, f"the path of {what}")
        if not path.is_file():
            raise self.fail(f"{what} not found: {display_path(path)}", where)
        return working_path(path)

    # One method per key; each returns the Config field's value.
    def fail_on(self, value: Any, where: tuple[Any, ...]) -> str:
        if value not in FAIL_ON:
            raise self.fail(f"'fail-on' must be one of {', '.join(FAIL_ON)}", where)
        return str(value)

    def select(self, value: Any, where: tuple[Any, ...]) -> tuple[str, ...]:
        return tuple(self.rule(item, at) for item, at in self.items(value, where))

    def ignore(self, value: Any, where: tuple[Any, ...]) -> tuple[str, ...]:
        return self.select(value, where)

    def severity(self, value: Any, where: tuple[Any, ...]) -> dict[str, Severity]:
        out = {}
        for name, level, at in self.pairs(value, where):
            if level not in SEVERITIES:
                raise self.fail(f"severity must be one of {', '.join(SEVERITIES)}", at)
            out[self.rule(name, at)] = Severity.parse(level)
        return out

    def parts(self, value: Any, where: tuple[Any, ...]) -> tuple[Path, ...]:
        return tuple(
            self.file(v, at, "part library") for v, at in self.items(value, where)
        )

    def margins(self, value: Any, where: tuple[Any, ...]) -> dict[str, float]:
        known = all_margins(self.catalogue)
        out = {}
        for name, number, at in self.pairs(value, where):
            if name not in known:
                raise self.fail(
                    f"unknown margin '{name}'{did_you_mean(name, known)}", at
                )
            if isinstance(number, bool) or not isinstance(number, (int, float)):
                raise self.fail(
                    f"margin '{name}' must be a number, got {_kind(number)}", at
                )
            if not math.isfinite(number) or number <= 0:
                raise self.fail(f"margin '{name}' must be a positive number", at)
            out[name] = float(number)
        return out

    def baseline(self, value: Any, where: tuple[Any, ...]) -> Path:
        return self.file(value, where, "baseline")


_KEYS: dict[str, Callable[[_Reader, Any, tuple[Any, ...]], Any]] = {
    "fail-on": _Reader.fail_on,
    "select": _Reader.select,
    "ignore": _Reader.ignore,
    "severity": _Reader.severity,
    "parts": _Reader.parts,
    "margins": _Reader.margins,
    "baseline": _Reader.baseline,
}


def load_config(path: Path, catalogue: Mapping[str, RuleMeta]) -> Config:
    """Load and validate a configuration file; raises ConfigError."""
    reader = _Reader(Path(path), catalogue)
    data = reader.doc.data
    if data is None:
        return Config(path=Path(path))
    if not isinstance(data, dict):
        raise reader.fail("the configuration must be a mapping of keys", ())
    values: dict[str, Any] = {}
    for key, value in data.items():
        if key not in _KEYS:
            raise reader.fail(
                f"unknown key '{key}'{did_you_mean(key, _KEYS)} "
                f"(known keys: {', '.join(_KEYS)})",
                (key,),
            )
        values[key.replace("-", "_")] = _KEYS[key](reader, value, (key,))
    _check_schema(reader, data)
    return Config(path=Path(path), **values)


def _check_schema(reader: _Reader, data: dict[str, Any]) -> None:
    """Raise a located ConfigError for the first departure from the schema."""
    from netcheck.schema import iter_errors

    for error in iter_errors("config", data):
        where = tuple(error.absolute_path)
        named = "'" + ".".join(map(str, where)) + "': " if where else ""
        raise reader.fail(f"{named}{error.message} (netcheck schema config)", where)
