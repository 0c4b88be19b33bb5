"""Fluctuation spectra: glueballs and mesons as Sturm-Liouville problems on a background.

Public API::

    from holostring.spectra import solve_spectrum
    result = solve_spectrum(bg, "scalar-glueball", states=20)
    result.masses, result.error_estimate, result.converged

See :mod:`holostring.spectra.solve` for the method and :mod:`holostring.spectra.channels` for
the built-in channels and their conventions.
"""

from __future__ import annotations

from holostring.spectra.analysis import (
    ReggeFit,
    fit_regge,
    mass_ratios,
    mass_squared_gradient,
)
from holostring.spectra.boundary import BoundaryKind
from holostring.spectra.channels import BUILTIN_CHANNELS, Channel, Spin, available_channels
from holostring.spectra.results import SpectrumResult
from holostring.spectra.solve import solve_spectrum

__all__ = [
    "BUILTIN_CHANNELS",
    "BoundaryKind",
    "Channel",
    "ReggeFit",
    "SpectrumResult",
    "Spin",
    "available_channels",
    "fit_regge",
    "mass_ratios",
    "mass_squared_gradient",
    "solve_spectrum",
]
