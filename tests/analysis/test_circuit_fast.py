"""The analysis's fast paths give what the plain code gives, bit for bit.

``solve_dc`` stamps its resistors through a precomputed ``_System``; here it
is compared with the straightforward stamping (``_reference_solve``, the
solver as first written, kept in this file) on every circuit the analysis
solves for the rule cases and samples, and on random networks with diodes.
"""

from __future__ import annotations

import random
from collections.abc import Mapping, Sequence
from pathlib import Path

import numpy as np
import pytest

from netcheck.analysis import circuit, domain, switched
from netcheck.analysis.circuit import (
    G_MIN,
    R_ON,
    Diode,
    Resistor,
    Solution,
    _next_state,
    _solve,
    _stamp,
    solve_dc,
)
from netcheck.analysis.elements import analyse
from netcheck.graph import build_graph
from netcheck.input import load_design

ROOT = Path(__file__).resolve().parents[2]
DESIGNS = sorted((ROOT / "tests" / "cases").glob("*/*.cnet")) + sorted(
    (ROOT / "sample_nets").glob("*/*.cnet")
)


def _reference_floating(nodes, fixed, resistors, diodes, states) -> set[str]:
    links: dict[str, list[str]] = {n: [] for n in nodes}
    conducting = [(r.a, r.b) for r in resistors] + [
        (d.a, d.b)
        for d in diodes
        if states[d.key] == "forward"
        or (states[d.key] == "reverse" and d.vz is not None)
    ]
    for a, b in conducting:
        links.setdefault(a, []).append(b)
        links.setdefault(b, []).append(a)
    reached = {n for n in fixed if n in links}
    todo = list(reached)
    while todo:
        for other in links[todo.pop()]:
            if other not in reached:
                reached.add(other)
                todo.append(other)
    return {n for n in nodes if n not in reached}


def _reference_linear(nodes, fixed, resistors, diodes, states) -> dict[str, float]:
    index = {n: i for i, n in enumerate(nodes)}
    size = len(nodes)
    matrix = [[0.0] * size for _ in range(size)]
    for node in _reference_floating(nodes, fixed, resistors, diodes, states):
        matrix[index[node]][index[node]] = G_MIN
    rhs = [0.0] * size
    for r in resistors:
        _stamp(matrix, rhs, index, fixed, r.a, r.b, 1.0 / r.resistance, 0.0)
    for d in diodes:
        state = states[d.key]
        if state == "forward":
            _stamp(matrix, rhs, index, fixed, d.a, d.b, 1.0 / R_ON, d.vf)
        elif state == "reverse" and d.vz is not None:
            _stamp(matrix, rhs, index, fixed, d.a, d.b, 1.0 / R_ON, -d.vz)
    values = _solve(matrix, rhs) if size else []
    potentials = dict(fixed)
    potentials.update({n: float(values[i]) for n, i in index.items()})
    return potentials


def _reference_solve(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    resistors: Sequence[Resistor],
    diodes: Sequence[Diode] = (),
) -> Solution:
    unknown = [n for n in nodes if n not in fixed]
    states = {d.key: "off" for d in diodes}
    for _ in range(circuit._MAX_ITERATIONS + len(diodes)):
        potentials = _reference_linear(unknown, fixed, resistors, diodes, states)
        changes = []
        for d in diodes:
            va, vb = potentials[d.a], potentials[d.b]
            new = _next_state(d, states[d.key], va, vb)
            if new != states[d.key]:
                excess = abs(va - vb) - (d.vf if new == "forward" else 0.0)
                changes.append((excess, d.key, new))
        if not changes:
            break
        changes.sort(reverse=True)
        _, key, new = changes[0]
        states[key] = new
    currents = {
        r.key: (potentials[r.a] - potentials[r.b]) / r.resistance for r in resistors
    }
    for d in diodes:
        currents[d.key] = circuit._diode_current(
            d, states[d.key], potentials[d.a], potentials[d.b]
        )
    return Solution(potentials, currents, states)


