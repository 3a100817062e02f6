"""Limits a user would expect, each with a clear, located error.

File size, include depth and confinement, numbers out of range, impossible
(negative or zero) values, YAML alias bombs, deep nesting, duplicate keys and
non-UTF-8 text; and the cost of reporting errors, which must not grow with the
square of the file.
"""

from __future__ import annotations

import os
import time
from collections.abc import Mapping
from pathlib import Path

import pytest
from robust_helpers import assert_well_behaved, run_cli, time_limit

from netcheck.errors import InputError, QuantityError
from netcheck.input import load_design
from netcheck.input.cnet.parse import parse_text, parse_with_grammar
from netcheck.input.cnet.read import MAX_FILE_BYTES, MAX_INCLUDE_DEPTH
from netcheck.source import Span, excerpt, register_text
from netcheck.units import parse_quantity
from netcheck.yamlsafe import MAX_DEPTH, MAX_NODES, load_located_yaml

BASE = (
    "supply  G1  dc=24V  earth=minus  +:L+  -:M\n"
    "switch  S1  13:L+  14:W1\n"
    "load    Y1  type=valve  R=72ohm  L=1H  1:W1  2:M\n"
    "diode   V1  A:M  K:W1\n"
)
PARTS_HEAD = (
    "format: netcheck-parts/1\n"
    "note: Illustrative values for a test; not any manufacturer's data.\n"
    "parts:\n"
)


def _write(folder: Path, files: Mapping[str, str | bytes]) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    for name, content in files.items():
        path = folder / name
        path.parent.mkdir(parents=True, exist_ok=True)
        if isinstance(content, bytes):
            path.write_bytes(content)
        else:
            path.write_text(content, encoding="utf-8")
    return folder


def _check(
    tmp_path: Path,
    name: str,
    files: Mapping[str, str | bytes],
    top: str = "top.cnet",
    *args: str,
):  # type: ignore[no-untyped-def]
    _write(tmp_path / name, files)
    outcome = run_cli(["check", f"{name}/{top}", *args], tmp_path)
    assert_well_behaved(outcome, root=tmp_path, limit=20)
    return outcome


# --- file size ----------------------------------------------------------------


def test_a_file_over_the_size_limit_is_refused_without_reading_it(
    tmp_path: Path,
) -> None:
    folder = _write(tmp_path / "big", {"top.cnet": BASE})
    with (folder / "top.cnet").open("a", encoding="utf-8") as out:
        out.write("#" * (MAX_FILE_BYTES - len(BASE) + 1))
    outcome = run_cli(["check", "big/top.cnet"], tmp_path)
    assert_well_behaved(outcome, limit=10)
    assert outcome.code == 2 and "larger than" in outcome.err


def test_an_included_file_over_the_limit_is_reported_at_the_include(
    tmp_path: Path,
) -> None:
    folder = _write(tmp_path / "inc", {"top.cnet": BASE + 'include "huge.cnet"\n'})
    with (folder / "huge.cnet").open("w", encoding="utf-8") as out:
        out.write("#" * (MAX_FILE_BYTES + 1))
    outcome = run_cli(["check", "inc/top.cnet"], tmp_path)
    assert_well_behaved(outcome, root=tmp_path, limit=10)
    assert outcome.code == 2 and "larger than" in outcome.err
    assert outcome.err.startswith("inc/top.cnet:5:9:")


def test_a_file_at_the_size_limit_is_read(tmp_path: Path) -> None:
    comment = "# " + "x" * (MAX_FILE_BYTES - len(BASE) - 3) + "\n"
    outcome = _check(tmp_path, "at-limit", {"top.cnet": BASE + comment})
    assert len((tmp_path / "at-limit" / "top.cnet").read_bytes()) == MAX_FILE_BYTES
    assert outcome.code == 0, outcome.describe()


# --- includes -------------------------------------------------------------------


def _chain(depth: int) -> dict[str, str | bytes]:
    """top.cnet includes s1, s1 includes s2, ... down to s<depth>."""
    files: dict[str, str | bytes] = {"top.cnet": BASE + 'include "s1.cnet"\n'}
    for i in range(1, depth + 1):
        files[f"s{i}.cnet"] = f'include "s{i + 1}.cnet"\n' if i < depth else "# last\n"
    return files


