"""netcheck.yaml and its shipped schema agree: same keys, same verdicts."""

from __future__ import annotations

import jsonschema
import pytest
import yaml
from report_samples import make_catalogue

from netcheck import config as config_module
from netcheck.config import load_config
from netcheck.errors import ConfigError
from netcheck.schema import iter_errors, load_schema

# Structural mistakes: both the readers and the schema refuse them.
STRUCTURAL = [
    "fail-on: sometimes\n",
    "ignore: {a: b}\n",
    "ignore: [3]\n",
    "severity: [error]\n",
    "severity:\n  single-connection-net: fatal\n",
    "margins:\n  diode-reverse-voltage: two\n",
    "margins:\n  diode-reverse-voltage: -1\n",
    "margins:\n  diode-reverse-voltage: true\n",
    "parts: 7\n",
    "baseline: 3\n",
    "ignroe: []\n",
    "- just\n- a list\n",
]
GOOD = """\
fail-on: warning
select: [dc-break-over-rating, inductive-load-unsuppressed]
ignore: single-connection-net
severity: {inductive-load-unsuppressed: error}
parts: [lib.parts.yaml]
margins: {diode-reverse-voltage: 2.5}
baseline: base.json
"""


def test_schema_names_every_key_the_reader_knows():
    assert set(load_schema("config")["properties"]) == set(config_module._KEYS)


def test_every_key_of_the_module_docstring_is_a_key():
    documented = yaml.safe_load(
        config_module.__doc__.split("::", 1)[1].split("\n\n")[1]
    )
    assert set(documented) == set(config_module._KEYS)


@pytest.mark.parametrize("text", STRUCTURAL)
def test_structural_mistakes_are_refused_by_both(text, tmp_path):
    assert list(iter_errors("config", yaml.safe_load(text)))
    (tmp_path / "netcheck.yaml").write_text(text)
    with pytest.raises(ConfigError):
        load_config(tmp_path / "netcheck.yaml", make_catalogue())


def test_a_good_file_is_valid_for_both(tmp_path):
    assert list(iter_errors("config", yaml.safe_load(GOOD))) == []
    (tmp_path / "lib.parts.yaml").write_text("parts: []\n")
    (tmp_path / "base.json").write_text("{}\n")
    (tmp_path / "netcheck.yaml").write_text(GOOD)
    assert load_config(tmp_path / "netcheck.yaml", make_catalogue()).fail_on


def test_the_schema_has_the_last_word_located(tmp_path, monkeypatch):
    # Whatever the schema refuses after the readers accepted it is an error at
    # the offending node (here a stand-in schema error on select's second item).
    (tmp_path / "netcheck.yaml").write_text(
        "fail-on: error\nselect:\n  - dc-break-over-rating\n  - single-connection-net\n"
    )
    refusal = jsonschema.ValidationError("is not allowed here", path=["select", 1])
    monkeypatch.setattr(
        "netcheck.schema.iter_errors", lambda name, data: iter([refusal])
    )
    monkeypatch.chdir(tmp_path)
    with pytest.raises(ConfigError) as caught:
        load_config(tmp_path / "netcheck.yaml", make_catalogue())
    err = caught.value
    assert "'select.1': is not allowed here" in err.message
    assert (err.span.file, err.span.line, err.span.column) == ("netcheck.yaml", 4, 5)
