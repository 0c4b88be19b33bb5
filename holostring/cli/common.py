"""Shared CLI plumbing: background resolution, --param parsing, error mapping, output.

Commands parse arguments, call the analysis layer and the report layer, nothing else. Every
deliberate error (:class:`~holostring.errors.HolostringError`) becomes one line on stderr and exit
code 2, through :func:`guarded`.
"""

from __future__ import annotations

import functools
import json
import math
import sys
from collections.abc import Callable
from typing import Any, TypeVar

import typer

from holostring.errors import HolostringError, InputError
from holostring.report.serialize import to_jsonable

F = TypeVar("F", bound=Callable[..., Any])

PARAM_HELP = "Parameter value NAME=VALUE (repeatable), e.g. --param c=0.5."
BACKGROUND_HELP = "A catalogue name (see 'holostring backgrounds') or a path to a background file."


def guarded(func: F) -> F:
    """Map HolostringError (and unwritable outputs) to one line on stderr and exit code 2."""

    @functools.wraps(func)
    def wrapper(*args: Any, **kwargs: Any) -> Any:
        try:
            return func(*args, **kwargs)
        except HolostringError as err:
            typer.echo(f"error: {err}", err=True)
            raise typer.Exit(code=2) from None
        except KeyboardInterrupt:
            typer.echo("interrupted", err=True)
            raise typer.Exit(code=130) from None

    return wrapper  # type: ignore[return-value]


def parse_params(items: list[str] | None) -> dict[str, float]:
    """Parse repeated ``NAME=VALUE`` options into floats (range checks come from the background)."""
    out: dict[str, float] = {}
    for item in items or []:
        name, sep, value = item.partition("=")
        name = name.strip()
        if not sep or not name:
            raise InputError("--param", f"expected NAME=VALUE, got '{item}'")
        try:
            x = float(value)
        except ValueError:
            raise InputError(f"--param {name}", f"'{value.strip()}' is not a number") from None
        if not math.isfinite(x):
            raise InputError(f"--param {name}", f"{value.strip()} is not a finite number")
        if name in out:
            raise InputError(f"--param {name}", "given twice")
        out[name] = x
    return out


UNIT_HELP = "Read the parameters in powers of this energy unit (GeV or MeV): results in GeV and fm."


def resolve_background(spec: str, params: list[str] | None, unit: str | None = None) -> Any:
    """Load BACKGROUND (catalogue name or file) with --param values, checked; ``unit`` (--unit)
    sets the energy unit the parameters are read in."""
    from holostring.background import load_background

    bg = load_background(spec, **parse_params(params))
    if unit is None:
        return bg
    from holostring.units import gev_per_unit

    try:
        gev_per_unit(unit)
    except InputError as err:
        raise InputError("--unit", err.reason) from None
    return bg.with_units(unit)


def echo_json(data: Any) -> None:
    """Print JSON (finite floats only: NaN and inf become null)."""
    typer.echo(json.dumps(to_jsonable(data), indent=2))


def stderr_is_tty() -> bool:
    """Whether progress bars may be drawn."""
    return sys.stderr.isatty()
