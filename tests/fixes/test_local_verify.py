"""Fixes re-checked on the part of the design their edits touch.

The verifier re-checks only the cluster of domains an edit touches
(netcheck.fixes.locality), and within it analyses only the elements the edit
can change (netcheck.fixes.rungs). The reference is the whole edited design
re-checked, kept here: on every rule case, sample, bench shape (about 300
components) and the designs of tests/fixes/cut_designs (a fused bus on a
battery with internal resistance, a coil and its contacts in two domains, a
suppressor across the rails, a low-side contact, a waiver) both must give the
same verdict and the same edits for every finding. Hand-chosen edits on those
designs (one that changes the current the fuse breaks, one that bridges two
rungs, one across the rails) must give the same verdict for every finding.
Where a domain allows it, a re-check analyses only the slice of the touched
rungs and the bus (netcheck.fixes.slices): its verdicts must equal those of
the cluster re-checked (the switch ``sliced=False``) and of the whole design,
each slice's decided findings the whole edited design's, message included,
and its nets' connection lists the whole edited design's, in order.
A last test counts the components re-analysed on generated designs of two
sizes: local re-checks make the work grow with the design, whole-design
re-checks with its square.
"""

from __future__ import annotations

import sys
from dataclasses import replace
from pathlib import Path

import pytest

import netcheck.fixes.slices as slices
import netcheck.fixes.verify as verify
from netcheck.errors import InputError
from netcheck.fixes.edits import AddComponent, Reconnect, Remove, SetValues, apply_edits
from netcheck.fixes.locality import Locality
from netcheck.fixes.rungs import Rungs
from netcheck.fixes.slices import Slices
from netcheck.fixes.verify import Verifier, verify_fixes
from netcheck.graph import build_graph
from netcheck.input import load_design
from netcheck.pipeline import analyse_path, run_checks

ROOT = Path(__file__).parents[2]
BENCH = ROOT / "bench"
CUT_DESIGNS = ROOT / "tests" / "fixes" / "cut_designs"
DESIGNS = (
    sorted((ROOT / "tests" / "cases").rglob("*.cnet"))
    + sorted((ROOT / "sample_nets").rglob("*.cnet"))
    + sorted(CUT_DESIGNS.glob("*.cnet"))
)
SHAPES = ("mixed", "one-rail", "many-supplies", "series", "parallel", "sheets")
SHAPES += ("plc", "unsuppressed")


def _gen_design():  # type: ignore[no-untyped-def]
    sys.path.insert(0, str(BENCH))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH))
    return gen_design


def _verdicts(findings):  # type: ignore[no-untyped-def]
    return [(f.rule, f.element, f.key, f.verified, f.edits) for f in findings]


def _facts(finding):  # type: ignore[no-untyped-def]
    return (finding.rule, finding.element, finding.key, finding.message)


def _agree(path: Path, everything: bool = True) -> None:
    """Local and whole-design verification agree; ``everything``: all checked.

    Without ``everything`` (the larger bench designs) the default budget may
    leave fixes unchecked (None): the local verdicts are then compared with
    the budget lifted, and the budgeted ones where they were reached.
    """
    netlist, analysis = analyse_path(path)
    findings = run_checks(netlist, analysis)
    local = verify_fixes(netlist, analysis, findings)  # the default work budget
    whole = verify_fixes(netlist, analysis, findings, budget=None, local=False)
    if everything:
        assert _verdicts(local) == _verdicts(whole)
        assert all(f.verified is not None for f in local if f.fix and not f.waived)
        return
    lifted = verify_fixes(netlist, analysis, findings, budget=None)
    assert _verdicts(lifted) == _verdicts(whole)
    reached = [i for i, f in enumerate(local) if f.verified is not None]
    assert [_verdicts(local)[i] for i in reached] == [
        _verdicts(whole)[i] for i in reached
    ]


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: str(p.relative_to(ROOT)))
def test_local_recheck_agrees_with_whole_design(path: Path) -> None:
    try:
        analyse_path(path)
    except InputError:
        pytest.skip("an included sheet or an input-error case, checked elsewhere")
    _agree(path)


@pytest.mark.parametrize("shape", SHAPES)
def test_local_recheck_agrees_on_bench_shapes(shape: str, tmp_path: Path) -> None:
    _agree(_gen_design().generate(300, tmp_path, shape=shape), everything=False)


def _diode(ref: str, anode: str, cathode: str, after: str) -> AddComponent:
    attributes = (("part", "diode-1a"),)
    return AddComponent("diode", ref, attributes, (("A", anode), ("K", cathode)), after)


