"""Property-based and mutation tests: hostile input never breaks netcheck.

The inputs: byte, line and token mutations of the shipped samples
(``sample_nets/**``), random garbage text and bytes, random quantities,
structure-aware mutations of the sample part libraries, and random include
graphs. The property (``robust_helpers.assert_well_behaved``): ``netcheck.cli.main``
ends with exit 0, 1 or 2 within a bounded time, never raises, never prints a
traceback, and an exit-2 run prints ``file:line:column: error: ...`` with the
offending line and a caret (``netcheck: error: ...`` where no position applies).

The example counts keep this file at about half a minute on two cores;
``NETCHECK_FUZZ_LONG=1`` adds a run of a thousand corruptions, and
``NETCHECK_FUZZ_RANDOM=1`` draws new examples instead of the fixed ones.
"""

from __future__ import annotations

import atexit
import functools
import itertools
import math
import os
import random
import re
import shutil
import tempfile
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from robust_helpers import SAMPLES, assert_well_behaved, run_cli, sample_names

from netcheck.attributes import QUANTITY_KEYS
from netcheck.errors import InputError
from netcheck.input.cnet.read import MAX_INCLUDE_DEPTH
from netcheck.input.parts import parse_library
from netcheck.model import Part
from netcheck.units import DIMENSIONS, parse_quantity

LONG = os.environ.get("NETCHECK_FUZZ_LONG") == "1"
RANDOM = os.environ.get("NETCHECK_FUZZ_RANDOM") == "1"
LIMIT = 20.0  # seconds one run of a mutated sample may take


def fuzz(examples: int) -> Callable[[Any], Any]:
    """Hypothesis settings of these tests: bounded, no deadline, no database."""
    return settings(
        max_examples=examples,
        deadline=None,
        database=None,
        derandomize=not RANDOM,
        suppress_health_check=[
            HealthCheck.too_slow,
            HealthCheck.data_too_large,
            HealthCheck.filter_too_much,
        ],
    )


# --- the samples, read once -----------------------------------------------------------


@dataclass(frozen=True)
class Sample:
    """One shipped sample design: its files' bytes, by name."""

    name: str
    files: dict[str, bytes]

    @property
    def top(self) -> str:
        """The top file's name."""
        return f"{self.name}.cnet"

    def names(self, suffix: str) -> list[str]:
        """The names of its files ending in ``suffix``, sorted."""
        return sorted(n for n in self.files if n.endswith(suffix))


def _read_samples() -> list[Sample]:
    out = []
    for name in sample_names():
        folder = SAMPLES / name
        files = {
            p.name: p.read_bytes() for p in sorted(folder.iterdir()) if p.is_file()
        }
        out.append(Sample(name, files))
    return out


ALL_SAMPLES = _read_samples()
_TOKENS = re.compile(rb"\S+")
SAMPLE_TOKENS = sorted(
    {
        t
        for s in ALL_SAMPLES
        for n in s.names(".cnet")
        for t in _TOKENS.findall(s.files[n])
    }
)
HOSTILE_TOKENS = [
    b"=",
    b":",
    b'"',
    b"#",
    b"\\",
    b"R=",
    b"R=-5ohm",
    b"R=0ohm",
    b"L=-1H",
    b"L=0H",
    b"dc=0V",
    b"dc=-24V",
    b"dc=1e999V",
    b"dc=NaNV",
    b"R=1e-300ohm",
    b"C=0F",
    b"part=no-such-part",
    b"part=",
    b"include",
    b'"../outside.cnet"',
    b'"/etc/passwd"',
    b"parts",
    b"title",
    b"waive",
    b"K1:13-14",
    b"13:",
    b":N",
    b"A1:A1",
    b"+:-",
    b"\xce\xa9",
    b"47\xce\xa9",
    b'"48 ohm"',
    b'"24 V"',
    b"type=motor",
    b"tags=,,,",
    b"suppression=diode",
    b"earth=mid",
    b"bidirectional=yes",
    b"99:X",
    b"A3:Y",
    b"\xef\xbb\xbf",
    b"\xff",
    b"\x00",
    b"\t",
    b"relay",
    b"load",
    b"supply",
    b"diode",
    b"1e15V",
    b"1e15kV",
    b"-0V",
    b"+24V",
    b".5A",
    b"5.A",
    b"1e-9ohm",
    b"1_000V",
]
TOKEN_POOL = SAMPLE_TOKENS + HOSTILE_TOKENS
INTERESTING_BYTES = sorted(
    set(b' \t\n"#:=\\+-.0123456789eEVAHFohm\x00\xff\xc3\xce\xa9\xef\xbb\xbf')
)

