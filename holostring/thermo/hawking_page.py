"""Hawking-Page transition: regularised on-shell action difference and T_c.

Method (Herzog, Phys. Rev. Lett. 98 (2007) 091601, hep-th/0608151). The Euclidean action is

    S_E = -1/(2 kappa^2) int d^5x sqrt(g) e^{-Phi} (R + 12) - 1/kappa^2 int_{z=eps} sqrt(h) e^{-Phi} K

in the Einstein frame of the background, in units of the AdS radius (no dilaton factor for the
hard wall). The thermal geometry integrates z over (eps, z_IR) (z_IR = z0 for the hard wall,
infinity otherwise); the black brane over (eps, min(z_h, z_IR)). Regularisation: a UV cutoff
z = eps, with the Euclidean time periods matched at the cutoff, beta_thermal = beta sqrt(f(eps)),
then the difference at eps -> 0. With L(z) = sqrt(g) e^{-Phi}(R + 12) and
1 - sqrt(f) = m z^4 + o(z^4), L_thermal = l z^-5 + ..., the limit is

    2 kappa^2 Delta F / L^3 = -[ int_0^{z_h'} (L_bb - L_th) dz - int_{z_h'}^{z_IR} L_th dz + m l / 4 ]
                              - 2 lim (X_bb - sqrt(f) X_th),

per unit three-volume, X the Gibbons-Hawking density (it drops out for AdS5 with f = 1 - z^4/z_h^4).
For AdS5 (R = -20) this is Herzog's 1/z_h^4 - 8 int_{z_h}^{z_IR} e^{-Phi} z^-5 dz, giving
T_c = 2^{1/4}/(pi z0) for the hard wall and T_c = 0.4917 sqrt(c) for the soft wall. With the
AdS5/CFT normalisation L^3/(2 kappa^2) = N^2/(8 pi^2), Delta F = (N^2/8 pi^2) x (this number).

Assumptions: the background is not back-reacted (warp and dilaton are T-independent); the
dilaton enters only through e^{-Phi}; when the Einstein-frame warp is not AdS5 the same action
is evaluated off shell (``on_shell = False`` in the result).

Physical units: the soft wall fixed by the rho mass, c = m_rho^2/4 with m_rho = 0.775 GeV, gives
T_c = 0.4917 x 0.3875 GeV = 0.1905 GeV (Herzog quotes 191 MeV); the hard wall with
z0 = j_{0,1}/m_rho gives T_c = 0.1223 GeV (Herzog: 122 MeV).
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np
import sympy as sp

from holostring.background.formula import Z
from holostring.background.frames import Frame
from holostring.background.model import Background
from holostring.errors import ConvergenceError, InputError, NotApplicableError
from holostring.provenance import Provenance
from holostring.thermo.action import boundary_density, bulk_density
from holostring.thermo.partners import ThermalFamily, thermal_family
from holostring.thermo.results import TransitionResult

REGULARISATION = (
    "UV cutoff z = eps; Euclidean time periods matched at the cutoff "
    "(beta_thermal = beta sqrt(f(eps))); difference of the bulk actions plus the Gibbons-Hawking "
    "terms, then eps -> 0 (Herzog hep-th/0608151)"
)
ASSUMPTIONS = (
    "the background is not back-reacted: warp and dilaton do not depend on T",
    "Einstein-frame action -1/(2 kappa^2) int sqrt(g) e^{-Phi} (R + 12) in units of the AdS radius",
    "the thermal geometry keeps the zero-temperature IR end (a hard wall cuts both geometries)",
    "classical gravity: leading order at large N; the transition is first order",
)
QUAD_RTOL = 1e-13


@dataclass(frozen=True, eq=False)
class ActionDifference:
    """The compiled free-energy difference of a thermal family as a function of z_h.

    Call :meth:`free_energy` for 2 kappa^2 Delta F / L^3 and its quadrature error.
    """

    family: ThermalFamily
    delta_bulk: Callable[..., Any] | None
    thermal_bulk: Callable[..., Any]
    constant: Callable[..., Any]
    on_shell: bool

    def _values(self, zh: float) -> list[float]:
        bb = self.family.black_brane
        vals = list(bb.values)
        vals[[p.name for p in bb.parameters].index(self.family.horizon)] = float(zh)
        return vals

    def free_energy(self, zh: float) -> tuple[float, float]:
        """2 kappa^2 (F_bb - F_th)/(L^3 V_3) at horizon ``zh`` and its quadrature error."""
        from scipy.integrate import quad

        vals = self._values(zh)
        z_ir = self.family.wall
        zcut = min(zh, z_ir)
        total = float(np.real(self.constant(np.array([zh]), *vals)[0]))
        err = 0.0
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            try:
                if self.delta_bulk is not None:

                    def dl(z: float) -> float:
                        return float(np.real(self.delta_bulk(z, *vals)))

                    v, e = quad(dl, 0.0, zcut, epsabs=0.0, epsrel=QUAD_RTOL, limit=400)
                    total += v
                    err += e
                if zcut < z_ir:

                    def lt(z: float) -> float:
                        return float(np.real(self.thermal_bulk(z, *vals)))

                    v, e = quad(lt, zcut, z_ir, epsabs=0.0, epsrel=QUAD_RTOL, limit=400)
                    total -= v
                    err += e
            except Warning as w:
                raise ConvergenceError(f"action integral at zh={zh:g} did not converge: {w}") from None
        return -total, err


def action_difference(family: ThermalFamily) -> ActionDifference:
    """Compile the regularised action difference of a thermal family (symbolic, then numeric).

    Raises
    ------
    NotApplicableError
        When the blackening does not approach 1 fast enough at the boundary (the difference
        then diverges), or the limits cannot be taken.
    """
    th, bb = family.thermal, family.black_brane
    mt, mb = th.metric(Frame.EINSTEIN), bb.metric(Frame.EINSTEIN)
    pieces = _symbolic_pieces(
        (mt["G_tt"], mt["G_xx"], mt["G_zz"], th.dilaton),
        (mb["G_tt"], mb["G_xx"], mb["G_zz"], bb.dilaton),
    )
    L_th, dL, constant, residuals = pieces
    known = set(bb.symbols.values()) | {Z}
    for expr in (L_th, dL, constant):
        extra = expr.free_symbols - known
        if extra:
            raise NotApplicableError(
                f"thermal partner uses parameters the black brane lacks: {sorted(map(str, extra))}"
            )
    delta = None if dL == 0 else bb.raw_function(dL)
    at_values = bb.substitutions()
    on_shell = all(sp.simplify(r.subs(at_values)) == 0 for r in residuals)
    return ActionDifference(family, delta, bb.raw_function(L_th), bb.raw_function(constant), bool(on_shell))


@lru_cache(maxsize=64)
def _symbolic_pieces(
    thermal: tuple[sp.Expr, ...], black: tuple[sp.Expr, ...]
) -> tuple[sp.Expr, sp.Expr, sp.Expr, tuple[sp.Expr, sp.Expr]]:
    """Symbolic L_thermal, L_bb - L_thermal, the boundary constant and on-shell residuals.

    Cached on the metric expressions, so parameter changes reuse the symbolic work.
    """
    L_th = bulk_density(*thermal)
    L_bb = bulk_density(*black)
    X_th = boundary_density(*thermal)
    X_bb = boundary_density(*black)
    ratio = sp.simplify(sp.sqrt(sp.simplify(black[0] / thermal[0])))
    try:
        m = sp.limit(sp.simplify((1 - ratio) / Z**4), Z, 0, "+")
        ell = sp.limit(sp.simplify(L_th * Z**5), Z, 0, "+")
        dk = sp.limit(sp.simplify(X_bb - ratio * X_th), Z, 0, "+")
    except (NotImplementedError, ValueError, TypeError) as err:
        raise NotApplicableError(f"cannot take the boundary limits of the action: {err}") from None
    for name, val in (("blackening", m), ("bulk action", ell), ("Gibbons-Hawking term", dk)):
        if val.has(sp.oo, -sp.oo, sp.zoo, sp.nan) or isinstance(val, sp.AccumBounds):
            raise NotApplicableError(
                f"the regularised action difference diverges ({name} limit at z -> 0 is {val}); "
                "the blackening must approach 1 as 1 - O(z^4) on an asymptotically AdS5 background"
            )
    dL = sp.simplify(L_bb - L_th)
    constant = sp.simplify(m * ell / 4 + 2 * dk)
    # on shell: R = -20 (L = -8 sqrt(g) e^{-Phi}) on both geometries
    residuals = tuple(
        sp.simplify(L + 8 * sp.exp(-c[3]) * _sqrtg({"G_tt": c[0], "G_xx": c[1], "G_zz": c[2]}))
        for L, c in ((L_th, thermal), (L_bb, black))
    )
    return L_th, dL, constant, residuals  # type: ignore[return-value]


def _sqrtg(m: dict[str, sp.Expr]) -> sp.Expr:
    from holostring.thermo.action import sqrt_det

    return sqrt_det([m["G_tt"], m["G_xx"], m["G_xx"], m["G_xx"]], m["G_zz"])


def compute_transition(
    background: Background | ThermalFamily,
    *,
    t_range: tuple[float, float] | None = None,
    points: int = 81,
    strict: bool = False,
) -> TransitionResult:
    """Hawking-Page transition temperature and free-energy difference versus T.

    Parameters
    ----------
    background
        A zero-temperature background (hard wall, soft wall, user throat) or a black brane
        (catalogue or a file with its own blackening), or a :class:`ThermalFamily`.
    t_range
        Temperatures (T_min, T_max) of the returned curve; default (0.7 T_c, 2.5 T_c), or the
        temperatures of z_h in (scale/4, 4 scale) without a transition.
    points
        Number of temperatures on the curve.
    strict
        Raise :class:`~holostring.errors.ConvergenceError` on an unconverged result instead of
        returning it with ``converged=False``.

    Returns
    -------
    TransitionResult

    Raises
    ------
    NotApplicableError
        For solitons or a blackening that makes the difference diverge.
    ConvergenceError
        With ``strict=True`` when a quadrature or the root search fails.

    References
    ----------
    Herzog, Phys. Rev. Lett. 98 (2007) 091601, hep-th/0608151; Hawking-Page, Commun. Math. Phys.
    87 (1983) 577; Witten, hep-th/9803131.

    Examples
    --------
    >>> from holostring.background import load_background
    >>> res = compute_transition(load_background("hard-wall", z0=1.0))
    >>> abs(res.critical_temperature - 2**0.25 / 3.141592653589793) < 1e-10
    True
    """
    from scipy.optimize import brentq

    fam = background if isinstance(background, ThermalFamily) else thermal_family(background)
    act = action_difference(fam)
    scale = fam.scale
    # scan z_h for sign changes of Delta F(z_h)
    grid = np.geomspace(1e-3 * scale, 1e3 * scale, 241)
    messages: list[str] = []
    converged = True
    try:
        act.free_energy(scale)
    except ConvergenceError as err:
        raise NotApplicableError(
            f"background '{fam.name}': the on-shell action integral does not converge ({err}); "
            "the Hawking-Page comparison needs a finite thermal action "
            "(e^-Phi sqrt(g) (R + 12) must fall off in the IR)"
        ) from None
    dF = np.empty_like(grid)
    for i, zh in enumerate(grid):
        try:
            dF[i] = act.free_energy(zh)[0]
        except ConvergenceError as err:
            dF[i] = math.nan
            converged = False
            messages.append(str(err))
    if not np.any(np.isfinite(dF)):
        raise NotApplicableError(
            f"background '{fam.name}': the on-shell action integral does not converge for any "
            f"horizon ({messages[0] if messages else 'no value'}); the Hawking-Page comparison "
            "needs a finite thermal action (e^-Phi sqrt(g) (R + 12) must fall off in the IR)"
        )
    roots: list[tuple[float, float, float]] = []  # (zh, T, T error)
    finite = np.isfinite(dF)
    for i in range(len(grid) - 1):
        if finite[i] and finite[i + 1] and np.sign(dF[i]) != np.sign(dF[i + 1]):

            def fn(x: float) -> float:
                return act.free_energy(x)[0]

            zc = brentq(fn, grid[i], grid[i + 1], xtol=1e-15 * grid[i], rtol=8 * np.finfo(float).eps)
            val, qerr = act.free_energy(zc)
            h = 1e-5 * zc
            slope = (fn(zc + h) - fn(zc - h)) / (2 * h)
            dz = (abs(val) + qerr) / abs(slope) + 1e-15 * zc
            t = float(fam.temperature(zc))
            dt = abs(float(fam.temperature(zc + h)) - float(fam.temperature(zc - h))) / (2 * h) * dz
            roots.append((float(zc), t, dt + 4 * np.finfo(float).eps * t))
    roots.sort(key=lambda r: r[1])
    t_c = roots[-1][1] if roots else None
    if not roots:
        dominant = "black brane" if np.nanmax(dF) < 0 else "thermal geometry"
        messages.append(f"no Hawking-Page transition: the {dominant} dominates at every scanned T")
    # the curve
    if t_range is None:
        if t_c is not None:
            t_range = (0.7 * t_c, 2.5 * t_c)
        else:
            ts = fam.temperature(np.array([4 * scale, 0.25 * scale]))
            t_range = (float(min(ts)), float(max(ts)))
    temps = np.linspace(t_range[0], t_range[1], points)
    hs = np.full_like(temps, math.nan)
    for i, t in enumerate(temps):
        try:
            hs[i] = fam.horizon_for(t)
        except InputError:
            pass
    if np.any(np.isnan(hs)):
        gone = temps[np.isnan(hs)]
        messages.append(
            f"no black brane exists at {gone.size} curve temperatures "
            f"({gone.min():.4g} to {gone.max():.4g}): T(z_h) has a minimum"
        )
    curve = np.full_like(temps, math.nan)
    cerr = np.full_like(temps, math.nan)
    for i, zh in enumerate(hs):
        if not math.isfinite(zh):
            continue
        try:
            curve[i], cerr[i] = act.free_energy(zh)
        except ConvergenceError as err:
            curve[i] = cerr[i] = math.nan
            converged = False
            messages.append(str(err))
    if not act.on_shell:
        messages.append(
            "the Einstein-frame metric is not AdS5: the action is evaluated off shell "
            "on the given background (not back-reacted); T_c is a model estimate"
        )
    t_err = roots[-1][2] if roots else None
    from holostring.units import energy_in_gev

    t_gev = energy_in_gev(t_c, fam.energy_unit, 1.0) if t_c is not None else None
    finite_err = cerr[np.isfinite(cerr)]
    error = t_err if t_err is not None else float(finite_err.max()) if finite_err.size else math.nan
    result = TransitionResult(
        background=fam.name,
        construction=fam.construction,
        critical_temperature=t_c,
        critical_temperature_error=t_err,
        critical_horizon=roots[-1][0] if roots else None,
        transitions=tuple(r[1] for r in roots),
        temperatures=temps,
        horizons=hs,
        free_energy_difference=curve,
        free_energy_error=cerr,
        energy_unit=fam.energy_unit,
        critical_temperature_gev=t_gev,
        on_shell=act.on_shell,
        regularisation=REGULARISATION,
        assumptions=ASSUMPTIONS,
        converged=converged,
        message="; ".join(dict.fromkeys(messages)) or "ok",
        error_estimate=error,
        provenance=Provenance(
            background=fam.name,
            parameters=fam.thermal.params,
            frame="einstein",
            settings={
                "quad_rtol": QUAD_RTOL,
                "scan_points": len(grid),
                "curve_points": points,
                "construction": fam.construction,
            },
        ),
    )
    if strict and not converged:
        raise ConvergenceError(result.message, result)
    return result