def test_includes_as_deep_as_the_limit_are_read(tmp_path: Path) -> None:
    outcome = _check(tmp_path, "deep-ok", _chain(MAX_INCLUDE_DEPTH))
    assert outcome.code == 0, outcome.describe()


def test_includes_deeper_than_the_limit_are_an_error(tmp_path: Path) -> None:
    outcome = _check(tmp_path, "deep", _chain(MAX_INCLUDE_DEPTH + 1))
    assert outcome.code == 2, outcome.describe()
    assert f"nested deeper than {MAX_INCLUDE_DEPTH}" in outcome.err
    assert outcome.err.startswith(f"deep/s{MAX_INCLUDE_DEPTH}.cnet:1:9:")


@pytest.mark.parametrize("statement", ["include", "parts"])
def test_a_path_leaving_the_top_folder_needs_allow_outside(
    tmp_path: Path, statement: str
) -> None:
    outside = BASE if statement == "include" else PARTS_HEAD + "  x: {kind: diode}\n"
    name = "shared.cnet" if statement == "include" else "shared.parts.yaml"
    files = {"design/top.cnet": f'{statement} "../{name}"\n' + BASE, name: outside}
    if statement == "include":
        files["design/top.cnet"] = f'include "../{name}"\n'
    _write(tmp_path / "conf", files)
    refused = run_cli(["check", "conf/design/top.cnet"], tmp_path)
    assert_well_behaved(refused, root=tmp_path)
    assert refused.code == 2 and "outside the design's folder" in refused.err
    assert refused.err.startswith("conf/design/top.cnet:1:")
    allowed = run_cli(["check", "--allow-outside", "conf/design/top.cnet"], tmp_path)
    assert_well_behaved(allowed, root=tmp_path)
    assert allowed.code == 0, allowed.describe()


def test_a_symlink_inside_the_folder_pointing_outside_is_confined(
    tmp_path: Path,
) -> None:
    _write(
        tmp_path / "sym",
        {"design/top.cnet": 'include "link.cnet"\n', "secret.cnet": BASE},
    )
    (tmp_path / "sym" / "design" / "link.cnet").symlink_to("../secret.cnet")
    outcome = run_cli(["check", "sym/design/top.cnet"], tmp_path)
    assert_well_behaved(outcome, root=tmp_path)
    assert outcome.code == 2 and "outside the design's folder" in outcome.err


# --- numbers --------------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "ok"),
    [
        ("1e15V", True),
        ("-1e15V", True),
        ("1.0000001e15V", False),
        ("1e16V", False),
        ("1e999V", False),
        ("-1e999V", False),
        ("1e308V", False),
        ("2e308V", False),
        ("999999999999999999999999999999V", False),
        ("0.000000000000000000000000000001V", True),
    ],
)
def test_the_range_of_quantities(text: str, ok: bool) -> None:
    if ok:
        assert (
            parse_quantity(text, "voltage").units
            == parse_quantity("1V", "voltage").units
        )
    else:
        with pytest.raises(QuantityError, match="out of range"):
            parse_quantity(text, "voltage")


@pytest.mark.parametrize("text", ["1e15kV", "1e15QV", "999999999999999Yohm"])
def test_the_range_applies_to_the_value_not_the_digits(text: str) -> None:
    dimension = "resistance" if "ohm" in text else "voltage"
    with pytest.raises(QuantityError, match="out of range"):
        parse_quantity(text, dimension)


# What the language must refuse, as (kind, attribute, value); each goes into a
# small valid design in place of (or beside) its usual value.
IMPOSSIBLE = [
    ("load", "R", "-5ohm"),
    ("load", "R", "0ohm"),
    ("load", "L", "-1H"),
    ("load", "tau", "-1ms"),
    ("load", "P", "-1W"),
    ("load", "I", "-1A"),
    ("resistor", "R", "-5ohm"),
    ("resistor", "R", "0ohm"),
    ("capacitor", "C", "-1uF"),
    ("capacitor", "C", "0uF"),
    ("rc", "R", "-100ohm"),
    ("rc", "C", "-1uF"),
    ("diode", "vf", "-0.9V"),
    ("diode", "voltage_rating", "-1000V"),
    ("diode", "current_rating", "0A"),
    ("zener", "vz", "-15V"),
    ("varistor", "energy", "-1J"),
    ("tvs", "vclamp", "-53V"),
    ("supply", "r_int", "-1ohm"),
    ("supply", "isc", "-1A"),
    ("supply", "dc", "0V"),
    ("supply", "dc", "-24V"),
]
POSSIBLE = [
    ("load", "L", "0H"),
    ("supply", "r_int", "0ohm"),
]


