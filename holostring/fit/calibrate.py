"""Calibration: weighted least squares of a background's free parameters against targets.

Residuals r_i = (O_i(p) - t_i)/s_i are minimised with :func:`scipy.optimize.least_squares`;
positive parameters are fitted in log p, so scales spanning decades converge alike. The Jacobian
is a central difference of the solvers' results (whose own errors are ~1e-10 relative), refined by
Richardson extrapolation for the final covariance C = (J^T J)^-1; uncertainties of predictions are
propagated linearly, sqrt(g^T C g), with g the Richardson gradient of the prediction.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from holostring.errors import ConvergenceError, HolostringError, InputError
from holostring.fit.observables import GRADIENT_METHODS, Observable, evaluate, gradient
from holostring.fit.targets import FreeParameter, TargetSet, unit_factor
from holostring.provenance import Provenance
from holostring.units import HBARC_GEV_FM


@dataclass(frozen=True)
class Prediction:
    """A calibrated model's value of one observable with its propagated uncertainty."""

    observable: str
    value: float
    uncertainty: float
    numerical_error: float
    unit: str
    target: float | None = None
    target_uncertainty: float | None = None

    @property
    def pull(self) -> float | None:
        """(prediction - target)/target uncertainty, when this is a target."""
        if self.target is None or not self.target_uncertainty:
            return None
        return (self.value - self.target) / self.target_uncertainty

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "observable": self.observable,
            "value": self.value,
            "uncertainty": self.uncertainty,
            "numerical_error": self.numerical_error,
            "unit": self.unit,
            "target": self.target,
            "target_uncertainty": self.target_uncertainty,
            "pull": self.pull,
        }


@dataclass(frozen=True)
class CalibrationResult:
    """Fitted parameters with covariance, residuals, chi^2 and predictions."""

    background: str
    names: tuple[str, ...]
    values: dict[str, float]
    uncertainties: dict[str, float]
    covariance: np.ndarray
    correlation: np.ndarray
    units: dict[str, str]
    chi2: float
    dof: int
    predictions: tuple[Prediction, ...]
    converged: bool
    message: str
    evaluations: int
    parameters: dict[str, float]
    provenance: Provenance

    @property
    def chi2_per_dof(self) -> float | None:
        """chi^2 per degree of freedom (None when the fit is exactly determined)."""
        return self.chi2 / self.dof if self.dof > 0 else None

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "background": self.background,
            "fitted": {
                n: {"value": self.values[n], "uncertainty": self.uncertainties[n], "unit": self.units[n]}
                for n in self.names
            },
            "covariance": self.covariance.tolist(),
            "correlation": self.correlation.tolist(),
            "chi2": self.chi2,
            "dof": self.dof,
            "chi2_per_dof": self.chi2_per_dof,
            "predictions": [p.to_dict() for p in self.predictions],
            "parameters": self.parameters,
            "converged": self.converged,
            "message": self.message,
            "evaluations": self.evaluations,
            "provenance": self.provenance.to_dict(),
        }


def display_unit(dimension: int, energy_unit: str = "GeV") -> tuple[str, float]:
    """Unit for showing a value of mass dimension ``dimension`` (fm for lengths) and the factor
    from GeV^dimension to it."""
    if dimension == 0:
        return "", 1.0
    if dimension == -1:
        return "fm", HBARC_GEV_FM
    scale = 1.0 if energy_unit == "GeV" else 1e3
    return (energy_unit if dimension == 1 else f"{energy_unit}^{dimension}"), scale**dimension


