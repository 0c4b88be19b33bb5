"""Screening versus temperature against the static-string solver and independent references."""

from __future__ import annotations

import math

import numpy as np
import pytest

from holostring.background import load_background
from holostring.strings import compute_potential
from holostring.thermo import compute_screening, compute_transition, thermal_family
from tests.thermo import reference as ref


@pytest.fixture(scope="module")
def ads_screening():
    return compute_screening(load_background("ads"), temperatures=[0.15, 0.31830988618379067, 0.9])


@pytest.fixture(scope="module")
def ads_reference():
    return ref.ads_black_brane_screening()


def test_ads_black_brane_equals_string_solver_at_every_T(ads_screening):
    res = ads_screening
    assert res.converged
    for T, lm, ls in zip(res.temperatures, res.max_separation, res.screening_length, strict=True):
        pot = compute_potential(load_background("ads-black-brane", zh=1 / (math.pi * T)))
        assert lm == pot.max_separation
        assert ls == pot.screening_length


def test_ads_black_brane_scales_as_one_over_T(ads_screening, ads_reference):
    res = ads_screening
    lt_max = res.max_separation * res.temperatures * math.pi
    lt_scr = res.screening_length * res.temperatures * math.pi
    assert np.ptp(lt_max) < 1e-9 and np.ptp(lt_scr) < 1e-9
    lmax_ref, ls_ref = ads_reference
    np.testing.assert_allclose(lt_max, lmax_ref, rtol=1e-9)
    np.testing.assert_allclose(lt_scr, ls_ref, rtol=1e-9)
    (pub_max, pub_s), tol, _ = ref.ADS_BB_PUBLISHED
    assert abs(lt_max[0] - pub_max) < tol and abs(lt_scr[0] - pub_s) < tol
    assert res.string_tension_below is None  # AdS does not confine
    assert res.critical_temperature is None


def test_ads_spatial_string_tension(ads_screening):
    # spatial Wilson loop along the horizon: sigma_s = g G_xx(z_h) = g pi^2 T^2 (common practice)
    res = ads_screening
    np.testing.assert_allclose(res.spatial_string_tension, math.pi**2 * res.temperatures**2, rtol=1e-13)


def test_hard_wall_above_tc_is_the_ads_black_brane():
    # for z_h < z0 the wall hides behind the horizon: L T is the AdS5 value at every T > T_c
    res = compute_screening(load_background("hard-wall", z0=1.0), points=3)
    value, tol, _ = ref.HARD_WALL_TC_Z0
    assert res.temperatures[0] == pytest.approx(value, rel=tol)
    lt = res.max_separation * res.temperatures * math.pi
    assert np.ptp(lt) < 1e-9
    # zero-temperature tension g/z0^2 (hard wall, Polchinski-Strassler hep-th/0109174) below T_c
    assert res.string_tension_below == pytest.approx(1.0, rel=1e-10)


def test_soft_wall_screening_matches_solver_and_tension_below_tc():
    bg = load_background("soft-wall", c=1.0)
    tr = compute_transition(bg)
    res = compute_screening(bg, transition=tr, temperatures=[tr.critical_temperature, 2.0])
    assert res.converged
    fam = thermal_family(bg)
    for T, lm, ls in zip(res.temperatures, res.max_separation, res.screening_length, strict=True):
        pot = compute_potential(load_background("soft-wall-black-brane", c=1.0, zh=fam.horizon_for(T)))
        assert lm == pytest.approx(pot.max_separation, rel=1e-12)
        assert ls == pytest.approx(pot.screening_length, rel=1e-12)
    # the soft wall's dilaton lengthens strings: L_max pi T above the conformal value, falling to it
    lt = res.max_separation * res.temperatures * math.pi
    lmax_ads = ref.ads_black_brane_screening()[0]
    assert lt[0] > lt[1] > lmax_ads
    # sigma = g e c / 2 (Andreev-Zakharov hep-ph/0604204), T-independent below T_c
    assert res.string_tension_below == pytest.approx(math.e / 2, rel=1e-8)
    # spatial tension in the string frame: g e^{c zh^2/2} / zh^2
    zh = res.horizons
    np.testing.assert_allclose(res.spatial_string_tension, np.exp(zh**2 / 2) / zh**2, rtol=1e-13)


def test_screening_bad_input():
    from holostring.errors import InputError

    with pytest.raises(InputError, match="temperatures"):
        compute_screening(load_background("ads"), temperatures=[-1.0])
    with pytest.raises(InputError, match="t_range"):
        compute_screening(load_background("ads"), t_range=(2.0, 1.0))
