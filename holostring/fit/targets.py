"""Calibration targets: observables with values, uncertainties and units, and which parameters
are free, bounded or fixed. Read from a TOML file or built in Python.

File format::

    [calibration]
    energy_unit = "GeV"              # the model's energy unit during the fit (default GeV)

    [parameters.c]                   # a free parameter (listed with free = true)
    free = true
    start = 0.2                      # optional starting value (default: the background's)
    range = "(0, 5)"                 # optional bounds for the fit

    [parameters.g]
    value = 1.0                      # a fixed parameter

    [[targets]]
    observable = "mass:vector-meson:0"
    value = 0.775
    uncertainty = 0.005
    unit = "GeV"                     # GeV, MeV, GeV^n, MeV^n, fm, fm^-1, or "" (dimensionless)
    source = "where the number comes from"

    [predict]                        # optional: further observables to predict with errors
    observables = ["string_tension", "r0"]

Parameters not listed keep the background's values (CLI --param) and stay fixed.
"""

from __future__ import annotations

import math
import re
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from holostring.errors import BackgroundFileError, HolostringError
from holostring.fit.observables import Observable, parse_observable
from holostring.units import HBARC_GEV_FM

_UNIT = re.compile(r"^(GeV|MeV|fm)(?:\^\(?(-?\d+)\)?)?$")


def unit_factor(unit: str, dimension: int) -> float:
    """Factor turning a value in ``unit`` into GeV^dimension.

    Raises
    ------
    ValueError
        When the unit is unknown or its dimension does not match.
    """
    u = unit.strip().replace(" ", "")
    if u in ("", "1", "dimensionless"):
        if dimension != 0:
            raise ValueError(f"a dimensionless value for an observable of mass dimension {dimension}")
        return 1.0
    if u in ("1/fm",):
        u = "fm^-1"
    m = _UNIT.match(u)
    if not m:
        raise ValueError(f"unknown unit '{unit}' (use GeV, MeV, GeV^n, MeV^n, fm, fm^-1)")
    base, power = m.group(1), int(m.group(2) or 1)
    if base == "fm":
        if -power != dimension:
            raise ValueError(f"unit '{unit}' has mass dimension {-power}, the observable {dimension}")
        return (1.0 / HBARC_GEV_FM) ** power  # fm = 1/(0.1973 GeV)
    if power != dimension:
        raise ValueError(f"unit '{unit}' has mass dimension {power}, the observable {dimension}")
    return (1.0 if base == "GeV" else 1e-3) ** power


@dataclass(frozen=True)
class Target:
    """One observable to reproduce: value and uncertainty in ``unit``."""

    observable: Observable
    value: float
    uncertainty: float
    unit: str = ""
    source: str = ""

    @property
    def factor(self) -> float:
        """Multiply a value in ``unit`` by this to get GeV^dimension."""
        return unit_factor(self.unit, self.observable.dimension)

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "observable": self.observable.spec,
            "value": self.value,
            "uncertainty": self.uncertainty,
            "unit": self.unit,
            "source": self.source,
        }


@dataclass(frozen=True)
class FreeParameter:
    """A parameter the calibration varies, with optional start and bounds."""

    name: str
    start: float | None = None
    lower: float = -math.inf
    upper: float = math.inf


@dataclass(frozen=True)
class TargetSet:
    """Everything a calibration needs besides the background."""

    targets: tuple[Target, ...]
    free: tuple[FreeParameter, ...]
    fixed: dict[str, float] = field(default_factory=dict)
    predict: tuple[Observable, ...] = ()
    energy_unit: str = "GeV"
    origin: str = ""


def load_targets(path: str | Path) -> TargetSet:
    """Read a targets file (format in the module docstring).

    Raises
    ------
    BackgroundFileError
        Naming the file, the key and the reason (the same error class as background files).
    """
    label = str(path)
    try:
        text = Path(path).read_text(encoding="utf-8")
    except FileNotFoundError:
        raise BackgroundFileError(label, None, "no such file") from None
    except (OSError, UnicodeDecodeError) as err:
        raise BackgroundFileError(label, None, f"cannot be read ({err})") from None
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as err:
        raise BackgroundFileError(label, None, f"malformed TOML: {err}") from None
    return parse_targets(doc, label)


