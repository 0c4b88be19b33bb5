"""Array building blocks of the spectral solver against closed forms."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.special import beta as beta_fn
from scipy.special import jn_zeros

from holostring.background import load_background
from holostring.spectra import solve_spectrum
from holostring.spectra.bases import NodalBasis, jacobi_rule


@pytest.mark.parametrize(("m", "alpha", "beta"), [(6, 0.0, 0.0), (9, 1.0, 4.0), (12, 0.0, 3.3)])
def test_jacobi_rule_is_exact_to_degree_2m_minus_1(m, alpha, beta):
    rule = jacobi_rule(m, alpha, beta)
    x, w = rule.x, np.exp(rule.log_weights)
    weight = (1 - x) ** alpha * (1 + x) ** beta
    for j in range(2 * m):
        # int_{-1}^{1} (1-x)^a (1+x)^b (1+x)^j dx = 2^(a+b+j+1) B(a+1, b+j+1) (common practice)
        exact = 2.0 ** (alpha + beta + j + 1) * beta_fn(alpha + 1, beta + j + 1)
        assert abs(np.sum(w * weight * (1 + x) ** j) / exact - 1) < 1e-12


def test_barycentric_weights_match_the_node_products():
    rule = jacobi_rule(10, 1.0, 3.3)
    x = rule.x
    # 1 / prod_{k != j} (x_j - x_k) (Berrut & Trefethen, SIAM Rev. 46 (2004) 501, eq. 3.2)
    direct = np.array([1.0 / np.prod(np.delete(x[j] - x, j)) for j in range(x.size)])
    ratio = direct / rule.bary
    np.testing.assert_allclose(ratio / ratio[0], 1.0, rtol=1e-10)


@pytest.mark.parametrize("right_zero", [False, True])
def test_nodal_basis_evaluates_and_differentiates_polynomials(right_zero):
    basis = NodalBasis.build(12, 0.0, 2.5, alpha=1.0, beta=4.0, right_zero=right_zero)
    p = np.polynomial.Polynomial([0.3, -1.0, 0.5, 0.2, -0.07])
    if right_zero:  # u = (b - z) p(z) vanishes at b exactly
        p = np.polynomial.Polynomial([2.5, -1.0]) * p
    z = np.linspace(0.0, 2.5, 7)
    u = p(basis.z)
    np.testing.assert_allclose(basis.evaluate(u, z), p(z), atol=1e-12)
    np.testing.assert_allclose(basis.derivative(u, z), p.deriv()(z), atol=1e-11)
    if right_zero:
        assert basis.evaluate(u, np.array([2.5]))[0] == 0.0


def test_rayleigh_quotients_keep_rounding_errors_away_at_high_resolution():
    # forming K^T K would cost ~1e-10 relative on the ground state at 200 nodes; the factored
    # Rayleigh quotient keeps every state near machine precision (zeros: scipy.special.jn_zeros,
    # hard wall Dirichlet, Boschi-Filho & Braga hep-th/0209080)
    r = solve_spectrum(load_background("hard-wall", z0=1.0), states=20, resolution=200)
    exact = jn_zeros(2, 20) ** 2
    assert np.max(np.abs(r.masses_squared / exact - 1)) < 1e-13
