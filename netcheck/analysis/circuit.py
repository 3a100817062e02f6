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

    def __init__(self, key: str, a: str, b: str, resistance: float) -> None:
        # Made per branch per solve: straight into ``__dict__`` (model.py's way).
        fields = self.__dict__
        fields["key"] = key
        fields["a"] = a
        fields["b"] = b
        fields["resistance"] = resistance


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

    def __init__(
        self, key: str, a: str, b: str, vf: float, vz: float | None = None
    ) -> None:
        fields = self.__dict__
        fields["key"] = key
        fields["a"] = a
        fields["b"] = b
        fields["vf"] = vf
        fields["vz"] = vz


@dataclass(frozen=True)
class Solution:
    """Node potentials, branch currents (a -> b) and the diode states found."""

    potentials: Mapping[str, float]
    currents: Mapping[str, float]
    diode_state: Mapping[str, str]  # "off", "forward" or "reverse"

    def __init__(
        self,
        potentials: Mapping[str, float],
        currents: Mapping[str, float],
        diode_state: Mapping[str, str],
    ) -> None:
        # One per cut solved: straight into ``__dict__``, as Resistor's is.
        fields = self.__dict__
        fields["potentials"] = potentials
        fields["currents"] = currents
        fields["diode_state"] = diode_state


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


class _System:
    """The nodal equations of one ``solve_dc`` call, rebuilt per diode state.

    What does not change with the diode states is worked out once: the node
    index, each resistor's conductance and where it stamps, and the
    resistors' links for ``_floating``. Each entry of the matrix and of the
    right-hand side still receives the same IEEE operations in the same
    order as ``_stamp`` gives it (a resistor's zero offset adds a zero, which
    leaves every sum started from +0.0 unchanged), so the solution is the
    same bit for bit (``tests/analysis/test_circuit_fast.py``).
    """

    def __init__(
        self,
        nodes: Sequence[str],
        fixed: Mapping[str, float],
        resistors: Sequence[Resistor],
    ) -> None:
        self.nodes = nodes
        self.fixed = fixed
        self.index = index = {n: i for i, n in enumerate(nodes)}
        self.stamps = []
        links: dict[str, list[str]] = {n: [] for n in nodes}
        # No unknown (a domain's rail-to-rail branches): nothing to stamp.
        for r in resistors if nodes else ():
            g = 1.0 / r.resistance
            ia, ib = index.get(r.a), index.get(r.b)
            # A fixed end stamps its potential into the right-hand side.
            fa = fixed[r.a] if ia is None and ib is not None else 0.0
            fb = fixed[r.b] if ib is None and ia is not None else 0.0
            self.stamps.append((ia, ib, g, fa, fb))
            links.setdefault(r.a, []).append(r.b)
            links.setdefault(r.b, []).append(r.a)
        # An infinite conductance (a subnormal resistance) would make g*0 a
        # NaN where _stamp adds it: such systems take _stamp for every branch.
        self.finite = all(math.isfinite(g) for _ia, _ib, g, _fa, _fb in self.stamps)
        self.resistors = resistors
        self.links = links

    def solve(
        self, diodes: Sequence[Diode], states: Mapping[str, str]
    ) -> dict[str, float]:
        """The potentials with the diodes in ``states``."""
        nodes, fixed, index = self.nodes, self.fixed, self.index
        size = len(nodes)
        if not size:
            # Every node fixed: no equation, no node to leak to (``_floating``
            # finds none), the potentials are the fixed ones.
            return dict(fixed)
        matrix = [[0.0] * size for _ in range(size)]
        for node in self._floating(diodes, states):
            matrix[index[node]][index[node]] = G_MIN
        rhs = [0.0] * size
        if self.finite:
            for ia, ib, g, fa, fb in self.stamps:
                if ia is not None:
                    row = matrix[ia]
                    row[ia] += g
                    if ib is None:
                        rhs[ia] += g * fb
                    else:
                        row[ib] += -g
                if ib is not None:
                    row = matrix[ib]
                    if ia is None:
                        rhs[ib] += g * fa
                    else:
                        row[ia] += -g
                    row[ib] += g
        else:
            for r in self.resistors:
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

    def _floating(self, diodes: Sequence[Diode], states: Mapping[str, str]) -> list:
        """Nodes with no conducting path to a fixed node: only these get G_MIN.

        A node tied to a rail through a resistor has a defined potential; a G_MIN
        leak there would shift it by V·R·G_MIN (1 kV through 80 ohm read
        999.99999992 V), so the leak goes only where it is needed.
        """
        links = self.links
        conducting = [
            (d.a, d.b)
            for d in diodes
            if states[d.key] == "forward"
            or (states[d.key] == "reverse" and d.vz is not None)
        ]
        if conducting:
            links = {n: list(v) for n, v in links.items()}
            for a, b in conducting:
                links.setdefault(a, []).append(b)
                links.setdefault(b, []).append(a)
        reached = {n for n in self.fixed if n in links}
        todo = list(reached)
        while todo:
            for other in links[todo.pop()]:
                if other not in reached:
                    reached.add(other)
                    todo.append(other)
        return [n for n in self.nodes if n not in reached]


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


