"""CLI test fixtures: the report samples, and a stand-in pipeline driven by the file.

The stand-in reads ``# fake: RULE ELEMENT [waived=REASON]`` lines and returns one
finding per line, anchored on that line, so a test moves findings by editing the
file. ``# element: NAME STATUS [REASON]`` gives a switching element its status
(see ``netcheck.coverage``). A line ``BROKEN`` raises a syntax error there.
Real end-to-end runs live in ``test_cli_end_to_end.py``.
"""

from __future__ import annotations

import re
import sys
from dataclasses import dataclass, field
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "report"))

from report_samples import (  # noqa: E402
    catalogue,
    finding,
    findings,
    golden,
    make_catalogue,
    report,
    sarif_schema,
)

from netcheck import catalogue as catalogue_module  # noqa: E402
from netcheck import cli, pipeline  # noqa: E402
from netcheck.coverage import ElementStatus  # noqa: E402
from netcheck.errors import SyntaxInputError  # noqa: E402
from netcheck.pipeline import CheckOptions, CheckResult  # noqa: E402
from netcheck.source import Span  # noqa: E402
from netcheck.units import Q_  # noqa: E402

__all__ = ["catalogue", "findings", "golden", "report", "sarif_schema", "project"]

# Values each fake finding carries, by rule (the names the templates use).
VALUES = {
    "dc-break-over-rating": {
        "current": Q_(2.5, "A"),
        "voltage": Q_(110, "V"),
        "rated_current": Q_(0.5, "A"),
    },
    "inductive-load-unsuppressed": {
        "load": "Y1",
        "time_constant": Q_(0.0048, "s"),
        "diode_voltage": Q_(48, "V"),
        "diode_current": Q_(0.5, "A"),
    },
    "single-connection-net": {"net": "N9"},
    "suppressor-underrated": {"rated": Q_(50, "V"), "needed": Q_(220, "V")},
}
FAKE = re.compile(r"#\s*fake:\s*(\S+)\s+(\S+)(?:\s+waived=(.+))?$")
INCLUDE = re.compile(r'^include\s+"([^"]+)"')
ELEMENT = re.compile(r"#\s*element:\s*(\S+)\s+(verified|unverified|ac)(?:\s+(\S+))?$")


@dataclass
class Project:
    """A temporary working directory with the stand-in pipeline installed."""

    root: Path
    calls: list[tuple[str, CheckOptions]] = field(default_factory=list)

    def write(self, name: str, text: str) -> Path:
        path = self.root / name
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")
        return path

    def run(self, *argv: str) -> int:
        return cli.main(list(argv))


def fake_check_path(catalogue, calls):
    def check_path(path: Path, options: CheckOptions) -> CheckResult:
        calls.append((Path(path).as_posix(), options))
        text = Path(path).read_text(encoding="utf-8")
        found, files, elements = [], [str(path)], []
        for number, line in enumerate(text.splitlines(), start=1):
            if line.strip() == "BROKEN":
                raise SyntaxInputError(
                    "expected a statement", Span(str(path), number, 1)
                )
            include = INCLUDE.match(line)
            if include:
                files.append(str(Path(path).parent / include[1]))
            status = ELEMENT.search(line)
            if status:
                name, state, reason = status.groups()
                elements.append(
                    ElementStatus(str(path), number, 1, name, state, reason or "")
                )
            match = FAKE.search(line)
            if match:
                rule, element, waived = match.groups()
                found.append(
                    finding(
                        catalogue,
                        rule,
                        str(path),
                        number,
                        element,
                        dict(VALUES[rule]),
                        waived=waived,
                    )
                )
        return CheckResult(
            file=str(path), findings=found, files=files, elements=elements
        )

    return check_path


@pytest.fixture
def project(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Project:
    """Work in ``tmp_path`` (a repository top, so no outer netcheck.yaml is found)."""
    (tmp_path / ".git").mkdir()
    monkeypatch.chdir(tmp_path)
    monkeypatch.delenv("NO_COLOR", raising=False)
    rules = make_catalogue()
    monkeypatch.setattr(catalogue_module, "load_catalogue", lambda: rules)
    result = Project(tmp_path)
    monkeypatch.setattr(pipeline, "check_path", fake_check_path(rules, result.calls))
    return result