def _resistor(ref: str, a: str, b: str, after: str, r: str = "220ohm") -> AddComponent:
    return AddComponent("resistor", ref, (("R", r),), (("1", a), ("2", b)), after)


# (design, edits, the path the local re-check must take: restricted, whole
# part after the comparison, or whole part without trying).
EDITS = [
    ("fused-bus-110v", [_diode("VX", "L-", "W2", "Y1")], "restricted"),
    # A resistor draws more current through the fuse (no element: its rule
    # reads the supply and the wiring only).
    ("fused-bus-110v", [_resistor("RX", "W5", "L-", "Y3")], "restricted"),
    ("fused-bus-110v", [_diode("VX", "W3", "W5", "Y3")], "restricted"),  # bridges
    ("fused-bus-110v", [Remove("V3")], "restricted"),
    ("fused-bus-110v", [_diode("VX", "L-", "P1", "H1")], "whole"),  # on the bus
    ("two-domains", [_diode("VX", "M1", "W1", "K1")], "restricted"),  # the coil
    ("two-domains", [_diode("VX", "L2-", "W2", "Y1")], "restricted"),  # contacts
    ("rails-suppressor", [_diode("VX", "W2", "W1", "Y1")], "restricted"),
    ("rails-suppressor", [_diode("VX", "M", "W3", "Y2")], "restricted"),  # waived
    ("rails-suppressor", [Remove("RV1")], "whole"),  # across the rails
    # K1's low-side contact is searched on the negative rail: its current is
    # the injection into M less that of M's group, so a resistor to M in
    # another rung moves it by a rounding (0.3333333333333333[26 -> 37] A).
    ("rails-suppressor", [_resistor("RX", "W3", "M", "Y2", "150ohm")], "compared"),
]


@pytest.mark.parametrize(
    ("name", "edits", "way"), EDITS, ids=[f"{d}-{w}" for d, _, w in EDITS]
)
def test_chosen_edits_agree_with_whole_design(
    name: str, edits: list, way: str, monkeypatch: pytest.MonkeyPatch
) -> None:
    netlist, analysis = analyse_path(CUT_DESIGNS / f"{name}.cnet")
    findings = run_checks(netlist, analysis)
    rungs = Rungs(netlist, analysis)
    compared: list[bool] = []
    real = Rungs.unchanged

    def spy(self, new, plan):  # type: ignore[no-untyped-def]
        compared.append(real(self, new, plan))
        return compared[-1]

    monkeypatch.setattr(Rungs, "unchanged", spy)
    local = Verifier(
        netlist, findings, {}, None, Locality(netlist, analysis.graph), rungs
    )
    whole = Verifier(netlist, findings, {}, None)
    for finding in findings:
        assert local.passes(finding, edits) == whole.passes(finding, edits), finding
    after = local.recheck(edits)
    cut = local._result(edits)[1]  # type: ignore[index]
    decided = [f for f in whole.recheck(edits) or [] if cut.decides(f.element)]
    assert after is not None and sorted(map(_facts, after)) == sorted(
        map(_facts, decided)
    )
    expected = {"restricted": [True], "compared": [False], "whole": []}[way]
    assert compared[:1] == expected


