"""Hawking-Page transition against published values and independent closed forms."""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
import sympy as sp
from scipy.special import jn_zeros

from holostring.background import load_background
from holostring.background.formula import Z
from holostring.errors import NotApplicableError
from holostring.thermo import compute_transition, thermal_family
from holostring.thermo.action import bulk_density, ricci_scalar
from tests.thermo import reference as ref


@pytest.mark.parametrize("z0", [0.5, 1.0, 3.7])
def test_hard_wall_critical_temperature(z0):
    value, tol, _source = ref.HARD_WALL_TC_Z0
    res = compute_transition(load_background("hard-wall", z0=z0))
    assert res.converged
    assert res.critical_temperature * z0 == pytest.approx(value, rel=tol)
    assert res.critical_temperature_error < 1e-12
    assert res.on_shell


def test_hard_wall_black_brane_entry_gives_same_tc():
    a = compute_transition(load_background("hard-wall", z0=1.3)).critical_temperature
    b = compute_transition(load_background("hard-wall-black-brane", z0=1.3)).critical_temperature
    assert a == pytest.approx(b, rel=1e-13)


def test_hard_wall_free_energy_curve_closed_form():
    # Herzog hep-th/0608151: 2 kappa^2 Delta F / L^3 = 2/z0^4 - pi^4 T^4 for z_h < z0
    z0 = 1.0
    res = compute_transition(load_background("hard-wall", z0=z0))
    T = res.temperatures
    inside = res.horizons < z0
    exact = 2 / z0**4 - math.pi**4 * T**4
    np.testing.assert_allclose(res.free_energy_difference[inside], exact[inside], rtol=1e-11, atol=1e-11)


@pytest.mark.parametrize("c", [0.15015625, 1.0, 4.0])
def test_soft_wall_critical_temperature(c):
    res = compute_transition(load_background("soft-wall", c=c))
    assert res.converged and res.on_shell
    tc = res.critical_temperature / math.sqrt(c)
    exact = ref.soft_wall_tc_over_sqrt_c()
    assert tc == pytest.approx(exact, rel=ref.SOFT_WALL_TC_CLOSED_FORM[1])
    published, tol, _ = ref.SOFT_WALL_TC_PUBLISHED
    assert abs(tc - published) <= tol
    assert res.critical_temperature_error < 1e-10 * res.critical_temperature


def test_soft_wall_free_energy_curve_incomplete_gamma():
    c = 1.0
    res = compute_transition(load_background("soft-wall", c=c), points=9)
    mpmath.mp.dps = 30
    for zh, val in zip(res.horizons, res.free_energy_difference, strict=True):
        exact = 1 / zh**4 - 4 * c**2 * float(mpmath.gammainc(-2, c * zh**2))
        assert val == pytest.approx(exact, rel=1e-11, abs=1e-11)


def test_ads_has_no_transition_and_conformal_free_energy():
    res = compute_transition(load_background("ads"))
    assert res.critical_temperature is None
    assert "black brane dominates" in res.message
    coeff, tol, _ = ref.ADS_FREE_ENERGY_COEFF
    np.testing.assert_allclose(res.free_energy_difference / res.temperatures**4, coeff, rtol=tol)


def test_physical_units_soft_and_hard_wall():
    m_rho = ref.M_RHO_GEV
    soft = load_background("soft-wall", c=m_rho**2 / 4).with_units("GeV")
    res = compute_transition(soft)
    value, tol, _ = ref.SOFT_WALL_TC_MEV
    assert abs(res.critical_temperature_gev * 1e3 - value) <= tol
    z0 = jn_zeros(0, 1)[0] / m_rho
    hard = load_background("hard-wall", z0=z0).with_units("GeV")
    value, tol, _ = ref.HARD_WALL_TC_MEV
    assert abs(compute_transition(hard).critical_temperature_gev * 1e3 - value) <= tol
    assert compute_transition(load_background("hard-wall")).critical_temperature_gev is None


def _write(tmp_path, name, text):
    p = tmp_path / f"{name}.toml"
    p.write_text(text)
    return str(p)


