"""Slices: a restricted re-check of the touched rungs and the bus alone.

A restricted re-check (:mod:`netcheck.fixes.rungs`) decides the findings of
the touched units X, the bus nets the edits touch and the domains' supplies.
Where the domains X reaches have no global element and one supply each, those
findings depend on X and the bus only, so the *slice* (X's components, edited,
and the domains' bus components, in design order) is built, analysed and
checked as a design of its own, and the rest of the cluster is never read.
Why each decided finding equals the whole design's:

*Rails.* The bus nets keep their zero-ohm groups when the slice's partition of
them equals the original design's (another unit could join two bus nets; the
edit could join or part them): checked, with every bus net's potential, after
the slice is solved. Rail potentials follow from the supply branches over that
partition, so the edited design has them too.

*Groups, solves, injections.* A net of X off the bus has every connection in
X, and so do its group (non-rail groups lie within a unit) and its internal
component (solved alone between fixed rails: same unknowns, same models in the
same order, the rails' names aside). Branch currents, potentials, the diode
states, the shorts that touch X (conducting paths through X's groups, or one
diode of X from rail to rail) and the injections into X's nets (sums over X's
branches, in their order) are the edited design's.

*Elements of X.* Each must have, in the slice, a side (``ZeroOhm.sides``, its
bypass open) that holds no bus net, and no bypass or a bypass block of off-bus
nets only (``rungs.opened_side``: X's own branches): then that side is closed
in the whole design too (its nets' branches are X's), the bypass the same,
the other side only larger, so the side, the
cut-off region and its solve are the same; a changeover (a second solved
state) falls back. The making current at closing solves the whole domain's
network: an element with a stated making current, or switching a lamp or a
motor, falls back.

*Chains and loads.* A chain through a net of X off the bus is X's (its inner
nets have two connections), a chain between two bus nets is a bus component's
or passes through a unit's nets; chains are keyed by wire groups, so those a
decided element or load reads are found in the slice. The degree of a bus net
(what makes a net inner) is its whole connection list, which the slice's graph
is given, the edit applied, in design order; nets of the same name but case
are given too (the hint of a single-connection net names them).

*Loads across the bus.* A load whose nets are bus nets of different zero-ohm
groups (a pilot lamp across the rails) is left out of the slice where the
domain's bus components are only its supply, fuses, breakers and such loads
and its solved state has no short: with the rails at their potentials (the
check above) such a load draws its own current and nothing else reads it. It
is no chain's part, no shunt, no short's; no suppressor sits across it; the
decided findings (X's, the touched bus nets' by their whole connection
lists, the supply's: its group ends and prospective current) never read it.
Its own findings are not decided.

*Checks.* The suppressors fitted (each by the first element by name switching
its load: one of X, the domain having no global one), series partners (same
loads), service and standing voltages (potentials above), reversed diodes and
shorts read X's data and the rails. A supply's own findings read its group
ends and the prospective current. If any condition fails the verifier takes
the restricted re-check of the whole cluster instead.
"""

from __future__ import annotations

from bisect import bisect_left, bisect_right
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, replace
from functools import cached_property

from netcheck.analysis.domain import DomainState, shunts
from netcheck.analysis.elements import Analysis, analyse
from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.fixes.edits import AddComponent, Edit, apply_edits
from netcheck.fixes.rungs import Restricted, Rungs, opened_side
from netcheck.graph import CONDUCTOR, SWITCH, Graph, build_graph
from netcheck.model import Component, Netlist

__all__ = ["Slices", "Slice"]


@dataclass(frozen=True)
class Slice:
    """One edited slice: its design, graph and analysis."""

    netlist: Netlist
    graph: Graph
    analysis: Analysis


