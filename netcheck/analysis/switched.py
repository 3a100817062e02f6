"""What each switching element must break: its switched circuit and its numbers."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from itertools import repeat

import pint

from netcheck.analysis.cut_solve import Row, solve_shape
from netcheck.analysis.domain import DomainState
from netcheck.analysis.loads import LoadFacts
from netcheck.analysis.suppression import Chain
from netcheck.analysis.zero_ohm import ZeroOhm
from netcheck.graph import SUPPLY, Branch
from netcheck.model import Component, SwitchingElement

__all__ = [
    "SwitchedLoad",
    "Suppressor",
    "ElementAnalysis",
    "with_fields",
    "Opening",
    "open_element",
    "net_injections",
]

# A load "loses supply" when opening the element takes away more than this
# share of its current (a modelling choice: a load merely re-routed keeps it).
LOST_SHARE = 0.5
_TINY = 1e-9  # A


@dataclass(frozen=True)
class Suppressor:
    """A suppressor found for an element: where it sits and what it is."""

    kind: str  # diode, diode-zener, zener, tvs, varistor, rc, capacitor, resistor, ...
    placement: str  # across-load, across-element, built-in
    refs: tuple[str, ...]
    load: str | None  # the load's reference (across-load, built-in)
    chain: Chain | None = None
    conducts: bool = False  # conducts in normal operation (e.g. a reversed diode)
    functional: bool = True  # can carry the load's current at opening

    def __init__(
        self,
        kind: str,
        placement: str,
        refs: tuple[str, ...],
        load: str | None,
        chain: Chain | None = None,
        conducts: bool = False,
        functional: bool = True,
    ) -> None:
        # The frozen dataclass's __init__ without its object.__setattr__ calls.
        fields = self.__dict__
        fields["kind"] = kind
        fields["placement"] = placement
        fields["refs"] = refs
        fields["load"] = load
        fields["chain"] = chain
        fields["conducts"] = conducts
        fields["functional"] = functional


@dataclass(frozen=True)
class SwitchedLoad:
    """One load that loses supply when the element opens."""

    facts: LoadFacts
    current: pint.Quantity  # before opening
    voltage: pint.Quantity  # across the load before opening
    category: str
    energy: pint.Quantity | None
    inductive: bool
    suppressors: tuple[Suppressor, ...]

    def __init__(
        self,
        facts: LoadFacts,
        current: pint.Quantity,
        voltage: pint.Quantity,
        category: str,
        energy: pint.Quantity | None,
        inductive: bool,
        suppressors: tuple[Suppressor, ...],
    ) -> None:
        # The frozen dataclass's __init__ without its object.__setattr__ calls.
        fields = self.__dict__
        fields["facts"] = facts
        fields["current"] = current
        fields["voltage"] = voltage
        fields["category"] = category
        fields["energy"] = energy
        fields["inductive"] = inductive
        fields["suppressors"] = suppressors


@dataclass(frozen=True)
class ElementAnalysis:
    """Everything the rules need about one switching element."""

    element: SwitchingElement
    component: Component
    domain: str | None
    supply: str | None  # "dc", "ac" or None
    voltage: pint.Quantity | None = None
    current: pint.Quantity | None = None
    loads: tuple[SwitchedLoad, ...] = ()
    load_category: str | None = None
    time_constant: pint.Quantity | None = None
    t95: pint.Quantity | None = None
    energy: pint.Quantity | None = None
    suppression: tuple[Suppressor, ...] = ()
    series_poles: int = 1
    series_elements: tuple[str, ...] = ()  # same device, in series (this one included)
    other_series: tuple[str, ...] = ()  # other devices' elements in series
    bypass: tuple[str, ...] = ()
    direction: int = 0  # +1 current a -> b, -1 b -> a, 0 none
    bidirectional: bool = False
    supply_ref: str | None = None
    missing: tuple[str, ...] = ()
    short_circuit: bool = False
    notes: tuple[str, ...] = field(default=())

    def __init__(
        self,
        element: SwitchingElement,
        component: Component,
        domain: str | None,
        supply: str | None,
        voltage: pint.Quantity | None = None,
        current: pint.Quantity | None = None,
        loads: tuple[SwitchedLoad, ...] = (),
        load_category: str | None = None,
        time_constant: pint.Quantity | None = None,
        t95: pint.Quantity | None = None,
        energy: pint.Quantity | None = None,
        suppression: tuple[Suppressor, ...] = (),
        series_poles: int = 1,
        series_elements: tuple[str, ...] = (),
        other_series: tuple[str, ...] = (),
        bypass: tuple[str, ...] = (),
        direction: int = 0,
        bidirectional: bool = False,
        supply_ref: str | None = None,
        missing: tuple[str, ...] = (),
        short_circuit: bool = False,
        notes: tuple[str, ...] = (),
    ) -> None:
        # The frozen dataclass's __init__ (one object.__setattr__ per field,
        # 22 of them, per switching element), written straight into
        # ``__dict__`` in the fields' order, as model.py's classes do.
        fields = self.__dict__
        fields["element"] = element
        fields["component"] = component
        fields["domain"] = domain
        fields["supply"] = supply
        fields["voltage"] = voltage
        fields["current"] = current
        fields["loads"] = loads
        fields["load_category"] = load_category
        fields["time_constant"] = time_constant
        fields["t95"] = t95
        fields["energy"] = energy
        fields["suppression"] = suppression
        fields["series_poles"] = series_poles
        fields["series_elements"] = series_elements
        fields["other_series"] = other_series
        fields["bypass"] = bypass
        fields["direction"] = direction
        fields["bidirectional"] = bidirectional
        fields["supply_ref"] = supply_ref
        fields["missing"] = missing
        fields["short_circuit"] = short_circuit
        fields["notes"] = notes

    @property
    def name(self) -> str:
        """The element's name, ``K1:13-14``."""
        return self.element.name

    @property
    def inductive_loads(self) -> tuple[SwitchedLoad, ...]:
        """The switched loads that store energy in an inductance."""
        return tuple(load for load in self.loads if load.inductive)


