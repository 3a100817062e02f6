"""The checks, one module per rule family; importing this package registers them."""

from netcheck.checks import network, suppression  # noqa: F401
