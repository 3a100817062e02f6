"""The edge-stepped side search against the plain net-stepped reference.

No outside source: the reference below is the search the module used before
(one net popped per side per round), kept here verbatim as the oracle.
"""

from __future__ import annotations

import random
from collections import deque
from types import SimpleNamespace

import pytest

from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.graph import SWITCH


def _reference_sides(zero: ZeroOhm, key: str, removed: set[str]):
    branch = zero.by_key[key]
    skip = removed | {key}
    seen = {"a": {branch.a}, "b": {branch.b}}
    queues = {"a": deque([branch.a]), "b": deque([branch.b])}
    if branch.a == branch.b:
        return {branch.a}, "a"
    while True:
        for side in ("b", "a"):
            queue = queues[side]
            if not queue:
                return seen[side], side
            net = queue.popleft()
            for edge, other in zero.adjacent.get(net, ()):
                if edge in skip:
                    continue
                if other in seen["a" if side == "b" else "b"]:
                    return set(), side
                if other not in seen[side]:
                    seen[side].add(other)
                    queues[side].append(other)


def _branch(key: str, a: str, b: str):
    return SimpleNamespace(key=key, a=a, b=b, role=SWITCH)


def _ladder(rng: random.Random, rungs: int):
    """One rail pair; rungs of series contacts with seal-ins and changeovers."""
    branches, shunts = [_branch("main", "P", "R+")], []
    for r in range(rungs):
        nets = ["R+"] + [f"n{r}_{i}" for i in range(rng.randint(1, 6))]
        for i in range(len(nets) - 1):
            branches.append(_branch(f"k{r}_{i}", nets[i], nets[i + 1]))
        if rng.random() < 0.3:  # seal-in around part of the chain
            branches.append(_branch(f"s{r}", nets[0], rng.choice(nets[1:])))
        if rng.random() < 0.2:  # changeover: second throw to a new net
            branches.append(_branch(f"c{r}", nets[-1], f"alt{r}"))
        if rng.random() < 0.2:  # precharge-style resistor across a contact
            shunts.append(_branch(f"r{r}", nets[0], nets[1]))
        if rng.random() < 0.1:  # self-loop element
            branches.append(_branch(f"l{r}", nets[-1], nets[-1]))
    return branches, shunts


def _random_graph(rng: random.Random, nets: int, edges: int):
    names = [f"x{i}" for i in range(nets)]
    return [
        _branch(f"e{i}", rng.choice(names), rng.choice(names)) for i in range(edges)
    ], []


@pytest.mark.parametrize("seed", range(12))
def test_sides_match_reference(seed: int) -> None:
    rng = random.Random(seed)
    if seed % 2:
        branches, shunts = _ladder(rng, rng.randint(1, 60))
    else:
        branches, shunts = _random_graph(rng, rng.randint(2, 30), rng.randint(1, 50))
    zero = ZeroOhm(branches, shunts)
    for branch in branches:
        bypass = set(zero.bypass(branch.key))
        got_side, got_end = zero.sides(branch.key, bypass)
        want_side, want_end = _reference_sides(zero, branch.key, bypass)
        assert got_side == want_side
        if want_side:  # the end is only meaningful for a switched side
            assert got_end == want_end
