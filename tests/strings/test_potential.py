"""V(L) on the catalogue against published closed forms and independent mpmath references."""

import math

import numpy as np
import pytest

from holostring.background import load_background
from holostring.errors import ConvergenceError, InputError, NotApplicableError
from holostring.strings import compute_potential, string_profile
from tests.strings import reference as ref

CATALOGUE = [
    "ads",
    "ads-black-brane",
    "ads-soliton",
    "hard-wall",
    "hard-wall-black-brane",
    "soft-wall",
    "soft-wall-black-brane",
    "d4-soliton",
]


def test_ads_maldacena_potential_over_six_decades():
    value, tol, _source = ref.ADS_VL
    L = np.geomspace(1e-3, 1e3, 25)
    res = compute_potential(load_background("ads"), L=L)
    assert res.converged, res.message
    assert np.all(np.abs(res.V * L / value - 1) < tol)
    assert res.max_separation is None and res.screening_length is None
    assert res.string_tension is None


def test_ads_scales_with_g():
    value, tol, _ = ref.ADS_VL
    res = compute_potential(load_background("ads", g=2.5), L=[0.3, 3.0])
    assert np.allclose(res.V * res.L, 2.5 * value, rtol=tol, atol=0)


def test_soft_wall_large_L_slope_is_symbolic_sigma():
    sigma, tol, _ = ref.SOFT_WALL_SIGMA
    L = np.array([70.0, 75.0, 80.0])  # 50 and more times the confinement scale 1/sqrt(c)
    res = compute_potential(load_background("soft-wall", c=1.0), L=L)
    assert res.converged, res.message
    slope = np.diff(res.V) / np.diff(L)
    assert np.all(np.abs(slope - sigma) < tol)
    assert abs(res.string_tension - sigma) < tol
    assert abs(res.string_tension_limit - sigma) < 1e-14


def test_soft_wall_sigma_scales_with_c():
    # sigma = g e c / 2 (Andreev-Zakharov hep-ph/0604204)
    res = compute_potential(load_background("soft-wall", c=0.3, g=2.0), points=20)
    assert res.string_tension_limit == pytest.approx(2.0 * math.e * 0.3 / 2, rel=1e-13)


def _fd_slope(bg, L0, h):
    L = L0 + h * np.array([-2.0, -1.0, 1.0, 2.0])
    res = compute_potential(bg, L=np.concatenate([L, [L0]]))
    V = res.V
    d = (8 * (V[2] - V[1]) - (V[3] - V[0])) / (12 * h)
    return d, res.force[-1]


@pytest.mark.parametrize("name", CATALOGUE)
def test_force_identity_dE_dL_equals_gF_on_catalogue(name):
    # dE/dL = g F(z*) (Kinar-Schreiber-Sonnenschein hep-th/9811192; Sonnenschein hep-th/0003032)
    bg = load_background(name)
    res = compute_potential(bg, points=8)
    for L0 in res.L[1:-1:2]:
        if res.branch_of_minimum[list(res.L).index(L0)] < 0:
            continue
        d, f = _fd_slope(bg, float(L0), 1e-3 * float(L0))
        assert d == pytest.approx(f, rel=1e-8, abs=1e-9)


def test_soft_wall_identity_to_1e9():
    bg = load_background("soft-wall", c=1.0)
    for L0 in (0.3, 2.0, 10.0):
        d, f = _fd_slope(bg, L0, 1e-3 * L0)
        assert abs(d - f) < 1e-9 * max(1.0, f)


def test_hard_wall_continuity_and_unit_slope():
    L0, tol, _ = ref.HARD_WALL_L0
    bg = load_background("hard-wall", z0=1.0)
    res = compute_potential(bg, L=[0.5, 1.0, 2.0, 5.0, 20.0])
    wall = next(b for b in res.branches if b.kind == "wall")
    assert wall.L_range[0] == pytest.approx(L0, rel=tol)
    eps = 1e-6
    res2 = compute_potential(bg, L=[L0 - 2 * eps, L0 - eps, L0 + eps, L0 + 2 * eps])
    V = res2.V
    left, right = 2 * V[1] - V[0], 2 * V[2] - V[3]  # both extrapolated to L0
    assert abs(left - right) < 1e-9
    # the slope on the connected side tends to g F(z0) = 1: it differs by O(L0 - L)
    assert (V[1] - V[0]) / eps == pytest.approx(0.5 * (res2.force[0] + res2.force[1]), abs=1e-8)
    assert abs(res2.force[1] - 1.0) < 1e-5
    assert (V[3] - V[2]) / eps == pytest.approx(1.0, abs=1e-8)
    assert res2.force[2] == 1.0
    slope = np.diff(res.V[2:]) / np.diff(res.L[2:])
    assert np.allclose(slope, 1.0, rtol=0, atol=1e-12)
    assert res.string_tension == 1.0


def test_ads_black_brane_lmax_and_screening():
    Lmax, Ls = ref.ads_black_brane_reference()
    res = compute_potential(load_background("ads-black-brane", zh=1.0))
    assert res.converged, res.message
    assert abs(res.max_separation - Lmax) < 1e-6 * Lmax
    assert abs(res.screening_length - Ls) < 1e-6 * Ls
    assert abs(res.max_separation - ref.ADS_BB_LMAX_PUBLISHED[0]) < ref.ADS_BB_LMAX_PUBLISHED[1]
    assert abs(res.screening_length - ref.ADS_BB_SCREENING_PUBLISHED[0]) < 1e-3
    kinds = sorted((b.kind, b.stable) for b in res.branches)
    assert kinds == [("connected", False), ("connected", True), ("disconnected", True)]
    # beyond the screening length the disconnected pair is the minimum
    far = res.L > res.screening_length
    assert np.allclose(res.V[far], -2.0, atol=1e-12)


