"""Find suppressors: single parts and chains (diode + zener, R + C) between two nets."""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass

from netcheck.graph import Branch
from netcheck.kinds import SUPPRESSOR_KINDS, conducts_one_way
from netcheck.model import once

__all__ = ["Chain", "find_chains", "chain_kind"]

_MAX_CHAIN = 4


@dataclass(frozen=True)
class Chain:
    """A suppressor between nets ``a`` and ``b``: one part or parts in series.

    ``branches`` run from ``a`` to ``b``; ``polarity`` maps each polarized
    part's key to +1 when its anode faces ``a``, -1 when it faces ``b``.
    """

    kind: str
    a: str
    b: str
    branches: tuple[Branch, ...]
    polarity: Mapping[str, int]

    def __init__(
        self,
        kind: str,
        a: str,
        b: str,
        branches: tuple[Branch, ...],
        polarity: Mapping[str, int],
    ) -> None:
        # One per suppressor of a design: straight into ``__dict__`` as
        # ``model.Component`` is (tests/test_model_init.py).
        fields = self.__dict__
        fields["kind"] = kind
        fields["a"] = a
        fields["b"] = b
        fields["branches"] = branches
        fields["polarity"] = polarity

    @once  # read per load and per rule; the fields are frozen
    def refs(self) -> tuple[str, ...]:
        """References of the parts in the chain."""
        return tuple(b.ref for b in self.branches)


# Chains named by the set of their part kinds (how many of each does not matter).
_CHAIN_NAMES = {
    frozenset({"diode"}): "diode",
    frozenset({"diode", "zener"}): "diode-zener",
    frozenset({"diode", "tvs"}): "diode-zener",
    frozenset({"zener"}): "zener",
    frozenset({"tvs"}): "tvs",
    frozenset({"varistor"}): "varistor",
    frozenset({"rc"}): "rc",
    frozenset({"resistor", "capacitor"}): "rc",
    frozenset({"capacitor"}): "capacitor",
    frozenset({"resistor"}): "resistor",
    frozenset({"diode", "resistor"}): "diode-resistor",
}


def chain_kind(kinds: Iterable[str]) -> str:
    """Name a chain by its parts: diode, diode-zener, rc, tvs, varistor, ..."""
    found = frozenset(kinds)
    return _CHAIN_NAMES.get(found) or "+".join(sorted(found))


# ``chain_kind`` of one part, by its kind (most chains are one part).
_SINGLE_NAMES = {next(iter(k)): v for k, v in _CHAIN_NAMES.items() if len(k) == 1}


def _polarity(branch: Branch, toward_a: str) -> int:
    # Polarized branches run anode (a) -> cathode (b).
    return 1 if branch.a == toward_a else -1


def find_chains(
    branches: Sequence[Branch], degree: Mapping[str, int], wire: Mapping[str, str]
) -> dict[frozenset[str], list[Chain]]:
    """Every suppressor chain, keyed by the unordered pair of wires it spans.

    A chain passes through an intermediate net only where that net joins
    exactly two connections, both of suppressor parts. ``wire`` maps a net
    to its representative after joining nets through fuses and breakers.
    """
    suppressors = [b for b in branches if b.role in SUPPRESSOR_KINDS]
    at: dict[str, list[Branch]] = {}
    for branch in suppressors:
        at.setdefault(branch.a, []).append(branch)
        at.setdefault(branch.b, []).append(branch)

    def inner(net: str) -> bool:
        return degree.get(net, 0) == 2 and len(at.get(net, ())) == 2

    chains: dict[frozenset[str], list[Chain]] = {}
    seen: set[tuple[str, ...]] = set()
    for start in suppressors:
        for origin in (start.a, start.b):
            if inner(origin):
                continue
            path, net = [start], start.b if origin == start.a else start.a
            nets = [origin]
            while inner(net) and len(path) < _MAX_CHAIN:
                nets.append(net)
                nxt = next(b for b in at[net] if b is not path[-1])
                net = nxt.b if nxt.a == net else nxt.a
                path.append(nxt)
            if inner(net) or net == origin:
                continue
            ident = (
                (start.key,) if len(path) == 1 else tuple(sorted(b.key for b in path))
            )
            if ident in seen:
                continue
            seen.add(ident)
            polarity = {
                b.key: _polarity(b, nets[i])
                for i, b in enumerate(path)
                if conducts_one_way(
                    b.kind,
                    b.component.value("bidirectional"),
                    {c.terminal for c in b.component.connections},
                )
            }
            kind = _SINGLE_NAMES.get(start.kind) if len(path) == 1 else None
            chain = Chain(
                kind or chain_kind(b.kind for b in path),
                origin,
                net,
                tuple(path),
                polarity,
            )
            pair = frozenset({wire.get(origin, origin), wire.get(net, net)})
            chains.setdefault(pair, []).append(chain)
    return chains
