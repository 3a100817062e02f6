"""The rules' short cuts agree with the full computation they skip.

Each short cut of ``netcheck.checks`` that answers without a transient solve
(or reuses a memoised one) is compared here with the computation it stands
for, element by element, on every rule case, every sample and every bench
shape.
"""

from __future__ import annotations

import sys
from functools import cache
from pathlib import Path

import pytest

from netcheck.analysis.elements import Analysis, analyse
from netcheck.analysis.fitted import element_peak, unsuppressed_loads
from netcheck.analysis.opening import element_transient
from netcheck.analysis.supplies import ranged_supply
from netcheck.catalogue import load_catalogue
from netcheck.checks.context import CheckContext
from netcheck.checks.suppressors import opens_unclamped
from netcheck.graph import build_graph
from netcheck.input import load_design
from netcheck.kinds import MECHANICAL_KINDS, SEMICONDUCTOR_KINDS
from netcheck.model import Netlist

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "bench"))
import gen_design  # noqa: E402
from shapes import SHAPES  # noqa: E402

CASES = sorted((ROOT / "tests" / "cases").glob("*/*.cnet"))
SAMPLES = sorted(p / f"{p.name}.cnet" for p in (ROOT / "sample_nets").iterdir())


@cache
def _analysed(path: Path) -> Analysis:
    netlist = load_design(path, display_base=path.parent)
    analysis = analyse(build_graph(netlist))
    NETLISTS[id(analysis)] = netlist
    return analysis


NETLISTS: dict[int, Netlist] = {}


def _designs(tmp: Path) -> list[Analysis]:
    out = [_analysed(p) for p in CASES + SAMPLES]
    for shape in SHAPES:
        top = gen_design.generate(400, tmp / shape, shape=shape)
        out.append(_analysed(top))
    return out


@pytest.fixture(scope="module")
def designs(tmp_path_factory: pytest.TempPathFactory) -> list[Analysis]:
    return _designs(tmp_path_factory.mktemp("shapes"))


def test_opens_unclamped_means_no_clamped_peak(designs: list[Analysis]) -> None:
    # What _contact_peaks skips: an opening of kind "none" (or none at all).
    skipped = solved = 0
    for analysis in designs:
        for element in analysis.sorted_elements():
            if element.supply != "dc" or element.component.kind not in MECHANICAL_KINDS:
                continue
            peak = element_peak(element)
            if opens_unclamped(element):
                skipped += 1
                assert peak is None or peak.kind == "none", element.name
            elif peak is not None and peak.kind != "none":
                solved += 1
    assert skipped > 100 and solved > 100, (skipped, solved)  # both sides covered


def test_unsuppressed_output_transient_is_its_element_peak(
    designs: list[Analysis],
) -> None:
    # _clamp_case reads the memoised element_peak for element_transient(e, None).
    outputs = 0
    for analysis in designs:
        for element in analysis.sorted_elements():
            if element.component.kind not in SEMICONDUCTOR_KINDS:
                continue
            if element.supply != "dc" or not unsuppressed_loads(element):
                continue
            outputs += 1
            assert element_peak(element) == element_transient(element, None)
    assert outputs > 50


def test_ranged_supply_memo_answers_what_the_graph_says(
    designs: list[Analysis],
) -> None:
    # CheckContext.ranged_supply answers None at once in a design where no
    # supply states a range, else remembers the answer per set of domains.
    ranged = without = 0
    for analysis in designs:
        netlist = NETLISTS[id(analysis)]
        ctx = CheckContext(netlist, analysis.graph, analysis, load_catalogue(), {})
        for _ in range(2):  # the second pass is served from the memo
            for component in netlist.components:
                expected = ranged_supply(analysis.graph, component)
                assert ctx.ranged_supply(component) == expected
                ranged += expected is not None
        without += not ctx._any_range()
    assert ranged > 10 and without > 10, (ranged, without)


def test_context_unsuppressed_loads_is_the_function(designs: list[Analysis]) -> None:
    # CheckContext.unsuppressed_loads is keyed by the identities of the
    # element's suppression and loads tuples; series chains share them.
    shared = 0
    for analysis in designs:
        ctx = CheckContext(
            NETLISTS[id(analysis)], analysis.graph, analysis, load_catalogue(), {}
        )
        seen: set[tuple[int, int]] = set()
        for element in analysis.sorted_elements():
            key = (id(element.suppression), id(element.loads))
            shared += key in seen
            seen.add(key)
            assert ctx.unsuppressed_loads(element) == unsuppressed_loads(element)
    assert shared > 100, shared  # the memo is hit, not only filled


def test_fast_unsuppressed_loads_is_the_reference(designs: list[Analysis]) -> None:
    # fitted.unsuppressed_loads asks effective() as yes/no and filters the
    # inductive loads inline; the reference is the function as first written.
    found = empty = 0
    for analysis in designs:
        for element in analysis.sorted_elements():
            fast = unsuppressed_loads(element)
            assert fast == _unsuppressed_loads_as_first_written(element), element.name
            found += bool(fast)
            empty += not fast and bool(element.inductive_loads)
    assert found > 100 and empty > 100, (found, empty)  # both answers covered


def test_verdict_key_is_the_reference(designs: list[Analysis]) -> None:
    # result._verdict_key remembers each value's rounding by float magnitude
    # and units identity; asked twice, the second answer comes from the memo.
    from netcheck.analysis.result import _verdict_key

    keys = set()
    for analysis in designs:
        for _ in range(2):
            for element in analysis.sorted_elements():
                key = _verdict_key(element)
                assert key == _verdict_key_as_first_written(element), element.name
                keys.add(key)
    assert len(keys) > 100, len(keys)


def _unsuppressed_loads_as_first_written(element):  # type: ignore[no-untyped-def]
    """``fitted.unsuppressed_loads`` before its yes/no short cut."""
    from netcheck.analysis.fitted import effective

    if effective(
        tuple(s for s in element.suppression if s.placement == "across-element")
    ):
        return []
    return [ld for ld in element.inductive_loads if not effective(ld.suppressors)]


def _verdict_key_as_first_written(element):  # type: ignore[no-untyped-def]
    """``result._verdict_key`` before its remembered roundings."""
    from netcheck.analysis.result import _magnitude

    component = element.component
    inline = tuple(
        sorted(
            (a.key, a.text)
            for a in component.attributes
            if a.key.startswith("contacts.")
        )
    )
    part = component.part.name if component.part is not None else None
    return (
        component.kind if part else component.ref,
        part,
        inline,
        element.supply,
        bool(element.loads),
        element.load_category,
        tuple(sorted({ld.category for ld in element.loads})),
        element.series_poles,
        _magnitude(element.voltage, "V"),
        _magnitude(element.current, "A"),
        _magnitude(element.time_constant, "s"),
    )
