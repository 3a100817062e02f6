"""The pipeline: design file -> model -> analysis -> checks -> findings."""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

from netcheck.findings import Finding

__all__ = ["CheckOptions", "CheckResult", "check_path"]


@dataclass(frozen=True)
class CheckOptions:
    """What the command line and configuration pass to the pipeline."""

    extra_parts: tuple[Path, ...] = ()
    allow_outside: bool = False
    margins: Mapping[str, float] = field(default_factory=dict)


@dataclass(frozen=True)
class CheckResult:
    """The findings of one design (waivers applied) and the files it read."""

    file: str
    findings: Sequence[Finding]
    files: Sequence[str]


def check_path(path: Path, options: CheckOptions = CheckOptions()) -> CheckResult:
    """Check one top-level ``.cnet`` design; raises InputError on bad input."""
    raise NotImplementedError("pipeline under construction")
