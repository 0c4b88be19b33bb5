"""Published and independently computed check values for the temperature module.

Each row is (value, tolerance, source). Tolerances are absolute unless the name says REL.
"""

from __future__ import annotations

import math

import mpmath

#: Hard wall: T_c z0 = 2^(1/4)/pi (relative tolerance).
HARD_WALL_TC_Z0 = (
    2**0.25 / math.pi,
    1e-10,
    "Herzog, Phys. Rev. Lett. 98 (2007) 091601, hep-th/0608151: T_c = 2^(1/4)/(pi z0)",
)

#: Soft wall: T_c / sqrt(c) to the four published digits (half a unit in the last digit).
SOFT_WALL_TC_PUBLISHED = (
    0.4917,
    0.00005,
    "Herzog, hep-th/0608151: T_c = 0.4917 sqrt(c) for the dilaton c z^2",
)


def soft_wall_tc_over_sqrt_c() -> float:
    """T_c/sqrt(c) of the soft wall from the closed form, at 30 digits with mpmath.

    Herzog's action difference for Phi = c z^2 (hep-th/0608151) is, with x = c z_h^2,
    Delta F ~ 1/z_h^4 - 8 int_{z_h}^inf e^{-c z^2} z^-5 dz = c^2 (1/x^2 - 4 Gamma(-2, x));
    the root in x gives T_c = sqrt(c)/(pi sqrt(x)). Gamma(-2, x) is mpmath's upper incomplete
    gamma function (independent of the code under test, which integrates numerically).
    """
    mpmath.mp.dps = 30
    x = mpmath.findroot(lambda x: 4 * mpmath.gammainc(-2, x) - 1 / x**2, 0.4)
    return float(1 / (mpmath.pi * mpmath.sqrt(x)))


SOFT_WALL_TC_CLOSED_FORM = (
    None,  # computed by soft_wall_tc_over_sqrt_c()
    1e-10,
    "closed form of Herzog's soft-wall action difference with the incomplete gamma function "
    "(hep-th/0608151), evaluated with mpmath",
)

#: rho mass used to fix the scale (PDG value rounded to MeV; from memory, common practice).
M_RHO_GEV = 0.775

#: Published T_c in MeV with the scale fixed by the rho mass (rounded to MeV in the paper).
SOFT_WALL_TC_MEV = (191.0, 0.5, "Herzog hep-th/0608151: soft wall T_c = 191 MeV")
HARD_WALL_TC_MEV = (122.0, 0.5, "Herzog hep-th/0608151: hard wall T_c = 122 MeV")

#: First zero of J_0: the hard-wall rho mass m_rho z0 = j_{0,1} (Dirichlet vector modes;
#: Erlich-Katz-Son-Stephanov hep-ph/0501128, as used by Herzog hep-th/0608151). Value from scipy.
#: (computed in the tests with scipy.special.jn_zeros(0, 1)).

#: Conformal plasma: F = -pi^2 N^2 T^4 / 8, i.e. 2 kappa^2 F / L^3 = -pi^4 T^4 with
#: L^3/(2 kappa^2) = N^2/(8 pi^2) (Gubser-Klebanov-Peet, hep-th/9602135; Witten hep-th/9803131).
ADS_FREE_ENERGY_COEFF = (-(math.pi**4), 1e-12, "Gubser-Klebanov-Peet hep-th/9602135 (strong coupling)")

#: AdS5 black brane of unit radius is an Einstein space: R = -20 (common practice).
ADS5_RICCI = (-20, 0, "common practice: R = -d(d+1)/L^2 for AdS_{d+1}, d = 4")

#: Unit two-sphere: R = 2 (common practice).
SPHERE_RICCI = (2, 0, "common practice: unit 2-sphere, R = 2")


def ads_black_brane_screening() -> tuple[float, float]:
    """(L_max pi T, L_s pi T) of the AdS5 black brane, computed independently with mpmath.

    With z_h = 1 (pi T = 1), f = 1 - z^4, F = sqrt(f)/z^2, H = 1/z^2, turning point s and
    y = z/s, one has F^2 - F(s)^2 = (1 - y^4)/(s^4 y^4), so
    L(s) = 2 s sqrt(1 - s^4) int_0^1 y^2 dy / sqrt((1 - s^4 y^4)(1 - y^4)) and the connected
    energy with the UV pole subtracted is
    E(s) = (2/s) [int_0^1 (sqrt((1 - s^4 y^4)/(1 - y^4)) - 1) dy / y^2 - 1],
    against the straight pair E = 2 [int_0^1 (H - 1/z^2) dz - 1] = -2 (Rey-Theisen-Yee
    hep-th/9803135; Brandhuber et al. hep-th/9803137). tanh-sinh quadrature handles the
    endpoint square-root singularity.
    """
    mp = mpmath.mp
    mp.dps = 25

    # y = 1 - t^2 removes the square root at y = 1: dy / sqrt(1 - y^4) = 2 dt / sqrt((1+y)(1+y^2))
    def length(s):
        def f(t):
            y = 1 - t**2
            return 2 * y**2 / mpmath.sqrt((1 - s**4 * y**4) * (1 + y) * (1 + y**2))

        return 2 * s * mpmath.sqrt(1 - s**4) * mpmath.quad(f, [0, 1])

    def energy(s):
        def f(t):
            y = 1 - t**2
            a = 2 * mpmath.sqrt((1 - s**4 * y**4) / ((1 + y) * (1 + y**2))) / y**2
            return a - 2 * t / y**2

        return 2 / s * (mpmath.quad(f, [0, 1]) - 1)

    s_max = mpmath.findroot(
        lambda s: mpmath.diff(length, s), (0.8, 0.9), solver="anderson", tol=1e-30, verify=False
    )
    assert abs(mpmath.diff(length, s_max)) < 1e-15
    s_scr = mpmath.findroot(lambda s: energy(s) + 2, (0.6, 0.7), solver="anderson", tol=1e-30, verify=False)
    assert abs(energy(s_scr) + 2) < 1e-15
    return float(length(s_max)), float(length(s_scr))


ADS_BB_PUBLISHED = (
    (0.869, 0.754),
    0.0005,
    "L_max pi T and L_s pi T of the AdS5 black brane to three digits (Rey-Theisen-Yee "
    "hep-th/9803135; Brandhuber et al. hep-th/9803137); from memory",
)
