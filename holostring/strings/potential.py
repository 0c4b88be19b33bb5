"""V(L) on every branch: connected strings, strings along a wall, disconnected pairs.

The connected family is tabulated in its parameter p (see connected.py), cut into pieces on
which L(p) is monotone (maxima and minima refined by a scalar optimiser), and V is computed on the
user's grid by solving L(p) = L on each piece (vectorised Illinois iteration), never by
interpolation. Every value is computed at two resolutions; their difference is the error estimate.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass

import numpy as np

from holostring.errors import ConvergenceError, InputError
from holostring.strings.connected import ConnectedFamily, EndKind
from holostring.strings.schemes import Scheme, straight_pair_energy

#: Gauss points per panel for the two resolutions (error estimate = difference), finest last:
#: compute_potential moves to the next pair when an error estimate is above the tolerance.
RESOLUTIONS = ((9, 12), (12, 16), (16, 24))
M_LO, M_HI = RESOLUTIONS[0]
TABLE_POINTS = 240


@dataclass
class Piece:
    """A monotone piece of the connected family: p in [pa, pb]."""

    pa: float
    pb: float
    La: float
    Lb: float
    increasing: bool
    p_tab: np.ndarray
    L_tab: np.ndarray

    @property
    def L_range(self) -> tuple[float, float]:
        return (min(self.La, self.Lb), max(self.La, self.Lb))


class Solver:
    """The connected family of one background, tabulated, with root finding in L (internal)."""

    def __init__(
        self, fam: ConnectedFamily, L_lo: float, L_hi: float, m_lo: int = M_LO, m_hi: int = M_HI
    ) -> None:
        self.fam = fam
        self.m_lo, self.m_hi = int(m_lo), int(m_hi)
        self.p_lo, self.p_hi = self._p_limits(L_lo, L_hi)
        p = np.linspace(self.p_lo, self.p_hi, TABLE_POINTS)
        r = fam.evaluate(p, self.m_hi)
        self.p_tab, self.L_tab, self.W_tab, self.F_tab = p, r["L"], r["W"], r["Fstar"]
        self.pieces = self._pieces()

    def L(self, p: np.ndarray) -> np.ndarray:
        return self.fam.evaluate(np.atleast_1d(p), self.m_hi)["L"]

    def _p_limits(self, L_lo: float, L_hi: float) -> tuple[float, float]:
        fam = self.fam
        ref = 1.0 if math.isinf(fam.z_end) else fam.z_end
        p_lo = math.log(L_lo / ref) - 2.0
        for _ in range(40):
            if self.L(p_lo)[0] < L_lo:
                break
            p_lo -= 3.0
        if fam.end in (EndKind.HORIZON,):
            return p_lo, 40.0
        if fam.end in (EndKind.WALL, EndKind.END):
            return p_lo, 60.0  # expit(60) == 1: the last point is the end itself
        p_hi = 8.0 if fam.end != EndKind.OPEN else math.log(L_hi / ref) + 2.0
        prev = None
        for _ in range(60):
            Lh = self.L(p_hi)[0]
            if Lh > 1.05 * L_hi or p_hi >= 700:
                break
            if fam.end == EndKind.OPEN:
                p_hi += 3.0
                continue
            step = 4.0
            if prev is not None and Lh > prev[1]:
                slope = (Lh - prev[1]) / (p_hi - prev[0])
                step = max(step, 1.1 * (1.05 * L_hi - Lh) / slope)
            prev = (p_hi, Lh)
            p_hi = min(700.0, p_hi + step)
        return p_lo, p_hi

    def _pieces(self) -> list[Piece]:
        from scipy.optimize import minimize_scalar

        p, L = self.p_tab, self.L_tab
        d = np.diff(L)
        sgn = np.sign(d)
        ext = [i for i in range(1, len(sgn)) if sgn[i] != 0 and sgn[i - 1] != 0 and sgn[i] != sgn[i - 1]]
        cuts = [(p[0], L[0])]
        for i in ext:
            s = 1.0 if sgn[i - 1] > 0 else -1.0  # a maximum when L was rising
            res = minimize_scalar(
                lambda x, s=s: -s * float(self.L(x)[0]),
                bounds=(p[i - 1], p[i + 1]),
                method="bounded",
                options={"xatol": 1e-11},
            )
            cuts.append((float(res.x), float(self.L(res.x)[0])))
        cuts.append((p[-1], L[-1]))
        pieces = []
        for (pa, La), (pb, Lb) in itertools.pairwise(cuts):
            inside = (p > pa) & (p < pb)
            pt = np.concatenate([[pa], p[inside], [pb]])
            Lt = np.concatenate([[La], L[inside], [Lb]])
            pieces.append(Piece(pa, pb, La, Lb, Lb > La, pt, Lt))
        return pieces

    def solve(self, piece: Piece, targets: np.ndarray) -> np.ndarray:
        """p with L(p) = target on a monotone piece (vectorised Illinois / regula falsi)."""
        T = np.asarray(targets, dtype=float)
        Lt, pt = piece.L_tab, piece.p_tab
        if not piece.increasing:
            Lt, pt = Lt[::-1], pt[::-1]
        Lt = np.maximum.accumulate(Lt)
        k = np.clip(np.searchsorted(Lt, T), 1, len(Lt) - 1)
        a, b = pt[k - 1].copy(), pt[k].copy()
        fa, fb = Lt[k - 1] - T, Lt[k] - T
        out = np.where(fa == 0, a, np.where(fb == 0, b, np.nan))
        active = np.isnan(out)
        for _ in range(100):
            if not np.any(active):
                break
            idx = np.nonzero(active)[0]
            ai, bi, fai, fbi = a[idx], b[idx], fa[idx], fb[idx]
            with np.errstate(all="ignore"):
                c = bi - fbi * (bi - ai) / (fbi - fai)
            bad = ~np.isfinite(c) | (c <= np.minimum(ai, bi)) | (c >= np.maximum(ai, bi))
            c = np.where(bad, 0.5 * (ai + bi), c)
            fc = self.L(c) - T[idx]
            flip = np.sign(fc) != np.sign(fbi)
            new_a = np.where(flip, bi, ai)
            new_fa = np.where(flip, fbi, 0.5 * fai)
            a[idx], fa[idx], b[idx], fb[idx] = new_a, new_fa, c, fc
            done = (np.abs(fc) <= 2e-16 * np.abs(T[idx])) | (np.abs(c - new_a) <= 1e-15 * (1.0 + np.abs(c)))
            out[idx[done]] = c[done]
            active[idx[done]] = False
        out[active] = b[active]
        return out


def default_range(fam: ConnectedFamily) -> tuple[float, float]:
    """A sensible L range: Coulomb to well into the linear regime, or up to beyond L_max."""
    ref = 1.0 if math.isinf(fam.z_end) else fam.z_end
    if fam.end == EndKind.HORIZON:
        return 0.05 * ref, 1.5 * ref
    if fam.end == EndKind.OPEN:
        return 0.1, 10.0
    return 0.05 * ref, 10.0 * ref


def validate_grid(L, L_range, points: int, fam: ConnectedFamily) -> np.ndarray:
    """The L grid from explicit values or a range, checked."""
    if L is not None:
        grid = np.atleast_1d(np.asarray(L, dtype=float))
        if grid.ndim != 1 or grid.size == 0:
            raise InputError("L", "must be a non-empty list of separations")
        if not np.all(np.isfinite(grid)) or np.any(grid <= 0):
            raise InputError("L", "separations must be finite and positive")
        return grid
    if isinstance(points, bool) or int(points) != points or points < 2:
        raise InputError("points", f"must be an integer >= 2, got {points}")
    if points > 100_000:
        raise InputError("points", f"{points} is more than 100000")
    lo, hi = default_range(fam) if L_range is None else L_range
    lo, hi = float(lo), float(hi)
    if not (math.isfinite(lo) and math.isfinite(hi)) or lo <= 0 or hi <= lo:
        raise InputError("range", f"need 0 < LMIN < LMAX, got {lo:g}:{hi:g}")
    return np.linspace(lo, hi, int(points))


def check_tolerance(tol: float) -> float:
    """Validate the tolerance."""
    if isinstance(tol, bool) or not isinstance(tol, int | float) or not (1e-15 <= tol <= 1e-1):
        raise InputError("tol", f"must be a number between 1e-15 and 0.1, got {tol}")
    return float(tol)


def pair_energy(fam: ConnectedFamily) -> tuple[float, float]:
    """(value, error) of two straight strings to the IR end in the uv-pole scheme (without g)."""
    return straight_pair_energy(fam.bg, fam.uv, fam.H, fam.H_near_end if fam.anchor is not None else None)


def scheme_offset(fam: ConnectedFamily, scheme: Scheme) -> tuple[float, float]:
    """Constant subtracted from uv-pole energies (without g) for ``scheme``, and its error."""
    if scheme == Scheme.UV_POLE:
        return 0.0, 0.0
    return pair_energy(fam)


def build_branches(
    solver: Solver, grid: np.ndarray, g: float, offset: float, offset_err: float
) -> list[dict]:
    """Every branch on the grid as plain dicts (internal)."""
    fam = solver.fam
    out = []
    n_conn = sum(1 for _ in solver.pieces)
    for i, piece in enumerate(solver.pieces):
        lo, hi = piece.L_range
        sel = (grid >= lo) & (grid <= hi)
        T = grid[sel]
        if T.size:
            p = solver.solve(piece, T)
            r_hi = fam.evaluate(p, solver.m_hi)
            r_lo = fam.evaluate(p, solver.m_lo)
            V = g * (r_hi["W"] + r_hi["Fstar"] * T - offset)
            err = g * (np.abs(r_hi["W"] - r_lo["W"]) + offset_err)
            scale = g * np.maximum.reduce([np.abs(r_hi["W"]), r_hi["Fstar"] * T, np.abs(V / g)])
            zs, Fs = r_hi["zstar"], r_hi["Fstar"]
        else:
            p = V = err = scale = zs = Fs = np.empty(0)
        label = (
            "connected"
            if n_conn == 1
            else (f"connected {i + 1} ({'stable' if piece.increasing else 'unstable'})")
        )
        out.append(
            {
                "kind": "connected",
                "stable": bool(piece.increasing),
                "mask": sel,
                "L": T,
                "V": V,
                "error": err,
                "scale": scale,
                "zstar": zs,
                "force": g * Fs,
                "p": p,
                "L_range": piece.L_range,
                "piece": piece,
                "label": label,
            }
        )
    if fam.end == EndKind.WALL:
        p_end = np.array([solver.p_hi])
        r_hi, r_lo = fam.evaluate(p_end, solver.m_hi), fam.evaluate(p_end, solver.m_lo)
        L0, F0 = float(r_hi["L"][0]), float(r_hi["Fstar"][0])
        E0 = g * (float(r_hi["W"][0]) + F0 * L0 - offset)
        e0 = g * (abs(float(r_hi["W"][0] - r_lo["W"][0])) + offset_err)
        sel = grid > L0
        T = grid[sel]
        V = E0 + g * F0 * (T - L0)
        out.append(
            {
                "kind": "wall",
                "stable": True,
                "mask": sel,
                "L": T,
                "V": V,
                "error": np.full(T.shape, e0),
                "scale": np.maximum(np.abs(V), g * F0 * T),
                "zstar": np.full(T.shape, fam.z_end),
                "force": np.full(T.shape, g * F0),
                "p": np.full(T.shape, np.inf),
                "L_range": (L0, math.inf),
                "L0": L0,
                "E0": E0,
                "F0": F0,
                "label": "along the wall",
            }
        )
    return out


def disconnected_branch(
    fam: ConnectedFamily, grid: np.ndarray, g: float, offset: float, offset_err: float
) -> dict:
    """Two straight strings to the horizon: V constant (internal)."""
    E, e = pair_energy(fam)
    val = g * (E - offset)
    err = g * (e + offset_err)
    n = grid.size
    return {
        "kind": "disconnected",
        "stable": True,
        "mask": np.ones(n, bool),
        "L": grid.copy(),
        "V": np.full(n, val),
        "error": np.full(n, err),
        "scale": np.full(n, g * abs(E)),
        "zstar": np.full(n, np.nan),
        "force": np.zeros(n),
        "p": np.full(n, np.nan),
        "L_range": (0.0, math.inf),
        "label": "disconnected (two straight strings)",
        "E": val,
    }


def minimum_energy(branches: list[dict], grid: np.ndarray) -> tuple[np.ndarray, ...]:
    """V, force, error, scale and branch index of the minimum-energy configuration (internal)."""
    n = grid.size
    V = np.full(n, np.nan)
    force = np.full(n, np.nan)
    err = np.zeros(n)
    scale = np.ones(n)
    which = np.full(n, -1)
    for j, b in enumerate(branches):
        idx = np.nonzero(b["mask"])[0]
        if idx.size == 0:
            continue
        better = np.isnan(V[idx]) | (b["V"] < V[idx])
        k = idx[better]
        V[k] = b["V"][better]
        force[k] = b["force"][better]
        err[k] = b["error"][better]
        scale[k] = b["scale"][better]
        which[k] = j
    return V, force, err, scale, which


def raise_or_return(result, strict: bool):
    """Strict mode: raise ConvergenceError carrying the result when it did not converge."""
    if strict and not result.converged:
        raise ConvergenceError(result.message, partial=result)
    return result
