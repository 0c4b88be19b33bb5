"""The spectral solver: masses, modes and U(z) of a channel on a background.

Method. The field is written phi = s(z) u(z); s carries the UV behaviour z^Delta (and, on a half
line, the WKB-like factor z^kappa (P W)^{-1/4} so that u decays like the Schrodinger function).
The smooth u is expanded in Chebyshev polynomials of degree N on [0, z_end] (z_end: the wall, the
tip of a cap, or a cut far in the classically forbidden region of an infinite IR end) and the
equation -a u'' - b u' + c u = m^2 u is imposed at first-kind Chebyshev points, which are all
interior, so the regular singular ends z = 0 and a cap are never evaluated: the polynomial space
itself selects the regular solution there. A wall condition, or psi = 0 at the cut, is one more
row. The generalised eigenproblem is solved with LAPACK (scipy.linalg.eig) at degrees N and 2N;
the difference is the error estimate, eigenvalues without a partner at the other resolution (or
with an imaginary part) are discarded as spurious, and N is doubled until the wanted states agree
to the tolerance or the maximum degree is reached.

References
----------
T. A. Driscoll & N. Hale, IMA J. Numer. Anal. 36 (2016) 108 (rectangular collocation).
J. P. Boyd, *Chebyshev and Fourier Spectral Methods*, 2nd ed., Dover 2001, ch. 7 (spurious
eigenvalues, comparison of two resolutions).
"""

from __future__ import annotations

import contextlib
import functools
import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from holostring.errors import ConvergenceError, InputError, NotApplicableError
from holostring.provenance import Provenance
from holostring.spectra.bases import Collocation, gauss_legendre
from holostring.spectra.boundary import Boundaries, BoundaryKind, resolve_boundaries
from holostring.spectra.channels import Channel, resolve_channel
from holostring.spectra.coefficients import Compiled, compiled, uv_exponent
from holostring.spectra.results import SpectrumResult

#: decay exponent int sqrt(U - m^2) d xi required at the cut of an infinite IR end
DECAY_AT_CUT = 22.0
#: largest polynomial degree tried
MAX_DEGREE = 768
#: relative distance within which eigenvalues at two resolutions are partners
PARTNER_TOL = 1e-5
PLOT_POINTS = 600


