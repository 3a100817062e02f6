"""The rule catalogue against the checks, the case folders and the case findings.

Every rule of ``rules/*.yaml`` has a registered check (``unused-waiver`` is raised
by the pipeline itself) and a case folder, complete metadata, margins with a
default and a source, and templates whose placeholders the findings of the cases
supply. The findings come from running every case of ``tests/cases`` (shared with
``test_cases.py``, which caches them).
"""

from __future__ import annotations

import re
from collections.abc import Iterator

import pytest
from test_cases import CASES, case_files, run_case

from netcheck.analysis.supplies import SUPPLY_NOTES
from netcheck.catalogue import RuleMeta, load_catalogue
from netcheck.checks.registry import all_checks
from netcheck.findings import Finding, Severity

PIPELINE_RULES = {"unused-waiver"}  # raised by the pipeline, not by a check
KEBAB = re.compile(r"\A[a-z][a-z0-9]*(?:-[a-z0-9]+)*\Z")

# Rule -> why its findings do not carry the values its templates use.
VALUES_NOT_CARRIED: dict[str, str] = {}
# Rule -> why a finding's fix is not the variant of the same name as its message.
FIX_VARIANT_WRONG: dict[str, str] = {}


def rules() -> dict[str, RuleMeta]:
    """Each rule once, by its name (aliases dropped)."""
    return {meta.name: meta for meta in load_catalogue().values()}


def case_findings() -> Iterator[Finding]:
    for path in case_files():
        yield from run_case(path)


def findings_of(rule: str) -> list[Finding]:
    return [f for f in case_findings() if f.rule == rule]


def _pattern(template: str) -> re.Pattern[str]:
    """A template as a regular expression: literal text, any text per placeholder."""
    parts = re.split(r"\{[^{}]*\}", template)
    return re.compile(".*?".join(re.escape(p) for p in parts), re.DOTALL)


def message_variants(meta: RuleMeta, finding: Finding) -> set[str]:
    """The message variants whose template could have produced the finding."""
    # A finding in a domain whose supply states a range ends with a note of the
    # voltage it was judged at (analysis/supplies.py).
    notes = ("", *SUPPLY_NOTES.values())
    return {
        name
        for name, template in meta.messages.items()
        if any(_pattern(template + note).fullmatch(finding.message) for note in notes)
    }


# --- the catalogue and the checks -------------------------------------------------


def test_every_rule_has_a_check_and_every_check_a_rule() -> None:
    names = set(rules())
    checks = set(all_checks())
    assert names - checks == PIPELINE_RULES, sorted(names - checks - PIPELINE_RULES)
    assert checks <= names, sorted(checks - names)
    assert not (checks & PIPELINE_RULES)


def test_every_rule_has_a_case_folder() -> None:
    folders = {p.name for p in CASES.iterdir() if p.is_dir()}
    assert set(rules()) <= folders, sorted(set(rules()) - folders)


@pytest.mark.parametrize("name", sorted(rules()))
def test_rule_metadata_is_complete(name: str) -> None:
    meta = rules()[name]
    assert KEBAB.match(meta.name), meta.name
    assert all(KEBAB.match(alias) for alias in meta.aliases), meta.aliases
    assert isinstance(meta.severity, Severity)
    assert meta.family and meta.title.strip() and meta.rationale.strip()
    assert meta.references and all(str(r).strip() for r in meta.references)
    assert meta.messages and all(t.strip() for t in meta.messages.values())
    assert "default" in meta.messages or len(meta.messages) > 1
    assert all(t.strip() for t in meta.fixes.values())


@pytest.mark.parametrize("name", sorted(rules()))
def test_margins_have_a_default_and_a_source(name: str) -> None:
    for margin in rules()[name].margins.values():
        assert KEBAB.match(margin.name), margin.name
        assert margin.default > 0, (margin.name, margin.default)
        assert margin.source.strip(), margin.name


def test_margin_names_are_unique() -> None:
    seen: dict[str, str] = {}
    for meta in rules().values():
        for margin in meta.margins:
            assert margin not in seen, f"{margin} in {seen.get(margin)} and {meta.name}"
            seen[margin] = meta.name


# --- templates against the findings of the cases -----------------------------------


def test_case_findings_have_filled_templates() -> None:
    unfilled = [
        f"{f.rule}@{f.span.file}:{f.span.line}: {text}"
        for f in case_findings()
        for text in (f.message, f.fix or "")
        if "{" in text or "}" in text
    ]
    assert not unfilled, "\n".join(unfilled)


@pytest.mark.parametrize("name", sorted(rules()))
def test_every_rule_is_raised_by_some_case(name: str) -> None:
    assert findings_of(name), f"no case raises {name}"


def _params(known: dict[str, str]) -> list[object]:
    return [
        pytest.param(
            name,
            marks=[pytest.mark.xfail(strict=True, reason=known[name])]
            if name in known
            else [],
        )
        for name in sorted(rules())
    ]