class Slices:
    """Slices of an analysed design, for the restricted re-checks that allow one."""

    def __init__(self, rungs: Rungs) -> None:
        self.rungs = rungs
        self._bus_of: dict[str, tuple[list[str], list[str]]] = {}

    @cached_property
    def position(self) -> dict[str, int]:
        """Each component's place in the design."""
        return {c.ref: i for i, c in enumerate(self.rungs.netlist.components)}

    @cached_property
    def bus_nets(self) -> dict[str, list[str]]:
        """The bus nets of each solved domain, sorted."""
        domain_of = self.rungs.analysis.graph.domain_of
        out: dict[str, list[str]] = {}
        for net in sorted(self.rungs.bus):
            out.setdefault(domain_of[net].name, []).append(net)
        return out

    @cached_property
    def folded(self) -> dict[str, list[str]]:
        """The design's nets by their names in lower case."""
        out: dict[str, list[str]] = {}
        for net in self.rungs.analysis.graph.connections:
            out.setdefault(net.lower(), []).append(net)
        return out

    def bus_components(self, name: str) -> tuple[list[str], list[str]]:
        """Domain ``name``'s bus components: (held in a slice, left out).

        Those whose first net is in the domain, found from its bus nets (a bus
        component has no other), each met at its first connection; the loads
        across the bus are left out where the domain allows (module
        docstring). Once per domain.
        """
        found = self._bus_of.get(name)
        if found is None:
            connections = self.rungs.analysis.graph.connections
            on_bus = self.rungs.on_bus
            seen: set[str] = set()
            parts: list[Component] = []
            for net in self.bus_nets.get(name, ()):
                for component, _ in connections[net]:
                    first = component.connections[0].net
                    if first == net and component.ref not in seen and on_bus(component):
                        seen.add(component.ref)
                        parts.append(component)
            held, apart = parts, []
            if _loads_apart(parts, self.rungs.analysis.states[name]):
                held = [c for c in parts if c.kind != "load"]
                apart = [c for c in parts if c.kind == "load"]
            found = self._bus_of[name] = ([c.ref for c in held], [c.ref for c in apart])
        return found

    def allows(self, plan: Restricted, edits: Sequence[Edit]) -> bool:
        """Whether ``plan`` can be re-checked by slice: see the module's docstring.

        Its domains have no global element, one supply and no changeover, and
        every component an edit changes is in the slice.
        """
        states = self.rungs.analysis.states
        refs = plan.x_refs
        if any(not isinstance(e, AddComponent) and e.ref not in refs for e in edits):
            return False
        return bool(plan.domains) and all(
            not self.rungs.globals.get(name)
            and len(states[name].domain.supplies) == 1
            and name not in self.rungs.analysis.alternate_states
            for name in plan.domains
        )

    def cost(self, plan: Restricted) -> int:
        """Components charged for the slice's re-check: the slice itself.

        The loads across the bus it leaves out are charged all the same: a
        re-check has fixed costs that a few components would not cover, and
        the fixes verified within the budget stay those of the full slice.
        """
        return len(self.refs(plan, charged=True))

    def refs(self, plan: Restricted, charged: bool = False) -> set[str]:
        """The slice's components of the original design (edits not applied).

        ``charged``: with the bus loads left out of it (:meth:`cost`).
        """
        refs = {r for r in plan.x_refs if r in self.position}
        for name in plan.domains:
            held, apart = self.bus_components(name)
            refs.update(held)
            if charged:
                refs.update(apart)
        return refs

    def build(self, edited: Netlist, plan: Restricted) -> Slice:
        """The edited slice (:meth:`edited`) with its graph and analysis."""
        graph = build_graph(edited)
        graph.connections = self._connections(graph, edited, plan)
        return Slice(edited, graph, analyse(graph))

    def edited(self, edits: Sequence[Edit], plan: Restricted) -> Netlist:
        """The slice with ``edits`` applied; raises what ``apply_edits`` raises.

        Its waivers are those a decided finding could match (a waiver is
        matched by the finding's element or its device), in the design's order.
        """
        design = self.rungs.netlist
        positions = sorted(self.position[ref] for ref in self.refs(plan))
        kept = tuple(design.components[i] for i in positions)
        decided = plan.decided
        waivers = tuple(
            w
            for w in design.waivers
            if w.target in decided or w.target.split(":", 1)[0] in decided
        )
        sliced = replace(design, components=kept, waivers=waivers)
        return apply_edits(sliced, edits, context=design)

    def _connections(
        self, graph: Graph, edited: Netlist, plan: Restricted
    ) -> dict[str, list[tuple[Component, str]]]:
        """The slice's nets with their whole connection lists, edits applied.

        A net no component of X touches, before or after, keeps its list; the
        others get the list of the edited design, in its order (the design's,
        added components last).
        """
        original = self.rungs.analysis.graph.connections
        x = plan.x_refs
        order = len(self.position)
        extra = {
            c.ref: order + i
            for i, c in enumerate(edited.components)
            if c.ref not in self.position
        }
        touched = {
            c.net
            for netlist in (self.rungs.netlist, edited)
            for ref in x
            if (component := netlist.component(ref)) is not None
            for c in component.connections
        }

        def place(entry: tuple[Component, str]) -> int:
            ref = entry[0].ref
            return self.position[ref] if ref in self.position else extra[ref]

        out: dict[str, list[tuple[Component, str]]] = {}
        for net, mine in graph.connections.items():
            before = original.get(net)
            if before is None:
                out[net] = mine
            elif net not in touched:
                out[net] = before
            else:
                out[net] = _merged(before, mine, x, place, self.position)
        for net in list(out):
            for twin in self.folded.get(net.lower(), ()):
                if twin not in out:
                    out[twin] = original[twin]
        return out

    def exact(self, piece: Slice, plan: Restricted) -> bool:
        """Whether the slice's decided findings are the whole design's (docstring)."""
        original = self.rungs.analysis
        for name in plan.domains:
            state = piece.analysis.states.get(name)
            if state is None or name in piece.analysis.alternate_states:
                return False
            before = original.states[name]
            if [s.ref for s in state.domain.supplies] != [
                s.ref for s in before.domain.supplies
            ]:
                return False
            if not _same_rails(before, state, self.bus_nets.get(name, ())):
                return False
        return self._elements_local(piece, plan)

    def _elements_local(self, piece: Slice, plan: Restricted) -> bool:
        analysis = piece.analysis
        zeros: dict[str, ZeroOhm] = {}
        for component in piece.netlist.components:
            if component.ref not in plan.x_refs:
                continue
            for element in component.elements:
                result = analysis.elements.get(element.name)
                if result is None or result.domain not in plan.domains:
                    return False
                if _makes(result):
                    return False
                name = result.domain
                if name not in zeros:
                    zeros[name] = _zero_ohm(piece.graph, analysis, name)
                if not self._side_local(zeros[name], element.name):
                    return False
        return True

    def _side_local(self, zero: ZeroOhm, key: str) -> bool:
        side = opened_side(zero, key, self.rungs.bus)
        return bool(side) and not any(net in self.rungs.bus for net in side)


