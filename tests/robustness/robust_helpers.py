"""Helpers of the robustness tests: run the CLI in-process and judge what it did.

``run_cli`` runs ``netcheck.cli.main`` with captured output, in a given working
directory and under a wall-clock limit; ``assert_well_behaved`` states the
property every hostile input must satisfy (cli.md): exit 0, 1 or 2, no Python
traceback, and on exit 2 diagnostics of the form ``file:line:column: error:
message`` followed by the offending line and a caret under the column (or
``file: error:`` / ``netcheck: error:`` where no position applies).
"""

from __future__ import annotations

import contextlib
import io
import json
import os
import re
import shutil
import signal
import time
import traceback
from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path

from netcheck import cli

REPO = Path(__file__).resolve().parents[2]
SAMPLES = REPO / "sample_nets"

# A positioned diagnostic, and one without a position (a file or the program).
POSITIONED = re.compile(r"^(?P<file>.+?):(?P<line>\d+):(?P<column>\d+): error: .+")
UNPOSITIONED = re.compile(r"^(?P<who>[^\s:][^:]*): error: .+")
CARET = re.compile(r"^(?P<pad> *)\^+$")
DEFAULT_LIMIT = 30.0


class TimeLimit(Exception):
    """A run took longer than its wall-clock limit."""


@dataclass(frozen=True)
class Outcome:
    """What one in-process run of the command line did."""

    argv: tuple[str, ...]
    code: int | None
    out: str
    err: str
    raised: str | None  # the formatted traceback of an escaping exception
    seconds: float

    def describe(self) -> str:
        """A short account for assertion messages."""
        return (
            f"argv={list(self.argv)} exit={self.code} in {self.seconds:.2f}s\n"
            f"--- stdout ---\n{self.out[-3000:]}\n--- stderr ---\n{self.err[-3000:]}"
            + (f"\n--- raised ---\n{self.raised}" if self.raised else "")
        )


@contextlib.contextmanager
def time_limit(seconds: float) -> Iterator[None]:
    """Raise TimeLimit in the main thread after ``seconds`` of wall-clock time."""

    def expire(signum: int, frame: object) -> None:
        raise TimeLimit(f"took longer than {seconds} s")

    previous = signal.signal(signal.SIGALRM, expire)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


@contextlib.contextmanager
def working_directory(path: Path) -> Iterator[None]:
    """Run the body with ``path`` as the working directory."""
    before = os.getcwd()
    os.chdir(path)
    try:
        yield
    finally:
        os.chdir(before)


def run_cli(argv: Sequence[str], cwd: Path, limit: float = DEFAULT_LIMIT) -> Outcome:
    """Run ``netcheck.cli.main(argv)`` in ``cwd``; never raises for the CLI's sake."""
    out, err = io.StringIO(), io.StringIO()
    code: int | None = None
    raised = None
    start = time.perf_counter()
    os.environ["NO_COLOR"] = "1"
    with working_directory(cwd):
        try:
            with (
                time_limit(limit),
                contextlib.redirect_stdout(out),
                contextlib.redirect_stderr(err),
            ):
                code = cli.main(list(argv))
        except TimeLimit as hang:
            raised = f"TimeLimit: {hang}"
        except BaseException:  # noqa: BLE001 - every escape is the finding
            raised = traceback.format_exc()
    return Outcome(
        tuple(argv),
        code,
        out.getvalue(),
        err.getvalue(),
        raised,
        time.perf_counter() - start,
    )


def _file_lines(root: Path, name: str) -> list[str] | None:
    """The lines of ``name`` as the language counts them (split on LF only)."""
    path = Path(name) if Path(name).is_absolute() else root / name
    try:
        data = path.read_bytes()
    except OSError:
        return None
    text = data.decode("utf-8", errors="replace").removeprefix("\ufeff")
    return [line.removesuffix("\r") for line in text.split("\n")]


# What str.splitlines() breaks at besides LF; a quoted line may stop at one of
# them (a lone CR) as long as the caret stays within what is shown.
_OTHER_BREAKS = "\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029"


def _has_line(source: list[str], number: int) -> bool:
    """Whether line ``number`` exists (the '' after a final newline does not)."""
    count = len(source) - 1 if source and source[-1] == "" else len(source)
    return 1 <= number <= count