def _design_with(kind: str, key: str, value: str) -> str:
    if kind == "supply":
        return (
            BASE.replace("earth=minus", f"earth=minus  {key}={value}", 1)
            if key != "dc"
            else BASE.replace("dc=24V", f"dc={value}", 1)
        )
    if kind == "load":
        line = "load    Y1  type=valve  R=72ohm  L=1H  1:W1  2:M\n"
        values = {"R": "72ohm", "L": "1H"}
        values[key] = value
        attrs = "  ".join(f"{k}={v}" for k, v in values.items())
        return BASE.replace(line, f"load    Y1  type=valve  {attrs}  1:W1  2:M\n")
    terminals = {"diode": "A:M  K:W1", "zener": "A:M  K:W1", "tvs": "A:M  K:W1"}
    return BASE + f"{kind}  X1  {key}={value}  {terminals.get(kind, '1:W1  2:M')}\n"


@pytest.mark.parametrize(
    ("kind", "key", "value"), IMPOSSIBLE, ids=[f"{k}-{a}={v}" for k, a, v in IMPOSSIBLE]
)
def test_impossible_values_are_input_errors(
    tmp_path: Path, kind: str, key: str, value: str
) -> None:
    outcome = _check(tmp_path, "v", {"top.cnet": _design_with(kind, key, value)})
    assert outcome.code == 2, outcome.describe()
    assert key in outcome.err, outcome.describe()
    line = next(
        i
        for i, text in enumerate(_design_with(kind, key, value).split("\n"), 1)
        if f"{key}={value}" in text
    )
    assert outcome.err.startswith(f"v/top.cnet:{line}:"), outcome.describe()


@pytest.mark.parametrize(
    ("kind", "key", "value"), POSSIBLE, ids=[f"{k}-{a}={v}" for k, a, v in POSSIBLE]
)
def test_zero_where_zero_is_meaningful_is_accepted(
    tmp_path: Path, kind: str, key: str, value: str
) -> None:
    outcome = _check(tmp_path, "z", {"top.cnet": _design_with(kind, key, value)})
    assert outcome.code in (0, 1), outcome.describe()


@pytest.mark.parametrize(
    ("part", "key"),
    [
        ("  valve: {kind: load, type: valve, R: -72 ohm, L: 1 H}\n", "R"),
        ("  valve: {kind: load, type: valve, R: 0 ohm, L: 1 H}\n", "R"),
        ("  valve: {kind: load, type: valve, R: 72 ohm, L: -1 H}\n", "L"),
        (
            "  valve: {kind: load, type: valve, R: 72 ohm, L: 1 H}\n"
            "  k:\n    kind: relay\n    coil: {terminals: [A1, A2], supply: dc,"
            " voltage: 24 V, resistance: -640 ohm, inductance: 1.1 H}\n",
            "resistance",
        ),
    ],
    ids=["R-negative", "R-zero", "L-negative", "coil-resistance-negative"],
)
def test_impossible_part_values_are_located_errors(
    tmp_path: Path, part: str, key: str
) -> None:
    top = 'parts "p.parts.yaml"\n' + BASE.replace(
        "type=valve  R=72ohm  L=1H", "part=valve"
    )
    outcome = _check(
        tmp_path, "pv", {"top.cnet": top, "p.parts.yaml": PARTS_HEAD + part}
    )
    assert outcome.code == 2, outcome.describe()
    assert outcome.err.startswith("pv/p.parts.yaml:") and f".{key}" in outcome.err


def test_a_tiny_resistance_is_refused_or_computed_honestly(tmp_path: Path) -> None:
    design = BASE.replace("R=72ohm", "R=1e-9ohm")
    outcome = _check(
        tmp_path, "tiny", {"top.cnet": design}, "top.cnet", "--format", "json"
    )
    if outcome.code == 2:
        assert "R" in outcome.err
        return
    import json

    currents = [
        f["values"]["current"]["value"]
        for f in json.loads(outcome.out)["findings"]
        if "current" in f["values"]
    ]
    assert currents and all(c == pytest.approx(24 / 1e-9, rel=0.01) for c in currents)