_counter = itertools.count()
_ROOT = Path(tempfile.mkdtemp(prefix="netcheck-fuzz-"))
atexit.register(shutil.rmtree, _ROOT, True)


@contextmanager
def scratch() -> Iterator[tuple[Path, str]]:
    """A fresh folder under a private root, with a unique name, removed after.

    The unique name gives every example its own display paths: the excerpt
    cache is keyed by display path (see test_limits.py).
    """
    name = f"ex{next(_counter)}"
    folder = _ROOT / name
    folder.mkdir(parents=True)
    try:
        yield folder, name
    finally:
        shutil.rmtree(folder, ignore_errors=True)


def _write_sample(folder: Path, sample: Sample, replaced: dict[str, bytes]) -> None:
    for name, data in sample.files.items():
        (folder / name).write_bytes(replaced.get(name, data))


def _run_sample(sample: Sample, replaced: dict[str, bytes], fmt: str) -> None:
    with scratch() as (folder, name):
        _write_sample(folder, sample, replaced)
        argv = ["check", f"{name}/{sample.top}", "--format", fmt]
        outcome = run_cli(argv, _ROOT, limit=LIMIT + 10)
        assert_well_behaved(outcome, root=_ROOT, limit=LIMIT)


# --- mutations ------------------------------------------------------------------------


def mutate_bytes(data: bytes, rng: random.Random, count: int) -> bytes:
    """Insert, delete, replace or duplicate single bytes and short runs."""
    buf = bytearray(data)
    for _ in range(count):
        at = rng.randrange(len(buf) + 1)
        byte = (
            rng.choice(INTERESTING_BYTES) if rng.random() < 0.7 else rng.randrange(256)
        )
        op = rng.randrange(5)
        if op == 0 or not buf:
            buf[at:at] = bytes([byte])
        elif op == 1:
            del buf[at : at + rng.randint(1, 8)]
        elif op == 2:
            buf[min(at, len(buf) - 1)] = byte
        elif op == 3:
            run = buf[at : at + rng.randint(1, 40)]
            buf[at:at] = run
        else:
            buf[min(at, len(buf) - 1)] ^= 1 << rng.randrange(8)
    return bytes(buf)


def mutate_lines(
    data: bytes, rng: random.Random, count: int, extra: list[bytes]
) -> bytes:
    """Delete, duplicate, swap, move, indent, dedent, truncate, join or borrow lines."""
    lines = data.split(b"\n")
    for _ in range(count):
        if not lines:
            lines = [b""]
        i = rng.randrange(len(lines))
        j = rng.randrange(len(lines))
        op = rng.randrange(11)
        if op == 0:
            del lines[i]
        elif op == 1:
            lines.insert(i, lines[j])
        elif op == 2:
            lines[i], lines[j] = lines[j], lines[i]
        elif op == 3:
            lines.insert(j, lines.pop(i))
        elif op == 4:
            lines[i] = rng.choice([b" ", b"    ", b"\t"]) + lines[i]
        elif op == 5:
            lines[i] = lines[i].lstrip()
        elif op == 6:
            lines[i] = lines[i][: rng.randrange(len(lines[i]) + 1)]
        elif op == 7 and i + 1 < len(lines):
            lines[i : i + 2] = [lines[i] + b" " + lines[i + 1]]
        elif op == 8 and extra:
            lines.insert(i, rng.choice(extra))
        elif op == 9:
            lines[i] = b"# " + lines[i]
        else:
            lines[i] = lines[i].lstrip(b"# ")
    return b"\n".join(lines)


def mutate_tokens(data: bytes, rng: random.Random, count: int) -> bytes:
    """Replace, delete, duplicate or swap whitespace-separated tokens."""
    pieces = re.split(rb"(\s+)", data)
    words = [k for k, p in enumerate(pieces) if p and not p.isspace()]
    for _ in range(count):
        if not words:
            break
        k = rng.choice(words)
        op = rng.randrange(5)
        if op == 0:
            pieces[k] = rng.choice(TOKEN_POOL)
        elif op == 1:
            pieces[k] = b""
        elif op == 2:
            pieces[k] = pieces[k] + b" " + pieces[k]
        elif op == 3:
            other = rng.choice(words)
            pieces[k], pieces[other] = pieces[other], pieces[k]
        else:  # glue a hostile fragment onto the token
            pieces[k] = pieces[k] + rng.choice(HOSTILE_TOKENS)
    return b"".join(pieces)


