"""Thermal partners: the zero-temperature (thermal) and black-brane versions of one background.

A finite-temperature study compares two Euclidean geometries with the same boundary and dilaton:

- the *thermal* geometry: the zero-temperature background with periodic Euclidean time (no
  horizon), which keeps its IR end (a hard wall at z0, or z -> infinity);
- the *black brane*: the same warp and dilaton with a blackening factor f(z) in
  G_tt -> f G_tt, G_zz -> G_zz / f, whose zero z_h is the horizon. The temperature follows from
  regularity at the horizon, T = |f'(z_h)| / (4 pi) (for G_tt = w f, G_zz = w / f).

By default f is the AdS5 black-brane factor f = 1 - z^4/z_h^4 (Witten hep-th/9803131), added to
the warp exactly as the hard- and soft-wall models do at finite temperature (Herzog
hep-th/0608151). The background is not back-reacted: the warp and the dilaton do not change with
T. A background file that already has a blackening factor and a horizon supplies its own f.

Catalogue pairs (``hard-wall`` / ``hard-wall-black-brane``, ``soft-wall`` /
``soft-wall-black-brane``, ``ads`` / ``ads-black-brane``) are taken from the catalogue files.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
import sympy as sp

from holostring.background.formula import Z
from holostring.background.model import Background, IREnd, IRKind, Parameter
from holostring.errors import InputError, NotApplicableError

#: catalogue black-brane entry -> its zero-temperature entry
CATALOGUE_PAIRS: dict[str, str] = {
    "ads-black-brane": "ads",
    "hard-wall-black-brane": "hard-wall",
    "soft-wall-black-brane": "soft-wall",
}
#: name of the horizon parameter of the catalogue black branes and of the ones built here
HORIZON = "zh"


@dataclass(frozen=True, eq=False)
class ThermalFamily:
    """A background at zero temperature and its black-brane partner, as one family in z_h.

    Attributes
    ----------
    name
        Name of the zero-temperature background.
    thermal
        The zero-temperature background (no horizon); its IR end is kept (wall or infinity).
    black_brane
        The black-brane background, with the horizon position as parameter ``horizon``
        (vary it with :meth:`at`).
    horizon
        Name of the horizon parameter in ``black_brane``.
    blackening
        f(z) as a sympy expression in z and the parameter symbols of ``black_brane``.
    construction
        How the black brane was obtained (catalogue pair, added AdS factor, or user's f).
    """

    name: str
    thermal: Background
    black_brane: Background
    horizon: str
    blackening: sp.Expr
    construction: str

    @property
    def wall(self) -> float:
        """IR end of the thermal geometry: wall position, or ``inf`` when z runs to infinity."""
        return self.thermal.z_ir

    @property
    def energy_unit(self) -> str | None:
        """Energy unit of the parameters (``None`` without units)."""
        return self.thermal.energy_unit

    @property
    def g(self) -> float:
        """The string coupling g = R^2 / (2 pi alpha')."""
        return self.black_brane.g

    def at(self, zh: float) -> Background:
        """The black brane with its horizon at ``zh`` (shares compiled functions)."""
        return self.black_brane.with_params(**{self.horizon: float(zh)})

    def temperature(self, zh: Any) -> Any:
        """Hawking temperature T = |f'(z_h)| / (4 pi) for horizon positions ``zh`` (vectorised).

        The blackening f may depend on z_h; its derivative is taken in z at fixed z_h, then
        evaluated at z = z_h.
        """
        zh_arr = np.asarray(zh, dtype=float)
        raw = self.black_brane.raw_function(sp.diff(self.blackening, Z))
        names = [p.name for p in self.black_brane.parameters]
        k = names.index(self.horizon)
        values = list(self.black_brane.values)
        out = np.empty_like(zh_arr, dtype=float)
        flat = out.reshape(-1)
        for i, x in enumerate(zh_arr.reshape(-1)):
            values[k] = float(x)
            flat[i] = abs(float(np.real(raw(np.array([x]), *values)[0]))) / (4.0 * math.pi)
        return out if out.ndim else float(out)

    def horizon_for(self, T: float, bracket: tuple[float, float] | None = None) -> float:
        """Horizon position z_h with temperature ``T`` (inverts :meth:`temperature`).

        For the AdS black-brane factor this is z_h = 1/(pi T) exactly; otherwise a bracketed
        root search on a geometric z_h grid (the branch with the smallest z_h is returned).

        Raises
        ------
        InputError
            When ``T`` is not positive or no horizon has this temperature.
        """
        if not (T > 0 and math.isfinite(T)):
            raise InputError("temperature", f"must be a positive number, got {T!r}")
        if self.is_ads_factor:
            return 1.0 / (math.pi * T)
        from scipy.optimize import brentq

        lo, hi = bracket or (1e-4 * self.scale, 1e4 * self.scale)
        grid = np.geomspace(lo, hi, 400)
        t = self.temperature(grid) - T
        idx = np.nonzero(np.sign(t[:-1]) != np.sign(t[1:]))[0]
        if idx.size == 0:
            raise InputError("temperature", f"no horizon in [{lo:.3g}, {hi:.3g}] has T = {T:g}")
        i = int(idx[0])
        return float(
            brentq(
                lambda x: float(self.temperature(x)) - T,
                grid[i],
                grid[i + 1],
                xtol=1e-15,
                rtol=4 * np.finfo(float).eps,
            )
        )

    @property
    def is_ads_factor(self) -> bool:
        """Whether f is exactly the AdS5 black-brane factor 1 - z^4/z_h^4."""
        zh = self.black_brane.symbols[self.horizon]
        return sp.simplify(self.blackening - (1 - Z**4 / zh**4)) == 0

    @property
    def scale(self) -> float:
        """A length scale of the family: the wall, else one from the dilaton, else 1."""
        if math.isfinite(self.wall):
            return self.wall
        phi = self.thermal.function("Phi")
        zz = np.geomspace(1e-3, 1e3, 121)
        with np.errstate(all="ignore"):
            vals = np.abs(np.asarray(phi(zz), dtype=float))
        hit = np.nonzero(vals >= 1.0)[0]
        return float(zz[hit[0]]) if hit.size else 1.0


def thermal_family(bg: Background) -> ThermalFamily:
    """Build the thermal (zero-temperature) and black-brane partners of a background.

    Parameters
    ----------
    bg
        A zero-temperature background (IR end at infinity or a wall, no blackening) or a black
        brane (a blackening factor and an IR horizon whose position is a parameter).

    Returns
    -------
    ThermalFamily

    Raises
    ------
    NotApplicableError
        For a background with a compact circle or a capped IR end (solitons), or a black brane
        whose horizon position is not a parameter.

    References
    ----------
    Herzog, Phys. Rev. Lett. 98 (2007) 091601, hep-th/0608151 (black-brane versions of the hard
    and soft walls); Witten, hep-th/9803131 (the AdS5 black brane).

    Examples
    --------
    >>> from holostring.background import load_background
    >>> fam = thermal_family(load_background("hard-wall", z0=2.0))
    >>> round(float(fam.temperature(0.5)), 12) == round(1 / (0.5 * 3.141592653589793), 12)
    True
    """
    from holostring.background import catalogue, load_background

    if bg.G_yy is not None or bg.n_flat != 3 or bg.ir.kind is IRKind.CAP:
        raise NotApplicableError(
            f"background '{bg.name}': temperature needs a 5D background with three flat "
            "directions and an IR end at infinity, a wall or a horizon (not a soliton)"
        )
    origin = bg.origin.removeprefix("catalogue:") if bg.origin.startswith("catalogue:") else None
    params = bg.params
    if origin in CATALOGUE_PAIRS or origin in CATALOGUE_PAIRS.values():
        if origin in CATALOGUE_PAIRS:
            bb_name, zero_name = origin, CATALOGUE_PAIRS[origin]
        else:
            zero_name = origin
            bb_name = next(k for k, v in CATALOGUE_PAIRS.items() if v == origin)
        zero = catalogue.entry(zero_name)
        bb = catalogue.entry(bb_name)
        zero = zero.with_params(**{k: v for k, v in params.items() if k in zero.params})
        bb = bb.with_params(**{k: v for k, v in params.items() if k in bb.params})
        zero = zero.with_units(bg.energy_unit)
        bb = bb.with_units(bg.energy_unit)
        assert bb.blackening is not None
        return ThermalFamily(
            zero_name, zero, bb, HORIZON, bb.blackening, f"catalogue pair {zero_name} / {bb_name}"
        )
    if bg.ir.kind is IRKind.HORIZON:
        return _from_black_brane(bg)
    if bg.blackening is not None and bg.blackening != 1:
        raise NotApplicableError(f"background '{bg.name}': has a blackening factor but no horizon IR end")
    bb = _add_ads_factor(bg)
    load_background(bb.with_params(**{HORIZON: 0.5 * _finite_scale(bg)}))  # checks the metric
    return ThermalFamily(
        bg.name,
        bg,
        bb,
        HORIZON,
        bb.blackening,  # type: ignore[arg-type]
        "AdS5 black-brane factor f = 1 - z^4/zh^4 added to the warp",
    )


def _finite_scale(bg: Background) -> float:
    return bg.z_ir if math.isfinite(bg.z_ir) else 1.0


def _add_ads_factor(bg: Background) -> Background:
    names = {p.name for p in bg.parameters}
    if HORIZON in names:
        raise NotApplicableError(
            f"background '{bg.name}': already has a parameter '{HORIZON}' but no horizon"
        )
    zh_param = Parameter(
        HORIZON, 1.0, lower=0.0, lower_open=True, dimension=-1.0, meaning="horizon position; T = 1/(pi zh)"
    )
    zh = zh_param.symbol
    f = 1 - Z**4 / zh**4
    return Background.from_components(
        f"{bg.name}-black-brane",
        G_tt=bg.G_tt * f,
        G_xx=bg.G_xx,
        G_zz=bg.G_zz / f,
        parameters=(*bg.parameters, zh_param),
        values={**bg.params, HORIZON: 1.0},
        frame=bg.frame,
        frame_rule=bg.frame_rule,
        dilaton=bg.dilaton,
        blackening=f,
        ir=IREnd(IRKind.HORIZON, zh),
        title=f"{bg.title or bg.name}, black-brane phase",
        source=bg.source,
        notes="black-brane partner built by holostring.thermo (AdS5 factor, not back-reacted)",
        energy_unit=bg.energy_unit,
        origin=bg.origin,
    )


def _from_black_brane(bg: Background) -> ThermalFamily:
    at = bg.ir.at
    horizon = None
    for p in bg.parameters:
        if at is not None and sp.simplify(at - p.symbol) == 0:
            horizon = p.name
    if horizon is None:
        raise NotApplicableError(f"background '{bg.name}': the horizon position ({at}) must be one parameter")
    f = bg.blackening
    if f is None:
        raise NotApplicableError(
            f"background '{bg.name}': a horizon needs its blackening factor (metric.blackening)"
        )
    zh = bg.symbols[horizon]
    G_tt = sp.simplify(bg.G_tt / f)
    G_zz = sp.simplify(bg.G_zz * f)
    if zh in G_tt.free_symbols | G_zz.free_symbols | bg.G_xx.free_symbols | bg.dilaton.free_symbols:
        raise NotApplicableError(
            f"background '{bg.name}': the warp or dilaton depends on the horizon parameter "
            f"'{horizon}'; only the blackening may"
        )
    thermal = Background.from_components(
        f"{bg.name}-thermal",
        G_tt=G_tt,
        G_xx=bg.G_xx,
        G_zz=G_zz,
        parameters=bg.parameters,
        values=bg.params,
        frame=bg.frame,
        frame_rule=bg.frame_rule,
        dilaton=bg.dilaton,
        ir=IREnd(IRKind.INFINITY),
        title=f"{bg.title or bg.name}, thermal (no horizon, IR at infinity)",
        source=bg.source,
        energy_unit=bg.energy_unit,
        origin=bg.origin,
    )
    return ThermalFamily(
        bg.name,
        thermal,
        bg,
        horizon,
        f,
        "user blackening factor; thermal partner f = 1 with the IR at infinity",
    )
