"""A component made from its shape's template is the component built in full.

``input/cnet/template.py`` makes every component of a statement shape after
the first from what the first one worked out; these tests build every
component of many designs both ways (the sample designs, every rule case and
generated designs of several bench shapes) and compare them field by field,
and count that the template path was the one taken.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

from netcheck.input.cnet.build import _Builder
from netcheck.input.cnet.read import Reader, read_libraries
from netcheck.input.cnet.template import Template, shape_of

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "bench"))
import gen_design  # noqa: E402

DESIGNS = sorted(
    p
    for folder in ("sample_nets", "tests/cases")
    for p in (ROOT / folder).rglob("*.cnet")
    if "sheets" not in p.parts
)


def _read(top: Path) -> tuple[Reader, dict]:
    reader = Reader(top.parent, False, top.parent)
    reader.read(top, (), None)
    return reader, read_libraries(reader, [])


def _both_ways(top: Path) -> int:
    """Compare template-made and fully built components; the templates used."""
    reader, parts = _read(top)
    if reader.errors:
        return 0
    errors: list = []
    builder = _Builder(parts, errors)
    used = 0
    for statement in reader.statements:
        built = builder.build(statement)
        if built is None or errors:
            return used
        template = builder.templates.get(shape_of(statement))
        if template is None:
            builder.templates[shape_of(statement)] = Template.of(built)
            continue
        made = template.component(statement)
        assert made == built
        assert [e.name for e in made.elements] == [e.name for e in built.elements]
        assert made.values == built.values
        used += 1
    return used


@pytest.mark.parametrize("top", DESIGNS, ids=lambda p: str(p.relative_to(ROOT)))
def test_templates_make_the_built_components(top):
    _both_ways(top)


@pytest.mark.parametrize("shape", ["mixed", "series", "parallel", "plc", "sheets"])
def test_templates_make_the_built_components_of_generated_designs(tmp_path, shape):
    gen_design.generate(600, tmp_path, shape=shape)
    assert _both_ways(tmp_path / "design.cnet") > 100
