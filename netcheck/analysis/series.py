"""Series arrangements: poles breaking one current, and changeover sides."""

from __future__ import annotations

from netcheck.analysis.switched import ElementAnalysis, with_fields
from netcheck.graph import Branch

__all__ = ["mark_series", "changeovers"]


def mark_series(elements: dict[str, ElementAnalysis]) -> dict[str, ElementAnalysis]:
    """Mark elements in series: same switched loads and the same current."""
    groups: dict[tuple, list[str]] = {}
    for name, e in elements.items():
        switched = e.loads
        if not switched or e.supply != "dc" or e.current is None:
            continue
        loads = (
            frozenset((switched[0].facts.key,))
            if len(switched) == 1
            else frozenset([ld.facts.key for ld in switched])
        )
        key = (e.domain, loads, round(float(e.current.magnitude), 9))
        groups.setdefault(key, []).append(name)
    out = dict(elements)
    for names in groups.values():
        if len(names) >= 2:
            _mark_group(elements, names, out)
    return out


def _mark_group(
    elements: dict[str, ElementAnalysis],
    names: list[str],
    out: dict[str, ElementAnalysis],
) -> None:
    """Mark one group: each element's partners are the group less its bypass.

    An element without a bypass has the whole group for partners, so its two
    tuples depend on its device alone: cut once per device from the sorted
    group by slices (a chain of 30 interlocks has 30 devices).
    """
    ordered = tuple(sorted(names))
    device_of = {n: elements[n].element.device for n in ordered}
    at: dict[str, list[int]] = {}
    for index, n in enumerate(ordered):
        at.setdefault(device_of[n], []).append(index)
    whole: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {}
    for name in names:
        e = elements[name]
        device = device_of[name]
        if e.bypass:
            bypass = set(e.bypass)
            partners = [n for n in ordered if n not in bypass]
            same = tuple([n for n in partners if device_of[n] == device])
            other = tuple([n for n in partners if device_of[n] != device])
        else:
            if device not in whole:
                whole[device] = _split(ordered, at[device])
            same, other = whole[device]
        out[name] = with_fields(
            e, series_poles=len(same), series_elements=same, other_series=other
        )


def _split(
    ordered: tuple[str, ...], positions: list[int]
) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """``ordered`` at ``positions`` (ascending), and the rest in order."""
    same = tuple(ordered[i] for i in positions)
    rest: list[str] = []
    start = 0
    for i in positions:
        rest.extend(ordered[start:i])
        start = i + 1
    rest.extend(ordered[start:])
    return same, tuple(rest)


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
