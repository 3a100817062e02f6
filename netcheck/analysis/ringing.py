"""Exact transients of the linear R-L-C loops formed by an RC or a capacitor at opening.

Plain floats in SI units (V, A, ohm, H, F, s, J). The loop is a coil (R, L) in series
with a branch of resistance Rs and capacitance C, with or without the supply in the
loop; its state z = [i, v_C] obeys z' = A·z + b, solved exactly by the 2×2 matrix
exponential (first principles: KVL and the capacitor law i = C·dv/dt).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Any

import numpy as np

__all__ = ["ring_transient"]

_GRID = 4097  # samples per scan; extrema and crossings are then refined by bisection


class _Loop:
    """z(t) = z_ss + expm(A·t)·(z0 - z_ss) for the 2×2 loop matrix A."""

    def __init__(self, a: np.ndarray, z0: np.ndarray, z_ss: np.ndarray) -> None:
        self.a, self.z_ss, self.u = a, z_ss, z0 - z_ss
        self.s = complex(np.trace(a) / 2)
        self.d = np.sqrt(complex(self.s**2 - np.linalg.det(a)))
        self.w = (a - self.s.real * np.eye(2)) @ self.u

    def deviation(self, t: np.ndarray) -> np.ndarray:
        """Return z(t) - z_ss, shape (2, n).

        For a 2×2 matrix, expm(A·t) = e^(s·t)·[cosh(d·t)·I + sinh(d·t)/d·(A - s·I)]
        with s = tr(A)/2 and d² = s² - det(A) (Cayley-Hamilton); d is imaginary for
        a ringing loop, and sinh(d·t)/d → t as d → 0 (critical damping).
        """
        t = np.atleast_1d(np.asarray(t, dtype=float))
        s, d = self.s, self.d
        dt = d * t
        e1, e2 = np.exp((s + d) * t), np.exp((s - d) * t)
        cosh = 0.5 * (e1 + e2)
        small = np.abs(dt) < 1e-3
        safe_d = d if d != 0 else 1.0
        sinh_d = np.where(
            small,
            np.exp(s * t) * t * (1 + dt**2 / 6 + dt**4 / 120),
            (e1 - e2) / (2 * safe_d),
        )
        return np.real(np.outer(self.u, cosh) + np.outer(self.w, sinh_d))

    def output(self, weights: np.ndarray, offset: float) -> Callable:
        """Return g(t) = offset + weights·z(t) as a vectorised function."""
        constant = offset + float(weights @ self.z_ss)
        return lambda t: constant + weights @ self.deviation(t)

    def slope(self, weights: np.ndarray) -> Callable:
        """Return g'(t) for g = weights·z (since z' = A·(z - z_ss))."""
        row = weights @ self.a
        return lambda t: row @ self.deviation(t)

    def peak(
        self, weights: np.ndarray, offset: float, grid: np.ndarray
    ) -> tuple[float, float]:
        """Return (time, value) of the largest offset + weights·z over t >= 0."""
        limit = offset + float(weights @ self.z_ss)
        return _maximum(self.output(weights, offset), self.slope(weights), grid, limit)

    def energy_integral(self) -> float:
        """Return ∫0^∞ (i - i_ss)² dt from the Lyapunov equation A·P + P·Aᵀ = -u·uᵀ."""
        (a11, a12), (a21, a22) = self.a
        u1, u2 = self.u
        system = np.array(
            [[2 * a11, 2 * a12, 0.0], [a21, a11 + a22, a12], [0.0, 2 * a21, 2 * a22]]
        )
        p11, _, _ = np.linalg.solve(system, -np.array([u1 * u1, u1 * u2, u2 * u2]))
        return float(p11)


def _grid(loop: _Loop) -> np.ndarray:
    """Sample times long enough to hold the first peak and the release.

    An oscillating loop passes both within its first period; a non-oscillating one
    has decayed by e^-80 after 80 slow time constants.
    """
    rate, det = -loop.s.real, float(np.linalg.det(loop.a))
    if loop.d.imag > 0:
        horizon = 2 * (2 * math.pi / loop.d.imag)
        if rate > 0:
            horizon = min(horizon, 80.0 / rate)
        fast = math.sqrt(det)
    else:
        fast = rate + loop.d.real
        horizon = 80.0 * fast / det  # det = product of the two decay rates
    start = min(1e-4 / fast, horizon / _GRID)
    linear = np.linspace(0.0, horizon, _GRID)
    return np.unique(np.concatenate([linear, np.geomspace(start, horizon, _GRID)]))


def _bisect(fun: Callable, lo: float, hi: float) -> float:
    """Root of a scalar sign change in [lo, hi]."""
    f_lo = float(fun(lo)[0])
    for _ in range(100):
        mid = 0.5 * (lo + hi)
        f_mid = float(fun(mid)[0])
        if (f_mid > 0) == (f_lo > 0) and f_mid != 0.0:
            lo, f_lo = mid, f_mid
        else:
            hi = mid
        if hi - lo <= 4e-16 * hi:
            break
    return 0.5 * (lo + hi)


def _maximum(
    g: Callable, slope: Callable, grid: np.ndarray, limit: float
) -> tuple[float, float]:
    """Largest value of g over t >= 0 (including its final value) and its time."""
    rising = slope(grid) > 0
    best_t, best = 0.0, float(g(0.0)[0])
    for k in np.nonzero(rising[:-1] & ~rising[1:])[0]:
        t_k = _bisect(slope, float(grid[k]), float(grid[k + 1]))
        value = float(g(t_k)[0])
        if value > best:
            best_t, best = t_k, value
    if limit > best:
        return math.inf, limit
    return best_t, best


def _release(current: Callable, grid: np.ndarray, release: float) -> float:
    """First time |i| <= release current, bisected between grid samples."""
    values = current(grid)
    sign = np.sign(values)
    hit = (np.abs(values) <= release) | (sign != sign[0])
    hits = np.nonzero(hit)[0]
    if hits.size == 0:
        return math.inf
    k = int(hits[0])
    if k == 0:
        return 0.0
    s0 = sign[k - 1]
    return _bisect(
        lambda t: s0 * current(t) - release, float(grid[k - 1]), float(grid[k])
    )


def ring_transient(
    resistance: float,
    inductance: float,
    supply: float,
    current: float,
    series_resistance: float,
    capacitance: float,
    *,
    across_element: bool,
    release_current: float,
) -> dict[str, Any]:
    """Exact R-L-C opening transient of an RC (Rs >= 0) across the load or the element.

    Across the load the capacitor starts charged to the coil's voltage R·I0 and the
    supply is out of the loop; across the element it starts empty and the supply stays
    in the loop. The element voltage is Vs + Rs·i + v_C (load) or Rs·i + v_C (element),
    with v_C counted in the direction of the loop current. Returns the fields of
    ``transients.Transient`` that depend on the arrangement, waveforms included.
    """
    loop, offset = _loop(
        resistance,
        inductance,
        supply,
        current,
        series_resistance,
        capacitance,
        across_element,
    )
    grid = _grid(loop)
    element, cap = np.array([series_resistance, 1.0]), np.array([0.0, 1.0])
    t_peak, peak = loop.peak(element, offset, grid)
    cap_peak = max(loop.peak(cap, 0.0, grid)[1], loop.peak(-cap, 0.0, grid)[1])
    i_of_t = loop.output(np.array([1.0, 0.0]), 0.0)
    release = 0.0
    if current > release_current:
        release = _release(i_of_t, grid, release_current)
    r_total = resistance + series_resistance
    square = loop.energy_integral() if r_total > 0 else 0.0
    t = _plot_times(grid, release, t_peak)
    v0, v_end = loop.z_ss[1] - loop.u[1], loop.z_ss[1]
    charge = capacitance * (v_end - v0)
    return {
        "peak_voltage": peak,
        "release_time": release,
        "suppressor_energy": series_resistance * square,
        "suppressor_charge": charge,
        "suppressor_peak_voltage": cap_peak,
        "coil_loss": resistance * square,
        "supply_energy": supply * charge if across_element else 0.0,
        "stored_energy": 0.5 * inductance * current**2 + 0.5 * capacitance * v0**2,
        "final_energy": 0.5 * capacitance * v_end**2,
        "conducts_continuously": False,
        "t": t,
        "i_load": i_of_t(t),
        "v_element": loop.output(element, offset)(t),
    }


def _loop(
    resistance: float,
    inductance: float,
    supply: float,
    current: float,
    series_resistance: float,
    capacitance: float,
    across_element: bool,
) -> tuple[_Loop, float]:
    """Build the loop and the constant part of the element voltage.

    KVL: L·di/dt = [Vs] - (R + Rs)·i - v_C and C·dv_C/dt = i.
    """
    r_total = resistance + series_resistance
    a = np.array([[-r_total / inductance, -1 / inductance], [1 / capacitance, 0.0]])
    if across_element:
        return _Loop(a, np.array([current, 0.0]), np.array([0.0, supply])), 0.0
    return _Loop(a, np.array([current, -resistance * current]), np.zeros(2)), supply


def _plot_times(grid: np.ndarray, release: float, t_peak: float) -> np.ndarray:
    """Return plot times: past the peak and the release, within the scanned grid."""
    events = [x for x in (release, t_peak) if math.isfinite(x) and x > 0]
    end = min(float(grid[-1]), 3 * max(events)) if events else float(grid[-1])
    return np.linspace(0.0, end, 501)
