"""The frozen result of a spectrum computation."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from holostring.provenance import Provenance


@dataclass(frozen=True, eq=False)
class SpectrumResult:
    """Normal modes of one channel on one background.

    Attributes
    ----------
    channel
        Channel name; ``channel_info`` has spin, M5^2, dilaton coupling, frame.
    boundary
        Name of the IR boundary condition (``dirichlet``, ``neumann``, ``regular``,
        ``decaying``); ``boundaries`` has both conditions with their statements.
    masses_squared
        m_n^2, n = 0, 1, ... in units of the background's scale (energy_unit^2 when set).
    masses
        m_n = sqrt(m_n^2) (NaN for a tachyonic m_n^2 < 0).
    error_estimate
        Absolute error estimate of each m_n^2: the difference between two resolutions.
    mass_error
        The same propagated to m_n.
    converged
        True when every error estimate is within ``tol`` (relative to max(|m_n^2|, 1)) and no
        unresolved eigenvalue lies among the returned ones.
    message
        What happened, in one line; says what to change when not converged.
    z
        Grid for plots (radial coordinate z), ascending.
    xi
        Schrodinger coordinate xi(z) = int_0^z sqrt(W/P) dz on the same grid (xi = z for a
        conformally flat metric).
    potential
        The Schrodinger potential U on the grid.
    modes
        psi_n(z) on the grid, shape (states, len(z)), normalised int psi^2 d xi = 1,
        positive near the boundary.
    field_modes
        phi_n(z) = psi_n / (P W)^{1/4}, same normalisation (int W phi^2 dz = 1).
    resolution
        The two numbers of nodes compared (coarse m, fine 2m).
    delta
        UV exponent: phi ~ z^delta.
    domain
        (z_start, z_end) of the computation (z_end is the cut for an infinite IR end).
    energy_unit
        The background's energy unit or None.
    provenance
        Background, parameters, frame and settings.
    """

    channel: str
    channel_info: dict[str, Any]
    boundary: str
    boundaries: dict[str, Any]
    masses_squared: np.ndarray
    masses: np.ndarray
    error_estimate: np.ndarray
    mass_error: np.ndarray
    converged: bool
    message: str
    z: np.ndarray
    xi: np.ndarray
    potential: np.ndarray
    modes: np.ndarray
    field_modes: np.ndarray
    resolution: tuple[int, int]
    delta: float
    domain: tuple[float, float]
    energy_unit: str | None
    provenance: Provenance
    discarded: int = 0

    @property
    def states(self) -> int:
        """Number of states returned."""
        return int(self.masses_squared.size)

    def masses_in_gev(self) -> np.ndarray | None:
        """Masses in GeV when the background carries an energy unit, else None."""
        from holostring.units import gev_per_unit

        k = gev_per_unit(self.energy_unit)
        return None if k is None else self.masses * k

    def to_dict(self, include_arrays: bool = True) -> dict[str, Any]:
        """Plain-data view (arrays as lists); ``include_arrays=False`` omits grids and modes."""
        out: dict[str, Any] = {
            "channel": self.channel,
            "channel_info": self.channel_info,
            "boundary": self.boundary,
            "boundaries": self.boundaries,
            "states": self.states,
            "masses": self.masses,
            "masses_squared": self.masses_squared,
            "error_estimate": self.error_estimate,
            "mass_error": self.mass_error,
            "converged": self.converged,
            "message": self.message,
            "resolution": list(self.resolution),
            "delta": self.delta,
            "domain": list(self.domain),
            "discarded_spurious": self.discarded,
            "energy_unit": self.energy_unit,
            "provenance": self.provenance.to_dict(),
        }
        gev = self.masses_in_gev()
        if gev is not None:
            out["masses_gev"] = gev
        if include_arrays:
            out["z"] = self.z
            out["xi"] = self.xi
            out["potential"] = self.potential
            out["modes"] = self.modes
        return out
