"""Analysis of V(L): Cornell fit, Sommer scales, screening length, maximal separation.

References
----------
Sommer, Nucl. Phys. B 411 (1994) 839, hep-lat/9310022 (r0: r^2 F(r) = 1.65; r1: r^2 F = 1.0).
Eichten et al., Phys. Rev. D 17 (1978) 3090 (the Cornell potential).
"""

from __future__ import annotations

import math

import numpy as np

from holostring.strings.potential import Piece, Solver
from holostring.strings.results import CornellFit

SOMMER_R0 = 1.65
SOMMER_R1 = 1.0


def cornell_fit(
    L: np.ndarray,
    V: np.ndarray,
    L_range: tuple[float, float] | None = None,
) -> CornellFit | None:
    """Fit V = -kappa/L + sigma L + C by linear least squares with uniform weights.

    Parameters
    ----------
    L, V
        Samples (NaN entries ignored).
    L_range
        Fit range (default: all finite samples).

    Returns
    -------
    CornellFit or None
        None when fewer than four samples lie in the range.
    """
    L = np.asarray(L, dtype=float)
    V = np.asarray(V, dtype=float)
    ok = np.isfinite(L) & np.isfinite(V)
    if L_range is not None:
        ok &= (L >= L_range[0]) & (L <= L_range[1])
    Lf, Vf = L[ok], V[ok]
    if Lf.size < 4:
        return None
    X = np.stack([-1.0 / Lf, Lf, np.ones_like(Lf)], axis=1)
    # column scaling keeps the normal matrix well conditioned
    s = np.sqrt(np.sum(X * X, axis=0))
    coef, *_ = np.linalg.lstsq(X / s, Vf, rcond=None)
    coef = coef / s
    resid = Vf - X @ coef
    dof = max(Lf.size - 3, 1)
    s2 = float(resid @ resid) / dof
    cov = s2 * np.linalg.pinv(X.T @ X)
    rng = (float(Lf.min()), float(Lf.max())) if L_range is None else (float(L_range[0]), float(L_range[1]))
    return CornellFit(
        kappa=float(coef[0]),
        sigma=float(coef[1]),
        C=float(coef[2]),
        covariance=cov,
        L_range=rng,
        points=int(Lf.size),
        rms=math.sqrt(float(resid @ resid) / Lf.size),
    )


def piece_energy(
    solver: Solver, p: np.ndarray, g: float, offset: float, m: int | None = None
) -> dict[str, np.ndarray]:
    """L, V, F*, z* of connected strings at parameters p (internal; m: the solver's finer one)."""
    r = solver.fam.evaluate(np.atleast_1d(p), solver.m_hi if m is None else m)
    r["V"] = g * (r["W"] + r["Fstar"] * r["L"] - offset)
    return r


def _root_in_p(fun, a: float, b: float) -> float:
    from scipy.optimize import brentq

    return float(brentq(fun, a, b, xtol=1e-14, rtol=1e-14, maxiter=200))


def screening_length(
    solver: Solver, g: float, offset: float, E_disc: float
) -> tuple[float | None, float, str]:
    """Smallest L where the stable connected string's energy reaches the disconnected pair's.

    Returns
    -------
    value, error_estimate, note
    """
    piece = next((pc for pc in solver.pieces if pc.increasing), None)
    if piece is None:
        return None, 0.0, "no stable connected branch"
    p = piece.p_tab
    V = piece_energy(solver, p, g, offset)["V"] - E_disc
    idx = np.nonzero((V[:-1] < 0) & (V[1:] >= 0))[0]
    if not idx.size:
        return None, 0.0, "the connected string stays below the disconnected pair on its whole range"
    i = int(idx[0])
    out = []
    for m in (solver.m_hi, solver.m_lo):
        pr = _root_in_p(
            lambda x, m=m: float(piece_energy(solver, x, g, offset, m)["V"][0] - E_disc), p[i], p[i + 1]
        )
        out.append(float(solver.fam.evaluate(np.array([pr]), m)["L"][0]))
    return out[0], abs(out[0] - out[1]), ""


def max_separation(solver: Solver) -> tuple[float | None, float]:
    """Largest L of connected strings when it is finite (black branes), with its error."""
    fam = solver.fam
    from holostring.strings.connected import EndKind

    if fam.end not in (EndKind.HORIZON, EndKind.END):
        return None, 0.0
    best = max(solver.pieces, key=lambda pc: max(pc.La, pc.Lb))
    p = best.pb if best.Lb >= best.La else best.pa
    hi = float(fam.evaluate(np.array([p]), solver.m_hi)["L"][0])
    lo = float(fam.evaluate(np.array([p]), solver.m_lo)["L"][0])
    return hi, abs(hi - lo)


