"""The closing network of a DC domain, cut at its supply rails into blocks.

The making current model (``making.py``) is a linear network: resistors,
ideal voltage sources (supplies, closed contacts, fuses, held capacitors) and
a 1 Tohm leak from every branch's first net to the reference. Its *rails* are
the nets wired to a supply terminal through fuses and breakers only; they stay
joined in every closing the model judges. Cut there, the rest falls into
*blocks* (a rung, a DC link) that meet only at the rails, so a block is a
passive multiport seen from the rails: port currents I = Y·V (Schur
complement of its inner nodes; Y from one solve with each rail port set to
1 V in turn). A closing changes one or two blocks; those are solved in full,
every other block enters as its Y, summed once per domain and configuration.
That is exact linear algebra (no approximation), and each solve is the size
of the element's own blocks, not of the domain.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from netcheck.analysis.domain import DomainState, UnionFind
from netcheck.analysis.si import si
from netcheck.graph import COIL, CONDUCTOR, LOAD, SUPPLY, SWITCH, Branch

__all__ = [
    "Net",
    "Blocks",
    "blocks_of",
    "R_IDEAL",
    "R_LEAK",
    "network_ohms",
]

# A supply with no r_int is given this internal resistance (ohm).
R_IDEAL = 1e-6
R_LEAK = 1e12  # ohm, every node to the reference (the usual SPICE remedy)


class Net:
    """A linear network: resistors, ideal voltage sources, and stamped multiports."""

    def __init__(self, ground: str) -> None:
        self.ground = ground
        self.nodes: dict[str, int] = {}
        self.resistors: list[tuple[str, str, float]] = []
        self.sources: list[tuple[str, str, float, str]] = []  # plus, minus, V, key
        self.stamps: list[tuple[list[str], np.ndarray]] = []
        self.injections: dict[str, float] = {}  # A into a node from outside

    def node(self, name: str) -> None:
        """Add a node (the reference is not one)."""
        if name != self.ground and name not in self.nodes:
            self.nodes[name] = len(self.nodes)

    def resistor(self, a: str, b: str, ohms: float) -> None:
        """A resistor between two nets."""
        self.node(a), self.node(b)
        self.resistors.append((a, b, ohms))

    def source(self, plus: str, minus: str, volts: float, key: str = "") -> None:
        """An ideal voltage source, its current reported under ``key``."""
        self.node(plus), self.node(minus)
        self.sources.append((plus, minus, volts, key))

    def stamp(self, ports: list[str], y: np.ndarray) -> None:
        """A passive multiport drawing y·V from ``ports`` (the reference left out)."""
        for port in ports:
            self.node(port)
        self.stamps.append((ports, y))

    def system(self) -> tuple[np.ndarray, np.ndarray]:
        """The modified-nodal matrix and right-hand side."""
        n, m = len(self.nodes), len(self.sources)
        matrix, rhs = np.zeros((n + m, n + m)), np.zeros(n + m)
        index = self.nodes.get
        for a, b, ohms in self.resistors:
            if a == b:
                continue
            g = 1.0 / ohms
            for x, y in ((a, b), (b, a)):
                i, j = index(x), index(y)
                if i is not None:
                    matrix[i, i] += g
                    if j is not None:
                        matrix[i, j] -= g
        for k, (plus, minus, volts, _key) in enumerate(self.sources):
            for node, sign in ((plus, 1.0), (minus, -1.0)):
                i = index(node)
                if i is not None:
                    matrix[i, n + k] += sign
                    matrix[n + k, i] += sign
            rhs[n + k] = volts
        for ports, y in self.stamps:
            at = [self.nodes[p] for p in ports]
            matrix[np.ix_(at, at)] += y
        for name, amps in self.injections.items():
            if name in self.nodes:
                rhs[self.nodes[name]] += amps
        return matrix, rhs

    def solve(self) -> tuple[dict[str, float], dict[str, float]]:
        """Node potentials and source currents (into ``plus`` from outside)."""
        matrix, rhs = self.system()
        solution = np.linalg.lstsq(matrix, rhs, rcond=None)[0]
        return self.read(solution)

    def read(self, solution: np.ndarray) -> tuple[dict[str, float], dict[str, float]]:
        """Potentials and source currents from a solution vector."""
        n = len(self.nodes)
        potentials = {name: float(solution[i]) for name, i in self.nodes.items()}
        potentials[self.ground] = 0.0
        currents = {s[3]: float(solution[n + k]) for k, s in enumerate(self.sources)}
        return potentials, currents


def network_ohms(state: DomainState, branch: Branch) -> float | None:
    """The resistance a load, coil or resistor puts in the network (ohm), or None."""
    if branch.role in (LOAD, COIL):
        value = state.facts[branch.key].resistance
    elif branch.kind == "resistor":
        value = branch.component.value("R")
    else:
        return None
    return si(value, "ohm") if value is not None else None


def add_branch(
    net: Net,
    state: DomainState,
    branch: Branch,
    ends: tuple[str, str],
    closed: bool,
    held: dict[str, float] | None,
    loads: bool,
) -> None:
    """One non-supply branch, as the closing model sees it (its leak included)."""
    a, b = ends
    key = branch.key
    net.resistor(a, net.ground, R_LEAK)
    if branch.role == CONDUCTOR or (branch.role == SWITCH and closed):
        net.source(a, b, 0.0, key)
    elif branch.kind in ("capacitor", "rc"):
        if held is not None and branch.component.value("C") is not None:
            series = branch.component.value("R") if branch.kind == "rc" else None
            ohms = si(series, "ohm") if series is not None else 0.0
            middle = f"{key}:c"
            net.source(middle, b, held.get(key, 0.0), key)
            net.resistor(a, middle, max(ohms, R_IDEAL))
    elif branch.role == LOAD and not loads:
        return
    elif (ohms := network_ohms(state, branch)) is not None:
        net.resistor(a, b, ohms)


@dataclass
class Blocks:
    """A domain cut at its rails: the blocks and their memoised multiports."""

    state: DomainState
    rail: dict[str, str]  # rail net -> its rail (the wire group's representative)
    ground: str
    ports: list[str]  # every rail but the reference
    members: list[list[Branch]]  # branches of each block
    block_of: dict[str, int]  # branch key -> block
    supplies: list[Branch]
    rail_conductors: list[Branch]  # fuses and breakers between rail nets
    regular: bool  # False: a closed path joins two rails (fall back to one solve)
    memo: dict[tuple, object] = field(default_factory=dict)
    solves: int = 0  # network solves made for this domain (a test reads them)
    largest: int = 0  # unknowns of the largest one

    def end(self, net: str) -> str:
        """The node a net is in the cut network: its rail, or itself."""
        return self.rail.get(net, net)

    def block_ports(self, index: int) -> list[str]:
        """The rails (reference left out) a block touches, in first-seen order."""
        key = ("ports", index)
        if key not in self.memo:
            self.memo[key] = self._ports(index)
        return self.memo[key]  # type: ignore[return-value]

    def _ports(self, index: int) -> list[str]:
        seen: dict[str, None] = {}
        for branch in self.members[index]:
            for net in (branch.a, branch.b):
                node = self.rail.get(net)
                if node is not None and node != self.ground:
                    seen.setdefault(node)
        return list(seen)

    def count(self, net: Net) -> None:
        """Record one solve of ``net``."""
        self.solves += 1
        self.largest = max(self.largest, len(net.nodes) + len(net.sources))


def _rails(state: DomainState) -> dict[str, str]:
    supplies = [b for b in state.domain.branches if b.role == SUPPLY]
    terminals = {state.wire[n] for b in supplies for n in (b.a, b.b)}
    return {n: w for n, w in state.wire.items() if w in terminals}


def blocks_of(state: DomainState) -> Blocks:
    """The domain's blocks, computed once per state."""
    cached = state.cache.get("closing-blocks")
    if cached is None:
        cached = state.cache["closing-blocks"] = _cut(state)
    return cached  # type: ignore[no-any-return]


