"""Regularisation schemes for the static-string energy, one function each, looked up by name.

The Nambu-Goto energy of a string reaching the boundary diverges like ``2 g int dz H(z)`` near
``z = 0``. Two schemes are provided:

``uv-pole``
    Subtract the divergent terms ``D(z)`` of the Laurent-Puiseux expansion of ``H`` at ``z = 0``
    (for asymptotically AdS backgrounds ``D = 1/z^2``) and add back ``int^{z*} D`` with the cut-off
    terms dropped: ``E = 2 g [ int_0^{z*} (H F / sqrt(F^2 - F*^2) - D) dz + P(z*) ]``, ``P' = D``.
    For pure AdS this is Maldacena's subtraction of the W-boson mass (hep-th/9803002).

``straight-strings``
    Subtract the energy of two straight strings from the boundary to the IR end (wall, cap or
    horizon), regularised in the same way. This is the natural zero for black branes, where the
    disconnected configuration is exactly that pair (Rey-Theisen-Yee hep-th/9803135).

Relation: ``V_straight(L) = V_uv(L) - E_pair`` with the L-independent constant
``E_pair = 2 g [ int_0^{z_IR} (H - D) dz + P(z_IR) ]`` (reported as ``scheme_offset``). The
straight-string scheme does not exist when ``E_pair`` diverges (e.g. the soft wall, where ``H``
grows without bound in the IR).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from enum import StrEnum

import numpy as np

from holostring.errors import InputError, NotApplicableError


class Scheme(StrEnum):
    """Named regularisation schemes for V(L)."""

    UV_POLE = "uv-pole"
    STRAIGHT_STRINGS = "straight-strings"


SCHEME_HELP = {
    Scheme.UV_POLE: "subtract the UV pole of the string measure (Maldacena's subtraction)",
    Scheme.STRAIGHT_STRINGS: "subtract two straight strings from the boundary to the IR end",
}


def as_scheme(name: str | Scheme) -> Scheme:
    """Validate a scheme name.

    Raises
    ------
    InputError
        For an unknown name, listing the known ones.
    """
    try:
        return Scheme(str(name))
    except ValueError:
        known = ", ".join(s.value for s in Scheme)
        raise InputError("scheme", f"'{name}' is not one of {known}") from None


@dataclass(frozen=True)
class UVDivergence:
    """Divergent terms ``D(z) = sum c z^p`` (p < 0) of H at the boundary.

    Attributes
    ----------
    terms
        ``(p, c)`` pairs; ``p = -1`` gives a logarithm in the antiderivative.
    text
        Human-readable ``D(z)``.
    """

    terms: tuple[tuple[float, float], ...]
    text: str
    regular: tuple[tuple[float, float], ...] = ()
    series_radius: float = 0.0

    def regular_part(self, z: np.ndarray) -> np.ndarray:
        """``H - D`` from the series at small z (used below ``series_radius``, where the direct
        difference of two large numbers would lose digits)."""
        return _power_sum(self.regular, z)

    def D(self, z: np.ndarray) -> np.ndarray:
        """The divergent part at ``z``."""
        return _power_sum(self.terms, z)

    def P(self, z: np.ndarray) -> np.ndarray:
        """Antiderivative of D with the cut-off terms dropped (``-1/z`` for ``1/z^2``)."""
        z = np.asarray(z, dtype=float)
        out = np.zeros_like(z)
        for p, c in self.terms:
            if abs(p + 1.0) < 1e-12:
                out = out + c * np.log(z)
            else:
                out = out + c * z ** (p + 1.0) / (p + 1.0)
        return out


def uv_divergence(bg) -> UVDivergence:
    """Find the divergent terms of H at z -> 0 (sympy series, numeric values substituted).

    Parameters
    ----------
    bg
        A :class:`~holostring.background.Background`.

    Returns
    -------
    UVDivergence
    """
    key = ("uv-divergence", tuple(bg.values))
    cache = bg._compiled.expressions
    if key in cache:
        return cache[key]  # type: ignore[return-value]
    import sympy as sp

    from holostring.background.formula import Z

    H = bg.expression("H").subs(bg.substitutions())
    terms: list[tuple[float, float]] = []
    regular: list[tuple[float, float]] = []
    radius = 0.0
    order = 8
    try:
        ser = sp.series(H, Z, 0, order).removeO()
        for term in sp.Add.make_args(sp.expand(ser)):
            coeff, power = term.as_coeff_exponent(Z)
            if coeff.has(Z) or not power.is_number:
                raise ValueError("non-power term")
            p, c = float(power), float(coeff)
            (terms if p < 0 else regular).append((p, c))
        # below this radius the omitted terms, O(z^order), are below 1e-16 of the kept ones
        big = max([abs(c) for _, c in regular] + [1.0])
        last = max((abs(c) for _, c in regular), default=0.0)
        radius = (1e-16 / max(last, 1e-300)) ** (1.0 / order) * min(1.0, big) if regular else 1.0
        z_ir = bg.z_ir if math.isfinite(bg.z_ir) else 1.0
        radius = min(radius, 0.05 * z_ir, 0.05)
    except Exception:
        terms, regular, radius = [], [], 0.0
    if not terms:
        Hn = bg.function("H")
        z0 = 1e-6 * (bg.z_ir if math.isfinite(bg.z_ir) else 1.0)
        h0 = float(Hn(np.array([z0]))[0]) * z0**2
        terms = [(-2.0, h0)]
    text = " + ".join(f"{c:.12g} z^{p:g}" for p, c in terms)
    out = UVDivergence(tuple(terms), text, tuple(regular), radius)
    cache[key] = out  # type: ignore[assignment]
    return out


def straight_pair_energy(
    bg,
    uv: UVDivergence,
    H: Callable,
    H_near_end: Callable | None = None,
) -> tuple[float, float]:
    """Energy (uv-pole scheme, without the factor g) of two straight strings to the IR end.

    Returns ``(value, error_estimate)`` of ``2 [int_0^{z_IR} (H - D) dz + P(z_IR)]``.

    Raises
    ------
    NotApplicableError
        When the integral diverges (no IR end and H not decaying, or a log-divergent pole).
    """
    from holostring.strings.quadrature import gauss_legendre

    z_ir = bg.z_ir
    if any(abs(p + 1.0) < 1e-12 for p, _ in uv.terms) and math.isinf(z_ir):
        raise NotApplicableError(
            "scheme straight-strings: the UV pole has a 1/z term, the straight string diverges"
        )
    if math.isinf(z_ir):
        # z = s/(1 - s) maps [0, 1) onto [0, inf); check decay first
        zt = np.array([1e2, 1e3, 1e4])
        with np.errstate(all="ignore"):
            tail = np.abs((H(zt) - uv.D(zt)) * zt**1.5)
        if not np.all(np.isfinite(tail)) or tail[-1] > 1e-3 * max(tail[0], 1e-300) + 1e-12:
            raise NotApplicableError(
                f"scheme straight-strings: the straight string to the IR end of '{bg.name}' has "
                "infinite energy (H does not fall off at large z); use uv-pole"
            )
        import warnings

        from scipy import integrate

        def f(z: float) -> float:
            return float(H(np.array([z]))[0] - uv.D(np.array([z]))[0])

        with warnings.catch_warnings():
            warnings.simplefilter("ignore", integrate.IntegrationWarning)
            val1, err1 = integrate.quad(f, 0.0, 1.0, epsabs=1e-14, epsrel=1e-13, limit=400)
            val2, err2 = integrate.quad(f, 1.0, np.inf, epsabs=1e-14, epsrel=1e-13, limit=400)
        return 2.0 * (val1 + val2), 2.0 * (err1 + err2)

    def integral(n: int) -> float:
        # z = z_IR (1 - t^2) removes a 1/sqrt(z_IR - z) end singularity of H
        t, w = gauss_legendre(n)
        t = np.asarray(t)
        z = z_ir * (1.0 - t * t)
        with np.errstate(all="ignore"):
            Hv = H(z) if H_near_end is None else H_near_end(z, z_ir * t * t)
        vals = (Hv - uv.D(z)) * 2.0 * z_ir * t
        return float(np.sum(w * vals)) + float(uv.P(np.array([z_ir]))[0])

    a, b = integral(96), integral(192)
    if not (math.isfinite(a) and math.isfinite(b)):
        raise NotApplicableError(
            f"scheme straight-strings: the straight-string energy of '{bg.name}' is not finite"
        )
    return 2.0 * b, 2.0 * abs(b - a)


def _power_sum(terms: tuple[tuple[float, float], ...], z: np.ndarray) -> np.ndarray:
    """sum c z^p over (p, c) pairs."""
    z = np.asarray(z, dtype=float)
    out = np.zeros_like(z)
    for p, c in terms:
        out = out + c * z**p
    return out
