"""``netcheck size``: option parsing, exit codes, the Size JSON shape and the text."""

from __future__ import annotations

import dataclasses
import io
import json

import pytest
from rich.console import Console

from netcheck import cli
from netcheck.report.size import render_size_text, size_to_json
from netcheck.sizing import size_load
from netcheck.units import Q_

SPEC = ["--voltage", "110V", "--resistance", "440ohm", "--inductance", "2.1H"]
KINDS = ["diode", "diode-zener", "varistor", "tvs", "rc"]
SI = {"V", "A", "s", "J", "ohm", "F"}


def run(argv, capsys):
    code = cli.main(["size", *argv])
    out, err = capsys.readouterr()
    return code, out, err


def assert_quantity(entry, unit):
    assert list(entry) == ["value", "unit", "text"]
    assert entry["unit"] == unit
    assert isinstance(entry["value"], float)
    assert isinstance(entry["text"], str) and entry["text"]


def test_size_json_shape(capsys):
    code, out, err = run([*SPEC, "--format", "json"], capsys)
    assert code == 0 and err == ""
    data = json.loads(out)
    assert list(data) == ["format", "load", "options"]
    assert data["format"] == "netcheck-size/1"
    assert list(data["load"]) == ["current", "time_constant", "energy"]
    for key, unit in (("current", "A"), ("time_constant", "s"), ("energy", "J")):
        assert_quantity(data["load"][key], unit)
    # V/R for the cli.md example (first principles)
    assert data["load"]["current"]["value"] == pytest.approx(0.25)
    assert [o["kind"] for o in data["options"]] == KINDS
    for entry in data["options"]:
        keys = ["kind", "peak_voltage", "release_time", "clamp_energy", "components"]
        assert list(entry) == keys
        assert_quantity(entry["peak_voltage"], "V")
        assert_quantity(entry["release_time"], "s")
        assert_quantity(entry["clamp_energy"], "J")
        assert entry["components"]
        for value in entry["components"].values():
            assert value["unit"] in SI
            assert_quantity(value, value["unit"])
    rc = data["options"][4]["components"]
    assert rc["capacitance"]["unit"] == "F" and rc["resistance"]["unit"] == "ohm"


def test_size_json_is_deterministic(capsys):
    first = run([*SPEC, "--format", "json"], capsys)[1]
    second = run([*SPEC, "--format", "json"], capsys)[1]
    assert first == second


def test_options_reach_the_sizing(capsys):
    argv = [
        *SPEC,
        "--clamp",
        "250V",
        "--vf",
        "0.7V",
        "--release-current",
        "25mA",
        "--format",
        "json",
    ]
    data = json.loads(run(argv, capsys)[1])
    diode, zener = data["options"][0], data["options"][1]
    assert diode["peak_voltage"]["value"] == pytest.approx(110.7)  # Vs + Vf
    assert zener["components"]["zener_voltage"]["value"] == pytest.approx(250)
    assert zener["peak_voltage"]["value"] == pytest.approx(110 + 250 + 0.7)


def test_unbounded_values_are_null_in_json():
    result = size_load(Q_(24, "V"), Q_(48, "ohm"), Q_(0.48, "H"))
    endless = dataclasses.replace(result.options[0], release_time=Q_(float("inf"), "s"))
    result = dataclasses.replace(result, options=(endless, *result.options[1:]))
    entry = json.loads(size_to_json(result))["options"][0]["release_time"]
    assert entry == {"value": None, "unit": "s", "text": "unbounded"}


def test_text_report_compares_options_and_cautions(capsys):
    code, out, _ = run([*SPEC, "--no-color"], capsys)
    assert code == 0
    for kind in KINDS:
        assert kind in out
    assert "reverse voltage ≥ 220 V" in out  # 2 x 110 V default margin (WE-12)
    assert "do not replace the manufacturer's data" in " ".join(out.split())


def test_render_size_text_to_a_console():
    buffer = io.StringIO()
    console = Console(file=buffer, width=100, no_color=True)
    render_size_text(size_load(Q_(24, "V"), Q_(48, "ohm"), Q_(0.48, "H")), console)
    text = buffer.getvalue()
    assert "what to buy" in text and "I²/10 rule" in text


@pytest.mark.parametrize(
    ("argv", "fragment"),
    [
        (
            ["--voltage", "11xV", "--resistance", "440ohm", "--inductance", "2.1H"],
            "--voltage:",
        ),
        (
            ["--voltage", "110V", "--resistance", "440V", "--inductance", "2.1H"],
            "--resistance:",
        ),
        (
            ["--voltage", "110V", "--resistance=-4ohm", "--inductance", "2.1H"],
            "resistance must be positive",
        ),
        ([*SPEC, "--release-current", "3"], "--release-current:"),
    ],
)
def test_bad_quantities_exit_2_without_traceback(argv, fragment, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    assert err.startswith("netcheck: error: ")
    assert fragment in err
    assert "Traceback" not in err


def test_missing_required_option_is_a_usage_error(capsys):
    code, out, err = run(["--voltage", "24V"], capsys)
    assert code == 2 and out == ""
    assert "the following arguments are required: --resistance" in err


def test_size_takes_margins_from_a_config_file(tmp_path, capsys):
    # WE-12: PIV >= 10 x 110 V = 1100 V with the relay makers' rule set in
    # netcheck.yaml, instead of the default 2 x = 220 V.
    import json as _json

    from netcheck import cli as _cli

    config = tmp_path / "netcheck.yaml"
    config.write_text("margins: {diode-reverse-voltage: 10}\n", encoding="utf-8")
    argv = [
        "size",
        "--voltage",
        "110V",
        "--resistance",
        "302ohm",
        "--inductance",
        "1H",
        "--format",
        "json",
    ]
    assert _cli.main([*argv, "--config", str(config)]) == 0
    options = _json.loads(capsys.readouterr().out)["options"]
    diode = next(o for o in options if o["kind"] == "diode")
    assert diode["components"]["reverse_voltage"]["value"] == 1100.0
    config.write_text("margins: {diode-reverse: 2.0}\n", encoding="utf-8")
    assert _cli.main([*argv, "--config", str(config)]) == 2
    assert "unknown margin" in capsys.readouterr().err