_CONNECTION = re.compile(rb'(?<=[ \t])([^\s:="#]+):([^\s:="#]+)')
_QUANTITY = re.compile(
    rb'(?<=[ \t])([A-Za-z_.]+)=([-+]?[0-9.]+(?:[eE][-+]?[0-9]+)?)([^\s"#]*)'
)
_CHOICE = re.compile(rb"(?<=[ \t])(type|suppression|earth|bidirectional)=(\S+)")
_CHOICES = {
    b"type": [
        b"resistive",
        b"solenoid",
        b"valve",
        b"brake",
        b"motor",
        b"lamp",
        b"capacitive",
        b"electronic",
        b"coil",
        b"heater",
        b"clutch",
    ],
    b"suppression": [b"none", b"diode", b"zener", b"varistor", b"rc", b"tvs"],
    b"earth": [b"minus", b"plus", b"none", b"mid"],
    b"bidirectional": [b"yes", b"no"],
}


def mutate_wiring(data: bytes, rng: random.Random, count: int) -> bytes:
    """Keep the syntax, change the circuit: rewire, reverse, rescale, drop, copy."""
    lines = data.split(b"\n")
    nets = sorted({m.group(2) for m in _CONNECTION.finditer(data)}) or [b"N"]
    for step in range(count):
        i = rng.randrange(len(lines))
        line = lines[i]
        op = rng.randrange(6)
        connections = list(_CONNECTION.finditer(line))
        if op == 0 and connections:  # move one terminal to another (or a new) net
            m = rng.choice(connections)
            net = rng.choice(nets) if rng.random() < 0.8 else b"NEW%d" % step
            lines[i] = line[: m.start(2)] + net + line[m.end(2) :]
        elif op == 1 and len(connections) >= 2:  # swap two nets: reverses a part
            a, b = rng.sample(connections, 2)
            first, second = sorted((a, b), key=lambda m: m.start())
            lines[i] = (
                line[: first.start(2)]
                + second.group(2)
                + line[first.end(2) : second.start(2)]
                + first.group(2)
                + line[second.end(2) :]
            )
        elif op == 2 and _QUANTITY.search(line):  # rescale a quantity
            m = rng.choice(list(_QUANTITY.finditer(line)))
            factor = rng.choice([1e-6, 1e-3, 0.1, 0.5, 2.0, 10.0, 1e3, 1e6])
            number = b"%g" % (float(m.group(2)) * factor)
            lines[i] = line[: m.start(2)] + number + line[m.end(2) :]
        elif op == 3 and line[:1].strip() and not line.startswith(b"#"):  # drop it
            end = i + 1
            while end < len(lines) and lines[end][:1] in (b" ", b"\t"):
                end += 1
            del lines[i:end]
        elif op == 4 and line[:1].strip() and not line.startswith(b"#"):  # copy it
            words = line.split(maxsplit=2)
            if len(words) >= 2 and words[0] not in (
                b"title",
                b"parts",
                b"include",
                b"waive",
            ):
                copy = line.replace(words[1], words[1] + b"x%d" % step, 1)
                lines.insert(i + 1, copy)
        elif _CHOICE.search(line):  # another load type, earthing, suppression
            m = rng.choice(list(_CHOICE.finditer(line)))
            lines[i] = (
                line[: m.start(2)] + rng.choice(_CHOICES[m.group(1)]) + line[m.end(2) :]
            )
    return b"\n".join(lines)


MUTATORS: dict[str, Callable[[bytes, random.Random, int], bytes]] = {
    "wiring": mutate_wiring,
    "bytes": mutate_bytes,
    "lines": lambda d, r, c: mutate_lines(
        d, r, c, [t for t in TOKEN_POOL if b" " not in t]
    ),
    "tokens": mutate_tokens,
}

samples = st.sampled_from(ALL_SAMPLES)
formats = st.sampled_from(["text", "json", "sarif"])


