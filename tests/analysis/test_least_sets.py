"""``least_of_sets`` names every set as the domain's ``UnionFind`` does."""

from __future__ import annotations

import random

from netcheck.analysis.domain import UnionFind
from netcheck.analysis.least_sets import least_of_sets


def test_random_joins_give_the_union_finds_representatives():
    rng = random.Random(3)  # fixed seed: the same joins every run
    for _ in range(500):
        nets = [f"N{rng.randint(0, 60)}" for _ in range(rng.randint(1, 40))]
        pairs = [
            (rng.choice(nets), rng.choice(nets)) for _ in range(rng.randint(0, 50))
        ]
        sets = UnionFind()
        for net in nets:
            sets.find(net)
        for a, b in pairs:
            sets.union(a, b)
        assert least_of_sets(nets, pairs) == {n: sets.find(n) for n in nets}


def test_a_set_is_named_by_its_least_net():
    joined = least_of_sets(["W2", "P1", "W1", "M"], [("W2", "W1"), ("W1", "P1")])
    assert joined == {"W2": "P1", "P1": "P1", "W1": "P1", "M": "M"}
