"""The rule catalogue reads the same with libyaml's safe loader as with PyYAML's own."""

from __future__ import annotations

import yaml

from netcheck.catalogue import _SAFE_LOADER
from netcheck.resources import data_path


def test_fast_loader_reads_the_rules_as_the_python_loader() -> None:
    paths = sorted(data_path("rules").glob("*.yaml"))
    assert len(paths) >= 5
    for path in paths:
        text = path.read_text(encoding="utf-8")
        fast = yaml.load(text, Loader=_SAFE_LOADER)
        assert fast == yaml.load(text, Loader=yaml.SafeLoader)
        assert repr(fast) == repr(yaml.safe_load(text))  # types and order too