def with_fields(e: ElementAnalysis, **changes: object) -> ElementAnalysis:
    """``dataclasses.replace(e, **changes)`` without its per-field cost.

    ``ElementAnalysis`` is a frozen dataclass with no ``__post_init__``, every
    field set by ``__init__``, so a copy of its fields with some changed is
    what ``replace`` builds (``tests/analysis/test_opening_shortcuts.py``
    compares whole analyses built either way). Unknown names are refused.
    """
    copy = object.__new__(ElementAnalysis)
    fields = copy.__dict__
    fields.update(e.__dict__)
    for name, value in changes.items():
        if name not in fields:
            raise TypeError(f"ElementAnalysis has no field {name!r}")
        fields[name] = value
    return copy


@dataclass(frozen=True)
class Opening:
    """The raw result of opening one element (SI floats)."""

    current_ab: float  # closed-state current a -> b
    voltage_ab: float  # V(a) - V(b) once open
    switched: tuple[str, ...]  # keys of load branches that lose supply
    bypass: tuple[str, ...]
    floating_nets: frozenset[str]

    def __init__(
        self,
        current_ab: float,
        voltage_ab: float,
        switched: tuple[str, ...],
        bypass: tuple[str, ...],
        floating_nets: frozenset[str],
    ) -> None:
        # The frozen dataclass's __init__ without its object.__setattr__ calls.
        fields = self.__dict__
        fields["current_ab"] = current_ab
        fields["voltage_ab"] = voltage_ab
        fields["switched"] = switched
        fields["bypass"] = bypass
        fields["floating_nets"] = floating_nets


def net_injections(state: DomainState) -> dict[str, float]:
    """Current leaving each net into non-zero-ohm branches (supplies included)."""
    injection: dict[str, float] = {}
    for key, current in state.currents.items():
        branch = state.branch_by_key.get(key)
        if branch is None:
            continue
        injection[branch.a] = injection.get(branch.a, 0.0) + current
        injection[branch.b] = injection.get(branch.b, 0.0) - current
    # A supply delivers what its rail group draws (all into its + terminal).
    per_group: dict[str, float] = {}
    for net, value in injection.items():
        group = state.group[net]
        per_group[group] = per_group.get(group, 0.0) + value
    for branch in state.domain.branches:
        if branch.role != SUPPLY:
            continue
        for net in (branch.a, branch.b):
            group = state.group[net]
            if group in per_group:
                injection[net] = injection.get(net, 0.0) - per_group.pop(group)
    return injection


def _floating_side(
    state: DomainState, side: set[str], terminals: set[str], group: str
) -> tuple[set[str], bool]:
    """The side that loses its supply; the flag says it is the searched side."""
    if group in state.rails and side & terminals:
        return set(state.group_nets[group]) - side, False
    return side, True


def _region(state: DomainState, floating: set[str], group: str) -> set[str]:
    """Branch keys whose currents can change when ``floating`` is cut off."""
    comps = set()
    keys: set[str] = set()
    attached, models = state.attached, state.models
    internal_of, net_group = state.internal_of, state.group
    for net in floating:
        for branch in attached.get(net, ()):
            key = branch.key
            if key not in models:
                continue
            keys.add(key)
            comp = internal_of.get(net_group[branch.a])
            if comp is not None:
                comps.add(comp)
            comp = internal_of.get(net_group[branch.b])
            if comp is not None:
                comps.add(comp)
    if group not in state.rails and group in internal_of:
        comps.add(internal_of[group])
    for comp in comps:
        keys |= state.comp_branches.get(comp, set())
    return keys


