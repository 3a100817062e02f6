"""The block-tree sides and blocks against the searches they replaced.

No outside source: the oracles below are the module's own former code, kept
verbatim: the side search that walked the graph edge by edge from both ends
(``_walked_sides``), and the bypass sets from networkx's biconnected
components of the net-edge-net subdivided graph (``_subdivided_blocks``).
Graphs: random multigraphs with and without shunts, long chains, parallel
bundles, bridges, cycles, ladders of rungs, symmetric graphs (ties), conductors
among the switching elements.
"""

from __future__ import annotations

import random
from collections import deque
from types import SimpleNamespace

import networkx as nx
import pytest

from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.graph import CONDUCTOR, SWITCH


def _walked_sides(zero: ZeroOhm, key: str, removed: set[str]):
    """The former ``ZeroOhm.sides``, verbatim but for its home."""
    branch = zero.by_key[key]
    if branch.a == branch.b:
        return {branch.a}, "a"
    skip = removed | {key}
    seen = {"a": {branch.a}, "b": {branch.b}}
    steps = {side: _walk(zero, seen[side], skip) for side in ("a", "b")}
    while True:
        for side, other_side in (("b", "a"), ("a", "b")):
            step = next(steps[side], None)
            if step is None:
                return _settle(seen, steps, side, other_side)
            if step in seen[other_side]:
                return set(), side


def _walk(zero: ZeroOhm, seen: set[str], skip: set[str]):
    queue = deque(seen)
    while queue:
        net = queue.popleft()
        for edge, other in zero.adjacent.get(net, ()):
            if edge in skip:
                continue
            yield other
            if other not in seen:
                seen.add(other)
                queue.append(other)


def _settle(seen, steps, done, other):
    size = len(seen[done])
    limit = size if done == "b" else size + 1
    while len(seen[other]) < limit:
        if next(steps[other], None) is None:
            break
    if len(seen[other]) >= limit:
        return seen[done], done
    return seen[other], other


def _subdivided_blocks(branches, shunts) -> dict[str, frozenset[str]]:
    """Edge key -> the edge keys of its block (blocks of two or more edges)."""
    graph = nx.Graph()
    for branch in [*shunts, *branches]:
        edge = ("edge", branch.key)
        graph.add_edge(("net", branch.a), edge)
        graph.add_edge(edge, ("net", branch.b))
    found = {}
    for nodes in nx.biconnected_components(graph):
        if len(nodes) > 2:
            edges = frozenset(key for kind, key in nodes if kind == "edge")
            found.update(dict.fromkeys(edges, edges))
    return found


def _branch(key: str, a: str, b: str, role: str = SWITCH):
    return SimpleNamespace(key=key, a=a, b=b, role=role)


def _random(rng: random.Random):
    nets = [f"x{i}" for i in range(rng.randint(2, 30))]
    branches = [
        _branch(f"e{i}", rng.choice(nets), rng.choice(nets), _role(rng))
        for i in range(rng.randint(1, 50))
    ]
    return branches, _shunts(rng, branches)


def _role(rng: random.Random) -> str:
    return CONDUCTOR if rng.random() < 0.25 else SWITCH


def _shunts(rng: random.Random, branches, joined: bool = False):
    """Shunts between nets of one component, or (``joined`` false) anywhere."""
    ends = sorted({n for b in branches for n in (b.a, b.b)})
    shunts = []
    for i in range(rng.randint(0, 4)):
        if joined:
            b = rng.choice(branches)
            a, z = b.a, rng.choice((b.a, b.b))
            shunts.append(_branch(f"r{i}", a, z, "load"))
        else:
            shunts.append(_branch(f"r{i}", rng.choice(ends), rng.choice(ends), "load"))
    return shunts


