"""netcheck: lint control-circuit netlists for DC switching hazards."""

__version__ = "0.1.0"
