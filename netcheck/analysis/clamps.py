"""Opening transients of an inductive load with a voltage clamp or a resistor.

Plain floats in SI units (V, A, ohm, H, s, J, C). Each function returns the fields of
``transients.Transient`` that depend on the arrangement. Sources: KVL on the coil loop
(L·di/dt = -(Vx + R·i), first principles) gives closed forms; the varistor's
power law has none and is integrated with ``ode.integrate``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from netcheck.analysis.ode import Event, Solution, integrate

__all__ = [
    "clamp_transient",
    "resistor_transient",
    "varistor_transient",
    "decay_time",
    "clamp_charge",
]

_POINTS = 401  # samples of a closed-form waveform
_STOP = 1e-9  # varistor integration stops at this fraction of I0 (energy left ~1e-18)


def _log1p_ratio(y: float) -> float:
    """log(1 + y)/y, 1 at y = 0."""
    return 1.0 - 0.5 * y if abs(y) < 1e-8 else math.log1p(y) / y


def decay_time(
    resistance: float, inductance: float, start: float, end: float, drive: float
) -> float:
    """Time for L·di/dt = -(drive + R·i) to take i from ``start`` down to ``end``.

    t = τ·ln((I0 + Vx/R)/(Id + Vx/R)) (solving the KVL equation), with log1p so
    it stays exact as R → 0 (then t = L·(I0 - Id)/Vx). Infinite if never reached.
    """
    if end >= start:
        return 0.0
    denominator = drive + resistance * end
    if denominator <= 0:
        return math.inf
    ratio = resistance * (start - end) / denominator
    return inductance * (start - end) / denominator * _log1p_ratio(ratio)


def _h(x: float) -> float:
    """(x - ln(1 + x))/x², by its series where cancellation would ruin it."""
    if x < 1e-3:
        return sum((-x) ** n / (n + 2) for n in range(8))
    return (x - math.log1p(x)) / (x * x)


def clamp_charge(
    resistance: float, inductance: float, current: float, drive: float
) -> float:
    """Charge ∫i dt until the current reaches zero under a constant drive Vx > 0.

    Q = (L/R)·[I0 - (Vx/R)·ln(1 + R·I0/Vx)] (integrating i(t), first principles),
    rewritten as L·I0²·h(R·I0/Vx)/Vx so that R → 0 gives L·I0²/(2·Vx).
    """
    if drive <= 0:
        return inductance * current / resistance if resistance > 0 else math.inf
    return inductance * current**2 * _h(resistance * current / drive) / drive


def _clamped_current(
    t: np.ndarray, resistance: float, inductance: float, current: float, drive: float
) -> np.ndarray:
    """Return i(t) = I0·e^(-t/τ) - (Vx/R)·(1 - e^(-t/τ)), stable for R → 0."""
    x = resistance * t / inductance
    phi = np.where(x < 1e-12, 1.0, -np.expm1(-x) / np.where(x == 0, 1.0, x))
    return current * np.exp(-x) - drive * t / inductance * phi


def _clamp_waveform(
    resistance: float,
    inductance: float,
    supply: float,
    current: float,
    drive: float,
    t_zero: float,
) -> tuple[np.ndarray, np.ndarray]:
    """Sample times and load current, up to a little past the current's zero."""
    if math.isfinite(t_zero):
        t = np.linspace(0.0, 1.2 * t_zero, _POINTS)
    else:
        # never reaches zero: show five time constants (R = 0: a clamp-limited ramp)
        scale = max(abs(drive), supply, 1e-12)
        tau = (
            inductance / resistance if resistance > 0 else inductance * current / scale
        )
        t = np.linspace(0.0, 5 * tau, _POINTS)
    i = _clamped_current(t, resistance, inductance, current, drive)
    return t, np.maximum(i, 0.0)


def clamp_transient(
    resistance: float,
    inductance: float,
    supply: float,
    current: float,
    clamp: float,
    release: float,
    *,
    across_element: bool,
) -> dict[str, Any]:
    """Constant clamp Vc across the load (Vx = Vc) or the element (Vx = Vc - Vs)."""
    drive = clamp - supply if across_element else clamp
    continuous = across_element and drive <= 0
    t_zero = decay_time(resistance, inductance, current, 0.0, drive)
    charge = (
        math.inf if continuous else clamp_charge(resistance, inductance, current, drive)
    )
    supply_energy = supply * charge if across_element else 0.0
    energy = clamp * charge
    stored = 0.5 * inductance * current**2
    t, i = _clamp_waveform(resistance, inductance, supply, current, drive, t_zero)
    on = t < t_zero
    base = 0.0 if across_element else supply
    return {
        "peak_voltage": base + clamp,
        "release_time": decay_time(resistance, inductance, current, release, drive),
        "suppressor_energy": energy,
        "suppressor_charge": charge,
        "suppressor_peak_voltage": clamp,
        "coil_loss": math.inf if continuous else stored + supply_energy - energy,
        "supply_energy": supply_energy,
        "stored_energy": 0.5 * inductance * current**2,
        "final_energy": 0.0,
        "conducts_continuously": continuous,
        "t": t,
        "i_load": np.where(on, i, 0.0),
        "v_element": np.where(on, base + clamp, supply),
    }


