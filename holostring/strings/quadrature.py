"""Quadrature for string integrals: Gauss rules, endpoint substitutions, Taylor differences.

Arrays and callables in, arrays out; nothing here knows about backgrounds.

The string integrals have the form ``int_0^{z*} g(z) / sqrt(Q(z) - Q(z*)) dz`` with a square-root
singularity at the turning point. With ``z = z*(1 - t^2)`` the singularity is removed
(``dz = 2 z* t dt`` and ``Q - Q* ~ t^2``). When the turning point approaches a minimum of ``Q`` (or
an end where the measure diverges) the integrand in ``t`` behaves like ``1/sqrt(a^2 + t^2)`` with
``a -> 0``; the stretched rule below maps ``t = a sinh(s)``, which makes that factor constant, and
splits ``s`` into panels of fixed length so that Gauss-Legendre keeps its exponential
convergence uniformly in ``a`` (down to ``a ~ 1e-150``).

References
----------
Golub & Welsch, Math. Comp. 23 (1969) 221 (Gauss rules); Takahasi & Mori, Publ. RIMS 9 (1974) 721
(variable substitutions for endpoint singularities).
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

#: Length of a panel in the stretched variable s (see :func:`stretched_rule`).
PANEL_LENGTH = 1.5
#: Number of panels of length PANEL_LENGTH below s = asinh(T_SPLIT / a); beyond them the
#: integrand is constant to O(exp(-2 * PANELS * PANEL_LENGTH)) ~ 1e-16 relative.
PANELS = 12
#: The stretched map covers t in [0, T_SPLIT]; [T_SPLIT, 1] gets a plain rule.
T_SPLIT = 0.5
#: a above which the plain rule on [0, 1] is used.
PLAIN_ABOVE = 0.5


@lru_cache(maxsize=64)
def gauss_legendre(n: int) -> tuple[np.ndarray, np.ndarray]:
    """Gauss-Legendre nodes and weights on [0, 1].

    Parameters
    ----------
    n
        Number of nodes (exact for polynomials of degree 2n - 1).

    Returns
    -------
    nodes, weights
        Read-only arrays of length ``n``.
    """
    x, w = np.polynomial.legendre.leggauss(int(n))
    x = 0.5 * (x + 1.0)
    w = 0.5 * w
    x.setflags(write=False)
    w.setflags(write=False)
    return x, w


def stretched_rule(a: np.ndarray, m: int) -> tuple[np.ndarray, np.ndarray]:
    """Nodes and weights on t in [0, 1] for integrands with a 1/sqrt(a^2 + t^2) factor.

    For each ``a`` (vectorised) the rule has ``n = 1 + (PANELS + 2) * m`` points. With ``a >=
    PLAIN_ABOVE`` it is plain Gauss-Legendre in ``t``. Otherwise ``[T_SPLIT, 1]`` gets ``2 m``
    Gauss points in ``t`` and ``[0, T_SPLIT]`` is mapped by ``t = a sinh(s)``, ``s in [0, S]``,
    ``S = asinh(T_SPLIT / a)``, which makes the factor constant; ``s`` is split into ``PANELS``
    panels of length ``PANEL_LENGTH`` below ``S`` (``m`` Gauss points each) and one remaining
    panel with a single point (the integrand there is constant to double precision).

    Parameters
    ----------
    a
        Array of stretching scales (> 0), shape ``(k,)``.
    m
        Gauss points per panel.

    Returns
    -------
    t, w
        Arrays of shape ``(k, n)``; ``sum(w * f(t), axis=1)`` approximates ``int_0^1 f dt``.
        No node lies at ``t = 0`` (panels of zero length carry zero weight).
    """
    a = np.atleast_1d(np.asarray(a, dtype=float))
    k = len(a)
    n = 1 + (PANELS + 2) * m
    xg, wg = gauss_legendre(m)
    xp, wp = gauss_legendre(n)
    x2, w2 = gauss_legendre(2 * m)
    with np.errstate(all="ignore"):
        S = np.arcsinh(T_SPLIT / np.maximum(a, 1e-300))
    j = np.arange(PANELS)
    hi = np.clip(S[:, None] - j[None, :] * PANEL_LENGTH, 0.0, None)
    lo = np.clip(S[:, None] - (j[None, :] + 1) * PANEL_LENGTH, 0.0, None)
    width = hi - lo  # (k, PANELS)
    s = (lo[:, :, None] + width[:, :, None] * xg[None, None, :]).reshape(k, PANELS * m)
    ws = (width[:, :, None] * wg[None, None, :]).reshape(k, PANELS * m)
    rest = lo[:, -1]  # remaining panel [0, rest], one midpoint node
    s = np.concatenate([0.5 * rest[:, None], s], axis=1)
    ws = np.concatenate([rest[:, None], ws], axis=1)
    s = np.where(ws > 0, s, 0.5 * S[:, None])  # zero-width panels: harmless nodes, zero weight
    with np.errstate(all="ignore"):
        t_s = a[:, None] * np.sinh(s)
        w_s = ws * a[:, None] * np.cosh(s)
    t_p = np.broadcast_to(T_SPLIT + (1.0 - T_SPLIT) * x2, (k, 2 * m))
    w_p = np.broadcast_to((1.0 - T_SPLIT) * w2, (k, 2 * m))
    t_s = np.concatenate([t_s, t_p], axis=1)
    w_s = np.concatenate([w_s, w_p], axis=1)
    plain = a >= PLAIN_ABOVE
    t = np.where(plain[:, None], xp[None, :], t_s)
    w = np.where(plain[:, None], wp[None, :], w_s)
    return t, w


def ragged_rule(
    a: np.ndarray, m: int, plain_points: int | None = None, tail_points: int | None = None
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The rule of :func:`stretched_rule` without its empty panels, flattened over all rows.

    Rows with ``a >= PLAIN_ABOVE`` get ``plain_points`` Gauss-Legendre points in ``t``. The other rows
    get only the panels of the ``s = asinh(t / a)`` map that have non-zero length (about
    ``asinh(T_SPLIT / a) / PANEL_LENGTH`` of them, at most ``PANELS``, plus the one-point panel
    when ``a`` is tiny) and ``tail_points`` points on ``[T_SPLIT, 1]``. The number of nodes therefore
    grows like ``log(1 / a)`` instead of being the worst case for every row.

    Parameters
    ----------
    a
        Stretching scales (> 0), shape ``(k,)``.
    m
        Gauss points per panel.
    plain_points, tail_points
        Default ``2 m + 1`` and ``4 m / 3`` (rounded up), for integrands analytic in a
        neighbourhood of ``[0, 1]`` whose nearest singularity is O(1) away.

    Returns
    -------
    row, t, w
        Flat arrays: the row each node belongs to, the node and its weight;
        ``np.bincount(row, w * f(t), minlength=k)`` approximates ``int_0^1 f dt`` per row.
    """
    a = np.atleast_1d(np.asarray(a, dtype=float))
    plain = a >= PLAIN_ABOVE
    plain_points = 2 * m + 1 if plain_points is None else int(plain_points)
    tail_points = -(-4 * m // 3) if tail_points is None else int(tail_points)
    xp, wp = gauss_legendre(plain_points)
    rp = np.nonzero(plain)[0]
    rows = [np.repeat(rp, xp.size)]
    ts = [np.tile(xp, rp.size)]
    ws = [np.tile(wp, rp.size)]
    rs = np.nonzero(~plain)[0]
    if rs.size:
        a_s = np.maximum(a[rs], 1e-300)
        S = np.arcsinh(T_SPLIT / a_s)
        npan = np.clip(np.ceil(S / PANEL_LENGTH), 1, PANELS).astype(int)
        pr = np.repeat(np.arange(rs.size), npan)
        j = np.arange(pr.size) - np.repeat(np.cumsum(npan) - npan, npan)
        hi = S[pr] - j * PANEL_LENGTH
        lo = np.maximum(hi - PANEL_LENGTH, 0.0)
        xg, wg = gauss_legendre(m)
        s = lo[:, None] + (hi - lo)[:, None] * xg[None, :]
        wsn = (hi - lo)[:, None] * wg[None, :]
        ap = a_s[pr][:, None]
        rows.append(np.repeat(rs[pr], m))
        ts.append((ap * np.sinh(s)).ravel())
        ws.append((wsn * ap * np.cosh(s)).ravel())
        rest = S - PANELS * PANEL_LENGTH  # [0, rest]: the integrand is constant there
        lump = np.nonzero(rest > 0)[0]
        if lump.size:
            s0 = 0.5 * rest[lump]
            rows.append(rs[lump])
            ts.append(a_s[lump] * np.sinh(s0))
            ws.append(rest[lump] * a_s[lump] * np.cosh(s0))
        x2, w2 = gauss_legendre(tail_points)
        rows.append(np.repeat(rs, x2.size))
        ts.append(np.tile(T_SPLIT + (1.0 - T_SPLIT) * x2, rs.size))
        ws.append(np.tile((1.0 - T_SPLIT) * w2, rs.size))
    return np.concatenate(rows), np.concatenate(ts), np.concatenate(ws)


def taylor_coefficients(f, center: float, radius: float, n: int = 64) -> np.ndarray:
    """Taylor coefficients of an analytic function by the Cauchy integral (trapezoid rule / FFT).

    Parameters
    ----------
    f
        Vectorised callable accepting complex arrays.
    center, radius
        Expansion point and circle radius (inside the disc of analyticity).
    n
        Number of points on the circle (coefficients 0 .. n-1, aliasing error ~ (r/R)^n).

    Returns
    -------
    numpy.ndarray
        Real coefficients ``c_k`` with ``f(center + y) = sum_k c_k y^k``.

    References
    ----------
    Trefethen & Weideman, SIAM Review 56 (2014) 385 (trapezoid rule on circles).
    """
    theta = 2.0 * np.pi * np.arange(n) / n
    y = radius * np.exp(1j * theta)
    with np.errstate(all="ignore"):
        values = np.asarray(f(center + y), dtype=complex)
    c = np.fft.fft(values) / n
    k = np.arange(n)
    return (c / radius**k).real


def taylor_value(c: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Evaluate ``sum_k c_k y^k`` (Horner)."""
    y = np.asarray(y, dtype=float)
    out = np.zeros_like(y)
    for ck in c[::-1]:
        out = out * y + ck
    return out


def taylor_difference(c: np.ndarray, y: np.ndarray, ystar: np.ndarray) -> np.ndarray:
    """``sum_k c_k (y^k - ystar^k)`` without cancellation between the two points.

    Uses ``y^k - ystar^k = y (y^{k-1} - ystar^{k-1}) + ystar^{k-1} (y - ystar)`` with ``y - ystar``
    supplied implicitly as ``h = y - ystar`` computed by the caller-free form below, so a tiny
    ``h`` keeps full relative accuracy.

    Parameters
    ----------
    c
        Coefficients (``c_0`` is ignored).
    y, ystar
        Arrays broadcast together, ``y >= ystar >= 0``.
    """
    y = np.asarray(y, dtype=float)
    ystar = np.asarray(ystar, dtype=float)
    return taylor_difference_h(c, ystar, y - ystar)


def taylor_difference_h(c: np.ndarray, ystar: np.ndarray, h: np.ndarray) -> np.ndarray:
    """``sum_k c_k ((ystar + h)^k - ystar^k)`` with ``h`` given exactly (see taylor_difference)."""
    ystar, h = np.broadcast_arrays(np.asarray(ystar, float), np.asarray(h, float))
    y = ystar + h
    q = h.copy()  # y^1 - ystar^1
    p = np.ones_like(ystar)  # ystar^0
    out = c[1] * q if len(c) > 1 else np.zeros_like(h)
    for k in range(2, len(c)):
        p = p * ystar  # ystar^(k-1)
        q = y * q + p * h  # y^k - ystar^k
        out = out + c[k] * q
    return out


def mean_on_segment(fprime, z: np.ndarray, h: np.ndarray, m: int = 10) -> np.ndarray:
    """``f(z) - f(z - h) = h * mean of f' on [z - h, z]`` by an m-point Gauss rule.

    Accurate in relative terms for small ``h``, where the direct difference of ``f`` cancels.
    """
    x, w = gauss_legendre(m)
    pts = z[..., None] - h[..., None] * x
    return h * np.sum(fprime(pts) * w, axis=-1)