@pytest.mark.parametrize("name", _params(VALUES_NOT_CARRIED))
def test_every_placeholder_is_supplied_by_a_finding(name: str) -> None:
    """Each placeholder of the rule's templates is among some finding's values."""
    meta = rules()[name]
    supplied: set[str] = set()
    for finding in findings_of(name):
        supplied |= {"element", "ref", *finding.values}
    missing = sorted(meta.placeholders() - supplied)
    assert not missing, f"{name}: no case finding supplies {missing}"


@pytest.mark.parametrize("name", sorted(rules()))
def test_every_message_variant_is_produced(name: str) -> None:
    meta = rules()[name]
    produced: set[str] = set()
    for finding in findings_of(name):
        variants = message_variants(meta, finding)
        assert variants, f"{name}: message matches no template: {finding.message!r}"
        produced |= variants
    assert set(meta.messages) <= produced, sorted(set(meta.messages) - produced)


@pytest.mark.parametrize("name", _params(FIX_VARIANT_WRONG))
def test_every_fix_variant_is_produced(name: str) -> None:
    meta = rules()[name]
    produced = {
        variant
        for finding in findings_of(name)
        if finding.fix
        for variant, template in meta.fixes.items()
        if _pattern(template).fullmatch(finding.fix)
    }
    assert set(meta.fixes) <= produced, sorted(set(meta.fixes) - produced)


@pytest.mark.parametrize("name", _params(FIX_VARIANT_WRONG))
def test_fix_goes_with_its_message_variant(name: str) -> None:
    """A message variant that has a fix variant of its own name gets that fix."""
    meta = rules()[name]
    wrong = []
    for finding in findings_of(name):
        own = {
            v
            for v in message_variants(meta, finding)
            if v != "default" and v in meta.fixes
        }
        if not own:
            continue
        if not any(_pattern(meta.fixes[v]).fullmatch(finding.fix or "") for v in own):
            wrong.append(
                f"{finding.element}: message {sorted(own)}, fix {finding.fix!r}"
            )
    assert not wrong, "\n".join(wrong)


@pytest.mark.parametrize("name", sorted(rules()))
def test_findings_have_the_rule_severity_or_a_documented_change(name: str) -> None:
    """Only inductive-load-unsuppressed and making-over-rating change severity."""
    meta = rules()[name]
    changed = {f.severity for f in findings_of(name)} - {meta.severity}
    # making-over-rating: a warning where only a category's making condition
    # (not a stated making current) is the basis (rules/making.yaml).
    lowered = {"inductive-load-unsuppressed": {Severity.ERROR}}
    lowered["making-over-rating"] = {Severity.WARNING}
    # arc-sustain-risk: info where the estimate says "unlikely" (rules/arc.yaml).
    lowered["arc-sustain-risk"] = {Severity.INFO}
    allowed = lowered.get(name, set())
    assert changed <= allowed, (name, sorted(s.label for s in changed))


@pytest.mark.parametrize("name", sorted(rules()))
def test_finding_keeps_the_variant_its_message_came_from(name: str) -> None:
    meta = rules()[name]
    for finding in findings_of(name):
        assert finding.variant in message_variants(meta, finding), finding.message


# Words that only prose standing in for a missing value would use.
PROSE = re.compile(r"\b(none|not given|unknown|no number|limited only|at least)\b")


def test_finding_values_are_raw_never_prose() -> None:
    """Missing values are None; the rule's ``absent`` texts word them."""
    prose = [
        (f.rule, name, value)
        for f in case_findings()
        for name, value in f.values.items()
        if isinstance(value, str) and PROSE.search(value)
    ]
    assert prose == []


def test_absent_values_take_the_first_alternative_whose_values_are_known() -> None:
    from netcheck.findings import fill_template

    absent = {"energy": ("at least {known}", "an unknown energy"), "x": ()}
    template = "{energy} stored, {x}"
    partial = fill_template(template, {"energy": None, "known": 2, "x": None}, absent)
    assert partial == "at least 2 stored, none"
    unknown = {"energy": None, "known": None, "x": 1}
    assert fill_template(template, unknown, absent) == "an unknown energy stored, 1"


def test_absent_texts_are_used_by_the_cases() -> None:
    """The cases reach the absent wording, so the YAML texts are exercised."""
    catalogue = rules()
    used = {
        (f.rule, name)
        for f in case_findings()
        for name, value in f.values.items()
        if value is None and name in catalogue[f.rule].absent
    }
    assert ("inductive-load-unsuppressed", "clamp_energy") in used
    assert ("inductive-load-unsuppressed", "energy") in used


@pytest.mark.parametrize(
    ("case", "wording"),
    [
        ("bad-energy-partly-known.cnet", "(500 mA, at least 60 mJ stored)"),
        ("bad-energy-unknown.cnet", "(250 mA, an unknown energy (no L or tau given)"),
    ],
)
def test_an_unknown_energy_is_worded_by_the_rule(case: str, wording: str) -> None:
    """The first absent text whose values are known words the missing energy."""
    [finding] = run_case(CASES / "inductive-load-unsuppressed" / case)
    assert finding.values["energy"] is None
    assert wording in finding.message