# Solutions by circuit (``_circuit_key``): unknown potentials, currents and
# diode states, each in the order ``_solve_fresh`` lists them.
_SOLVED: dict[tuple, tuple[tuple[float, ...], tuple[float, ...], tuple[str, ...]]] = {}
_SOLVED_LIMIT = 1 << 16
# Circuits with more branches are solved afresh: a domain's rail-to-rail
# branches (thousands) make a key as costly as their solve, met once.
_REMEMBERED_BRANCHES = 64


def _exact(value: object) -> object:
    """A float as a key part that tells -0.0 from 0.0 (== does not)."""
    if type(value) is not float:
        raise TypeError  # ints, numpy scalars: solved afresh, not remembered
    if value:
        return value
    return "-0" if math.copysign(1.0, value) < 0 else "+0"


def _exact_or_none(value: float | None) -> object:
    return None if value is None else _exact(value)


def _circuit_key(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    resistors: Sequence[Resistor],
    diodes: Sequence[Diode],
) -> tuple | None:
    """Everything ``_solve_fresh`` reads, with each node named by its position.

    The solve reads the names only to tell nodes apart, to find the fixed
    ones and their order, and (diode keys) to break ties between equal
    state changes; the key holds the positions, the fixed potentials in
    their order, every value (floats exactly) and the diodes' key order.
    None (solve afresh) where names repeat, a value is not a float, or the
    circuit has more than ``_REMEMBERED_BRANCHES`` branches.
    """
    count = len(resistors) + len(diodes)
    if count > _REMEMBERED_BRANCHES:
        return None
    pos = dict(zip(nodes, range(len(nodes)), strict=True))
    if len(pos) != len(nodes):
        return None
    if count > 1:
        keys = {r.key for r in resistors}
        keys.update([d.key for d in diodes])
        if len(keys) != count:
            return None
    exact = _exact
    try:
        # One flat tuple (the four counts first make it unambiguous); a
        # nonzero float is its own exact key part, without a call.
        key: list = [len(nodes), len(fixed), len(resistors), len(diodes)]
        add = key.extend
        for n, v in fixed.items():
            add((pos[n], v if type(v) is float and v else exact(v)))
        for r in resistors:
            v = r.resistance
            add((pos[r.a], pos[r.b], v if type(v) is float and v else exact(v)))
        for d in diodes:
            add((pos[d.a], pos[d.b], exact(d.vf), _exact_or_none(d.vz)))
        if len(diodes) > 1:
            add(sorted(range(len(diodes)), key=lambda i: diodes[i].key))
        return tuple(key)
    except (KeyError, TypeError):
        return None


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

    Repeated rungs are one circuit under other names: the solution is
    remembered by ``_circuit_key`` (a pure function's inputs, names by
    position) and handed back under the caller's names, the same floats
    (``tests/analysis/test_circuit_fast.py``).
    """
    key = _circuit_key(nodes, fixed, resistors, diodes)
    if key is None:
        return _solve_fresh(nodes, fixed, resistors, diodes)
    unknown = [n for n in nodes if n not in fixed]
    found = _SOLVED.get(key)
    if found is None:
        solution = _solve_fresh(nodes, fixed, resistors, diodes)
        if len(_SOLVED) >= _SOLVED_LIMIT:
            _SOLVED.clear()
        potentials, currents, states = (
            solution.potentials,
            solution.currents,
            solution.diode_state,
        )
        _SOLVED[key] = (
            tuple([potentials[n] for n in unknown]),
            tuple(currents.values()),
            tuple(states.values()),
        )
        return solution
    values, flows, modes = found
    potentials = dict(fixed)
    potentials.update(zip(unknown, values, strict=True))
    names = [r.key for r in resistors]
    if diodes:
        diode_keys = [d.key for d in diodes]
        names += diode_keys
        states = dict(zip(diode_keys, modes, strict=True))
    else:
        states = {}
    return Solution(potentials, dict(zip(names, flows, strict=True)), states)


def _solve_fresh(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    resistors: Sequence[Resistor],
    diodes: Sequence[Diode] = (),
) -> Solution:
    """``solve_dc`` itself, nothing remembered."""
    unknown = [n for n in nodes if n not in fixed]
    states = {d.key: "off" for d in diodes}
    system = _System(unknown, fixed, resistors)
    for _ in range(_MAX_ITERATIONS + len(diodes)):
        potentials = system.solve(diodes, states)
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
