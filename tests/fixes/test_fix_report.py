"""The reports carry each fix's edits and say whether it was verified."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from netcheck import cli
from netcheck.cli import output
from netcheck.schema import validate

CASE = Path(__file__).parents[1] / "cases" / "inductive-load-unsuppressed"


def test_json_fix_has_edits_and_verification(capsys) -> None:  # type: ignore[no-untyped-def]
    cli.main(
        ["check", str(CASE / "bad-contact-no-suppression.cnet"), "--format", "json"]
    )
    data = json.loads(capsys.readouterr().out)
    assert validate("findings", data) is None
    fix = next(
        f["fix"] for f in data["findings"] if f["rule"] == "inductive-load-unsuppressed"
    )
    assert fix["verified"] is True
    (edit,) = fix["edits"]
    assert edit["action"] == "add" and edit["kind"] == "diode"
    # The diode is rated at the fix text's own numbers (margins applied), or above.
    assert edit["attributes"]["voltage_rating"] == fix["values"]["diode_voltage"][
        "text"
    ].replace(" ", "")


def test_text_says_which_fixes_are_verified(
    capsys, monkeypatch: pytest.MonkeyPatch
) -> None:  # type: ignore[no-untyped-def]
    monkeypatch.setattr(output, "stdout_is_terminal", lambda: True)
    cli.main(["check", str(CASE / "bad-contact-no-suppression.cnet"), "--no-color"])
    out = capsys.readouterr().out
    assert "verified: applied to a copy of the design" in " ".join(out.split())


def test_text_says_a_fix_without_edits_is_not_verified(
    capsys, monkeypatch: pytest.MonkeyPatch, tmp_path: Path
) -> None:  # type: ignore[no-untyped-def]
    monkeypatch.setattr(output, "stdout_is_terminal", lambda: True)
    design = tmp_path / "d.cnet"
    design.write_text(
        'title "illustrative"\nsupply G1 dc=24V +:L+ -:M\n'
        "load H1 type=lamp R=480ohm 1:L+ 2:m\n"
    )
    cli.main(["check", str(design), "--no-color", "--fail-on", "never"])
    out = " ".join(capsys.readouterr().out.split())
    assert "not verified: no edit the tool can apply" in out


def test_a_lamp_is_never_told_to_add_suppression() -> None:
    """A DC-6 lamp load: the fix is the rating, and no edit adds a suppressor."""
    from netcheck.catalogue import load_catalogue
    from netcheck.fixes.edits import AddComponent
    from netcheck.pipeline import check_path

    case = CASE.parent / "category-mismatch" / "bad-lamp-dc12-rating.cnet"
    (finding,) = [f for f in check_path(case).findings if f.rule == "category-mismatch"]
    meta = load_catalogue()["category-mismatch"]
    assert finding.fix == meta.fix("not-inductive").format(category="DC-6")
    assert not any(isinstance(e, AddComponent) for e in finding.edits)
