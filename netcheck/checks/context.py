"""What a check sees: the design, its analysis, options, and a finding factory."""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from dataclasses import dataclass, field
from typing import Any

from netcheck.analysis.elements import Analysis
from netcheck.analysis.switched import ElementAnalysis
from netcheck.catalogue import RuleMeta, all_margins
from netcheck.findings import Finding, Severity, fill_template
from netcheck.graph import Branch, Domain, Graph
from netcheck.model import Component, Netlist

__all__ = ["CheckContext", "Anchor"]

Anchor = ElementAnalysis | Component | tuple[Component, str]


@dataclass
class CheckContext:
    """The read-only view a check gets; ``rule`` is set by the runner per check."""

    netlist: Netlist
    graph: Graph
    analysis: Analysis
    catalogue: Mapping[str, RuleMeta]
    margins: Mapping[str, float]
    rule: str = ""
    # Results several checks share (e.g. the suppressors fitted), computed once.
    memo: dict[str, Any] = field(default_factory=dict)

    def switching_elements(
        self, supply: str | None = None
    ) -> Iterator[ElementAnalysis]:
        """Switching elements sorted by name, optionally of one supply kind."""
        for element in self.analysis.sorted_elements():
            if supply is None or element.supply == supply:
                yield element

    def components(self, *kinds: str) -> Iterator[Component]:
        """Components of the given kinds (all if none), in file order."""
        for component in self.netlist.components:
            if not kinds or component.kind in kinds:
                yield component

    def domains(self) -> Iterator[Domain]:
        """Supply domains."""
        yield from self.graph.domains

    def branches(self, *roles: str) -> Iterator[Branch]:
        """Branches of the given roles (all if none)."""
        for branch in self.graph.branches:
            if not roles or branch.role in roles:
                yield branch

    def nets(self) -> Iterator[tuple[str, list[tuple[Component, str]]]]:
        """Every net with its connections, sorted by name."""
        for net in sorted(self.graph.connections):
            yield net, self.graph.connections[net]

    def option(self, name: str) -> float:
        """A margin: from configuration, else the rule YAML's default."""
        if name in self.margins:
            return float(self.margins[name])
        return all_margins(self.catalogue)[name].default

    def finding(
        self,
        anchor: Anchor,
        *,
        message: str = "default",
        fix: str = "default",
        key: str = "",
        severity: Severity | None = None,
        rule: str | None = None,
        **values: Any,
    ) -> Finding:
        """A finding of the current rule, its templates filled from ``values``.

        ``severity`` raises or lowers the rule's default where the rule's YAML
        says the severity depends on the case; ``rule`` lets a check report
        ``rating-data-missing`` when it cannot decide.
        """
        meta = self.catalogue[rule or self.rule]
        if isinstance(anchor, ElementAnalysis):
            component, element = anchor.component, anchor.name
        elif isinstance(anchor, tuple):
            component, element = anchor
        else:
            component, element = anchor, anchor.ref
        values = {"element": element, "ref": component.ref, **values}
        fix_template = meta.fix(fix)
        return Finding(
            rule=meta.name,
            severity=severity or meta.severity,
            message=fill_template(meta.message(message), values),
            span=component.span,
            element=element,
            values={k: v for k, v in values.items() if k not in ("element", "ref")},
            fix=fill_template(fix_template, values) if fix_template else None,
            references=meta.references,
            key=key,
        )
