"""Physical units. The tool computes in units of the background's scale; when a background
declares an energy unit (GeV), lengths convert to fm through hbar c."""

from __future__ import annotations

#: hbar c in GeV fm (CODATA 2018, exact to the digits given; common practice).
HBARC_GEV_FM = 0.1973269804

_TO_GEV = {"GeV": 1.0, "MeV": 1e-3, "TeV": 1e3}


def gev_per_unit(energy_unit: str | None) -> float | None:
    """How many GeV one energy unit is (``None`` for a dimensionless background)."""
    if energy_unit is None:
        return None
    if energy_unit not in _TO_GEV:
        from holostring.errors import InputError

        raise InputError("energy_unit", f"'{energy_unit}' is not one of {', '.join(_TO_GEV)}")
    return _TO_GEV[energy_unit]


def energy_in_gev(value: float, energy_unit: str | None, dimension: float = 1.0) -> float | None:
    """A quantity of mass dimension ``dimension`` in GeV^dimension, or None without units."""
    k = gev_per_unit(energy_unit)
    return None if k is None else value * k**dimension


def length_in_fm(value: float, energy_unit: str | None) -> float | None:
    """A length (mass dimension -1) in fm, or None without units."""
    k = gev_per_unit(energy_unit)
    return None if k is None else value / k * HBARC_GEV_FM