def _mutated_cnet(
    sample: Sample, seed: int, family: str, count: int
) -> dict[str, bytes]:
    rng = random.Random(seed)
    target = rng.choice(sample.names(".cnet"))
    return {target: MUTATORS[family](sample.files[target], rng, count)}


@fuzz(40)
@given(
    sample=samples, seed=st.integers(0, 2**32), count=st.integers(1, 12), fmt=formats
)
def test_byte_mutations_of_the_samples(
    sample: Sample, seed: int, count: int, fmt: str
) -> None:
    _run_sample(sample, _mutated_cnet(sample, seed, "bytes", count), fmt)


@fuzz(40)
@given(sample=samples, seed=st.integers(0, 2**32), count=st.integers(1, 8), fmt=formats)
def test_line_mutations_of_the_samples(
    sample: Sample, seed: int, count: int, fmt: str
) -> None:
    _run_sample(sample, _mutated_cnet(sample, seed, "lines", count), fmt)


@fuzz(40)
@given(sample=samples, seed=st.integers(0, 2**32), count=st.integers(1, 8), fmt=formats)
def test_token_mutations_of_the_samples(
    sample: Sample, seed: int, count: int, fmt: str
) -> None:
    _run_sample(sample, _mutated_cnet(sample, seed, "tokens", count), fmt)


@fuzz(40)
@given(
    sample=samples, seed=st.integers(0, 2**32), count=st.integers(1, 10), fmt=formats
)
def test_wiring_mutations_of_the_samples(
    sample: Sample, seed: int, count: int, fmt: str
) -> None:
    _run_sample(sample, _mutated_cnet(sample, seed, "wiring", count), fmt)


# --- garbage --------------------------------------------------------------------------


def _run_text(data: bytes, *options: str) -> None:
    with scratch() as (folder, name):
        (folder / "top.cnet").write_bytes(data)
        outcome = run_cli(
            ["check", f"{name}/top.cnet", *options], _ROOT, limit=LIMIT + 10
        )
        assert_well_behaved(outcome, root=_ROOT, limit=LIMIT)


@fuzz(80)
@given(text=st.text(max_size=400))
def test_random_text(text: str) -> None:
    _run_text(text.encode("utf-8", errors="surrogatepass"))


@fuzz(40)
@given(data=st.binary(max_size=400))
def test_random_bytes(data: bytes) -> None:
    _run_text(data)


_word = st.sampled_from(TOKEN_POOL)
_gap = st.sampled_from(
    [b" ", b"  ", b"\t", b"\n", b"\n    ", b"\n\n", b"\r\n", b" # x\n"]
)


@fuzz(80)
@given(pieces=st.lists(st.tuples(_word, _gap), max_size=60), fmt=formats)
def test_random_token_soup(pieces: list[tuple[bytes, bytes]], fmt: str) -> None:
    _run_text(b"".join(w + g for w, g in pieces), "--format", fmt)


@pytest.mark.parametrize(
    "text",
    ["{", "=", ":", "\u00e9t\u00e9", " {", '{"format": 1}'],
    ids=["brace", "equals", "colon", "accent", "indented", "json"],
)
def test_an_unexpected_first_character_is_an_input_error(text: str) -> None:
    with scratch() as (folder, name):
        (folder / "top.cnet").write_text(text, encoding="utf-8")
        outcome = run_cli(["check", f"{name}/top.cnet"], _ROOT)
        assert_well_behaved(outcome, root=_ROOT, limit=LIMIT)
        assert outcome.code == 2
        assert outcome.err.startswith(f"{name}/top.cnet:1:")


# --- quantities -----------------------------------------------------------------------