USER_DILATON = """
[background]
name = "quartic-dilaton"
frame = "einstein"
[parameters.c]
default = 1.0
range = "(0, inf)"
dimension = 2
[parameters.d]
default = 0.0
range = "[0, inf)"
dimension = 4
[metric]
warp = "1/z^2"
dilaton = "c*z^2 + d*z^4"
[ir]
kind = "infinity"
"""


def _tc_by_mpmath(phi):
    """Independent reference: root of 1/zh^4 - 8 int_zh^inf e^-Phi z^-5 dz with mpmath."""
    mpmath.mp.dps = 25

    def dF(zh):
        return 1 / zh**4 - 8 * mpmath.quad(lambda z: mpmath.exp(-phi(z)) / z**5, [zh, mpmath.inf])

    zh = mpmath.findroot(dF, (0.5, 1.0), solver="anderson", tol=1e-30, verify=False)
    assert abs(dF(zh)) < 1e-18
    return float(1 / (mpmath.pi * zh))


def test_user_dilaton_reduces_to_soft_wall_and_matches_independent_quadrature(tmp_path):
    path = _write(tmp_path, "quartic", USER_DILATON)
    soft = compute_transition(load_background("soft-wall", c=1.0)).critical_temperature
    user0 = compute_transition(load_background(path, c=1.0, d=0.0)).critical_temperature
    assert user0 == pytest.approx(soft, rel=1e-12)
    res = compute_transition(load_background(path, c=1.0, d=0.3))
    assert res.on_shell
    expected = _tc_by_mpmath(lambda z: z**2 + 0.3 * z**4)
    assert res.critical_temperature == pytest.approx(expected, rel=1e-9)


USER_BLACKENING = """
[background]
name = "own-f"
frame = "einstein"
[parameters.c]
default = 1.0
range = "(0, inf)"
dimension = 2
[parameters.zh]
default = 1.0
range = "(0, inf)"
dimension = -1
[metric]
warp = "1/z^2"
blackening = "1 - (z/zh)^4"
dilaton = "c*z^2"
[ir]
kind = "horizon"
at = "zh"
"""


def test_user_blackening_file(tmp_path):
    path = _write(tmp_path, "ownf", USER_BLACKENING)
    fam = thermal_family(load_background(path, c=2.0))
    assert "user blackening" in fam.construction
    assert math.isinf(fam.wall)
    res = compute_transition(fam)
    assert res.critical_temperature == pytest.approx(
        ref.soft_wall_tc_over_sqrt_c() * math.sqrt(2.0), rel=1e-10
    )


def test_diverging_blackening_is_refused(tmp_path):
    text = USER_BLACKENING.replace('"1 - (z/zh)^4"', '"1 - (z/zh)^2"').replace(
        'kind = "horizon"\nat = "zh"', 'kind = "horizon"\nat = "zh"'
    )
    path = _write(tmp_path, "badf", text)
    with pytest.raises(NotApplicableError, match="diverges"):
        compute_transition(load_background(path))


def test_solitons_are_refused():
    with pytest.raises(NotApplicableError, match="soliton"):
        compute_transition(load_background("ads-soliton"))


@pytest.mark.slow
def test_infinite_thermal_action_is_refused(tmp_path):
    # a string-frame warp exp(s z^2/2)/(z^2 sqrt(1 + k z^2)) with no dilaton is not AdS5 in the
    # Einstein frame and grows in the IR: the off-shell action density e^-Phi sqrt(g)(R + 12)
    # grows too, so no finite comparison exists
    path = tmp_path / "growing.toml"
    path.write_text(
        '[background]\nname = "growing"\n[parameters.s]\ndefault = 1.0\nrange = "(0, inf)"\n'
        '[parameters.k]\ndefault = 0.5\nrange = "[0, inf)"\n'
        '[metric]\nA = "s*z^2/4 - log(1 + k*z^2)/4"\n'
    )
    with pytest.raises(NotApplicableError, match="does not converge"):
        compute_transition(load_background(str(path)))


