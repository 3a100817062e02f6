"""Suppression sizing for one inductive DC load: what each option does and what to buy.

Quantities in, quantities out. Each option is simulated with ``analysis.transients``
(``options.py``); ratings apply the rule catalogue's margins (``rules/*.yaml``, the
same ones ``check`` applies), overridable e.g. from a netcheck.yaml.
"""

from __future__ import annotations

from collections.abc import Mapping

from netcheck.analysis.constants import SILICON_RECTIFIER_VF
from netcheck.analysis.snubber import PEAK_LIMIT
from netcheck.analysis.transients import VARISTOR_EXPONENT
from netcheck.sizing.circuit import SIZE_MARGINS, build_circuit, margin_defaults
from netcheck.sizing.options import OPTIONS
from netcheck.sizing.results import (
    SI_UNITS,
    LoadSummary,
    Rating,
    SizeOption,
    SizeResult,
    si_unit,
)
from netcheck.units import Q_, Quantity

__all__ = [
    "SIZE_MARGINS",
    "margin_defaults",
    "DEFAULT_FORWARD_VOLTAGE",
    "VARISTOR_EXPONENT",
    "Rating",
    "SizeOption",
    "LoadSummary",
    "SizeResult",
    "size_load",
    "SI_UNITS",
    "si_unit",
]

# Diode forward drop (spec default for netcheck size --vf).
DEFAULT_FORWARD_VOLTAGE = Q_(SILICON_RECTIFIER_VF, "V")


def size_load(
    voltage: Quantity,
    resistance: Quantity,
    inductance: Quantity,
    release_current: Quantity | None = None,
    clamp: Quantity | None = None,
    vf: Quantity = DEFAULT_FORWARD_VOLTAGE,
    margins: Mapping[str, float] | None = None,
    *,
    peak_limit: Quantity = PEAK_LIMIT,
    surge_current: Quantity | None = None,
    exponent: float = VARISTOR_EXPONENT,
) -> SizeResult:
    """Size diode, diode-zener, varistor, TVS (across the load) and RC (across contact).

    ``clamp`` (zener/varistor/TVS clamp voltage) defaults to the supply voltage, the
    release current to 10 % of the steady current V/R, the closing surge current that
    bounds the RC's R to the steady current. ``margins`` override the catalogue's.
    Raises QuantityError or ConfigError.
    """
    circuit = build_circuit(
        voltage,
        resistance,
        inductance,
        release_current,
        clamp,
        vf,
        margins,
        peak_limit,
        surge_current,
        exponent,
    )
    options = tuple(build(circuit) for build in OPTIONS)
    return SizeResult(circuit.summary(), options, tuple(circuit.margins.items()))
