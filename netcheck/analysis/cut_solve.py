"""The solve of a cut-off region, remembered by the region's shape.

One rail pair with thousands of rungs: every rung's coil (and its diode) is
cut off by its own contact, under its own net names, and each is the same
small circuit. ``solve_dc`` remembers such circuits too, but only after its
caller has built every branch's model and it has built its key and the whole
named solution again. A cut needs two potentials and its branches' currents:
``solve_shape`` keys the region on its shape and hands back just those.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

from netcheck.analysis.circuit import (
    _REMEMBERED_BRANCHES,
    Diode,
    Resistor,
    _exact,
    _exact_or_none,
    solve_dc,
)

__all__ = ["solve_shape"]

# (branch key, node of end a, node of end b, the branch's model in the state)
Row = tuple[str, str, str, Resistor | Diode]


def _value(model: Resistor | Diode) -> tuple | None:
    """A model's kind and values as a key part (floats exactly), or None."""
    try:
        if type(model) is Resistor:
            return ("r", _exact(model.resistance))
        return ("d", _exact(model.vf), _exact_or_none(model.vz))  # type: ignore[union-attr]
    except TypeError:
        return None  # ints, numpy scalars: solved as given


def _shape(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    rows: Sequence[Row],
    node: str,
    group: str,
    values: dict[int, tuple] | None = None,
) -> tuple | None:
    """Everything the solve of ``rows`` reads, nodes named by position.

    What ``circuit._circuit_key`` holds (the node count, the fixed potentials
    in their order, each branch's ends and values, floats exactly) and the
    positions of the two nodes read back, with each branch's kind in the rows'
    order. The rows come in key order, so the diodes' key order (the solve's
    tie-break) is their order here. None (solve as given) where a value is
    not a float or the region is larger than ``solve_dc`` remembers.

    ``values``, if given, remembers each model's ``_value`` by identity, the
    model kept beside it (a state's models are met once per cut that holds
    them).
    """
    if len(rows) > _REMEMBERED_BRANCHES:
        return None
    pos = {n: i for i, n in enumerate(nodes)}
    key: list = [len(nodes), pos[node], pos[group], len(fixed)]
    add = key.append
    try:
        for n, v in fixed.items():
            add(pos[n])
            add(_exact(v))
    except TypeError:
        return None
    for _, a, b, model in rows:
        if values is None:
            value = _value(model)
        else:
            held = values.get(id(model))
            if held is None or held[0] is not model:
                held = values[id(model)] = (model, _value(model))
            value = held[1]
        if value is None:
            return None
        add(pos[a])
        add(pos[b])
        add(value)
    return tuple(key)


def solve_shape(
    nodes: Sequence[str],
    fixed: Mapping[str, float],
    rows: Sequence[Row],
    node: str,
    group: str,
    memo: dict,
    values: dict[int, tuple] | None = None,
) -> tuple[float, float, tuple[float, ...]]:
    """The potentials of ``node`` and ``group`` and each row's current.

    ``solve_dc`` of the rows' models (resistors and diodes apart, each in the
    rows' order), remembered in ``memo`` by ``_shape``: the solve is a pure
    function of what the shape holds, so a remembered result is the same
    floats (``tests/analysis/test_cut_solve.py`` compares the two on varied
    designs). ``memo`` lives as long as the caller likes (a domain state's),
    and so does ``values`` (``_shape``'s memo of the models' values).
    """
    shape = _shape(nodes, fixed, rows, node, group, values)
    found = memo.get(shape) if shape is not None else None
    if found is None:
        resistors = [
            Resistor(k, a, b, m.resistance)
            for k, a, b, m in rows
            if type(m) is Resistor
        ]
        diodes = [
            Diode(k, a, b, m.vf, m.vz)  # type: ignore[union-attr]
            for k, a, b, m in rows
            if type(m) is not Resistor
        ]
        solution = solve_dc(nodes, fixed, resistors, diodes)
        currents = solution.currents
        found = (
            solution.potentials[node],
            solution.potentials[group],
            tuple(currents[k] for k, _, _, _ in rows),
        )
        if shape is not None:
            memo[shape] = found
    return found  # type: ignore[no-any-return]