def _cut(state: DomainState) -> Blocks:
    rail = _rails(state)
    ground = rail.get(state.supplies[0].b, state.supplies[0].b)
    inner = UnionFind()
    loose: list[Branch] = []
    for branch in state.domain.branches:
        if branch.role == SUPPLY or (branch.role == CONDUCTOR and branch.a in rail):
            continue
        ends = [n for n in (branch.a, branch.b) if n not in rail]
        if not ends:
            loose.append(branch)  # both ends on rails: a block of its own
            continue
        inner.union(ends[0], ends[-1])
    index: dict[str, int] = {}
    members: list[list[Branch]] = []
    block_of: dict[str, int] = {}
    for branch in state.domain.branches:
        if branch.role == SUPPLY or (branch.role == CONDUCTOR and branch.a in rail):
            continue
        ends = [n for n in (branch.a, branch.b) if n not in rail]
        if ends:
            root = inner.find(ends[0])
            if root not in index:
                index[root] = len(members)
                members.append([])
            block = index[root]
        else:
            block = len(members)
            members.append([])
        members[block].append(branch)
        block_of[branch.key] = block
    ports = sorted({r for r in rail.values() if r != ground})
    blocks = Blocks(
        state,
        rail,
        ground,
        ports,
        members,
        block_of,
        [b for b in state.domain.branches if b.role == SUPPLY],
        [b for b in state.domain.branches if b.role == CONDUCTOR and b.a in rail],
        True,
    )
    blocks.regular = _regular(blocks)
    return blocks


def _regular(blocks: Blocks) -> bool:
    """No closed contact or fuse joins two rails (or a rail and the reference)."""
    state = blocks.state
    rails = set(blocks.rail.values())
    for members in blocks.members:
        joined = UnionFind()
        for branch in members:
            if branch.role == CONDUCTOR or (
                branch.role == SWITCH and branch.key not in state.opened
            ):
                joined.union(blocks.end(branch.a), blocks.end(branch.b))
        rails_in: dict[str, str] = {}
        for node in {blocks.end(n) for b in members for n in (b.a, b.b)}:
            if node in rails:
                root = joined.find(node)
                if rails_in.setdefault(root, node) != node:
                    return False
    return True
