"""The making current on a domain cut at its rails equals the whole-domain solve.

``making.py`` solves a small domain as one dense modified-nodal system per
closing; a large one is cut at its supply rails into blocks, the closing's
own blocks solved in full and every other block entering as its multiport
(``closing_ports.py``). Both are the same linear network, so by superposition
(Thevenin/Norton equivalence, any circuit-theory text) they give the same
currents; the reference here is the dense whole-domain least-squares solve,
forced by lifting the size limit and solved exactly (LU, numpy.linalg.solve:
the production least-squares solve drops the 1 Tohm leaks below its rank
cutoff and is off by up to a few 1e-4, e.g. 399.998 V for a link charged to
400 V with nothing drawing current). The last tests are the guard against the
quadratic pattern: the largest system solved and the solves per closing stay
the size of one rung however many rungs share the rails.
"""

from __future__ import annotations

import math
import types
from pathlib import Path

import numpy as np
import pytest
from helpers import net

import netcheck.analysis.closing_net as closing_net
import netcheck.analysis.making as making
from netcheck.analysis.closing_net import blocks_of
from netcheck.analysis.making import closing_inrush

ROOT = Path(__file__).resolve().parents[2]
DESIGNS = sorted(
    [
        *(ROOT / "tests" / "cases" / "making-over-rating").glob("*.cnet"),
        *(
            p
            for p in (ROOT / "sample_nets").glob("*/*.cnet")
            if p.stem == p.parent.name
        ),
    ]
)


ROUGH: list[bool] = []  # a singular system fell back to least squares


def _exact(matrix, rhs, rcond=None):  # type: ignore[no-untyped-def]
    try:
        return (np.linalg.solve(matrix, rhs),)
    except np.linalg.LinAlgError:
        # Contacts in parallel (a loop of 0 V sources): no unique solution,
        # least squares as in production; compared to 1e-3 only.
        ROUGH.append(True)
        return np.linalg.lstsq(matrix, rhs, rcond=rcond)


EXACT = types.SimpleNamespace(
    zeros=np.zeros, linalg=types.SimpleNamespace(lstsq=_exact)
)


def _both(analysis, name, monkeypatch):  # type: ignore[no-untyped-def]
    element = analysis.elements[name]
    ROUGH.clear()
    monkeypatch.setattr(making, "DENSE_BRANCHES", 10**9)
    monkeypatch.setattr(closing_net, "np", EXACT)  # the dense solve only
    dense = closing_inrush(analysis, element)
    monkeypatch.setattr(closing_net, "np", np)
    monkeypatch.setattr(making, "DENSE_BRANCHES", -1)
    for state in analysis.states.values():
        state.cache.clear()
    cut = closing_inrush(analysis, element)
    return dense, cut


def _close(a: float | None, b: float | None) -> bool:
    if a is None or b is None:
        return a is b
    return math.isclose(a, b, rel_tol=1e-3 if ROUGH else 1e-6, abs_tol=1e-6)


def _same(dense, cut) -> bool:  # type: ignore[no-untyped-def]
    if dense is None or cut is None:
        return dense is cut
    if not (_close(dense.peak, cut.peak) and _close(dense.steady, cut.steady)):
        return False
    if [c.ref for c in dense.charges] != [c.ref for c in cut.charges]:
        return False
    return all(
        _close(c.step, d.step) and _close(c.loop, d.loop)
        for c, d in zip(dense.charges, cut.charges, strict=True)
    )


def _dc_elements(analysis):  # type: ignore[no-untyped-def]
    return [n for n, e in sorted(analysis.elements.items()) if e.supply == "dc"]


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.stem)
def test_cut_equals_whole_domain_on_cases_and_samples(
    path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from netcheck.pipeline import analyse_path

    _, analysis = analyse_path(path)
    for name in _dc_elements(analysis):
        dense, cut = _both(analysis, name, monkeypatch)
        assert _same(dense, cut), (name, dense, cut)


# Rungs that all move the rails: a real 0.5 ohm source, resistors that draw
# current with the loads left out, RC networks across contacts and a link
# capacitor behind a precharge path. Closing one rung sags the rails enough
# that capacitors of other rungs step too (hand estimate: 24 V / 20 ohm x
# 0.5 ohm = 0.6 V per rung, above the 24 mV step threshold).
def _sagging_design(rungs: int) -> str:
    lines = ["supply G1 dc=24V earth=minus r_int=0.5ohm +:L+ -:M"]
    lines.append("fuse F1 1:L+ 2:P")
    for i in range(1, rungs + 1):
        lines += [
            f"relay K{i} 13:P 14:N{i}",
            f"resistor R{i} R=20ohm P=50W 1:N{i} 2:M",
            f"rc Z{i} R=10ohm C=1uF voltage_rating=100V 1:P 2:N{i}",
        ]
        if i % 3 == 0:
            lines += [
                f"resistor RP{i} R=5ohm P=50W 1:N{i} 2:D{i}",
                f"capacitor C{i} C=100uF voltage_rating=63V +:D{i} -:M",
                f"load U{i} type=resistive R=48ohm 1:D{i} 2:M",
            ]
    return "\n".join(lines) + "\n"


def test_cut_equals_whole_domain_where_every_rung_moves_the_rails(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    _, analysis = net(tmp_path, _sagging_design(12))
    names = _dc_elements(analysis)
    stepped = 0
    for name in names:
        dense, cut = _both(analysis, name, monkeypatch)
        assert _same(dense, cut), (name, dense, cut)
        rung = name.split(":")[0][1:]
        stepped += sum(1 for c in cut.charges if c.ref[1:] != rung)
    assert stepped > 0  # other rungs' capacitors did step: the bound was exercised


def _one_rail(rungs: int) -> str:
    lines = ["supply G1 dc=24V earth=minus r_int=20mohm +:L+ -:M", "fuse F1 1:L+ 2:P"]
    for i in range(1, rungs + 1):
        lines += [
            f"relay K{i} 13:P 14:N{i}",
            f"load H{i} type=lamp R=48ohm 1:N{i} 2:M",
            f"capacitor C{i} C=10uF voltage_rating=63V +:N{i} -:M",
        ]
    return "\n".join(lines) + "\n"


def _solves(tmp: Path, rungs: int) -> tuple[int, int, int]:
    _, analysis = net(tmp, _one_rail(rungs))
    elements = _dc_elements(analysis)
    for name in elements:
        assert closing_inrush(analysis, analysis.elements[name]) is not None
    blocks = blocks_of(analysis.states["G1"])
    return blocks.solves, blocks.largest, len(elements)


def test_each_closing_solves_a_network_the_size_of_its_rung(tmp_path: Path) -> None:
    (tmp_path / "a").mkdir(), (tmp_path / "b").mkdir()
    small = _solves(tmp_path / "a", 40)
    large = _solves(tmp_path / "b", 160)
    assert small[0] > 0  # the domain was cut (a whole-domain solve counts none)
    # The largest system: one rung (contact, lamp, capacitor and its source,
    # the rails and the supply), whatever the number of rungs.
    assert large[1] == small[1] <= 10  # 7 today
    # Solves grow with the elements, not with elements x domain.
    per_small, per_large = small[0] / small[2], large[0] / large[2]
    assert per_large <= 1.05 * per_small
