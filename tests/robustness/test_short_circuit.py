"""A short circuit across a supply is a finding, not a numerical failure.

Forward-biased diodes across the rails with no load, contacts closing a supply
on itself, and their cousins must end with exit 1 and a ``supply-short-circuit``
(or, for a diode across a load, ``freewheel-diode-reversed``) error; every
value in the JSON report must be a finite number or null, and ``inspect`` must
not fail on the same design.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest
from robust_helpers import Outcome, assert_well_behaved, run_cli

SUPPLY = "supply  G1  dc=24V  earth=minus  +:L+  -:M\n"
SUPPLY_RINT = "supply  G1  dc=24V  earth=minus  r_int=50mohm  +:L+  -:M\n"
LOAD = "load    Y1  type=valve  R=72ohm  L=1H  1:W1  2:M\n"

SHORTS = {
    "diode-forward-across-rails": (
        SUPPLY + "diode  V1  A:L+  K:M\n",
        "supply-short-circuit",
    ),
    "diode-forward-with-r_int": (
        SUPPLY_RINT + "diode  V1  A:L+  K:M\n",
        "supply-short-circuit",
    ),
    "two-diodes-in-series": (
        SUPPLY + "diode  V1  A:L+  K:W5\ndiode  V2  A:W5  K:M\n",
        "supply-short-circuit",
    ),
    "diode-behind-a-contact": (
        SUPPLY + "switch  S1  13:L+  14:W1\ndiode  V1  A:W1  K:M\n",
        "supply-short-circuit",
    ),
    "diode-behind-a-fuse": (
        SUPPLY + "fuse  F1  1:L+  2:L1\ndiode  V1  A:L1  K:M\n",
        "supply-short-circuit",
    ),
    "zener-forward": (
        SUPPLY + "zener  V1  vz=33V  A:L+  K:M\n",
        "supply-short-circuit",
    ),
    "zener-in-breakdown": (
        SUPPLY + "zener  V1  vz=15V  A:M  K:L+\n",
        "supply-short-circuit",
    ),
    "tvs-unidirectional-forward": (
        SUPPLY + "tvs  V1  standoff=33V  vclamp=53V  A:L+  K:M\n",
        "supply-short-circuit",
    ),
    "contact-across-the-rails": (
        SUPPLY + "switch  S1  13:L+  14:M\n",
        "supply-short-circuit",
    ),
    "two-contacts-in-series-across-the-rails": (
        SUPPLY + "switch  S1  13:L+  14:W1\nswitch  S2  13:W1  14:M\n",
        "supply-short-circuit",
    ),
    "relay-contacts-closing-the-supply-on-itself": (
        SUPPLY + "relay  K1  A1:L+  A2:M  13:L+  14:W1  21:W1  22:M\n",
        "supply-short-circuit",
    ),
    "fuse-across-the-rails": (SUPPLY + "fuse  F1  1:L+  2:M\n", "supply-short-circuit"),
    "contact-short-on-an-unearthed-110V-battery": (
        "supply  G1  dc=110V  earth=none  r_int=80mohm  +:B+  -:B-\n"
        "switch  S1  13:B+  14:B-\n",
        "supply-short-circuit",
    ),
    "supply-terminals-on-one-net": (
        "supply  G1  dc=24V  +:L+  -:L+\n",
        "supply-short-circuit",
    ),
    "freewheel-diode-reversed-across-a-load": (
        SUPPLY + "switch  S1  13:L+  14:W1\n" + LOAD + "diode  V1  A:W1  K:M\n",
        "freewheel-diode-reversed",
    ),
}

NOT_SHORTS = {
    "diode-reversed-across-rails": SUPPLY + "diode  V1  A:M  K:L+\n",
    "zener-above-the-supply": SUPPLY + "zener  V1  vz=33V  A:M  K:L+\n",
    "capacitor-across-rails": SUPPLY + "capacitor  C1  C=1uF  1:L+  2:M\n",
    "rc-across-rails": SUPPLY + "rc  C1  R=100ohm  C=1uF  1:L+  2:M\n",
    "two-supplies-in-parallel": SUPPLY + "supply  G2  dc=24V  earth=minus  +:L+  -:M\n",
    "freewheel-diode-the-right-way": (
        SUPPLY + "switch  S1  13:L+  14:W1\n" + LOAD + "diode  V1  A:M  K:W1\n"
    ),
}


def _run(tmp_path: Path, name: str, design: str, *argv: str) -> Outcome:
    folder = tmp_path / name
    folder.mkdir()
    (folder / "top.cnet").write_text(design, encoding="utf-8")
    outcome = run_cli([*argv, f"{name}/top.cnet"], tmp_path)
    assert_well_behaved(outcome, root=tmp_path, limit=20)
    return outcome


def _finite(document: object) -> bool:
    if isinstance(document, float):
        return math.isfinite(document)
    if isinstance(document, dict):
        return all(_finite(v) for v in document.values())
    if isinstance(document, list):
        return all(_finite(v) for v in document)
    return True


def _findings(tmp_path: Path, name: str, design: str) -> tuple[Outcome, list[dict]]:
    outcome = _run(tmp_path, name, design, "check", "--format", "json")
    assert outcome.code in (0, 1), outcome.describe()
    document = json.loads(outcome.out)
    assert _finite(document), outcome.out
    return outcome, document["findings"]


@pytest.mark.parametrize(
    ("name", "design", "rule"),
    [(n, d, r) for n, (d, r) in SHORTS.items()],
    ids=list(SHORTS),
)
def test_a_short_circuit_is_an_error_finding(
    tmp_path: Path, name: str, design: str, rule: str
) -> None:
    outcome, findings = _findings(tmp_path, name, design)
    assert outcome.code == 1, outcome.describe()
    hits = [f for f in findings if f["rule"] == rule]
    assert hits, outcome.describe()
    assert all(f["severity"] == "error" for f in hits)


@pytest.mark.parametrize(
    ("name", "design"), list(NOT_SHORTS.items()), ids=list(NOT_SHORTS)
)
def test_no_short_circuit_where_there_is_none(
    tmp_path: Path, name: str, design: str
) -> None:
    _, findings = _findings(tmp_path, name, design)
    rules = {f["rule"] for f in findings}
    assert not rules & {"supply-short-circuit", "freewheel-diode-reversed"}, rules


def test_the_prospective_current_follows_the_internal_resistance(
    tmp_path: Path,
) -> None:
    _, findings = _findings(tmp_path, "rint", SUPPLY_RINT + "diode  V1  A:L+  K:M\n")
    (short,) = [f for f in findings if f["rule"] == "supply-short-circuit"]
    current = short["values"]["current"]
    assert current["unit"] == "A"
    # (E - Vf) / r_int with a forward drop between 0 and 2 V.
    assert (24 - 2) / 0.05 <= current["value"] <= 24 / 0.05


@pytest.mark.parametrize(
    ("name", "design"), [(n, d) for n, (d, _) in SHORTS.items()], ids=list(SHORTS)
)
def test_inspect_survives_a_short_circuit(
    tmp_path: Path, name: str, design: str
) -> None:
    outcome = _run(tmp_path, name, design, "inspect", "--format", "json")
    assert outcome.code == 0, outcome.describe()
    assert _finite(json.loads(outcome.out))


def test_two_supplies_in_anti_parallel_are_a_short(tmp_path: Path) -> None:
    design = SUPPLY + "supply  G2  dc=24V  +:M  -:L+\n"
    outcome, findings = _findings(tmp_path, "anti", design)
    assert outcome.code == 1
    assert {f["rule"] for f in findings} & {
        "supply-short-circuit",
        "ac-dc-interconnected",
    }


@pytest.mark.parametrize(
    "part",
    [
        "tvs  V1  standoff=12V  vclamp=20V  energy=1J  bidirectional=yes  1:L+  2:M\n",
        "varistor  R1  vdc_max=12V  vclamp=30V  energy=1J  1:L+  2:M\n",
    ],
    ids=["tvs", "varistor"],
)
def test_a_low_voltage_clamp_across_the_rails_is_reported(
    tmp_path: Path, part: str
) -> None:
    outcome, findings = _findings(tmp_path, "clamp", SUPPLY + part)
    assert outcome.code == 1
    assert {f["rule"] for f in findings} & {
        "suppressor-conducts-normally",
        "supply-short-circuit",
    }
