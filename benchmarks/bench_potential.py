"""Benchmark: L(z*) and E(z*) of the soft wall (c = 1) for 1000 turning points.

Naive baseline, written the way a notebook would: scipy.integrate.quad (default tolerances) per
turning point for L and for the regularised E. Ours: holostring's vectorised stretched Gauss rules
over all turning points at once, at two resolutions (so the error estimate is included in the
timing). Both are checked against an mpmath reference at 30 digits on a subset of the turning
points (tanh-sinh quadrature, endpoint substitution). The turning points are labelled by p as in
ConnectedFamily.zstar: z* = z_m expit(p), z_m - z* = z_m expit(-p); the reference uses the exact
z_m = sqrt(2/c), the naive code gets z* as a float.

Run:  .venv/bin/python benchmarks/bench_potential.py
"""

from __future__ import annotations

import math
import time
import warnings

import mpmath as mp
import numpy as np
from scipy import integrate

from holostring.background import load_background
from holostring.strings.connected import ConnectedFamily
from holostring.strings.potential import M_HI, M_LO

N = 1000
C = 1.0
ZM = math.sqrt(2.0 / C)


def naive(zstars: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """quad per turning point, directly on the z integrals (notebook style)."""

    def F(z):
        return math.exp(C * z * z / 2) / (z * z)

    def inv_root(z, Fs):
        d = F(z) ** 2 - Fs**2
        return 1.0 / math.sqrt(d) if d > 0 else 0.0

    Ls, Es = [], []
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        for zs in zstars:
            Fs = F(zs)
            L = 2 * integrate.quad(lambda z, Fs=Fs: Fs * inv_root(z, Fs), 0, zs, limit=200)[0]
            E = (
                2
                * integrate.quad(lambda z, Fs=Fs: F(z) ** 2 * inv_root(z, Fs) - 1 / z**2, 0, zs, limit=200)[0]
                - 2 / zs
            )
            Ls.append(L)
            Es.append(E)
    return np.array(Ls), np.array(Es)


def ours(fam: ConnectedFamily, p: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    hi = fam.evaluate(p, M_HI)
    lo = fam.evaluate(p, M_LO)
    E = hi["W"] + hi["Fstar"] * hi["L"]
    E_lo = lo["W"] + lo["Fstar"] * lo["L"]
    # two-resolution estimate, relative to the scale |E| + L used for the errors below
    err = np.maximum(np.abs(hi["L"] - lo["L"]), np.abs(E - E_lo)) / np.maximum(np.abs(E), hi["L"])
    return hi["L"], E, err


def reference(p: float) -> tuple[float, float]:
    """mpmath, 30 digits, for the turning point labelled by p (see ConnectedFamily.zstar).

    z* = z_m expit(p) and z_m - z* = z_m expit(-p) with the exact z_m = sqrt(2/c); then
    z = z*(1 - u^2) and F^2 - F*^2 from exp differences at full precision.
    """
    with mp.workdps(30):
        zm = mp.sqrt(2 / mp.mpf(C))
        zs_m = zm / (1 + mp.exp(-mp.mpf(p)))
        ys = zm / (1 + mp.exp(mp.mpf(p)))
        Fs = mp.exp(C * zs_m**2 / 2) / zs_m**2

        def parts(u):
            z = zs_m * (1 - u * u)
            F = mp.exp(C * z * z / 2) / z**2
            # F^2 - F*^2 = F*^2 [exp(a) - (1 - u^2)^4] / (1 - u^2)^4, a = C (z^2 - z*^2),
            # written without cancellation at small u
            u2 = u * u
            num = mp.expm1(-C * zs_m**2 * u2 * (2 - u2)) + u2 * (4 - 6 * u2 + 4 * u2**2 - u2**3)
            root = Fs * mp.sqrt(num) / (1 - u2) ** 2
            jac = 2 * zs_m * u
            # H F / root - 1/z^2 = (F - 1/z^2)/s + (1/z^2) r/(s (1 + s)), s = root/F, r = (Fs/F)^2
            s = root / F
            r = (Fs / F) ** 2
            e_int = mp.expm1(C * z * z / 2) / z**2 / s + r / (s * (1 + s)) / z**2
            return jac * Fs / root, jac * e_int

        a = mp.sqrt(2 * ys / zs_m)
        pts = sorted({mp.mpf(0), min(a, mp.mpf("0.5")), mp.mpf("0.5"), mp.mpf(1)})
        L = 2 * mp.quad(lambda u: parts(u)[0], pts)
        E = 2 * mp.quad(lambda u: parts(u)[1], pts) - 2 / zs_m
        return float(L), float(E)


def best_of(runs: int, fun, *args):
    """Smallest wall time of ``runs`` calls (the usual timeit convention) and the last result."""
    best, out = math.inf, None
    for _ in range(runs):
        t0 = time.perf_counter()
        out = fun(*args)
        best = min(best, time.perf_counter() - t0)
    return best, out


def main() -> None:
    bg = load_background("soft-wall", c=C)
    fam = ConnectedFamily.build(bg)
    p = np.linspace(-3.0, 12.0, N)
    zs, ys = fam.zstar(p)

    fam.evaluate(p[:4], M_HI)  # warm-up (compiled functions cached)
    t_ours, (L1, E1, err) = best_of(5, ours, fam, p)
    t_naive, (L0, E0) = best_of(3, naive, zs)

    sub = np.linspace(0, N - 1, 25).astype(int)
    ref = np.array([reference(p[i]) for i in sub])
    scale = np.maximum(np.abs(ref[:, 1]), np.abs(ref[:, 0]))  # E crosses zero: relative to |E|+L

    def rel(x, r, s=None):
        return np.max(np.abs(x - r) / (np.abs(r) if s is None else s))

    print(f"soft wall c={C}, {N} turning points z* in [{zs[0]:.4g}, z_m - {ys[-1]:.2e}]")
    print(f"  reference: mpmath 30 digits on {len(sub)} of them; times: best of 5 (ours), 3 (naive)")
    print(
        f"  naive quad : {t_naive:8.4f} s   max rel error L {rel(L0[sub], ref[:, 0]):.2e}, "
        f"E {rel(E0[sub], ref[:, 1], scale):.2e}"
    )
    print(
        f"  holostring : {t_ours:8.4f} s   max rel error L {rel(L1[sub], ref[:, 0]):.2e}, "
        f"E {rel(E1[sub], ref[:, 1], scale):.2e}   (own relative error estimate max {np.max(err):.1e}, "
        f"Gauss points per panel {M_HI} and {M_LO})"
    )
    print(f"  time ratio naive/ours: {t_naive / t_ours:.0f}x")


if __name__ == "__main__":
    main()
