"""The rule catalogue: loads ``rules/*.yaml`` into RuleMeta objects."""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any

import yaml

from netcheck.findings import Finding, Severity, fill_template, placeholders
from netcheck.resources import data_path
from netcheck.source import Span

__all__ = ["RuleMeta", "Margin", "load_catalogue", "verify_catalogue"]


@dataclass(frozen=True)
class Margin:
    """A configurable margin of a rule, with the source of its default."""

    name: str
    default: float
    source: str
    description: str = ""


@dataclass(frozen=True)
class RuleMeta:
    """Everything the YAML says about one rule."""

    name: str
    severity: Severity
    family: str
    title: str
    rationale: str
    references: tuple[str, ...]
    messages: Mapping[str, str]
    fixes: Mapping[str, str]
    margins: Mapping[str, Margin] = field(default_factory=dict)
    aliases: tuple[str, ...] = ()
    # How a template words a value that is None, by placeholder: alternatives,
    # the first whose own placeholders are all known is used.
    absent: Mapping[str, tuple[str, ...]] = field(default_factory=dict)

    def message(self, variant: str = "default") -> str:
        """The message template of ``variant``."""
        return self.messages[variant]

    def fix(self, variant: str = "default") -> str | None:
        """The fix template of ``variant`` (None where the rule has no fix)."""
        return self.fixes.get(variant)

    def placeholders(self) -> set[str]:
        """All placeholders used by any template of the rule."""
        names: set[str] = set()
        texts = [t for alts in self.absent.values() for t in alts]
        for template in [*self.messages.values(), *self.fixes.values(), *texts]:
            names |= placeholders(template)
        return names

    def finding(
        self,
        span: Span,
        element: str,
        values: Mapping[str, Any],
        *,
        message: str = "default",
        fix: str = "default",
        severity: Severity | None = None,
        key: str = "",
        ref: str = "",
        note: str = "",
        copy_values: bool = True,
    ) -> Finding:
        """A finding of this rule, its templates filled from ``values``.

        The one way findings are built, for checks and waivers alike; the
        templates may also use ``element`` and ``ref`` (the component's
        reference, ``element`` by default). ``note`` is a template appended to
        the message (the supply voltage a finding was judged at).
        ``copy_values=False`` keeps ``values`` itself as the finding's values,
        for a caller that made the dict for this finding alone (the check
        context: a heavy report makes tens of thousands of findings).
        """
        fill = {"element": element, "ref": ref or element, **values}
        fix_template = self.fixes.get(fix)
        template = self.messages[message]
        if note:
            template = _joined(template, note)
        absent = self.absent
        # Positional, in Finding's field order: rule, severity, message, span,
        # element, values, fix, references, key, fingerprint, waived, variant.
        return Finding(
            self.name,
            severity or self.severity,
            fill_template(template, fill, absent),
            span,
            element,
            dict(values) if copy_values else values,
            fill_template(fix_template, fill, absent) if fix_template else None,
            self.references,
            key,
            "",
            None,
            message,
        )


@lru_cache(maxsize=1024)
def _joined(template: str, note: str) -> str:
    """``template + note``, one string object per pair.

    The same object each time: its hash is computed once, and the templates'
    compiled cache (``findings._compiled``) is keyed by the text.
    """
    return template + note


def _variants(value: Any) -> dict[str, str]:
    if value is None:
        return {}
    if isinstance(value, str):
        return {"default": value.strip()}
    return {str(k): str(v).strip() for k, v in value.items()}


def _rule(entry: Mapping[str, Any], family: str) -> RuleMeta:
    margins = {
        name: Margin(
            name, float(m["default"]), str(m["source"]), str(m.get("about", ""))
        )
        for name, m in (entry.get("margins") or {}).items()
    }
    return RuleMeta(
        name=entry["name"],
        severity=Severity.parse(entry["severity"]),
        family=family,
        title=entry["title"].strip(),
        rationale=" ".join(entry["rationale"].split()),
        references=tuple(entry.get("references") or ()),
        messages=_variants(entry["message"]),
        fixes=_variants(entry.get("fix")),
        margins=margins,
        aliases=tuple(entry.get("aliases") or ()),
        absent={
            str(k): (v.strip(),) if isinstance(v, str) else tuple(x.strip() for x in v)
            for k, v in (entry.get("absent") or {}).items()
        },
    )


# libyaml's safe loader where PyYAML has it (the same data, ten times faster:
# tests/test_catalogue_loader.py), else the pure-Python one.
_SAFE_LOADER = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


@lru_cache(maxsize=1)
def load_catalogue() -> dict[str, RuleMeta]:
    """Load every rule of ``rules/*.yaml``, keyed by name (aliases too)."""
    rules: dict[str, RuleMeta] = {}
    for path in sorted(data_path("rules").glob("*.yaml")):
        document = yaml.load(path.read_text(encoding="utf-8"), Loader=_SAFE_LOADER)
        for entry in document["rules"]:
            meta = _rule(entry, document.get("family", path.stem))
            if meta.name in rules:
                raise ValueError(f"{path}: rule {meta.name} defined twice")
            rules[meta.name] = meta
    for meta in list(rules.values()):
        for alias in meta.aliases:
            rules.setdefault(alias, meta)
    return rules


def verify_catalogue(catalogue: Mapping[str, RuleMeta], checks: Iterable[str]) -> None:
    """Fail if a YAML rule has no check or a check has no YAML rule."""
    names = {meta.name for meta in catalogue.values()}
    registered = set(checks)
    missing = sorted(names - registered - {"unused-waiver"})
    extra = sorted(registered - names)
    if missing or extra:
        raise RuntimeError(
            f"rule catalogue and checks disagree: no check for {missing}, "
            f"no YAML for {extra}"
        )


def all_margins(catalogue: Mapping[str, RuleMeta]) -> dict[str, Margin]:
    """Every margin of every rule, keyed by margin name."""
    margins: dict[str, Margin] = {}
    for meta in catalogue.values():
        margins.update(meta.margins)
    return margins