_UNITS = [
    "",
    "V",
    "mV",
    "kV",
    "MV",
    "A",
    "mA",
    "uA",
    "µA",
    "μA",
    "kA",
    "ohm",
    "Ω",
    "kohm",
    "kΩ",
    "Mohm",
    "mohm",
    "H",
    "mH",
    "uH",
    "F",
    "uF",
    "µF",
    "nF",
    "pF",
    "s",
    "ms",
    "us",
    "min",
    "hour",
    "J",
    "mJ",
    "kJ",
    "W",
    "mW",
    "kW",
    "Hz",
    "kHz",
    "m",
    "mm",
    "%",
    "degC",
    "K",
    "V/A",
    "ohms",
    "volts",
    "Q",
    "QV",
    "yV",
    "x",
    "VV",
    "v",
    "Ohm",
    "e",
    "inf",
    "nan",
    "E",
    "dB",
    "°",
    "1",
    "kg",
    "N",
]
_numbers = st.one_of(
    st.integers(-(10**20), 10**20).map(str),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.floats(min_value=-1e18, max_value=1e18).map(lambda f: f"{f:.6g}"),
    st.sampled_from(
        [
            "0",
            "-0",
            "+0",
            ".5",
            "5.",
            "1e15",
            "1e16",
            "1e308",
            "1e309",
            "1e-324",
            "-1e999",
            "0x10",
            "1_000",
            "١٢",
            "½",
            "NaN",
            "inf",
            "1e",
            "e5",
            "--1",
            "+-1",
            "1.2.3",
            "",
            " ",
            "1e+15",
            "9" * 400,
        ]
    ),
)
quantities = st.builds(
    lambda n, gap, unit: f"{n}{gap}{unit}",
    _numbers,
    st.sampled_from(["", "", " ", "  ", "\t"]),
    st.sampled_from(_UNITS),
)


@fuzz(400)
@given(
    text=st.one_of(quantities, st.text(max_size=30)),
    dimension=st.sampled_from(sorted(DIMENSIONS)),
)
def test_parse_quantity_returns_a_finite_quantity_or_a_quantity_error(
    text: str, dimension: str
) -> None:
    try:
        value = parse_quantity(text, dimension)
    except InputError:
        return
    assert math.isfinite(float(value.magnitude)), (text, value)
    expected = parse_quantity(
        f"1 {DIMENSIONS[dimension]}" if DIMENSIONS[dimension] else "1", dimension
    )
    assert value.dimensionality == expected.dimensionality, (text, value)


_DESIGN = (
    "supply  G1  dc=24V  earth=minus  r_int=50mohm  +:L+  -:M\n"
    "switch  S1  13:L+  14:W1\n"
    "load    Y1  type=valve  R=72ohm  L=1H  1:W1  2:M\n"
    "diode   V1  A:M  K:W1  vf=0.9V\n"
    "rc      C1  R=100ohm  C=1uF  1:W1  2:M\n"
)
# (line, key) pairs of _DESIGN whose value a test replaces.
_SLOTS = [(1, "dc"), (1, "r_int"), (3, "R"), (3, "L"), (4, "vf"), (5, "R"), (5, "C")]


@fuzz(50)
@given(
    slot=st.sampled_from(_SLOTS), quantity=quantities, quoted=st.booleans(), fmt=formats
)
def test_random_quantities_in_a_design(
    slot: tuple[int, str], quantity: str, quoted: bool, fmt: str
) -> None:
    line, key = slot
    lines = _DESIGN.split("\n")
    value = (
        '"' + quantity.replace("\\", "\\\\").replace('"', '\\"') + '"'
        if quoted
        else quantity
    )
    lines[line - 1] = re.sub(
        rf"(?<=\s){re.escape(key)}=\S+", lambda m: f"{key}={value}", lines[line - 1]
    )
    with scratch() as (folder, name):
        (folder / "top.cnet").write_text("\n".join(lines), encoding="utf-8")
        outcome = run_cli(["check", f"{name}/top.cnet", "--format", fmt], _ROOT)
        assert_well_behaved(outcome, root=_ROOT, limit=LIMIT)
        if outcome.code == 2:
            # The rest of the design is valid: the error is about the changed line.
            assert f"{name}/top.cnet:{line}:" in outcome.err, outcome.describe()


# --- part libraries -------------------------------------------------------------------


def _paths(node: Any, path: tuple[Any, ...] = ()) -> list[tuple[Any, ...]]:
    out = [path]
    if isinstance(node, dict):
        for key, value in node.items():
            out += _paths(value, (*path, key))
    elif isinstance(node, list):
        for index, value in enumerate(node):
            out += _paths(value, (*path, index))
    return out


def _get(node: Any, path: tuple[Any, ...]) -> Any:
    for key in path:
        node = node[key]
    return node


