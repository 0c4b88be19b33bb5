"""The Euclidean on-shell action density of a diagonal 5D metric with a dilaton (symbolic).

For ds^2 = sum_i e^{2 a_i(z)} dx_i^2 + e^{2 b(z)} dz^2 (four directions x_i = tau, x1..x3) the
Ricci scalar is

    R = -e^{-2b} [ 2 sum a_i'' + sum a_i'^2 + (sum a_i')^2 - 2 b' sum a_i' ]

(common practice; it gives R = -20 for AdS5 of unit radius with or without the black-brane
factor). The bulk Lagrangian density per unit Euclidean four-volume is
L(z) = sqrt(g) e^{-Phi} (R + 12), and the Gibbons-Hawking density at a cutoff z = eps with the
outward normal pointing to the boundary is X(z) = e^{-Phi} sqrt(h) K with
sqrt(h) K = -(1/sqrt(G_zz)) d/dz (sqrt(g)/sqrt(G_zz)).
"""

from __future__ import annotations

import sympy as sp

from holostring.background.formula import Z


def ricci_scalar(diagonal: list[sp.Expr], G_zz: sp.Expr) -> sp.Expr:
    """Ricci scalar of ds^2 = sum_i diagonal[i] dx_i^2 + G_zz dz^2, everything a function of z.

    Parameters
    ----------
    diagonal
        The metric components along the z-independent directions (Euclidean: all positive).
    G_zz
        The radial component.

    Returns
    -------
    sympy.Expr
    """
    a = [sp.log(c) / 2 for c in diagonal]
    b = sp.log(G_zz) / 2
    da = [sp.diff(x, Z) for x in a]
    s1 = sum(da)
    bracket = 2 * sum(sp.diff(x, Z, 2) for x in a) + sum(x**2 for x in da) + s1**2 - 2 * sp.diff(b, Z) * s1
    return -bracket / G_zz


def sqrt_det(diagonal: list[sp.Expr], G_zz: sp.Expr) -> sp.Expr:
    """sqrt(det g) of the diagonal metric."""
    prod = G_zz
    for c in diagonal:
        prod = prod * c
    return sp.powsimp(sp.sqrt(sp.powsimp(prod, force=True)), force=True)


def bulk_density(G_tt: sp.Expr, G_xx: sp.Expr, G_zz: sp.Expr, dilaton: sp.Expr) -> sp.Expr:
    """L(z) = sqrt(g) e^{-Phi} (R + 12) for the Euclidean metric (G_tt, G_xx x3, G_zz)."""
    diag = [G_tt, G_xx, G_xx, G_xx]
    R = ricci_scalar(diag, G_zz)
    return sp.simplify(sqrt_det(diag, G_zz) * sp.exp(-dilaton) * (sp.simplify(R) + 12))


def boundary_density(G_tt: sp.Expr, G_xx: sp.Expr, G_zz: sp.Expr, dilaton: sp.Expr) -> sp.Expr:
    """X(z) = e^{-Phi} sqrt(h) K at a cutoff z, outward normal towards the boundary z -> 0."""
    diag = [G_tt, G_xx, G_xx, G_xx]
    root_zz = sp.sqrt(G_zz)
    return sp.simplify(-sp.exp(-dilaton) / root_zz * sp.diff(sqrt_det(diag, G_zz) / root_zz, Z))