class _Model:
    """Maps the fit variables u to observables; counts evaluations."""

    def __init__(self, bg: Any, free: tuple[FreeParameter, ...], exact: bool = True) -> None:
        self.bg = bg
        self.free = free
        self.exact = exact
        self.methods: dict[str, str] = {}
        self.log = [bg.parameter(f.name).lower >= 0 for f in free]
        self.evaluations = 0

    def to_params(self, u: np.ndarray) -> dict[str, float]:
        return {
            f.name: (math.exp(x) if lg else float(x)) for f, x, lg in zip(self.free, u, self.log, strict=True)
        }

    def to_u(self, p: dict[str, float]) -> np.ndarray:
        return np.array(
            [math.log(p[f.name]) if lg else p[f.name] for f, lg in zip(self.free, self.log, strict=True)]
        )

    def observe(self, u: np.ndarray, obs: list[Observable]) -> tuple[np.ndarray, np.ndarray]:
        self.evaluations += 1
        bg = self.bg.with_params(**self.to_params(u))
        res = evaluate(bg, obs)
        vals = np.array([res[o.spec].value for o in obs])
        errs = np.array([res[o.spec].error for o in obs])
        return vals, errs

    def gradient(self, u: np.ndarray, obs: list[Observable], h: float, richardson: bool) -> np.ndarray:
        """d observables / d u: exact formulas where the observable has them (envelope theorem,
        Hellmann-Feynman), central differences (Richardson-extrapolated if asked) otherwise."""
        rows: list[np.ndarray | None] = [None] * len(obs)
        if self.exact:
            params = self.to_params(u)
            bg = self.bg.with_params(**params)
            names = [f.name for f in self.free]
            dpdu = np.array([params[n] if lg else 1.0 for n, lg in zip(names, self.log, strict=True)])
            memo: dict[str, Any] = {}
            for i, o in enumerate(obs):
                d = gradient(bg, o, names, memo)
                if d is not None:
                    rows[i] = np.asarray(d, dtype=float) * dpdu
                    self.methods[o.spec] = GRADIENT_METHODS[o.kind]
        rest = [i for i, r in enumerate(rows) if r is None]
        if rest:
            sub = [obs[i] for i in rest]
            fd = self._difference(u, sub, h, richardson)
            for k, i in enumerate(rest):
                rows[i] = fd[k]
                self.methods[obs[i].spec] = "central differences" + (
                    " with Richardson extrapolation" if richardson else ""
                )
        return np.array(rows)

    def _difference(self, u: np.ndarray, obs: list[Observable], h: float, richardson: bool) -> np.ndarray:
        cols = []
        for j in range(len(u)):

            def diff(step: float, j: int = j) -> np.ndarray:
                e = np.zeros_like(u)
                e[j] = step
                return (self.observe(u + e, obs)[0] - self.observe(u - e, obs)[0]) / (2 * step)

            d = diff(h)
            if richardson:
                d = (4 * diff(h / 2) - d) / 3
            cols.append(d)
        return np.array(cols).T


def calibrate(
    background: Any,
    targets: TargetSet,
    *,
    max_evaluations: int = 200,
    exact_gradients: bool = True,
    strict: bool = False,
) -> CalibrationResult:
    """Fit the free parameters of ``background`` to ``targets``.

    Parameters
    ----------
    background
        The background; parameters not free or fixed by the targets keep its values.
    targets
        A :class:`~holostring.fit.targets.TargetSet` (see :func:`~holostring.fit.targets.load_targets`).
    max_evaluations
        Budget of residual evaluations for the optimiser.
    exact_gradients
        Use exact derivative formulas where an observable has them (string tension: envelope
        theorem; masses: Hellmann-Feynman); ``False`` forces finite differences everywhere.
    strict
        Raise :class:`~holostring.errors.ConvergenceError` (carrying the partial result) when the
        optimiser does not converge, instead of returning ``converged=False``.

    Returns
    -------
    CalibrationResult

    Examples
    --------
    >>> from holostring.background import load_background
    >>> from holostring.fit.targets import parse_targets
    >>> t = parse_targets({"parameters": {"c": {"free": True}}, "targets": [
    ...     {"observable": "string_tension", "value": 0.2, "uncertainty": 0.01, "unit": "GeV^2"}]})
    >>> round(calibrate(load_background("soft-wall"), t).values["c"], 6)  # sigma = g e c/2
    0.147152
    """
    from scipy.optimize import least_squares

    bg = background.with_units(targets.energy_unit)
    if targets.fixed:
        bg = bg.with_params(**targets.fixed)
    for f in targets.free:
        bg.parameter(f.name)  # unknown names fail here, naming the parameter
        if f.name in targets.fixed:
            raise InputError(f"parameter {f.name}", "is both free and fixed")
    model = _Model(bg, targets.free, exact_gradients)
    obs = [t.observable for t in targets.targets]
    t_val = np.array([t.value * t.factor for t in targets.targets])
    t_unc = np.array([t.uncertainty * t.factor for t in targets.targets])

    start = {f.name: (f.start if f.start is not None else bg.params[f.name]) for f in targets.free}
    u0 = model.to_u(start)
    lower, upper = _bounds(model, bg)
    with np.errstate(invalid="ignore"):
        margin_lo = np.where(np.isfinite(lower), lower + 1e-9 * (np.abs(lower) + 1), -np.inf)
        margin_hi = np.where(np.isfinite(upper), upper - 1e-9 * (np.abs(upper) + 1), np.inf)
    u0 = np.clip(u0, margin_lo, margin_hi)

    def residuals(u: np.ndarray) -> np.ndarray:
        try:
            vals, _ = model.observe(u, obs)
        except HolostringError:
            return np.full(len(obs), 1e6)
        return (vals - t_val) / t_unc

    def jac(u: np.ndarray) -> np.ndarray:
        try:
            return model.gradient(u, obs, 1e-5, richardson=False) / t_unc[:, None]
        except HolostringError:
            return np.zeros((len(obs), len(u)))

    method = "lm" if np.all(np.isinf(lower)) and np.all(np.isinf(upper)) and len(obs) >= len(u0) else "trf"
    fit = least_squares(
        residuals,
        u0,
        jac=jac,
        bounds=(lower, upper),
        method=method,
        x_scale="jac",
        xtol=1e-13,
        ftol=1e-13,
        gtol=1e-13,
        max_nfev=max_evaluations,
    )
    u = fit.x
    params = model.to_params(u)
    final_bg = bg.with_params(**params)
    values, _ = model.observe(u, obs)
    r = (values - t_val) / t_unc
    chi2 = float(r @ r)
    dof = len(obs) - len(u)

    J = model.gradient(u, obs, 1e-4, richardson=True) / t_unc[:, None]
    cov_u = _inverse(J.T @ J)
    dpdu = np.array([params[f.name] if lg else 1.0 for f, lg in zip(targets.free, model.log, strict=True)])
    cov = cov_u * np.outer(dpdu, dpdu)
    sd = np.sqrt(np.clip(np.diag(cov), 0, None))
    with np.errstate(invalid="ignore", divide="ignore"):
        corr = cov / np.outer(sd, sd)

    predictions = _predictions(model, u, cov_u, targets, final_bg)
    converged = bool(fit.success) and np.all(np.isfinite(sd))
    message = fit.message if converged else f"not converged: {fit.message}"
    names = tuple(f.name for f in targets.free)
    result = CalibrationResult(
        background=bg.name,
        names=names,
        values={n: params[n] for n in names},
        uncertainties={n: float(s) for n, s in zip(names, sd, strict=True)},
        covariance=cov,
        correlation=corr,
        units={n: bg.parameter(n).unit(targets.energy_unit) for n in names},
        chi2=chi2,
        dof=dof,
        predictions=predictions,
        converged=converged,
        message=str(message),
        evaluations=model.evaluations,
        parameters=final_bg.params,
        provenance=Provenance(
            bg.name,
            final_bg.params,
            "string",
            {
                "analysis": "calibration",
                "targets": targets.origin,
                "method": f"least_squares/{method}",
                "energy_unit": targets.energy_unit,
                "gradients": dict(model.methods),
            },
        ),
    )
    if strict and not converged:
        raise ConvergenceError(f"calibration of {', '.join(names)}: {message}", result)
    return result


