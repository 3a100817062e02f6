"""Run every hostile input of ``corpus/`` and compare with ``corpus/expect.yaml``.

Each case is a folder (copied to a temporary directory first); big files and
symlinks are written at run time by the generators below, named by the case's
``generate`` key.
"""

from __future__ import annotations

import os
import shutil
from collections.abc import Callable
from pathlib import Path

import pytest
import yaml
from robust_helpers import assert_well_behaved, run_cli

from netcheck.input.cnet.read import MAX_FILE_BYTES, MAX_INCLUDE_DEPTH

CORPUS = Path(__file__).resolve().parent / "corpus"
LONG = os.environ.get("NETCHECK_FUZZ_LONG") == "1"

BASE = (
    "supply  G1  dc=24V  earth=minus  +:L+  -:M\n"
    "switch  S1  13:L+  14:W1\n"
    "load    Y1  type=valve  R=72ohm  L=1H  1:W1  2:M\n"
    "diode   V1  A:M  K:W1\n"
)


def ten_megabyte_line(folder: Path) -> None:
    """A valid design with one 10 MB comment line in the middle."""
    comment = "# " + "x" * 10_000_000 + "\n"
    head, tail = BASE.split("switch", 1)
    (folder / "top.cnet").write_text(head + comment + "switch" + tail, encoding="utf-8")


def file_too_large(folder: Path) -> None:
    """One byte over the file-size limit, all comments."""
    line = "#" + "-" * 1022 + "\n"
    with (folder / "top.cnet").open("w", encoding="utf-8") as out:
        out.write(line * (MAX_FILE_BYTES // len(line) + 1))


def many_syntax_errors_at_end(folder: Path) -> None:
    """100 000 good statements, then 30 broken ones."""
    good = "".join(f"load  Y{i}  R=10ohm  1:A{i}  2:B\n" for i in range(100_000))
    bad = "".join(f"load  Z{i}  R=  1:A  2:B\n" for i in range(30))
    (folder / "top.cnet").write_text(good + bad, encoding="utf-8")


def many_semantic_errors(folder: Path) -> None:
    """100 000 statements, each with a resistance given in volts."""
    text = "".join(f"load  Y{i}  R=10V  1:A{i}  2:B\n" for i in range(100_000))
    (folder / "top.cnet").write_text(text, encoding="utf-8")


def yaml_deep_flow(folder: Path) -> None:
    """A part library of 100 000 nested flow sequences."""
    head = (
        "format: netcheck-parts/1\nnote: Illustrative; not any manufacturer's data.\n"
    )
    body = "parts: " + "[" * 100_000 + "]" * 100_000 + "\n"
    (folder / "p.parts.yaml").write_text(head + body, encoding="utf-8")


def include_depth(folder: Path) -> None:
    """A chain of includes two deeper than the limit."""
    depth = MAX_INCLUDE_DEPTH + 2
    (folder / "top.cnet").write_text(
        'supply  G1  dc=24V  +:L+  -:M\ninclude "s1.cnet"\n', encoding="utf-8"
    )
    for i in range(1, depth + 1):
        (folder / f"s{i}.cnet").write_text(
            f'include "s{i + 1}.cnet"\n' if i < depth else "", encoding="utf-8"
        )


def _loop(folder: Path, name: str) -> None:
    first, second = folder / name, folder / f"other-{name}"
    first.symlink_to(second.name)
    second.symlink_to(first.name)


def symlink_loop_include(folder: Path) -> None:
    """``include`` of a symlink that points at a symlink pointing back."""
    (folder / "top.cnet").write_text(
        'supply  G1  dc=24V  +:L+  -:M\ninclude "loop.cnet"\n', encoding="utf-8"
    )
    _loop(folder, "loop.cnet")


def symlink_loop_parts(folder: Path) -> None:
    """``parts`` naming a symlink loop."""
    (folder / "top.cnet").write_text(
        'parts "loop.parts.yaml"\nsupply  G1  dc=24V  +:L+  -:M\n', encoding="utf-8"
    )
    _loop(folder, "loop.parts.yaml")


def symlink_loop_path(folder: Path) -> None:
    """A symlink loop given on the command line."""
    _loop(folder, "loop.cnet")


GENERATORS: dict[str, Callable[[Path], None]] = {
    f.__name__: f
    for f in (
        ten_megabyte_line,
        file_too_large,
        many_syntax_errors_at_end,
        many_semantic_errors,
        yaml_deep_flow,
        include_depth,
        symlink_loop_include,
        symlink_loop_parts,
        symlink_loop_path,
    )
}


def _cases() -> list:
    expect = yaml.safe_load((CORPUS / "expect.yaml").read_text(encoding="utf-8"))
    params = []
    for name, case in expect.items():
        marks = []
        if case.get("xfail"):
            marks.append(pytest.mark.xfail(strict=True, reason=case["xfail"]))
        if case.get("long") and not LONG:
            marks.append(pytest.mark.skip(reason="long case: set NETCHECK_FUZZ_LONG=1"))
        params.append(pytest.param(name, case, id=name, marks=marks))
    return params


def test_every_case_has_a_folder_or_a_generator() -> None:
    expect = yaml.safe_load((CORPUS / "expect.yaml").read_text(encoding="utf-8"))
    for name, case in expect.items():
        assert (CORPUS / name).is_dir() or case.get("generate") in GENERATORS, name
        assert case["exit"] in (0, 1, 2), name
        assert case.get("generate") in (None, *GENERATORS), name
    folders = {p.name for p in CORPUS.iterdir() if p.is_dir()}
    assert folders <= set(expect), (
        f"folders without an expectation: {folders - set(expect)}"
    )


@pytest.mark.parametrize(("name", "case"), _cases())
def test_corpus_case(name: str, case: dict, tmp_path: Path) -> None:
    folder = tmp_path / name
    if (CORPUS / name).is_dir():
        shutil.copytree(CORPUS / name, folder, symlinks=True)
    else:
        folder.mkdir()
    if case.get("generate"):
        GENERATORS[case["generate"]](folder)
    limit = float(case.get("seconds", 20))
    # Run from the parent so that every case's files have their own display
    # names ("nul-byte/top.cnet"): the excerpt cache is keyed by that name
    # (see test_limits.py::test_excerpt_cache_is_not_stale).
    args = [a if a.startswith("-") else f"{name}/{a}" for a in case.get("args", [])]
    argv = ["check", f"{name}/{case.get('top', 'top.cnet')}", *args]
    outcome = run_cli(argv, tmp_path, limit=limit + 5)
    assert_well_behaved(outcome, root=tmp_path, limit=limit)
    assert outcome.code == case["exit"], outcome.describe()
    shown = outcome.err if case["exit"] == 2 else outcome.out
    if "message" in case:
        assert case["message"] in shown, outcome.describe()
    if "at" in case:
        assert outcome.err.startswith(f"{name}/{case['at']}"), outcome.describe()
