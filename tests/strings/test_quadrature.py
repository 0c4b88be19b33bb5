"""Quadrature building blocks against closed forms."""

import math

import numpy as np
import pytest

from holostring.strings import quadrature as quad


@pytest.mark.parametrize("n", [4, 8, 16])
def test_gauss_legendre_exact_for_polynomials(n):
    # int_0^1 t^k dt = 1/(k+1) exactly for k <= 2n - 1 (Golub-Welsch 1969; common practice)
    x, w = quad.gauss_legendre(n)
    for k in range(2 * n):
        assert abs(np.sum(w * x**k) - 1.0 / (k + 1)) < 1e-14


@pytest.mark.parametrize("a", [1e-150, 1e-40, 1e-8, 1e-3, 0.1, 0.49, 0.5, 2.0, 1e3])
def test_stretched_rule_near_singular_factor(a):
    # int_0^1 dt / sqrt(a^2 + t^2) = asinh(1/a) (closed form, Abramowitz-Stegun 3.3.44)
    t, w = quad.stretched_rule(np.array([a]), 12)
    val = np.sum(w * (1.0 / np.sqrt(a * a + t * t)))
    assert val == pytest.approx(math.asinh(1.0 / a), rel=1e-14)
    # a smooth factor on top: int_0^1 cos(t) / sqrt(a^2 + t^2) dt against scipy
    from scipy import integrate

    ref = integrate.quad(
        lambda x: math.cos(x) / math.hypot(a, x),
        0,
        1,
        epsabs=0,
        epsrel=1e-13,
        limit=500,
        points=[min(a, 0.5)] if a < 1 else None,
    )[0]
    got = np.sum(w * np.cos(t) / np.sqrt(a * a + t * t))
    assert got == pytest.approx(ref, rel=1e-11)


def test_stretched_rule_converges_with_m():
    a = 1e-20
    ref = math.asinh(1.0 / a) - (1 - math.cos(1.0)) * 0  # reference below
    vals = []
    for m in (6, 10, 14):
        t, w = quad.stretched_rule(np.array([a]), m)
        vals.append(np.sum(w * np.exp(-t) / np.sqrt(a * a + t * t)))
    assert abs(vals[2] - vals[1]) < 1e-13 * abs(vals[2])
    assert ref > 0


def test_taylor_coefficients_of_exp():
    # exp(z0 + y) = e^{z0} sum y^k / k!
    c = quad.taylor_coefficients(np.exp, 0.7, 0.5, 64)
    exact = np.array([math.exp(0.7) / math.factorial(k) for k in range(20)])
    # Cauchy-estimate error: eps * max|f| on the circle / r^k
    bound = 1e-14 * math.exp(1.2) / 0.5 ** np.arange(20)
    assert np.all(np.abs(c[:20] - exact) <= bound)


def test_taylor_difference_keeps_relative_accuracy():
    # sum c_k ((y*+h)^k - y*^k) for c = (0, 0, 1): (y*+h)^2 - y*^2 = h (2 y* + h) exactly
    c = np.array([5.0, 0.0, 1.0])
    ys = np.array([1e-30, 1e-8, 0.3])
    h = np.array([1e-40, 1e-20, 1e-3])
    got = quad.taylor_difference_h(c, ys, h)
    assert np.allclose(got, h * (2 * ys + h), rtol=1e-15, atol=0)


def test_mean_on_segment():
    # f(z) - f(z - h) for f = sin
    z = np.array([1.0, 2.0])
    h = np.array([1e-9, 0.3])
    got = quad.mean_on_segment(np.cos, z, h)
    exact = 2 * np.cos(z - h / 2) * np.sin(h / 2)
    assert np.allclose(got, exact, rtol=1e-14)


@pytest.mark.parametrize("m", [9, 12])
def test_ragged_rule_matches_closed_form_for_every_row(m):
    # int_0^1 dt / sqrt(a^2 + t^2) = asinh(1/a) (Abramowitz-Stegun 4.6.20 / 3.3.44) for many
    # scales at once, empty panels left out
    a = np.array([1e-200, 1e-60, 1e-12, 1e-5, 0.01, 0.3, 0.5, 3.0])
    row, t, w = quad.ragged_rule(a, m)
    got = np.bincount(row, weights=w / np.sqrt(a[row] ** 2 + t * t), minlength=a.size)
    assert np.allclose(got, np.arcsinh(1.0 / a), rtol=1e-14, atol=0)
    # fewer nodes for moderate a than for tiny a: only the panels that are needed
    counts = np.bincount(row, minlength=a.size)
    assert counts[4] < counts[0]
    # a smooth factor on top: cos(t), against the fixed-width stretched rule
    t2, w2 = quad.stretched_rule(a, 16)
    ref = np.sum(w2 * np.cos(t2) / np.sqrt(a[:, None] ** 2 + t2 * t2), axis=1)
    got = np.bincount(row, weights=w * np.cos(t) / np.sqrt(a[row] ** 2 + t * t), minlength=a.size)
    assert np.allclose(got, ref, rtol=1e-12 if m == 9 else 1e-14, atol=0)
