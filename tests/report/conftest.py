"""Fixtures of the report tests (defined in report_samples, shared with tests/cli)."""

from report_samples import catalogue, findings, golden, report, sarif_schema

__all__ = ["catalogue", "findings", "golden", "report", "sarif_schema"]
