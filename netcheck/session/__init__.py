"""The session: many designs, one project root, one report.

The command line only parses options into a :class:`Request` and calls in here:

- ``root.py``: the project root that shown paths, SARIF URIs and fingerprints
  are relative to (one display-path rule for output and fingerprints alike);
- ``discover.py``: the top-level designs among the named paths, by the input
  seam's suffixes and includes;
- ``settings.py``: the command line merged over each design's ``netcheck.yaml``;
- ``run.py``: the process pool, select/ignore, severity overrides, baselines
  (stale entries included) and ``--fail-on``.
"""

from __future__ import annotations

from netcheck.session.discover import discover_designs
from netcheck.session.root import project_root
from netcheck.session.run import Outcome, check_designs, os_error_line
from netcheck.session.settings import (
    Request,
    Settings,
    SettingsCache,
    UsageError,
    configured_margins,
    resolve_rules,
)

__all__ = [
    "Outcome",
    "Request",
    "Settings",
    "SettingsCache",
    "UsageError",
    "check_designs",
    "configured_margins",
    "discover_designs",
    "os_error_line",
    "project_root",
    "resolve_rules",
]
