"""The entry point :func:`compute_potential`."""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from holostring.background.model import Background
from holostring.provenance import Provenance
from holostring.strings import analysis
from holostring.strings.connected import ConnectedFamily, EndKind
from holostring.strings.potential import (
    RESOLUTIONS,
    Solver,
    build_branches,
    check_tolerance,
    disconnected_branch,
    minimum_energy,
    raise_or_return,
    scheme_offset,
    validate_grid,
)
from holostring.strings.results import PotentialResult, StringBranch
from holostring.strings.schemes import Scheme, as_scheme


def _background(background: Background | str) -> Background:
    if isinstance(background, Background):
        return background
    from holostring.background import load_background

    return load_background(background)


def compute_potential(
    background: Background | str,
    *,
    scheme: str | Scheme = "uv-pole",
    L: Any = None,
    L_range: tuple[float, float] | None = None,
    points: int = 200,
    tol: float = 1e-9,
    strict: bool = False,
    fit_range: tuple[float, float] | None = None,
) -> PotentialResult:
    """The static potential V(L) on every branch, with its analysis.

    Parameters
    ----------
    background
        A :class:`~holostring.background.Background` or a catalogue name / file path.
    scheme
        ``uv-pole`` or ``straight-strings`` (see :mod:`holostring.strings.schemes`).
    L
        Explicit separations (overrides ``L_range`` and ``points``).
    L_range, points
        A linear grid of ``points`` separations on ``(LMIN, LMAX)``; a default range that shows
        the Coulomb and the linear (or screened) regime otherwise.
    tol
        Relative tolerance on V (relative to the local energy scale) for ``converged``.
    strict
        Raise :class:`~holostring.errors.ConvergenceError` (carrying the result) instead of
        returning an unconverged result.
    fit_range
        L range of the Cornell fit (default: the grid's range).

    Returns
    -------
    PotentialResult

    Raises
    ------
    InputError
        Bad grid, range, scheme or tolerance.
    NotApplicableError
        The background has no U-shaped strings (F does not decrease from the boundary), or the
        scheme does not exist for it.
    ConvergenceError
        With ``strict=True`` when an error estimate exceeds the tolerance.

    References
    ----------
    Maldacena, hep-th/9803002; Rey-Yee, hep-th/9803001; Rey-Theisen-Yee, hep-th/9803135;
    Brandhuber et al., hep-th/9803137; Sonnenschein, hep-th/0003032; Sommer, hep-lat/9310022.

    Examples
    --------
    >>> import holostring as hs
    >>> res = hs.compute_potential(hs.load_background("soft-wall", c=1.0), points=50)
    >>> round(res.string_tension_limit, 10)
    1.3591409142
    """
    bg = _background(background)
    sch = as_scheme(scheme)
    tol = check_tolerance(tol)
    fam = ConnectedFamily.build(bg)
    g = bg.g
    grid = validate_grid(L, L_range, points, fam)
    ref = 1.0 if math.isinf(fam.z_end) else fam.z_end
    L_lo = min(float(grid.min()), 0.01 * ref)
    L_hi = float(grid.max())
    if fam.confining:
        L_hi = max(L_hi, 30.0 * ref)
    offset, offset_err = scheme_offset(fam, sch)
    # two resolutions; a finer pair when an estimate is above the tolerance (explicit ladder)
    for m_lo, m_hi in RESOLUTIONS:
        solver = Solver(fam, L_lo, L_hi, m_lo, m_hi)
        raw = build_branches(solver, grid, g, offset, offset_err)
        if fam.end == EndKind.HORIZON:
            raw.append(disconnected_branch(fam, grid, g, offset, offset_err))
        bad = _too_large(raw, tol)
        if not bad:
            break
    V, force, err, _scale, which = minimum_energy(raw, grid)

    notes: dict[str, str] = {}
    errors: dict[str, float] = {}
    messages: list[str] = list(fam.notes)

    # Cornell fit on the minimum-energy strings that are not the disconnected pair
    conn = np.isin(which, [j for j, b in enumerate(raw) if b["kind"] != "disconnected"])
    cornell = analysis.cornell_fit(grid[conn], V[conn], fit_range)
    if cornell is None:
        notes["cornell"] = "fewer than four connected points on the grid"
    elif _asymptotically_ads(bg) is False:
        notes["coulomb_coefficient"] = (
            "not meaningful: the background is not asymptotically AdS, so V(L) has no -kappa/L "
            "Coulomb law at small L; the Cornell kappa and C are fit parameters on the stated "
            "range only"
        )
        messages.append("Cornell kappa " + notes["coulomb_coefficient"])

    # tension: effective (largest L tabulated) and the limit g F(z_end)
    tension = tension_limit = None
    if fam.confining:
        tension_limit = g * fam.end_F()
        wall = next((b for b in raw if b["kind"] == "wall"), None)
        if wall is not None:
            tension = g * wall["F0"]
            notes["string_tension"] = "slope of V along the wall"
        else:
            tension = g * float(solver.F_tab[-1])
            notes["string_tension"] = f"dV/dL = g F(z*) at L = {solver.L_tab[-1]:.6g}"
        errors["string_tension"] = abs(tension - tension_limit)
    else:
        notes["string_tension"] = "not confining: dV/dL falls to zero at large L"

    E_disc = next((b["E"] for b in raw if b["kind"] == "disconnected"), None)
    Ls = None
    if E_disc is not None:
        Ls, e, why = analysis.screening_length(solver, g, offset, E_disc)
        errors["screening_length"] = e
        if why:
            notes["screening_length"] = why
    jumps = analysis.transitions(solver, raw, which, grid, g, offset)
    if jumps:
        notes["transitions"] = (
            "V(L) is multi-valued; the minimum-energy string jumps between branches (first-order "
            "transition, a kink in V) at L = " + ", ".join(f"{x[0]:.10g}" for x in jumps)
        )
    Lmax, e = analysis.max_separation(solver)
    if Lmax is not None:
        errors["max_separation"] = e

    r0, e0, why0 = analysis.sommer_scale(analysis.SOMMER_R0, solver, raw, g, offset)
    r1, e1, why1 = analysis.sommer_scale(analysis.SOMMER_R1, solver, raw, g, offset)
    errors["r0"], errors["r1"] = e0, e1
    if why0:
        notes["r0"] = why0
    if why1:
        notes["r1"] = why1

    branches = tuple(
        StringBranch(
            kind=b["kind"],
            stable=b["stable"],
            L=b["L"],
            V=b["V"],
            zstar=b["zstar"],
            error=b["error"],
            L_range=tuple(float(x) for x in b["L_range"]),
            label=b["label"],
            minimum=which[b["mask"]] == j,
        )
        for j, b in enumerate(raw)
    )
    finite = np.isfinite(V)
    if not np.all(finite):
        messages.append(f"no string configuration at {int((~finite).sum())} grid separations")
    for b in bad:
        k = int(np.argmax(b["error"] / b["scale"]))
        messages.append(
            f"{b['label']}: error estimate {b['error'][k]:.2e} above tol {tol:g} x scale "
            f"{b['scale'][k]:.3g} at L = {b['L'][k]:.6g}"
        )
    for key, val in errors.items():
        ref_val = {
            "r0": r0,
            "r1": r1,
            "screening_length": Ls,
            "max_separation": Lmax,
            "string_tension": tension_limit,
        }.get(key)
        if ref_val and val > max(tol, 1e-12) * abs(ref_val) * 10:
            messages.append(f"{key}: error estimate {val:.2e} is above the tolerance")
    error_estimate = float(np.nanmax(err)) if err.size else 0.0
    converged = not bad and all(
        not (v and errors.get(k, 0.0) > max(tol, 1e-12) * abs(v) * 10)
        for k, v in (("r0", r0), ("r1", r1), ("screening_length", Ls), ("max_separation", Lmax))
    )
    message = "; ".join(messages) if messages else "converged"
    prov = Provenance(
        background=bg.name,
        parameters=dict(bg.params),
        frame="string",
        settings={
            "scheme": str(sch),
            "gauss_points_per_panel": [solver.m_lo, solver.m_hi],
            "tol": tol,
            "end_kind": fam.end,
            "uv_subtraction": fam.uv.text,
            "table_p_range": [solver.p_lo, solver.p_hi],
        },
    )
    res = PotentialResult(
        L=grid,
        V=V,
        force=force,
        branch_of_minimum=which,
        branches=branches,
        scheme=str(sch),
        scheme_offset=g * offset if sch != Scheme.UV_POLE else 0.0,
        string_tension=tension,
        string_tension_limit=tension_limit,
        coulomb_coefficient=None if cornell is None else cornell.kappa,
        constant=None if cornell is None else cornell.C,
        cornell=cornell,
        r0=r0,
        r1=r1,
        max_separation=Lmax,
        screening_length=Ls,
        error_estimate=error_estimate,
        converged=converged,
        message=message,
        provenance=prov,
        confinement_point=fam.z_end if fam.confining else None,
        end_kind=fam.end,
        notes=notes,
        errors=errors,
        physical=_physical(bg, tension, cornell, r0, r1, Lmax, Ls),
        transitions=tuple((x[0], x[1]) for x in jumps),
    )
    return raise_or_return(res, strict)


