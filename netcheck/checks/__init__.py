"""The checks, one module per rule family; importing this package registers them."""

from netcheck.checks import (  # noqa: F401
    arc,
    arrangement,
    clamps,
    coils,
    making,
    network,
    protection,
    ratings,
    suppression,
    suppressors,
)
