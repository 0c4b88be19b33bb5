"""Spectra against published values and exact solutions (sources in reference.py)."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from holostring.background import load_background
from holostring.errors import ConvergenceError, InputError, NotApplicableError
from holostring.spectra import (
    Channel,
    fit_regge,
    mass_ratios,
    mass_squared_gradient,
    solve_spectrum,
)
from tests.spectra import reference as ref


def rel(a, b):
    return np.abs(np.asarray(a) / np.asarray(b) - 1.0)


@pytest.fixture(scope="module")
def hard_wall():
    return load_background("hard-wall", z0=1.0)


@pytest.fixture(scope="module")
def soft_wall():
    return load_background("soft-wall", c=1.0)


@pytest.fixture(scope="module")
def soliton():
    return load_background("ads-soliton", z0=1.0)


# ----------------------------------------------------------------------------- hard wall
@pytest.mark.parametrize(
    ("channel", "boundary", "rows"),
    [
        ("scalar-glueball", "dirichlet", ref.HARD_WALL_DIRICHLET),
        ("scalar-glueball", "neumann", ref.HARD_WALL_NEUMANN),
        ("vector-meson", "dirichlet", ref.HARD_WALL_VECTOR_DIRICHLET),
        ("vector-meson", "neumann", ref.HARD_WALL_VECTOR_NEUMANN),
    ],
)
def test_hard_wall_bessel_zeros(hard_wall, channel, boundary, rows):
    r = solve_spectrum(hard_wall, channel, states=20, boundary=boundary)
    assert r.converged, r.message
    assert r.boundary == boundary
    assert boundary.capitalize() in r.boundaries["statement"]
    tol = max(row[1] for row in rows)
    assert rel(r.masses, ref.values(rows)).max() < tol
    # the estimate is honest: it bounds the true error
    assert np.all(
        np.abs(r.masses_squared - ref.values(rows) ** 2) <= r.error_estimate + 1e-12 * ref.values(rows) ** 2
    )


def test_hard_wall_default_is_dirichlet_and_scales_with_z0():
    bg = load_background("hard-wall", z0=2.0)
    r = solve_spectrum(bg, states=5)
    assert r.boundary == "dirichlet"
    # m_n z0 = j_{2,n}: exact scaling of the problem (common practice)
    assert rel(r.masses * 2.0, ref.values(ref.HARD_WALL_DIRICHLET)[:5]).max() < 1e-10


# ----------------------------------------------------------------------------- soft wall
@pytest.mark.parametrize(
    ("channel", "rows"),
    [("scalar-glueball", ref.SOFT_WALL_SCALAR), ("vector-meson", ref.SOFT_WALL_VECTOR)],
)
def test_soft_wall_linear_towers(soft_wall, channel, rows):
    r = solve_spectrum(soft_wall, channel, states=20)
    assert r.converged, r.message
    assert r.boundary == "decaying"
    assert rel(r.masses_squared, ref.values(rows)).max() < 1e-10


def test_soft_wall_scales_with_c():
    r = solve_spectrum(load_background("soft-wall", c=0.37), "vector-meson", states=8)
    assert rel(r.masses_squared, 0.37 * ref.values(ref.SOFT_WALL_VECTOR)[:8]).max() < 1e-10


def test_tensor_channel_is_the_documented_massless_scalar(soft_wall):
    t = solve_spectrum(soft_wall, "tensor-glueball", states=6)
    s = solve_spectrum(soft_wall, "scalar-glueball", states=6)
    assert t.channel_info["spin"] == 2 and t.channel_info["dilaton_coupling"] == 1.0
    np.testing.assert_allclose(t.masses_squared, s.masses_squared, rtol=1e-12)
    ratio, err = mass_ratios(t, s)
    np.testing.assert_allclose(ratio, s.masses / s.masses[0], rtol=1e-12)
    assert np.all(err < 1e-9)


def test_regge_slope_exact_within_error(soft_wall):
    for channel in ("scalar-glueball", "vector-meson"):
        fit = fit_regge(solve_spectrum(soft_wall, channel, states=20))
        slope, source = ref.REGGE_SLOPE
        assert abs(fit.slope - slope) <= max(3 * fit.slope_error, 1e-13), source
        assert fit.slope_error < 1e-9
        assert fit.covariance.shape == (2, 2)


def test_regge_fit_of_a_curved_spectrum_widens_its_errors(hard_wall):
    fit = fit_regge(solve_spectrum(hard_wall, states=10))
    assert fit.scaled  # m_n^2 ~ n^2 is not linear: covariance scaled by chi2/dof
    assert fit.slope_error > 1.0


def test_soft_wall_potential_and_ground_state(soft_wall):
    r = solve_spectrum(soft_wall, states=3)
    z = r.z
    # U = 15/(4 z^2) + c^2 z^2 + 2c (hep-ph/0703316, c = 1)
    np.testing.assert_allclose(r.potential, 15 / (4 * z**2) + z**2 + 2, rtol=1e-12)
    np.testing.assert_allclose(r.xi, z, rtol=1e-12)
    # psi_0 = N z^{5/2} exp(-z^2/2) (exact ground state of that potential)
    exact = z**2.5 * np.exp(-(z**2) / 2)
    exact /= np.sqrt(np.trapezoid(exact**2, z))
    np.testing.assert_allclose(r.modes[0], exact, atol=1e-6)
    # orthonormal in xi
    gram = np.trapezoid(r.modes[:, None, :] * r.modes[None, :, :], r.xi, axis=-1)
    np.testing.assert_allclose(gram, np.eye(3), atol=1e-5)


def test_user_channel_from_a_file(tmp_path):
    text = (
        '[background]\nname = "sw-massive"\nframe = "einstein"\n'
        '[parameters.c]\ndefault = 1.0\nrange = "(0, inf)"\n'
        '[metric]\nwarp = "1/z^2"\ndilaton = "c*z^2"\n[ir]\nkind = "infinity"\n'
        '[[fields]]\nname = "dim3-scalar"\nspin = 0\nmass_squared = -3.0\n'
    )
    path = tmp_path / "sw.toml"
    path.write_text(text)
    bg = load_background(str(path))
    r = solve_spectrum(bg, "dim3-scalar", states=10)
    # Delta = 3; radial oscillator -psi'' + (c^2 z^2 + (nu^2 - 1/4)/z^2 + 2c) psi, nu = Delta - 2:
    # m_n^2 = 4c(n + Delta/2) (exact, common practice; Delta = 4 gives hep-ph/0703316)
    assert abs(r.delta - 3.0) < 1e-12
    assert rel(r.masses_squared, 4.0 * (np.arange(10) + 1.5)).max() < 1e-10


def test_channel_object_accepted(soft_wall):
    ch = Channel("proca", 1, mass_squared=0.0, dilaton_coupling=1.0)
    r = solve_spectrum(soft_wall, ch, states=3)
    assert rel(r.masses_squared, [4.0, 8.0, 12.0]).max() < 1e-10


# ----------------------------------------------------------------------------- soliton
def test_ads_soliton_published_table(soliton):
    r = solve_spectrum(soliton, states=20)
    assert r.converged, r.message
    assert r.boundary == "regular"
    for n, (value, tol, source) in enumerate(ref.COOT_QCD3):
        assert abs(r.masses_squared[n] - value) <= tol, source
    for n, (value, tol, source) in enumerate(ref.ZYSKIN_QCD3):
        if value is not None:
            assert abs(r.masses_squared[n] - value) <= tol, source


# ----------------------------------------------------------------------------- gradients
def test_gradient_soft_wall(soft_wall):
    for n in (0, 4):
        g = mass_squared_gradient(soft_wall, "scalar-glueball", n)
        assert abs(g["c"] - 4 * (n + 2)) < 1e-8  # d/dc of 4c(n+2)


@pytest.mark.parametrize(
    ("name", "boundary"), [("hard-wall", "dirichlet"), ("hard-wall", "neumann"), ("ads-soliton", None)]
)
def test_gradient_moving_ir_end(name, boundary):
    z0 = 1.3
    bg = load_background(name, z0=z0)
    r = solve_spectrum(bg, states=3, boundary=boundary)
    g = mass_squared_gradient(bg, "scalar-glueball", 2, boundary=boundary)
    # m^2 ~ 1/z0^2 by scaling (common practice)
    assert abs(g["z0"] / (-2 * r.masses_squared[2] / z0) - 1) < 1e-8


# ----------------------------------------------------------------------------- catalogue
def test_every_confining_catalogue_background(catalogue_names):
    solved = 0
    for name in catalogue_names:
        bg = load_background(name)
        if bg.ir.kind == "horizon":
            with pytest.raises(NotApplicableError, match="horizon"):
                solve_spectrum(bg)
            continue
        if name == "ads":
            with pytest.raises(NotApplicableError, match="continuous"):
                solve_spectrum(bg)
            continue
        for channel in ("scalar-glueball", "vector-meson"):
            r = solve_spectrum(bg, channel, states=20)
            assert r.converged, (name, channel, r.message)
            assert np.all(np.diff(r.masses_squared) > 0)
            assert np.all(r.error_estimate <= 1e-10 * np.maximum(1, r.masses_squared))
        solved += 1
    assert solved >= 4


# ----------------------------------------------------------------------------- honesty
def test_unconverged_is_reported_not_silent(soft_wall):
    r = solve_spectrum(soft_wall, states=20, resolution=16)
    assert not r.converged
    assert "not converged" in r.message
    assert r.states <= 20
    with pytest.raises(ConvergenceError) as info:
        solve_spectrum(soft_wall, states=20, resolution=16, strict=True)
    assert info.value.partial is not None and not info.value.partial.converged


def test_no_spurious_eigenvalues_reach_the_user(hard_wall):
    # at a coarse fixed resolution the returned states must still be genuine ones
    r = solve_spectrum(hard_wall, states=30, resolution=24)
    exact = ref.values(ref.HARD_WALL_DIRICHLET)
    k = min(r.states, 20)
    ok = r.error_estimate[:k] < 1e-6 * r.masses_squared[:k]
    assert np.all(rel(r.masses[:k][ok], exact[:k][ok]) < 1e-5)


@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"channel": "pion"}, "channel"),
        ({"states": 0}, "states"),
        ({"tol": 0.0}, "tol"),
        ({"boundary": "robin"}, "boundary"),
        ({"resolution": 3}, "resolution"),
    ],
)
def test_bad_input_names_the_field(soft_wall, kwargs, field):
    with pytest.raises(InputError) as info:
        solve_spectrum(soft_wall, **kwargs)
    assert info.value.field == field


def test_wall_condition_without_a_wall(soft_wall, soliton):
    for bg in (soft_wall, soliton):
        with pytest.raises(InputError, match="only at a hard wall"):
            solve_spectrum(bg, boundary="neumann")


def test_result_is_frozen_and_serialisable(hard_wall):
    r = solve_spectrum(hard_wall, states=3)
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.converged = False  # type: ignore[misc]
    d = r.to_dict()
    for key in (
        "channel",
        "masses",
        "masses_squared",
        "error_estimate",
        "converged",
        "boundary",
        "provenance",
    ):
        assert key in d
    assert d["provenance"]["background"] == "hard-wall"
