"""Published check values for backgrounds and diagnostics: (value, tolerance, source) rows."""

import math

import mpmath as mp

# Maldacena, Phys. Rev. Lett. 80 (1998) 4859, hep-th/9803002, eq. for the Wilson loop in AdS5:
# V(L) = -4 pi^2 sqrt(2 g_YM^2 N) / (Gamma(1/4)^4 L); with g = R^2/(2 pi alpha') = sqrt(g_YM^2 N)/(2 pi)
# this is V L = -g 8 pi^3/Gamma(1/4)^4. Evaluated with mpmath's Gamma.
KAPPA_ADS = (
    float(8 * mp.pi**3 / mp.gamma(mp.mpf(1) / 4) ** 4),
    1e-12,
    "Maldacena hep-th/9803002; mpmath Gamma",
)

# Soft-wall string tension sigma = g e c / 2 for w = exp(c z^2/2)/z^2:
# Andreev-Zakharov, Phys. Rev. D 74 (2006) 025023, hep-ph/0604204 (sigma = e c R^2/(4 pi alpha')).
SOFT_WALL_SIGMA_C1 = (math.e / 2, 1e-12, "Andreev-Zakharov hep-ph/0604204")

# Hard-wall string tension g/z0^2: F(z0) = 1/z0^2 at the wall (KSS criterion, Kinar-Schreiber-
# Sonnenschein hep-th/9811192; common practice for the hard wall).
HARD_WALL_SIGMA_Z01 = (1.0, 1e-14, "Kinar-Schreiber-Sonnenschein hep-th/9811192")


# AdS5 black brane temperature T = 1/(pi z_h): Witten hep-th/9803131 (common practice).
def black_brane_temperature(zh: float) -> float:
    return 1.0 / (math.pi * zh)


# D4 soliton string tension: sigma = (1/(2 pi alpha')) (U_KK/R)^(3/2), Brandhuber-Itzhaki-
# Sonnenschein-Yankielowicz hep-th/9803263 (from memory: the tension is set by g_tt at the tip).
def d4_sigma(z0: float, g: float = 1.0) -> float:
    return g * z0 ** (-1.5)
