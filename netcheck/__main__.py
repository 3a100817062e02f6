"""``python -m netcheck``: the same as the ``netcheck`` console script."""

from netcheck.cli import entry

entry()
