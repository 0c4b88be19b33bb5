"""Sturm-Liouville coefficients of a channel on a background, and the Schrodinger potential U.

For a field phi(z) exp(i p.x) with m^2 = -p^2 along the flat directions (t, x_i),

    -(P phi')' + Q phi = m^2 W phi,

with, for a scalar (and the transverse-traceless tensor, a massless scalar),

    P = e^{-k Phi} sqrt(-g) g^zz,   W = e^{-k Phi} sqrt(-g) |g^tt|,   Q = e^{-k Phi} sqrt(-g) M5^2,

and for the transverse components of a vector the same with one more factor g^xx. Here
sqrt(-g) = sqrt(G_tt G_xx^n_flat G_yy G_zz) * internal measure, in the channel's frame. The
Liouville transformation d xi = sqrt(W/P) dz, psi = (P W)^{1/4} phi gives

    -psi''(xi) + U psi = m^2 psi,   U = Q/W + a (L_s' + L_s^2 + L_s L_a / 2),

with a = P/W, L_s = (log (P W)^{1/4})', L_a = (log a)' (z-derivatives). For a conformally flat
metric (a = 1, P = W = e^B) this is U = B''/2 + B'^2/4 + M5^2 e^{2A} (DESIGN.md section 4; soft
wall: Karch-Katz-Son-Stephanov, hep-ph/0602229, eq. 9).

The numerical solver does not work with psi directly: it writes phi = s(z) u(z) with s carrying
the boundary behaviour (z^Delta, and the decay at infinity) and solves

    -a u'' - b u' + c u = m^2 u,   b = a (L_P + 2 L_s),   c = Q/W - a (L_s' + L_s^2 + L_P L_s),

where L_P = (log P)' and L_s = (log s)'. Every expression is built symbolically once per background
structure and channel, then compiled with the parameters (and Delta) as arguments.

References
----------
C. Csaki, H. Ooguri, Y. Oz, J. Terning, JHEP 01 (1999) 017, hep-th/9806021 (glueballs as
Sturm-Liouville problems on a soliton background).
"""

from __future__ import annotations

import weakref
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np
import sympy as sp

from holostring.background.formula import Z
from holostring.background.frames import Frame, FrameRule, frame_factor
from holostring.errors import NotApplicableError
from holostring.spectra.channels import Channel, Spin

#: symbols standing for numbers fixed at solve time
DELTA = sp.Symbol("Delta_uv", real=True)
KAPPA = sp.Symbol("kappa_uv", real=True)


def _logd(expr: sp.Expr) -> sp.Expr:
    """(log expr)' with logs of products and powers expanded (expr positive on the domain)."""
    d = sp.diff(sp.expand_log(sp.log(expr), force=True), Z)
    return _tidy(d)


def _tidy(expr: sp.Expr) -> sp.Expr:
    """Cancel rational expressions (removes 1/z^2 cancellations before compiling)."""
    try:
        if expr.is_rational_function(Z):
            return sp.cancel(sp.together(expr))
    except (TypeError, ValueError, NotImplementedError):  # pragma: no cover - sympy corner cases
        return expr
    return expr


@dataclass(frozen=True)
class SturmLiouville:
    """Symbolic Sturm-Liouville coefficients P, Q, W (in z and the parameter symbols)."""

    P: sp.Expr
    Q: sp.Expr
    W: sp.Expr
    frame: Frame


def sturm_liouville(background: Any, channel: Channel) -> SturmLiouville:
    """Build P, Q, W of a channel on a background (see the module docstring).

    Parameters
    ----------
    background
        A :class:`holostring.background.Background`.
    channel
        The bulk field.

    Returns
    -------
    SturmLiouville
    """
    bg = background
    m = bg.metric(channel.frame)
    G_tt, G_xx, G_zz = m["G_tt"], m["G_xx"], m["G_zz"]
    G_yy = m.get("G_yy", sp.Integer(1))
    measure = bg.internal_measure
    if measure != 1 and Frame(channel.frame) is not Frame(bg.frame) and bg.dilaton != 0:
        if FrameRule(bg.frame_rule) is FrameRule.TEN_D:
            n_internal = 10 - (2 + bg.n_flat + (1 if bg.G_yy is not None else 0) + 1)
            omega = frame_factor(bg.frame_rule, bg.dilaton)
            power = sp.Rational(n_internal, 2)
            measure = measure * (omega**power if channel.frame is Frame.STRING else omega**-power)
    sqrt_g = sp.sqrt(G_tt * G_xx**bg.n_flat * G_yy * G_zz) * measure
    dil = sp.exp(-sp.nsimplify(channel.dilaton_coupling) * bg.dilaton)
    base = sp.powsimp(dil * sqrt_g, force=True)
    P = base / G_zz
    W = base / G_tt
    Q = base * sp.nsimplify(channel.mass_squared)
    if channel.spin is Spin.VECTOR:
        P, W, Q = P / G_xx, W / G_xx, Q / G_xx
    return SturmLiouville(*(sp.powsimp(e, force=True) for e in (P, Q, W)), frame=channel.frame)


@dataclass(frozen=True)
class Compiled:
    """Compiled coefficient functions, each f(z, Delta, kappa, *parameter values)."""

    sl: SturmLiouville
    a: Callable[..., Any]
    b_finite: Callable[..., Any]
    c_finite: Callable[..., Any]
    b_half: Callable[..., Any]
    c_half: Callable[..., Any]
    log_s_half: Callable[..., Any]
    Ls_half: Callable[..., Any]
    log_W: Callable[..., Any]
    log_P: Callable[..., Any]
    Q_over_W: Callable[..., Any]
    U: Callable[..., Any]
    uv: Callable[..., Any]  # values -> (alpha, gamma, q0/p0)
    U_expr: sp.Expr


