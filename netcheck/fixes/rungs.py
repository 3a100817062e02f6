"""Rungs: the few elements an edit can change, re-analysed on their own.

A re-check solves the edited domains in full (the closed-state operating
point, the zero-ohm groups, the suppressor chains), but analyses the opening
of only some elements and decides only their findings; the rest of the design
is shown to keep its findings. Why that equals re-checking the whole design:

*Bus and rungs.* In a solved DC domain the *bus* is every net joined to a
supply terminal by wires, fuses and breakers (``DomainState.wire``). Removing
the bus leaves *units*: nets joined through components (every net of one
component is in one unit, so a relay's coil and contacts stay together, across
domains too). A *bus component* has bus nets only (a fuse, a lamp across the
rails, the supply itself).

*Rung-local elements.* An element whose searched side (``ZeroOhm.sides``, the
smaller side, its bypass open) holds no bus net, with no bypass or a bypass
block of off-bus nets only (parallel contacts inside a rung: the block and
its bypass are its unit's own, the same in the edited design, see
``opened_side``), in the domain's main state,
reads only its own unit: its side and the injections into it (branch currents
of its unit: the closed-state solve fixes rails at the supply EMF and solves
each internal component alone, and currents between fixed nodes are per
branch), the cut-off region and its solve (nets of its floating side and the
internal components they touch, all in its unit), the chains at its nets and
its loads' nets (chains pass only through nets with two suppressor
connections, never a bus net, which always has a supply, fuse or breaker
connection), and its sag (its own current). The side it gets stays the same in
the edited design when its other side stays at least one net larger: the
*slack* of each rail group (``|group| - 2·|side| - 1``, least over its
rung-local elements) must cover the nets of the touched units in the group.
Every other element is *global* (bus elements, low-side contacts whose side is
the negative rail, elements bypassed through a load or by a block that holds a
bus net, changeover elements).

*The cut.* Let X be the units the edits touch (nets of the edited components,
before and after). Re-analysed (``analyse(only=...)``): X's components, the
added ones, and every global element of the domains X reaches. Decided: X's
components and nets, the new nets and parts, the bus nets the edits touch, the
supplies of those domains, and the bus components whose elements switch a load
of X. Their findings equal the whole design's: their analyses are computed by
the same code on the same solved domains, and whatever a rule reads beside
(the suppressors fitted, each by the first element by name that switches its
load: an element of X or a global one; series partners: the same loads, so
the same elements) is among the re-analysed elements or full-domain data.

*The rest keeps its findings.* Rung-local elements of other units: unchanged,
above. Global elements are compared with the original analysis after the
re-check: one that switches no load of X must be unchanged in full; one that
does must keep its voltage and its view of every other load (the suppressors
of other units are fitted from it). Bus components with nothing switched from
X, other units' components and untouched bus nets then read unchanged inputs.
If a comparison fails, or an edit is a bus component (its edit could change
chains across the rails or a bypass), a supply or a fuse or breaker (they
move rails and the bus), or reaches an unsolved domain, the
verifier re-checks the whole cluster instead (:mod:`netcheck.fixes.locality`).
Where the domains X reaches have no global element, the re-check need not
build the cluster at all: :mod:`netcheck.fixes.slices` analyses X and the bus.
"""

from __future__ import annotations

from collections.abc import Container, Iterable, Sequence
from dataclasses import dataclass, fields

from netcheck.analysis.domain import DomainState, shunts
from netcheck.analysis.elements import Analysis
from netcheck.analysis.switched import ElementAnalysis, Suppressor, SwitchedLoad
from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.fixes.edits import AddComponent, Edit, Reconnect, Remove
from netcheck.graph import CONDUCTOR, SUPPLY, SWITCH, Branch, Domain
from netcheck.kinds import PROTECTIVE_KINDS
from netcheck.model import Component, Netlist

__all__ = ["Rungs", "Restricted"]

_BUS_KINDS = PROTECTIVE_KINDS | {"supply"}


class _Unit:
    """One unit: its nets and the components that touch them (by identity)."""

    __slots__ = ("nets", "refs")

    def __init__(self, nets: frozenset[str], refs: frozenset[str]) -> None:
        self.nets = nets
        self.refs = refs


