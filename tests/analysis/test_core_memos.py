"""The analysis's memos give what a fresh computation gives.

Each memo (``loads.load_facts``, ``opening.load_transient``) is compared, on
every load of the rule cases and samples, with the computation it stands
for, the memo emptied first.
"""

from __future__ import annotations

import dataclasses
import functools
from pathlib import Path
from typing import Any

import pint
import pytest

from netcheck.analysis import loads, opening
from netcheck.analysis.elements import analyse
from netcheck.graph import COIL, LOAD, Branch, build_graph
from netcheck.input import load_design
from netcheck.units import Q_

ROOT = Path(__file__).resolve().parents[2]
DESIGNS = sorted((ROOT / "tests" / "cases").glob("*/*.cnet")) + sorted(
    (ROOT / "sample_nets").glob("*/*.cnet")
)


def _exact(value: Any) -> Any:
    """A value with every bit of a quantity's magnitude and its exact units."""
    if isinstance(value, pint.Quantity):
        return ("Q", type(value.magnitude), repr(value.magnitude), str(value.units))
    if isinstance(value, tuple):
        return tuple(_exact(v) for v in value)
    return value


def _load_branches() -> list:
    found = []
    for path in DESIGNS:
        try:
            netlist = load_design(path, display_base=path.parent)
        except Exception:  # noqa: BLE001 - a case of bad input has no loads
            continue
        graph = build_graph(netlist)
        found += [
            b for d in graph.domains for b in d.branches if b.role in (LOAD, COIL)
        ]
    return found


def test_load_facts_remembered_equal_load_facts_worked_out():
    branches = _load_branches()
    assert len(branches) > 250
    assert {b.role for b in branches} == {LOAD, COIL}
    loads._FACTS.clear()
    loads._BY_SOURCE.clear()
    first = [loads.load_facts(b) for b in branches]  # fills the memo
    assert len(loads._FACTS) < len(branches)  # repeated parts do share facts
    assert len(loads._BY_SOURCE) < len(branches)  # and their dicts
    again = [loads.load_facts(b) for b in branches]  # from the memo
    for branch, one, two in zip(branches, first, again, strict=True):
        loads._FACTS.clear()
        loads._BY_SOURCE.clear()
        fresh = loads.load_facts(branch)
        names = list(fresh.__dataclass_fields__)
        want = [_exact(getattr(fresh, n)) for n in names]
        assert [_exact(getattr(one, n)) for n in names] == want, branch.key
        assert [_exact(getattr(two, n)) for n in names] == want, branch.key
        assert one == two == fresh


def test_an_edited_copy_of_a_load_gets_its_own_facts():
    # An edit builds new value objects (a copy with another R): new identities,
    # so the memo cannot hand back the old facts. 24 V / 1234.5 ohm, Ohm's law.
    branch = next(
        b for b in _load_branches() if b.role == LOAD and b.component.value("R")
    )
    before = loads.load_facts(branch)
    values = {**branch.component.values, "R": Q_(1234.5, "ohm"), "L": Q_(2.0, "H")}
    edited = Branch(
        dataclasses.replace(branch.component, values=values),
        branch.role,
        branch.a,
        branch.b,
    )
    after = loads.load_facts(edited)
    assert after.resistance.magnitude == 1234.5
    assert after.time_constant.to("s").magnitude == 2.0 / 1234.5  # tau = L/R
    assert loads.load_facts(branch) == before


def test_a_dict_under_a_reused_identity_is_read_afresh():
    """The identity memo hands back facts only for the very dict it holds."""
    branch = next(
        b for b in _load_branches() if b.role == LOAD and b.component.value("R")
    )
    before = loads.load_facts(branch)
    source = branch.component.values
    # As if the id now named another dict: the entry holds some other object.
    loads._BY_SOURCE[(False, id(source))] = ({}, ("poisoned",) * 9)
    assert loads.load_facts(branch) == before


@functools.cache
def _analyses() -> list:
    found = []
    for path in DESIGNS:
        try:
            netlist = load_design(path, display_base=path.parent)
        except Exception:  # noqa: BLE001 - a case of bad input has no circuit
            continue
        found.append(analyse(build_graph(netlist)))
    return found


def _transient_fields(made: Any) -> Any:
    if made is None:
        return None
    out = []
    for name in made.__dataclass_fields__:
        value = getattr(made, name)
        if isinstance(value, pint.Quantity) and hasattr(value.magnitude, "tolist"):
            value = ("wave", repr(value.magnitude.tolist()), str(value.units))
        out.append((name, _exact(value)))
    return out


def _calls(analysis: Any) -> list[tuple]:
    """Every (load, supply, suppressor, element) the suppressor rules model."""
    calls = []
    for element in analysis.elements.values():
        if element.supply != "dc" or element.voltage is None:
            continue
        for load in element.loads:
            for s in (None, *load.suppressors):
                calls.append((load, element.voltage, s, element.component))
                calls.append((load, load.voltage, s, None))
    return calls


def test_load_transients_remembered_equal_transients_worked_out():
    calls = [c for a in _analyses() for c in _calls(a)]
    assert len(calls) > 500
    opening._TRANSIENTS.clear()
    first = [opening.load_transient(*c) for c in calls]
    assert len(opening._TRANSIENTS) < len(calls) / 2  # repeated rungs share
    assert sum(t is not None for t in first) > 100
    for call, one in zip(calls, first, strict=True):
        opening._opening.cache_clear()
        fresh = _transient_fields(opening._load_transient(*call))
        assert _transient_fields(one) == fresh
        assert _transient_fields(opening.load_transient(*call)) == fresh


def test_a_transient_at_another_current_is_worked_out_again():
    # ½·L·I² grows with I: the same load at twice the current is a new entry.
    load, supply, s, element = next(
        c
        for a in _analyses()
        for c in _calls(a)
        if c[2] is not None and opening.load_transient(*c) is not None
    )
    doubled = dataclasses.replace(load, current=load.current * 2.0)
    one = opening.load_transient(load, supply, s, element)
    two = opening.load_transient(doubled, supply, s, element)
    assert two.stored_energy.to("J").magnitude == pytest.approx(
        4.0 * one.stored_energy.to("J").magnitude, rel=1e-9
    )


def test_chain_parts_stay_right_when_their_memo_is_emptied(monkeypatch):
    # The chain memo is bounded (_CHAINS_LIMIT); emptied part-way through a
    # design, it must still give the parts a fresh reading gives.
    calls = [c for a in _analyses() for c in _calls(a) if c[2] is not None]
    chains = {id(c[2].chain): c[2].chain for c in calls if c[2].chain is not None}
    assert len(chains) > 20
    monkeypatch.setattr(opening, "_CHAINS_LIMIT", 3)
    opening._CHAINS.clear()
    remembered = [opening._chain_parts(chain) for chain in chains.values()] * 2
    assert len(opening._CHAINS) <= 3
    opening._CHAINS.clear()
    monkeypatch.setattr(opening, "_CHAINS_LIMIT", 1 << 17)
    fresh = [opening._chain_parts(chain) for chain in chains.values()] * 2
    assert [r[0] for r in remembered] == [f[0] for f in fresh]