# --- YAML -------------------------------------------------------------------------


def _nested_lists(depth: int) -> str:
    return "[" * depth + "]" * depth + "\n"


def test_yaml_nesting_up_to_the_limit_is_read() -> None:
    doc = load_located_yaml(_nested_lists(MAX_DEPTH + 1), "n.yaml", InputError)
    assert doc.data is not None


def test_yaml_nesting_beyond_the_limit_is_a_located_error() -> None:
    with pytest.raises(InputError, match=f"nested more than {MAX_DEPTH}") as caught:
        load_located_yaml(_nested_lists(MAX_DEPTH + 2), "n.yaml", InputError)
    assert caught.value.span is not None and caught.value.span.file == "n.yaml"


def test_yaml_nesting_deep_enough_to_exhaust_the_stack_is_an_error() -> None:
    with time_limit(20), pytest.raises(InputError, match="nested"):
        load_located_yaml(_nested_lists(200_000), "n.yaml", InputError)


def test_an_alias_bomb_stops_at_the_node_budget_quickly() -> None:
    lines = ['a0: &a0 ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]']
    for i in range(1, 12):
        lines.append(f"a{i}: &a{i} [" + ", ".join([f"*a{i - 1}"] * 9) + "]")
    start = time.perf_counter()
    with time_limit(20), pytest.raises(InputError, match=str(MAX_NODES)):
        load_located_yaml("\n".join(lines) + "\n", "bomb.yaml", InputError)
    assert time.perf_counter() - start < 10


def test_aliases_of_mappings_are_counted_too() -> None:
    keys = ", ".join(f"k{i}: 1" for i in range(9))
    lines = [f"m0: &m0 {{{keys}}}"]
    for i in range(1, 8):
        lines.append(
            f"m{i}: &m{i} {{" + ", ".join(f"k{j}: *m{i - 1}" for j in range(9)) + "}"
        )
    with time_limit(20), pytest.raises(InputError, match="aliased"):
        load_located_yaml("\n".join(lines) + "\n", "maps.yaml", InputError)


@pytest.mark.parametrize(
    ("text", "key", "line"),
    [
        ("a: 1\na: 2\n", "a", 2),
        ("a:\n  b: 1\n  c: 2\n  b: 3\n", "b", 4),
        ("- {x: 1, x: 2}\n", "x", 1),
        ("'no': 1\nno: 2\n", "no", 2),
    ],
)
def test_duplicate_yaml_keys_are_located_errors(text: str, key: str, line: int) -> None:
    with pytest.raises(InputError, match=f"duplicate key '{key}'") as caught:
        load_located_yaml(text, "d.yaml", InputError)
    assert caught.value.span is not None and caught.value.span.line == line


@pytest.mark.parametrize(
    "text",
    [
        "!!python/object/apply:os.system ['true']\n",
        "a: !!python/object:os.system {x: 1}\n",
        "a: !!python/name:os.system\n",
        "a: !!python/tuple [1, 2]\n",
        "a: !custom 1\n",
    ],
)
def test_yaml_tags_beyond_plain_data_are_refused(text: str) -> None:
    with pytest.raises(InputError):
        load_located_yaml(text, "t.yaml", InputError)


# --- text encoding -------------------------------------------------------------------


@pytest.mark.parametrize(
    ("data", "where"),
    [
        (b"supply  G1  dc=24V  +:L+  -:M\n# \xff\n", "3:"),
        (b"supply  G1  dc=24V  +:L+  -:M\n# \xc3\n", "3:"),
        (b"supply  G1  dc=24V  +:L+  -:M\n# \xed\xa0\x80 (a surrogate)\n", "3:"),
        (b"supply  G1  dc=24V  +:L+  -:M\n# \xf4\x90\x80\x80 (above U+10FFFF)\n", "3:"),
        (b"supply  G1  dc=24V  +:L+  -:M\n# \xc0\xaf (overlong)\n", "3:"),
        (b"\xff\xfes\x00u\x00p\x00", "1:1"),  # UTF-16 with its BOM
    ],
    ids=["ff", "truncated", "surrogate", "too-high", "overlong", "utf-16"],
)
def test_non_utf8_text_is_a_located_error(
    tmp_path: Path, data: bytes, where: str
) -> None:
    data = (
        data.replace(b"# ", b"switch  S1  13:L+  14:W1\n# ") if where == "3:" else data
    )
    outcome = _check(tmp_path, "enc", {"top.cnet": data})
    assert outcome.code == 2 and "not UTF-8" in outcome.err, outcome.describe()
    assert outcome.err.startswith(f"enc/top.cnet:{where}"), outcome.describe()