@dataclass(frozen=True)
class Restricted:
    """What one re-check analyses (component refs) and decides (names)."""

    only: frozenset[str]
    decided: frozenset[str]
    domains: frozenset[str]
    x_refs: frozenset[str]  # components of the touched units and the added ones

    @property
    def cost(self) -> int:
        """Components whose elements are re-analysed."""
        return len(self.only)


class Rungs:
    """Bus, units, global elements and rail-group slack of an analysed design.

    The bus is worked out for every solved domain at once; a unit, and the
    global elements and slack of a domain, when a plan first reaches them
    (what each reads is its own: a unit's nets and components, a domain's
    branches and state), so the re-checks of a few rungs do not pay for
    every rung of the design.
    """

    def __init__(self, netlist: Netlist, analysis: Analysis) -> None:
        self.netlist = netlist
        self.analysis = analysis
        graph = analysis.graph
        self.bus: set[str] = set()
        self.solved: set[str] = set()
        for domain in graph.domains:
            state = analysis.states.get(domain.name)
            if domain.kind == "dc" and state is not None and state.domain is not None:
                self._add_bus(domain, state)
        self._connections = graph.connections
        self._unit_of: dict[str, _Unit] = {}
        self._domain = {d.name: d for d in graph.domains}
        self.globals: dict[str, list[str]] = {}  # domain -> element names
        self.group: dict[str, str] = {}  # net -> rail group (solved domains)
        self.slack: dict[str, int] = {}  # rail group -> slack

    def _add_bus(self, domain: Domain, state: DomainState) -> None:
        terminals = {n for b in domain.branches if b.role == SUPPLY for n in (b.a, b.b)}
        reps = {state.wire[t] for t in terminals}
        self.bus.update(n for n in domain.nets if state.wire[n] in reps)
        self.solved.add(domain.name)

    def on_bus(self, component: Component) -> bool:
        """Whether every net of ``component`` is a bus net (a bus component)."""
        bus = self.bus
        return all(c.net in bus for c in component.connections)

    def _bus_branch(self, branch: Branch) -> bool:
        """Whether ``branch`` belongs to a bus component (its own ends first)."""
        bus = self.bus
        return branch.a in bus and branch.b in bus and self.on_bus(branch.component)

    def is_bus_ref(self, ref: str) -> bool:
        """Whether ``ref`` names a bus component of the design."""
        component = self.netlist.component(ref)
        return component is not None and self.on_bus(component)

    def unit(self, net: str) -> _Unit | None:
        """The unit of ``net``: None for a bus net or a net no component has.

        Nets joined through components, the bus left out (every net of one
        component in one unit); found by a search from ``net``, once per unit.
        """
        known = self._unit_of.get(net)
        if known is not None or net in self.bus or net not in self._connections:
            return known
        bus, connections = self.bus, self._connections
        nets, refs, todo = {net}, set(), [net]
        while todo:
            for component, _ in connections[todo.pop()]:
                if component.ref in refs:
                    continue
                refs.add(component.ref)
                for c in component.connections:
                    if c.net not in bus and c.net not in nets:
                        nets.add(c.net)
                        todo.append(c.net)
        unit = _Unit(frozenset(nets), frozenset(refs))
        for member in nets:
            self._unit_of[member] = unit
        return unit

    def _classified(self, names: Iterable[str]) -> None:
        """Classify the elements of the solved domains ``names`` not yet done."""
        for name in names:
            if name not in self.globals and name in self.solved:
                self._classify(self._domain[name], self.analysis.states[name])

    def _classify(self, domain: Domain, state: DomainState) -> None:
        closed = [
            b
            for b in domain.branches
            if b.role in (SWITCH, CONDUCTOR) and state.group[b.a] == state.group[b.b]
        ]
        zero = ZeroOhm(closed, shunts(state))
        found = self.globals.setdefault(domain.name, [])
        for net, group in state.group.items():
            if group in state.rails:
                self.group[net] = group
        for branch in domain.branches:
            if branch.role != SWITCH or branch.element is None:
                continue
            if not self._local(branch, zero, state):
                found.append(branch.element.name)

    def _local(self, branch, zero: ZeroOhm, state: DomainState) -> bool:  # type: ignore[no-untyped-def]
        key = branch.key
        if key in state.opened or self._bus_branch(branch):
            return False
        side = opened_side(zero, key, self.bus)
        if side is None or any(net in self.bus for net in side):
            return False
        if not side:
            return True
        group = state.group[branch.a]
        if group not in state.rails:
            return True
        slack = len(state.group_nets[group]) - 2 * len(side) - 1
        if slack < 0:
            return False
        self.slack[group] = min(self.slack.get(group, slack), slack)
        return True

    def plan(self, edits: Sequence[Edit]) -> Restricted | None:
        """The restricted re-check of ``edits``, or None if it cannot be exact."""
        nets: set[str] = set()
        added: set[str] = set()
        for edit in edits:
            final = self._final_nets(edit)
            if final is None or all(n in self.bus for n in final):
                return None  # a bus component: chains across the rails, bypasses
            nets |= final | self._old_nets(edit)
            if isinstance(edit, AddComponent):
                added.add(edit.ref)
        units = {u for n in nets if (u := self.unit(n)) is not None}
        x_nets = set().union(*(u.nets for u in units)) if units else set()
        domains = self._domains(x_nets | (nets & self.bus))
        if domains is None:
            return None
        self._classified(domains)
        if not self._slack_covers(x_nets):
            return None
        x_refs = set(added).union(*(u.refs for u in units))
        only = set(x_refs)
        for name in domains:
            only.update(n.split(":", 1)[0] for n in self.globals.get(name, ()))
        decided = only - self._global_refs(domains) | x_refs | x_nets
        decided |= {n for n in nets if self.unit(n) is None} | (nets & self.bus)
        decided |= {s.ref for name in domains for s in self._supplies(name)}
        decided |= self._bus_switching_x(domains, x_refs)
        return Restricted(
            frozenset(only), frozenset(decided), frozenset(domains), frozenset(x_refs)
        )

    def _final_nets(self, edit: Edit) -> set[str] | None:
        """The nets of the edited component afterwards; None: not a rung's part.

        A supply or a protective device would move rails or the bus itself.
        """
        if isinstance(edit, AddComponent):
            if edit.kind in _BUS_KINDS:
                return None
            return {net for _, net in edit.connections}
        component = self.netlist.component(edit.ref)
        if component is None or self.on_bus(component):
            return None
        if component.kind in _BUS_KINDS:
            return None
        wiring = {c.terminal: c.net for c in component.connections}
        if isinstance(edit, Reconnect):
            wiring.update(dict(edit.connections))
        if isinstance(edit, Remove):
            return {net for net in wiring.values() if self.unit(net) is not None}
        return set(wiring.values())

    def _old_nets(self, edit: Edit) -> set[str]:
        ref = edit.after if isinstance(edit, AddComponent) else edit.ref
        component = self.netlist.component(ref)
        if component is None or isinstance(edit, AddComponent):
            return set()
        return {c.net for c in component.connections}

    def _domains(self, nets: Iterable[str]) -> set[str] | None:
        domain_of = self.analysis.graph.domain_of
        out: set[str] = set()
        for net in nets:
            domain = domain_of.get(net)
            if domain is None:
                continue  # a new net: it joins the domains of the nets beside it
            if domain.name not in self.solved:
                return None
            out.add(domain.name)
        return out

    def _slack_covers(self, x_nets: set[str]) -> bool:
        per_group: dict[str, int] = {}
        for net in x_nets:
            group = self.group.get(net)
            if group is not None:
                per_group[group] = per_group.get(group, 0) + 1
        return all(self.slack.get(g, count) >= count for g, count in per_group.items())

    def _supplies(self, name: str) -> Sequence:  # type: ignore[type-arg]
        return self.analysis.states[name].domain.supplies

    def _global_refs(self, domains: Iterable[str]) -> set[str]:
        return {
            n.split(":", 1)[0] for name in domains for n in self.globals.get(name, ())
        }

    def _bus_switching_x(self, domains: Iterable[str], x_refs: set[str]) -> set[str]:
        """Bus components with an element switching a load of the touched units."""
        out = set()
        for name in domains:
            for element in self.globals.get(name, ()):
                ref = element.split(":", 1)[0]
                original = self.analysis.elements.get(element)
                if original is not None and self.is_bus_ref(ref):
                    if any(ld.facts.ref in x_refs for ld in original.loads):
                        out.add(ref)
        return out

    def unchanged(self, analysis: Analysis, plan: Restricted) -> bool:
        """Whether every global element's part the rest of the design reads is kept.

        A bus element that switches a load of X is decided, but its voltage
        and its view of other loads must stay; every other global element must
        stay as it was in full (series marks apart, recomputed from the same).
        """
        for name in plan.domains:
            for element in self.globals.get(name, ()):
                before = self.analysis.elements.get(element)
                after = analysis.elements.get(element)
                if before is None or after is None:
                    return False
                x = plan.x_refs
                switched = any(
                    ld.facts.ref in x for ld in (*before.loads, *after.loads)
                )
                if not switched and _whole(before) != _whole(after):
                    return False
                if switched and element.split(":", 1)[0] not in plan.decided:
                    return False  # its own findings would go undecided
                if switched and (
                    before.voltage != after.voltage
                    or _others(before, x) != _others(after, x)
                ):
                    return False
        return True