def _attached_nets(state: DomainState) -> set[str]:
    """Nets with a branch of a circuit model (``state.models``) attached.

    Kept in ``state.cache``; it reads ``state.attached`` and ``state.models``,
    both fixed once the domain is solved.
    """
    nets: set[str] | None = state.cache.get("model-nets")  # type: ignore[assignment]
    if nets is None:
        models = state.models
        nets = state.cache["model-nets"] = {  # type: ignore[assignment]
            net
            for net, branches in state.attached.items()
            if any(b.key in models for b in branches)
        }
    return nets  # type: ignore[return-value]


def _rows(
    state: DomainState, keys: list[str], active: frozenset[str], node: str
) -> tuple[list[Row], set[str]]:
    """Each key's branch with its ends as nodes (``active`` nets are ``node``).

    ``state.model``'s renaming, with the nodes met; the model is the state's.
    """
    by_key, group, models = state.branch_by_key, state.group, state.models
    rows: list[Row] = []
    ends: set[str] = set()
    for key in keys:
        branch = by_key[key]
        a = node if branch.a in active else group[branch.a]
        b = node if branch.b in active else group[branch.b]
        rows.append((key, a, b, models[key]))
        ends.add(a)
        ends.add(b)
    return rows, ends


def _cut_off(
    state: DomainState, floating: set[str], group: str
) -> tuple[float, float, tuple[str, ...]]:
    """The circuit with ``floating`` cut off from ``group``, solved once per cut.

    Returns the potentials of ``<open>`` and ``group`` in the region's
    solution (what is read of it) and the loads that lose supply. The region
    is the branches of a circuit model attached to floating nets, with the
    internal components they touch. Nets without a model branch attached
    change nothing: the region is found through the branches attached to
    floating nets, and only model branches' ends are renamed. So the cut is
    keyed on the floating nets that have one, with ``group``: contacts in
    parallel (20 start buttons OR-ed) and contacts in series (30 interlocks
    before one coil) share one solve. The memo lives in ``state.cache`` and
    reads nothing but the state and the key; cuts of one shape under other
    names share a solve too (``cut_solve.solve_shape``, memo in the state).
    """
    cache = state.cache
    memo = cache.get("cut-off")
    if memo is None:
        memo = cache["cut-off"] = {}
    active = frozenset(floating & _attached_nets(state))
    key = (active, group)
    found = memo.get(key)  # type: ignore[attr-defined]
    if found is None:
        found = memo[key] = _solve_cut(state, active, group)  # type: ignore[index]
    return found  # type: ignore[no-any-return]


def _solve_cut(
    state: DomainState, active: frozenset[str], group: str
) -> tuple[float, float, tuple[str, ...]]:
    """``_cut_off`` of the floating nets with a model branch, worked out."""
    node = "<open>"
    ordered = sorted(_region(state, set(active), group))
    rows, ends = _rows(state, ordered, active, node)
    ends.add(node)
    ends.add(group)
    nodes = sorted(ends)
    rails = state.rails
    fixed = {n: rails[n] for n in nodes if n in rails and n != node}
    cache = state.cache
    shapes = cache.get("cut-shapes")
    if shapes is None:
        shapes = cache["cut-shapes"] = {}
        cache["cut-values"] = {}
    values: dict = cache["cut-values"]  # type: ignore[assignment]
    v_open, v_group, flows = solve_shape(
        nodes, fixed, rows, node, group, shapes, values
    )
    facts, before = state.facts, state.currents
    switched = []
    for k, flow in zip(ordered, flows, strict=True):
        if k in facts:
            was = abs(before.get(k, 0.0))
            if was > _TINY and abs(flow) < LOST_SHARE * was:
                switched.append(k)
    return v_open, v_group, tuple(switched)


def open_element(
    state: DomainState,
    zero: ZeroOhm,
    injection: Mapping[str, float],
    terminals: set[str],
    branch: Branch,
) -> Opening:
    """Open one element in its worst case: series elements closed, bypasses open."""
    bypass = zero.bypass(branch.key)
    side, end = zero.sides(branch.key, set(bypass))
    if not side:
        return Opening(0.0, 0.0, (), bypass, frozenset())
    # Each net's injection in the side's own order, as a generator would.
    flow = sum(map(injection.get, side, repeat(0.0, len(side))))
    current_ab = flow if end == "b" else -flow
    group = state.group[branch.a]
    floating, searched = _floating_side(state, side, terminals, group)
    floating_end = end if searched else ("a" if end == "b" else "b")
    v_float, v_rest, switched = _cut_off(state, floating, group)
    voltage_ab = (v_rest - v_float) if floating_end == "b" else (v_float - v_rest)
    return Opening(current_ab, voltage_ab, switched, bypass, frozenset(floating))
