"""Analysis of spectra: Regge fits, mass ratios, and parameter derivatives of m_n^2.

References
----------
Karch-Katz-Son-Stephanov, hep-ph/0602229 (linear trajectories m_n^2 = 4c(n+1) of the soft wall).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import sympy as sp

from holostring.errors import InputError
from holostring.spectra.results import SpectrumResult


@dataclass(frozen=True)
class ReggeFit:
    """Weighted least-squares fit m_n^2 = slope * n + intercept.

    Attributes
    ----------
    slope, intercept
        The fitted a and b.
    covariance
        2x2 covariance of (slope, intercept). Built from the per-state error estimates
        (``absolute``); when the points scatter more than those errors (chi2/dof > 1, a
        spectrum that is not linear) it is scaled by chi2/dof, and ``scaled`` is True.
    slope_error, intercept_error
        Square roots of the diagonal.
    chi2, dof
        Chi-square with the error estimates as sigmas, and degrees of freedom.
    n, residuals
        The fitted state numbers and m_n^2 - (a n + b).
    """

    slope: float
    intercept: float
    covariance: np.ndarray
    slope_error: float
    intercept_error: float
    chi2: float
    dof: int
    scaled: bool
    n: np.ndarray
    residuals: np.ndarray
    channel: str = ""

    def to_dict(self) -> dict[str, Any]:
        """Plain-data view."""
        return {
            "channel": self.channel,
            "slope": self.slope,
            "intercept": self.intercept,
            "slope_error": self.slope_error,
            "intercept_error": self.intercept_error,
            "covariance": self.covariance,
            "chi2": self.chi2,
            "dof": self.dof,
            "covariance_scaled_by_chi2_per_dof": self.scaled,
            "n": self.n,
            "residuals": self.residuals,
        }


def fit_regge(result: SpectrumResult, n_min: int = 0, n_max: int | None = None) -> ReggeFit:
    """Fit m_n^2 = a n + b to states n_min .. n_max of a spectrum.

    Parameters
    ----------
    result
        A spectrum.
    n_min, n_max
        The fitted range of n (inclusive; default: all states).

    Returns
    -------
    ReggeFit

    Raises
    ------
    InputError
        Fewer than two states in the range.

    Examples
    --------
    >>> from holostring.background import load_background
    >>> from holostring.spectra import solve_spectrum
    >>> fit = fit_regge(solve_spectrum(load_background("soft-wall", c=1.0), states=6))
    >>> round(fit.slope, 8)
    4.0
    """
    lam = np.asarray(result.masses_squared, dtype=float)
    err = np.asarray(result.error_estimate, dtype=float)
    n = np.arange(lam.size)
    hi = lam.size - 1 if n_max is None else min(int(n_max), lam.size - 1)
    sel = (n >= n_min) & (n <= hi)
    if np.count_nonzero(sel) < 2:
        raise InputError("regge range", f"needs at least two states, got n = {n_min}..{hi}")
    n, y, e = n[sel].astype(float), lam[sel], err[sel]
    # floor the sigmas at the rounding level of the eigenvalues
    sigma = np.maximum(e, 4 * np.finfo(float).eps * np.maximum(1.0, np.abs(y)))
    X = np.column_stack([n, np.ones_like(n)])
    Wt = 1.0 / sigma**2
    XtW = X.T * Wt
    cov = np.linalg.inv(XtW @ X)
    coef = cov @ (XtW @ y)
    resid = y - X @ coef
    chi2 = float(np.sum(Wt * resid**2))
    dof = int(n.size - 2)
    scaled = dof > 0 and chi2 / dof > 1.0
    if scaled:
        cov = cov * (chi2 / dof)
    return ReggeFit(
        slope=float(coef[0]),
        intercept=float(coef[1]),
        covariance=cov,
        slope_error=float(np.sqrt(cov[0, 0])),
        intercept_error=float(np.sqrt(cov[1, 1])),
        chi2=chi2,
        dof=dof,
        scaled=bool(scaled),
        n=n.astype(int),
        residuals=resid,
        channel=result.channel,
    )


def mass_ratios(
    numerator: SpectrumResult, denominator: SpectrumResult, reference: int | None = 0
) -> tuple[np.ndarray, np.ndarray]:
    """Mass ratios between two channels, with propagated errors.

    Parameters
    ----------
    numerator, denominator
        Two spectra (e.g. tensor and scalar glueballs).
    reference
        Divide every m_n(numerator) by m_reference(denominator) (default the ground state,
        giving m(2++)/m(0++) at n = 0); ``None`` divides state by state.

    Returns
    -------
    (ratios, errors)
        Arrays over the states of ``numerator`` (state by state: the common states).
    """
    m1, e1 = np.asarray(numerator.masses), np.asarray(numerator.mass_error)
    m2, e2 = np.asarray(denominator.masses), np.asarray(denominator.mass_error)
    if reference is None:
        k = min(m1.size, m2.size)
        m1, e1, m2, e2 = m1[:k], e1[:k], m2[:k], e2[:k]
    else:
        if not 0 <= reference < m2.size:
            raise InputError("reference", f"state {reference} not in the denominator spectrum")
        m2, e2 = m2[reference], e2[reference]
    r = m1 / m2
    err = np.abs(r) * np.sqrt((e1 / m1) ** 2 + (e2 / m2) ** 2)
    return r, err


_GRAD_CACHE: dict[Any, Any] = {}


def _derivative_functions(comp: Any, background: Any, name: str) -> tuple[Any, ...]:
    from holostring.background.formula import Z

    key = (id(comp), name)
    hit = _GRAD_CACHE.get(key)
    if hit is not None and hit[0] is comp:
        return hit[1]
    sym = background.symbols[name]
    sl = comp.sl
    params = [p.symbol for p in background.parameters]
    log_P = sp.expand_log(sp.log(sl.P), force=True)
    log_W = sp.expand_log(sp.log(sl.W), force=True)
    QW = sp.powsimp(sl.Q / sl.W, force=True)
    exprs = [sp.diff(log_P, sym), sp.diff(log_W, sym), sp.diff(QW, sym)]
    fns = []
    for e in exprs:
        f = sp.lambdify([Z, *params], e, modules=["scipy", "numpy"])
        if Z not in e.free_symbols:
            f = (lambda g: lambda z, *v: np.zeros_like(z) + g(z, *v))(f)
        fns.append(f)
    at = background.ir.at
    dz_end = None if at is None else sp.lambdify(params, sp.diff(at, sym), modules=["numpy"])
    out = (*fns, dz_end)
    _GRAD_CACHE[key] = (comp, out)
    return out


def mass_squared_gradient(
    background: Any,
    channel: Any = "scalar-glueball",
    n: int = 0,
    parameters: list[str] | None = None,
    *,
    boundary: str | None = None,
    tol: float = 1e-10,
) -> dict[str, float]:
    """Derivatives d m_n^2 / d p by the Hellmann-Feynman theorem.

    For -(P phi')' + Q phi = m^2 W phi normalised by int W phi^2 = 1,

        d m^2/dp = int (P_p phi'^2 + (Q_p - m^2 W_p) phi^2) dz + [end-point term] dz_IR/dp,

    the end-point term being -P phi'^2 at a Dirichlet wall and (Q - m^2 W) phi^2 at a Neumann
    wall or a cap, when the IR position depends on p.

    Parameters
    ----------
    background, channel, boundary, tol
        As for :func:`~holostring.spectra.solve_spectrum`.
    n
        The state.
    parameters
        Names (default: every parameter except the string coupling g).

    Returns
    -------
    dict
        Parameter name -> d m_n^2 / d p.

    References
    ----------
    R. P. Feynman, Phys. Rev. 56 (1939) 340 (the theorem); the end-point terms are Hadamard's
    domain variation (common practice).
    """
    from holostring.spectra.boundary import BoundaryKind
    from holostring.spectra.solve import _gl_nodes, _normalised_u, _single_thread, _solve

    names = parameters or [p.name for p in background.parameters if p.name != "g"]
    for name in names:
        background.parameter(name)
    with _single_thread():
        out, prob = _solve(background, channel, int(n) + 1, boundary, None, tol)
    V, col = out["V_col"]
    lam = float(out["lam"][n])
    u_nodes = _normalised_u(prob, V[:, [n]], col)
    zq, wq = _gl_nodes(prob.z_end, 2 * col.z.size + 32)
    u = col.evaluate(u_nodes, zq)[0]
    du = col.derivative(u_nodes, zq)[0]
    log_s = prob.log_s(zq)
    Ls = prob.dlog_s(zq)
    wP = np.exp(prob.log_P(zq) + 2 * log_s)
    wW = np.exp(prob.log_W(zq) + 2 * log_s)
    QW = prob._call(prob.comp.Q_over_W, zq)
    ze = np.array([prob.z_end])
    grads: dict[str, float] = {}
    for name in names:
        dlogP, dlogW, dQW, dz_end = _derivative_functions(prob.comp, background, name)
        vals = prob.values
        integrand = (
            wP * dlogP(zq, *vals) * (Ls * u + du) ** 2
            + wW * (dQW(zq, *vals) + (QW - lam) * dlogW(zq, *vals)) * u**2
        )
        g = float(np.sum(wq * integrand))
        if dz_end is not None and not prob.half:
            dz = float(dz_end(*vals))
            if dz != 0.0:
                ue = col.evaluate(u_nodes, ze)[0, 0]
                if prob.ir is BoundaryKind.DIRICHLET:
                    due = col.derivative(u_nodes, ze)[0, 0]
                    end = -np.exp(prob.log_P(ze)[0] + 2 * prob.log_s(ze)[0]) * due**2
                else:
                    qw = prob._call(prob.comp.Q_over_W, ze)[0]
                    end = (qw - lam) * np.exp(prob.log_W(ze)[0] + 2 * prob.log_s(ze)[0]) * ue**2
                g += float(end) * dz
        grads[name] = g
    return grads
