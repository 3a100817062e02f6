"""A pole in the minus conductor breaks exactly the supply voltage, printed as such.

KVL: once the pole opens no current flows, so the open terminal sits at L+
through the load and the pole sees the whole 1000 V. A leak to the reference on
nodes that are tied to a rail (G_MIN) used to read 999.99999992 V.
"""

from __future__ import annotations

import json
from pathlib import Path

from netcheck.analysis.circuit import Resistor, solve_dc
from netcheck.cli import main as cli_main

CASE = (
    Path(__file__).parents[1]
    / "cases/dc-voltage-over-rating/bad-pole-in-minus-conductor.cnet"
)


def test_a_node_tied_to_a_rail_takes_the_rail_potential_exactly() -> None:
    # KVL with no current: V(n) = V(L+) exactly, whatever the resistance.
    solution = solve_dc(["L+", "n"], {"L+": 1000.0}, [Resistor("r", "L+", "n", 80.0)])
    assert solution.potentials["n"] == 1000.0


def test_a_node_with_no_path_still_solves_to_the_reference() -> None:
    solution = solve_dc(["L+", "n"], {"L+": 1000.0}, [])
    assert solution.potentials["n"] == 0.0


def _run(capsys, *args: str) -> str:  # type: ignore[no-untyped-def]
    cli_main(["check", *args, str(CASE)])
    return capsys.readouterr().out


def test_check_prints_1_kv(capsys) -> None:  # type: ignore[no-untyped-def]
    text = _run(capsys)
    assert "breaks 1 kV DC" in text
    assert "999" not in text


def test_json_carries_the_exact_value(capsys) -> None:  # type: ignore[no-untyped-def]
    data = json.loads(_run(capsys, "--format", "json"))
    (finding,) = [f for f in data["findings"] if f["rule"] == "dc-voltage-over-rating"]
    voltage = finding["values"]["voltage"]
    assert (voltage["value"], voltage["text"]) == (1000.0, "1 kV")
