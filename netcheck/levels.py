"""The severity words of options and configuration, importable without pint.

The command line's ``--help`` offers these choices before anything heavy loads;
``netcheck.findings.Severity`` is the enum they parse into.
"""

from __future__ import annotations

__all__ = ["FAIL_ON", "SEVERITIES"]

SEVERITIES = ("error", "warning", "info")
FAIL_ON = (*SEVERITIES, "never")
