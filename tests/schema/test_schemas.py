"""Every file netcheck reads or writes matches its shipped JSON Schema.

The outputs are real ones, made by the command line from the shipped samples.
"""

from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import jsonschema
import pytest

from netcheck import schema
from netcheck.errors import PartsError
from netcheck.yamlsafe import load_located_yaml

ROOT = Path(__file__).resolve().parents[2]
SAMPLES = ROOT / "sample_nets"
# The top file of each sample is named after its folder; the others are sheets.
DESIGNS = sorted(d / f"{d.name}.cnet" for d in SAMPLES.iterdir() if d.is_dir())


def _yaml(text: str):
    # The project's own loader: it keeps a bare 'no:' key a string, as YAML 1.2
    # (and editors) read it, where PyYAML's 1.1 rules make it false.
    return load_located_yaml(text, "example.yaml", PartsError).data


def _run(*args: str, cwd: Path = ROOT) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "netcheck", *args],
        cwd=cwd,
        capture_output=True,
        text=True,
        timeout=300,
        env={"PATH": "/usr/bin:/bin", "NO_COLOR": "1", "PYTHONPATH": str(ROOT)},
    )


def test_names_and_ids():
    assert schema.schema_names() == (
        "baseline",
        "config",
        "findings",
        "inspect",
        "parts",
        "size",
    )
    ids = set()
    for name in schema.schema_names():
        document = schema.load_schema(name)
        assert document["$schema"] == "https://json-schema.org/draft/2020-12/schema"
        assert document["$id"] == f"urn:netcheck:schema:{name}:{document['version']}"
        jsonschema.Draft202012Validator.check_schema(document)
        ids.add(document["$id"])
    assert len(ids) == len(schema.schema_names())
    with pytest.raises(KeyError, match="known: baseline"):
        schema.load_schema("nope")


def test_no_custom_use_of_standard_formats():
    # Editors check standard formats ('time' is RFC 3339 time of day): a quantity
    # such as '1.7 ms' must not be declared with one (JSON Schema 2020-12, 7.3).
    def keywords(node):
        if isinstance(node, dict):
            for key, value in node.items():
                if key == "format" and isinstance(value, str):
                    yield value
                yield from keywords(value)
        elif isinstance(node, list):
            for item in node:
                yield from keywords(item)

    for name in schema.schema_names():
        assert list(keywords(schema.load_schema(name))) == [], name


def test_findings_json_of_every_sample():
    result = _run("check", "sample_nets", "--format", "json")
    assert result.returncode == 1, result.stderr
    document = json.loads(result.stdout)
    schema.validate("findings", document)
    assert document["findings"]


def test_findings_schema_refuses_a_broken_document():
    result = _run("check", "sample_nets", "--format", "json")
    document = json.loads(result.stdout)
    document["findings"][0]["severity"] = "fatal"
    with pytest.raises(jsonschema.ValidationError):
        schema.validate("findings", document)


@pytest.mark.parametrize("design", DESIGNS, ids=lambda p: p.name)
def test_inspect_json_of_every_sample(design):
    result = _run("inspect", str(design.relative_to(ROOT)), "--format", "json")
    assert result.returncode == 0, result.stderr
    document = json.loads(result.stdout)
    schema.validate("inspect", document)
    assert document["elements"]


@pytest.mark.parametrize(
    "args",
    [
        ["--voltage", "110V", "--resistance", "440ohm", "--inductance", "2.1H"],
        [
            "--voltage",
            "24V",
            "--resistance",
            "48ohm",
            "--inductance",
            "180mH",
            "--clamp",
            "36V",
            "--release-current",
            "25mA",
        ],
    ],
)
def test_size_json(args):
    result = _run("size", *args, "--format", "json")
    assert result.returncode == 0, result.stderr
    schema.validate("size", json.loads(result.stdout))


def test_baseline_file(tmp_path):
    out = tmp_path / "baseline.json"
    result = _run("baseline", "sample_nets", "-o", str(out))
    assert result.returncode == 0, result.stderr
    document = json.loads(out.read_text(encoding="utf-8"))
    schema.validate("baseline", document)
    document["fingerprints"][0]["fingerprint"] = 42
    with pytest.raises(jsonschema.ValidationError):
        schema.validate("baseline", document)


@pytest.mark.parametrize(
    "library", sorted(SAMPLES.glob("*/*.parts.yaml")), ids=lambda p: p.name
)
def test_sample_part_libraries(library):
    schema.validate("parts", _yaml(library.read_text(encoding="utf-8")))


def test_part_quantities_are_checked_for_dimension():
    library = {
        "format": "netcheck-parts/1",
        "parts": {"d1": {"kind": "diode", "vf": "0.9 V", "voltage_rating": "3 A"}},
    }
    with pytest.raises(jsonschema.ValidationError, match="expected a voltage"):
        schema.validate("parts", library)
    library["parts"]["d1"]["voltage_rating"] = "1000 V"
    schema.validate("parts", library)


def _yaml_blocks(path: Path) -> list[str]:
    text = path.read_text(encoding="utf-8")
    return re.findall(r"^```yaml\n(.*?)^```", text, flags=re.S | re.M)


DOCS = [ROOT / "README.md", *sorted((ROOT / "docs").glob("*.md"))]
BLOCKS = [
    (path.name, i, block)
    for path in DOCS
    for i, block in enumerate(_yaml_blocks(path))
    if "fail-on:" in block or "netcheck-parts/1" in block
]


def test_documents_hold_examples_of_both():
    kinds = {"parts" if "netcheck-parts/1" in b else "config" for _, _, b in BLOCKS}
    assert kinds == {"parts", "config"}


@pytest.mark.parametrize(
    ("document", "index", "block"), BLOCKS, ids=[f"{d}-{i}" for d, i, _ in BLOCKS]
)
def test_documented_yaml_examples_are_valid(document, index, block):
    name = "parts" if "netcheck-parts/1" in block else "config"
    schema.validate(name, _yaml(block))


@pytest.mark.parametrize(
    ("config", "ok"),
    [
        ({"fail-on": "warning", "ignore": "single-connection-net"}, True),
        ({"margins": {"diode-reverse-voltage": 2.0}, "parts": None}, True),
        ({"fail-on": "sometimes"}, False),
        ({"colour": "red"}, False),
        ({"margins": {"diode-reverse-voltage": 0}}, False),
        ({"severity": {"single-connection-net": "fatal"}}, False),
    ],
)
def test_config_schema(config, ok):
    if ok:
        schema.validate("config", config)
    else:
        with pytest.raises(jsonschema.ValidationError):
            schema.validate("config", config)
