"""The nodal solver's fast paths give what the plain code gives, bit for bit.

``solve_dc`` stamps its resistors through a precomputed ``_System`` and
remembers solutions by circuit (``_circuit_key``: names by position); here it
is compared with the straightforward stamping (``_reference_solve``, the
solver as first written, kept in this file) on every circuit the analysis
solves for the rule cases and samples, and on random networks with diodes,
each solved fresh, from the memo, and under other names.
"""

from __future__ import annotations

import random
from collections.abc import Mapping, Sequence
from pathlib import Path

import numpy as np
import pytest

from netcheck.analysis import circuit, cut_solve, domain
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


def _logged_calls(monkeypatch: pytest.MonkeyPatch) -> list[tuple]:
    calls: list[tuple] = []

    def logging_solve(nodes, fixed, resistors, diodes=()):  # type: ignore[no-untyped-def]
        calls.append((list(nodes), dict(fixed), list(resistors), list(diodes)))
        return solve_dc(nodes, fixed, resistors, diodes)

    monkeypatch.setattr(domain, "solve_dc", logging_solve)
    monkeypatch.setattr(cut_solve, "solve_dc", logging_solve)
    for path in DESIGNS:
        try:
            netlist = load_design(path, display_base=path.parent)
        except Exception:  # noqa: BLE001 - a case of bad input has no circuit
            continue
        analyse(build_graph(netlist))
    return calls


def _renamed(nodes, fixed, resistors, diodes, tag: str) -> tuple:
    """The same circuit with every node and key renamed (order kept)."""
    name = {n: f"{n}{tag}" for n in nodes}
    name.update({n: f"{n}{tag}" for n in fixed})
    return (
        [name[n] for n in nodes],
        {name[n]: v for n, v in fixed.items()},
        [
            Resistor(r.key + tag, name.get(r.a, r.a), name.get(r.b, r.b), r.resistance)
            for r in resistors
        ],
        [
            Diode(d.key + tag, name.get(d.a, d.a), name.get(d.b, d.b), d.vf, d.vz)
            for d in diodes
        ],
    )


def _check_all_paths(nodes, fixed, resistors, diodes) -> None:
    reference = _reference_solve(nodes, fixed, resistors, diodes)
    circuit._SOLVED.clear()
    _same(solve_dc(nodes, fixed, resistors, diodes), reference)  # fresh
    _same(solve_dc(nodes, fixed, resistors, diodes), reference)  # remembered
    other = _renamed(nodes, fixed, resistors, diodes, "~2")
    _same(solve_dc(*other), _reference_solve(*other))  # remembered, renamed


def test_every_circuit_of_the_cases_solves_as_the_plain_stamping_does(monkeypatch):
    calls = _logged_calls(monkeypatch)
    assert len(calls) > 200  # the cases do reach the solver
    assert any(diodes for *_rest, diodes in calls)
    for nodes, fixed, resistors, diodes in calls:
        _check_all_paths(nodes, fixed, resistors, diodes)


def test_the_memo_is_hit_by_repeated_rungs():
    circuit._SOLVED.clear()
    for tag in ("1", "2", "3"):
        solve_dc(
            *_renamed(
                ["X", "P", "M"],
                {"P": 24.0, "M": 0.0},
                [Resistor("R", "P", "X", 48.0), Resistor("Y", "X", "M", 480.0)],
                [],
                tag,
            )
        )
    assert len(circuit._SOLVED) == 1


def test_a_rail_at_minus_zero_is_another_circuit():
    # 0.0 == -0.0, but the potentials copied from ``fixed`` keep their sign.
    circuit._SOLVED.clear()
    args = (["X", "P", "M"], [Resistor("R", "P", "X", 48.0)])
    plus = solve_dc(args[0], {"P": 24.0, "M": 0.0}, args[1])
    minus = solve_dc(args[0], {"P": 24.0, "M": -0.0}, args[1])
    assert repr(plus.potentials["M"]) == "0.0" and repr(minus.potentials["M"]) == "-0.0"
    assert len(circuit._SOLVED) == 2


def test_diode_ties_follow_the_key_order():
    # Two equal diodes across one source: the first state change taken is the
    # later key (the sort is reversed); renaming that swaps the order of the
    # keys must not take the remembered choice.
    nodes, fixed = ["P", "M"], {"P": 24.0, "M": 0.0}
    first = [Diode("Da", "P", "M", 0.7, None), Diode("Db", "P", "M", 0.7, None)]
    swapped = [Diode("Db", "P", "M", 0.7, None), Diode("Da", "P", "M", 0.7, None)]
    circuit._SOLVED.clear()
    for diodes in (first, swapped, first):
        _same(
            solve_dc(nodes, fixed, [], diodes),
            _reference_solve(nodes, fixed, [], diodes),
        )
    assert len(circuit._SOLVED) == 2


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
        _check_all_paths(*_random_network(rng))


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
