"""The making current of one element, solved on the domain cut at its rails.

The same model and the same two closings as ``making.py`` (read its
docstring), each solve made on the element's own blocks with every other
block as its multiport (``closing_ports.py``), so a closing costs the size of
its rung, not of the domain. Capacitors of the other blocks can only move with
the rails; they are looked at one by one only where a bound on that movement
(their largest volts per rail volt times the rails' change) could reach the
step threshold.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from netcheck.analysis.closing_net import Blocks
from netcheck.analysis.closing_ports import (
    block_caps,
    capacitors,
    closed_switches,
    rest_hold,
    rest_sensitivity,
    rest_step,
    sensitivity,
    solve_cut,
)
from netcheck.analysis.making import UNBOUNDED_LOOP, Charge, Inrush
from netcheck.analysis.switched import ElementAnalysis
from netcheck.graph import Branch

__all__ = ["cut_inrush"]


@dataclass(frozen=True)
class _Scenario:
    shut: frozenset[str]  # switches closed once the element has closed
    base: str  # how the other blocks stand: "state" or "open"
    explicit: frozenset[int]  # the blocks solved in full
    before: dict[str, float]  # potentials just before (caps open, loads out)
    after: dict[str, float]  # and once settled


def _rails(blocks: Blocks, potentials: dict[str, float]) -> np.ndarray:
    return np.array([potentials.get(p, 0.0) for p in blocks.ports])


def _voltage(blocks: Blocks, sc: _Scenario, cap: Branch, after: bool) -> float:
    potentials = sc.after if after else sc.before
    if blocks.block_of[cap.key] in sc.explicit:
        a, b = blocks.end(cap.a), blocks.end(cap.b)
        return potentials.get(a, 0.0) - potentials.get(b, 0.0)
    index = blocks.block_of[cap.key]
    s = sensitivity(blocks, index, sc.base)
    if not s.size:
        return 0.0
    return rest_step(blocks, cap, sc.base, _rails(blocks, potentials))


def _scenario(
    blocks: Blocks, shut: frozenset[str], name: str, base: str, explicit: frozenset
) -> _Scenario:
    before = solve_cut(blocks, explicit, shut - {name}, None, False, base)[0]
    after = solve_cut(blocks, explicit, shut, None, False, base)[0]
    return _Scenario(shut, base, explicit, before, after)


def _loop(
    blocks: Blocks, sc: _Scenario, key: str, shut: frozenset[str]
) -> float | None:
    """The Thevenin resistance a capacitor sees (ohm): 1 V more, how much current."""
    explicit = sc.explicit | {blocks.block_of[key]}
    first = solve_cut(blocks, explicit, shut, {}, False, sc.base)[1].get(key, 0.0)
    second = solve_cut(blocks, explicit, shut, {key: 1.0}, False, sc.base)[1]
    change = abs(second.get(key, 0.0) - first)
    loop = 1.0 / change if change > 0 else None
    return loop if loop is not None and loop >= UNBOUNDED_LOOP else None


def _stepping(blocks: Blocks, sc: _Scenario, threshold: float) -> list[Branch]:
    """The capacitors that may change voltage.

    The explicit blocks' ones, and the others' where the rails' movement
    could reach ``threshold``.
    """
    change = _rails(blocks, sc.after) - _rails(blocks, sc.before)
    moved = float(np.abs(change).max()) if change.size else 0.0
    wide = moved * rest_sensitivity(blocks, sc.base) >= 0.5 * threshold
    if wide:
        return capacitors(blocks)
    inside = {c.key for index in sc.explicit for c in block_caps(blocks, index)}
    return [c for c in capacitors(blocks) if c.key in inside] if inside else []


def _charges(blocks: Blocks, sc: _Scenario) -> list[Charge]:
    state = blocks.state
    scale = max((abs(v) for v in state.emf.values()), default=1.0)
    threshold = 1e-3 * max(scale, 1.0)
    out = []
    for cap in _stepping(blocks, sc, threshold):
        step = _voltage(blocks, sc, cap, True) - _voltage(blocks, sc, cap, False)
        if abs(step) < threshold:
            continue  # unchanged (the leak resistors leave millivolts)
        loop = _loop(blocks, sc, cap.key, sc.shut)
        capacitance = float(cap.component.value("C").to("F").magnitude)
        out.append(Charge(cap.ref, capacitance, step, loop))
    return out


def _first_branch(blocks: Blocks, ref: str) -> Branch:
    if "by-ref" not in blocks.memo:
        first: dict[str, Branch] = {}
        for branch in blocks.state.domain.branches:
            first.setdefault(branch.ref, branch)
        blocks.memo["by-ref"] = first
    return blocks.memo["by-ref"][ref]  # type: ignore[index]


def _precharged(blocks: Blocks, usual: _Scenario, own: list[Charge], name: str) -> bool:
    """Whether a slower path (higher loop resistance) charges what ``name`` would."""
    opened = usual.shut - {name}
    for charge in own:
        cap = _first_branch(blocks, charge.ref)
        full = _voltage(blocks, usual, cap, True)
        if abs(full - _voltage(blocks, usual, cap, False)) > 0.05 * max(abs(full), 1.0):
            return False
        slow = _loop(blocks, usual, cap.key, opened)
        if slow is None or (charge.loop is not None and slow <= charge.loop):
            return False
    return True


def _peak(blocks: Blocks, sc: _Scenario, name: str) -> float:
    held = {
        c.key: _voltage(blocks, sc, c, False)
        for index in sc.explicit
        for c in block_caps(blocks, index)
    }
    draw = rest_hold(blocks, sc.base, sc.explicit, _rails(blocks, sc.before))
    currents = solve_cut(blocks, sc.explicit, sc.shut, held, True, sc.base, draw)[1]
    return abs(currents.get(name, 0.0))


def cut_inrush(blocks: Blocks, element: ElementAnalysis) -> Inrush:
    """``making.closing_inrush`` for a domain cut into blocks (same results)."""
    name = element.name
    shut = closed_switches(blocks)
    own_block = frozenset({blocks.block_of[name]})
    closed = solve_cut(blocks, own_block, shut, None, True, "state")[1]
    steady = abs(closed.get(name, 0.0))
    if not capacitors(blocks):
        # Nothing to charge: the closing draws what the closed circuit draws
        # (the peak network is then the closed-state one itself).
        return Inrush(steady, steady, ())
    series = {name, *element.series_elements, *element.other_series}
    usual = _scenario(blocks, shut, name, "state", own_block)
    first = frozenset(s for s in series if s in shut)
    path = own_block | {blocks.block_of[s] for s in first}
    power_up = _scenario(blocks, first, name, "open", path)
    own = _charges(blocks, power_up)
    chosen = usual if not own or _precharged(blocks, usual, own, name) else power_up
    charges = own if chosen is power_up else _charges(blocks, usual)
    if any(c.loop is None for c in charges):
        return Inrush(None, steady, tuple(charges))
    return Inrush(_peak(blocks, chosen, name), steady, tuple(charges))
