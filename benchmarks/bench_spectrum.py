"""Benchmark: naive shooting versus holostring's spectral solver, first 20 glueball states.

Run by hand:  .venv/bin/python benchmarks/bench_spectrum.py

The baseline is what a notebook would do: integrate the radial equation from near the boundary
with the leading behaviour as initial data (scipy.integrate.solve_ivp, DOP853, rtol 1e-10),
scan m^2 on a grid for sign changes of the IR condition, and refine each bracket with
scipy.optimize.brentq. Both methods are checked against exact results:

- hard wall z0 = 1, Dirichlet: m_n = zeros of J_2 (Boschi-Filho & Braga, hep-th/0209080);
- soft wall c = 1, scalar glueball: m_n^2 = 4(n + 2) (Colangelo et al., hep-ph/0703316).

Timing: the shooting baseline runs once (it takes seconds); ours is the best of REPEAT calls
(timeit-style minimum, which discards interruptions by other processes), after one warm-up call
that does the symbolic preparation and compilation, done once per background structure and
channel. Each timed call does the whole solve: both resolutions, the spurious-eigenvalue filter,
modes and the potential on the plot grid.
"""

from __future__ import annotations

import time

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import brentq
from scipy.special import jn_zeros

from holostring.background import load_background
from holostring.spectra import solve_spectrum

STATES = 20
EPS = 1e-3  # starting point of the shooting near the boundary
REPEAT = 10  # timed calls of ours; the minimum is reported


# ----------------------------------------------------------------------------- baseline
def shoot_hard_wall(lam: float) -> float:
    """phi(z0 = 1) for -(z^-3 phi')' = lam z^-3 phi with phi ~ z^4 (1 - lam z^2/12) at EPS."""

    def rhs(z, y):
        return [y[1], 3.0 * y[1] / z - lam * y[0]]

    z0 = EPS
    y0 = [z0**4 * (1 - lam * z0**2 / 12), 4 * z0**3 - 6 * lam * z0**5 / 12]
    sol = solve_ivp(rhs, (z0, 1.0), y0, method="DOP853", rtol=1e-10, atol=1e-14)
    return sol.y[0, -1] / np.max(np.abs(sol.y[0]))


def shoot_soft_wall(lam: float, z_max: float = 12.0) -> float:
    """psi(z_max) for -psi'' + (15/(4z^2) + z^2 + 2) psi = lam psi with psi ~ z^(5/2) at EPS."""

    def rhs(z, y):
        return [y[1], (15 / (4 * z * z) + z * z + 2 - lam) * y[0]]

    z0 = EPS
    y0 = [z0**2.5, 2.5 * z0**1.5]
    sol = solve_ivp(rhs, (z0, z_max), y0, method="DOP853", rtol=1e-10, atol=1e-300)
    return sol.y[0, -1] / np.max(np.abs(sol.y[0]))


def shooting(f, lam_max: float, grid: int) -> np.ndarray:
    lams = np.linspace(0.5, lam_max, grid)
    vals = np.array([f(x) for x in lams])
    roots = []
    for a, b, fa, fb in zip(lams[:-1], lams[1:], vals[:-1], vals[1:], strict=True):
        if fa * fb < 0:
            roots.append(brentq(f, a, b, xtol=1e-12, rtol=1e-13))
        if len(roots) == STATES:
            break
    return np.array(roots)


# ----------------------------------------------------------------------------- runs
def timed(fn, repeat: int = 1):
    best = np.inf
    out = None
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t)
    return out, best


def main() -> None:
    hw = load_background("hard-wall", z0=1.0)
    sw = load_background("soft-wall", c=1.0)
    exact_hw = jn_zeros(2, STATES) ** 2
    exact_sw = 4.0 * (np.arange(STATES) + 2)
    # warm up: symbolic preparation and compilation happen once per background and channel
    solve_spectrum(hw, states=STATES)
    solve_spectrum(sw, states=STATES)

    print(f"first {STATES} scalar-glueball states; relative errors on m^2 against exact values")
    print(f"time: shooting one run; spectral best of {REPEAT} runs (after one warm-up call)\n")
    print(f"{'case':<12}{'method':<12}{'time [s]':>12}{'max rel err':>14}{'ratio':>10}")
    for name, bg, exact, f, lam_max, grid in (
        ("hard wall", hw, exact_hw, shoot_hard_wall, exact_hw[-1] * 1.02, 400),
        ("soft wall", sw, exact_sw, shoot_soft_wall, exact_sw[-1] + 2.0, 200),
    ):
        base, t_base = timed(lambda f=f, lam_max=lam_max, grid=grid: shooting(f, lam_max, grid))
        ours, t_ours = timed(lambda bg=bg: solve_spectrum(bg, states=STATES), repeat=REPEAT)
        err_base = np.max(np.abs(base / exact[: base.size] - 1)) if base.size else np.inf
        err_ours = np.max(np.abs(ours.masses_squared / exact - 1))
        note = "" if base.size == STATES else f"  (shooting found only {base.size} states)"
        print(f"{name:<12}{'shooting':<12}{t_base:>12.3f}{err_base:>14.2e}{'':>10}{note}")
        print(f"{'':<12}{'spectral':<12}{t_ours:>12.5f}{err_ours:>14.2e}{t_base / t_ours:>9.0f}x")
        print(
            f"{'':<12}{'':<12}{'':>12}  converged={ours.converged}, nodes "
            f"{ours.resolution[0]}/{ours.resolution[1]}, estimate max "
            f"{np.max(ours.error_estimate / exact):.1e}"
        )


if __name__ == "__main__":
    main()