def _chains(rng: random.Random):
    """Rails with long series chains, seal-ins, bundles and rings."""
    branches = [_branch("fuse", "L+", "P", CONDUCTOR)]
    for r in range(rng.randint(1, 12)):
        nets = ["P"] + [f"c{r}_{i}" for i in range(rng.randint(1, 40))]
        for i in range(len(nets) - 1):
            branches.append(_branch(f"k{r}_{i}", nets[i], nets[i + 1], _role(rng)))
        shape = rng.random()
        if shape < 0.3:  # a bundle of parallel contacts at the chain's end
            for j in range(rng.randint(2, 21)):
                branches.append(_branch(f"p{r}_{j}", nets[-1], f"coil{r}"))
        elif shape < 0.5:  # a seal-in around part of the chain
            lo = rng.randrange(len(nets) - 1)
            branches.append(_branch(f"s{r}", nets[lo], rng.choice(nets[lo + 1 :])))
        elif shape < 0.6:  # a ring back to the rail
            branches.append(_branch(f"ring{r}", nets[-1], "P", _role(rng)))
    return branches, _shunts(rng, branches, joined=True)


def _ties(rng: random.Random):
    """Mirror-image halves, so both sides of the middle contacts hold as many.

    Listed in random order, so the search starts on either side of them.
    """
    half = rng.randint(1, 8)
    ends = ("A0", "B0") if rng.random() < 0.5 else ("B0", "A0")
    branches = [_branch("mid", *ends)]
    if rng.random() < 0.5:
        branches.append(_branch("mid2", *ends))
    for side in "AB":
        for i in range(half):
            branches.append(_branch(f"{side}{i}", f"{side}{i}", f"{side}{i + 1}"))
    rng.shuffle(branches)
    return branches, []


GRAPHS = [_random, _chains, _ties]


@pytest.mark.parametrize("seed", range(60))
def test_sides_equal_the_walk(seed: int) -> None:
    rng = random.Random(seed)  # fixed seeds
    branches, shunts = GRAPHS[seed % len(GRAPHS)](rng)
    zero = ZeroOhm(branches, shunts)
    for branch in branches:
        bypass = set(zero.bypass(branch.key))
        keys = sorted(zero.by_key)
        choices = [bypass, set(), set(rng.sample(keys, min(2, len(keys))))]
        for removed in choices:
            got_side, got_end = zero.sides(branch.key, set(removed))
            want_side, want_end = _walked_sides(zero, branch.key, set(removed))
            assert got_side == want_side, (branch.key, removed)
            if want_side:  # the end is only meaningful for a switched side
                assert got_end == want_end, (branch.key, removed)


@pytest.mark.parametrize("seed", range(30))
def test_bypass_sets_equal_the_subdivided_blocks(seed: int) -> None:
    rng = random.Random(seed)
    branches, shunts = GRAPHS[seed % len(GRAPHS)](rng)
    zero = ZeroOhm(branches, shunts)
    blocks = _subdivided_blocks(branches, shunts)
    for branch in branches:
        block = blocks.get(branch.key, frozenset())
        want = tuple(
            k
            for k in sorted(block)
            if k != branch.key and k in zero.by_key and zero.by_key[k].role == SWITCH
        )
        assert zero.bypass(branch.key) == want
        assert zero.bypass_through_load(branch.key) == any(
            k in zero.shunt_keys for k in block
        )


def test_a_chain_side_is_what_hangs_below_each_contact() -> None:
    # Worked by hand: rail P, chain P-c1-c2-c3; contact c1-c2 leaves {c2, c3}.
    branches = [_branch("k1", "P", "c1"), _branch("k2", "c1", "c2")]
    branches += [_branch("k3", "c2", "c3"), _branch("k0", "L", "P")]
    zero = ZeroOhm(branches)
    assert zero.sides("k2", set()) == ({"c2", "c3"}, "b")
    assert zero.sides("k0", set()) == ({"L"}, "a")
    assert zero.sides("k1", set()) == ({"P", "L"}, "a")  # 2 nets against 3


@pytest.mark.parametrize("first", ["x", "y", "k"])
def test_a_tie_goes_to_b(first: str) -> None:
    # Whichever net the search starts from (A's side, B's side).
    branches = [
        _branch("k", "A", "B"),
        _branch("x", "A", "A1"),
        _branch("y", "B", "B1"),
    ]
    branches.sort(key=lambda b: b.key != first)
    assert ZeroOhm(branches).sides("k", set()) == ({"B", "B1"}, "b")
