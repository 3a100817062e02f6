"""Solving the cut closing network: block multiports and per-closing solves.

A *configuration* says how the blocks not being solved in full stand: ``base``
"state" (their switching elements as in the solved state) or "open" (all
open, as at power-up), capacitors open or held as sources, loads in or out.
Each block's multiport in a configuration is computed once (one least-squares
solve with one right-hand side per rail port) and the domain's sum once; a
closing subtracts its own blocks' share and adds them back in full.

Held capacitors of the other blocks (the peak solve) hold the voltages their
block had just before, with loads out: a block's port currents are then
Y·V + K·V_before, K = T·S (T: port current per held volt, S: capacitor volt
per rail volt, both from the block's solves), again summed once per domain.
"""

from __future__ import annotations

import numpy as np

from netcheck.analysis.closing_net import R_IDEAL, R_LEAK, Blocks, Net, add_branch
from netcheck.graph import SWITCH, Branch

__all__ = [
    "Config",
    "capacitors",
    "closed_switches",
    "rest_sensitivity",
    "rest_step",
    "solve_cut",
    "rest_hold",
    "block_caps",
]

Config = tuple[str, bool, bool]  # base, capacitors held, loads in


def capacitors(blocks: Blocks) -> list[Branch]:
    """The capacitors (with a C) of the domain, in its order."""
    if "caps" not in blocks.memo:
        blocks.memo["caps"] = [
            b
            for b in blocks.state.domain.branches
            if b.kind in ("capacitor", "rc") and b.component.value("C") is not None
        ]
    return blocks.memo["caps"]  # type: ignore[return-value]


def closed_switches(blocks: Blocks) -> frozenset[str]:
    """The switching elements closed in the solved state."""
    if "shut" not in blocks.memo:
        state = blocks.state
        blocks.memo["shut"] = frozenset(
            b.key
            for b in state.domain.branches
            if b.role == SWITCH and b.key not in state.opened
        )
    return blocks.memo["shut"]  # type: ignore[return-value]


def _base_closed(blocks: Blocks, base: str) -> frozenset[str]:
    return closed_switches(blocks) if base == "state" else frozenset()


def _block_net(
    blocks: Blocks,
    index: int,
    shut: frozenset[str],
    held: dict[str, float] | None,
    loads: bool,
) -> Net:
    net = Net(blocks.ground)
    for branch in blocks.members[index]:
        ends = (blocks.end(branch.a), blocks.end(branch.b))
        add_branch(net, blocks.state, branch, ends, branch.key in shut, held, loads)
    return net


def _port_solve(
    blocks: Blocks, index: int, config: Config, cap_volts: np.ndarray | None = None
) -> tuple[Net, np.ndarray, list[str]]:
    """The block solved with each port at 1 V in turn, one column each.

    With ``cap_volts``: ports at 0 and the capacitors at each of its columns.
    """
    base, held, loads = config
    ports = blocks.block_ports(index)
    shut = _base_closed(blocks, base)
    net = _block_net(blocks, index, shut, {} if held else None, loads)
    first = len(net.sources)
    for port in ports:
        net.source(port, blocks.ground, 0.0, f"port:{port}")
    matrix, _ = net.system()
    n = len(net.nodes)
    columns = np.zeros((matrix.shape[0], len(ports)))
    if cap_volts is None:
        for q in range(len(ports)):
            columns[n + first + q, q] = 1.0
    else:
        for k, source in enumerate(net.sources[:first]):
            row = _cap_row(blocks, index, source[3])
            if row is not None and source[0].endswith(":c"):
                columns[n + k, :] = cap_volts[row, :]
    blocks.count(net)
    solution = np.linalg.lstsq(matrix, columns, rcond=None)[0]
    return net, solution.reshape(matrix.shape[0], len(ports)), ports


def block_caps(blocks: Blocks, index: int) -> list[Branch]:
    """The capacitors (with a C) of one block, in the domain's order."""
    if "block-caps" not in blocks.memo:
        by_block: dict[int, list[Branch]] = {}
        for cap in capacitors(blocks):
            by_block.setdefault(blocks.block_of[cap.key], []).append(cap)
        blocks.memo["block-caps"] = by_block
    return blocks.memo["block-caps"].get(index, [])  # type: ignore[attr-defined]


def _cap_row(blocks: Blocks, index: int, key: str) -> int | None:
    for row, cap in enumerate(block_caps(blocks, index)):
        if cap.key == key:
            return row
    return None


def multiport(blocks: Blocks, index: int, config: Config) -> np.ndarray:
    """The block's Y (A per V) over its ports in ``config``."""
    key = ("Y", index, config)
    if key not in blocks.memo:
        if not blocks.block_ports(index):
            blocks.memo[key] = np.zeros((0, 0))
        else:
            net, solution, ports = _port_solve(blocks, index, config)
            n, first = len(net.nodes), len(net.sources) - len(ports)
            blocks.memo[key] = -solution[n + first :, :]
    return blocks.memo[key]  # type: ignore[return-value]


def sensitivity(blocks: Blocks, index: int, base: str) -> np.ndarray:
    """Capacitor voltages per rail volt (caps open, loads out): S, caps x ports."""
    key = ("S", index, base)
    if key not in blocks.memo:
        caps, ports = block_caps(blocks, index), blocks.block_ports(index)
        s = np.zeros((len(caps), len(ports)))
        if caps and ports:
            net, solution, _ = _port_solve(blocks, index, (base, False, False))
            for row, cap in enumerate(caps):
                for end, sign in ((cap.a, 1.0), (cap.b, -1.0)):
                    i = net.nodes.get(blocks.end(end))
                    if i is not None:
                        s[row, :] += sign * solution[i, :]
        blocks.memo[key] = s
    return blocks.memo[key]  # type: ignore[return-value]