def _bounds(model: _Model, bg: Any) -> tuple[np.ndarray, np.ndarray]:
    lo, hi = [], []
    for f, lg in zip(model.free, model.log, strict=True):
        p = bg.parameter(f.name)
        a, b = max(f.lower, p.lower), min(f.upper, p.upper)
        if lg:
            lo.append(math.log(a) if a > 0 else -math.inf)
            hi.append(math.log(b) if math.isfinite(b) else math.inf)
        else:
            lo.append(a)
            hi.append(b)
    return np.array(lo), np.array(hi)


def _inverse(a: np.ndarray) -> np.ndarray:
    try:
        return np.linalg.inv(a)
    except np.linalg.LinAlgError:
        return np.full_like(a, np.nan)


def _predictions(
    model: _Model, u: np.ndarray, cov_u: np.ndarray, targets: TargetSet, bg: Any
) -> tuple[Prediction, ...]:
    seen: dict[str, tuple[Observable, float | None, float | None, str | None]] = {}
    for t in targets.targets:
        seen[t.observable.spec] = (t.observable, t.value, t.uncertainty, t.unit)
    for o in targets.predict:
        seen.setdefault(o.spec, (o, None, None, None))
    obs = [v[0] for v in seen.values()]
    out = []
    try:
        vals, errs = model.observe(u, obs)
        grads = model.gradient(u, obs, 1e-4, richardson=True)
    except HolostringError:
        vals = np.full(len(obs), np.nan)
        errs = np.full(len(obs), np.nan)
        grads = np.full((len(obs), len(u)), np.nan)
    for i, (o, tval, tunc, tunit) in enumerate(seen.values()):
        if tunit is not None:
            unit, k = tunit, 1.0 / unit_factor(tunit, o.dimension)
        else:
            unit, k = display_unit(o.dimension, targets.energy_unit)
        var = float(grads[i] @ cov_u @ grads[i])
        out.append(
            Prediction(
                o.spec,
                float(vals[i] * k),
                math.sqrt(max(var, 0.0)) * abs(k),
                float(errs[i] * abs(k)),
                unit,
                tval,
                tunc,
            )
        )
    return tuple(out)