_CACHE: weakref.WeakKeyDictionary[Any, dict[Any, Compiled]] = weakref.WeakKeyDictionary()


def compiled(background: Any, channel: Channel) -> Compiled:
    """Symbolic preparation and compilation, cached per background structure and channel."""
    store = _CACHE.setdefault(background._compiled, {})
    key = (channel.spin is Spin.VECTOR, channel.mass_squared, channel.dilaton_coupling, str(channel.frame))
    hit = store.get(key)
    if hit is None:
        hit = _prepare(background, channel)
        store[key] = hit
    return hit


def _prepare(bg: Any, channel: Channel) -> Compiled:
    sl = sturm_liouville(bg, channel)
    P, Q, W = sl.P, sl.Q, sl.W
    params = [p.symbol for p in bg.parameters]
    LP, LW = _logd(P), _logd(W)
    a = sp.powsimp(sp.powdenest(P / W, force=True), force=True)
    a = _tidy(sp.simplify(a)) if a.is_rational_function(Z) else a
    QW = _tidy(sp.powsimp(Q / W, force=True))
    Ls_fin = DELTA / Z
    Ls_half = KAPPA / Z - (LP + LW) / 4

    def bc(Ls: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
        b = _tidy(a * (LP + 2 * Ls))
        c = _tidy(QW - a * (sp.diff(Ls, Z) + Ls**2 + LP * Ls))
        return b, c

    b_f, c_f = bc(Ls_fin)
    b_h, c_h = bc(Ls_half)
    Lsig = _tidy((LP + LW) / 4)
    La = _tidy(LP - LW)
    U = _tidy(QW + a * (sp.diff(Lsig, Z) + Lsig**2 + Lsig * La / 2))
    log_P = sp.expand_log(sp.log(P), force=True)
    log_W = sp.expand_log(sp.log(W), force=True)
    log_s_half = KAPPA * sp.log(Z) - (log_P + log_W) / 4

    args = [Z, DELTA, KAPPA, *params]

    def comp(expr: sp.Expr) -> Callable[..., Any]:
        fn = sp.lambdify(args, expr, modules=["scipy", "numpy"])
        if Z not in expr.free_symbols:
            return lambda z, *v: np.zeros_like(np.asarray(z, dtype=float)) + fn(z, *v)
        return fn

    # leading UV exponents: P ~ z^alpha, W ~ z^gamma, Q/P ~ q0/p0 z^-2
    def limit0(expr: sp.Expr) -> sp.Expr:
        try:
            val = sp.limit(_tidy(expr), Z, 0, "+")
        except (NotImplementedError, ValueError, TypeError):  # pragma: no cover
            return sp.nan
        return val

    alpha = limit0(Z * LP)
    gamma = limit0(Z * LW)
    qp = limit0(Z**2 * QW / a) if QW != 0 else sp.Integer(0)
    uv_exprs = [alpha, gamma, qp]
    uv_fns = [sp.lambdify(params, e, modules=["numpy"]) for e in uv_exprs]

    def uv(*values: float) -> tuple[float, float, float]:
        return tuple(float(f(*values)) for f in uv_fns)  # type: ignore[return-value]

    return Compiled(
        sl=sl,
        a=comp(a),
        b_finite=comp(b_f),
        c_finite=comp(c_f),
        b_half=comp(b_h),
        c_half=comp(c_h),
        log_s_half=comp(log_s_half),
        Ls_half=comp(_tidy(Ls_half)),
        log_W=comp(log_W),
        log_P=comp(log_P),
        Q_over_W=comp(QW),
        U=comp(U),
        uv=uv,
        U_expr=U,
    )


def uv_exponent(alpha: float, gamma: float, qp: float, field: str = "channel") -> float:
    """Normalisable UV exponent Delta of phi ~ z^Delta from the leading powers of P, W, Q.

    With P ~ p0 z^alpha and Q ~ q0 z^(alpha-2), the indicial equation is
    Delta^2 + (alpha - 1) Delta - q0/p0 = 0; the larger root is the normalisable one (for AdS5,
    alpha = -3: Delta (Delta - 4) = M5^2, the usual mass-dimension relation; Witten hep-th/9802150).

    Raises
    ------
    NotApplicableError
        When the UV is not a regular singular point of this type, or M5^2 is below the
        Breitenlohner-Freedman bound.
    """
    if not all(np.isfinite([alpha, gamma, qp])):
        raise NotApplicableError(
            f"{field}: the UV behaviour at z -> 0 is not a power law; the spectrum needs a "
            "regular singular boundary (asymptotically AdS or a power-law throat)"
        )
    if gamma <= alpha - 2 + 1e-12:
        raise NotApplicableError(
            f"{field}: the mass term W is as singular as P/z^2 at z -> 0; no discrete "
            "boundary condition applies"
        )
    disc = (alpha - 1) ** 2 + 4 * qp
    if disc < -1e-14:
        raise NotApplicableError(
            f"{field}: bulk mass below the Breitenlohner-Freedman bound (indicial discriminant "
            f"{disc:.3g} < 0)"
        )
    return 0.5 * (-(alpha - 1) + np.sqrt(max(disc, 0.0)))