_scalars = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(-(10**6), 10**6),
    st.floats(allow_nan=True, allow_infinity=True),
    st.text(max_size=20),
    st.sampled_from(
        [
            "24 V",
            "-1 ohm",
            "0 H",
            "0 ohm",
            "1e999 V",
            "nan V",
            "1e15 kV",
            "3 A",
            "DC-13",
            "AC-15",
            "dc",
            "ac/dc",
            "relay",
            "load",
            "diode",
            "[1, 2]",
            "yes",
            "no",
            "~",
            "",
            "1 H",
            "-0.5 A",
            "85 %",
            "abc",
        ]
    ),
)
_values = st.recursive(
    _scalars,
    lambda inner: st.one_of(
        st.lists(inner, max_size=3),
        st.dictionaries(
            st.sampled_from(
                [
                    "kind",
                    "voltage",
                    "current",
                    "category",
                    "R",
                    "L",
                    "coil",
                    "contacts",
                    "x",
                ]
            ),
            inner,
            max_size=3,
        ),
    ),
    max_leaves=6,
)
_keys = st.sampled_from(
    [
        "kind",
        "voltage",
        "current",
        "resistance",
        "inductance",
        "ratings",
        "poles",
        "category",
        "contacts",
        "coil",
        "format",
        "parts",
        "note",
        "R",
        "L",
        "vf",
        "x",
        "",
        "0",
        "no",
        "common",
        "nc",
        "no",
        "series",
        "voltage_max",
        "terminals",
    ]
)


def mutate_tree(
    data: Any,
    rng: random.Random,
    new_value: Callable[[], Any],
    new_key: Callable[[], Any],
    count: int,
) -> Any:
    """Delete, replace, rename, duplicate, wrap or rescale nodes of a YAML tree."""
    for _ in range(count):
        paths = [p for p in _paths(data) if p]
        if not paths:
            return new_value()
        path = rng.choice(paths)
        parent, key = _get(data, path[:-1]), path[-1]
        op = rng.randrange(7)
        if op == 0:
            del parent[key]
        elif op == 1:
            parent[key] = new_value()
        elif op == 2 and isinstance(parent, dict):
            parent[new_key()] = parent.pop(key)
        elif op == 3 and isinstance(parent, list):
            parent.insert(key, parent[key])
        elif op == 4:
            parent[key] = (
                [parent[key]] if rng.random() < 0.5 else {new_key(): parent[key]}
            )
        elif op == 5 and isinstance(parent[key], str):
            number = re.match(r"\s*[-+]?[\d.]+(?:e[-+]?\d+)?", parent[key])
            if number:
                factor = rng.choice(["-1", "0", "1e20", "1e-20", "-0"])
                try:
                    scaled = float(number.group()) * float(factor)
                except ValueError:
                    continue
                parent[key] = f"{scaled:g}{parent[key][number.end() :]}"
        else:
            other = _get(data, rng.choice(paths))
            parent[key] = yaml.safe_load(yaml.safe_dump(other))
    return data


_RANDOM_SCALARS = [
    None,
    True,
    False,
    0,
    -1,
    1.5,
    float("nan"),
    float("inf"),
    "",
    "24 V",
    "-1 ohm",
    "0 H",
    "1e999 V",
    "DC-13",
    "relay",
    "abc",
    "3 A",
    "85 %",
]
_RANDOM_KEYS = [
    "kind",
    "voltage",
    "current",
    "R",
    "L",
    "coil",
    "contacts",
    "ratings",
    "poles",
    "x",
    "",
    "no",
]


def random_value(rng: random.Random, depth: int = 0) -> Any:
    """A random YAML value without hypothesis (for the long run)."""
    roll = rng.random()
    if depth < 2 and roll < 0.15:
        return [random_value(rng, depth + 1) for _ in range(rng.randrange(3))]
    if depth < 2 and roll < 0.3:
        return {
            rng.choice(_RANDOM_KEYS): random_value(rng, depth + 1)
            for _ in range(rng.randrange(3))
        }
    return rng.choice(_RANDOM_SCALARS)


def _libraries() -> list[tuple[Sample, str]]:
    return [(s, n) for s in ALL_SAMPLES for n in s.names(".yaml") if n != "expect.yaml"]


libraries = st.sampled_from(_libraries())


@fuzz(40)
@given(
    library=libraries,
    seed=st.integers(0, 2**32),
    count=st.integers(1, 5),
    data=st.data(),
)
def test_structured_mutations_of_the_part_libraries(
    library: tuple[Sample, str], seed: int, count: int, data: st.DataObject
) -> None:
    sample, name = library
    tree = yaml.safe_load(sample.files[name])
    tree = mutate_tree(
        tree,
        random.Random(seed),
        lambda: data.draw(_values),
        lambda: data.draw(_keys),
        count,
    )
    text = yaml.safe_dump(tree, sort_keys=False, allow_unicode=True)
    _run_sample(sample, {name: text.encode("utf-8")}, "text")