def sommer_scale(
    target: float,
    solver: Solver,
    branches: list[dict],
    g: float,
    offset: float,
) -> tuple[float | None, float, str]:
    """Separation r with r^2 dV/dL = target on the minimum-energy configuration.

    Returns
    -------
    value, error_estimate, reason
        ``value`` None with the reason when there is no solution.
    """
    roots: list[tuple[float, float]] = []
    values: list[float] = []
    for b in branches:
        if b["kind"] == "wall":
            r = math.sqrt(target / (g * b["F0"]))
            values.append(g * b["F0"] * b["L0"] ** 2)
            if r >= b["L0"] and _is_minimum(
                r, b["E0"] + g * b["F0"] * (r - b["L0"]), solver, branches, g, offset, skip=b
            ):
                roots.append((r, 0.0))
        if b["kind"] != "connected" or not b["stable"]:
            continue
        piece: Piece = b["piece"]
        r_tab = piece_energy(solver, piece.p_tab, g, offset)
        G = r_tab["L"] ** 2 * g * r_tab["Fstar"] - target
        values.extend((G + target).tolist())
        for i in np.nonzero(np.sign(G[:-1]) != np.sign(G[1:]))[0]:
            est = []
            for m in (solver.m_hi, solver.m_lo):

                def fun(x, m=m):
                    rr = solver.fam.evaluate(np.array([x]), m)
                    return float(rr["L"][0] ** 2 * g * rr["Fstar"][0] - target)

                pr = _root_in_p(fun, piece.p_tab[i], piece.p_tab[i + 1])
                est.append(pr)
            rr = piece_energy(solver, np.array(est), g, offset)
            r = float(rr["L"][0])
            if _is_minimum(r, float(rr["V"][0]), solver, branches, g, offset, skip=b):
                roots.append((r, abs(float(rr["L"][0] - rr["L"][1]))))
    if roots:
        r, e = min(roots)
        return r, e, ""
    if not values:
        return None, 0.0, "no stable string branch"
    lo, hi = float(np.nanmin(values)), float(np.nanmax(values))
    return (
        None,
        0.0,
        (
            f"no solution: r^2 dV/dL on the minimum-energy strings stays within [{lo:.4g}, {hi:.4g}]"
            f" and does not reach {target:g}"
        ),
    )


def _is_minimum(
    r: float, V: float, solver: Solver, branches: list[dict], g: float, offset: float, skip: dict
) -> bool:
    """Whether energy V at separation r is the lowest among all branches there."""
    for b in branches:
        if b is skip:
            continue
        lo, hi = b["L_range"]
        if not (lo <= r <= hi):
            continue
        if b["kind"] == "disconnected":
            other = b["E"]
        elif b["kind"] == "wall":
            other = b["E0"] + g * b["F0"] * (r - b["L0"])
        else:
            p = solver.solve(b["piece"], np.array([r]))
            other = float(piece_energy(solver, p, g, offset)["V"][0])
        if other < V - 1e-12 * max(abs(V), 1.0):
            return False
    return True


def branch_energy(
    solver: Solver, branch: dict, L: float, g: float, offset: float, m: int | None = None
) -> float:
    """Energy of one connected or wall branch at separation L (internal)."""
    if branch["kind"] == "wall":
        return branch["E0"] + g * branch["F0"] * (L - branch["L0"])
    if branch["kind"] == "disconnected":
        return branch["E"]
    p = solver.solve(branch["piece"], np.array([L]))
    return float(piece_energy(solver, p, g, offset, m)["V"][0])


def transitions(
    solver: Solver, branches: list[dict], which: np.ndarray, grid: np.ndarray, g: float, offset: float
) -> list[tuple[float, float, int, int]]:
    """Separations where the minimum-energy string jumps from one branch to another.

    Between neighbouring grid points whose minimum lies on different branches (other than the
    disconnected pair, whose crossing is the screening length) the energies are equated by
    Brent's method, at both resolutions.

    Returns
    -------
    list of (L_c, error_estimate, branch_before, branch_after)
    """
    from scipy.optimize import brentq

    out = []
    order = np.argsort(grid)
    Ls, w = grid[order], which[order]
    for k in np.nonzero((w[:-1] != w[1:]) & (w[:-1] >= 0) & (w[1:] >= 0))[0]:
        i, j = int(w[k]), int(w[k + 1])
        bi, bj = branches[i], branches[j]
        if "disconnected" in (bi["kind"], bj["kind"]):
            continue
        lo = max(Ls[k], bi["L_range"][0], bj["L_range"][0])
        hi = min(Ls[k + 1], bi["L_range"][1], bj["L_range"][1])
        est = []
        for m in (solver.m_hi, solver.m_lo):

            def diff(L, m=m, bi=bi, bj=bj):
                return branch_energy(solver, bi, L, g, offset, m) - branch_energy(solver, bj, L, g, offset, m)

            try:
                est.append(brentq(diff, lo, hi, xtol=1e-14, rtol=1e-14, maxiter=200))
            except ValueError:  # the branches do not cross inside: the switch is an end point
                break
        if len(est) == 2:
            out.append((float(est[0]), abs(est[0] - est[1]), i, j))
    return out