def _hold_matrix(blocks: Blocks, index: int, base: str) -> np.ndarray:
    """K: port currents (loads in) per rail volt of the moment before."""
    key = ("K", index, base)
    if key not in blocks.memo:
        s, ports = sensitivity(blocks, index, base), blocks.block_ports(index)
        k = np.zeros((len(ports), len(ports)))
        if s.size and np.any(s):
            net, solution, _ = _port_solve(blocks, index, (base, True, True), s)
            n, first = len(net.nodes), len(net.sources) - len(ports)
            k = -solution[n + first :, :]
        blocks.memo[key] = k
    return blocks.memo[key]  # type: ignore[return-value]


def _scatter(
    blocks: Blocks, index: int, local: np.ndarray, into: np.ndarray, sign: float
) -> None:
    at = _at(blocks, index)
    for i, row in enumerate(at):
        for j, column in enumerate(at):
            into[row, column] += sign * local[i, j]


def _at(blocks: Blocks, index: int) -> list[int]:
    key = ("at", index)
    if key not in blocks.memo:
        where = _port_index(blocks)
        blocks.memo[key] = [where[p] for p in blocks.block_ports(index)]
    return blocks.memo[key]  # type: ignore[return-value]


def _port_index(blocks: Blocks) -> dict[str, int]:
    if "port-index" not in blocks.memo:
        blocks.memo["port-index"] = {p: i for i, p in enumerate(blocks.ports)}
    return blocks.memo["port-index"]  # type: ignore[return-value]


def _total(blocks: Blocks, kind: str, config: Config) -> np.ndarray:
    key = ("total", kind, config)
    if key not in blocks.memo:
        size = len(blocks.ports)
        total = np.zeros((size, size))
        for index in range(len(blocks.members)):
            local = (
                multiport(blocks, index, config)
                if kind == "Y"
                else _hold_matrix(blocks, index, config[0])
            )
            _scatter(blocks, index, local, total, 1.0)
        blocks.memo[key] = total
    return blocks.memo[key]  # type: ignore[return-value]


def _rest(
    blocks: Blocks, kind: str, config: Config, explicit: frozenset[int]
) -> np.ndarray:
    rest = _total(blocks, kind, config).copy()
    for index in explicit:
        local = (
            multiport(blocks, index, config)
            if kind == "Y"
            else _hold_matrix(blocks, index, config[0])
        )
        _scatter(blocks, index, local, rest, -1.0)
    return rest


def rest_hold(
    blocks: Blocks, base: str, explicit: frozenset[int], before: np.ndarray
) -> np.ndarray:
    """The currents the other blocks' held capacitors draw from the rails (A)."""
    return _rest(blocks, "K", (base, True, True), explicit) @ before


def rest_sensitivity(blocks: Blocks, base: str) -> float:
    """The largest capacitor volts per rail volt in the domain (a bound, caps open)."""
    key = ("S-bound", base)
    if key not in blocks.memo:
        bound = 0.0
        for index in range(len(blocks.members)):
            s = sensitivity(blocks, index, base)
            if s.size:
                bound = max(bound, float(np.abs(s).sum(axis=1).max()))
        blocks.memo[key] = bound
    return blocks.memo[key]  # type: ignore[return-value]


def rest_step(blocks: Blocks, cap: Branch, base: str, change: np.ndarray) -> float:
    """A capacitor's voltage change (V) when the rails move by ``change``."""
    index = blocks.block_of[cap.key]
    s = sensitivity(blocks, index, base)
    if not s.size:
        return 0.0
    at = _at(blocks, index)
    row = next(i for i, c in enumerate(block_caps(blocks, index)) if c is cap)
    return float(s[row, :] @ change[at])


def solve_cut(
    blocks: Blocks,
    explicit: frozenset[int],
    shut: frozenset[str],
    held: dict[str, float] | None,
    loads: bool,
    base: str,
    draw: np.ndarray | None = None,
) -> tuple[dict[str, float], dict[str, float]]:
    """The network with ``explicit`` blocks in full, the others as multiports.

    ``draw``: currents (A) the other blocks draw from the rails besides Y·V.
    """
    net = Net(blocks.ground)
    for branch in [*blocks.supplies, *blocks.rail_conductors]:
        net.resistor(blocks.end(branch.a), net.ground, R_LEAK)
    state = blocks.state
    for supply in blocks.supplies:
        emf = f"{supply.ref}:emf"
        plus, minus = blocks.end(supply.a), blocks.end(supply.b)
        net.source(emf, minus, state.emf[supply.ref], supply.key)
        net.resistor(emf, plus, state.r_int[supply.ref] or R_IDEAL)
    for port in blocks.ports:
        net.node(port)
    for index in explicit:
        for branch in blocks.members[index]:
            ends = (blocks.end(branch.a), blocks.end(branch.b))
            add_branch(net, state, branch, ends, branch.key in shut, held, loads)
    rest = _rest(blocks, "Y", (base, held is not None, loads), explicit)
    net.stamp(list(blocks.ports), rest)
    if draw is not None:
        net.injections = {p: -float(draw[i]) for i, p in enumerate(blocks.ports)}
    blocks.count(net)
    return net.solve()
