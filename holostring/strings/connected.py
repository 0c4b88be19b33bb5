"""Connected (U-shaped) static strings: L(z*) and E(z*) for many turning points at once.

With ``Q = F^2 = G_tt G_xx`` and ``H = sqrt(G_tt G_zz)`` (string frame), a string with turning
point ``z*`` has (Maldacena hep-th/9803002; Sonnenschein hep-th/0003032, eqs. 2.6-2.8)::

    L(z*) = 2 int_0^{z*} H F* / (F sqrt(Q - Q*)) dz
    E(z*) = g [ W(z*) + F* L(z*) ],   W(z*) = 2 int_0^{z*} (H sqrt(1 - Q*/Q) - D) dz + 2 P(z*)

``W = E/g - F* L`` is the Legendre transform of the energy: its integrand has no endpoint
singularity, and ``dW/dF* = -L`` is equivalent to ``dE/dL = g F*``. ``D``, ``P`` are the UV
subtraction of :mod:`holostring.strings.schemes`.

Turning points are labelled by a parameter ``p``: ``z* = z_end expit(p)``, ``z_end - z* =
z_end expit(-p)`` when the family ends at a finite ``z_end`` (so that both the UV, ``p -> -inf``,
and the approach to the end, ``p -> +inf``, are on a log scale), ``z* = exp(p)`` otherwise. Near an
*anchor* (a minimum ``z_m`` of F, or an IR end where H diverges), where ``L -> infinity``
logarithmically, Q and H are represented by Taylor series in ``y = z_end - z`` obtained from a
Cauchy integral, so that ``Q - Q*`` keeps full relative accuracy for ``z_end - z*`` down to
``1e-300 z_end`` and the strings reach separations of hundreds of confinement lengths.
"""

from __future__ import annotations

import math
from collections import OrderedDict
from dataclasses import dataclass, field

import numpy as np
from scipy.special import expit

from holostring.background.frames import Frame
from holostring.background.model import Background, IRKind
from holostring.errors import NotApplicableError
from holostring.strings import quadrature as quad
from holostring.strings.schemes import UVDivergence, uv_divergence

#: connected families kept per background structure (one per parameter values)
FAMILY_CACHE_SIZE = 8


class EndKind:
    """How the family of connected strings ends as p -> +inf."""

    MINIMUM = "minimum"  #: F has a minimum F(z_m) > 0: L -> inf, linear confinement
    CAP = "cap"  #: space ends with F > 0 and H diverging: L -> inf, linear confinement
    WALL = "wall"  #: space ends with F > 0, L finite: the string continues along the wall
    HORIZON = "horizon"  #: F -> 0 at a horizon: L has a maximum, strings screen
    OPEN = "open"  #: no end in range (pure AdS-like): L -> inf as z* -> inf, no tension
    END = "end"  #: a smooth end with F > 0 and finite L (not continued)


def _trim(c: np.ndarray, radius: float) -> np.ndarray:
    """Drop trailing Taylor coefficients whose terms stay below 1e-18 of the largest on the disc."""
    size = np.abs(c) * radius ** np.arange(c.size)
    keep = np.nonzero(size > 1e-18 * size.max())[0]
    return c[: max(int(keep[-1]) + 1, 3)].copy()


def _series_difference(
    c: np.ndarray, ystar: np.ndarray, h: np.ndarray, r_star: np.ndarray | None = None
) -> np.ndarray:
    """``q(ystar + h) - q(ystar)`` for ``q(y) = sum c_k y^k`` with full relative accuracy.

    Where ``h >= ystar / 4`` the two sums without ``c_0`` are subtracted (at most a factor ~3
    of rounding is lost, one Horner pass per node); closer pairs use the cancellation-free
    recurrence of :func:`~holostring.strings.quadrature.taylor_difference_h`. ``r_star``
    optionally supplies ``q(ystar) - c_0`` (computed once per turning point by the caller).
    """
    c1 = c.copy()
    c1[0] = 0.0
    if r_star is None:
        r_star = quad.taylor_value(c1, ystar)
    out = quad.taylor_value(c1, ystar + h) - r_star
    close = np.nonzero(h < 0.25 * ystar)[0]
    if close.size:
        out[close] = quad.taylor_difference_h(c, ystar[close], h[close])
    return out


@dataclass
class Anchor:
    """Taylor data near the end of the family (see module docstring)."""

    z: float
    radius: float  #: Taylor representation used for y = z_end - z <= radius
    cQ: np.ndarray  #: Q(z_end - y) = sum cQ_k y^k
    cH: np.ndarray | None  #: y^pH H^2(z_end - y) = sum cH_k y^k (None: evaluate H directly)
    pH: int = 0


