"""The spectral solver: masses, modes and U(z) of a channel on a background.

Method. The field is written phi = s(z) u(z); s carries the UV behaviour z^Delta (and, on a half
line, the WKB-like factor z^kappa (P W)^{-1/4} so that u decays like the Schrodinger function),
and at a Dirichlet end one more factor (z_end - z). The problem -(P phi')' + Q phi = m^2 W phi
is taken in its weak (Rayleigh-Ritz) form

    int p u' v' dz + int rho c u v dz [+ p L_s u v at a Neumann wall] = m^2 int rho u v dz,

with p = P s^2, rho = W s^2 and c the regular coefficient of the u equation (the 1/z^2 terms
cancel by the indicial equation). u is a polynomial of degree m - 1 on [0, z_end] (z_end: the
wall, the tip of a cap, or a cut far in the classically forbidden region of an infinite IR end)
given by its values at the m Gauss-Jacobi points, whose weight (z_end - z)^alpha z^beta takes up
the leading powers of p and rho at the ends; the same points are the quadrature. All nodes are
interior, so the singular ends z = 0 and a cap are never evaluated; regularity there and a
Neumann condition are natural conditions of the weak form, a Dirichlet end is built into s. The
mass matrix is diagonal, so with K = sqrt(w p) D / sqrt(w rho) the problem is the symmetric
standard one (K^T K + diag(c)) y = m^2 y. LAPACK's symmetric solver (scipy.linalg.eigh, lowest
eigenpairs only) gives the eigenvectors; each eigenvalue is then recomputed as the Rayleigh
quotient |K y|^2 + c.y^2 in that factored form, which removes the rounding error of forming
K^T K (the error of a Rayleigh quotient is quadratic in that of the vector). This is done with m
and 2m nodes; the difference is the error estimate, eigenvalues without a partner at the other
resolution are discarded as spurious, and m is doubled until the wanted states agree to the
tolerance or the maximum size is reached.

References
----------
J. P. Boyd, *Chebyshev and Fourier Spectral Methods*, 2nd ed., Dover 2001, ch. 7 (spurious
eigenvalues, comparison of two resolutions).
C. Canuto, M. Y. Hussaini, A. Quarteroni, T. A. Zang, *Spectral Methods: Fundamentals in Single
Domains*, Springer 2006, sec. 2.3 and ch. 3 (Gauss-Jacobi quadrature, Galerkin with numerical
integration).
B. N. Parlett, *The Symmetric Eigenvalue Problem*, SIAM 1998, ch. 4 (Rayleigh quotient accuracy).
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
from holostring.spectra.bases import NodalBasis, gauss_legendre, interpolation_matrix
from holostring.spectra.boundary import Boundaries, BoundaryKind, resolve_boundaries
from holostring.spectra.channels import Channel, resolve_channel
from holostring.spectra.coefficients import Compiled, compiled, uv_exponent
from holostring.spectra.results import SpectrumResult

#: decay exponent int sqrt(U - m^2) d xi required at the cut of an infinite IR end
DECAY_AT_CUT = 22.0
#: largest number of nodes tried
MAX_DEGREE = 768
#: relative distance within which eigenvalues at two resolutions are partners
PARTNER_TOL = 1e-5
PLOT_POINTS = 600
METHOD = "Gauss-Jacobi Galerkin (weak form, diagonal mass), m and 2m nodes"


@dataclass
class _Level:
    """Lowest eigenpairs at one resolution: m^2 ascending and node values of u (columns)."""

    lam: np.ndarray
    u: np.ndarray
    basis: NodalBasis


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
    beta: float = 0.0
    cache: dict[int, _Level] = field(default_factory=dict)

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

    @property
    def dirichlet(self) -> bool:
        """u = 0 at z_end: a Dirichlet wall, or the cut of an infinite IR end."""
        return self.ir in (BoundaryKind.DIRICHLET, BoundaryKind.DECAYING)

    # discretisation ---------------------------------------------------------------------
    def level(self, m: int, k: int) -> _Level:
        """The lowest min(k, m) eigenpairs with m nodes (cached per m)."""
        hit = self.cache.get(m)
        if hit is not None and hit.lam.size >= min(k, m):
            return hit
        basis = NodalBasis.build(
            m,
            0.0,
            self.z_end,
            alpha=1.0 if self.dirichlet else 0.0,
            beta=self.beta,
            right_zero=self.dirichlet,
        )
        z = basis.z
        _, b, c = self.coefficients(z)
        log_s = self.log_s(z)
        lp = self.log_P(z) + 2.0 * log_s
        lr = self.log_W(z) + 2.0 * log_s
        if self.dirichlet:  # s -> s (z_end - z): p, rho get d^2 and c gets b/d
            d = self.z_end - z
            lp = lp + 2.0 * np.log(d)
            lr = lr + 2.0 * np.log(d)
            c = c + b / d
        with np.errstate(all="ignore"):
            left = np.exp(0.5 * (basis.log_weights + lp))
            right = np.exp(-0.5 * (basis.log_weights + lr))
        if not (
            np.all(np.isfinite(left))
            and np.all(np.isfinite(right))
            and np.all(right > 0)
            and np.all(np.isfinite(c))
        ):
            raise NotApplicableError(
                "the fluctuation equation has non-finite coefficients inside the domain "
                f"(0, {self.z_end:g}); check the background's metric and dilaton"
            )
        K = left[:, None] * basis.D * right[None, :]
        C = K.T @ K
        C[np.diag_indices_from(C)] += c
        e = g_end = None
        if self.ir is BoundaryKind.NEUMANN:
            # boundary term of the weak form for phi'(z0) = 0: p L_s u v at the wall
            ze = np.array([self.z_end])
            e = interpolation_matrix(basis.domain.to_x(z), basis.bary, basis.domain.to_x(ze))[0]
            e = e * right
            g_end = float(np.exp(self.log_P(ze)[0] + 2.0 * self.log_s(ze)[0]) * self.dlog_s(ze)[0])
            if not math.isfinite(g_end):
                raise NotApplicableError(f"P or Delta/z is not finite at the wall z0 = {self.z_end:g}")
            C += g_end * np.outer(e, e)
        Y = _lowest_eigenvectors(C, min(k, m))
        # Rayleigh quotients in factored form: free of the rounding of K^T K
        KY = K @ Y
        lam = np.sum(KY**2, axis=0) + c @ Y**2
        if e is not None:
            lam = lam + g_end * (e @ Y) ** 2
        lam = lam / np.sum(Y**2, axis=0)
        order = np.argsort(lam)
        u = Y[:, order] * right[:, None]  # sum w rho v^2 = 1
        if self.dirichlet:
            u *= (self.z_end - z)[:, None]
        out = _Level(lam[order], u, basis)
        self.cache[m] = out
        return out


def _lowest_eigenvectors(C: np.ndarray, k: int) -> np.ndarray:
    """Orthonormal eigenvectors of the k lowest eigenvalues of the symmetric matrix C (columns).

    LAPACK is called directly: the divide-and-conquer driver (all pairs) is the fastest up to
    about 128 unknowns, the relatively robust representations (k pairs) above.
    """
    from scipy.linalg import lapack

    m = C.shape[0]
    if m <= 128:
        _, Y, info = lapack.dsyevd(C, compute_v=1, lower=1)
        Y = Y[:, :k]
    else:
        _, Y, _, _, info = lapack.dsyevr(C, compute_v=1, range="I", il=1, iu=k, lower=1)
    if info != 0:
        raise NotApplicableError(
            f"the symmetric eigensolver failed (LAPACK info {info}) with "
            f"{m} nodes; the coefficients may be too large"
        )
    return Y


@functools.lru_cache(maxsize=1)
def _blas_controller() -> Any:
    """One threadpoolctl controller per process (building one scans the loaded libraries)."""
    try:
        from threadpoolctl import ThreadpoolController
    except ImportError:  # pragma: no cover - threadpoolctl is a dependency
        return None
    return ThreadpoolController()


def _single_thread() -> Any:
    """Limit BLAS to one thread for these small matrices.

    Multithreaded LAPACK gains nothing at a few hundred unknowns and loses a factor of ten or more
    on a loaded machine.
    """
    ctl = _blas_controller()
    if ctl is None:  # pragma: no cover
        return contextlib.nullcontext()
    return ctl.limit(limits=1, user_api="blas")


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
    if not good[-1] and not good[len(z) // 2 :].any():
        raise NotApplicableError("the Schrodinger potential U is not finite at large z")
    # non-finite U at large z (overflow) counts as a wall of the potential
    U = np.where(np.isfinite(U), U, np.inf)
    dxi = np.where(np.isfinite(dxi), dxi, 0.0)
    xi = np.concatenate([[0.0], np.cumsum(0.5 * (dxi[1:] + dxi[:-1]) * np.diff(z))])

    def count(lam: float) -> float:
        k = np.sqrt(np.clip(lam - U, 0.0, None))
        return float(np.sum(0.5 * (k[1:] + k[:-1]) * np.diff(xi)) / math.pi)

    tail = U[-len(z) // 20 :]
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
    # Jacobi exponent at z = 0: p ~ z^(alpha + 2 Delta), rho ~ z^(gamma + 2 Delta), rho c at most
    # one power lower; the weight takes up all but that one power
    beta = max(min(alpha, gamma) + 2.0 * delta - 1.0, 0.0)
    prob = _Problem(comp, values, delta, kappa, z_end, half, bounds.ir.kind, beta)
    if kind is IRKind.CAP:
        a_near = prob._call(comp.a, np.array([z_end * (1 - 1e-6)]))[0]
        if not (abs(a_near) < 1e-3):
            raise NotApplicableError(
                f"background '{background.name}' declares a cap at z0 = {z_end:g}, but P/W does "
                "not vanish there: the circle does not shrink for this channel"
            )
    return prob, bounds


def _solve(
    background: Any, channel: str | Channel, states: int, boundary: Any, resolution: int | None, tol: float
) -> tuple[dict[str, Any], _Problem]:
    ch = resolve_channel(background, channel)
    if isinstance(states, bool) or not isinstance(states, int | np.integer) or states < 1:
        raise InputError("states", f"must be a positive integer, got {states!r}")
    if states > 200:
        raise InputError("states", f"at most 200 states, got {states}")
    if not (isinstance(tol, int | float) and 0 < tol < 1):
        raise InputError("tol", f"must be a number in (0, 1), got {tol!r}")
    if resolution is not None and (
        not isinstance(resolution, int | np.integer) or not 8 <= resolution <= MAX_DEGREE
    ):
        raise InputError("resolution", f"must be an integer in [8, {MAX_DEGREE}]")
    prob, bounds = _prepare(background, ch, boundary)
    if prob.half:
        prob.z_end = _half_line_cut(prob, states, 1.0)
        n = resolution or max(32, 3 * states + 24)
    else:
        n = resolution or max(24, 2 * states + 8)
    # a few eigenpairs beyond the wanted ones, to see spurious or unresolved ones among them
    k = states + max(4, states // 4)
    while True:
        coarse, fine = prob.level(n, k), prob.level(2 * n, k)
        lam_c, lam_f = coarse.lam, fine.lam
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
        parts.append(f"only {keep.size} of {states} states resolved with {2 * n} nodes")
    if keep.size and not np.all(ok_err):
        worst = int(np.argmax(err / (tol * np.maximum(1.0, np.abs(lam)))))
        parts.append(
            f"state n={worst} differs by {err[worst]:.2e} between {n} and {2 * n} nodes (tolerance {tol:g})"
        )
    if below.any():
        parts.append("an unresolved eigenvalue lies among the returned ones; numbering uncertain")
    converged = not parts
    if converged:
        message = f"{states} states converged: {n} and {2 * n} nodes agree within {tol:g} (relative)"
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
        # modes from the fine level, where they come with the eigenvalues
        "V_col": (fine.u[:, keep], fine.basis),
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


def _normalised_u(prob: _Problem, V: np.ndarray, col: NodalBasis) -> np.ndarray:
    """Node values of u (states, nodes) with u(0) > 0.

    The columns of ``V`` come normalised from :meth:`_Problem.level`: int W phi^2 dz = 1 by the
    Gauss-Jacobi quadrature of the weak form, exact up to the discretisation error.
    """
    sign = np.sign(col.evaluate(V.T, np.array([0.0]))[:, 0])
    sign[sign == 0] = 1.0
    return V.T * sign[:, None]


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
        Fixed number of nodes N (compared with 2N); ``None`` starts from N ~ 2-3 x states and
        doubles N until the states agree.
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


def _assemble(
    background: Any, out: dict[str, Any], prob: _Problem, states: int, tol: float, resolution: int | None
) -> SpectrumResult:
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
            "method": METHOD,
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
