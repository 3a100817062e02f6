"""``graph.net_graph`` builds the very graph networkx's own calls build.

``net_graph`` writes the multigraph's adjacency dicts directly for speed; these
tests build the same graph through networkx's public ``add_nodes_from`` and
``add_edges_from`` and compare nodes, adjacency order, edge keys and data, and
the sharing of each edge's key dict between its two ends.
"""

from __future__ import annotations

import sys
from pathlib import Path

import networkx as nx
import pytest

from netcheck.graph import BRANCH, ROLE, Branch, build_graph
from netcheck.input import load_design, read_design_text

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "bench"))
import gen_design  # noqa: E402

SAMPLES = sorted(p / f"{p.name}.cnet" for p in (ROOT / "sample_nets").iterdir())


def _public(nets, branches) -> nx.MultiGraph:
    graph = nx.MultiGraph()
    graph.add_nodes_from(nets)
    graph.add_edges_from((b.a, b.b, b.key, {ROLE: b.role, BRANCH: b}) for b in branches)
    return graph


def _same(built: nx.MultiGraph, public: nx.MultiGraph) -> None:
    assert list(built.nodes(data=True)) == list(public.nodes(data=True))
    assert list(built.edges(keys=True, data=True)) == list(
        public.edges(keys=True, data=True)
    )
    for node in public:
        assert list(built.adj[node]) == list(public.adj[node])
        for other, keys in public.adj[node].items():
            assert list(built.adj[node][other].items()) == list(keys.items())
            assert built._adj[node][other] is built._adj[other][node]
    assert built.number_of_edges() == public.number_of_edges()


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.parent.name)
def test_samples_build_the_public_graph(path):
    graph = build_graph(load_design(path))
    _same(graph.graph, _public(graph.connections, graph.branches))


@pytest.mark.parametrize("shape", ["mixed", "series", "parallel", "plc"])
def test_generated_designs_build_the_public_graph(tmp_path, shape):
    gen_design.generate(400, tmp_path, shape=shape)
    graph = build_graph(load_design(tmp_path / "design.cnet"))
    assert len(graph.branches) > 100
    _same(graph.graph, _public(graph.connections, graph.branches))


def test_self_loops_parallel_edges_and_a_repeated_key():
    # A two-pole fuse has one key (its reference) for both poles: on the same
    # pair of nets networkx keeps one edge and updates its data, so must we.
    netlist = read_design_text(
        "supply G1 dc=24V +:P -:M\n"
        "fuse F1 1:P 2:Q 3:P 4:Q\n"
        "load H1 1:Q 2:M\nload H2 1:Q 2:M\nload H3 1:Q 2:Q\n"
    )
    graph = build_graph(netlist)
    _same(graph.graph, _public(graph.connections, graph.branches))
    assert graph.graph.number_of_edges("P", "Q") == 1
    assert graph.graph.number_of_edges("Q", "Q") == 1


@pytest.mark.parametrize("shape", ["mixed", "one-rail", "parallel", "plc"])
def test_built_branches_carry_what_their_properties_work_out(tmp_path, shape):
    # build_graph writes each branch's ref, kind and key as it makes it; a
    # branch made by Branch(...) works them out on first read: they must agree.
    gen_design.generate(400, tmp_path, shape=shape)
    paths = [tmp_path / "design.cnet", *SAMPLES]
    for path in paths:
        for built in build_graph(load_design(path)).branches:
            fresh = Branch(built.component, built.role, built.a, built.b, built.element)
            assert fresh == built
            assert (fresh.ref, fresh.kind, fresh.key) == (
                built.ref,
                built.kind,
                built.key,
            )


def test_the_multigraph_is_built_when_first_read(tmp_path):
    """``Graph.graph`` is made on first reading, once, from the nets it was built on.

    Fix slices replace ``connections`` after building; the multigraph keeps
    the nets the graph was made with, as when it was built eagerly.
    """
    gen_design.generate(200, tmp_path, shape="mixed")
    graph = build_graph(load_design(tmp_path / "design.cnet"))
    assert graph._net_graph is None
    original = graph.connections
    graph.connections = {}
    built = graph.graph
    assert built is graph.graph
    _same(built, _public(original, graph.branches))


def _former_add_branches(component, out):  # type: ignore[no-untyped-def]
    """``graph._add_branches`` before its two-terminal quick path (verbatim)."""
    from netcheck.graph import (
        _END,
        COIL,
        COIL_KINDS,
        CONDUCTOR,
        LOAD,
        PROTECTIVE_KINDS,
        SUPPLY,
        SWITCH,
        SWITCHING_KINDS,
        _branch,
    )

    connections = component.connections
    net = {c.terminal: c.net for c in reversed(connections)}.get
    kind = component.kind
    if kind == "supply":
        a, b = ("+", "-") if net("+") or net("-") else ("L", "N")
        if net(a) and net(b):
            out.append(_branch(component, SUPPLY, net(a), net(b), None, component.ref))
        return
    if kind in COIL_KINDS and net("A1") and net("A2"):
        key = f"{component.ref}:coil"
        out.append(_branch(component, COIL, net("A1"), net("A2"), None, key))
    for element in component.elements:
        a, b = net(element.a), net(element.b)
        if a and b:
            out.append(_branch(component, SWITCH, a, b, element, element.name))
    if kind in PROTECTIVE_KINDS:
        for pole in component.poles:
            a, b = net(pole.common), net(pole.no or "")
            if a and b:
                out.append(_branch(component, CONDUCTOR, a, b, None, component.ref))
        return
    if kind in SWITCHING_KINDS or len(connections) != 2:
        return
    first, second = connections[0].terminal, connections[1].terminal
    if _END(second, 2) < _END(first, 2):
        first, second = second, first
    role = LOAD if kind == "load" else kind
    ends = net(first), net(second)
    out.append(_branch(component, role, *ends, None, component.ref))


def _same_branches(netlist) -> int:  # type: ignore[no-untyped-def]
    from netcheck.graph import _add_branches

    count = 0
    for component in netlist.components:
        mine, former = [], []
        _add_branches(component, mine)
        _former_add_branches(component, former)
        assert [b.__dict__ for b in mine] == [b.__dict__ for b in former]
        count += len(mine)
    return count


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.parent.name)
def test_sample_branches_are_the_former_ones(path):
    assert _same_branches(load_design(path)) > 0


@pytest.mark.parametrize("shape", ["mixed", "unsuppressed", "plc", "series"])
def test_generated_branches_are_the_former_ones(tmp_path, shape):
    gen_design.generate(400, tmp_path, shape=shape)
    assert _same_branches(load_design(tmp_path / "design.cnet")) > 100


def test_two_terminal_parts_of_every_kind_and_order(tmp_path):
    """Ends ordered by terminal (1/+/A first, else as written), several kinds."""
    text = "\n".join(
        [
            "supply G1 dc=24V +:P -:M",
            "load E1 R=10ohm 2:X 1:Y",
            "load E2 R=10ohm 1:X 2:Y",
            "resistor R1 R=1kohm 2:P 1:X",
            "diode V1 K:P A:X",
            "diode V2 A:X K:M",
            "capacitor C1 C=1uF 2:X 1:M",
        ]
    )
    path = tmp_path / "d.cnet"
    path.write_text(text + "\n")
    netlist = load_design(path)
    assert _same_branches(netlist) == 7
    ends = {b.ref: (b.a, b.b) for b in build_graph(netlist).branches}
    assert ends["E1"] == ("Y", "X") and ends["R1"] == ("X", "P")
    assert ends["V1"] == ("X", "P") and ends["C1"] == ("M", "X")