@dataclass
class ConnectedFamily:
    """Numeric machinery for the connected strings of one background (internal).

    Build with :meth:`build`; :meth:`evaluate` returns L, W, z*, F* for an array of ``p``.
    """

    bg: Background
    Q: object
    dQ: object
    H2: object
    uv: UVDivergence
    end: str
    z_end: float
    anchor: Anchor | None
    notes: list[str] = field(default_factory=list)

    # ------------------------------------------------------------------ construction
    @classmethod
    def build(cls, bg: Background) -> ConnectedFamily:
        """Compile F^2, its derivative and H^2, locate the end of the family and its anchor."""
        import sympy as sp

        from holostring.background.formula import Z

        key = tuple(bg.values)
        cache = bg._compiled.memo.setdefault("connected-families", OrderedDict())
        if key in cache:
            cache.move_to_end(key)
            return cache[key]
        m = bg.metric(Frame.STRING)
        Qe = m["G_tt"] * m["G_xx"]
        H2e = m["G_tt"] * m["G_zz"]
        Q = bg.function(Qe)
        dQ = bg.function(sp.diff(Qe, Z))
        H2 = bg.function(H2e)
        fam = cls(
            bg=bg, Q=Q, dQ=dQ, H2=H2, uv=uv_divergence(bg), end=EndKind.OPEN, z_end=math.inf, anchor=None
        )
        fam._locate_end()
        cache[key] = fam
        while len(cache) > FAMILY_CACHE_SIZE:
            cache.popitem(last=False)  # scans and fits visit many values: keep the latest few
        return fam

    def _locate_end(self) -> None:
        bg = self.bg
        z_ir = bg.z_ir
        if math.isinf(z_ir):
            z = np.geomspace(1e-6, 1e6, 3000)
        else:
            z = np.unique(
                np.concatenate(
                    [
                        z_ir * np.geomspace(1e-6, 0.5, 1500),
                        z_ir * (1.0 - np.geomspace(0.5, 1e-10, 1500)),
                    ]
                )
            )
        with np.errstate(all="ignore"):
            d = np.asarray(self.dQ(z), dtype=float)
        ok = np.isfinite(d)
        if ok[0] and d[0] >= 0:
            raise NotApplicableError(
                f"potential: F = sqrt(G_tt G_xx) of '{bg.name}' does not decrease from the boundary"
            )
        turn = np.nonzero(ok[:-1] & ok[1:] & (d[:-1] < 0) & (d[1:] >= 0))[0]
        if len(turn):
            from scipy.optimize import brentq

            i = int(turn[0])
            zm = brentq(
                lambda x: float(self.dQ(np.array([x]))[0]),
                z[i],
                z[i + 1],
                xtol=1e-300,
                rtol=1e-15,
                maxiter=400,
            )
            self.end, self.z_end = EndKind.MINIMUM, zm
            self._make_anchor(pH=0)
            rest = z[z > zm * 1.001]
            with np.errstate(all="ignore"):
                later = np.asarray(self.Q(rest), dtype=float)
            if rest.size and np.nanmin(later) < float(self.Q(np.array([zm]))[0]) * (1 - 1e-12):
                self.notes.append(
                    "F falls below F(z_m) again beyond its minimum z_m; connected strings with "
                    "turning points there are not computed"
                )
            return
        if math.isinf(z_ir):
            self.end, self.z_end = EndKind.OPEN, math.inf
            return
        self.z_end = z_ir
        with np.errstate(all="ignore"):
            q_end = float(self.Q(np.array([z_ir]))[0])
            q_mid = float(self.Q(np.array([0.5 * z_ir]))[0])
        if not (q_end > 1e-12 * q_mid) or bg.ir.kind is IRKind.HORIZON:
            self.end = EndKind.HORIZON
            self._make_anchor(pH=0)
            return
        y = z_ir * np.array([1e-6, 1e-8])
        with np.errstate(all="ignore"):
            h2 = np.asarray(self.H2(z_ir - y), dtype=float)
        power = math.log(h2[1] / h2[0]) / math.log(100.0) if np.all(h2 > 0) else 0.0
        if power > 0.5:
            self.end = EndKind.CAP
            self._make_anchor(pH=round(power))
        elif bg.ir.kind is IRKind.WALL:
            self.end = EndKind.WALL
        else:
            self.end = EndKind.END
            self.notes.append("the IR end is reached at finite L; strings are not continued past it")

    def _make_anchor(self, pH: int) -> None:
        za = self.z_end
        radius = 0.5 * za
        for _ in range(5):
            cQ = quad.taylor_coefficients(lambda y: self.Q(za - y), 0.0, radius, 64)
            if self.end == EndKind.MINIMUM:
                cQ[1] = 0.0  # the expansion point is the minimum (|c1| ~ eps)
            cH = None
            if pH:
                cH = quad.taylor_coefficients(lambda y: y**pH * self.H2(za - y), 0.0, radius, 64)
            use = 0.3 * radius
            ys = use * np.array([1e-3, 0.1, 0.5, 1.0])
            with np.errstate(all="ignore"):
                qd = np.asarray(self.Q(za - ys), dtype=float)
                good = np.allclose(quad.taylor_value(cQ, ys), qd, rtol=1e-11, atol=0)
                if cH is not None:
                    hd = ys**pH * np.asarray(self.H2(za - ys), dtype=float)
                    ys_far = ys[1:]
                    good = good and np.allclose(quad.taylor_value(cH, ys_far), hd[1:], rtol=1e-9)
            if good:
                cQ = _trim(cQ, use)
                cH = None if cH is None else _trim(cH, use)
                self.anchor = Anchor(z=za, radius=use, cQ=cQ, cH=cH, pH=pH)
                return
            radius *= 0.5
        self.anchor = None
        self.notes.append(
            "the metric is not analytic near the end point; accuracy near it is limited to ~1e-8"
        )

    # ------------------------------------------------------------------ evaluation
    def zstar(self, p: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Turning point z* and distance to the end y* for parameters p."""
        p = np.asarray(p, dtype=float)
        if math.isinf(self.z_end):
            return np.exp(p), np.full_like(p, np.inf)
        return self.z_end * expit(p), self.z_end * expit(-p)

    def p_of_zstar(self, zstar: np.ndarray) -> np.ndarray:
        """Inverse of :meth:`zstar` (z* in (0, z_end])."""
        zstar = np.asarray(zstar, dtype=float)
        if math.isinf(self.z_end):
            return np.log(zstar)
        with np.errstate(divide="ignore"):
            return np.log(zstar) - np.log(self.z_end - zstar)

    @property
    def confining(self) -> bool:
        """Whether L -> infinity along the family with F* -> F(z_end) > 0, or a wall continues it."""
        return self.end in (EndKind.MINIMUM, EndKind.CAP, EndKind.WALL)

    def end_F(self) -> float | None:
        """F at the end of the family (the string tension over g), when confining."""
        if not self.confining:
            return None
        if self.anchor is not None:
            return math.sqrt(float(self.anchor.cQ[0]))
        return math.sqrt(float(self.Q(np.array([self.z_end]))[0]))

    def evaluate(self, p: np.ndarray, m: int = 12) -> dict[str, np.ndarray]:
        """L, W, z*, F* at parameters ``p`` with ``m`` Gauss points per panel.

        All turning points are integrated at once: the nodes of every row (only the panels a
        row needs, see :func:`~holostring.strings.quadrature.ragged_rule`) form one flat array,
        the integrands are evaluated once per node and summed per row.

        Returns
        -------
        dict
            ``zstar, ystar, Fstar, L, W`` (W without the factor g, uv-pole scheme).
        """
        p = np.atleast_1d(np.asarray(p, dtype=float))
        zs, ys = self.zstar(p)
        a = self.stretch(zs, ys)
        row, t, w = quad.ragged_rule(a, m)
        Qstar = self._Qstar(zs, ys)
        L_int, W_int = self.integrands_flat(zs, ys, Qstar, row, t)
        k = zs.size
        with np.errstate(all="ignore"):
            L = 2.0 * np.bincount(row, weights=w * L_int, minlength=k)
            W = 2.0 * (np.bincount(row, weights=w * W_int, minlength=k) + self.uv.P(zs))
        Fstar = np.sqrt(Qstar)
        # the horizon itself: F* = 0, the string is the straight pair (L = 0)
        if self.end == EndKind.HORIZON:
            L = np.where((Fstar <= 0) | ~np.isfinite(L), 0.0, L)
        return {"zstar": zs, "ystar": ys, "Fstar": Fstar, "L": L, "W": W}

    def stretch(self, zs: np.ndarray, ys: np.ndarray) -> np.ndarray:
        """Scale a of the near-singular factor 1/sqrt(a^2 + t^2) (inf: none)."""
        stretched = self.anchor is not None or self.end in (EndKind.MINIMUM, EndKind.CAP, EndKind.HORIZON)
        with np.errstate(all="ignore"):
            a = np.sqrt(2.0 * ys / zs) if stretched else np.full_like(zs, np.inf)
        a = np.where(np.isfinite(a), a, np.inf)
        return np.where(a > 0, a, 1e-300)

    def integrands(
        self, zs: np.ndarray, ys: np.ndarray, t: np.ndarray
    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """F*, and the L and W integrands in t (Jacobian 2 z* t included) at z = z*(1 - t^2).

        ``t`` has shape ``(k, n)``: ``n`` nodes for each of the ``k`` turning points.
        """
        t = np.asarray(t, dtype=float)
        k, n = t.shape
        row = np.repeat(np.arange(k), n)
        Qstar = self._Qstar(zs, ys)
        L_int, W_int = self.integrands_flat(zs, ys, Qstar, row, t.ravel())
        return np.sqrt(Qstar), L_int.reshape(k, n), W_int.reshape(k, n)

    def integrands_flat(
        self, zs: np.ndarray, ys: np.ndarray, Qstar: np.ndarray, row: np.ndarray, t: np.ndarray
    ) -> tuple[np.ndarray, np.ndarray]:
        """The L and W integrands at flat nodes ``t`` belonging to turning points ``zs[row]``.

        ``Q - Q*`` is what the accuracy hinges on. Near the anchor it comes from the Taylor
        data (a difference of series, no cancellation); elsewhere directly when less than a
        digit cancels, and otherwise as ``h`` times the mean of ``dQ/dz`` on the segment.
        """
        an = self.anchor
        zr = zs[row]
        h = zr * t * t
        z = zr - h
        Qs = Qstar[row]
        n = t.size
        dQ = np.empty(n)
        Qz = np.empty(n)
        Hz = np.empty(n)
        with np.errstate(all="ignore"):
            if an is not None:
                yr = ys[row]
                A = (yr + h) <= an.radius
                iA = np.nonzero(A)[0]
                rest = np.nonzero(~A)[0]
                c1 = an.cQ.copy()
                c1[0] = 0.0
                near = ys <= an.radius
                r_row = np.zeros_like(ys)
                r_row[near] = quad.taylor_value(c1, ys[near])
                dA = _series_difference(an.cQ, yr[iA], h[iA], r_row[row[iA]])
                dQ[iA] = dA
                Qz[iA] = Qs[iA] + dA
                if an.cH is not None:
                    yA = yr[iA] + h[iA]
                    Hz[iA] = np.sqrt(quad.taylor_value(an.cH, yA) / yA**an.pH)
                    Hz[rest] = np.sqrt(self.H2(z[rest]))
                else:
                    Hz[:] = np.sqrt(self.H2(z))
            else:
                rest = np.arange(n)
                Hz[:] = np.sqrt(self.H2(z))
            zR, hR = z[rest], h[rest]
            QR = np.asarray(self.Q(zR), dtype=float)
            Qz[rest] = QR
            direct = QR - Qs[rest]
            # less than a digit left in the direct difference: use the mean of dQ on the segment
            lost = (direct < 0.1 * QR) & (hR <= 0.25 * zr[rest])
            for m_seg, sel in ((4, lost & (hR <= 0.02 * zr[rest])), (8, lost & (hR > 0.02 * zr[rest]))):
                i = np.nonzero(sel)[0]
                if i.size:
                    direct[i] = -quad.mean_on_segment(self.dQ, zr[rest][i], hR[i], m_seg)
            dQ[rest] = direct
            root = np.sqrt(dQ / Qz)  # sqrt(1 - Q*/Q)
            jac = 2.0 * zr * t
            Fs = np.sqrt(Qs)
            L_int = jac * Hz * Fs / (np.sqrt(Qz) * np.sqrt(dQ))
            uv = self.uv
            HmD = np.empty(n)
            small = z < uv.series_radius
            i = np.nonzero(small)[0]
            HmD[i] = uv.regular_part(z[i])
            i = np.nonzero(~small)[0]
            HmD[i] = Hz[i] - uv.D(z[i])
            W_int = jac * (-Hz * (Qs / Qz) / (1.0 + root) + HmD)
        return L_int, W_int

    def _Qstar(self, zs: np.ndarray, ys: np.ndarray) -> np.ndarray:
        an = self.anchor
        with np.errstate(all="ignore"):
            out = np.asarray(self.Q(zs), dtype=float).copy()
            if an is not None:
                near = ys <= an.radius
                out[near] = quad.taylor_value(an.cQ, ys[near])
        return np.maximum(out, 0.0)

    def H_near_end(self, z: np.ndarray, y: np.ndarray) -> np.ndarray:
        """H at z = z_end - y using the anchor's Taylor data where available."""
        an = self.anchor
        with np.errstate(all="ignore"):
            out = np.sqrt(np.asarray(self.H2(z), dtype=float))
            if an is not None and an.cH is not None:
                near = y <= an.radius
                out[near] = np.sqrt(quad.taylor_value(an.cH, y[near]) / y[near] ** an.pH)
        return out

    def H(self, z: np.ndarray) -> np.ndarray:
        """H(z) evaluated directly."""
        with np.errstate(all="ignore"):
            return np.sqrt(np.asarray(self.H2(np.asarray(z, dtype=float)), dtype=float))
