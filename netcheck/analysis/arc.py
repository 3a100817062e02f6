"""A first-order estimate of whether a DC break arc is sustained.

An estimate, not a rating: a stable break arc in air needs the source voltage
above the contact material's minimum arc voltage Um (per break; n breaks in
series need n·Um) and the current above its minimum arc current Im (Holm,
*Electric Contacts*, as reproduced in the facts sheet, section 6). An
inductive load's kick exceeds Um whatever the supply, so there only Im counts.
The Ayrton characteristic V = A + B·d + (C + D·d)/I and its load-line test
(an arc goes out where the characteristic lies above E - I·R for every I,
the Kaufmann criterion) are given for the illustrative constants the
facts sheet lists (carbon arcs); they are not data for metal contacts.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "MIN_ARC",
    "AG_LIKE",
    "ArcEstimate",
    "min_arc",
    "estimate",
    "ayrton_voltage",
    "ayrton_margin",
]

# Material -> (Um in V, Im in A). Ag, Au, Au alloy, Pd, Pt: a contact-protection
# data sheet table (facts sheet 6); Cu, W, Ni, Fe, C, AgCdO: from memory (Holm).
MIN_ARC: dict[str, tuple[float, float]] = {
    "Ag": (12.0, 0.40),
    "Au": (15.0, 0.40),
    "AuAlloy": (9.0, 0.40),
    "Pd": (16.0, 0.80),
    "Pt": (17.5, 0.70),
    "Cu": (13.0, 0.43),
    "W": (15.0, 1.0),
    "Ni": (14.0, 0.5),
    "Fe": (15.0, 0.45),
    "C": (20.0, 0.01),
    "AgCdO": (10.0, 0.4),
}
# AgNi, AgSnO2 and materials not listed: treated as silver (an assumption; no
# published value was found, facts sheet 6, LOW confidence).
AG_LIKE = MIN_ARC["Ag"]

# Ayrton's constants for solid carbons (d in mm, I in A; facts sheet 11, from
# memory): V = A + B·d + (C + D·d)/I.
AYRTON = (38.88, 2.074, 11.66, 10.54)


@dataclass(frozen=True)
class ArcEstimate:
    """The screening verdict and what it rests on."""

    sustained: bool
    um: float  # V per break
    im: float  # A
    breaks: int
    assumed_material: bool  # the material's values were assumed Ag-like
    reason: str  # "voltage", "current" or "both" (what is above / below)


def min_arc(material: str | None) -> tuple[tuple[float, float], bool]:
    """(Um, Im) of a material and whether they were assumed (Ag-like)."""
    if material in MIN_ARC:
        return MIN_ARC[material], False
    return AG_LIKE, True


def estimate(
    voltage: float, current: float, breaks: int, material: str | None, inductive: bool
) -> ArcEstimate:
    """Whether an arc is likely sustained: V > n·Um (or inductive) and I > Im."""
    (um, im), assumed = min_arc(material)
    voltage_ok = inductive or voltage > breaks * um
    current_ok = current > im
    reason = (
        "both"
        if voltage_ok and current_ok
        else ("current" if voltage_ok else "voltage")
    )
    return ArcEstimate(voltage_ok and current_ok, um, im, breaks, assumed, reason)


def ayrton_voltage(current: float, gap_mm: float, constants=AYRTON) -> float:  # type: ignore[no-untyped-def]
    """Arc voltage by Ayrton's equation (V)."""
    a, b, c, d = constants
    return a + b * gap_mm + (c + d * gap_mm) / current


def ayrton_margin(
    emf: float,
    resistance: float,
    breaks: int,
    gap_mm: float,
    constants=AYRTON,  # type: ignore[no-untyped-def]
) -> float:
    """Smallest of Va(I) - (E - I·R) over 0 < I <= E/R: > 0 means the arc goes out.

    With a = n(A + B·d) and c = n(C + D·d): f(I) = a - E + c/I + R·I, least at
    I* = sqrt(c/R) where f = a - E + 2·sqrt(c·R) (facts sheet 11, derived).
    """
    a0, b0, c0, d0 = constants
    a, c = breaks * (a0 + b0 * gap_mm), breaks * (c0 + d0 * gap_mm)
    best = math.sqrt(c / resistance)
    if best <= emf / resistance:
        return a - emf + 2.0 * math.sqrt(c * resistance)
    end = emf / resistance
    return a - emf + c / end + resistance * end