@pytest.mark.parametrize("zh", [0.5, 2.0])
def test_black_brane_scales_with_temperature(zh):
    Lmax, Ls = ref.ads_black_brane_reference()
    res = compute_potential(load_background("ads-black-brane", zh=zh), points=10)
    assert res.max_separation == pytest.approx(Lmax * zh, rel=1e-8)
    assert res.screening_length == pytest.approx(Ls * zh, rel=1e-8)


def test_hard_wall_black_brane_is_the_black_brane():
    Lmax, Ls = ref.ads_black_brane_reference()
    res = compute_potential(load_background("hard-wall-black-brane", zh=0.5, z0=1.0), points=10)
    assert res.max_separation == pytest.approx(0.5 * Lmax, rel=1e-8)
    assert res.screening_length == pytest.approx(0.5 * Ls, rel=1e-8)


def test_schemes_differ_by_straight_pair_constant():
    bg = load_background("ads-black-brane", zh=1.0)
    L = [0.2, 0.5, 0.8]
    uv = compute_potential(bg, L=L, scheme="uv-pole")
    ss = compute_potential(bg, L=L, scheme="straight-strings")
    # straight strings to the horizon in AdS: 2 g (int (H - 1/z^2) - 1/z_h) = -2 g / z_h
    assert np.allclose(ss.V - uv.V, 2.0, rtol=0, atol=1e-11)
    assert ss.scheme == "straight-strings" and uv.scheme == "uv-pole"
    assert ss.screening_length == pytest.approx(uv.screening_length, rel=1e-12)


def test_straight_strings_scheme_not_applicable_on_soft_wall():
    with pytest.raises(NotApplicableError):
        compute_potential(load_background("soft-wall"), scheme="straight-strings", points=5)


def test_straight_strings_on_pure_ads_equals_uv_pole():
    bg = load_background("ads")
    a = compute_potential(bg, L=[1.0], scheme="uv-pole")
    b = compute_potential(bg, L=[1.0], scheme="straight-strings")
    assert b.V[0] == pytest.approx(a.V[0], abs=1e-12)


def test_sommer_scale_satisfies_its_definition():
    c0, _c1, _ = ref.SOMMER
    bg = load_background("soft-wall", c=1.0)
    res = compute_potential(bg, points=10)
    d, _f = _fd_slope(bg, res.r0, 1e-3)
    assert res.r0**2 * d == pytest.approx(c0, rel=1e-8)
    # r^2 F starts at g kappa = 8 pi^3/Gamma(1/4)^4 = 1.4355 > 1: r1 does not exist
    assert res.r1 is None and "no solution" in res.notes["r1"]


def test_cornell_fit_recovers_coulomb_and_tension():
    res = compute_potential(load_background("soft-wall", c=1.0), L_range=(0.05, 0.3), points=60)
    fit = res.cornell
    assert fit.L_range == (0.05, 0.3)
    # at small L the Coulomb coefficient approaches -V L of AdS (Maldacena hep-th/9803002)
    assert fit.kappa == pytest.approx(-ref.ADS_VL[0], rel=1e-2)
    assert fit.covariance.shape == (3, 3)


def test_unconverged_is_never_silent():
    bg = load_background("soft-wall")
    res = compute_potential(bg, points=5, tol=1e-15)
    assert not res.converged and "error estimate" in res.message
    with pytest.raises(ConvergenceError) as info:
        compute_potential(bg, points=5, tol=1e-15, strict=True)
    assert info.value.partial is not None


@pytest.mark.parametrize(
    "kwargs",
    [
        {"L_range": (2.0, 1.0)},
        {"L_range": (0.0, 1.0)},
        {"points": 1},
        {"L": [1.0, -2.0]},
        {"scheme": "nope"},
        {"tol": 0.0},
    ],
)
def test_bad_input_names_the_field(kwargs):
    with pytest.raises(InputError):
        compute_potential(load_background("ads"), **kwargs)


def test_profile_reaches_half_separation_and_turning_point():
    bg = load_background("soft-wall")
    prof = string_profile(bg, 3.0)
    p = prof.minimum
    assert p.x.max() == pytest.approx(1.5, rel=1e-12)
    assert p.z.max() == pytest.approx(p.zstar, rel=1e-12)
    res = compute_potential(bg, L=[3.0])
    assert p.V == pytest.approx(res.V[0], rel=1e-14)


def test_result_is_frozen_and_serialisable():
    import dataclasses
    import json

    from holostring.report.serialize import to_jsonable

    res = compute_potential(load_background("ads-black-brane"), points=10)
    with pytest.raises(dataclasses.FrozenInstanceError):
        res.scheme = "x"
    d = to_jsonable(res.to_dict())
    json.dumps(d)
    for key in (
        "L",
        "V",
        "string_tension",
        "coulomb_coefficient",
        "r0",
        "scheme",
        "error_estimate",
        "screening_length",
        "max_separation",
    ):
        assert key in d


def test_cornell_kappa_flagged_when_not_asymptotically_ads():
    # the D4 soliton's warp grows like z^(-3/2) at the boundary, not z^-2 (Witten hep-th/9803131;
    # common practice): there is no -kappa/L Coulomb law to fit
    from holostring.background.diagnostics import diagnose

    bg = load_background("d4-soliton")
    assert diagnose(bg).asymptotically_ads is False
    res = compute_potential(bg, points=20)
    assert "not meaningful" in res.notes["coulomb_coefficient"]
    assert "kappa" in res.message and res.converged
    ads = compute_potential(load_background("soft-wall"), points=20)
    assert "coulomb_coefficient" not in ads.notes
