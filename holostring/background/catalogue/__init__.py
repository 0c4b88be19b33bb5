"""The built-in catalogue: background files shipped with the package, each citing its source."""

from __future__ import annotations

from functools import cache
from importlib import resources

from holostring.background.model import Background


def names() -> list[str]:
    """Names of the catalogue entries, sorted."""
    folder = resources.files(__name__)
    return sorted(p.name.removesuffix(".toml") for p in folder.iterdir() if p.name.endswith(".toml"))


def path_of(name: str) -> str:
    """Path of the catalogue file for ``name``."""
    return str(resources.files(__name__) / f"{name}.toml")


@cache
def entry(name: str) -> Background:
    """Load a catalogue entry at its defaults (cached: compile once per run)."""
    from holostring.background.files import load_file

    return load_file(path_of(name), origin=f"catalogue:{name}")
