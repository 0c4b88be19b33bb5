"""Symbolic diagnostics of a background: UV and IR behaviour, confinement, sigma, kappa, and the
first terms of the small-L expansion of V(L).

References
----------
- Confinement criterion: Kinar, Schreiber, Sonnenschein, Nucl. Phys. B 566 (2000) 103,
  hep-th/9811192: the Wilson loop obeys an area law when F = sqrt(G_tt G_xx) has a minimum
  F(z_m) > 0, or H = sqrt(G_tt G_zz) diverges, or space ends, where F > 0; sigma = g F(z_m).
- Coulomb coefficient of AdS: Maldacena, Phys. Rev. Lett. 80 (1998) 4859, hep-th/9803002:
  kappa = g 8 pi^3 / Gamma(1/4)^4.
- Small-L expansion (derived here, checked against the numerics of holostring.strings): for
  z^2 F = 1 + a_F z^2 + ..., z^2 H = 1 + a_H z^2 + ...,
  V = -kappa/L + C + b L + O(L^3) with
  b = g [ a_F (1 + 2 I1/I0 - 2 I2/I0) + 2 a_H I2/I0 ],
  I0 = sqrt(2) pi^(3/2)/Gamma(1/4)^2,  1 + 2 I1/I0 = Gamma(1/4)^4/(8 pi^2),  I2/I0 = Gamma(1/4)^4/(24 pi^2).
  For a conformally flat warp w = z^-2 (1 + a z^2 + ...) this is b = g a Gamma(1/4)^4/(8 pi^2).
"""

from __future__ import annotations

import math
import signal
import threading
from contextlib import contextmanager
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import sympy as sp

from holostring.background.formula import Z
from holostring.background.model import Background, IRKind, positive_sqrt
from holostring.provenance import Provenance

#: Maldacena's Coulomb coefficient over g, exact (hep-th/9803002).
KAPPA_ADS = 8 * sp.pi**3 / sp.gamma(sp.Rational(1, 4)) ** 4
#: b / (g a) for a conformally flat warp z^-2 (1 + a z^2 + ...), derived in the module docstring.
SLOPE_FACTOR = sp.gamma(sp.Rational(1, 4)) ** 4 / (8 * sp.pi**2)
_I2_OVER_I0 = sp.gamma(sp.Rational(1, 4)) ** 4 / (24 * sp.pi**2)

SYMBOLIC_TIME_LIMIT = 5.0


