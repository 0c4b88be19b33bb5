"""Named boundary conditions for spectra, validated against the background's IR end.

The UV end z -> 0 is always a regular singular point: the field must be normalisable,
phi ~ z^Delta with Delta the larger root of the indicial equation (Delta(Delta - 4) = M5^2 for a
scalar in AdS5). The IR end decides the rest:

- ``wall`` (hard wall at z0): Dirichlet phi(z0) = 0 or Neumann phi'(z0) = 0, on the field phi,
  chosen by the user (Dirichlet by default); Boschi-Filho & Braga, hep-th/0209080;
- ``cap`` (a circle shrinks smoothly, AdS soliton): regularity at the tip, a natural
  condition of the weak form (the second solution has a logarithm and infinite energy); Csaki-Ooguri-Oz-Terning,
  hep-th/9806021;
- ``infinity``: normalisable at infinity (the Schrodinger function decays); the domain is cut
  where the highest wanted state has decayed by about e^-22 (WKB), with psi = 0 there;
- ``horizon``: refused. Normal modes need a confining IR end; a horizon gives quasinormal modes.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum
from typing import Any

from holostring.background.model import IRKind
from holostring.errors import InputError, NotApplicableError


class BoundaryKind(StrEnum):
    """Named boundary conditions."""

    NORMALISABLE = "normalisable"  #: phi ~ z^Delta at the UV boundary
    DIRICHLET = "dirichlet"  #: phi(z0) = 0 at a hard wall
    NEUMANN = "neumann"  #: phi'(z0) = 0 at a hard wall
    REGULAR = "regular"  #: regular where a circle shrinks (cap)
    DECAYING = "decaying"  #: normalisable at z -> infinity


@dataclass(frozen=True)
class BoundaryCondition:
    """A boundary condition at one end, with the sentence that states it in outputs."""

    kind: BoundaryKind
    at: float
    statement: str

    def to_dict(self) -> dict[str, Any]:
        """Plain-data view."""
        return {"kind": str(self.kind), "at": self.at, "statement": self.statement}


@dataclass(frozen=True)
class Boundaries:
    """The pair of boundary conditions of a spectrum problem."""

    uv: BoundaryCondition
    ir: BoundaryCondition

    @property
    def name(self) -> str:
        """Short name of the IR condition (``dirichlet``, ``neumann``, ``regular``, ``decaying``)."""
        return str(self.ir.kind)

    @property
    def statement(self) -> str:
        """Both conditions in one sentence."""
        return f"{self.uv.statement}; {self.ir.statement}"

    def to_dict(self) -> dict[str, Any]:
        """Plain-data view."""
        return {
            "name": self.name,
            "uv": self.uv.to_dict(),
            "ir": self.ir.to_dict(),
            "statement": self.statement,
        }


def resolve_boundaries(background: Any, boundary: str | BoundaryKind | None, delta: float) -> Boundaries:
    """Validate a requested IR boundary condition against the background's IR end.

    Parameters
    ----------
    background
        The background (its ``ir.kind`` and ``z_ir`` are used).
    boundary
        ``"dirichlet"``, ``"neumann"`` or ``None`` (the natural condition of the IR end).
    delta
        The UV exponent, for the statement.

    Returns
    -------
    Boundaries

    Raises
    ------
    InputError
        A wall condition requested where there is no wall, or an unknown name.
    NotApplicableError
        A horizon as IR end (quasinormal modes are out of scope).
    """
    kind = background.ir.kind
    z_ir = background.z_ir
    uv = BoundaryCondition(BoundaryKind.NORMALISABLE, 0.0, f"normalisable at z = 0 (phi ~ z^{delta:.6g})")
    requested: BoundaryKind | None = None
    if boundary is not None:
        try:
            requested = BoundaryKind(str(boundary).lower())
        except ValueError:
            raise InputError("boundary", f"'{boundary}' is not one of dirichlet, neumann") from None
        if requested not in (BoundaryKind.DIRICHLET, BoundaryKind.NEUMANN):
            raise InputError("boundary", f"'{boundary}' is not one of dirichlet, neumann")
    if kind is IRKind.HORIZON:
        raise NotApplicableError(
            f"background '{background.name}' ends at a horizon (z_h = {z_ir:g}): normal modes "
            "need a confining IR end (wall, cap or infinity); quasinormal modes are not computed"
        )
    if kind is IRKind.WALL:
        requested = requested or BoundaryKind.DIRICHLET
        text = (
            f"Dirichlet phi(z0) = 0 at the wall z0 = {z_ir:g}"
            if requested is BoundaryKind.DIRICHLET
            else f"Neumann phi'(z0) = 0 at the wall z0 = {z_ir:g}"
        )
        return Boundaries(uv, BoundaryCondition(requested, z_ir, text))
    if requested is not None:
        raise InputError(
            "boundary",
            f"'{requested}' applies only at a hard wall; background "
            f"'{background.name}' has IR end '{kind}', whose condition is fixed",
        )
    if kind is IRKind.CAP:
        return Boundaries(
            uv,
            BoundaryCondition(
                BoundaryKind.REGULAR, z_ir, f"regular at the tip z0 = {z_ir:g} where the circle shrinks"
            ),
        )
    return Boundaries(
        uv, BoundaryCondition(BoundaryKind.DECAYING, float("inf"), "normalisable as z -> infinity")
    )