def parse_targets(doc: dict[str, Any], label: str = "<targets>") -> TargetSet:
    """Build a :class:`TargetSet` from parsed TOML data."""

    def fail(key: str | None, reason: str) -> BackgroundFileError:
        return BackgroundFileError(label, key, reason)

    allowed = {"calibration", "parameters", "targets", "predict"}
    for k in doc:
        if k not in allowed:
            raise fail(k, f"unknown table (allowed: {', '.join(sorted(allowed))})")
    head = doc.get("calibration", {})
    if not isinstance(head, dict):
        raise fail("calibration", "must be a table")
    for k in head:
        if k != "energy_unit":
            raise fail(f"calibration.{k}", "unknown key (allowed: energy_unit)")
    unit = head.get("energy_unit", "GeV")
    if unit not in ("GeV", "MeV"):
        raise fail("calibration.energy_unit", "must be GeV or MeV")

    free: list[FreeParameter] = []
    fixed: dict[str, float] = {}
    params = doc.get("parameters", {})
    if not isinstance(params, dict):
        raise fail("parameters", "must be a table of tables")
    for name, spec in params.items():
        key = f"parameters.{name}"
        if not isinstance(spec, dict):
            raise fail(key, "must be a table (free, start, range, value)")
        for k in spec:
            if k not in {"free", "start", "range", "value"}:
                raise fail(f"{key}.{k}", "unknown key (allowed: free, start, range, value)")
        if spec.get("free", False) is True:
            if "value" in spec:
                raise fail(f"{key}.value", "a free parameter takes 'start', not 'value'")
            lo, hi = -math.inf, math.inf
            if "range" in spec:
                lo, hi = _interval(spec["range"], lambda r, key=key: fail(f"{key}.range", r))
            start = spec.get("start")
            if start is not None:
                start = _number(start, lambda r, key=key: fail(f"{key}.start", r))
                if not lo < start < hi:
                    raise fail(f"{key}.start", "must lie inside the range")
            free.append(FreeParameter(name, start, lo, hi))
        elif "value" in spec:
            fixed[name] = _number(spec["value"], lambda r, key=key: fail(f"{key}.value", r))
        else:
            raise fail(key, "give 'free = true' or a fixed 'value'")

    raw = doc.get("targets", [])
    if not isinstance(raw, list) or not raw:
        raise fail("targets", "needs at least one [[targets]] entry")
    targets: list[Target] = []
    for i, spec in enumerate(raw):
        key = f"targets[{i}]"
        if not isinstance(spec, dict):
            raise fail(key, "must be a table")
        for k in spec:
            if k not in {"observable", "value", "uncertainty", "unit", "source"}:
                raise fail(
                    f"{key}.{k}", "unknown key (allowed: observable, value, uncertainty, unit, source)"
                )
        try:
            obs = parse_observable(spec.get("observable", ""))
        except HolostringError as err:
            raise fail(f"{key}.observable", str(err)) from None
        value = _number(spec.get("value"), lambda r, key=key: fail(f"{key}.value", r))
        unc = _number(spec.get("uncertainty"), lambda r, key=key: fail(f"{key}.uncertainty", r))
        if unc <= 0:
            raise fail(f"{key}.uncertainty", "must be positive")
        tgt = Target(obs, value, unc, str(spec.get("unit", "")), str(spec.get("source", "")))
        try:
            tgt.factor  # noqa: B018 - validates the unit against the observable's dimension
        except ValueError as err:
            raise fail(f"{key}.unit", str(err)) from None
        targets.append(tgt)
    if not free:
        raise fail("parameters", "no free parameter: mark at least one with 'free = true'")
    predict: list[Observable] = []
    pred = doc.get("predict", {})
    if pred:
        if not isinstance(pred, dict) or not isinstance(pred.get("observables", []), list):
            raise fail("predict", "must be a table with observables = [...]")
        for j, s in enumerate(pred.get("observables", [])):
            try:
                predict.append(parse_observable(s))
            except HolostringError as err:
                raise fail(f"predict.observables[{j}]", str(err)) from None
    return TargetSet(tuple(targets), tuple(free), fixed, tuple(predict), unit, label)


def _number(value: Any, fail: Any) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise fail("must be a number")
    x = float(value)
    if not math.isfinite(x):
        raise fail("must be finite")
    return x


def _interval(text: Any, fail: Any) -> tuple[float, float]:
    if not isinstance(text, str):
        raise fail("expected an interval such as '(0, 5)'")
    m = re.fullmatch(r"\s*[\[(]\s*([^,\s]+)\s*,\s*([^\])\s]+)\s*[\])]\s*", text)
    if not m:
        raise fail("expected an interval such as '(0, 5)'")
    try:
        lo, hi = float(m.group(1)), float(m.group(2))
    except ValueError:
        raise fail("interval ends must be numbers or inf") from None
    if not lo < hi:
        raise fail("interval is empty")
    return lo, hi
