"""Check values for the static-string module: (value, tolerance, source) rows.

Tolerances are relative unless stated. Values that need a computation are obtained here with
mpmath at 30 digits, independently of the package's numerics (tanh-sinh quadrature straight on the
published integrals).
"""

from __future__ import annotations

import math
from functools import lru_cache

import mpmath as mp

_G14 = float(mp.gamma(0.25))

#: AdS5: V(L) L = -8 pi^3 g / Gamma(1/4)^4 for every L.
ADS_VL = (
    -8.0 * math.pi**3 / _G14**4,
    1e-10,
    "Maldacena, Phys. Rev. Lett. 80 (1998) 4859, hep-th/9803002, eq. (7): "
    "V = -4 pi^2 sqrt(2 g^2 N)/(Gamma(1/4)^4 L), with sqrt(2 g^2 N) = R^2/alpha' = 2 pi g",
)

#: AdS5: L(z*) / z* = 2 sqrt(2) pi^(3/2) / Gamma(1/4)^2.
ADS_L_OVER_ZSTAR = (
    2.0 * math.sqrt(2.0) * math.pi**1.5 / _G14**2,
    1e-12,
    "Maldacena hep-th/9803002, eq. (5) (L in terms of the turning point)",
)

#: Soft wall: string tension g e c / 2 at c = 1, g = 1.
SOFT_WALL_SIGMA = (
    math.e / 2.0,
    1e-8,
    "Andreev-Zakharov, Phys. Rev. D 74 (2006) 025023, hep-ph/0604204, eq. (9): sigma = g e c/2",
)

#: Hard wall z0 = 1: the string reaching the wall has L(z0) = 2 sqrt(2) pi^(3/2) z0/Gamma(1/4)^2,
#: and beyond it V has slope g/z0^2 = 1.
HARD_WALL_L0 = (
    2.0 * math.sqrt(2.0) * math.pi**1.5 / _G14**2,
    1e-12,
    "Maldacena hep-th/9803002 eq. (5) at z* = z0; wall tension g/z0^2: Polchinski-Strassler "
    "hep-th/0109174 (common practice)",
)

#: AdS black brane: published L_max pi T ~ 0.869 and screening length pi T ~ 0.754 (from memory
#: of the published figures, three digits). The precise values are computed below with mpmath.
ADS_BB_LMAX_PUBLISHED = (
    0.869,
    1e-3,
    "Rey-Theisen-Yee, Nucl. Phys. B 527 (1998) 171, hep-th/9803135; Brandhuber-Itzhaki-"
    "Sonnenschein-Yankielowicz, JHEP 06 (1998) 001, hep-th/9803137 (from memory)",
)
ADS_BB_SCREENING_PUBLISHED = (
    0.754,
    1e-3,
    "Rey-Theisen-Yee hep-th/9803135; Brandhuber et al. hep-th/9803137 (from memory)",
)

#: Sommer's conventions (hep-lat/9310022): r0^2 F(r0) = 1.65, r1^2 F(r1) = 1.0.
SOMMER = (1.65, 1.0, "Sommer, Nucl. Phys. B 411 (1994) 839, hep-lat/9310022")


def _bb_L_E(zs: mp.mpf) -> tuple[mp.mpf, mp.mpf]:
    """L and E (uv-pole scheme, g = 1) of the AdS black brane with z_h = 1, turning point zs.

    With F = sqrt(1 - z^4)/z^2, H = 1/z^2 (Rey-Theisen-Yee hep-th/9803135) and z = zs u one has
    F^2 - F*^2 = (1 - u^4)/(zs u)^4, and with s = u^4 both integrals are Euler integrals
    (Abramowitz-Stegun 15.3.1), k = zs^4:
        L = (zs/2) sqrt(1 - k) B(3/4, 1/2) 2F1(1/2, 3/4; 5/4; k)
        E = B(-1/4, 1/2) 2F1(-1/2, -1/4; 1/4; k) / (2 zs)     (analytic continuation in the
                                                              exponent = the UV-pole subtraction)
    """
    k = zs**4
    L = zs / 2 * mp.sqrt(1 - k) * mp.beta(0.75, 0.5) * mp.hyp2f1(0.5, 0.75, 1.25, k)
    E = mp.beta(-0.25, 0.5) * mp.hyp2f1(-0.5, -0.25, 0.25, k) / (2 * zs)
    return L, E


@lru_cache(maxsize=1)
def ads_black_brane_reference() -> tuple[float, float]:
    """(L_max pi T, L_screening pi T) of the AdS black brane at 30 digits (z_h = 1: pi T = 1).

    The disconnected pair has E = 2 (int_0^1 (H - 1/z^2) dz - 1/z_h) = -2.
    """
    with mp.workdps(30):
        zmax = mp.findroot(
            lambda s: mp.diff(lambda x: _bb_L_E(x)[0], s), (mp.mpf("0.75"), mp.mpf("0.95")), solver="anderson"
        )
        Lmax = _bb_L_E(zmax)[0]
        zscr = mp.findroot(lambda s: _bb_L_E(s)[1] + 2, (mp.mpf("0.5"), mp.mpf("0.7")), solver="anderson")
        Ls = _bb_L_E(zscr)[0]
        return float(Lmax), float(Ls)
