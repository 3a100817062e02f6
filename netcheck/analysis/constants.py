"""The physical assumptions the analysis makes where a design gives no value.

Each one lives here once, with where it comes from; the solvers, the rating
tables and ``netcheck size`` import it from here.
"""

from __future__ import annotations

__all__ = [
    "T95_PER_TAU",
    "STRAY_CAPACITANCE",
    "SILICON_DIODE_CONDUCTION_VF",
    "SILICON_RECTIFIER_VF",
]

# T0.95 is the time an RL circuit takes to reach 95 % of its final current:
# 1 - exp(-t/tau) = 0.95 gives t = tau·ln 20 = 2.996·tau. The spec (parts.md) and
# IEC 60947-5-1 use T0.95 = 3·L/R; so does everything netcheck reports, so that
# a limit and the value compared with it are computed the same way.
T95_PER_TAU = 3.0

# F: the capacitance assumed across an unsuppressed opening element (from
# memory: contact and wiring capacitances are tens to hundreds of pF).
STRAY_CAPACITANCE = 100e-12

# V: a silicon diode's forward drop where it starts to conduct, used by the
# closed-state solve to decide which diodes conduct (common practice).
SILICON_DIODE_CONDUCTION_VF = 0.7

# V: a silicon rectifier diode's forward drop near its rated current, as it
# carries a coil's current at opening (from memory); also the spec's default
# for ``netcheck size --vf``.
SILICON_RECTIFIER_VF = 0.9