def _asymptotically_ads(bg: Background) -> bool | None:
    """The UV part of diagnose(bg).asymptotically_ads (None when it cannot be made).

    Only the UV limits are taken (memoised per metric structure): the full diagnosis also
    solves for the confinement point symbolically, which can take seconds.
    """
    try:
        from holostring.background.diagnostics import uv_behaviour

        return bool(uv_behaviour(bg)[0])
    except Exception:  # the diagnosis is an optional annotation here, never a failure
        return None


def _too_large(raw: list[dict], tol: float) -> list[dict]:
    """Branches with an error estimate above ``tol`` times their energy scale."""
    return [b for b in raw if b["L"].size and np.any(b["error"] > tol * np.maximum(b["scale"], 1e-300))]


def _physical(bg: Background, tension, cornell, r0, r1, Lmax, Ls) -> dict[str, Any] | None:
    """Main numbers in GeV and fm when the background's parameters carry an energy unit."""
    if bg.energy_unit is None:
        return None
    from holostring.units import energy_in_gev, length_in_fm

    u = bg.energy_unit

    def fm(x):
        return None if x is None else length_in_fm(x, u)

    out = {
        "energy_unit": u,
        "string_tension_GeV2": None if tension is None else energy_in_gev(tension, u, 2.0),
        "sqrt_string_tension_GeV": None if tension is None else energy_in_gev(math.sqrt(tension), u),
        "r0_fm": fm(r0),
        "r1_fm": fm(r1),
        "max_separation_fm": fm(Lmax),
        "screening_length_fm": fm(Ls),
    }
    if cornell is not None:
        out["constant_GeV"] = energy_in_gev(cornell.C, u)
        out["coulomb_coefficient"] = cornell.kappa
    return out
