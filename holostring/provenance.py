"""Provenance attached to every result: which background, parameters, frame, scheme, resolution."""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from functools import cache
from typing import Any


@cache
def package_version() -> str:
    """Return the installed holostring version (``0+unknown`` when run from a bare source tree)."""
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version("holostring")
    except PackageNotFoundError:  # pragma: no cover - only outside an install
        return "0+unknown"


@dataclass(frozen=True)
class Provenance:
    """What produced a result, enough to reproduce it.

    Attributes
    ----------
    background
        The background's name.
    parameters
        Parameter values used, by name.
    frame
        The metric frame the computation used ("string" or "einstein").
    settings
        Method settings: scheme, resolution, tolerances, boundary conditions...
    version
        The holostring version.
    """

    background: str
    parameters: dict[str, float]
    frame: str = "string"
    settings: dict[str, Any] = field(default_factory=dict)
    version: str = field(default_factory=package_version)

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return asdict(self)
