"""A small DC operating-point solver: nodal analysis with ideal-diode states.

Floats in SI units throughout (volts, amperes, ohms): this is the numerical
kernel; callers convert to and from quantities.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

__all__ = ["Resistor", "Diode", "Solution", "solve_dc", "R_ON", "G_MIN"]

# A forward-biased diode is modelled as its forward drop in series with R_ON;
# G_MIN from every floating node (no conducting path to a fixed one) to the
# reference keeps it solvable (the usual SPICE device for the same problem).
# Both are modelling assumptions.
R_ON = 1e-3
G_MIN = 1e-12
_MAX_ITERATIONS = 50


@dataclass(frozen=True)
class Resistor:
    """A linear branch between nodes ``a`` and ``b`` (current counted a -> b)."""

    key: str
    a: str
    b: str
    resistance: float


@dataclass(frozen=True)
class Diode:
    """An ideal diode with forward drop ``vf`` (anode ``a``, cathode ``b``).

    ``vz`` is a reverse breakdown (zener) voltage, or None for a plain diode.
    """

    key: str
    a: str
    b: str
    vf: float
    vz: float | None = None


@dataclass(frozen=True)
class Solution:
    """Node potentials, branch currents (a -> b) and the diode states found."""

    potentials: Mapping[str, float]
    currents: Mapping[str, float]
    diode_state: Mapping[str, str]  # "off", "forward" or "reverse"


def _diode_current(d: Diode, state: str, va: float, vb: float) -> float:
    if state == "forward":
        return (va - vb - d.vf) / R_ON
    if state == "reverse" and d.vz is not None:
        return (va - vb + d.vz) / R_ON
    return 0.0


def _stamp(
    matrix: list[list[float]],
    rhs: list[float],
    index: Mapping[str, int],
    fixed: Mapping[str, float],
    a: str,
    b: str,
    g: float,
    offset: float,
) -> None:
    """Stamp a branch with current g*(Va - Vb - offset) from a to b."""
    ia, ib = index.get(a), index.get(b)
    for _node, sign, i in ((a, 1.0, ia), (b, -1.0, ib)):
        if i is None:
            continue
        rhs[i] += sign * g * offset
        for other, osign, j in ((a, 1.0, ia), (b, -1.0, ib)):
            if j is None:
                rhs[i] -= sign * osign * g * fixed[other]
            else:
                matrix[i][j] += sign * osign * g


def _linear_solve(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    resistors: Sequence[Resistor],
    diodes: Sequence[Diode],
    states: Mapping[str, str],
) -> dict[str, float]:
    # The equations are stamped in Python floats (the same IEEE operations in
    # the same order as into numpy arrays, a fraction of the cost per entry).
    index = {n: i for i, n in enumerate(nodes)}
    size = len(nodes)
    matrix = [[0.0] * size for _ in range(size)]
    for node in _floating(nodes, fixed, resistors, diodes, states):
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


def _floating(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    resistors: Sequence[Resistor],
    diodes: Sequence[Diode],
    states: Mapping[str, str],
) -> set[str]:
    """Nodes with no conducting path to a fixed node: only these get G_MIN.

    A node tied to a rail through a resistor has a defined potential; a G_MIN
    leak there would shift it by V·R·G_MIN (1 kV through 80 ohm read
    999.99999992 V), so the leak goes only where it is needed.
    """
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


def _solve(matrix: list[list[float]], rhs: list[float]) -> Sequence[float]:
    """Solve the nodal equations; least squares where they are ill-conditioned.

    Conductances spanning twenty decades (a micro-ohm in series with a
    tera-ohm) can make the matrix numerically singular; the least-squares
    solution is then the physically meaningful one.

    One unknown (nearly every solve: a rung cut off at one node) is one
    division, which is what LAPACK's LU solve computes for a 1x1 system, bit
    for bit (``tests/analysis/test_circuit_solve.py``); numpy's call costs a
    hundred times that.
    """
    if len(rhs) == 1 and matrix[0][0] != 0.0:
        value = rhs[0] / matrix[0][0]
        if math.isfinite(value):
            return [value]
    return _solve_dense(np.array(matrix), np.array(rhs))


def _solve_dense(matrix: np.ndarray, rhs: np.ndarray) -> np.ndarray:
    try:
        values = np.linalg.solve(matrix, rhs)
        if np.all(np.isfinite(values)):
            return values
    except np.linalg.LinAlgError:
        pass
    return np.linalg.lstsq(matrix, rhs, rcond=None)[0]


def _next_state(d: Diode, state: str, va: float, vb: float) -> str:
    if state == "forward":
        return "forward" if _diode_current(d, state, va, vb) > 0 else "off"
    if state == "reverse":
        return "reverse" if _diode_current(d, state, va, vb) < 0 else "off"
    if va - vb > d.vf:
        return "forward"
    if d.vz is not None and vb - va > d.vz:
        return "reverse"
    return "off"


def solve_dc(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    resistors: Sequence[Resistor],
    diodes: Sequence[Diode] = (),
) -> Solution:
    """Solve the DC operating point; ``fixed`` nodes have given potentials.

    Diode states are found by iteration from all-off, one state change at a
    time (the diode most over its threshold first), which converges for the
    monotone networks of control circuits.
    """
    unknown = [n for n in nodes if n not in fixed]
    states = {d.key: "off" for d in diodes}
    for _ in range(_MAX_ITERATIONS + len(diodes)):
        potentials = _linear_solve(unknown, fixed, resistors, diodes, states)
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
        currents[d.key] = _diode_current(
            d, states[d.key], potentials[d.a], potentials[d.b]
        )
    return Solution(potentials, currents, states)
