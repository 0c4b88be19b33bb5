"""Array-only spectral building blocks: Chebyshev points, differentiation, interpolation, quadrature.

Nothing here knows about backgrounds; everything takes and returns numpy arrays, so each
function is tested against closed forms alone.

The collocation used by :mod:`holostring.spectra.solve` takes the Chebyshev points of the first
kind (all interior, so coefficient functions are never evaluated at a singular end point),
optionally with the right end point added for a boundary condition, and builds differentiation
matrices from barycentric weights. The resulting standard eigenvalue problem is solved by LAPACK
with balancing, which keeps rounding errors near 1e-13 up to a few hundred points.

References
----------
L. N. Trefethen, *Spectral Methods in MATLAB*, SIAM 2000, ch. 6.
J.-P. Berrut & L. N. Trefethen, SIAM Review 46 (2004) 501 (barycentric interpolation).
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np


def first_kind_points(m: int) -> np.ndarray:
    """Chebyshev points of the first kind (roots of T_m), ascending, all inside (-1, 1)."""
    if m < 1:
        raise ValueError("m must be at least 1")
    return -np.cos(np.pi * (np.arange(m) + 0.5) / m)


def first_kind_weights(m: int, right_end: bool = False) -> np.ndarray:
    """Barycentric weights of the ascending first-kind points, optionally with x = 1 appended.

    With l(x) = prod_k (x - x_k) = T_m(x) / 2^(m-1), the weights are 1 / l'(x_j)
    = 2^(m-1) sin(t_j) / (m sin(m t_j)) for x_j = cos(t_j); appending x = 1 divides them by
    (x_j - 1) and adds the weight 1 / l(1) = 2^(m-1). The common factor 2^(m-1) is dropped.
    """
    t = first_kind_angles(m)  # x_j = cos(t_j), ascending
    w = np.sin(t) / (m * np.sin(m * t))
    if not right_end:
        return w
    one_minus_x = 2.0 * np.sin(0.5 * t) ** 2
    return np.append(-w / one_minus_x, 1.0)


def first_kind_angles(m: int, right_end: bool = False) -> np.ndarray:
    """Angles t_j with x_j = cos(t_j) of the ascending first-kind points (t = 0 appended)."""
    t = np.pi - np.pi * (np.arange(m) + 0.5) / m
    return np.append(t, 0.0) if right_end else t


def angle_differences(t: np.ndarray) -> np.ndarray:
    """x_i - x_j for x = cos(t), as -2 sin((t_i + t_j)/2) sin((t_i - t_j)/2), free of cancellation."""
    return -2.0 * np.sin(0.5 * (t[:, None] + t[None, :])) * np.sin(0.5 * (t[:, None] - t[None, :]))


def differentiation_matrix(x: np.ndarray, w: np.ndarray, dx: np.ndarray | None = None) -> np.ndarray:
    """First-derivative matrix of the interpolant on nodes ``x`` with barycentric weights ``w``.

    Off-diagonal (w_j / w_i) / (x_i - x_j); the diagonal by the negative-sum trick, which keeps
    D @ 1 = 0 to rounding (Berrut & Trefethen 2004, section 9). ``dx`` may give the node
    differences computed without cancellation (see :func:`angle_differences`).
    """
    dx = (x[:, None] - x[None, :]) if dx is None else dx.copy()
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
    diff = t[:, None] - x[None, :]
    exact = diff == 0.0
    with np.errstate(divide="ignore", invalid="ignore"):
        kernel = w[None, :] / diff
        E = kernel / kernel.sum(axis=1, keepdims=True)
    rows = exact.any(axis=1)
    E[rows] = exact[rows].astype(float)
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
class Collocation:
    """Chebyshev collocation on the first-kind points of an interval, optionally with its right end.

    The unknowns are the values at ``z`` (m interior first-kind points, plus b when
    ``right_end``); the equation is imposed at the interior points only, so coefficient
    functions are never evaluated at an end point. A regular singular left end needs no row: the
    polynomial space selects the regular solution. A condition at the right end eliminates the
    value there.

    Attributes
    ----------
    z
        Nodes mapped to [a, b], ascending.
    weights
        Barycentric weights of the nodes.
    D1, D2
        First and second z-derivative matrices on the nodes.
    """

    z: np.ndarray
    weights: np.ndarray
    D1: np.ndarray
    D2: np.ndarray
    domain: LinearMap
    right_end: bool

    @classmethod
    def build(cls, m: int, a: float, b: float, right_end: bool = False) -> Collocation:
        """Nodes and matrices for m interior points on [a, b] (and the point b if asked)."""
        dom = LinearMap(a, b)
        t = first_kind_angles(m, right_end)
        x = np.cos(t)
        w = first_kind_weights(m, right_end)
        D = differentiation_matrix(x, w, angle_differences(t)) / dom.scale
        z = dom.a + dom.scale * 2.0 * np.cos(0.5 * t) ** 2  # 1 + x without cancellation
        return cls(z, w, D, D @ D, dom, right_end)

    @property
    def interior(self) -> int:
        """Number of interior nodes m."""
        return self.z.size - (1 if self.right_end else 0)

    def evaluate(self, values: np.ndarray, z: np.ndarray) -> np.ndarray:
        """Evaluate interpolants (node values in the last axis) at physical points ``z``."""
        x = self.domain.to_x(np.asarray(z, dtype=float))
        E = interpolation_matrix(self.domain.to_x(self.z), self.weights, x)
        return values @ E.T

    def derivative(self, values: np.ndarray, z: np.ndarray) -> np.ndarray:
        """First z-derivative of interpolants at physical points ``z``."""
        return self.evaluate(values @ self.D1.T, z)
