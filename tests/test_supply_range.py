"""Supply voltage ranges: ``range=LOW..HIGH`` beside the nominal ``dc=``.

Located input errors for bad ranges are in ``tests/input_errors/supply-range.cnet``;
the checks judged at the top of a range in ``tests/cases/*/*range*.cnet``.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from netcheck.errors import QuantityError
from netcheck.input.cnet.fast import fast_statements
from netcheck.input.cnet.parse import parse_with_grammar
from netcheck.ranges import highest_voltage, parse_range
from netcheck.source import Span
from netcheck.units import Q_
from tests.helpers import findings_of, net


def test_a_range_reads_both_ends() -> None:
    band = parse_range("range", "88V..125V")
    assert band.low == Q_(88, "V") and band.high == Q_(125, "V")
    assert band.contains(Q_(110, "V")) and not band.contains(Q_(126, "V"))
    assert str(band) == "88 V..125 V"


def test_an_error_in_the_high_end_points_at_the_high_end() -> None:
    with pytest.raises(QuantityError) as error:
        parse_range("range", "88V..125A", Span("f", 3, 20, 3, 29))
    assert error.value.span is not None
    assert (error.value.span.column, error.value.span.end_column) == (25, 29)


@pytest.mark.parametrize("text", ["125V", "..125V", "88V..", "88V..100V..125V"])
def test_a_range_needs_two_ends(text: str) -> None:
    with pytest.raises(QuantityError, match="is not a range"):
        parse_range("range", text)


def test_both_readers_read_a_range_alike() -> None:
    text = "supply G1 dc=110V range=88V..125V +:B+ -:B-\n"
    fast = fast_statements(text, "t.cnet")
    assert fast is not None  # the fast reader takes it, no fallback
    assert list(fast) == list(parse_with_grammar(text, "t.cnet").statements)


def test_the_analysis_runs_at_the_top_of_the_range(tmp_path: Path) -> None:
    _, analysis = net(
        tmp_path,
        """\
        supply  G1  dc=110V  range=88V..125V  earth=none  +:B+  -:B-
        switch  S1  13:B+  14:N1
        load    E1  type=heater  R=125ohm  1:N1  2:B-
        """,
    )
    element = analysis.elements["S1:13-14"]
    assert element.voltage == Q_(125, "V")
    assert element.current.to("A").magnitude == pytest.approx(1.0)  # 125 V / 125 ohm


def test_a_ranged_and_a_plain_supply_of_one_nominal_are_no_short(
    tmp_path: Path,
) -> None:
    # Two 110 V sources in parallel (charger and battery): both taken at the
    # range's top, so KVL holds round them and no short is reported.
    found = findings_of(
        tmp_path,
        """\
        supply  G1  dc=110V  range=88V..125V  earth=none  r_int=50mohm  +:B+  -:B-
        supply  G2  dc=110V  earth=none  r_int=50mohm  +:B+  -:B-
        load    E1  type=heater  R=125ohm  1:B+  2:B-
        """,
    )
    assert not [f for f in found if f.rule == "supply-short-circuit"]


def test_findings_say_which_voltage_they_were_judged_at(tmp_path: Path) -> None:
    found = findings_of(
        tmp_path,
        """\
        supply  G1  dc=24V  range=21.6V..28.8V  earth=minus  +:L+  -:M
        relay   K1  contacts.voltage_max=60V  13:L+  14:N1
        load    Y1  type=valve  R=48ohm  L=0.48H  1:N1  2:M
        """,
    )
    judged = [f for f in found if f.values.get("supply_highest") is not None]
    assert judged
    for finding in judged:
        assert "judged at 28.8 V, the highest voltage of supply G1" in finding.message
        assert finding.values["supply_lowest"] == Q_(21.6, "V")


def test_without_a_range_the_nominal_is_the_highest() -> None:
    class Plain:
        def value(self, key: str) -> object:
            return {"dc": Q_(24, "V")}.get(key)

    assert highest_voltage(Plain()) == Q_(24, "V")


def test_size_takes_a_voltage_range_and_sizes_at_its_top(capsys) -> None:
    from netcheck import cli

    coil = ["--resistance", "440ohm", "--inductance", "2.1H", "--format", "json"]
    assert cli.main(["size", "--voltage", "88V..125V", *coil]) == 0
    ranged = json.loads(capsys.readouterr().out)
    assert cli.main(["size", "--voltage", "125V", *coil]) == 0
    assert ranged == json.loads(capsys.readouterr().out)
    # 125 V / 440 ohm = 284.1 mA (Ohm's law): the current at the top.
    assert ranged["load"]["current"]["value"] == pytest.approx(125 / 440)
    text = ["size", "--voltage", "88V..125V", "--resistance", "440ohm"]
    assert cli.main([*text, "--inductance", "2.1H", "--no-color"]) == 0
    assert (
        "highest voltage of the supply's range 88 V..125 V" in capsys.readouterr().out
    )
    assert cli.main(["size", "--voltage", "125V..88V", *coil]) == 2
    assert "runs backwards" in capsys.readouterr().err
