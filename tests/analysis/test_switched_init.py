"""The analysis results' hand-written ``__init__``s make what dataclasses would.

``ElementAnalysis`` (one per switching element), ``SwitchedLoad``,
``Suppressor``, ``Opening`` and ``Solution`` (one per cut solved) write their
fields straight into ``__dict__``; each is compared here with the
``__init__`` that ``dataclasses`` generates for the same fields: positional
and keyword calls, defaults, field order, equality, hash, repr, immutability
and ``dataclasses.replace``. No outside source: a check of our own code.
"""

from __future__ import annotations

import pytest
from helpers import assert_init_as_generated

from netcheck.analysis.circuit import Solution
from netcheck.analysis.switched import (
    ElementAnalysis,
    Opening,
    Suppressor,
    SwitchedLoad,
)
from netcheck.units import Q_

SUPPRESSOR = Suppressor("diode", "across-load", ("V1",), "Y1")
CASES = [
    (Suppressor, ("diode", "across-load", ("V1",), "Y1"), {}),
    (
        Suppressor,
        ("zener", "across-element", ("V2", "V3"), None),
        {"conducts": True, "functional": False},
    ),
    (Opening, (0.5, -24.0, ("Y1",), ("K2:13-14",), frozenset({"W1"})), {}),
    (
        SwitchedLoad,
        ("facts", Q_(0.5, "A"), Q_(24.0, "V"), "DC-13", None, True, (SUPPRESSOR,)),
        {},
    ),
    (ElementAnalysis, ("K1:13-14", "K1", "DC1", "dc"), {}),
    (
        ElementAnalysis,
        ("K1:13-14", "K1", "DC1", "dc"),
        {
            "voltage": Q_(24.0, "V"),
            "current": Q_(0.5, "A"),
            "load_category": "DC-13",
            "suppression": (SUPPRESSOR,),
            "series_poles": 2,
            "series_elements": ("K1:13-14", "K1:23-24"),
            "bypass": ("K2:13-14",),
            "direction": -1,
            "bidirectional": True,
            "supply_ref": "G1",
            "missing": ("Y1: inductance",),
            "short_circuit": True,
            "notes": ("a note",),
        },
    ),
    (Solution, ({"W1": 24.0}, {"R1": 0.5}, {}), {}),
]


@pytest.mark.parametrize(("cls", "args", "kwargs"), CASES)
def test_init_matches_the_generated_one(cls, args, kwargs):
    hashable = cls is not Solution  # it holds dicts
    assert_init_as_generated(
        cls, args, kwargs, hashable=hashable, every_field_in_vars=True
    )


@pytest.mark.parametrize("category", ["DC-1", "DC-12", "DC-13", "DC-14", "AC-15", ""])
def test_one_category_is_its_own_most_demanding(category):
    from netcheck.analysis.loads import _DEMAND, most_demanding

    known = [c for c in [category] if c in _DEMAND]
    expected = max(known, key=_DEMAND.index) if known else None
    assert most_demanding([category]) == expected
    assert most_demanding([category, "DC-1"]) == max(
        [*known, "DC-1"], key=_DEMAND.index
    )
