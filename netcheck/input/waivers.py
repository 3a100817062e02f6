"""Waiver targets that cannot match: what the writer meant, and what to write.

language.md, "waive": a waiver names the reference or switching element a
finding is about (``K1`` or ``K1:13-14``). Two slips are certain at input time
and are refused, located, with the spelling that works; a target that is
merely stale (no such finding today) is left to the ``unused-waiver`` rule.

- ``S1:14-13``: the element exists with its terminals the other way round.
  An element is named as the model names it, common (or first) terminal
  first (language.md, "Poles and switching elements").
- ``N5``, a net's name: findings are anchored on components, so a finding
  about a net (``single-connection-net``) is waived by the component it names.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

from netcheck.errors import InputError
from netcheck.model import Component, Waiver

__all__ = ["check_waiver_targets"]


def check_waiver_targets(
    waivers: Iterable[Waiver], components: Sequence[Component]
) -> list[InputError]:
    """The input errors of waivers whose target is a certain slip."""
    waivers = list(waivers)
    if not waivers:
        return []  # no maps of a large design's components for nothing
    by_ref = {c.ref: c for c in components}
    nets: dict[str, list[str]] = {}
    for component in components:
        for connection in component.connections:
            nets.setdefault(connection.net, []).append(component.ref)
    errors = []
    for waiver in waivers:
        message = _reversed(waiver, by_ref) or _net(waiver, by_ref, nets)
        if message is not None:
            errors.append(InputError(message, waiver.target_span or waiver.span))
    return errors


def _reversed(waiver: Waiver, by_ref: dict[str, Component]) -> str | None:
    ref, _, terminals = waiver.target.partition(":")
    component = by_ref.get(ref)
    first, dash, second = terminals.rpartition("-")
    if component is None or not dash or not first:
        return None
    names = {e.name for e in component.elements}
    flipped = f"{ref}:{second}-{first}"
    if waiver.target in names or flipped not in names:
        return None
    return (
        f"{ref} has no switching element {terminals}; its terminals are named the "
        f"other way round: write waive {waiver.rule} {flipped}"
    )


def _net(
    waiver: Waiver, by_ref: dict[str, Component], nets: dict[str, list[str]]
) -> str | None:
    target = waiver.target
    if ":" in target or target in by_ref or target not in nets:
        return None
    refs = sorted(set(nets[target]))
    write = " or ".join(f"waive {waiver.rule} {ref}" for ref in refs[:3])
    return (
        f"{target!r} is a net, not a component: a waiver names the component or "
        f"switching element a finding is about; write {write}"
    )
