"""Multi-valued V(L) on the ridge-throat demo (metrics/ridge-throat.toml): every branch kept.

The independent reference is scipy.integrate.quad straight on the textbook integrals for a
conformally flat string-frame metric (H = F = w; Maldacena hep-th/9803002; Sonnenschein
hep-th/0003032, eqs. 2.6-2.8), with the warp w written out here by hand, not compiled by the
package:
    L(z*) = 2 int_0^{z*} F* dz / sqrt(F^2 - F*^2)
    E(z*) = 2 g [int_0^{z*} (F^2 / sqrt(F^2 - F*^2) - 1/z^2) dz - 1/z*]   (uv-pole scheme)
"""

import math
import warnings
from pathlib import Path

import numpy as np
import pytest
from scipy import integrate, optimize

from holostring.background import load_background
from holostring.strings import compute_potential

RIDGE = Path(__file__).resolve().parents[2] / "metrics" / "ridge-throat.toml"
C, B, S = 1.0, 0.8, 0.7  # the file's defaults


def _F(z):
    A = C * z * z / 4 + B * (z / S) ** 4 * math.exp(-((z / S) ** 2))
    return math.exp(2 * A) / (z * z)


def _L_E(zs):
    """L and E (g = 1) by quad with z = z*(1 - t^2)."""
    Fs = _F(zs)

    def root(t):
        return math.sqrt(max(_F(zs * (1 - t * t)) ** 2 - Fs * Fs, 1e-300))

    def fL(t):  # quad's nodes are interior: t > 0
        return Fs * 2 * zs * t / root(t)

    def fE(t):
        z = zs * (1 - t * t)
        return (_F(z) ** 2 / root(t) - 1 / (z * z)) * 2 * zs * t

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        L = 2 * integrate.quad(fL, 0, 1, epsabs=0, epsrel=1e-12, limit=200)[0]
        E = 2 * (integrate.quad(fE, 0, 1, epsabs=0, epsrel=1e-12, limit=200)[0] - 1 / zs)
    return L, E


@pytest.fixture(scope="module")
def ridge():
    bg = load_background(str(RIDGE))
    return bg, compute_potential(bg, L_range=(1.0, 3.5), points=120)


def test_three_branches_meet_at_the_cusps_of_L(ridge):
    _bg, res = ridge
    assert res.converged, res.message
    conn = [b for b in res.branches if b.kind == "connected"]
    assert [b.stable for b in conn] == [True, False, True]
    # the cusps are the local maximum and minimum of L(z*), where dL/dz* = 0 (quad reference)
    zmax = optimize.minimize_scalar(
        lambda z: -_L_E(z)[0], bounds=(0.7, 1.0), method="bounded", options={"xatol": 1e-9}
    )
    zmin = optimize.minimize_scalar(
        lambda z: _L_E(z)[0], bounds=(1.1, 1.5), method="bounded", options={"xatol": 1e-9}
    )
    L_top, L_bottom = -zmax.fun, zmin.fun
    assert conn[0].L_range[1] == pytest.approx(L_top, rel=1e-9)
    assert conn[1].L_range[1] == pytest.approx(L_top, rel=1e-9)
    assert conn[1].L_range[0] == pytest.approx(L_bottom, rel=1e-9)
    assert conn[2].L_range[0] == pytest.approx(L_bottom, rel=1e-9)
    # within the window three strings exist, outside it one
    for L0, count in ((1.5, 1), (2.3, 3), (3.0, 1)):
        r = compute_potential(ridge[0], L=[L0])
        assert sum(b.L.size for b in r.branches) == count


def test_force_identity_on_every_branch(ridge):
    # dE/dL = g F(z*) (Kinar-Schreiber-Sonnenschein hep-th/9811192) on stable and unstable strings
    bg, _ = ridge
    L0, h = 2.3, 1e-3
    L = L0 + h * np.array([-2.0, -1.0, 0.0, 1.0, 2.0])
    res = compute_potential(bg, L=L)
    conn = [b for b in res.branches if b.kind == "connected"]
    assert len(conn) == 3
    for b in conn:
        assert b.L.size == 5
        V = b.V
        d = (8 * (V[3] - V[1]) - (V[4] - V[0])) / (12 * h)
        assert d == pytest.approx(bg.g * _F(float(b.zstar[2])), rel=1e-8)
        # and the energy itself against quad at the branch's own turning point
        assert V[2] == pytest.approx(_L_E(float(b.zstar[2]))[1], rel=1e-9)
        assert _L_E(float(b.zstar[2]))[0] == pytest.approx(L0, rel=1e-9)


def test_minimum_energy_is_continuous_with_a_kink_at_an_independent_crossing(ridge):
    bg, res = ridge
    assert len(res.transitions) == 1
    L_c, err = res.transitions[0]
    assert err < 1e-8

    # independent crossing: on each stable branch solve L(z*) = L by brentq, equate energies
    zmax = optimize.minimize_scalar(lambda z: -_L_E(z)[0], bounds=(0.7, 1.0), method="bounded").x
    zmin = optimize.minimize_scalar(lambda z: _L_E(z)[0], bounds=(1.1, 1.5), method="bounded").x

    def energy(L, lo, hi):
        zs = optimize.brentq(lambda z: _L_E(z)[0] - L, lo, hi, xtol=1e-13)
        return _L_E(zs)[1]

    def gap(L):
        return energy(L, 0.3, zmax) - energy(L, zmin, 1.7)

    L_ref = optimize.brentq(gap, 2.05, 2.6, xtol=1e-12)
    assert L_c == pytest.approx(L_ref, rel=1e-8)

    # V is continuous at L_c and its slope jumps (first-order transition)
    eps = 1e-5
    r = compute_potential(bg, L=[L_c - 2 * eps, L_c - eps, L_c + eps, L_c + 2 * eps])
    V = r.V
    left, right = 2 * V[1] - V[0], 2 * V[2] - V[3]  # both extrapolated to L_c
    assert abs(left - right) < 1e-8
    slope_left, slope_right = (V[1] - V[0]) / eps, (V[3] - V[2]) / eps
    assert slope_left - slope_right > 0.1  # the large-z* string is the flatter one
    assert r.branch_of_minimum[1] != r.branch_of_minimum[2]
    # every grid point is marked on exactly one branch
    marks = sum(np.isin(res.L, b.L[b.minimum]) for b in res.branches)
    assert np.all(marks == 1)
