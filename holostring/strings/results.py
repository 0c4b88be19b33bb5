"""Frozen result objects of the static-string module."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from holostring.provenance import Provenance


def _arr(x: Any) -> Any:
    return x.tolist() if isinstance(x, np.ndarray) else x


@dataclass(frozen=True)
class StringBranch:
    """One branch of static strings, sampled on the part of the L grid it covers.

    Attributes
    ----------
    kind
        ``connected`` (U-shaped string), ``wall`` (U-string lying along a hard wall) or
        ``disconnected`` (two straight strings to a horizon).
    stable
        False for a connected branch with dL/dz* < 0 (an energy maximum). A stable branch can
        still be metastable: ``minimum`` says where it is the lowest configuration.
    L, V, zstar, error
        Separations, energies (in the result's scheme), turning points (wall: the wall; NaN for
        disconnected strings) and error estimates (difference of two resolutions).
    L_range
        The separations this branch exists for (its whole extent, not only on the grid).
    minimum
        Boolean per sample: whether this branch is the minimum-energy configuration there.
    """

    kind: str
    stable: bool
    L: np.ndarray
    V: np.ndarray
    zstar: np.ndarray
    error: np.ndarray
    L_range: tuple[float, float]
    label: str = ""
    minimum: np.ndarray = field(default_factory=lambda: np.zeros(0, dtype=bool))

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "kind": self.kind,
            "label": self.label,
            "stable": self.stable,
            "L_range": list(self.L_range),
            "L": _arr(self.L),
            "V": _arr(self.V),
            "zstar": _arr(self.zstar),
            "error": _arr(self.error),
            "minimum": _arr(np.asarray(self.minimum, dtype=bool)),
        }


@dataclass(frozen=True)
class CornellFit:
    """Least-squares fit V = -kappa/L + sigma L + C on a stated range.

    Attributes
    ----------
    kappa, sigma, C
        Fitted coefficients.
    covariance
        3x3 covariance of (kappa, sigma, C) from the residual variance (uniform weights).
    L_range
        The fitted range; ``points`` how many grid points it held.
    rms
        Root-mean-square residual.
    weights
        How points were weighted (``uniform``).
    """

    kappa: float
    sigma: float
    C: float
    covariance: np.ndarray
    L_range: tuple[float, float]
    points: int
    rms: float
    weights: str = "uniform"

    @property
    def errors(self) -> tuple[float, float, float]:
        """One-sigma errors of (kappa, sigma, C)."""
        d = np.sqrt(np.clip(np.diag(self.covariance), 0.0, None))
        return float(d[0]), float(d[1]), float(d[2])

    def __call__(self, L: np.ndarray) -> np.ndarray:
        """The fitted curve."""
        L = np.asarray(L, dtype=float)
        return -self.kappa / L + self.sigma * L + self.C

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        ek, es, ec = self.errors
        return {
            "kappa": self.kappa,
            "kappa_error": ek,
            "sigma": self.sigma,
            "sigma_error": es,
            "C": self.C,
            "C_error": ec,
            "covariance": _arr(self.covariance),
            "L_range": list(self.L_range),
            "points": self.points,
            "rms_residual": self.rms,
            "weights": self.weights,
        }


@dataclass(frozen=True)
class PotentialResult:
    """The static quark-antiquark potential V(L) of one background.

    Attributes
    ----------
    L, V
        The grid and the minimum-energy potential on it (NaN where no string exists).
    force
        dV/dL of the minimum-energy configuration, ``g F(z*)`` (exact identity).
    branch_of_minimum
        Index into ``branches`` of the minimum-energy configuration at each L (-1: none).
    branches
        Every branch: connected (stable and unstable), wall, disconnected.
    scheme, scheme_offset
        Regularisation scheme; ``V_straight = V_uv - scheme_offset_uv`` (see schemes.py).
    string_tension
        Effective tension dV/dL at the largest separation analysed (None if not confining).
    string_tension_limit
        ``g F`` at the confinement point (the exact asymptotic tension), None if not confining.
    coulomb_coefficient, constant, cornell
        Cornell-fit kappa, C and the full fit (None when the fit is not possible).
    r0, r1
        Sommer scales r^2 F(r) = 1.65 and 1.0; None with the reason in ``notes``.
    max_separation, screening_length
        L_max of connected strings and the separation where the disconnected pair takes over.
    error_estimate
        Largest error estimate of V on the grid (difference between two resolutions).
    converged, message
        Whether every estimate is below ``tol`` (relative to the local energy scale); what failed.
    physical
        The main numbers in GeV and fm when the background carries an energy unit.
    transitions
        ``(L_c, error)`` of every jump of the minimum-energy string between two branches
        (multi-valued V(L): a first-order transition, V continuous with a kink).
    """

    L: np.ndarray
    V: np.ndarray
    force: np.ndarray
    branch_of_minimum: np.ndarray
    branches: tuple[StringBranch, ...]
    scheme: str
    scheme_offset: float | None
    string_tension: float | None
    string_tension_limit: float | None
    coulomb_coefficient: float | None
    constant: float | None
    cornell: CornellFit | None
    r0: float | None
    r1: float | None
    max_separation: float | None
    screening_length: float | None
    error_estimate: float
    converged: bool
    message: str
    provenance: Provenance
    confinement_point: float | None = None
    end_kind: str = ""
    notes: dict[str, str] = field(default_factory=dict)
    errors: dict[str, float] = field(default_factory=dict)
    physical: dict[str, Any] | None = None
    transitions: tuple[tuple[float, float], ...] = ()

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view (arrays as lists)."""
        return {
            "background": self.provenance.background,
            "parameters": dict(self.provenance.parameters),
            "scheme": self.scheme,
            "scheme_offset": self.scheme_offset,
            "L": _arr(self.L),
            "V": _arr(self.V),
            "force": _arr(self.force),
            "string_tension": self.string_tension,
            "string_tension_limit": self.string_tension_limit,
            "coulomb_coefficient": self.coulomb_coefficient,
            "constant": self.constant,
            "cornell": None if self.cornell is None else self.cornell.to_dict(),
            "r0": self.r0,
            "r1": self.r1,
            "max_separation": self.max_separation,
            "screening_length": self.screening_length,
            "confinement_point": self.confinement_point,
            "end_kind": self.end_kind,
            "error_estimate": self.error_estimate,
            "converged": self.converged,
            "message": self.message,
            "notes": dict(self.notes),
            "errors": dict(self.errors),
            "physical": self.physical,
            "transitions": [{"L": x, "error": e} for x, e in self.transitions],
            "branches": [b.to_dict() for b in self.branches],
            "provenance": self.provenance.to_dict(),
        }


