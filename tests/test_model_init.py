"""The hand-written ``__init__``s make what the dataclass's own would.

``model.py``, ``graph.py``, ``input/cnet/statements.py`` and the analysis's
``circuit.py``, ``loads.py`` and ``suppression.py`` give the classes
built once per token their own ``__init__`` for speed (``findings.Finding``
too: a heavy report builds thousands); here each is compared
with the ``__init__`` that ``dataclasses`` generates for the same fields:
positional and keyword calls, defaults, equality, hash, repr, immutability and
``dataclasses.replace``.
"""

from __future__ import annotations

import dataclasses

import pytest
from helpers import assert_init_as_generated

from netcheck.analysis.circuit import Diode, Resistor
from netcheck.analysis.loads import LoadFacts
from netcheck.analysis.suppression import Chain
from netcheck.findings import Finding, Severity
from netcheck.graph import Branch
from netcheck.input.cnet.statements import ComponentStatement, RawAttribute
from netcheck.model import Attribute, Component, Connection, Pole, SwitchingElement
from netcheck.source import Span

SPAN = Span("a.cnet", 3, 5, 3, 9)


CONNECTION = Connection("13", "W1", SPAN)
ELEMENT = SwitchingElement("K1", "13", "14", "no", SPAN)
CASES = [
    (Attribute, ("part", "relay-24v", "relay-24v", SPAN), {}),
    (Connection, ("13", "W1", SPAN), {}),
    (SwitchingElement, ("K1", "13", "14", "no", SPAN), {}),
    (Component, ("relay", "K1", SPAN, (CONNECTION,)), {}),
    (
        Component,
        ("relay", "K1", SPAN, (CONNECTION,)),
        {
            "attributes": (Attribute("part", "p", "p", SPAN),),
            "values": {"part": "p"},
            "tags": frozenset({"x"}),
            "poles": (Pole("13", "14"),),
            "elements": (ELEMENT,),
        },
    ),
    (Branch, (None, "switch", "P1", "W1", ELEMENT), {}),
    (Branch, (None, "load", "P1", "W1"), {}),
    (Resistor, ("R1", "P1", "W1", 48.0), {}),
    (Chain, ("diode", "W1", "M1", (), {"V1": 1}), {}),
    (Diode, ("V1", "M1", "W1", 0.7), {}),
    (Diode, ("V1", "M1", "W1", 0.7), {"vz": 33.0}),
    (
        LoadFacts,
        ("Y1", "Y1", "valve", None, None, None, None, "none", None, None, ()),
        {},
    ),
    (RawAttribute, ("v", "24V", False, SPAN), {}),
    (
        ComponentStatement,
        ("relay", "K1", (RawAttribute("v", "24", False, SPAN),), (), SPAN),
        {"ref_span": SPAN},
    ),
    (Finding, ("rule", Severity.ERROR, "text", SPAN, "K1:13-14"), {}),
    (
        Finding,
        ("rule", Severity.WARNING, "text", SPAN, "K1:13-14"),
        {
            "values": {"current": 1.5},
            "fix": "fit a diode",
            "references": ("IEC 60947-5-1",),
            "key": "vz",
            "fingerprint": "0123456789abcdef",
            "waived": "reviewed",
            "variant": "output",
            "edits": ("edit",),
            "verified": True,
        },
    ),
]


@pytest.mark.parametrize(("cls", "args", "kwargs"), CASES)
def test_init_matches_the_generated_one(cls, args, kwargs):
    hashable = cls not in (Component, Finding, Chain)  # they hold a dict
    assert_init_as_generated(cls, args, kwargs, hashable=hashable)


def test_a_components_default_values_are_a_new_dict_each_time():
    first = Component("load", "H1", SPAN, ())
    second = Component("load", "H2", SPAN, ())
    assert first.values == {} and first.values is not second.values


def test_a_findings_default_values_are_a_new_dict_each_time():
    first = Finding("rule", Severity.INFO, "text", SPAN, "H1")
    second = Finding("rule", Severity.INFO, "text", SPAN, "H2")
    assert first.values == {} and first.values is not second.values


