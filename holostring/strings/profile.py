"""String profiles x(z): the shape of each static-string configuration at one separation."""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from holostring.background.model import Background
from holostring.errors import InputError
from holostring.provenance import Provenance
from holostring.strings import quadrature as quad
from holostring.strings.connected import ConnectedFamily
from holostring.strings.potential import M_HI, M_LO
from holostring.strings.results import ProfileResult, StringProfile


def half_profile(
    fam: ConnectedFamily, p: float, points: int = 80, m: int = M_HI
) -> tuple[np.ndarray, np.ndarray]:
    """Distance from the turning point x(z) = int_z^{z*} (dx/dz) dz on ``points`` depths.

    Returns ``(z, x)`` from the boundary (x = L/2) down to the turning point (x = 0).
    """
    zs, ys = fam.zstar(np.array([p]))
    a = float(fam.stretch(zs, ys)[0])
    tj = np.sin(0.5 * np.pi * np.linspace(0.0, 1.0, points))[1:]  # t of the depth points
    k = tj.size
    t, w = quad.stretched_rule(np.full(k, a) / tj, m)
    t = t * tj[:, None]
    w = w * tj[:, None]
    _, L_int, _ = fam.integrands(np.full(k, zs[0]), np.full(k, ys[0]), t)
    x = np.sum(w * L_int, axis=1)
    z = zs[0] * (1.0 - tj * tj)
    return np.concatenate([z[::-1], [zs[0]]]), np.concatenate([x[::-1], [0.0]])


#: quantiles of a V(L) grid at which profiles are drawn beside it
SHOWN_QUANTILES = (0.1, 0.35, 0.6, 0.9)


def profiles_along(background: Background, potential: Any) -> list[ProfileResult]:
    """Profiles at a few separations spread over a potential result's L grid (for plots)."""
    L_show = np.quantile(potential.L, SHOWN_QUANTILES)
    return [string_profile(background, float(x), scheme=potential.scheme) for x in L_show]


def string_profile(
    background: Background | str,
    L: float | None = None,
    *,
    zstar: float | None = None,
    scheme: str = "uv-pole",
    points: int = 80,
) -> ProfileResult:
    """Profiles x(z) of every static string at separation ``L`` (or of one turning point).

    Parameters
    ----------
    background
        A Background or a catalogue name / file path.
    L
        Quark separation: every configuration existing there (connected branches, the string
        along a wall, the disconnected pair), the minimum-energy one marked.
    zstar
        Instead of L: the connected string with this turning point.
    scheme
        Energy scheme for the reported V.
    points
        Depth samples per half string.

    Returns
    -------
    ProfileResult

    Raises
    ------
    InputError
        Neither or both of L and zstar, or values out of range.

    Examples
    --------
    >>> import holostring as hs
    >>> prof = hs.string_profile(hs.load_background("soft-wall"), 2.0)
    >>> round(float(prof.minimum.x.max()), 12)
    1.0
    """
    from holostring.strings.compute import _background, compute_potential

    bg = _background(background)
    if (L is None) == (zstar is None):
        raise InputError("L", "give exactly one of L and zstar")
    fam = ConnectedFamily.build(bg)
    if zstar is not None:
        zstar = float(zstar)
        if not (0 < zstar <= fam.z_end) or (zstar == fam.z_end and fam.end != "wall"):
            raise InputError("zstar", f"must lie in (0, {fam.z_end:g}) for '{bg.name}'")
        p = float(fam.p_of_zstar(np.array([zstar]))[0])
        hi = fam.evaluate(np.array([p]), M_HI)
        lo = fam.evaluate(np.array([p]), M_LO)
        Ls = float(hi["L"][0])
        z, x = half_profile(fam, p, points)
        V = bg.g * float(hi["W"][0] + hi["Fstar"][0] * Ls)
        prof = _connected(z, x, Ls, V, float(zstar), "connected", True, True)
        err = abs(float(hi["L"][0] - lo["L"][0]))
        return ProfileResult(
            L=Ls,
            profiles=(prof,),
            error_estimate=err,
            converged=True,
            message="converged",
            provenance=_prov(bg, scheme),
        )
    if not (isinstance(L, int | float) and math.isfinite(L) and L > 0):
        raise InputError("L", f"must be a positive number, got {L}")
    res = compute_potential(bg, L=[float(L)], scheme=scheme)
    profiles = []
    for j, br in enumerate(res.branches):
        if br.L.size == 0:
            continue
        minimum = int(res.branch_of_minimum[0]) == j
        V = float(br.V[0])
        if br.kind == "disconnected":
            zz = np.linspace(0.0, fam.z_end, points)
            x = np.concatenate([np.full(points, -L / 2), np.full(points, L / 2)])
            profiles.append(
                StringProfile(
                    "disconnected",
                    True,
                    minimum,
                    float(L),
                    V,
                    math.nan,
                    x,
                    np.concatenate([zz, zz[::-1]]),
                    (points,),
                )
            )
            continue
        zs = float(br.zstar[0])
        p = float(fam.p_of_zstar(np.array([zs]))[0]) if br.kind == "connected" else 60.0
        z, xh = half_profile(fam, p, points)
        if br.kind == "wall":
            L0 = 2.0 * float(xh[0])
            left = -L / 2 + (L0 / 2 - xh)
            xs = np.concatenate([left, (-left)[::-1]])
            zz = np.concatenate([z, z[::-1]])
            profiles.append(StringProfile("wall", True, minimum, float(L), V, zs, xs, zz))
        else:
            profiles.append(_connected(z, xh, float(L), V, zs, br.label, br.stable, minimum))
    return ProfileResult(
        L=float(L),
        profiles=tuple(profiles),
        error_estimate=res.error_estimate,
        converged=res.converged,
        message=res.message,
        provenance=_prov(bg, scheme),
    )


def _connected(z, xh, L, V, zs, kind, stable, minimum) -> StringProfile:
    x = np.concatenate([-xh, xh[::-1]])
    zz = np.concatenate([z, z[::-1]])
    return StringProfile(
        kind if kind.startswith("connected") else "connected", stable, minimum, L, V, zs, x, zz
    )


def _prov(bg: Background, scheme: str) -> Provenance:
    return Provenance(
        background=bg.name,
        parameters=dict(bg.params),
        frame="string",
        settings={"scheme": str(scheme), "gauss_points_per_panel": [M_LO, M_HI]},
    )