@dataclass(frozen=True)
class StringProfile:
    """The shape x(z) of one static string configuration.

    ``x`` and ``z`` trace the string from one end on the boundary to the other (the
    disconnected pair: two separate vertical lines, ``segments`` gives their split).
    """

    kind: str
    stable: bool
    minimum: bool
    L: float
    V: float
    zstar: float
    x: np.ndarray
    z: np.ndarray
    segments: tuple[int, ...] = ()

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "kind": self.kind,
            "stable": self.stable,
            "minimum": self.minimum,
            "L": self.L,
            "V": self.V,
            "zstar": self.zstar,
            "x": _arr(self.x),
            "z": _arr(self.z),
        }


@dataclass(frozen=True)
class ProfileResult:
    """String profiles at one separation: every configuration, the minimum-energy one marked."""

    L: float
    profiles: tuple[StringProfile, ...]
    error_estimate: float
    converged: bool
    message: str
    provenance: Provenance

    @property
    def minimum(self) -> StringProfile | None:
        """The minimum-energy configuration."""
        for p in self.profiles:
            if p.minimum:
                return p
        return None

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "L": self.L,
            "profiles": [p.to_dict() for p in self.profiles],
            "error_estimate": self.error_estimate,
            "converged": self.converged,
            "message": self.message,
            "provenance": self.provenance.to_dict(),
        }
