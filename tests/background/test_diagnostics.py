"""Confinement criterion, sigma, kappa and the small-L slope against outside references."""

import math

import mpmath as mp
import numpy as np
import pytest
from scipy.optimize import minimize_scalar

from holostring.background import load_background
from holostring.background.diagnostics import diagnose
from tests.background.reference import (
    HARD_WALL_SIGMA_Z01,
    KAPPA_ADS,
    SOFT_WALL_SIGMA_C1,
    d4_sigma,
)


def test_soft_wall_sigma_closed_form():
    value, tol, _source = SOFT_WALL_SIGMA_C1
    d = diagnose(load_background("soft-wall", c=1.0))
    assert d.confining
    assert d.string_tension == pytest.approx(value, rel=tol)
    assert d.string_tension_exact == "E*c*g/2"
    assert d.confinement_point == pytest.approx(math.sqrt(2.0), rel=1e-14)


@pytest.mark.parametrize(("c", "g"), [(0.3, 1.0), (1.0, 2.5), (4.0, 0.7)])
def test_symbolic_sigma_against_numeric_minimisation(c, g):
    # independent check: scipy minimisation of F = exp(c z^2/2)/z^2
    bg = load_background("soft-wall", c=c, g=g)
    res = minimize_scalar(
        lambda z: math.exp(c * z * z / 2) / z**2,
        bounds=(0.01, 20),
        method="bounded",
        options={"xatol": 1e-12},
    )
    assert diagnose(bg).string_tension == pytest.approx(g * res.fun, rel=1e-10)


def test_numeric_minimum_on_a_user_throat(tmp_path):
    # no closed form expected: the certified numeric minimum is checked against scipy
    p = tmp_path / "t.toml"
    p.write_text('[background]\nname = "t"\n[metric]\nwarp = "exp(z^2/2 + 0.1*sin(3*z))/z^2"\n')
    d = diagnose(load_background(str(p)))
    res = minimize_scalar(
        lambda z: math.exp(z * z / 2 + 0.1 * math.sin(3 * z)) / z**2,
        bounds=(0.5, 3),
        method="bounded",
        options={"xatol": 1e-12},
    )
    assert d.confining
    assert d.string_tension == pytest.approx(res.fun, rel=1e-10)
    assert d.string_tension_error < 1e-12


def test_hard_wall_sigma():
    value, tol, _ = HARD_WALL_SIGMA_Z01
    d = diagnose(load_background("hard-wall", z0=1.0))
    assert d.confining and d.string_tension == pytest.approx(value, rel=tol)
    assert diagnose(load_background("hard-wall", z0=2.0, g=3.0)).string_tension == pytest.approx(0.75)


def test_ads_coulomb_coefficient_against_mpmath():
    value, tol, _ = KAPPA_ADS
    d = diagnose(load_background("ads"))
    assert not d.confining and d.string_tension is None
    assert d.coulomb_coefficient == pytest.approx(value, rel=tol)
    assert diagnose(load_background("ads", g=2.0)).coulomb_coefficient == pytest.approx(2 * value, rel=tol)


def test_soliton_and_d4_confine_at_the_cap():
    assert diagnose(load_background("ads-soliton", z0=2.0)).string_tension == pytest.approx(0.25)
    d = diagnose(load_background("d4-soliton", z0=0.5))
    assert d.confining and d.string_tension == pytest.approx(d4_sigma(0.5), rel=1e-12)


def test_black_brane_screens():
    d = diagnose(load_background("ads-black-brane"))
    assert not d.confining
    assert "horizon" in d.criterion


def test_small_l_slope_constants_against_quadrature():
    # The closed forms used for b are checked by direct mpmath quadrature of the integrals
    # I0 = int u^2/sqrt(1-u^4), I1 = int u^2/((1+u^2) sqrt(1-u^4)), I2 = int u^4/sqrt(1-u^4) on [0,1].
    mp.mp.dps = 30
    I0 = mp.quad(lambda u: u**2 / mp.sqrt(1 - u**4), [0, 1])
    I1 = mp.quad(lambda u: u**2 / ((1 + u**2) * mp.sqrt(1 - u**4)), [0, 1])
    I2 = mp.quad(lambda u: u**4 / mp.sqrt(1 - u**4), [0, 1])
    g4 = mp.gamma(mp.mpf(1) / 4) ** 4
    assert float(I0) == pytest.approx(float(mp.sqrt(2) * mp.pi**1.5 / mp.gamma(0.25) ** 2), rel=1e-14)
    assert float(1 + 2 * I1 / I0) == pytest.approx(float(g4 / (8 * mp.pi**2)), rel=1e-14)
    assert float(I2 / I0) == pytest.approx(float(g4 / (24 * mp.pi**2)), rel=1e-14)


def test_small_l_slope_values():
    # soft wall: a = c/2 in w = z^-2 (1 + a z^2 + ...), so b = g c Gamma(1/4)^4 / (16 pi^2)
    d = diagnose(load_background("soft-wall", c=0.8, g=1.5))
    expected = 1.5 * 0.8 * float(mp.gamma(0.25) ** 4 / (16 * mp.pi**2))
    assert d.expansion_slope == pytest.approx(expected, rel=1e-13)
    assert diagnose(load_background("hard-wall")).expansion_slope == 0.0


def test_small_l_slope_against_a_direct_l_expansion():
    # Independent check of b for a warp with a_F = a_H = a: L(z*) and E(z*) by mpmath quadrature
    # at small z*, V + kappa/L - C fitted to b L. Uses the soft wall with c = 1 (a = 1/2).
    mp.mp.dps = 25
    c = mp.mpf(1)

    def F(z):
        return mp.exp(c * z * z / 2) / z**2

    def L_and_E(zs):
        Fs = F(zs)
        L = 2 * mp.quad(lambda t: 2 * t * zs * Fs / mp.sqrt(abs(F(zs * (1 - t * t)) ** 2 - Fs**2)), [0, 1])
        # UV-pole subtraction: E = 2 int (F^2/sqrt(F^2-F*^2) - 1/z^2) dz - 2/z*
        E = (
            2
            * mp.quad(
                lambda t: (
                    2
                    * t
                    * zs
                    * (
                        F(zs * (1 - t * t)) ** 2 / mp.sqrt(abs(F(zs * (1 - t * t)) ** 2 - Fs**2))
                        - 1 / (zs * (1 - t * t)) ** 2
                    )
                ),
                [0, 1],
            )
            - 2 / zs
        )
        return L, E

    kappa = 8 * mp.pi**3 / mp.gamma(0.25) ** 4
    pts = [L_and_E(mp.mpf(z)) for z in (0.02, 0.04)]
    # V + kappa/L = C + b L + O(L^3): two points give b up to O(L^2)
    (L1, E1), (L2, E2) = pts
    b = ((E2 + kappa / L2) - (E1 + kappa / L1)) / (L2 - L1)
    d = diagnose(load_background("soft-wall", c=1.0))
    assert d.expansion_slope == pytest.approx(float(b), rel=2e-3)


def test_diagnostics_json_keys():
    data = diagnose(load_background("soft-wall")).to_dict()
    for key in ("confining", "string_tension", "coulomb_coefficient", "asymptotically_ads"):
        assert key in data
    assert np.isfinite(data["string_tension"])
