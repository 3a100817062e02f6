"""Help texts (SARIF rule descriptors, ``explain``) show no raw ``{placeholders}``."""

from __future__ import annotations

import json
import re

import pytest

from netcheck.catalogue import load_catalogue
from netcheck.findings import placeholders
from netcheck.report import Report, unique_rules
from netcheck.report.sarif import help_text, render_sarif
from netcheck.report.template_words import describe, readable
from netcheck.report.text import render_explain

RULES = unique_rules(load_catalogue())
BRACE = re.compile(r"[{}]")
VARIANTS = [
    (meta, kind, variant)
    for meta in RULES
    for kind, templates in (("message", meta.messages), ("fix", meta.fixes))
    for variant in sorted(templates)
]


@pytest.mark.parametrize(
    ("meta", "kind", "variant"),
    VARIANTS,
    ids=[f"{m.name}-{k}-{v}" for m, k, v in VARIANTS],
)
def test_every_template_variant_reads_as_words(meta, kind, variant):
    template = (meta.messages if kind == "message" else meta.fixes)[variant]
    shown = readable(template, meta.name)
    assert not BRACE.search(shown), shown
    for name in placeholders(template):
        # Each placeholder has words of its own, not the fallback of its name.
        assert f"<{describe(meta.name, name)}>" in shown
    explain = render_explain(meta, meta.name)
    assert shown in explain
    assert not BRACE.search(explain), explain


@pytest.mark.parametrize("meta", RULES, ids=[m.name for m in RULES])
def test_sarif_descriptor_has_no_placeholders(meta):
    log = json.loads(render_sarif(Report.build([]), {meta.name: meta}))
    [descriptor] = log["runs"][0]["tool"]["driver"]["rules"]
    for field in ("help", "fullDescription", "shortDescription"):
        assert not BRACE.search(descriptor[field]["text"]), descriptor[field]
    assert descriptor["help"]["text"] == help_text(meta)
    for template in meta.fixes.values():
        assert readable(template, meta.name) in descriptor["help"]["text"]


def test_words_replace_the_name():
    shown = readable("breaks {current} at {voltage}", "dc-break-over-rating")
    assert shown == "breaks <breaking current> at <breaking voltage>"
    # A rule can mean something narrower by a common name.
    assert readable("{rated}", "coil-voltage-out-of-range") == "<rated coil voltage>"


def test_unknown_name_falls_back_without_braces():
    assert readable("a {made_up_name}", "any-rule") == "a <made up name>"
