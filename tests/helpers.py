"""Shared test helpers: build a design from inline text, compare quantities."""

from __future__ import annotations

import dataclasses
import sys
import textwrap
from pathlib import Path

import pint
import pytest

from netcheck.analysis.elements import Analysis, analyse
from netcheck.errors import InputError
from netcheck.graph import build_graph
from netcheck.input import load_design
from netcheck.model import Netlist
from netcheck.pipeline import run_checks

ROOT = Path(__file__).resolve().parent.parent
BENCH = ROOT / "bench"
# Every design the repository ships: the rule cases and the samples.
REPOSITORY_DESIGNS = sorted((ROOT / "tests" / "cases").rglob("*.cnet")) + sorted(
    (ROOT / "sample_nets").rglob("*.cnet")
)


def design_id(path: Path) -> str:
    """A repository design's test id: its path from the repository root."""
    return str(path.relative_to(ROOT))


def load_or_skip(path: Path) -> Netlist:
    """Load a repository design; skip an included sheet or an input-error case."""
    try:
        return load_design(path)
    except InputError:
        pytest.skip("an included sheet or an input-error case")


def bench_design(size: int, tmp: Path, shape: str, hazard_rate: float = 0.2) -> Path:
    """Generate a bench design (``bench/gen_design.py``) into ``tmp``; its top file."""
    sys.path.insert(0, str(BENCH))
    try:
        import gen_design
    finally:
        sys.path.remove(str(BENCH))
    return gen_design.generate(size, tmp, shape=shape, hazard_rate=hazard_rate)  # type: ignore[no-any-return]


def generated_dataclass(cls: type) -> type:
    """The same fields as ``cls``, with the ``__init__`` dataclasses writes."""
    fields = [
        (
            f.name,
            f.type,
            dataclasses.field(default=f.default, default_factory=f.default_factory),
        )
        for f in dataclasses.fields(cls)
    ]
    return dataclasses.make_dataclass(cls.__name__, fields, frozen=True)


def assert_init_as_generated(
    cls: type,
    args: tuple,
    kwargs: dict,
    *,
    hashable: bool,
    every_field_in_vars: bool = False,
) -> None:
    """A hand-written ``__init__`` of a frozen dataclass acts as the generated one."""
    ours = cls(*args, **kwargs)
    names = [f.name for f in dataclasses.fields(cls)]
    theirs = generated_dataclass(cls)(*args, **kwargs)
    if every_field_in_vars:
        assert list(vars(ours)) == names  # every field, in the fields' order
    assert [getattr(ours, n) for n in names] == [getattr(theirs, n) for n in names]
    by_name = cls(**dict(zip(names, args, strict=False)), **kwargs)
    assert by_name == ours
    if hashable:
        assert hash(by_name) == hash(ours) == hash(theirs)
    assert repr(ours) == repr(theirs).replace(
        theirs.__class__.__qualname__, cls.__qualname__, 1
    )
    with pytest.raises(dataclasses.FrozenInstanceError):
        setattr(ours, names[0], "changed")
    changed = dataclasses.replace(ours, **{names[1]: "other"})
    assert getattr(changed, names[1]) == "other" and changed != ours


PARTS_HEADER = """\
format: netcheck-parts/1
note: Illustrative values for the tests; not any manufacturer's data.
parts:
"""


def write_design(tmp: Path, text: str, parts: str = "", name: str = "design.cnet") -> Path:
    """Write a design (and an optional part library ``parts.yaml``) into ``tmp``."""
    body = textwrap.dedent(text).lstrip("\n")
    if parts:
        entries = textwrap.indent(textwrap.dedent(parts).strip("\n"), "  ")
        (tmp / "parts.yaml").write_text(PARTS_HEADER + entries + "\n", encoding="utf-8")
        body = 'parts "parts.yaml"\n' + body
    path = tmp / name
    path.write_text(body, encoding="utf-8")
    return path


def net(tmp: Path, text: str, parts: str = "") -> tuple[Netlist, Analysis]:
    """Read and analyse an inline design."""
    path = write_design(tmp, text, parts)
    netlist = load_design(path, display_base=tmp)
    return netlist, analyse(build_graph(netlist))


def findings_of(tmp: Path, text: str, parts: str = "") -> list:
    """The (non-waived) findings of an inline design."""
    netlist, analysis = net(tmp, text, parts)
    return [f for f in run_checks(netlist, analysis) if not f.waived]


def approx_q(actual: pint.Quantity | None, expected: float, unit: str,
             rel: float = 1e-6, abs_: float = 0.0) -> None:
    """Assert a quantity equals ``expected`` in ``unit`` (units-aware)."""
    assert actual is not None, "quantity missing"
    assert actual.to(unit).magnitude == pytest.approx(expected, rel=rel, abs=abs_)
