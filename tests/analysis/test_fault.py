"""Prospective DC fault current and the polarity of protective poles."""

from __future__ import annotations

from pathlib import Path

import pytest
from helpers import net

from netcheck.analysis.fault import inlet_of, protective_devices, supply_fault_current


def test_battery_fault_current_is_emf_over_internal_resistance(tmp_path: Path) -> None:
    netlist, analysis = net(
        tmp_path,
        "supply G1 dc=48V r_int=5mohm +:B+ -:B-\nfuse F1 1:B+ 2:W1\n"
        "load E1 type=resistive R=4.8ohm 1:W1 2:B-\n",
    )
    (device,) = protective_devices(analysis.graph)
    # Ohm's law round a bolted fault: 48 V / 0.005 ohm = 9.6 kA (hand calculation).
    assert device.prospective.to("A").magnitude == pytest.approx(9600.0)
    assert device.voltage.to("V").magnitude == pytest.approx(48.0)


@pytest.mark.parametrize(
    ("attributes", "expected"),
    [
        ("r_int=5mohm isc=500A", 500.0),  # the stated isc caps E / r_int
        ("isc=2kA", 2000.0),  # isc alone
        ("r_int=50mohm isc=5kA", 960.0),  # 48 / 0.05 = 960 A is below isc
        ("", None),  # neither: unknown, never guessed
    ],
)
def test_supply_fault_current_caps(
    tmp_path: Path, attributes: str, expected: float | None
) -> None:
    netlist, _ = net(
        tmp_path,
        f"supply G1 dc=48V {attributes} +:B+ -:B-\n"
        "load E1 type=resistive R=4.8ohm 1:B+ 2:B-\n",
    )
    current = supply_fault_current(netlist.components[0])
    if expected is None:
        assert current is None
    else:
        assert current.to("A").magnitude == pytest.approx(expected)


def test_parallel_supplies_feed_the_fault_together(tmp_path: Path) -> None:
    _, analysis = net(
        tmp_path,
        "supply G1 dc=48V r_int=10mohm +:B+ -:B-\n"
        "supply G2 dc=48V r_int=20mohm +:B+ -:B-\nfuse F1 1:B+ 2:W1\n"
        "load E1 type=resistive R=4.8ohm 1:W1 2:B-\n",
    )
    (device,) = protective_devices(analysis.graph)
    # 48/0.01 + 48/0.02 = 4.8 kA + 2.4 kA = 7.2 kA (sources in parallel).
    assert device.prospective.to("A").magnitude == pytest.approx(7200.0)


def test_inlet_of_poles_in_the_plus_and_minus_lines(tmp_path: Path) -> None:
    netlist, analysis = net(
        tmp_path,
        "supply G1 dc=110V r_int=50mohm +:B+ -:B-\n"
        "breaker Q1 1:W1 2:B+ 3:W2 4:B-\n"
        "load E1 type=resistive R=110ohm 1:W1 2:W2\n",
    )
    breaker = netlist.components[1]
    plus, minus = breaker.poles
    # + line: the current comes from B+ at 2; - line: it leaves at 4 toward B-.
    assert inlet_of(analysis.graph, breaker, plus) == "2"
    assert inlet_of(analysis.graph, breaker, minus) == "3"


def _inlet_by_whole_walk(graph, component, pole):  # type: ignore[no-untyped-def]
    """The reference: a fresh walk of every conductor and contact per question."""
    import networkx as nx

    from netcheck.graph import CONDUCTOR, SUPPLY, SWITCH

    a, b = component.net_of(pole.common), component.net_of(pole.no or "")
    joined = nx.MultiGraph()
    for branch in graph.branches:
        if branch.component is not component and branch.role in (CONDUCTOR, SWITCH):
            joined.add_edge(branch.a, branch.b)
    supplies = [br for br in graph.branches if br.role == SUPPLY]
    plus, minus = {s.a for s in supplies}, {s.b for s in supplies}

    def reaches(net, targets):  # type: ignore[no-untyped-def]
        if net in targets:
            return True
        return net in joined and bool(
            nx.node_connected_component(joined, net) & targets
        )

    ap, bp, am, bm = (
        reaches(a, plus),
        reaches(b, plus),
        reaches(a, minus),
        reaches(b, minus),
    )
    if ap != bp and not (am or bm):
        return pole.common if ap else pole.no
    if am != bm and not (ap or bp):
        return pole.no if am else pole.common
    return None


@pytest.mark.parametrize("seed", range(30))
def test_inlet_of_equals_a_whole_walk_on_random_wiring(tmp_path, seed) -> None:  # type: ignore[no-untyped-def]
    # Random fuses and contacts between a few nets: the one-edge shortcut
    # (search the smaller side) must answer as a walk of everything does.
    import random

    from netcheck.analysis.fault import Feeds, inlet_of

    rng = random.Random(seed)
    nets = ["P", "M"] + [f"N{i}" for i in range(8)]
    lines = ["supply G1 dc=24V earth=minus +:P -:M"]
    for i in range(rng.randint(3, 9)):
        x, y = rng.sample(nets, 2)
        lines.append(f"fuse F{i} 1:{x} 2:{y}")
    for i in range(rng.randint(0, 6)):
        x, y = rng.sample(nets, 2)
        lines.append(f"relay K{i} 13:{x} 14:{y}")
    for net_name in nets[2:]:
        lines.append(f"load E{net_name} type=heater R=10ohm 1:{net_name} 2:M")
    _, analysis = net(tmp_path, "\n".join(lines) + "\n")
    graph = analysis.graph
    feeds = Feeds(graph)
    for component in graph.netlist.components:
        for pole in component.poles if component.kind == "fuse" else ():
            expected = _inlet_by_whole_walk(graph, component, pole)
            assert inlet_of(graph, component, pole, feeds) == expected, component.ref
