"""Series arrangements: poles breaking one current, and changeover sides."""

from __future__ import annotations

from dataclasses import replace

from netcheck.analysis.switched import ElementAnalysis
from netcheck.graph import Branch

__all__ = ["mark_series", "changeovers"]


def mark_series(elements: dict[str, ElementAnalysis]) -> dict[str, ElementAnalysis]:
    """Mark elements in series: same switched loads and the same current."""
    groups: dict[tuple, list[str]] = {}
    for name, e in elements.items():
        if e.supply != "dc" or not e.loads or e.current is None:
            continue
        loads = frozenset(ld.facts.key for ld in e.loads)
        key = (e.domain, loads, round(float(e.current.magnitude), 9))
        groups.setdefault(key, []).append(name)
    out = dict(elements)
    for names in groups.values():
        if len(names) < 2:
            continue
        # Sorted once per group: filtering a sorted list keeps it sorted.
        ordered = sorted(names)
        device_of = {n: elements[n].element.device for n in ordered}
        for name in names:
            e = elements[name]
            bypass = set(e.bypass)
            partners = [n for n in ordered if n not in bypass] if bypass else ordered
            device = device_of[name]
            same = tuple(n for n in partners if device_of[n] == device)
            other = tuple(n for n in partners if device_of[n] != device)
            out[name] = replace(
                e, series_poles=len(same), series_elements=same, other_series=other
            )
    return out


def changeovers(switches: list[Branch]) -> tuple[set[str], set[str]]:
    """The NO and NC elements of changeover poles (both sides connected).

    The two sides of one changeover are never closed together, so the closed
    state closes the NO sides (NC sides open) and a second state, used for the
    NC sides' own analysis, the reverse.
    """
    by_common: dict[tuple[str, str], list[Branch]] = {}
    for branch in switches:
        assert branch.element is not None
        if branch.element.form in ("no", "nc"):
            by_common.setdefault((branch.ref, branch.element.a), []).append(branch)
    no_side, nc_side = set(), set()
    for group in by_common.values():
        forms = {b.element.form for b in group if b.element is not None}
        if forms == {"no", "nc"}:
            for b in group:
                assert b.element is not None
                (no_side if b.element.form == "no" else nc_side).add(b.key)
    return no_side, nc_side