def test_temperature_from_horizon_regularity():
    # AdS5 black brane T = 1/(pi z_h) (Witten hep-th/9803131)
    fam = thermal_family(load_background("soft-wall", c=0.7))
    zh = np.array([0.2, 1.0, 3.0])
    np.testing.assert_allclose(fam.temperature(zh), 1 / (np.pi * zh), rtol=1e-14)
    assert fam.horizon_for(0.4) == pytest.approx(1 / (0.4 * np.pi), rel=1e-14)


def test_ricci_scalar_known_cases():
    zh = sp.Symbol("zh", positive=True)
    f = 1 - Z**4 / zh**4
    R = sp.simplify(ricci_scalar([f / Z**2, 1 / Z**2, 1 / Z**2, 1 / Z**2], 1 / (Z**2 * f)))
    assert R == ref.ADS5_RICCI[0]
    # unit 2-sphere dz^2 + sin^2 z dx^2 as the 'z' and one direction (others flat, constant)
    R2 = sp.simplify(ricci_scalar([sp.sin(Z) ** 2, 1, 1, 1], sp.Integer(1)))
    assert R2 == ref.SPHERE_RICCI[0]
    assert sp.simplify(bulk_density(f / Z**2, 1 / Z**2, 1 / (Z**2 * f), sp.Integer(0)) + 8 / Z**5) == 0


def test_generic_partner_matches_catalogue_partner(tmp_path):
    # the black brane built by adding f to a user copy of the hard wall equals the catalogue entry
    text = """
[background]
name = "my-wall"
[parameters.z0]
default = 1.0
range = "(0, inf)"
dimension = -1
[metric]
warp = "1/z^2"
[ir]
kind = "wall"
at = "z0"
"""
    fam = thermal_family(load_background(_write(tmp_path, "mywall", text), z0=1.4))
    assert "added" in fam.construction
    ref_bb = load_background("hard-wall-black-brane", z0=1.4, zh=0.6)
    bb = fam.at(0.6)
    z = np.linspace(0.05, 0.59, 7)
    for name in ("G_tt", "G_xx", "G_zz", "F", "H"):
        np.testing.assert_allclose(bb.function(name)(z), ref_bb.function(name)(z), rtol=1e-14)
    res = compute_transition(fam)
    assert res.critical_temperature * 1.4 == pytest.approx(ref.HARD_WALL_TC_Z0[0], rel=1e-10)


def test_user_blackening_not_ads_temperature_and_inversion(tmp_path):
    # f = (1 - (z/zh)^4)(1 + a z^4): T = |f'(zh)|/(4 pi) = (1 + a zh^4)/(pi zh) (horizon regularity)
    text = USER_BLACKENING.replace('"1 - (z/zh)^4"', '"(1 - (z/zh)^4)*(1 + a*z^4)"').replace(
        "[metric]", '[parameters.a]\ndefault = 0.2\nrange = "[0, 1]"\n\n[metric]'
    )
    fam = thermal_family(load_background(_write(tmp_path, "fa", text)))
    assert not fam.is_ads_factor
    zh = np.array([0.3, 0.8, 1.2])
    np.testing.assert_allclose(fam.temperature(zh), (1 + 0.2 * zh**4) / (np.pi * zh), rtol=1e-13)
    T = float(fam.temperature(0.8))
    assert fam.horizon_for(T) == pytest.approx(0.8, rel=1e-12)
    res = compute_transition(fam)
    assert res.critical_temperature is not None and res.on_shell is False


def test_results_are_frozen_and_plain():
    import dataclasses
    import json

    from holostring.report.serialize import to_jsonable

    res = compute_transition(load_background("hard-wall"), points=5)
    with pytest.raises(dataclasses.FrozenInstanceError):
        res.critical_temperature = 1.0  # type: ignore[misc]
    d = json.loads(json.dumps(to_jsonable(res.to_dict())))
    assert d["critical_temperature"] == res.critical_temperature
    assert d["provenance"]["background"] == "hard-wall"