_YAML_HAZARDS = [
    "\n  dup: {kind: diode}\n  dup: {kind: diode}\n",
    "\nx: &a [1, 2]\ny: *a\n",
    "\n  evil: !!python/object/apply:os.system ['true']\n",
    "\n  m: {<<: {kind: diode}}\n",
    "\n\tbad: tab\n",
    "\n  deep: " + "[" * 80 + "]" * 80 + "\n",
    "\n  s: !!str 1\n",
    "\n  b: !!binary aGVsbG8=\n",
    "\n%YAML 1.1\n---\n",
    "\n--- second document\n",
    "\n  ? complex\n  : key\n",
]


@fuzz(30)
@given(
    library=libraries,
    seed=st.integers(0, 2**32),
    count=st.integers(1, 6),
    family=st.sampled_from(["bytes", "lines", "tokens", "hazard"]),
)
def test_text_mutations_of_the_part_libraries(
    library: tuple[Sample, str], seed: int, count: int, family: str
) -> None:
    sample, name = library
    rng = random.Random(seed)
    text = sample.files[name]
    if family == "hazard":
        lines = text.split(b"\n")
        at = rng.randrange(len(lines) + 1)
        lines[at:at] = [rng.choice(_YAML_HAZARDS).encode("utf-8")]
        mutated = b"\n".join(lines)
    else:
        mutated = MUTATORS[family](text, rng, count)
    _run_sample(sample, {name: mutated}, "text")


@fuzz(120)
@given(
    library=libraries,
    seed=st.integers(0, 2**32),
    count=st.integers(1, 5),
    data=st.data(),
)
def test_parse_library_raises_input_errors_only(
    library: tuple[Sample, str], seed: int, count: int, data: st.DataObject
) -> None:
    sample, name = library
    tree = mutate_tree(
        yaml.safe_load(sample.files[name]),
        random.Random(seed),
        lambda: data.draw(_values),
        lambda: data.draw(_keys),
        count,
    )
    text = yaml.safe_dump(tree, sort_keys=False, allow_unicode=True)
    try:
        parts = parse_library(text, "fuzz.parts.yaml")
    except InputError as error:
        assert error.render()
        return
    assert all(isinstance(p, Part) for p in parts.values())
    for part in parts.values():
        for key, value in part.data.items():
            if key in QUANTITY_KEYS and hasattr(value, "magnitude"):
                assert math.isfinite(float(value.magnitude)), (part.name, key, value)


# --- include graphs -------------------------------------------------------------------


@dataclass(frozen=True)
class IncludeGraph:
    """Files f0 (the top) .. fN and, for each, what it includes."""

    edges: tuple[
        tuple[str, ...], ...
    ]  # per file: "f3", "missing", "outside", "dir", ...
    chain: int  # extra files in a straight chain below the last file


def _targets(count: int) -> st.SearchStrategy[str]:
    return st.one_of(
        st.integers(0, count - 1).map(lambda i: f"f{i}"),
        st.sampled_from(["missing", "outside", "dir", "absolute", "self"]),
    )


include_graphs = st.integers(1, 6).flatmap(
    lambda n: st.builds(
        IncludeGraph,
        st.lists(
            st.lists(_targets(n), max_size=3).map(tuple), min_size=n, max_size=n
        ).map(tuple),
        st.one_of(st.just(0), st.integers(0, MAX_INCLUDE_DEPTH + 3)),
    )
)

_PATHS = {
    "missing": "missing.cnet",
    "outside": "../outside.cnet",
    "dir": "subdir",
    "absolute": "/etc/hostname",
}


def _include_text(graph: IncludeGraph, index: int) -> str:
    lines = []
    if index == 0:
        lines.append("supply  G1  dc=24V  earth=minus  +:L+  -:M")
    lines.append(f"load  Y{index}  type=lamp  R=480ohm  1:L+  2:M")
    for target in graph.edges[index]:
        name = f"f{index}" if target == "self" else target
        lines.append(f'include "{_PATHS.get(name, name + ".cnet")}"')
    if index == len(graph.edges) - 1 and graph.chain:
        lines.append('include "c1.cnet"')
    return "\n".join(lines) + "\n"