def opened_side(zero: ZeroOhm, key: str, bus: Container[str]) -> set[str] | None:
    """The side ``open_element`` finds for ``key``, if it can be rung-local.

    That is the smaller side with the element and its bypass open
    (``ZeroOhm.sides``). None where the element is not closed, a bypass runs
    through a load, or its bypass block holds a bus net: a block of off-bus
    nets has only its unit's branches (a zero-ohm path out of it stays in
    the unit until it meets the bus), and an edit elsewhere could join it to
    a larger cycle only through two rails its unit already joins, which puts
    a bus net on both sides of the element (global), so its bypass is the
    same in the edited design.
    """
    if key not in zero.by_key or zero.bypass_through_load(key):
        return None
    bypass = zero.bypass(key)
    if bypass:
        block = zero.blocks[zero.block_of[key]]
        ends = (zero.by_key[k] for k in block)
        if any(b.a in bus or b.b in bus for b in ends):
            return None
    side, _ = zero.sides(key, set(bypass))
    return side


def _suppressors(suppressors: Iterable[Suppressor]) -> tuple:  # type: ignore[type-arg]
    out = []
    for s in suppressors:
        chain = s.chain
        shape = None
        if chain is not None:
            shape = (
                chain.kind,
                chain.a,
                chain.b,
                tuple(b.key for b in chain.branches),
                tuple(sorted(chain.polarity.items())),
            )
        out.append(
            (s.kind, s.placement, s.refs, s.load, s.conducts, s.functional, shape)
        )
    return tuple(out)


# What a re-check compares field by field, every field but these: the element
# and component are the edited copy's own objects, and series marking is
# design-wide (``mark_series``) while a restricted re-check analyses a few.
_NOT_COMPARED = frozenset(
    {"element", "component", "series_poles", "series_elements", "other_series"}
)


def _fields(
    item: ElementAnalysis | SwitchedLoad, skip: frozenset[str] = frozenset()
) -> tuple:  # type: ignore[type-arg]
    """A result's fields as comparable values, its loads and suppressors by shape."""
    out = []
    for f in fields(item):
        if f.name in skip:
            continue
        value = getattr(item, f.name)
        if f.name == "loads":
            value = tuple(_fields(ld) for ld in value)
        elif f.name in ("suppression", "suppressors"):
            value = _suppressors(value)
        out.append(value)
    return tuple(out)


def _others(element: ElementAnalysis, x_refs: frozenset[str]) -> tuple:  # type: ignore[type-arg]
    return tuple(_fields(ld) for ld in element.loads if ld.facts.ref not in x_refs)


def _whole(e: ElementAnalysis) -> tuple:  # type: ignore[type-arg]
    return _fields(e, _NOT_COMPARED)
