"""``fill_template`` (a compiled format string per template) words what the
plain piece-by-piece filling words.

The reference below is the filling as it was written first: each literal, then
each placeholder's text, the ``absent`` wording for None. Compared on every
template of the rule catalogue with values of every kind a check passes, on
templates with doubled braces, format specs and conversions, and for the
missing-value error.
"""

from __future__ import annotations

import math
import string

import pytest

from netcheck.catalogue import load_catalogue
from netcheck.findings import _absent, _text, fill_template, placeholders
from netcheck.units import Q_


def _reference(template, values, absent=None):  # type: ignore[no-untyped-def]
    absent = absent or {}
    out = []
    for literal, name, _, _ in string.Formatter().parse(template):
        out.append(literal)
        if name is None:
            continue
        if name not in values:
            raise KeyError(name)
        value = values[name]
        out.append(_text(value) if value is not None else _absent(name, values, absent))
    return "".join(out)


KINDS = [
    Q_(0.3333333333, "A"),
    Q_(-0.0, "V"),
    Q_(0.0, "J"),
    Q_(1e-9, "s"),
    Q_(48, "V"),
    Q_(2.5e6, "ohm"),
    Q_(math.nan, "V"),
    Q_(0.5, ""),
    "K1:13-14",
    "",
    "{odd}",
    None,
    3,
    0.1,
    1e-12,
    True,
    ("K1", "K2"),
    ["a"],
    frozenset(),
    24.0,
]


def _templates():  # type: ignore[no-untyped-def]
    for meta in {m.name: m for m in load_catalogue().values()}.values():
        texts = [*meta.messages.values(), *meta.fixes.values()]
        texts += [t for alts in meta.absent.values() for t in alts]
        for text in texts:
            yield meta, text


def test_every_catalogue_template_fills_as_before() -> None:
    count = 0
    for meta, template in _templates():
        names = sorted(placeholders(template) | {n for n in meta.absent})
        for shift in range(len(KINDS)):
            values = {n: KINDS[(i + shift) % len(KINDS)] for i, n in enumerate(names)}
            # Absent wordings may name values the template does not.
            for alts in meta.absent.values():
                for text in alts:
                    for name in placeholders(text):
                        values.setdefault(name, KINDS[shift])
            expected = _reference(template, values, meta.absent)
            assert fill_template(template, values, meta.absent) == expected
            count += 1
    assert count > 1000


@pytest.mark.parametrize(
    "template",
    [
        "",
        "plain text",
        "{{literal}} {a}",
        "{a}{b}{a}",
        "}} {a:.2f} {b!r} {{",
        "{a} at the end {b}",
        "{ a }",
        "ünï {a} Ω",
    ],
)
def test_braces_specs_and_conversions_fill_as_before(template: str) -> None:
    values = {"a": Q_(1.5, "mA"), "b": None, " a ": "spaced"}
    absent = {"b": ("not given",)}
    assert fill_template(template, values, absent) == _reference(
        template, values, absent
    )
    assert fill_template(template, values) == _reference(template, values)


def test_a_missing_value_is_a_key_error_naming_it() -> None:
    with pytest.raises(KeyError) as ours:
        fill_template("{a} and {b}", {"a": 1})
    with pytest.raises(KeyError) as theirs:
        _reference("{a} and {b}", {"a": 1})
    assert ours.value.args == theirs.value.args == ("b",)