def _expected_errors(graph: IncludeGraph) -> set[str]:
    """Walk the includes as the language defines them; return the error kinds."""
    errors: set[str] = set()
    visits: dict[str, int] = {}
    last = f"f{len(graph.edges) - 1}"

    def includes(name: str) -> list[str]:
        if name.startswith("c"):
            index = int(name[1:])
            return [f"c{index + 1}"] if index < graph.chain else []
        index = int(name[1:])
        out = [name if t == "self" else t for t in graph.edges[index]]
        return out + (["c1"] if name == last and graph.chain else [])

    def read(name: str, chain: tuple[str, ...]) -> None:
        if name in chain:
            errors.add("include cycle")
            return
        if len(chain) > MAX_INCLUDE_DEPTH:
            errors.add("nested deeper")
            return
        visits[name] = visits.get(name, 0) + 1
        for target in includes(name):
            if target in ("missing", "dir"):
                errors.add("not found")
            elif target in ("outside", "absolute"):
                errors.add("outside")
            else:
                read(target, (*chain, name))

    read("f0", ())
    if any(count > 1 for name, count in visits.items() if name.startswith("f")):
        errors.add("defined twice")
    return errors


@fuzz(60)
@given(graph=include_graphs)
def test_random_include_graphs(graph: IncludeGraph) -> None:
    expected = _expected_errors(graph)
    with scratch() as (folder, name):
        design = folder / "design"
        (design / "subdir").mkdir(parents=True)
        (folder / "outside.cnet").write_text("# outside the design\n", encoding="utf-8")
        for index in range(len(graph.edges)):
            (design / f"f{index}.cnet").write_text(
                _include_text(graph, index), encoding="utf-8"
            )
        for index in range(1, graph.chain + 1):
            below = f'include "c{index + 1}.cnet"\n' if index < graph.chain else ""
            (design / f"c{index}.cnet").write_text(
                f"# chain {index}\n{below}", encoding="utf-8"
            )
        outcome = run_cli(["check", f"{name}/design/f0.cnet"], _ROOT)
        assert_well_behaved(outcome, root=_ROOT, limit=LIMIT)
        if expected:
            assert outcome.code == 2, (expected, outcome.describe())
            for kind in expected - {"defined twice"}:
                assert kind in outcome.err, (kind, outcome.describe())
        else:
            assert outcome.code == 0, outcome.describe()
        # Handing over the folder instead: the tops are found, nothing breaks.
        whole = run_cli(["check", f"{name}/design"], _ROOT)
        assert_well_behaved(whole, root=_ROOT, limit=LIMIT)


# --- a thousand corruptions (opt-in) --------------------------------------------------


@pytest.mark.skipif(
    not LONG, reason="set NETCHECK_FUZZ_LONG=1 to run a thousand corruptions"
)
def test_a_thousand_corruptions() -> None:
    rng = random.Random(20240601)
    failures = []
    families = [
        "bytes",
        "lines",
        "tokens",
        "wiring",
        "wiring",
        "yaml-tree",
        "yaml-text",
    ]
    for run in range(1000):
        sample = rng.choice(ALL_SAMPLES)
        family = rng.choice(families)
        seed, count = rng.randrange(2**32), rng.randint(1, 12)
        local = random.Random(seed)
        if family.startswith("yaml"):
            name = local.choice(sample.names(".parts.yaml"))
            if family == "yaml-tree":
                tree = yaml.safe_load(sample.files[name])
                tree = mutate_tree(
                    tree,
                    local,
                    functools.partial(random_value, local),
                    functools.partial(local.choice, _RANDOM_KEYS),
                    count,
                )
                replaced = {name: yaml.safe_dump(tree, sort_keys=False).encode()}
            else:
                fam = local.choice(list(MUTATORS))
                replaced = {name: MUTATORS[fam](sample.files[name], local, count)}
        else:
            replaced = _mutated_cnet(sample, seed, family, count)
        try:
            _run_sample(sample, replaced, rng.choice(["text", "json", "sarif"]))
        except AssertionError as failure:
            failures.append(
                f"run {run} ({sample.name}, {family}, seed {seed}, "
                f"count {count}):\n{str(failure)[:2000]}"
            )
    assert not failures, f"{len(failures)} of 1000 runs failed:\n\n" + "\n\n".join(
        failures[:10]
    )
