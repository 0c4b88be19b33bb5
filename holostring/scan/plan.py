"""Scan plans: which parameter points a scan visits (grids or seeded random samples).

A varied parameter is written ``NAME=START:STOP:COUNT`` (``COUNT`` evenly spaced values from
``START`` to ``STOP`` inclusive), ``NAME=START:STOP:COUNT:log`` (logarithmically spaced, both ends
positive) or ``NAME=V1,V2,...`` (explicit values). For random samples the range ``NAME=START:STOP``
is enough; each point draws every parameter uniformly (log-uniformly with ``:log``) from its range.
"""

from __future__ import annotations

import hashlib
import itertools
import json
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from holostring.errors import InputError

#: the largest scan accepted (a million points is already hours of work on two cores)
MAX_POINTS = 1_000_000

GRID = "grid"
RANDOM = "random"


@dataclass(frozen=True)
class Axis:
    """One varied parameter.

    Attributes
    ----------
    name
        Parameter name.
    start, stop
        Range ends as given (``start > stop`` runs the grid downwards).
    count
        Number of grid values (``None`` when only a range was given, for random samples).
    log
        Logarithmic spacing (or log-uniform sampling).
    values
        Explicit grid values (set for ``NAME=V1,V2,...``; otherwise computed from the range).
    spec
        The text it was parsed from, canonical.
    """

    name: str
    start: float
    stop: float
    count: int | None = None
    log: bool = False
    values: tuple[float, ...] | None = None
    spec: str = ""

    def grid(self) -> tuple[float, ...]:
        """The grid values of this axis.

        Raises
        ------
        InputError
            When the axis has a range but no COUNT.
        """
        if self.values is not None:
            return self.values
        if self.count is None:
            raise InputError(f"--vary {self.name}", "a grid needs NAME=START:STOP:COUNT (COUNT is missing)")
        if self.count == 1:
            return (self.start,)
        import numpy as np

        if self.log:
            pts = np.geomspace(self.start, self.stop, self.count)
        else:
            pts = np.linspace(self.start, self.stop, self.count)
        out = [float(x) for x in pts]
        out[0], out[-1] = self.start, self.stop  # exact ends, as the user wrote them
        return tuple(out)


def parse_vary(spec: str) -> Axis:
    """Parse one ``--vary`` spec (see the module docstring).

    Parameters
    ----------
    spec
        ``NAME=START:STOP:COUNT[:log]``, ``NAME=START:STOP[:log]`` or ``NAME=V1,V2,...``.

    Returns
    -------
    Axis

    Raises
    ------
    InputError
        Naming the spec and what is wrong with it.

    Examples
    --------
    >>> parse_vary("c=0.5:2:4").grid()
    (0.5, 1.0, 1.5, 2.0)
    """
    if not isinstance(spec, str):
        raise InputError("--vary", f"expected text NAME=START:STOP:COUNT, got {type(spec).__name__}")
    name, sep, body = spec.partition("=")
    name, body = name.strip(), body.strip()
    field = f"--vary {name or spec}"
    if not sep or not name or not body:
        raise InputError("--vary", f"expected NAME=START:STOP:COUNT, got '{spec}'")
    if not name.isidentifier():
        raise InputError(field, f"'{name}' is not a parameter name")
    if ":" not in body:
        values = tuple(_number(field, v) for v in body.split(","))
        if len(set(values)) != len(values):
            raise InputError(field, "a value is listed twice")
        return Axis(name, values[0], values[-1], len(values), False, values, f"{name}={body}")
    parts = [p.strip() for p in body.split(":")]
    log = parts[-1].lower() == "log"
    if log:
        parts = parts[:-1]
    if len(parts) not in (2, 3):
        raise InputError(field, f"expected START:STOP:COUNT, got '{body}'")
    start, stop = _number(field, parts[0]), _number(field, parts[1])
    count = None
    if len(parts) == 3:
        try:
            count = int(parts[2])
        except ValueError:
            raise InputError(field, f"COUNT '{parts[2]}' is not a whole number") from None
        if count < 1:
            raise InputError(field, f"COUNT must be at least 1, got {count}")
        if count > MAX_POINTS:
            raise InputError(field, f"COUNT {count} is more than {MAX_POINTS} points")
        if count > 1 and start == stop:
            raise InputError(field, f"START and STOP are equal ({start:g}) but COUNT is {count}")
    if log and (start <= 0 or stop <= 0):
        raise InputError(field, "a log range needs START and STOP above 0")
    canon = (
        f"{name}={start!r}:{stop!r}" + (f":{count}" if count is not None else "") + (":log" if log else "")
    )
    return Axis(name, start, stop, count, log, None, canon)


