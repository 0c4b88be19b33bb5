"""Screening of a static quark pair in the black-brane phase, versus temperature.

In the black brane the connected U-shaped string exists only up to a largest separation
L_max(T); the disconnected pair of straight strings to the horizon takes over at the screening
length L_s(T) < L_max(T), where the two energies cross (Rey-Theisen-Yee hep-th/9803135;
Brandhuber-Itzhaki-Sonnenschein-Yankielowicz hep-th/9803137). Both come from the static-string
solver :func:`holostring.strings.compute_potential` at each temperature; this module only scans T,
collects the numbers and checks them. For the AdS5 black brane L_max pi T = 0.869 and
L_s pi T = 0.754, exactly proportional to 1/T.

Below T_c the thermal geometry (no horizon, T-independent) dominates, so the effective string
tension there equals the zero-temperature one (Herzog hep-th/0608151). Above T_c the tension of
spatial Wilson loops is sigma_s(T) = g G_xx(z_h) in the string frame (the string lies along the
horizon).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from holostring.background.model import Background
from holostring.errors import ConvergenceError, HolostringError, InputError, NotApplicableError
from holostring.provenance import Provenance
from holostring.thermo.partners import ThermalFamily, thermal_family
from holostring.thermo.results import ScreeningResult, TransitionResult


def _temperature_grid(
    fam: ThermalFamily,
    t_c: float | None,
    temperatures: Any,
    t_range: tuple[float, float] | None,
    points: int,
) -> np.ndarray:
    if temperatures is not None:
        temps = np.asarray(temperatures, dtype=float).reshape(-1)
        if temps.size == 0 or not np.all(np.isfinite(temps)) or np.any(temps <= 0):
            raise InputError("temperatures", "must be positive finite numbers")
        return temps
    if points < 2:
        raise InputError("points", f"need at least 2 temperatures, got {points}")
    if t_range is None:
        if t_c is not None:
            t_range = (t_c, 3.0 * t_c)
        else:
            zh0 = 0.9 * fam.wall if math.isfinite(fam.wall) else 2.0 * fam.scale
            ts = fam.temperature(np.array([zh0, zh0 / 8]))
            t_range = (float(min(ts)), float(max(ts)))
    lo, hi = t_range
    if not (0 < lo < hi and math.isfinite(hi)):
        raise InputError("t_range", f"need 0 < T_min < T_max, got ({lo:g}, {hi:g})")
    return np.linspace(lo, hi, points)


def compute_screening(
    background: Background | ThermalFamily,
    *,
    transition: TransitionResult | None = None,
    temperatures: Any = None,
    t_range: tuple[float, float] | None = None,
    points: int = 12,
    scheme: str = "uv-pole",
    tol: float = 1e-9,
    strict: bool = False,
) -> ScreeningResult:
    """Largest separation and screening length of the static string versus temperature.

    Parameters
    ----------
    background
        A zero-temperature background or a black brane (see
        :func:`holostring.thermo.thermal_family`), or a :class:`ThermalFamily`.
    transition
        A :class:`TransitionResult` for the same background (its T_c sets the default range);
        computed when omitted.
    temperatures
        Explicit temperatures (overrides ``t_range`` and ``points``).
    t_range
        (T_min, T_max); default (T_c, 3 T_c), or a range of z_h around the model scale when
        there is no transition.
    points
        Number of temperatures.
    scheme, tol
        Passed to :func:`holostring.strings.compute_potential`.
    strict
        Raise :class:`~holostring.errors.ConvergenceError` when a temperature did not converge.

    Returns
    -------
    ScreeningResult

    Raises
    ------
    InputError
        For invalid temperatures or ranges.
    ConvergenceError
        With ``strict=True`` when the string solver did not converge somewhere.

    References
    ----------
    Rey-Theisen-Yee, Nucl. Phys. B 527 (1998) 171, hep-th/9803135; Brandhuber et al., Phys. Lett.
    B 434 (1998) 36, hep-th/9803137; Herzog, hep-th/0608151.

    Examples
    --------
    >>> from holostring.background import load_background
    >>> res = compute_screening(load_background("ads"), temperatures=[0.5])  # doctest: +SKIP
    >>> round(res.max_separation[0] * 3.14159265 * 0.5, 3)  # doctest: +SKIP
    0.869
    """
    try:
        from holostring.strings import compute_potential
    except ImportError:
        raise NotApplicableError(
            "screening needs the static-string solver holostring.strings.compute_potential, "
            "which this installation lacks"
        ) from None

    fam = background if isinstance(background, ThermalFamily) else thermal_family(background)
    t_c = None
    if transition is None and temperatures is None and t_range is None:
        from holostring.thermo.hawking_page import compute_transition

        transition = compute_transition(fam)
    if transition is not None:
        t_c = transition.critical_temperature
    temps = _temperature_grid(fam, t_c, temperatures, t_range, points)
    horizons = np.array([fam.horizon_for(t) for t in temps])
    n = temps.size
    lmax, ls, errs = np.full(n, math.nan), np.full(n, math.nan), np.full(n, math.nan)
    ok = np.zeros(n, dtype=bool)
    messages: list[str] = []
    g = fam.g
    for i, zh in enumerate(horizons):
        if zh >= fam.wall:
            messages.append(f"T={temps[i]:.6g}: horizon behind the wall, no black brane")
            continue
        bb = fam.at(zh)
        try:
            pot = compute_potential(bb, scheme=scheme, tol=tol, strict=False)
        except HolostringError as err:
            messages.append(f"T={temps[i]:.6g}: {err}")
            continue
        if pot.max_separation is not None:
            lmax[i] = pot.max_separation
        if pot.screening_length is not None:
            ls[i] = pot.screening_length
        errs[i] = float(pot.error_estimate) if pot.error_estimate is not None else math.nan
        ok[i] = bool(pot.converged)
        if not pot.converged:
            messages.append(f"T={temps[i]:.6g}: string solver not converged ({pot.message})")
    gxx = fam.black_brane.raw_function("G_xx")
    names = [p.name for p in fam.black_brane.parameters]
    k = names.index(fam.horizon)
    sigma_s = np.empty(n)
    for i, zh in enumerate(horizons):
        vals = list(fam.black_brane.values)
        vals[k] = float(zh)
        sigma_s[i] = g * float(np.real(gxx(np.array([zh]), *vals)[0])) if zh < fam.wall else math.nan
    sigma0 = None
    try:
        sigma0 = compute_potential(fam.thermal, scheme=scheme, tol=tol, strict=False).string_tension
    except HolostringError as err:
        messages.append(f"zero-temperature string tension: {err}")
    converged = bool(np.all(ok))
    finite = errs[np.isfinite(errs)]
    result = ScreeningResult(
        background=fam.name,
        temperatures=temps,
        horizons=horizons,
        max_separation=lmax,
        screening_length=ls,
        errors=errs,
        converged_points=ok,
        spatial_string_tension=sigma_s,
        string_tension_below=None if sigma0 is None else float(sigma0),
        critical_temperature=t_c,
        energy_unit=fam.energy_unit,
        converged=converged,
        message="; ".join(messages) or "ok",
        error_estimate=float(finite.max()) if finite.size else math.nan,
        provenance=Provenance(
            background=fam.name,
            parameters=fam.thermal.params,
            frame="string",
            settings={"scheme": scheme, "tol": tol, "points": int(n), "construction": fam.construction},
        ),
    )
    if strict and not converged:
        raise ConvergenceError(result.message, result)
    return result
