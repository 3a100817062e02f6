"""Shared solves and analyses, block-tree sides and series marking change nothing.

No outside source: each whole design is analysed twice, once as shipped and
once with the former code patched in (verbatim but for its home): sides
searched edge by edge, every cut-off region and solve worked out afresh for
the element's whole floating side, every element analysed on its own (not
once per parallel bundle, its loads not once per chain, its power flag not
once per part), and series marking by ``dataclasses.replace``. Every
element's analysis must be equal, field for field (floats exactly). Designs:
every rule case, the samples, the bench's shapes (series chains, parallel
bundles and seal-ins, one rail, PLC cards, mixed) and a ring of contacts with
a main pole among pushbuttons.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest
from helpers import (
    REPOSITORY_DESIGNS,
    bench_design,
    design_id,
    load_or_skip,
    write_design,
)

from netcheck.analysis import element_loads, switched
from netcheck.analysis import elements as elements_module
from netcheck.analysis.circuit import solve_dc
from netcheck.analysis.elements import analyse
from netcheck.analysis.loads import rated_as_power_device
from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.graph import build_graph
from netcheck.input import load_design

SHAPES = ("series", "parallel", "one-rail", "plc", "mixed")


def _former_cut_off(state, floating, group):  # type: ignore[no-untyped-def]
    node = "<open>"
    rename = {net: node for net in floating}
    keys = switched._region(state, set(floating), group)
    models = [state.model(k, rename) for k in sorted(keys)]
    resistors = [m for m in models if hasattr(m, "resistance")]
    diodes = [m for m in models if not hasattr(m, "resistance")]
    nodes = sorted({n for m in models for n in (m.a, m.b)} | {node, group})
    fixed = {n: state.rails[n] for n in nodes if n in state.rails and n != node}
    solution = solve_dc(nodes, fixed, resistors, diodes)
    lost = tuple(
        k
        for k in sorted(keys)
        if k in state.facts
        and abs(state.currents.get(k, 0.0)) > switched._TINY
        and abs(solution.currents.get(k, 0.0))
        < switched.LOST_SHARE * abs(state.currents[k])
    )
    return solution.potentials[node], solution.potentials[group], lost


def _former_mark_series(elements):  # type: ignore[no-untyped-def]
    groups: dict[tuple, list[str]] = {}
    for name, e in elements.items():
        if e.supply != "dc" or not e.loads or e.current is None:
            continue
        loads = frozenset(ld.facts.key for ld in e.loads)
        key = (e.domain, loads, round(float(e.current.magnitude), 9))
        groups.setdefault(key, []).append(name)
    out = dict(elements)
    for names in groups.values():
        if len(names) < 2:
            continue
        ordered = sorted(names)
        device_of = {n: elements[n].element.device for n in ordered}
        for name in names:
            e = elements[name]
            bypass = set(e.bypass)
            partners = [n for n in ordered if n not in bypass] if bypass else ordered
            device = device_of[name]
            same = tuple(n for n in partners if device_of[n] == device)
            other = tuple(n for n in partners if device_of[n] != device)
            out[name] = replace(
                e, series_poles=len(same), series_elements=same, other_series=other
            )
    return out


def _searched(self, key, removed):  # type: ignore[no-untyped-def]
    branch = self.by_key[key]
    if branch.a == branch.b:
        return {branch.a}, "a"
    return self._searched_sides(branch, removed)


def _each_alone(shared, *args):  # type: ignore[no-untyped-def]
    return elements_module._analyse_dc(*args)


def _loads_alone(ctx, opening, power, sag):  # type: ignore[no-untyped-def]
    loads = tuple(element_loads.switched_loads(ctx, opening, power, sag))
    if len(loads) == 1:  # the former one-load path, its values made afresh
        return element_loads._one_switched(loads[0])
    return element_loads._switched(ctx, opening, power, sag)


def _power_alone(state, component):  # type: ignore[no-untyped-def]
    return rated_as_power_device(component)


def _both(netlist, monkeypatch):  # type: ignore[no-untyped-def]
    shipped = analyse(build_graph(netlist)).elements
    with monkeypatch.context() as patch:
        patch.setattr(switched, "_cut_off", _former_cut_off)
        patch.setattr(elements_module, "mark_series", _former_mark_series)
        patch.setattr(ZeroOhm, "sides", _searched)
        patch.setattr(elements_module, "_analyse_parallel", _each_alone)
        patch.setattr(elements_module, "switched_once", _loads_alone)
        patch.setattr(element_loads, "_rated_as_power_device", _power_alone)
        former = analyse(build_graph(netlist)).elements
    return shipped, former


def _assert_same(shipped, former) -> None:  # type: ignore[no-untyped-def]
    assert list(shipped) == list(former)
    for name, element in shipped.items():
        assert element == former[name], name
        assert element.series_elements == former[name].series_elements, name


@pytest.mark.parametrize("path", REPOSITORY_DESIGNS, ids=design_id)
def test_repository_designs(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    netlist = load_or_skip(path)
    _assert_same(*_both(netlist, monkeypatch))


@pytest.mark.parametrize("shape", SHAPES)
def test_bench_shapes(
    shape: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    top = bench_design(600, tmp_path, shape)
    shipped, former = _both(load_design(top, display_base=tmp_path), monkeypatch)
    marked = any(e.other_series or e.series_poles > 1 for e in shipped.values())
    assert marked or shape not in ("series", "parallel")  # they exercise it
    _assert_same(shipped, former)


BUNDLES = """\
supply  G1  dc=24V  earth=minus  +:L+  -:M
switch  S5  13:L+  14:P
switch  S1  13:P  14:X
switch  S2  13:X  14:Y
switch  S3  13:P  14:Y
relay   K1  coil.resistance=240ohm  coil.inductance=1H  A1:X  A2:M
relay   K2  coil.resistance=480ohm  coil.inductance=2H  A1:Y  A2:M
contactor Q1  1:P  2:Z
switch  S4  13:P  14:Z
switch  S6  13:P  14:Z
switch  S7  13:Z  14:P
load    E1  type=motor  R=10ohm  L=10mH  1:Z  2:M
"""


def test_elements_of_one_block_share_only_what_they_can(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # A ring of three contacts (one block, two of them from P), a contactor's
    # main pole (power categories) with pushbuttons beside it, one reversed.
    netlist = load_design(write_design(tmp_path, BUNDLES), display_base=tmp_path)
    shipped, former = _both(netlist, monkeypatch)
    _assert_same(shipped, former)
    assert shipped["S1:13-14"].current != shipped["S3:13-14"].current
    assert shipped["Q1:1-2"].load_category != shipped["S4:13-14"].load_category
    assert shipped["S4:13-14"].direction == -shipped["S7:13-14"].direction != 0
