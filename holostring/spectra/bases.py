"""Array-only spectral building blocks: Gauss-Jacobi nodes, differentiation, interpolation, quadrature.

Nothing here knows about backgrounds; everything takes and returns numpy arrays, so each
function is tested against closed forms alone.

The solver in :mod:`holostring.spectra.solve` uses a nodal basis: polynomials of degree m - 1
given by their values at the m Gauss-Jacobi points of [a, b] (roots of P_m^(alpha, beta); all
interior, so coefficient functions are never evaluated at an end point). The same points with
their Gauss weights serve as the quadrature of the weak form, which makes the mass matrix
diagonal. The Jacobi exponents are chosen so that the weight (b - z)^alpha (z - a)^beta carries
the leading power of the integrands at the ends; what remains is smooth, and the quadrature keeps
spectral accuracy.

Everything that depends only on (m, alpha, beta) is computed once on [-1, 1] and cached; an
interval only rescales it.

References
----------
L. N. Trefethen, *Spectral Methods in MATLAB*, SIAM 2000, ch. 6 (differentiation matrices).
J.-P. Berrut & L. N. Trefethen, SIAM Review 46 (2004) 501 (barycentric interpolation).
H. Wang, D. Huybrechs, S. Vandewalle, Math. Comp. 83 (2014) 2893, arXiv:1207.4174
(barycentric weights of Gauss-Jacobi points from the quadrature weights).
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np


def differentiation_matrix(x: np.ndarray, w: np.ndarray) -> np.ndarray:
    """First-derivative matrix of the interpolant on nodes ``x`` with barycentric weights ``w``.

    Off-diagonal (w_j / w_i) / (x_i - x_j); the diagonal by the negative-sum trick, which keeps
    D @ 1 = 0 to rounding (Berrut & Trefethen 2004, section 9).
    """
    dx = x[:, None] - x[None, :]
    np.fill_diagonal(dx, 1.0)
    D = (w[None, :] / w[:, None]) / dx
    np.fill_diagonal(D, 0.0)
    D -= np.diag(D.sum(axis=1))
    return D


def interpolation_matrix(x: np.ndarray, w: np.ndarray, targets: np.ndarray) -> np.ndarray:
    """Matrix E with (E @ f)_i = p(t_i), p the interpolant of f on nodes ``x`` (weights ``w``).

    Returns
    -------
    numpy.ndarray
        Shape ``(len(targets), len(x))``; exact rows where a target hits a node.
    """
    t = np.asarray(targets, dtype=float).reshape(-1)
    E = np.subtract.outer(t, x)
    exact = E == 0.0
    hit = exact.any(axis=1)
    with np.errstate(divide="ignore", invalid="ignore"):
        np.divide(w, E, out=E)
        E /= E.sum(axis=1, keepdims=True)
    if hit.any():
        E[hit] = exact[hit]
    return E


@functools.lru_cache(maxsize=32)
def gauss_legendre(m: int) -> tuple[np.ndarray, np.ndarray]:
    """Gauss-Legendre nodes and weights on [-1, 1] (``scipy.special.roots_legendre``, cached)."""
    from scipy.special import roots_legendre

    x, w = roots_legendre(m)
    x.setflags(write=False)
    w.setflags(write=False)
    return x, w


@dataclass(frozen=True)
class JacobiRule:
    """Gauss-Jacobi points on [-1, 1] with everything the nodal basis needs (read-only arrays).

    Attributes
    ----------
    x
        The m roots of P_m^(alpha, beta), ascending.
    log_weights
        log of the plain quadrature weights: int f dx ~ sum exp(log_weights) f(x) for f
        = (1 - x)^alpha (1 + x)^beta g with g smooth (the Gauss weights divided by the weight
        function at the nodes; kept as logs because they span many decades).
    bary
        Barycentric weights (-1)^j sqrt((1 - x_j^2) w_j) (Wang, Huybrechs & Vandewalle 2014).
    D
        First-derivative matrix on the nodes.
    """

    x: np.ndarray
    log_weights: np.ndarray
    bary: np.ndarray
    D: np.ndarray


@functools.lru_cache(maxsize=64)
def jacobi_rule(m: int, alpha: float, beta: float) -> JacobiRule:
    """Gauss-Jacobi rule of m points for the weight (1 - x)^alpha (1 + x)^beta, cached.

    Parameters
    ----------
    m
        Number of points (at least 2).
    alpha, beta
        Exponents, each > -1.

    Returns
    -------
    JacobiRule
    """
    from scipy.special import roots_jacobi

    if m < 2:
        raise ValueError("m must be at least 2")
    if not (alpha > -1 and beta > -1):
        raise ValueError("Jacobi exponents must exceed -1")
    x, w = roots_jacobi(m, alpha, beta)
    bary = (-1.0) ** np.arange(m) * np.sqrt((1.0 - x**2) * w)
    log_w = np.log(w) - alpha * np.log1p(-x) - beta * np.log1p(x)
    D = differentiation_matrix(x, bary)
    for arr in (x, log_w, bary, D):
        arr.setflags(write=False)
    return JacobiRule(x, log_w, bary, D)


@dataclass(frozen=True)
class LinearMap:
    """The affine map x in [-1, 1] -> z in [a, b]."""

    a: float
    b: float

    @property
    def scale(self) -> float:
        """dz/dx."""
        return 0.5 * (self.b - self.a)

    def to_z(self, x: np.ndarray) -> np.ndarray:
        """Map reference points to the physical interval."""
        return self.a + self.scale * (np.asarray(x) + 1.0)

    def to_x(self, z: np.ndarray) -> np.ndarray:
        """Map physical points to the reference interval."""
        return (np.asarray(z) - self.a) / self.scale - 1.0


@dataclass(frozen=True)
class NodalBasis:
    """Polynomials on the Gauss-Jacobi points of [a, b], optionally times (b - z).

    A function is stored by its values at the nodes ``z``. With ``right_zero`` the functions are
    u(z) = (b - z) v(z), v a polynomial of degree m - 1, so that u(b) = 0 holds exactly; the
    stored values are still those of u.

    Attributes
    ----------
    z
        Nodes mapped to [a, b], ascending, all interior.
    log_weights
        log of plain quadrature weights on [a, b] (see :class:`JacobiRule`).
    bary
        Barycentric weights of the nodes.
    D
        First z-derivative matrix of the polynomial interpolant v on the nodes.
    """

    z: np.ndarray
    log_weights: np.ndarray
    bary: np.ndarray
    D: np.ndarray
    domain: LinearMap
    right_zero: bool = False

    @classmethod
    def build(
        cls, m: int, a: float, b: float, alpha: float = 0.0, beta: float = 0.0, right_zero: bool = False
    ) -> NodalBasis:
        """Nodes and matrices for m points on [a, b], weight (b - z)^alpha (z - a)^beta."""
        rule = jacobi_rule(int(m), float(alpha), float(beta))
        dom = LinearMap(a, b)
        h = dom.scale
        return cls(dom.to_z(rule.x), rule.log_weights + np.log(h), rule.bary, rule.D / h, dom, right_zero)

    @property
    def size(self) -> int:
        """Number of nodes m."""
        return int(self.z.size)

    def _factor(self, z: np.ndarray) -> np.ndarray:
        return self.domain.b - z if self.right_zero else np.ones_like(z)

    def _matrix(self, z: np.ndarray) -> np.ndarray:
        return interpolation_matrix(self.domain.to_x(self.z), self.bary, self.domain.to_x(z))

    def evaluate(self, values: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Evaluate functions (node values in the last axis) at physical points ``z``."""
        z = np.asarray(z, dtype=float).reshape(-1)
        # contiguous operands: numpy's matmul is many times slower on transposed views
        v = np.ascontiguousarray(values / self._factor(self.z))
        return v @ self._matrix(z).T * self._factor(z)

    def derivative(self, values: np.ndarray, z: np.ndarray) -> np.ndarray:
        """First z-derivative of the functions at physical points ``z``."""
        z = np.asarray(z, dtype=float).reshape(-1)
        v = np.ascontiguousarray(values / self._factor(self.z))
        E = self._matrix(z)
        dv = (v @ self.D.T) @ E.T
        if not self.right_zero:
            return dv
        return dv * (self.domain.b - z) - v @ E.T