def resistor_transient(
    resistance: float,
    inductance: float,
    supply: float,
    current: float,
    parallel: float,
    release: float,
) -> dict[str, Any]:
    """Resistor Rp across the load: τ' = L/(R + Rp), Vsw = Vs + I0·Rp (KVL)."""
    if parallel <= 0:
        raise ValueError("a resistor across the load needs resistance > 0")
    tau = inductance / (resistance + parallel)
    if release >= current:
        release_time = 0.0
    else:
        release_time = tau * math.log(current / release) if release > 0 else math.inf
    stored = 0.5 * inductance * current**2
    t = np.linspace(0.0, 5 * tau, _POINTS)
    i = current * np.exp(-t / tau)
    return {
        "peak_voltage": supply + current * parallel,
        "release_time": release_time,
        "suppressor_energy": stored * parallel / (resistance + parallel),
        "suppressor_charge": current * tau,
        "suppressor_peak_voltage": current * parallel,
        "coil_loss": stored * resistance / (resistance + parallel),
        "supply_energy": 0.0,
        "stored_energy": 0.5 * inductance * current**2,
        "final_energy": 0.0,
        "conducts_continuously": False,
        "t": t,
        "i_load": i,
        "v_element": supply + parallel * i,
    }


@dataclass(frozen=True)
class _Varistor:
    """Power law I = Iref·(V/Vref)^α, odd in V (a varistor conducts both ways)."""

    v_ref: float
    i_ref: float
    exponent: float

    def voltage(self, i: float) -> float:
        """Return the varistor voltage at current i."""
        return math.copysign(
            self.v_ref * (abs(i) / self.i_ref) ** (1 / self.exponent), i
        )


def _integrate_varistor(
    resistance: float,
    inductance: float,
    current: float,
    varistor: _Varistor,
    release: float,
    i_stop: float,
) -> Solution:
    """Integrate states [i, charge, varistor energy, coil loss] down to ``i_stop``."""

    def rhs(_t: float, y: np.ndarray) -> np.ndarray:
        i = y[0]
        v = varistor.voltage(i)
        return np.array(
            [-(resistance * i + v) / inductance, i, v * i, resistance * i * i]
        )

    bound = inductance * current / varistor.voltage(i_stop)  # |di/dt| >= V(i_stop)/L
    stored = 0.5 * inductance * current**2
    atol = [1e-10 * current, 1e-10 * current * bound, 1e-10 * stored, 1e-10 * stored]
    events = [Event(lambda _t, y: y[0] - i_stop, terminal=True)]
    if 0 < release < current:
        events.append(Event(lambda _t, y: y[0] - release))
    return integrate(
        rhs, [current, 0.0, 0.0, 0.0], 2 * bound, rtol=1e-9, atol=atol, events=events
    )


def varistor_transient(
    resistance: float,
    inductance: float,
    supply: float,
    current: float,
    v_ref: float,
    i_ref: float,
    exponent: float,
    release: float,
) -> dict[str, Any]:
    """Varistor I = Iref·(V/Vref)^α across the load, integrated numerically.

    The integration stops when the current has fallen to 1e-9·I0 (the energy left
    is 1e-18 of the stored energy); the short rest to zero is added linearly.
    """
    varistor = _Varistor(v_ref, i_ref, exponent)
    i_stop = _STOP * current if release <= 0 else min(_STOP * current, 0.5 * release)
    solution = _integrate_varistor(
        resistance, inductance, current, varistor, release, i_stop
    )
    v_stop = varistor.voltage(i_stop)
    t_zero = float(solution.t[-1]) + inductance * i_stop / (
        v_stop + resistance * i_stop
    )
    if release >= current:
        release_time = 0.0
    else:
        release_time = solution.event_times[1][0] if release > 0 else t_zero
    _, charge, energy, coil = solution.y[-1]
    i = np.append(solution.y[:, 0], 0.0)
    return {
        "peak_voltage": supply + varistor.voltage(current),
        "release_time": release_time,
        "suppressor_energy": float(energy),
        "suppressor_charge": float(charge),
        "suppressor_peak_voltage": varistor.voltage(current),
        "coil_loss": float(coil),
        "supply_energy": 0.0,
        "stored_energy": 0.5 * inductance * current**2,
        "final_energy": 0.0,
        "conducts_continuously": False,
        "t": np.append(solution.t, t_zero),
        "i_load": i,
        "v_element": supply + np.array([varistor.voltage(x) for x in i]),
    }