def _same(ours: Solution, theirs: Solution) -> None:
    # repr tells 0.0 from -0.0 and keeps every bit of a float.
    assert repr(dict(ours.potentials)) == repr(dict(theirs.potentials))
    assert repr(dict(ours.currents)) == repr(dict(theirs.currents))
    assert dict(ours.diode_state) == dict(theirs.diode_state)


def _recorded_calls(monkeypatch: pytest.MonkeyPatch) -> list[tuple]:
    calls: list[tuple] = []

    def recording(nodes, fixed, resistors, diodes=()):  # type: ignore[no-untyped-def]
        calls.append((list(nodes), dict(fixed), list(resistors), list(diodes)))
        return solve_dc(nodes, fixed, resistors, diodes)

    monkeypatch.setattr(domain, "solve_dc", recording)
    monkeypatch.setattr(switched, "solve_dc", recording)
    for path in DESIGNS:
        try:
            netlist = load_design(path, display_base=path.parent)
        except Exception:  # noqa: BLE001 - a case of bad input has no circuit
            continue
        analyse(build_graph(netlist))
    return calls


def test_every_circuit_of_the_cases_solves_as_the_plain_stamping_does(monkeypatch):
    calls = _recorded_calls(monkeypatch)
    assert len(calls) > 200  # the cases do reach the solver
    assert any(diodes for *_rest, diodes in calls)
    for nodes, fixed, resistors, diodes in calls:
        _same(
            solve_dc(nodes, fixed, resistors, diodes),
            _reference_solve(nodes, fixed, resistors, diodes),
        )


def _random_network(rng: random.Random) -> tuple:
    count = rng.randint(1, 7)
    nodes = [f"n{i}" for i in range(count)] + ["P", "M"]
    rng.shuffle(nodes)
    fixed = {"P": rng.choice([24.0, 110.0, 0.5]), "M": rng.choice([0.0, -0.0, 1.5])}
    resistors = [
        Resistor(
            f"R{i}",
            rng.choice(nodes),
            rng.choice(nodes),
            10 ** rng.uniform(-6, 12),
        )
        for i in range(rng.randint(0, 9))
    ]
    diodes = [
        Diode(
            f"D{i}",
            rng.choice(nodes),
            rng.choice(nodes),
            rng.choice([0.0, 0.7, 1.1]),
            rng.choice([None, 5.1, 33.0]),
        )
        for i in range(rng.randint(0, 4))
    ]
    return nodes, fixed, resistors, diodes


def test_random_networks_solve_as_the_plain_stamping_does():
    rng = random.Random(5)  # fixed seed: the same networks every run
    for _ in range(3000):
        nodes, fixed, resistors, diodes = _random_network(rng)
        _same(
            solve_dc(nodes, fixed, resistors, diodes),
            _reference_solve(nodes, fixed, resistors, diodes),
        )


def test_an_infinite_conductance_takes_the_plain_stamping():
    # 1e-310 ohm is subnormal: 1/R overflows to inf and inf * 0 is NaN.
    args = (
        ["P", "X", "M"],
        {"P": 24.0, "M": 0.0},
        [Resistor("R1", "P", "X", 1e-310), Resistor("R2", "X", "M", 10.0)],
    )
    assert not circuit._System(["X"], args[1], args[2]).finite
    # The NaN equations defeat numpy's least squares on either path alike.
    with pytest.raises(np.linalg.LinAlgError):
        _reference_solve(*args)
    with pytest.raises(np.linalg.LinAlgError):
        solve_dc(*args)


def test_ohms_law_still_holds_on_the_fast_path():
    # 24 V over 100 ohm + 20 ohm: 0.2 A, 4 V across 20 ohm (Ohm's law).
    solution = solve_dc(
        ["P", "X", "M"],
        {"P": 24.0, "M": 0.0},
        [Resistor("R1", "P", "X", 100.0), Resistor("R2", "X", "M", 20.0)],
    )
    assert solution.potentials["X"] == pytest.approx(4.0)
    assert solution.currents["R1"] == pytest.approx(0.2)