def test_names_worked_out_once_follow_the_fields():
    element = SwitchingElement("K1", "13", "14", "no", SPAN)
    assert element.name == "K1:13-14" and "name" in vars(element)
    assert dataclasses.replace(element, a="23", b="24").name == "K1:23-24"
    coil = Branch(Component("relay", "K1", SPAN, ()), "coil", "P1", "W1")
    assert (coil.key, coil.ref, coil.kind) == ("K1:coil", "K1", "relay")
    assert Branch(None, "switch", "P1", "W1", element).key == "K1:13-14"
    assert coil == Branch(Component("relay", "K1", SPAN, ()), "coil", "P1", "W1")


@pytest.mark.parametrize(
    "changes",
    [
        {"fingerprint": "fedcba9876543210"},
        {"span": Span("b.cnet", 9, 1), "fingerprint": "00"},
        {"waived": "accepted", "verified": False, "edits": ()},
        {"values": {"voltage": 24.0}, "message": "other"},
        {},
    ],
)
def test_evolve_builds_what_replace_builds(changes):
    from netcheck.findings import evolve

    for _, args, kwargs in (c for c in CASES if c[0] is Finding):
        finding = Finding(*args, **kwargs)
        ours, theirs = (
            evolve(finding, **changes),
            dataclasses.replace(finding, **changes),
        )
        assert vars(ours) == vars(theirs) and ours == theirs
        assert type(ours) is Finding and ours is not finding
        # The same objects as replace keeps (the values dict is not copied).
        assert all(vars(ours)[k] is vars(theirs)[k] for k in vars(theirs))
        with pytest.raises(dataclasses.FrozenInstanceError):
            ours.rule = "changed"
    with pytest.raises(TypeError):
        evolve(Finding(*CASES[-1][1]), colour="red")


def _holding_where_it_starts(cls, *others):
    """An instance as the fast reader makes it: no span, where it starts."""
    token = object.__new__(cls)
    fields = token.__dict__
    names = [f.name for f in dataclasses.fields(cls)][:-1]  # all but span
    for name, value in zip(names, others, strict=True):
        fields[name] = value
    fields["_file"], fields["_line"], fields["_column"] = "a.cnet", 3, 5
    return token


@pytest.mark.parametrize(
    ("cls", "args"),
    [
        (Connection, ("13", "W1")),  # 13:W1 from column 5: ends at 10
        (Attribute, ("v", "24V", "24V")),  # v=24V (key, value, text)
        (RawAttribute, ("v", "24V", False)),
    ],
)
def test_a_token_that_keeps_where_it_starts_is_the_token_with_its_span(cls, args):
    made = _holding_where_it_starts(cls, *args)
    fields = [f.name for f in dataclasses.fields(cls)]
    width = len("13:W1") if cls is Connection else len("v=24V")
    span = Span("a.cnet", 3, 5, 3, 5 + width)
    whole = cls(*args, span)
    assert "span" not in vars(made)
    assert hash(made) == hash(whole) and made == whole and repr(made) == repr(whole)
    assert made.span == span and vars(made)["span"] is made.span  # kept
    assert dataclasses.replace(made, **{fields[0]: "x"}).span == span
    assert all(getattr(made, n) == getattr(whole, n) for n in fields)


def test_a_reference_span_is_worked_out_from_its_column():
    statement = object.__new__(ComponentStatement)
    fields = statement.__dict__
    fields.update(kind="relay", ref="K10", attributes=(), connections=())
    fields["span"] = Span("a.cnet", 7, 1, 8, 20)
    fields["_ref_column"] = 9
    whole = ComponentStatement(
        "relay", "K10", (), (), fields["span"], Span("a.cnet", 7, 9, 7, 12)
    )
    assert statement == whole and hash(statement) == hash(whole)
    assert statement.ref_span == Span("a.cnet", 7, 9, 7, 12)