@dataclass
class _Problem:
    """Numbers fixed for one solve: compiled coefficients at parameter values, domain, BC."""

    comp: Compiled
    values: tuple[float, ...]
    delta: float
    kappa: float
    z_end: float
    half: bool
    ir: BoundaryKind
    cache: dict[int, Any] = field(default_factory=dict)

    # coefficient functions ------------------------------------------------------------
    def _call(self, fn: Any, z: np.ndarray) -> np.ndarray:
        with np.errstate(all="ignore"):
            return np.asarray(fn(z, self.delta, self.kappa, *self.values), dtype=float)

    def coefficients(self, z: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        c = self.comp
        b_fn, c_fn = (c.b_half, c.c_half) if self.half else (c.b_finite, c.c_finite)
        return self._call(c.a, z), self._call(b_fn, z), self._call(c_fn, z)

    def log_s(self, z: np.ndarray) -> np.ndarray:
        if self.half:
            return self._call(self.comp.log_s_half, z)
        with np.errstate(divide="ignore"):
            return self.delta * np.log(z)

    def dlog_s(self, z: np.ndarray) -> np.ndarray:
        if self.half:
            return self._call(self.comp.Ls_half, z)
        return self.delta / z

    def log_W(self, z: np.ndarray) -> np.ndarray:
        return self._call(self.comp.log_W, z)

    def log_P(self, z: np.ndarray) -> np.ndarray:
        return self._call(self.comp.log_P, z)

    # discretisation ---------------------------------------------------------------------
    def eig(self, n: int) -> tuple[Any, ...]:
        """Eigenvalues (ascending, real, finite) with n interior points, and the matrices."""
        if n in self.cache:
            return self.cache[n]
        import scipy.linalg

        end_row = self.ir is not BoundaryKind.REGULAR
        col = Collocation.build(n, 0.0, self.z_end, right_end=end_row)
        zi = col.z[:n]
        a, b, c = self.coefficients(zi)
        if not (np.all(np.isfinite(a)) and np.all(np.isfinite(b)) and np.all(np.isfinite(c))):
            raise NotApplicableError(
                "the fluctuation equation has non-finite coefficients inside the domain "
                f"(0, {self.z_end:g}); check the background's metric and dilaton"
            )
        A = -a[:, None] * col.D2[:n] - b[:, None] * col.D1[:n]
        A[:, :n] += np.diag(c)
        end_map = None
        if end_row:
            if self.ir is BoundaryKind.NEUMANN:
                # phi' = s (L_s u + u') = 0 at the wall: u_end = end_map @ u_interior
                row = col.D1[-1].copy()
                row[-1] += float(self.dlog_s(np.array([self.z_end]))[0])
                end_map = -row[:n] / row[-1]
                A = A[:, :n] + np.outer(A[:, n], end_map)
            else:
                A = A[:, :n]  # u = 0 at the wall or at the cut
        # eigenvalues alone: LAPACK's Schur form without vectors is ~10x more accurate
        w = scipy.linalg.eigvals(A)
        ok = np.isfinite(w) & (np.abs(w.imag) <= 1e-7 * np.maximum(1.0, np.abs(w.real)))
        w = np.sort(w[ok].real)
        out = (w, col, A, end_map if end_row else None, end_row)
        self.cache[n] = out
        return out

    def vectors(self, n: int, lam: np.ndarray) -> tuple[np.ndarray, Collocation]:
        """Node values of u for the eigenvalues ``lam`` (from :meth:`eig` at the same n)."""
        import scipy.linalg

        _, col, A, end_map, end_row = self.eig(n)
        w, V = scipy.linalg.eig(A)
        idx = np.array([int(np.argmin(np.abs(w - x))) for x in lam], dtype=int)
        V = V[:, idx].real
        if end_row:
            last = end_map @ V if end_map is not None else np.zeros(V.shape[1])
            V = np.vstack([V, last])
        return V, col


def _single_thread() -> Any:
    """Limit BLAS to one thread for these small matrices when threadpoolctl is installed.

    Multithreaded LAPACK gains nothing at a few hundred unknowns and loses a factor of ten or more
    on a loaded machine.
    """
    try:
        from threadpoolctl import threadpool_limits
    except ImportError:
        return contextlib.nullcontext()
    return threadpool_limits(limits=1, user_api="blas")


def _match(fine: np.ndarray, coarse: np.ndarray) -> np.ndarray:
    """For each fine eigenvalue, the distance to the nearest coarse one."""
    if coarse.size == 0:
        return np.full(fine.shape, np.inf)
    idx = np.searchsorted(coarse, fine)
    lo = np.clip(idx - 1, 0, coarse.size - 1)
    hi = np.clip(idx, 0, coarse.size - 1)
    return np.minimum(np.abs(fine - coarse[lo]), np.abs(fine - coarse[hi]))


def _half_line_cut(prob: _Problem, states: int, scale: float) -> float:
    """Where to cut an infinite IR end: past the last wanted turning point, by WKB decay."""
    z = np.geomspace(1e-6 * scale, 1e6 * scale, 6000)
    U = prob._call(prob.comp.U, z)
    a = prob._call(prob.comp.a, z)
    dxi = np.sqrt(1.0 / np.where(a > 0, a, np.nan))
    good = np.isfinite(U) & np.isfinite(dxi)
    if not good[-1] and not good[len(z) // 2:].any():
        raise NotApplicableError("the Schrodinger potential U is not finite at large z")
    # non-finite U at large z (overflow) counts as a wall of the potential
    U = np.where(np.isfinite(U), U, np.inf)
    dxi = np.where(np.isfinite(dxi), dxi, 0.0)
    xi = np.concatenate([[0.0], np.cumsum(0.5 * (dxi[1:] + dxi[:-1]) * np.diff(z))])

    def count(lam: float) -> float:
        k = np.sqrt(np.clip(lam - U, 0.0, None))
        return float(np.sum(0.5 * (k[1:] + k[:-1]) * np.diff(xi)) / math.pi)

    tail = U[-len(z) // 20:]
    lam = max(1.0 / scale**2, float(np.nanmin(U)) + 1.0 / scale**2)
    for _ in range(200):
        if count(lam) >= states + 3:
            break
        lam *= 2.0
    if not (U[-1] > lam and np.all(np.diff(tail[np.isfinite(tail)]) >= 0)):
        sup = float(np.nanmax(np.where(np.isfinite(U[-500:]), U[-500:], np.nan)))
        raise NotApplicableError(
            f"no discrete spectrum: the Schrodinger potential U does not confine (it stays "
            f"near {sup:.4g} at z = {z[-1]:.3g}); the spectrum is continuous"
        )
    beyond = np.nonzero(U > lam)[0]
    start = beyond[np.searchsorted(beyond, np.argmin(np.where(U < lam, -U, np.inf)))]
    k = np.sqrt(np.clip(U - lam, 0.0, None))
    decay = np.concatenate([[0.0], np.cumsum(0.5 * (k[1:] + k[:-1]) * np.diff(xi))])
    decay -= decay[start]
    idx = np.searchsorted(decay, DECAY_AT_CUT)
    return float(z[min(idx, len(z) - 1)])


def _prepare(background: Any, channel: Channel, boundary: Any) -> tuple[_Problem, Boundaries]:
    from holostring.background.model import IRKind

    comp = compiled(background, channel)
    values = tuple(background.values)
    alpha, gamma, qp = comp.uv(*values)
    delta = uv_exponent(alpha, gamma, qp, field=f"channel {channel.name}")
    bounds = resolve_boundaries(background, boundary, delta)
    kind = background.ir.kind
    half = kind is IRKind.INFINITY
    kappa = delta + 0.25 * (alpha + gamma)
    z_end = background.z_ir if not half else 1.0
    if not half and not (math.isfinite(z_end) and z_end > 0):
        raise InputError("background", f"IR end at z = {z_end} is not a positive number")
    prob = _Problem(comp, values, delta, kappa, z_end, half, bounds.ir.kind)
    if kind is IRKind.CAP:
        a_near = prob._call(comp.a, np.array([z_end * (1 - 1e-6)]))[0]
        if not (abs(a_near) < 1e-3):
            raise NotApplicableError(
                f"background '{background.name}' declares a cap at z0 = {z_end:g}, but P/W does "
                "not vanish there: the circle does not shrink for this channel"
            )
    return prob, bounds


def _solve(background: Any, channel: str | Channel, states: int, boundary: Any,
           resolution: int | None, tol: float) -> tuple[dict[str, Any], _Problem]:
    ch = resolve_channel(background, channel)
    if isinstance(states, bool) or not isinstance(states, int | np.integer) or states < 1:
        raise InputError("states", f"must be a positive integer, got {states!r}")
    if states > 200:
        raise InputError("states", f"at most 200 states, got {states}")
    if not (isinstance(tol, int | float) and 0 < tol < 1):
        raise InputError("tol", f"must be a number in (0, 1), got {tol!r}")
    if resolution is not None and (not isinstance(resolution, int | np.integer)
                                   or not 8 <= resolution <= MAX_DEGREE):
        raise InputError("resolution", f"must be an integer in [8, {MAX_DEGREE}]")
    prob, bounds = _prepare(background, ch, boundary)
    if prob.half:
        scale = 1.0
        prob.z_end = _half_line_cut(prob, states, scale)
        n = resolution or max(48, 4 * states + 32)
    else:
        n = resolution or max(32, 3 * states + 16)
    while True:
        lam_c = prob.eig(n)[0]
        lam_f = prob.eig(2 * n)[0]
        dist = _match(lam_f, lam_c)
        partnered = dist <= PARTNER_TOL * np.maximum(1.0, np.abs(lam_f))
        keep = np.nonzero(partnered)[0][:states]
        err = dist[keep]
        lam = lam_f[keep]
        ok_err = err <= tol * np.maximum(1.0, np.abs(lam))
        # an eigenvalue without partner below the last kept one breaks the numbering
        below = (~partnered) & (lam_f < (lam[-1] if lam.size else -np.inf))
        done = keep.size == states and bool(np.all(ok_err)) and not below.any()
        if done or resolution is not None or 4 * n > MAX_DEGREE:
            break
        n *= 2
    discarded = int(np.count_nonzero(~partnered[: keep[-1] + 1])) if keep.size else 0
    parts = []
    if keep.size < states:
        parts.append(f"only {keep.size} of {states} states resolved at degree {2 * n}")
    if keep.size and not np.all(ok_err):
        worst = int(np.argmax(err / (tol * np.maximum(1.0, np.abs(lam)))))
        parts.append(f"state n={worst} differs by {err[worst]:.2e} between degrees {n} and {2 * n}"
                     f" (tolerance {tol:g})")
    if below.any():
        parts.append("an unresolved eigenvalue lies among the returned ones; numbering uncertain")
    converged = not parts
    if converged:
        message = (f"{states} states converged: degrees {n} and {2 * n} agree within "
                   f"{tol:g} (relative)")
        if discarded:
            message += f"; {discarded} spurious eigenvalue(s) discarded"
    else:
        message = "not converged: " + "; ".join(parts)
        message += "; increase resolution or lower the number of states"
    return {
        "channel": ch,
        "bounds": bounds,
        "lam": lam,
        "err": err,
        # modes from the coarse matrix: the wanted states agree there to the tolerance, and the
        # eigenvector solve costs 8x less than at 2N
        "V_col": prob.vectors(n, lam_c[np.array([int(np.argmin(np.abs(lam_c - x)))
                                                 for x in lam], dtype=int)]
                              if lam.size else lam),
        "n": n,
        "converged": converged,
        "message": message,
        "discarded": discarded,
    }, prob


@functools.lru_cache(maxsize=1)
def _version() -> str:
    from holostring.provenance import package_version

    return package_version()


def _gl_nodes(z_end: float, m: int) -> tuple[np.ndarray, np.ndarray]:
    x, w = gauss_legendre(m)
    return 0.5 * z_end * (x + 1.0), 0.5 * z_end * w


def _normalised_u(prob: _Problem, V: np.ndarray, col: Collocation) -> np.ndarray:
    """Node values of u scaled so that int W phi^2 dz = 1 and u(0) > 0."""
    zq, wq = _gl_nodes(prob.z_end, 2 * col.z.size + 16)
    uq = col.evaluate(V.T, zq)
    weight = np.exp(prob.log_W(zq) + 2.0 * prob.log_s(zq))
    norm = np.sqrt(np.sum(wq * weight * uq**2, axis=1))
    sign = np.sign(col.evaluate(V.T, np.array([0.0]))[:, 0])
    sign[sign == 0] = 1.0
    return (V / (norm * sign)).T  # (states, nodes)


def solve_spectrum(
    background: Any,
    channel: str | Channel = "scalar-glueball",
    *,
    states: int = 10,
    boundary: str | None = None,
    resolution: int | None = None,
    tol: float = 1e-10,
    strict: bool = False,
) -> SpectrumResult:
    """Normal-mode masses, modes and the Schrodinger potential of a channel.

    Parameters
    ----------
    background
        A :class:`holostring.background.Background` with a confining IR end (wall, cap, or
        infinity with a confining potential).
    channel
        ``"scalar-glueball"``, ``"tensor-glueball"``, ``"vector-meson"``, a name declared in
        the background file, or a :class:`~holostring.spectra.channels.Channel`.
    states
        Number of states n = 0 .. states-1.
    boundary
        At a hard wall: ``"dirichlet"`` (default) or ``"neumann"``, a condition on the field
        phi. Must be ``None`` for other IR ends (their condition is fixed).
    resolution
        Fixed polynomial degree N (compared with 2N); ``None`` adapts N by doubling.
    tol
        Relative tolerance on m_n^2 (absolute below |m^2| = 1).
    strict
        Raise :class:`~holostring.errors.ConvergenceError` (carrying the result) instead of
        returning ``converged=False``.

    Returns
    -------
    SpectrumResult

    Raises
    ------
    InputError
        Unknown channel, invalid options, or a wall condition without a wall.
    NotApplicableError
        A horizon as IR end, a non-confining potential, or an unsupported UV behaviour.
    ConvergenceError
        With ``strict=True`` when the tolerance is not met.

    References
    ----------
    Boschi-Filho & Braga, hep-th/0209080 (hard wall); Karch-Katz-Son-Stephanov, hep-ph/0602229
    and Colangelo et al., hep-ph/0703316 (soft wall); Csaki-Ooguri-Oz-Terning, hep-th/9806021
    (AdS soliton).

    Examples
    --------
    >>> from holostring.background import load_background
    >>> r = solve_spectrum(load_background("soft-wall", c=1.0), "vector-meson", states=3)
    >>> [round(float(x), 8) for x in r.masses_squared]
    [4.0, 8.0, 12.0]
    """
    with _single_thread():
        out, prob = _solve(background, channel, states, boundary, resolution, tol)
        result = _assemble(background, out, prob, states, tol, resolution)
    if strict and not result.converged:
        raise ConvergenceError(result.message, partial=result)
    return result


def _assemble(background: Any, out: dict[str, Any], prob: _Problem, states: int, tol: float,
              resolution: int | None) -> SpectrumResult:
    ch: Channel = out["channel"]
    V, col = out["V_col"]
    lam, err = out["lam"], out["err"]
    U_n = _normalised_u(prob, V, col)
    z_end = prob.z_end
    z = z_end * (np.arange(PLOT_POINTS) + 0.5) / PLOT_POINTS
    u = col.evaluate(U_n, z)
    log_s = prob.log_s(z)
    log_sigma = 0.25 * (prob.log_P(z) + prob.log_W(z))
    with np.errstate(all="ignore"):
        phi = np.exp(log_s) * u
        psi = np.exp(log_s + log_sigma) * u
        U = prob._call(prob.comp.U, z)
        masses = np.where(lam >= 0, np.sqrt(np.abs(lam)), np.nan)
        mass_err = np.where(lam > 0, err / (2.0 * np.sqrt(np.abs(lam))), np.nan)
    xi = _xi(prob, z)
    bounds: Boundaries = out["bounds"]
    prov = Provenance(
        background=background.name,
        parameters=dict(background.params),
        frame=str(ch.frame),
        settings={
            "method": "rectangular Chebyshev collocation, degrees N and 2N",
            "resolution": [out["n"], 2 * out["n"]],
            "fixed_resolution": resolution,
            "tol": tol,
            "states": states,
            "boundary": bounds.statement,
            "domain": [0.0, z_end],
            "channel": ch.to_dict(),
        },
        version=_version(),
    )
    return SpectrumResult(
        channel=ch.name,
        channel_info=ch.to_dict(),
        boundary=bounds.name,
        boundaries=bounds.to_dict(),
        masses_squared=lam,
        masses=masses,
        error_estimate=err,
        mass_error=mass_err,
        converged=out["converged"],
        message=out["message"],
        z=z,
        xi=xi,
        potential=U,
        modes=psi,
        field_modes=phi,
        resolution=(out["n"], 2 * out["n"]),
        delta=prob.delta,
        domain=(0.0, z_end),
        energy_unit=background.energy_unit,
        provenance=prov,
        discarded=out["discarded"],
    )


def _xi(prob: _Problem, z: np.ndarray) -> np.ndarray:
    """xi(z) = int_0^z sqrt(W/P) dz, by Gauss-Legendre on each grid interval."""
    x, w = gauss_legendre(8)
    edges = np.concatenate([[0.0], z])
    left, right = edges[:-1], edges[1:]
    half = 0.5 * (right - left)
    nodes = (left[:, None] + half[:, None] * (x[None, :] + 1.0)).ravel()
    a = prob._call(prob.comp.a, nodes).reshape(len(z), -1)
    with np.errstate(all="ignore"):
        pieces = np.sum(w[None, :] / np.sqrt(np.abs(a)), axis=1) * half
    return np.cumsum(np.where(np.isfinite(pieces), pieces, 0.0))
