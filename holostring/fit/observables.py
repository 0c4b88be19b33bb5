"""Observables: named quantities the tool computes from a background, with their mass dimension.

An observable is named by a short spec string, the same in target files, the API and the CLI:

==============================  =====  ==========================================================
spec                            dim    meaning
==============================  =====  ==========================================================
``string_tension``              2      sigma (symbolic/certified, background diagnostics)
``sqrt_string_tension``         1      sqrt(sigma)
``coulomb_coefficient_uv``      0      kappa = g 8 pi^3/Gamma(1/4)^4 (asymptotically AdS only)
``coulomb_coefficient``         0      kappa of the Cornell fit of V(L)
``r0`` / ``r1``                 -1     Sommer scales, r^2 dV/dL = 1.65 / 1.0
``mass:CHANNEL:N``              1      N-th mass (N = 0 is the ground state) of a spectral channel
``mass_squared:CHANNEL:N``      2      its square
``ratio:CH1:N1/CH2:N2``         0      mass ratio m(CH1, N1)/m(CH2, N2)
``critical_temperature``        1      Hawking-Page T_c
``screening_length:T=X``        -1     screening length at temperature X (model units)
==============================  =====  ==========================================================

Values are in the model's units (powers of the background's energy unit); :mod:`holostring.units`
converts. Each evaluation returns a :class:`Measurement` with its numerical error estimate.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from typing import Any

from holostring.errors import ConvergenceError, InputError, NotApplicableError

SIMPLE = {
    "string_tension": 2,
    "sqrt_string_tension": 1,
    "coulomb_coefficient_uv": 0,
    "coulomb_coefficient": 0,
    "r0": -1,
    "r1": -1,
    "critical_temperature": 1,
}
_CHANNEL = r"[A-Za-z][A-Za-z0-9_\-]*"
_MASS = re.compile(rf"^(mass|mass_squared):({_CHANNEL}):(\d+)$")
_RATIO = re.compile(rf"^ratio:({_CHANNEL}):(\d+)/({_CHANNEL}):(\d+)$")
_SCREEN = re.compile(r"^screening_length:T=([0-9.eE+\-]+)$")


@dataclass(frozen=True)
class Measurement:
    """A computed value with its numerical error estimate (absolute)."""

    value: float
    error: float

    def to_dict(self) -> dict[str, float]:
        """Plain-JSON view."""
        return {"value": self.value, "error": self.error}


@dataclass(frozen=True)
class Observable:
    """A parsed observable spec.

    Attributes
    ----------
    spec
        The text it was parsed from (canonical).
    kind
        One of the keys of :data:`SIMPLE`, or ``mass``, ``mass_squared``, ``ratio``, ``screening_length``.
    dimension
        Mass dimension of the value.
    args
        Channel names, state numbers or a temperature, by kind.
    """

    spec: str
    kind: str
    dimension: int
    args: tuple[Any, ...] = ()


def parse_observable(spec: str) -> Observable:
    """Parse an observable spec (see the module docstring).

    Raises
    ------
    InputError
        Naming the spec and listing what is accepted.
    """
    if not isinstance(spec, str):
        raise InputError("observable", f"expected text, got {type(spec).__name__}")
    s = spec.strip()
    if s in SIMPLE:
        return Observable(s, s, SIMPLE[s])
    m = _MASS.match(s)
    if m:
        kind = m.group(1)
        return Observable(s, kind, 1 if kind == "mass" else 2, (m.group(2), int(m.group(3))))
    m = _RATIO.match(s)
    if m:
        return Observable(s, "ratio", 0, (m.group(1), int(m.group(2)), m.group(3), int(m.group(4))))
    m = _SCREEN.match(s)
    if m:
        try:
            t = float(m.group(1))
        except ValueError:
            t = math.nan
        if not (math.isfinite(t) and t > 0):
            raise InputError(f"observable {s}", "the temperature must be a positive number")
        return Observable(s, "screening_length", -1, (t,))
    accepted = (
        ", ".join(SIMPLE) + ", mass:CHANNEL:N, mass_squared:CHANNEL:N, ratio:CH:N/CH:N, screening_length:T=X"
    )
    raise InputError(f"observable {s}", f"unknown (accepted: {accepted})")


def evaluate(
    bg: Any, specs: Iterable[str | Observable], cache: dict[str, Any] | None = None
) -> dict[str, Measurement]:
    """Evaluate observables on one background; results of shared solves are reused.

    Parameters
    ----------
    bg
        A :class:`~holostring.background.Background` at the wanted parameter values.
    specs
        Observable specs or parsed observables.
    cache
        Optional dict reused across calls on the same background (solver results by key).

    Returns
    -------
    dict
        spec -> :class:`Measurement`, in the order given.

    Raises
    ------
    HolostringError
        When an observable does not exist for this background (e.g. no string tension) or a
        solver did not converge.
    """
    memo: dict[str, Any] = {} if cache is None else cache
    out: dict[str, Measurement] = {}
    for item in specs:
        obs = item if isinstance(item, Observable) else parse_observable(item)
        out[obs.spec] = _EVALUATORS[obs.kind](bg, obs, memo)
    return out


# --------------------------------------------------------------------------- evaluators
def _memo(memo: dict[str, Any], key: str, compute: Callable[[], Any]) -> Any:
    if key not in memo:
        memo[key] = compute()
    return memo[key]


def _diagnostics(bg: Any, memo: dict[str, Any]) -> Any:
    from holostring.background.diagnostics import diagnose

    return _memo(memo, "diagnostics", lambda: diagnose(bg))


def _sigma(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    d = _diagnostics(bg, memo)
    if not d.confining or d.string_tension is None:
        raise NotApplicableError(f"{obs.spec}: background '{bg.name}' does not confine ({d.criterion})")
    err = d.string_tension_error or 0.0
    if obs.kind == "sqrt_string_tension":
        root = math.sqrt(d.string_tension)
        return Measurement(root, 0.5 * err / root)
    return Measurement(d.string_tension, err)


def _kappa_uv(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    d = _diagnostics(bg, memo)
    if d.coulomb_coefficient is None:
        raise NotApplicableError(f"{obs.spec}: background '{bg.name}' is not asymptotically AdS")
    return Measurement(d.coulomb_coefficient, 0.0)


def _potential(bg: Any, memo: dict[str, Any]) -> Any:
    from holostring.strings import compute_potential

    return _memo(memo, "potential", lambda: compute_potential(bg))


def _from_potential(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    res = _potential(bg, memo)
    value = getattr(res, obs.kind)
    value = getattr(value, "value", value)
    if value is None or not math.isfinite(float(value)):
        notes = getattr(res, "notes", None) or {}
        reason = notes.get(obs.kind) or "no solution"
        raise NotApplicableError(f"{obs.spec}: {reason}")
    err = _error_of(res, obs.kind)
    return Measurement(float(value), err)


def _error_of(res: Any, name: str) -> float:
    errors = getattr(res, "errors", None)
    if isinstance(errors, dict) and name in errors:
        return float(errors[name])
    est = getattr(res, "error_estimate", 0.0)
    if isinstance(est, dict):
        return float(est.get(name, 0.0) or 0.0)
    return float(est or 0.0)


def _spectrum(bg: Any, channel: str, states: int, memo: dict[str, Any]) -> Any:
    from holostring.spectra import solve_spectrum

    key = f"spectrum:{channel}"
    have = memo.get(key)
    if have is None or len(have.masses) < states:
        have = solve_spectrum(bg, channel, states=max(states, 4))
        if not have.converged:
            raise ConvergenceError(f"spectrum of {channel}: {have.message}", have)
        memo[key] = have
    return have


def _mass(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    channel, n = obs.args
    res = _spectrum(bg, channel, n + 1, memo)
    m2 = float(res.masses_squared[n])
    err2 = float(res.error_estimate[n])
    if obs.kind == "mass_squared":
        return Measurement(m2, err2)
    m = math.sqrt(m2)
    return Measurement(m, 0.5 * err2 / m)


def _ratio(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    c1, n1, c2, n2 = obs.args
    a = _mass(bg, Observable("", "mass", 1, (c1, n1)), memo)
    b = _mass(bg, Observable("", "mass", 1, (c2, n2)), memo)
    r = a.value / b.value
    return Measurement(r, r * math.hypot(a.error / a.value, b.error / b.value))


def _transition(bg: Any, memo: dict[str, Any]) -> Any:
    from holostring.thermo import compute_transition

    return _memo(memo, "transition", lambda: compute_transition(bg, points=9))


def _critical_temperature(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    res = _transition(bg, memo)
    value = res.critical_temperature
    if value is None:
        raise NotApplicableError(f"{obs.spec}: {res.message or 'no Hawking-Page transition'}")
    return Measurement(float(value), float(res.critical_temperature_error or 0.0))


def _screening(bg: Any, obs: Observable, memo: dict[str, Any]) -> Measurement:
    import numpy as np

    from holostring.thermo import compute_screening

    (t,) = obs.args
    res = _memo(
        memo,
        f"screening:{t!r}",
        lambda: compute_screening(bg, temperatures=np.array([t]), transition=memo.get("transition")),
    )
    value = float(res.screening_length[0])
    if not np.isfinite(value):
        raise NotApplicableError(f"{obs.spec}: no screening length at T={t:g} ({res.message})")
    return Measurement(value, float(res.errors[0]))


_EVALUATORS: dict[str, Callable[[Any, Observable, dict[str, Any]], Measurement]] = {
    "string_tension": _sigma,
    "sqrt_string_tension": _sigma,
    "coulomb_coefficient_uv": _kappa_uv,
    "coulomb_coefficient": _from_potential,
    "r0": _from_potential,
    "r1": _from_potential,
    "mass": _mass,
    "mass_squared": _mass,
    "ratio": _ratio,
    "critical_temperature": _critical_temperature,
    "screening_length": _screening,
}


# --------------------------------------------------------------------------- exact derivatives
#: how each observable's parameter derivatives are obtained when they are exact
GRADIENT_METHODS = {
    "string_tension": "envelope theorem: d sigma/dp = g dF/dp at the confinement point (F' = 0 there)",
    "sqrt_string_tension": "envelope theorem, chain rule",
    "coulomb_coefficient_uv": "closed form kappa = g 8 pi^3/Gamma(1/4)^4",
    "mass": "Hellmann-Feynman: dm^2/dp = <phi| dQ/dp - m^2 dW/dp |phi> + <phi'| dP/dp |phi'>",
    "mass_squared": "Hellmann-Feynman",
    "ratio": "Hellmann-Feynman, chain rule",
}


def gradient(bg: Any, obs: Observable, names: list[str], memo: dict[str, Any] | None = None) -> Any:
    """Exact derivatives d O / d p for the parameters ``names``, or None when the observable has
    no exact formula here (callers then use finite differences).

    Returns
    -------
    numpy.ndarray or None
        One derivative per name, in the units of the observable per unit of the parameter.
    """
    import numpy as np

    memo = {} if memo is None else memo
    if obs.kind in ("string_tension", "sqrt_string_tension"):
        value = _sigma(bg, Observable("string_tension", "string_tension", 2), memo).value
        d = np.array([_dsigma(bg, name, memo) for name in names])
        return d if obs.kind == "string_tension" else d / (2 * math.sqrt(value))
    if obs.kind == "coulomb_coefficient_uv":
        kappa = _kappa_uv(bg, obs, memo).value
        return np.array([kappa / bg.g if name == "g" else 0.0 for name in names])
    if obs.kind in ("mass", "mass_squared"):
        channel, n = obs.args
        d_m2 = _dmass_squared(bg, channel, n, names)
        if obs.kind == "mass_squared":
            return d_m2
        m = _mass(bg, obs, memo).value
        return d_m2 / (2 * m)
    if obs.kind == "ratio":
        c1, n1, c2, n2 = obs.args
        a = _mass(bg, Observable("", "mass", 1, (c1, n1)), memo).value
        b = _mass(bg, Observable("", "mass", 1, (c2, n2)), memo).value
        da = _dmass_squared(bg, c1, n1, names) / (2 * a)
        db = _dmass_squared(bg, c2, n2, names) / (2 * b)
        return da / b - a * db / b**2
    return None


def _dmass_squared(bg: Any, channel: str, n: int, names: list[str]) -> Any:
    import numpy as np

    from holostring.spectra import mass_squared_gradient

    others = [p for p in names if p != "g"]
    grads = mass_squared_gradient(bg, channel, n, others) if others else {}
    return np.array([0.0 if p == "g" else float(grads[p]) for p in names])


def _dsigma(bg: Any, name: str, memo: dict[str, Any]) -> float:
    """d sigma / d p with sigma = g F(z_m(p), p): F' = 0 at an interior minimum, so only the
    explicit dependence counts; at a wall or cap z_m = z_IR(p) moves with p."""
    import sympy as sp

    from holostring.background.formula import Z

    d = _diagnostics(bg, memo)
    z_m = d.confinement_point
    if name == "g":
        return d.string_tension / bg.g
    sym = bg.symbols[name]
    F = bg.expression("F")
    dF_dp = float(bg.function(sp.diff(F, sym))(z_m))
    interior = not (bg.ir.at is not None and math.isfinite(bg.z_ir) and abs(z_m - bg.z_ir) <= 1e-12 * bg.z_ir)
    if interior:
        return bg.g * dF_dp
    dzir_dp = float(sp.N(sp.diff(bg.ir.at, sym).subs(bg.substitutions())))
    dF_dz = float(bg.function(sp.diff(F, Z))(z_m))
    return bg.g * (dF_dp + dF_dz * dzir_dp)
