"""Frozen result objects of the temperature module."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from holostring.provenance import Provenance


def _clean(x: Any) -> Any:
    if isinstance(x, np.ndarray):
        return x.tolist()
    if isinstance(x, np.generic):
        return x.item()
    return x


def _fields_dict(result: Any) -> dict[str, Any]:
    """Every dataclass field as plain data (arrays to lists), provenance as its own dict."""
    return {
        k: _clean(getattr(result, k)) if k != "provenance" else result.provenance.to_dict()
        for k in result.__dataclass_fields__
    }


@dataclass(frozen=True)
class TransitionResult:
    """Hawking-Page comparison of the thermal and black-brane geometries.

    Attributes
    ----------
    background
        Name of the zero-temperature background.
    construction
        How the black-brane partner was built.
    critical_temperature
        T_c where the black brane starts to dominate (``None`` when there is no transition),
        in units of the background's scale (or ``energy_unit``).
    critical_temperature_error
        Error estimate of T_c (quadrature error propagated through the root, plus the root
        tolerance).
    critical_horizon
        Horizon position z_h at T_c.
    transitions
        Every temperature where the free-energy difference changes sign on the scanned range.
    temperatures, horizons
        The curve's temperatures and matching horizon positions.
    free_energy_difference
        2 kappa^2 (F_black-brane - F_thermal) / (L^3 V_3) per temperature: negative where the
        black brane (deconfined phase) dominates.
    free_energy_error
        Quadrature error estimates of the same.
    energy_unit
        ``None`` or e.g. ``"GeV"``; with a unit, ``critical_temperature_gev`` is filled.
    critical_temperature_gev
        T_c in GeV (``None`` without units or without a transition).
    on_shell
        Whether both geometries solve the Einstein equations with Lambda = -6 (true for an
        Einstein-frame AdS5 warp); otherwise the action is evaluated off shell on the given,
        not back-reacted, background.
    regularisation, assumptions
        Plain-text statements of the method.
    converged, message, error_estimate
        Status; ``error_estimate`` is the T_c error (or the largest curve error without T_c).
    provenance
        What produced the result.
    """

    background: str
    construction: str
    critical_temperature: float | None
    critical_temperature_error: float | None
    critical_horizon: float | None
    transitions: tuple[float, ...]
    temperatures: np.ndarray
    horizons: np.ndarray
    free_energy_difference: np.ndarray
    free_energy_error: np.ndarray
    energy_unit: str | None
    critical_temperature_gev: float | None
    on_shell: bool
    regularisation: str
    assumptions: tuple[str, ...]
    converged: bool
    message: str
    error_estimate: float
    provenance: Provenance = field(repr=False)

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return _fields_dict(self)


@dataclass(frozen=True)
class ScreeningResult:
    """Screening of the static quark pair in the black-brane phase, versus temperature.

    Attributes
    ----------
    background
        Name of the zero-temperature background.
    temperatures, horizons
        Temperatures (model units or ``energy_unit``) and the matching horizon positions.
    max_separation
        L_max(T): the largest separation of a connected string (``nan`` where absent).
    screening_length
        L_s(T): where the connected and disconnected energies cross (``nan`` where absent).
    errors
        Per-temperature error estimates reported by the string solver.
    converged_points
        Per-temperature convergence flags of the string solver.
    spatial_string_tension
        sigma_s(T) = g G_xx(z_h) (string frame), the tension of spatial Wilson loops in the
        black brane.
    string_tension_below
        The zero-temperature string tension, which is the effective tension at every
        T < T_c (the thermal geometry does not depend on T); ``None`` when the model has none.
    critical_temperature
        T_c used to separate the phases (``None`` without a transition).
    energy_unit
        ``None`` or e.g. ``"GeV"``; lengths are then in GeV^-1 (and in fm via ``*_fm``).
    converged, message, error_estimate, provenance
        Status and origin.
    """

    background: str
    temperatures: np.ndarray
    horizons: np.ndarray
    max_separation: np.ndarray
    screening_length: np.ndarray
    errors: np.ndarray
    converged_points: np.ndarray
    spatial_string_tension: np.ndarray
    string_tension_below: float | None
    critical_temperature: float | None
    energy_unit: str | None
    converged: bool
    message: str
    error_estimate: float
    provenance: Provenance = field(repr=False)

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return _fields_dict(self)