def _work(tmp: Path, n: int, monkeypatch: pytest.MonkeyPatch) -> tuple[int, int]:
    """(components re-analysed, budget) verifying the fixes of a generated design."""
    top = _gen_design().generate(n, tmp / str(n), shape="unsuppressed")
    netlist, analysis = analyse_path(top)
    assert len(load_design(top, display_base=tmp).components) == n
    counted = [0]
    real = verify.analyse

    def counting(graph, only=None):  # type: ignore[no-untyped-def]
        # Counted apart from the budget: a restricted re-check analyses the
        # elements of ``only`` and makes passes over the part (RESTRICTED_SHARE).
        size = len(graph.netlist.components)
        if only is None:
            counted[0] += size
        else:
            numerator, denominator = verify.RESTRICTED_SHARE
            counted[0] += len(only) + -(-size * numerator // denominator)
        return real(graph, only)

    def slice_counting(graph):  # type: ignore[no-untyped-def]
        counted[0] += len(graph.netlist.components)  # a slice is analysed whole
        return real(graph)

    monkeypatch.setattr(verify, "analyse", counting)
    monkeypatch.setattr(slices, "analyse", slice_counting)
    findings = verify_fixes(netlist, analysis, run_checks(netlist, analysis))
    monkeypatch.setattr(verify, "analyse", real)
    monkeypatch.setattr(slices, "analyse", real)
    assert any(f.verified for f in findings)
    return counted[0], verify.work_budget(netlist)


def test_recheck_work_grows_linearly(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """The re-checks of ``check`` cost at most a fixed multiple of the design.

    The generated shape puts up to a few thousand components in one domain, so
    at these sizes a re-check is half the design or all of it: the work budget,
    not the cut, is what bounds the work. The whole design re-checked 64 times
    (the former count budget) would be 51,200 components at 800.
    """
    small, small_budget = _work(tmp_path, 200, monkeypatch)
    large, large_budget = _work(tmp_path, 800, monkeypatch)
    assert small_budget == 4 * 200 + verify.WORK_FLOOR
    assert 0 < small <= small_budget and 0 < large <= large_budget
    assert large - small <= verify.WORK_FACTOR * (800 - 200) + verify.WORK_FLOOR


def _sliced_rechecks(path: Path, monkeypatch: pytest.MonkeyPatch) -> tuple[int, list]:  # type: ignore[type-arg]
    """(slices taken, mismatches) verifying the fixes of ``path`` by slices.

    Every slice taken is compared with the whole edited design: the decided
    findings (message included) and the connection lists of the slice's nets.
    """
    netlist, analysis = analyse_path(path)
    findings = run_checks(netlist, analysis)
    taken: list[int] = [0]
    mismatches: list = []  # type: ignore[type-arg]
    real = verify.Verifier._sliced
    whole = Verifier(netlist, findings, {}, None)

    edits: list = [None]  # type: ignore[type-arg]  # those of the slice being built

    def spy(self, chosen, plan):  # type: ignore[no-untyped-def]
        edits[0] = chosen
        result = real(self, chosen, plan)
        if isinstance(result, tuple):
            taken[0] += 1
            after, cut = result
            full = [f for f in whole.recheck(chosen) or [] if cut.decides(f.element)]
            if sorted(map(_facts, after)) != sorted(map(_facts, full)):
                mismatches.append(("findings", chosen))
        return result

    real_build = Slices.build

    def build_spy(self, edited, plan):  # type: ignore[no-untyped-def]
        piece = real_build(self, edited, plan)
        full = build_graph(apply_edits(netlist, edits[0])).connections
        for net, entries in piece.graph.connections.items():
            mine = [(c.ref, t) for c, t in entries]
            if mine != [(c.ref, t) for c, t in full.get(net, ())]:
                mismatches.append(("connections", net, edits[0]))
        return piece

    monkeypatch.setattr(verify.Verifier, "_sliced", spy)
    monkeypatch.setattr(Slices, "build", build_spy)
    sliced = verify_fixes(netlist, analysis, findings, budget=None)
    monkeypatch.undo()
    cluster = verify_fixes(netlist, analysis, findings, budget=None, sliced=False)
    if _verdicts(sliced) != _verdicts(cluster):
        mismatches.append(("verdicts", path))
    return taken[0], mismatches


# At 300 components only the unsuppressed shape has fixes; the others get
# theirs at 2,000.
SLICED = [(shape, 300) for shape in SHAPES]
SLICED += [(s, 2000) for s in ("mixed", "one-rail", "many-supplies", "plc", "sheets")]


@pytest.mark.parametrize(("shape", "size"), SLICED)
def test_sliced_recheck_agrees_on_bench_shapes(
    shape: str, size: int, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    top = _gen_design().generate(size, tmp_path, shape=shape)
    taken, mismatches = _sliced_rechecks(top, monkeypatch)
    assert mismatches == []
    if shape == "unsuppressed" or size > 300:
        assert taken > 0


def test_added_component_after_one_outside_the_slice() -> None:
    """An added part follows its anchor's statement even outside the slice."""
    netlist, _ = analyse_path(CUT_DESIGNS / "fused-bus-110v.cnet")
    anchor = netlist.components[0]
    sliced = replace(netlist, components=netlist.components[1:2])
    edit = _diode("VX", "L-", "W2", anchor.ref)
    edited = apply_edits(sliced, [edit], context=netlist)
    assert edited.component("VX").span == anchor.span  # type: ignore[union-attr]
    taken = _diode(anchor.ref, "L-", "W2", anchor.ref)
    with pytest.raises(ValueError):
        apply_edits(sliced, [taken], context=netlist)  # exists outside the slice


# Hand-chosen edits on a generated one-rail design (no global element), with
# the way the local re-check must take: by slice, or by the cluster after the
# slice's conditions fail (a resistor across a contact bypasses it).
# The parallel shape's start contacts bypass one another inside their rung
# (a block of off-bus nets): rung-local, so its domains take slices too.
# (The series shape's slices mostly fall back: a long chain is the larger
# side of its first contact in the slice, whose rail group is the bus alone.)
# A parallel rung is 23 components, so a tenth of 1,500 is a few.
@pytest.mark.parametrize(
    ("shape", "least"), [("mixed", 20), ("many-supplies", 20), ("parallel", 3)]
)
def test_sliced_recheck_agrees_with_many_hazards(
    shape: str, least: int, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """A tenth of the loads unsuppressed: dozens of slices, rungs side by side."""
    top = _gen_design().generate(1500, tmp_path, shape=shape, hazard_rate=0.1, seed=1)
    taken, mismatches = _sliced_rechecks(top, monkeypatch)
    assert mismatches == [] and taken >= least


LAMP = (("1", "W1.8"), ("2", "M1"))  # beside Y7, switched by K1:13-14
SLICE_EDITS = [
    ([Remove("V1")], "slice"),
    ([Reconnect("V2", (("A", "W1.2"), ("K", "M1")))], "slice"),  # reversed
    # Bridges two rungs whose outputs are closed: a shunt round both outputs.
    ([_resistor("RX", "W1.1", "W1.2", "Y1")], "cluster"),
    ([_diode("VX", "W1.1", "W1.8", "Y1")], "slice"),  # a diode: no shunt
    ([_diode("VX", "W1.1", "P1", "Y1")], "slice"),  # to the bus
    ([_resistor("RX", "P1", "W1.7", "S1")], "cluster"),  # across S1
    ([SetValues("V1", (("voltage_rating", "1V"),))], "slice"),
    # The making current at closing is the whole domain's network: a lamp
    # switched, or a stated making current, falls back.
    ([AddComponent("load", "HX", (("part", "lamp-24v"),), LAMP, "Y7")], "cluster"),
    ([SetValues("K1", (("contacts.making_current", "5A"),))], "cluster"),
]


@pytest.mark.parametrize(
    ("edits", "way"),
    SLICE_EDITS,
    ids=[f"{i}-{w}" for i, (_, w) in enumerate(SLICE_EDITS)],
)
def test_chosen_slice_edits_agree_with_whole_design(
    edits: list, way: str, tmp_path: Path
) -> None:
    top = _gen_design().generate(300, tmp_path, shape="one-rail")
    netlist, analysis = analyse_path(top)
    findings = run_checks(netlist, analysis)
    rungs = Rungs(netlist, analysis)
    local = Verifier(
        netlist,
        findings,
        {},
        None,
        Locality(netlist, analysis.graph),
        rungs,
        Slices(rungs),
    )
    whole = Verifier(netlist, findings, {}, None)
    after = local.recheck(edits)
    cut = local._result(edits)[1]  # type: ignore[index]
    decided = [f for f in whole.recheck(edits) or [] if cut.decides(f.element)]
    assert after is not None and sorted(map(_facts, after)) == sorted(
        map(_facts, decided)
    )
    taken = cut.names == frozenset()  # a slice's cut names nothing but its plan
    assert cut.restricted is not None and taken == (way == "slice")
    for finding in findings:
        assert local.passes(finding, edits) == whole.passes(finding, edits), finding


def test_slices_leave_out_the_loads_across_the_bus(tmp_path: Path) -> None:
    """The sliced tests above cover slices without their pilot lamps.

    The mixed shape's domains have only a supply, fuses and lamps on the bus:
    the lamps stay out of the slices (but are charged). A suppressor across
    the rails keeps every bus part in.
    """
    top = _gen_design().generate(2000, tmp_path, shape="mixed")
    netlist, analysis = analyse_path(top)
    pieces = Slices(Rungs(netlist, analysis))
    apart = [pieces.bus_components(name)[1] for name in sorted(pieces.rungs.solved)]
    assert any(apart)
    for refs in apart:
        assert all(netlist.component(r).kind == "load" for r in refs)  # type: ignore[union-attr]
    netlist, analysis = analyse_path(CUT_DESIGNS / "rails-suppressor.cnet")
    pieces = Slices(Rungs(netlist, analysis))
    assert all(not pieces.bus_components(n)[1] for n in pieces.rungs.solved)
