"""Fixes that really fix: structured edits, verified by re-checking the design."""
