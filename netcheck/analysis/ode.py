"""A small adaptive Runge-Kutta integrator (Dormand-Prince 5(4)) with event location.

Values are plain floats (numpy arrays of states); the caller chooses the units. It
exists so that the package needs no scipy at run time (scipy is a test reference).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

__all__ = ["Event", "Solution", "integrate"]

Rhs = Callable[[float, np.ndarray], np.ndarray]

# Dormand & Prince (1980) 5(4) tableau, as in Hairer, Norsett & Wanner, "Solving
# Ordinary Differential Equations I", table 5.2 (5th-order solution propagated).
_C = (0.0, 1 / 5, 3 / 10, 4 / 5, 8 / 9, 1.0, 1.0)
_A = (
    (),
    (1 / 5,),
    (3 / 40, 9 / 40),
    (44 / 45, -56 / 15, 32 / 9),
    (19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729),
    (9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656),
    (35 / 384, 0.0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84),
)
# Difference between the 5th- and 4th-order weights (the error estimate).
_E = np.array(
    [71 / 57600, 0.0, -71 / 16695, 71 / 1920, -17253 / 339200, 22 / 525, -1 / 40]
)
_SAFETY, _GROW, _SHRINK = 0.9, 5.0, 0.2


@dataclass(frozen=True)
class Event:
    """A function g(t, y) whose sign change is located; terminal events stop."""

    function: Callable[[float, np.ndarray], float]
    terminal: bool = False


@dataclass(frozen=True, eq=False)
class Solution:
    """Accepted step points ``t`` (n,), states ``y`` (n, m), event times per event."""

    t: np.ndarray
    y: np.ndarray
    event_times: tuple[tuple[float, ...], ...]
    terminated: bool


def _step(rhs: Rhs, t: float, y: np.ndarray, f0: np.ndarray, h: float) -> tuple:
    """One Dormand-Prince step: new state, its derivative and the error vector."""
    k = [f0]
    for stage in range(1, 7):
        incr = sum(a * kk for a, kk in zip(_A[stage], k, strict=False) if a != 0.0)
        k.append(rhs(t + _C[stage] * h, y + h * incr))
    y_new = y + h * sum(a * kk for a, kk in zip(_A[6], k, strict=False) if a != 0.0)
    error = h * sum(e * kk for e, kk in zip(_E, k, strict=True) if e != 0.0)
    return y_new, k[6], error


def _locate(
    rhs: Rhs, event: Event, t0: float, y0: np.ndarray, f0: np.ndarray, h: float
) -> tuple[float, np.ndarray]:
    """Bisect an event's sign change inside an accepted step, on true sub-steps.

    Each trial state is a Runge-Kutta step of part of h from the step's start, so
    the event is located as accurately as the integration itself.
    """
    lo, hi = 0.0, h
    g_lo = event.function(t0, y0)
    y_hi = _step(rhs, t0, y0, f0, h)[0]
    for _ in range(100):
        mid = 0.5 * (lo + hi)
        y_mid = _step(rhs, t0, y0, f0, mid)[0]
        g_mid = event.function(t0 + mid, y_mid)
        if (g_mid > 0) == (g_lo > 0) and g_mid != 0.0:
            lo, g_lo = mid, g_mid
        else:
            hi, y_hi = mid, y_mid
        if hi - lo <= 1e-15 * max(abs(t0 + hi), 1e-300):
            break
    return t0 + hi, y_hi


def _first_step(
    rhs: Rhs, y0: np.ndarray, f0: np.ndarray, scale: np.ndarray, t_end: float
) -> float:
    """Return a cautious first step from the size of the state and its slope."""
    d0 = float(np.sqrt(np.mean((y0 / scale) ** 2)))
    d1 = float(np.sqrt(np.mean((f0 / scale) ** 2)))
    if d0 < 1e-5 or d1 < 1e-5:
        return 1e-6 * t_end
    return min(0.01 * d0 / d1, 0.1 * t_end)


def integrate(
    rhs: Rhs,
    y0: Sequence[float],
    t_end: float,
    *,
    rtol: float = 1e-8,
    atol: Sequence[float] | float = 1e-12,
    events: Sequence[Event] = (),
    max_steps: int = 200_000,
) -> Solution:
    """Integrate y' = rhs(t, y) from t = 0 to ``t_end`` or a terminal event."""
    t, y = 0.0, np.asarray(y0, dtype=float)
    f = rhs(t, y)
    atol_v = np.broadcast_to(np.asarray(atol, dtype=float), y.shape)
    h = _first_step(rhs, y, f, atol_v + rtol * np.abs(y), t_end)
    times, states = [t], [y]
    found: list[list[float]] = [[] for _ in events]
    for _ in range(max_steps):
        h = min(h, t_end - t)
        y_new, f_new, error = _step(rhs, t, y, f, h)
        scale = atol_v + rtol * np.maximum(np.abs(y), np.abs(y_new))
        norm = float(np.sqrt(np.mean((error / scale) ** 2)))
        if norm > 1.0:
            h *= max(_SHRINK, _SAFETY * norm**-0.2)
            if h <= 1e-14 * max(t, t_end * 1e-6):
                raise RuntimeError(f"step size underflow at t = {t:g}")
            continue
        stop = _events(rhs, events, found, t, y, f, h, y_new)
        if stop is not None:
            times.append(stop[0])
            states.append(stop[1])
            return Solution(
                np.array(times), np.array(states), tuple(map(tuple, found)), True
            )
        t, y, f = t + h, y_new, f_new
        times.append(t)
        states.append(y)
        if t >= t_end:
            return Solution(
                np.array(times), np.array(states), tuple(map(tuple, found)), False
            )
        growth = _GROW if norm == 0.0 else min(_GROW, _SAFETY * norm**-0.2)
        h *= growth
    raise RuntimeError(f"no convergence in {max_steps} steps")


def _events(
    rhs: Rhs,
    events: Sequence[Event],
    found: list[list[float]],
    t: float,
    y: np.ndarray,
    f: np.ndarray,
    h: float,
    y_new: np.ndarray,
) -> tuple[float, np.ndarray] | None:
    """Record the events crossed in an accepted step; return a terminal stop."""
    crossed: list[tuple[int, float, np.ndarray]] = []
    for index, event in enumerate(events):
        before, after = event.function(t, y), event.function(t + h, y_new)
        if before == 0.0 or ((before > 0) == (after > 0) and after != 0.0):
            continue
        t_e, y_e = _locate(rhs, event, t, y, f, h)
        crossed.append((index, t_e, y_e))
    terminal = [c for c in crossed if events[c[0]].terminal]
    stop = min(terminal, key=lambda c: c[1]) if terminal else None
    for index, t_e, _ in crossed:
        if stop is None or t_e <= stop[1]:
            found[index].append(t_e)
    return None if stop is None else (stop[1], stop[2])