def test_a_non_utf8_part_library_is_an_error_naming_it(tmp_path: Path) -> None:
    top = 'parts "p.parts.yaml"\n' + BASE
    lib = (PARTS_HEAD + "  d: {kind: diode, description: r\xe9sistance}\n").encode(
        "latin-1"
    )
    outcome = _check(tmp_path, "yenc", {"top.cnet": top, "p.parts.yaml": lib})
    assert outcome.code == 2 and "not UTF-8" in outcome.err
    assert "p.parts.yaml" in outcome.err


# --- the cost of errors --------------------------------------------------------------


def _statements(count: int, value: str = "10ohm") -> str:
    return "".join(f"load  Y{i}  R={value}  1:A{i}  2:B\n" for i in range(count))


def test_syntax_errors_at_the_end_cost_about_one_parse() -> None:
    good = _statements(1000)
    start = time.perf_counter()
    # A file with errors is read by the grammar (the fast line reader gives up on
    # it), so one grammar parse of the clean text is the yardstick.
    parse_with_grammar(good, "good.cnet")
    one_parse = time.perf_counter() - start
    bad = good + "".join(f"load  Z{i}  R=  1:A  2:B\n" for i in range(25))
    allowed = 5 * one_parse + 0.5
    start = time.perf_counter()
    with time_limit(allowed + 0.05), pytest.raises(InputError):
        parse_text(bad, "bad.cnet")
    assert time.perf_counter() - start < allowed


def test_an_excerpt_costs_the_same_in_a_long_file() -> None:
    register_text("short.cnet", "x\n" * 10)
    register_text("long.cnet", "x\n" * 200_000)
    start = time.perf_counter()
    for _ in range(200):
        excerpt(Span("short.cnet", 10, 1))
    short = time.perf_counter() - start
    start = time.perf_counter()
    for _ in range(200):
        excerpt(Span("long.cnet", 200_000, 1))
    long = time.perf_counter() - start
    assert long < 20 * short + 0.05


def test_excerpt_cache_is_not_stale(tmp_path: Path) -> None:
    _write(tmp_path / "a", {"top.cnet": "# first file, line 1\n# first file, line 2\n"})
    _write(tmp_path / "b", {"top.cnet": b"supply  G1  dc=24V  +:L+  -:M\n# \x00\n"})
    first = run_cli(["check", "top.cnet"], tmp_path / "a")
    assert first.code == 0
    second = run_cli(["check", "top.cnet"], tmp_path / "b")
    assert second.code == 2
    assert second.err.split("\n")[1] == "# \x00", second.describe()


@pytest.mark.parametrize(
    "filler",
    ["\n", "# a comment\n", "    # indented\n"],
    ids=["blank", "comment", "indented-comment"],
)
def test_blank_and_comment_lines_cost_linear_time(filler: str) -> None:
    statements = _statements(1000)
    start = time.perf_counter()
    parse_text(statements, "statements.cnet")
    allowed = time.perf_counter() - start + 0.5
    text = "supply  G1  dc=24V  +:L+  -:M\n" + filler * 8_000
    start = time.perf_counter()
    with time_limit(allowed + 0.05):
        parse_text(text, "comments.cnet")
    assert time.perf_counter() - start < allowed


def test_load_design_on_a_directory_is_an_input_error(tmp_path: Path) -> None:
    (tmp_path / "d.cnet").mkdir()
    with pytest.raises(InputError):
        load_design(tmp_path / "d.cnet")
    outcome = run_cli(["check", "d.cnet"], tmp_path)
    assert_well_behaved(outcome)
    assert outcome.code == 2


@pytest.mark.skipif(os.geteuid() == 0, reason="root reads every file")
def test_an_unreadable_file_is_an_error(tmp_path: Path) -> None:
    _write(tmp_path / "u", {"top.cnet": BASE})
    (tmp_path / "u" / "top.cnet").chmod(0)
    outcome = run_cli(["check", "u/top.cnet"], tmp_path)
    assert_well_behaved(outcome)
    assert outcome.code == 2
