"""The shared cut-off solves, block-tree sides and series marking change nothing.

No outside source: each whole design is analysed twice, once as shipped and
once with the former code patched in (verbatim but for its home): sides
searched edge by edge, every cut-off region and solve worked out afresh for
the element's whole floating side, and series marking by
``dataclasses.replace``. Every element's analysis must be equal, field for
field (floats exactly). Designs: every rule case, the samples, and the bench's
shapes (series chains, parallel bundles and seal-ins, one rail, PLC cards,
mixed).
"""

from __future__ import annotations

import sys
from dataclasses import replace
from pathlib import Path

import pytest

from netcheck.analysis import elements as elements_module
from netcheck.analysis import switched
from netcheck.analysis.circuit import solve_dc
from netcheck.analysis.elements import analyse
from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.errors import InputError
from netcheck.graph import build_graph
from netcheck.input import load_design

ROOT = Path(__file__).parents[2]
BENCH = ROOT / "bench"
DESIGNS = sorted((ROOT / "tests" / "cases").rglob("*.cnet")) + sorted(
    (ROOT / "sample_nets").rglob("*.cnet")
)
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
    return keys, solution, lost


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


def _both(netlist, monkeypatch):  # type: ignore[no-untyped-def]
    shipped = analyse(build_graph(netlist)).elements
    with monkeypatch.context() as patch:
        patch.setattr(switched, "_cut_off", _former_cut_off)
        patch.setattr(elements_module, "mark_series", _former_mark_series)
        patch.setattr(ZeroOhm, "sides", _searched)
        former = analyse(build_graph(netlist)).elements
    return shipped, former


def _assert_same(shipped, former) -> None:  # type: ignore[no-untyped-def]
    assert list(shipped) == list(former)
    for name, element in shipped.items():
        assert element == former[name], name
        assert element.series_elements == former[name].series_elements, name


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: str(p.relative_to(ROOT)))
def test_repository_designs(path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    try:
        netlist = load_design(path)
    except InputError:
        pytest.skip("an included sheet or an input-error case")
    _assert_same(*_both(netlist, monkeypatch))


@pytest.mark.parametrize("shape", SHAPES)
def test_bench_shapes(
    shape: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    sys.path.insert(0, str(BENCH))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH))
    top = gen_design.generate(600, tmp_path, shape=shape, hazard_rate=0.2)
    shipped, former = _both(load_design(top, display_base=tmp_path), monkeypatch)
    marked = any(e.other_series or e.series_poles > 1 for e in shipped.values())
    assert marked or shape not in ("series", "parallel")  # they exercise it
    _assert_same(shipped, former)