def _merged(
    before: list[tuple[Component, str]],
    mine: Iterable[tuple[Component, str]],
    x: frozenset[str],
    place: Callable[[tuple[Component, str]], int],
    position: Mapping[str, int],
) -> list[tuple[Component, str]]:
    """A net's whole connection list after the edits: X's entries from the slice.

    ``before`` is in design order (``place``); X's old entries are taken out
    and its new ones put in at their places by bisection: a bus net's list is
    long, X's entries few.
    """
    kept = list(before)
    for ref in x:
        if ref not in position:
            continue  # an added component: no old entries
        at = bisect_left(kept, position[ref], key=place)
        while at < len(kept) and kept[at][0].ref == ref:
            del kept[at]
    for entry in mine:
        if entry[0].ref in x:
            kept.insert(bisect_right(kept, place(entry), key=place), entry)
    return kept


_WIRING_KINDS = frozenset({"supply", "fuse", "breaker"})


def _loads_apart(parts: Sequence[Component], state: DomainState) -> bool:
    """Whether the bus loads among ``parts`` can be left out of the slices.

    Every part is the supply, a fuse, a breaker or a two-terminal load across
    two zero-ohm groups, and the solved state has no short.
    """
    if state.shorts or state.supply_shorts:
        return False
    group = state.group
    for part in parts:
        if part.kind in _WIRING_KINDS:
            continue
        nets = [c.net for c in part.connections]
        if part.kind != "load" or len(nets) != 2 or part.elements:
            return False
        if group.get(nets[0]) is None or group.get(nets[0]) == group.get(nets[1]):
            return False
    return True


def _same_rails(before, after, nets: Iterable[str]) -> bool:  # type: ignore[no-untyped-def]
    """The bus nets are grouped alike in both states, at the same potentials."""
    forward: dict[str, str] = {}
    backward: dict[str, str] = {}
    for net in nets:
        if net not in after.group:
            return False
        old, new = before.group[net], after.group[net]
        if forward.setdefault(old, new) != new or backward.setdefault(new, old) != old:
            return False
        if before.net_potential(net) != after.net_potential(net):
            return False
    return True


def _zero_ohm(graph: Graph, analysis: Analysis, name: str) -> ZeroOhm:
    state = analysis.states[name]
    domain = next(d for d in graph.domains if d.name == name)
    closed = [
        b
        for b in domain.branches
        if b.role in (SWITCH, CONDUCTOR) and state.group[b.a] == state.group[b.b]
    ]
    return ZeroOhm(closed, shunts(state))


def _makes(result) -> bool:  # type: ignore[no-untyped-def]
    """Whether the making check could solve the element's closing network.

    It does for a stated making current, or a lamp or motor switched (the
    category's making test): the closing network is the whole domain's.
    """
    if result.component.value("contacts", "making_current") is not None:
        return True
    return any(ld.facts.type in ("lamp", "motor") for ld in result.loads)
