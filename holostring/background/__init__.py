"""Backgrounds: symbolic definition, safe formula parser, catalogue, files, diagnostics."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from holostring.background.frames import Frame, FrameRule
from holostring.background.model import Background, FieldDeclaration, IREnd, IRKind, Parameter
from holostring.errors import InputError

__all__ = [
    "Background",
    "FieldDeclaration",
    "Frame",
    "FrameRule",
    "IREnd",
    "IRKind",
    "Parameter",
    "load_background",
]


def load_background(spec: str | Path | Background, check: bool = True, **params: Any) -> Background:
    """Load a background by catalogue name or file path, with parameter values.

    Parameters
    ----------
    spec
        A catalogue name (``soft-wall``), a path to a TOML background file, or a Background.
    check
        Check numerically that the metric is positive and finite inside the domain.
    **params
        Parameter values overriding the defaults, validated against their ranges.

    Returns
    -------
    Background

    Raises
    ------
    InputError, BackgroundFileError
        Unknown name, malformed file, unknown or invalid parameter, missing required value,
        or a metric component that is not positive on the domain.

    Examples
    --------
    >>> bg = load_background("soft-wall", c=0.5)
    >>> bg.params["c"]
    0.5
    """
    from holostring.background import catalogue
    from holostring.background.checks import check_metric

    if isinstance(spec, Background):
        bg = spec
    else:
        text = str(spec)
        if text in catalogue.names():
            bg = catalogue.entry(text)
        elif text.endswith(".toml") or Path(text).exists() or "/" in text:
            from holostring.background.files import load_file

            bg = load_file(text)
        else:
            known = ", ".join(catalogue.names())
            raise InputError("background", f"'{text}' is neither a catalogue name ({known}) nor a file")
    bg = bg.with_params(**params) if params else bg
    missing = [p.name for p, v in zip(bg.parameters, bg.values, strict=True) if v != v]
    if missing:
        raise InputError(f"parameter {missing[0]}", "has no default; give a value with --param")
    if check:
        check_metric(bg)
    return bg