@dataclass(frozen=True)
class Diagnostics:
    """What a background does, from its formulas.

    Attributes
    ----------
    asymptotically_ads
        z^2 G_tt, z^2 G_xx, z^2 G_zz -> 1 as z -> 0 (string frame).
    uv_power
        p in G_xx ~ z^p near the boundary (-2 for AdS).
    ir_kind, ir_position
        How and where space ends.
    confining
        The Kinar-Schreiber-Sonnenschein criterion holds.
    criterion
        Which branch of the criterion decided (plain words).
    confinement_point
        z_m where the long string sits (an interior minimum of F or the IR end), or None.
    string_tension, string_tension_error
        sigma = g F(z_m) and its numerical uncertainty (0 when exact).
    string_tension_exact
        The closed form as text (e.g. ``E*c*g/2``), or None when only numeric.
    coulomb_coefficient
        kappa = g 8 pi^3/Gamma(1/4)^4 for asymptotically AdS backgrounds, else None.
    expansion_slope
        b in V = -kappa/L + C + b L + ... at small L, or None (with ``expansion_note``).
    crossover_length
        sqrt(kappa/sigma): where the Coulomb and linear terms are equal, when both exist.
    temperature
        T = |d_z G_tt| / (4 pi sqrt(G_tt G_zz)) at a horizon, else None.
    notes
        Human-readable remarks (why something is None).
    """

    background: str
    asymptotically_ads: bool
    uv_power: float | None
    ir_kind: str
    ir_position: float | None
    confining: bool
    criterion: str
    confinement_point: float | None
    string_tension: float | None
    string_tension_error: float | None
    string_tension_exact: str | None
    coulomb_coefficient: float | None
    coulomb_coefficient_exact: str | None
    expansion_slope: float | None
    expansion_slope_exact: str | None
    crossover_length: float | None
    temperature: float | None
    notes: tuple[str, ...]
    provenance: Provenance
    formulas: dict[str, str] = field(default_factory=dict)

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view (keys as in the CLI's --json output)."""
        return {
            "background": self.background,
            "confining": self.confining,
            "criterion": self.criterion,
            "string_tension": self.string_tension,
            "string_tension_error": self.string_tension_error,
            "string_tension_exact": self.string_tension_exact,
            "confinement_point": self.confinement_point,
            "coulomb_coefficient": self.coulomb_coefficient,
            "coulomb_coefficient_exact": self.coulomb_coefficient_exact,
            "asymptotically_ads": self.asymptotically_ads,
            "uv_power": self.uv_power,
            "ir_end": {"kind": self.ir_kind, "at": self.ir_position},
            "small_L_slope": self.expansion_slope,
            "small_L_slope_exact": self.expansion_slope_exact,
            "crossover_length": self.crossover_length,
            "temperature": self.temperature,
            "notes": list(self.notes),
            "formulas": self.formulas,
            "provenance": self.provenance.to_dict(),
        }


def diagnose(bg: Background) -> Diagnostics:
    """Symbolic and certified-numeric diagnostics of a background.

    Parameters
    ----------
    bg
        The background, at its current parameter values.

    Returns
    -------
    Diagnostics

    References
    ----------
    Kinar-Schreiber-Sonnenschein hep-th/9811192; Maldacena hep-th/9803002.

    Examples
    --------
    >>> from holostring.background import load_background
    >>> round(diagnose(load_background("hard-wall", z0=1.0)).string_tension, 12)
    1.0
    """
    notes: list[str] = []
    F = bg.expression("F")
    H = bg.expression("H")
    subs = bg.substitutions()
    g = bg.g

    ads, power = _uv(bg)
    if not ads:
        notes.append(
            f"not asymptotically AdS (G_xx ~ z^{power:g} at the boundary): the Coulomb "
            "coefficient and small-L expansion do not apply"
            if power is not None
            else "not asymptotically AdS"
        )
    conf = _confinement(bg, F, subs, notes)
    kappa = kappa_exact = None
    if ads:
        kappa = float(g * KAPPA_ADS)
        kappa_exact = str(sp.Symbol("g") * KAPPA_ADS)
    slope = slope_exact = None
    if ads:
        slope, slope_exact = _slope(bg, F, H, notes)
    crossover = None
    if kappa is not None and conf["sigma"]:
        crossover = math.sqrt(kappa / conf["sigma"])
    temperature = _temperature(bg) if bg.ir.kind is IRKind.HORIZON else None
    z_ir = bg.z_ir
    return Diagnostics(
        background=bg.name,
        asymptotically_ads=ads,
        uv_power=power,
        ir_kind=str(bg.ir.kind),
        ir_position=None if math.isinf(z_ir) else z_ir,
        confining=conf["confining"],
        criterion=conf["criterion"],
        confinement_point=conf["z_m"],
        string_tension=conf["sigma"],
        string_tension_error=conf["sigma_error"],
        string_tension_exact=conf["sigma_exact"],
        coulomb_coefficient=kappa,
        coulomb_coefficient_exact=kappa_exact,
        expansion_slope=slope,
        expansion_slope_exact=slope_exact,
        crossover_length=crossover,
        temperature=temperature,
        notes=tuple(notes),
        provenance=Provenance(bg.name, bg.params, "string", {"analysis": "diagnostics"}),
        formulas={"F": str(F), "H": str(H)},
    )


# --------------------------------------------------------------------------- UV
def uv_behaviour(bg: Background) -> tuple[bool, float | None]:
    """Whether ``bg`` is asymptotically AdS5 (z^2 G -> 1 for G_tt, G_xx, G_zz) and the power p in
    G_xx ~ z^p at the boundary. Cheap after the first call on a background structure."""
    return _uv(bg)


def _uv(bg: Background) -> tuple[bool, float | None]:
    m = bg.metric("string")
    subs = bg.substitutions()
    ads = True
    memo = bg._compiled.memo
    for key in ("G_tt", "G_xx", "G_zz"):
        lim = _limit0(Z**2 * m[key], subs, memo, f"uv:{key}")
        if lim is None or abs(lim - 1.0) > 1e-12:
            ads = False
    power = _limit0(Z * sp.diff(sp.log(m["G_xx"]), Z), subs, memo, "uv:power")
    return ads, power


def _limit0(expr: sp.Expr, subs: dict[sp.Symbol, float], memo: dict[str, Any], key: str) -> float | None:
    """lim_{z->0+} of expr at the current parameters: sympy first, numeric extrapolation after.

    The symbolic limit (in the parameter symbols) is computed once per background structure.
    """
    if key not in memo:
        memo[key] = None
        with _time_limit(SYMBOLIC_TIME_LIMIT) as ok:
            try:
                lim = sp.limit(sp.simplify(expr), Z, 0, "+")
                if ok() and not lim.has(sp.oo, -sp.oo, sp.zoo, sp.nan, sp.Limit):
                    memo[key] = lim
            except Exception:  # noqa: S110 - sympy may fail on any user formula; numerics follow
                pass
    lim = memo[key]
    if lim is not None:
        try:
            value = complex(sp.N(lim.subs(subs)))
        except (TypeError, ValueError):
            value = complex(math.nan)
        if math.isfinite(value.real) and abs(value.imag) < 1e-14:
            return value.real
    f = sp.lambdify(Z, expr.subs(subs), modules=["scipy", "numpy"])
    zs = np.array([1e-5, 1e-6, 1e-7])
    with np.errstate(all="ignore"):
        vals = np.asarray(f(zs), dtype=float)
    if not np.all(np.isfinite(vals)) or abs(vals[-1] - vals[-2]) > 1e-6 * max(1.0, abs(vals[-1])):
        return None
    return float(vals[-1])


# --------------------------------------------------------------------------- confinement
def _confinement(
    bg: Background, F: sp.Expr, subs: dict[sp.Symbol, float], notes: list[str]
) -> dict[str, Any]:
    g = bg.g
    out: dict[str, Any] = {
        "confining": False,
        "criterion": "",
        "z_m": None,
        "sigma": None,
        "sigma_error": None,
        "sigma_exact": None,
    }
    Fn = bg.function("F")
    dFn = bg.function("dF")
    z_ir = bg.z_ir
    kind = bg.ir.kind
    z_m, z_m_err = _interior_minimum(Fn, dFn, z_ir)
    if z_m is not None:
        sigma = g * float(Fn(np.array([z_m]))[0])
        if sigma <= 0:
            out["criterion"] = "F has a minimum where it vanishes: no area law"
            return out
        out.update(
            confining=True,
            z_m=z_m,
            sigma=sigma,
            criterion="F = sqrt(G_tt G_xx) has a minimum F(z_m) > 0 (KSS)",
        )
        # F is stationary at z_m, so the z_m error enters sigma only at second order
        d2 = _second_derivative(Fn, z_m)
        out["sigma_error"] = g * (0.5 * abs(d2) * z_m_err**2) + 4 * np.finfo(float).eps * sigma
        exact = _exact_minimum(bg, F, z_m)
        if exact is not None:
            z_exact, sigma_exact = exact
            out.update(
                z_m=float(sp.N(z_exact.subs(subs))),
                sigma=g * float(sp.N(sigma_exact.subs(subs))),
                sigma_error=0.0,
                sigma_exact=str(sp.Symbol("g") * sigma_exact),
            )
        if kind is IRKind.HORIZON:
            out.update(
                confining=False,
                criterion="F has a local minimum but space ends at a horizon where F = 0: "
                "a linear regime at intermediate L, then screening",
            )
            notes.append(
                "deconfined: the horizon screens long strings; see max_separation and "
                "screening_length from the potential command"
            )
        return out
    if kind in (IRKind.WALL, IRKind.CAP) and math.isfinite(z_ir):
        F_end = float(np.real(Fn(np.array([z_ir]))[0]))
        if F_end > 0:
            crit = (
                "space ends at a wall where F > 0 (KSS)"
                if kind is IRKind.WALL
                else "H diverges where the circle shrinks, with F > 0 (KSS)"
            )
            expr = sp.simplify(F.subs(Z, bg.ir.at)) if bg.ir.at is not None else None
            out.update(
                confining=True,
                z_m=z_ir,
                sigma=g * F_end,
                criterion=crit,
                sigma_error=0.0,
                sigma_exact=None if expr is None else str(sp.Symbol("g") * expr),
            )
            return out
        out["criterion"] = "space ends where F vanishes: no area law"
        return out
    if kind is IRKind.HORIZON:
        out["criterion"] = "F decreases to zero at the horizon: screening, no area law"
        return out
    out["criterion"] = "F decreases monotonically towards the IR with no positive minimum: no area law"
    return out


def _interior_minimum(Fn: Any, dFn: Any, z_ir: float) -> tuple[float | None, float]:
    """A certified interior minimum of F: a sign change of F' from - to +, refined by brentq."""
    from scipy.optimize import brentq

    top = z_ir if math.isfinite(z_ir) else 1e3
    lo = 1e-4 * (z_ir if math.isfinite(z_ir) else 1.0)
    zs = np.geomspace(lo, top * (1 - 1e-9) if math.isfinite(z_ir) else top, 4000)
    with np.errstate(all="ignore"):
        d = np.real(np.asarray(dFn(zs), dtype=complex))
        f = np.real(np.asarray(Fn(zs), dtype=complex))
    finite = np.isfinite(d) & np.isfinite(f)
    idx = np.where(finite[:-1] & finite[1:] & (d[:-1] < 0) & (d[1:] > 0))[0]
    if idx.size == 0:
        return None, 0.0
    # the global minimum among the candidates
    best = min(idx, key=lambda i: f[i])
    a, b = zs[best], zs[best + 1]

    def dfun(x: float) -> float:
        return float(np.real(dFn(np.array([x]))[0]))

    z_m = brentq(dfun, a, b, xtol=1e-15, rtol=4 * np.finfo(float).eps, maxiter=200)
    return float(z_m), 4 * np.finfo(float).eps * z_m


def _second_derivative(Fn: Any, z: float) -> float:
    h = 1e-4 * z
    vals = np.real(Fn(np.array([z - h, z, z + h])))
    return float((vals[0] - 2 * vals[1] + vals[2]) / h**2)


def _exact_minimum(bg: Background, F: sp.Expr, z_numeric: float) -> tuple[sp.Expr, sp.Expr] | None:
    """Solve F'(z) = 0 in closed form; return (z_m, F(z_m)) matching the numeric minimum."""
    if sp.count_ops(F) > 80:
        return None
    subs = bg.substitutions()
    memo = bg._compiled.memo  # the closed-form roots depend on the formulas, not on the values
    if "dF_roots" not in memo:
        memo["dF_roots"] = None
        with _time_limit(SYMBOLIC_TIME_LIMIT) as ok:
            try:
                dF = sp.together(sp.diff(sp.log(F), Z))
                sols = sp.solve(sp.numer(dF), Z)
            except Exception:
                sols = None
            if ok() and sols is not None:
                memo["dF_roots"] = [
                    (s, sp.simplify(positive_sqrt(sp.simplify(F.subs(Z, s) ** 2)))) for s in sols
                ]
    roots = memo["dF_roots"]
    if roots is None:
        return None
    for s, value in roots:
        try:
            val = complex(sp.N(s.subs(subs)))
        except (TypeError, ValueError):
            continue
        if abs(val.imag) < 1e-12 and abs(val.real - z_numeric) < 1e-8 * max(1.0, z_numeric):
            return s, value
    return None


# --------------------------------------------------------------------------- small L
def _slope(bg: Background, F: sp.Expr, H: sp.Expr, notes: list[str]) -> tuple[float | None, str | None]:
    memo = bg._compiled.memo
    if "slope" not in memo:
        coeffs = []
        for name, expr in (("F", F), ("H", H)):
            a = _second_order(expr)
            if a is None:
                memo["slope"] = (None, name)
                break
            coeffs.append(a)
        else:
            a_F, a_H = coeffs
            g = bg.parameter("g").symbol
            b = sp.simplify(g * (a_F * (SLOPE_FACTOR - 2 * _I2_OVER_I0) + 2 * a_H * _I2_OVER_I0))
            fn = sp.lambdify([p.symbol for p in bg.parameters], b, modules=["scipy", "numpy"])
            memo["slope"] = (b, fn)
    b, extra = memo["slope"]
    if b is None:
        notes.append(f"small-L slope not available: z^2 {extra} is not 1 + a z^2 + O(z^3) at the boundary")
        return None, None
    return float(extra(*bg.values)), str(b)


def _second_order(expr: sp.Expr) -> sp.Expr | None:
    with _time_limit(SYMBOLIC_TIME_LIMIT) as ok:
        try:
            ser = sp.series(Z**2 * expr, Z, 0, 3).removeO()
        except Exception:
            return None
        if not ok():
            return None
    ser = sp.expand(ser)
    if sp.simplify(ser.subs(Z, 0) - 1) != 0:
        return None
    a = ser.coeff(Z, 2)
    rest = sp.simplify(ser - 1 - a * Z**2)
    if rest != 0:
        return None
    return sp.simplify(a)


# --------------------------------------------------------------------------- temperature
def _temperature(bg: Background) -> float | None:
    m = bg.metric("string")
    expr = sp.diff(m["G_tt"], Z) / positive_sqrt(m["G_tt"] * m["G_zz"])
    at = bg.ir.at
    if at is None:
        return None
    subs = bg.substitutions()
    with _time_limit(SYMBOLIC_TIME_LIMIT) as ok:
        try:
            val = sp.limit(expr.subs(subs), Z, at.subs(subs), "-")
            num = complex(sp.N(val))
            if ok() and math.isfinite(num.real):
                return abs(num.real) / (4 * math.pi)
        except Exception:  # noqa: S110 - sympy may fail on any user formula; numerics follow
            pass
    z_h = bg.z_ir
    f = sp.lambdify(Z, expr.subs(subs), modules=["scipy", "numpy"])
    vals = [abs(float(np.real(f(z_h * (1 - e))))) for e in (1e-6, 1e-7)]
    return vals[-1] / (4 * math.pi)


# --------------------------------------------------------------------------- helpers
@contextmanager
def _time_limit(seconds: float) -> Any:
    """Stop a sympy computation after ``seconds`` (main thread only; elsewhere no limit)."""
    expired = {"flag": False}
    if threading.current_thread() is not threading.main_thread() or not hasattr(signal, "setitimer"):
        yield lambda: True
        return

    class _TimeoutError(Exception):
        pass

    def handler(signum: int, frame: Any) -> None:
        expired["flag"] = True
        raise _TimeoutError

    old = signal.signal(signal.SIGALRM, handler)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield lambda: not expired["flag"]
    except _TimeoutError:
        pass
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, old)
