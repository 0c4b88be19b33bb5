"""Unconverged results are reported as such, with the partial result, never silently."""

import pytest

from holostring.background import load_background
from holostring.errors import ConvergenceError
from holostring.fit.calibrate import calibrate
from holostring.fit.targets import parse_targets
from holostring.spectra import solve_spectrum
from holostring.strings import compute_potential


def test_potential_below_attainable_tolerance():
    bg = load_background("soft-wall")
    res = compute_potential(bg, tol=1e-15, points=20)
    assert res.converged is False and "above tol" in res.message
    assert res.V.size == 20  # the partial result is there
    with pytest.raises(ConvergenceError) as info:
        compute_potential(bg, tol=1e-15, points=20, strict=True)
    assert info.value.partial is not None and info.value.partial.converged is False


def test_spectrum_below_attainable_tolerance():
    bg = load_background("soft-wall")
    res = solve_spectrum(bg, states=5, tol=1e-15)
    assert res.converged is False and "not converged" in res.message
    # the masses are still returned, and are right to the accuracy actually reached
    # (scalar glueballs m_n^2 = 4(n+2), Colangelo et al. hep-ph/0703316)
    assert res.masses_squared[0] == pytest.approx(8.0, rel=1e-10)
    with pytest.raises(ConvergenceError):
        solve_spectrum(bg, states=5, tol=1e-15, strict=True)


def test_calibration_out_of_budget():
    t = parse_targets(
        {
            "parameters": {"c": {"free": True, "start": 5.0}},
            "targets": [{"observable": "string_tension", "value": 0.2, "uncertainty": 1e-6, "unit": "GeV^2"}],
        }
    )
    res = calibrate(load_background("soft-wall"), t, max_evaluations=1)
    assert res.converged is False and res.message.startswith("not converged")
    with pytest.raises(ConvergenceError) as info:
        calibrate(load_background("soft-wall"), t, max_evaluations=1, strict=True)
    assert info.value.partial.values["c"] > 0