def _number(field: str, text: str) -> float:
    try:
        x = float(text)
    except ValueError:
        raise InputError(field, f"'{text.strip()}' is not a number") from None
    if not math.isfinite(x):
        raise InputError(field, f"{text.strip()} is not a finite number")
    return x


@dataclass(frozen=True)
class ScanPlan:
    """The ordered list of points a scan visits.

    Attributes
    ----------
    axes
        The varied parameters.
    kind
        ``"grid"`` (Cartesian product, last axis fastest) or ``"random"``.
    points
        One tuple of values per point, in the order of ``axes``.
    seed
        Random seed (random plans only).
    """

    axes: tuple[Axis, ...]
    kind: str
    points: tuple[tuple[float, ...], ...]
    seed: int | None = None

    @property
    def names(self) -> tuple[str, ...]:
        """Varied parameter names."""
        return tuple(a.name for a in self.axes)

    @property
    def shape(self) -> tuple[int, ...] | None:
        """Grid shape (one length per axis), ``None`` for random plans."""
        return tuple(len(a.grid()) for a in self.axes) if self.kind == GRID else None

    def __len__(self) -> int:
        return len(self.points)

    def describe(self) -> dict[str, Any]:
        """Plain data that identifies the plan (used to refuse resuming a different scan)."""
        return {
            "kind": self.kind,
            "vary": [a.spec for a in self.axes],
            "points": len(self.points),
            "seed": self.seed,
        }

    def fingerprint(self) -> str:
        """Short hash of the plan description and all point values."""
        text = json.dumps([self.describe(), self.points])
        return hashlib.sha256(text.encode()).hexdigest()[:16]


def _as_axes(vary: Sequence[str | Axis]) -> tuple[Axis, ...]:
    if isinstance(vary, str | Axis):
        vary = [vary]
    axes = tuple(v if isinstance(v, Axis) else parse_vary(v) for v in vary)
    if not axes:
        raise InputError("--vary", "give at least one parameter to vary")
    seen: set[str] = set()
    for a in axes:
        if a.name in seen:
            raise InputError(f"--vary {a.name}", "given twice")
        seen.add(a.name)
    return axes


def grid_plan(vary: Sequence[str | Axis]) -> ScanPlan:
    """A Cartesian grid over the varied parameters (the last one varies fastest).

    Raises
    ------
    InputError
        For a malformed spec, a repeated name or a missing COUNT.

    Examples
    --------
    >>> len(grid_plan(["c=0.1:1:10", "g=1:2:3"]))
    30
    """
    axes = _as_axes(vary)
    total = math.prod(len(a.grid()) for a in axes)
    if total > MAX_POINTS:
        raise InputError("--vary", f"the grid has {total} points, more than {MAX_POINTS}")
    points = tuple(itertools.product(*(a.grid() for a in axes)))
    return ScanPlan(axes, GRID, points)


def random_plan(vary: Sequence[str | Axis], samples: int, seed: int = 0) -> ScanPlan:
    """``samples`` random points, each parameter uniform (or log-uniform) over its range.

    The same ``seed`` gives the same points on every machine (numpy's PCG64 generator).

    Raises
    ------
    InputError
        For a malformed spec, an explicit value list, or ``samples`` below 1.
    """
    import numpy as np

    axes = _as_axes(vary)
    if isinstance(samples, bool) or not isinstance(samples, int) or samples < 1:
        raise InputError("--random", f"the number of samples must be a whole number >= 1, got {samples}")
    if samples > MAX_POINTS:
        raise InputError("--random", f"{samples} samples is more than {MAX_POINTS}")
    for a in axes:
        if a.values is not None:
            raise InputError(f"--vary {a.name}", "random samples need a range START:STOP, not a list")
    rng = np.random.default_rng(seed)
    u = rng.random((samples, len(axes)))
    cols = []
    for j, a in enumerate(axes):
        if a.log:
            lo, hi = math.log(a.start), math.log(a.stop)
            cols.append(np.exp(lo + (hi - lo) * u[:, j]))
        else:
            cols.append(a.start + (a.stop - a.start) * u[:, j])
    points = tuple(tuple(float(c[i]) for c in cols) for i in range(samples))
    return ScanPlan(axes, RANDOM, points, seed)
