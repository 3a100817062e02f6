"""One switched load's values, shared per state, equal those made afresh.

No outside source: ``element_loads._one_load`` (the path of an element that
switches one load) is compared, for every load of every solved state and at
several sags, with the former path it stands for, ``switched_loads`` then
``_one_switched``: every field equal (floats exactly, quantities in the same
units). Designs: every rule case, the samples, and the bench's shapes with and
without suppressors.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from helpers import REPOSITORY_DESIGNS, bench_design, design_id, load_or_skip

from netcheck.analysis import element_loads
from netcheck.analysis.elements import analyse
from netcheck.analysis.found_suppressors import DomainContext
from netcheck.analysis.switched import Opening
from netcheck.graph import build_graph
from netcheck.input import load_design

SAGS = (1.0, 0.75, 0.0)


def _former(ctx, key, power, sag):  # type: ignore[no-untyped-def]
    opening = Opening(0.0, 0.0, (key,), (), frozenset())
    (load,) = element_loads.switched_loads(ctx, opening, power, sag)
    return element_loads._one_switched(load)


def _same_quantity(a, b) -> None:  # type: ignore[no-untyped-def]
    if a is None or b is None:
        assert a is b
        return
    assert a.units == b.units
    assert type(a.magnitude) is type(b.magnitude)
    assert repr(a.magnitude) == repr(b.magnitude)  # -0.0 and NaN told apart


def _same(shared, former) -> None:  # type: ignore[no-untyped-def]
    (mine,), (theirs,) = shared.loads, former.loads
    assert mine == theirs
    assert mine.facts is theirs.facts
    for field in ("current", "voltage", "energy"):
        _same_quantity(getattr(mine, field), getattr(theirs, field))
    assert shared.category == former.category
    for field in ("tau", "t95", "energy"):
        _same_quantity(getattr(shared, field), getattr(former, field))
    assert shared.suppression == former.suppression
    assert shared.missing == former.missing
    assert shared == former


def _compare(netlist) -> int:  # type: ignore[no-untyped-def]
    analysis = analyse(build_graph(netlist))
    compared = 0
    states = [*analysis.states.values(), *analysis.alternate_states.values()]
    for state in states:
        name = state.domain.name
        ctx = DomainContext(
            state.domain, state, analysis.chains[name], analysis.wires[name]
        )
        for key in state.facts:
            for power in (False, True):
                for sag in SAGS:
                    # Twice: the second call reads the state's memo.
                    for _ in range(2):
                        shared = element_loads._one_load(ctx, key, power, sag)
                        _same(shared, _former(ctx, key, power, sag))
                        compared += 1
    return compared


@pytest.mark.parametrize("path", REPOSITORY_DESIGNS, ids=design_id)
def test_repository_designs(path: Path) -> None:
    _compare(load_or_skip(path))


@pytest.mark.parametrize("shape", ["mixed", "unsuppressed", "series", "plc"])
def test_bench_shapes(shape: str, tmp_path: Path) -> None:
    top = bench_design(400, tmp_path, shape)
    assert _compare(load_design(top, display_base=tmp_path)) > 100


def test_loads_of_one_part_share_their_values(tmp_path: Path) -> None:
    """Two rungs of one part at one operating point read one set of values."""
    top = bench_design(400, tmp_path, "unsuppressed")
    analysis = analyse(build_graph(load_design(top, display_base=tmp_path)))
    by_values: dict[tuple, list] = {}
    for element in analysis.elements.values():
        if len(element.loads) == 1:
            load = element.loads[0]
            by_values.setdefault((load.current, load.voltage), []).append(element)
    repeated = [group for group in by_values.values() if len(group) > 1]
    assert repeated
    first, second = repeated[0][:2]
    assert first.loads[0].current is second.loads[0].current
    assert first.t95 is second.t95


def test_an_equal_identity_of_another_object_is_not_a_hit(tmp_path: Path) -> None:
    """An entry is read only for the very inductance and time constant it holds."""
    top = bench_design(200, tmp_path, "unsuppressed")
    analysis = analyse(build_graph(load_design(top, display_base=tmp_path)))
    state = next(iter(analysis.states.values()))
    name = state.domain.name
    ctx = DomainContext(
        state.domain, state, analysis.chains[name], analysis.wires[name]
    )
    key = next(k for k, f in state.facts.items() if f.inductance is not None)
    element_loads._one_load(ctx, key, False, 1.0)
    memo = state.cache["one-load-values"]
    (entry_key,) = [k for k in memo if k[0] == id(state.facts[key].inductance)][:1]
    poisoned = list(memo[entry_key])
    poisoned[0] = object()  # as if the id now named another object
    poisoned[2] = None
    memo[entry_key] = tuple(poisoned)
    shared = element_loads._one_load(ctx, key, False, 1.0)
    _same(shared, _former(ctx, key, False, 1.0))
