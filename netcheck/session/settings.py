"""What a run was asked for, and what applies to each design.

Precedence: the command line over the design's ``netcheck.yaml`` (``--config``
or the nearest one) over the defaults. ``--select`` replaces the configured
selection; ``--ignore`` and ``--parts`` add to the configured ones.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

from netcheck.baseline import load_baseline_entries
from netcheck.catalogue import RuleMeta
from netcheck.config import Config, canonical_rule, find_config, load_config
from netcheck.findings import Severity
from netcheck.pipeline import CheckOptions

__all__ = [
    "Request",
    "Settings",
    "SettingsCache",
    "UsageError",
    "configured_margins",
    "resolve_rules",
]

DEFAULT_FAIL_ON = "error"


class UsageError(Exception):
    """A command line that cannot be carried out: reported with usage, exit 2."""


@dataclass(frozen=True)
class Request:
    """What the command line asked for; None or empty: not given."""

    paths: tuple[Path, ...]
    config: Path | None = None
    parts: tuple[Path, ...] = ()
    allow_outside: bool = False
    select: tuple[str, ...] | None = None
    ignore: tuple[str, ...] | None = None
    fail_on: str | None = None
    baseline: Path | None = None
    use_baseline: bool = False  # apply --baseline or the configured baseline
    jobs: int = 1


@dataclass(frozen=True)
class Settings:
    """What applies to one design: its configuration merged with the command line."""

    fail_on: Severity | None  # None: never fail
    select: frozenset[str] | None
    ignore: frozenset[str]
    severity: Mapping[str, Severity]
    options: CheckOptions
    baseline: Mapping[str, Mapping[str, str]] | None  # entries by fingerprint

    def keeps(self, rule: str) -> bool:
        """Whether ``--select``/``--ignore`` (and their keys) keep ``rule``."""
        chosen = self.select is None or rule in self.select
        return chosen and rule not in self.ignore


def resolve_rules(
    names: Sequence[str] | None, option: str, catalogue: Mapping[str, RuleMeta]
) -> list[str] | None:
    """Canonical rule names of an option; UsageError for an unknown one."""
    if names is None:
        return None
    try:
        return [canonical_rule(name, catalogue) for name in names]
    except ValueError as err:
        raise UsageError(f"{option}: {err}") from None


def merge(
    config: Config, request: Request, catalogue: Mapping[str, RuleMeta]
) -> Settings:
    """Command line over configuration over defaults."""
    select = resolve_rules(request.select, "--select", catalogue)
    ignore = resolve_rules(request.ignore, "--ignore", catalogue)
    chosen = select if select is not None else config.select
    fail_on = request.fail_on or config.fail_on or DEFAULT_FAIL_ON
    baseline = (request.baseline or config.baseline) if request.use_baseline else None
    options = CheckOptions(
        extra_parts=(*config.parts, *request.parts),
        allow_outside=request.allow_outside,
        margins=dict(config.margins),
    )
    return Settings(
        fail_on=None if fail_on == "never" else Severity.parse(fail_on),
        select=frozenset(chosen) if chosen is not None else None,
        ignore=frozenset((*config.ignore, *(ignore or []))),
        severity=dict(config.severity),
        options=options,
        baseline=load_baseline_entries(baseline) if baseline is not None else None,
    )


@dataclass
class SettingsCache:
    """Settings by configuration file, so each is read and merged once a run."""

    request: Request
    catalogue: Mapping[str, RuleMeta]
    _cache: dict[Path | None, Settings] = field(default_factory=dict)

    def for_design(self, file: Path) -> Settings:
        """The settings of ``file``: ``--config`` or its nearest netcheck.yaml."""
        path = self.request.config or find_config(file)
        key = path.resolve() if path is not None else None
        if key not in self._cache:
            config = load_config(path, self.catalogue) if path else Config()
            self._cache[key] = merge(config, self.request, self.catalogue)
        return self._cache[key]


def configured_margins(
    config: Path | None, catalogue: Mapping[str, RuleMeta]
) -> dict[str, float] | None:
    """The ``margins:`` of a netcheck.yaml named with --config (None: none named).

    For ``size``, which has no design to find a configuration from.
    """
    if config is None:
        return None
    return dict(load_config(config, catalogue).margins)