def _quotes_line(quoted: str, expected: str, column: int) -> bool:
    """Whether ``quoted`` shows line ``expected`` (or its part before a break)."""
    if quoted == expected:
        return True
    head = expected[: len(quoted)]
    rest = expected[len(quoted) :]
    return (
        head == quoted
        and rest[:1] in tuple(_OTHER_BREAKS)
        and column <= len(quoted) + 1
    )


def diagnostic_problems(err: str, root: Path | None = None) -> list[str]:
    """Return what is wrong with the diagnostics of an exit-2 run ('' if nothing).

    Every block is a head line; a positioned head is followed by the source line
    and a caret line whose caret stands under the column. With ``root`` given,
    the quoted line must be the file's line of that number (tabs shown as
    spaces), counting lines as the language does.
    """
    problems = []
    files: dict[str, list[str] | None] = {}
    lines = err.rstrip("\n").split("\n")
    if not lines or not lines[0]:
        return ["exit 2 with nothing on standard error"]
    i = 0
    while i < len(lines):
        line = lines[i]
        head = POSITIONED.match(line)
        if head is None:
            if line.startswith("usage:") or line.startswith(" "):
                i += 1
                continue
            if UNPOSITIONED.match(line) is None:
                problems.append(f"line {i + 1} is not a diagnostic: {line[:200]!r}")
            i += 1
            continue
        number, column = int(head["line"]), int(head["column"])
        source = None
        if root is not None:
            if head["file"] not in files:
                files[head["file"]] = _file_lines(root, head["file"])
            source = files[head["file"]]
        has_excerpt = i + 2 < len(lines) and CARET.match(lines[i + 2]) is not None
        if not has_excerpt:
            if source is not None and not _has_line(source, number):
                i += 1  # no such line (an empty file): nothing to quote
                continue
            problems.append(f"no excerpt and caret after {line[:200]!r}")
            i += 1
            continue
        quoted, caret = lines[i + 1], lines[i + 2]
        mark = CARET.match(caret)
        assert mark is not None
        if len(mark["pad"]) != column - 1:
            problems.append(
                f"caret at column {len(mark['pad']) + 1}, head says {column}: "
                f"{line[:200]!r}"
            )
        if source is not None and 1 <= number <= len(source):
            expected = source[number - 1].replace("\t", " ")
            if not _quotes_line(quoted, expected, column):
                problems.append(
                    f"{head['file']}:{number}: quoted line {quoted[:120]!r} is not "
                    f"line {number} of the file ({expected[:120]!r})"
                )
        i += 3
    return problems


def assert_well_behaved(
    outcome: Outcome, root: Path | None = None, limit: float | None = None
) -> None:
    """Assert the robustness property of one run (module docstring)."""
    assert outcome.raised is None, outcome.describe()
    assert outcome.code in (0, 1, 2), outcome.describe()
    assert "Traceback" not in outcome.out, outcome.describe()
    assert "Traceback" not in outcome.err, outcome.describe()
    if limit is not None:
        assert outcome.seconds < limit, outcome.describe()
    if outcome.code == 2:
        problems = diagnostic_problems(outcome.err, root)
        assert not problems, "\n".join(problems) + "\n" + outcome.describe()
    elif _wants_json(outcome.argv) and "-o" not in outcome.argv:
        document = json.loads(outcome.out)
        formats = {"check": "netcheck-findings/1", "inspect": "netcheck-inspect/1"}
        expected = formats.get(outcome.argv[0])
        if expected is not None:
            assert document["format"] == expected, outcome.describe()


def _wants_json(argv: Sequence[str]) -> bool:
    pairs = zip(argv, argv[1:], strict=False)
    return any(a == "--format" and b == "json" for a, b in pairs)


def copy_sample(name: str, target: Path) -> Path:
    """Copy ``sample_nets/<name>`` to ``target``; return the copy's folder."""
    folder = target / name
    if folder.exists():
        shutil.rmtree(folder)
    shutil.copytree(SAMPLES / name, folder)
    return folder


def sample_names() -> list[str]:
    """The sample designs (folders of ``sample_nets`` holding ``<name>.cnet``)."""
    return sorted(p.name for p in SAMPLES.iterdir() if (p / f"{p.name}.cnet").is_file())
